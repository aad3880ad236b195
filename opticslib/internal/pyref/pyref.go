// Package pyref runs the NumPy/SciPy reference scripts of
// testdata/crosscheck for the cross-check tests of the opticslib packages.
//
// The scripts run with $BEAMNOTE_PYTHON if set, else the system interpreter
// /usr/bin/python3, which sees Debian's python3-numpy and python3-scipy (the
// python3 first on PATH may not). Tests skip, saying why, where the
// interpreter or the modules are missing, except under CI=true: CI
// installs them, so there a missing reference fails the test rather than
// letting a cross-check pass unseen.
package pyref

import (
	"bytes"
	"encoding/json"
	"os"
	"os/exec"
	"path/filepath"
	"testing"
)

// Python returns the interpreter that runs the reference scripts:
// $BEAMNOTE_PYTHON if set, else /usr/bin/python3, the system interpreter
// that sees Debian's numpy and scipy.
func Python() string {
	if p := os.Getenv("BEAMNOTE_PYTHON"); p != "" {
		return p
	}
	return "/usr/bin/python3"
}

// Run writes in as JSON to a temporary file, runs the reference script
// testdata/crosscheck/<script> on it and decodes the script's JSON output
// into out. It skips the test if the interpreter or numpy/scipy are
// unavailable (fails it under CI=true), and fails it if the script itself
// fails. Tests must run in a
// package directory two levels below the checkout (opticslib/<pkg>).
func Run(t testing.TB, script string, in, out any) {
	t.Helper()
	skip := t.Skipf
	if os.Getenv("CI") == "true" {
		skip = t.Fatalf // CI installs the references: a missing one is a failure there
	}
	python, err := exec.LookPath(Python())
	if err != nil {
		skip("cross-check skipped: %s not found (install python3-numpy and python3-scipy, or set BEAMNOTE_PYTHON): %v", Python(), err)
		return
	}
	if msg, err := exec.Command(python, "-c", "import numpy, scipy").CombinedOutput(); err != nil {
		skip("cross-check skipped: %s cannot import numpy and scipy (install python3-numpy python3-scipy): %v\n%s", python, err, msg)
		return
	}
	dir := t.TempDir()
	inPath, outPath := filepath.Join(dir, "in.json"), filepath.Join(dir, "out.json")
	data, err := json.Marshal(in)
	if err != nil {
		t.Fatalf("json.Marshal(cases) error: %v", err)
	}
	if err := os.WriteFile(inPath, data, 0o600); err != nil {
		t.Fatalf("WriteFile(%s) error: %v", inPath, err)
	}
	path := filepath.Join("..", "..", "testdata", "crosscheck", script)
	// Stat the script through os so that go test's result cache is
	// invalidated when the script changes (the child process's reads are
	// not recorded).
	if _, err := os.Stat(path); err != nil {
		t.Fatalf("reference script: %v", err)
	}
	var stderr bytes.Buffer
	cmd := exec.Command(python, path, inPath, outPath)
	cmd.Stderr = &stderr
	if err := cmd.Run(); err != nil {
		t.Fatalf("%s %s error: %v\n%s", python, path, err, stderr.Bytes())
	}
	data, err = os.ReadFile(outPath)
	if err != nil {
		t.Fatalf("ReadFile(%s) error: %v", outPath, err)
	}
	if err := json.Unmarshal(data, out); err != nil {
		t.Fatalf("json.Unmarshal(%s output) error: %v", script, err)
	}
}
