// Package kerneltest drives the installed beamnote kernel for the tests of
// the kernel's packages that need a real one: it skips a test when the
// kernel is not installed, and runs kernelclient.py (jupyter_client and
// nbclient) against the project-local kernelspec.
package kerneltest

import (
	"bytes"
	"encoding/json"
	"os"
	"os/exec"
	"path/filepath"
	"testing"

	"github.com/beamnote/beamnote/kernel/layout"
)

// Installed returns the layout of the checkout, or skips t (also under
// go test -short) unless the beamnote kernel is installed in the
// project-local Jupyter data directory with jupyter and python3 at hand;
// under CI=true a missing kernel fails t instead.
func Installed(t *testing.T) layout.Layout {
	t.Helper()
	if testing.Short() {
		t.Skip("runs a Jupyter kernel")
	}
	l, err := layout.FindLayout(".")
	if err != nil {
		t.Fatal(err)
	}
	if _, err := os.Stat(filepath.Join(layout.KernelDir(l.JupyterData()), "kernel.json")); err != nil || layout.Jupyter() == "" || layout.Python() == "" {
		if os.Getenv("CI") == "true" {
			t.Fatal("beamnote kernel not installed under CI=true (make test runs make kernel first)")
		}
		t.Skip("beamnote kernel not installed (run make kernel)")
	}
	return l
}

// Client runs kernelclient.py (beside this file) in mode with the
// project-local kernelspec and decodes the JSON it prints into v.
func Client(t *testing.T, l layout.Layout, mode string, v any) {
	t.Helper()
	script := filepath.Join(l.Root, "kernel", "internal", "kerneltest", "kernelclient.py")
	cmd := exec.Command(layout.Python(), script, mode)
	cmd.Env = layout.Environ(l.JupyterEnv(false))
	var stderr bytes.Buffer
	cmd.Stderr = &stderr
	out, err := cmd.Output()
	if err != nil {
		t.Fatalf("kernelclient.py %s: %v\n%s", mode, err, stderr.Bytes())
	}
	if err := json.Unmarshal(out, v); err != nil {
		t.Fatalf("kernelclient.py %s: %v\n%s", mode, err, out)
	}
}
