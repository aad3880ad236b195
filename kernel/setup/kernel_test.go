package setup

import (
	"bytes"
	"context"
	"encoding/json"
	"fmt"
	"io"
	"maps"
	"net"
	"net/http"
	"os"
	"os/exec"
	"path/filepath"
	"slices"
	"strings"
	"testing"
	"time"
)

// TestKernelSurvivesCrashes executes testdata/notebooks/reliability.ipynb with
// the installed beamnote kernel: a cell that panics, one that calls os.Exit,
// one that does not compile, one that prints "error: …" and returns, and one
// that writes "error: …" to stderr and exits 1 (what nb.Must does) must each
// be reported as a problem of that cell, with the message; a line that only
// contains "error:" is not a problem; and the cells after them must still
// run. It needs `make kernel` first and skips otherwise.
func TestKernelSurvivesCrashes(t *testing.T) {
	if testing.Short() {
		t.Skip("runs a Jupyter kernel")
	}
	l, err := FindLayout(".")
	if err != nil {
		t.Fatal(err)
	}
	if _, err := os.Stat(filepath.Join(KernelDir(l.JupyterData()), "kernel.json")); err != nil || Jupyter() == "" {
		t.Skip("beamnote kernel not installed (run make kernel)")
	}
	out := t.TempDir()
	nbPath := filepath.Join(l.Root, "testdata", "notebooks", "reliability.ipynb")
	err = l.ExecuteNotebooks([]string{nbPath}, out, false, io.Discard)
	if err == nil {
		t.Fatal("ExecuteNotebooks(reliability.ipynb) = nil, want the crashes reported")
	}
	for _, want := range []string{
		`cell 1 (var m map[string]int): the cell program crashed ("panic: assignment to entry in nil map" on stderr, at Cell[1]: Line 3)`,
		`cell 2 (os.Exit(3)): the cell program crashed ("exit status 3" on stderr)`,
		`cell 3 (undefinedFunction()): does not compile: Cell[3]: Line 2: undefined: undefinedFunction`,
		`: the cell reported an error on stdout: error: lens "L2": focal length = 0 m: must be nonzero` + "\n",
		`: the cell reported an error on stderr: error: beam: waist radius = -1 mm: must be positive (exit status 1)`,
		`cell 6 (fmt.Println("   Error: solver did not converge")): the cell reported an error on stdout: Error: solver did not converge`,
	} {
		if !strings.Contains(err.Error(), want) {
			t.Errorf("ExecuteNotebooks error lacks %q:\n%v", want, err)
		}
	}
	for _, cell := range []string{"cell 4 (", "cell 5 ("} {
		if n := strings.Count(err.Error(), cell); n != 1 {
			t.Errorf("ExecuteNotebooks error names %s %d times, want once:\n%v", cell, n, err)
		}
	}
	if strings.Contains(err.Error(), "cell 7 (") {
		t.Errorf("ExecuteNotebooks reports cell 7, whose lines only contain \"error:\":\n%v", err)
	}
	b, rerr := os.ReadFile(filepath.Join(out, "reliability.ipynb"))
	if rerr != nil {
		t.Fatal(rerr)
	}
	var nb Notebook
	if err := json.Unmarshal(b, &nb); err != nil {
		t.Fatal(err)
	}
	last := nb.Cells[len(nb.Cells)-1]
	alive := false
	for _, o := range last.Outputs {
		if o.OutputType == "stream" && strings.Contains(multiline(o.Text), "kernel still alive") {
			alive = true
		}
	}
	if !alive {
		t.Errorf("the cell after the crashes did not run: outputs %+v", last.Outputs)
	}
}

// TestServeSmoke starts the notebook server the way `make notebook` does
// (ServeCommand), on a free loopback port, and checks through the Jupyter
// REST API (jupyter_server documentation, "REST API": /api/kernelspecs,
// /api/contents) that it serves notebooks/ with the beamnote kernel as the
// default and refuses requests without the token, and that the token is
// on no process's command line (/proc/<pid>/cmdline, which every local user
// can read). It needs `make kernel` first and skips otherwise.
func TestServeSmoke(t *testing.T) {
	if testing.Short() {
		t.Skip("starts a Jupyter server")
	}
	l, err := FindLayout(".")
	if err != nil {
		t.Fatal(err)
	}
	if _, err := os.Stat(filepath.Join(KernelDir(l.JupyterData()), "kernel.json")); err != nil || Jupyter() == "" {
		t.Skip("beamnote kernel not installed (run make kernel)")
	}
	ln, err := net.Listen("tcp", "127.0.0.1:0")
	if err != nil {
		t.Fatal(err)
	}
	port := ln.Addr().(*net.TCPAddr).Port
	ln.Close()
	argv, env, url, err := l.ServeCommand(ServeOptions{Port: port})
	if err != nil {
		t.Fatal(err)
	}
	cmd := exec.Command(argv[0], argv[1:]...)
	cmd.Env = Environ(env)
	if err := cmd.Start(); err != nil {
		t.Fatal(err)
	}
	defer func() {
		cmd.Process.Signal(os.Interrupt)
		cmd.Process.Signal(os.Interrupt) // the notebook server asks to confirm
		done := make(chan error, 1)
		go func() { done <- cmd.Wait() }()
		select {
		case <-done:
		case <-time.After(10 * time.Second):
			cmd.Process.Kill()
		}
	}()
	token := url[strings.Index(url, "token=")+len("token="):]
	base := fmt.Sprintf("http://127.0.0.1:%d", port)
	ctx, cancel := context.WithTimeout(context.Background(), 60*time.Second)
	defer cancel()
	if err := WaitServing(ctx, url); err != nil {
		t.Fatalf("notebook server on port %d: %v", port, err)
	}
	if _, err := os.Stat("/proc/self/cmdline"); err == nil {
		// `jupyter notebook` execs jupyter-notebook in the same process.
		b, err := os.ReadFile(fmt.Sprintf("/proc/%d/cmdline", cmd.Process.Pid))
		if err != nil {
			t.Errorf("reading the server's command line: %v", err)
		}
		if !bytes.Contains(b, []byte("notebook")) {
			t.Errorf("process %d is not the notebook server: command line %q", cmd.Process.Pid, b)
		}
		if bytes.Contains(b, []byte(token)) {
			t.Errorf("the token is on the server's command line %q", b)
		}
		// Nor on any other process's, such as a helper the server started.
		procs, _ := filepath.Glob("/proc/[0-9]*/cmdline")
		for _, p := range procs {
			if b, err := os.ReadFile(p); err == nil && bytes.Contains(b, []byte(token)) {
				t.Errorf("the token is on the command line of %s: %q", p, b)
			}
		}
	}
	var specs struct {
		Default     string                     `json:"default"`
		Kernelspecs map[string]json.RawMessage `json:"kernelspecs"`
	}
	resp, err := http.Get(base + "/api/kernelspecs?token=" + token)
	if err != nil {
		t.Fatal(err)
	}
	err = json.NewDecoder(resp.Body).Decode(&specs)
	resp.Body.Close()
	if err != nil {
		t.Fatalf("/api/kernelspecs: %v", err)
	}
	if _, ok := specs.Kernelspecs[KernelName]; !ok || specs.Default != KernelName {
		t.Errorf("kernelspecs: default %q, names %v; want %q present and default", specs.Default, slices.Sorted(maps.Keys(specs.Kernelspecs)), KernelName)
	}
	resp, err = http.Get(base + "/api/kernelspecs")
	if err != nil {
		t.Fatal(err)
	}
	resp.Body.Close()
	if resp.StatusCode != http.StatusForbidden {
		t.Errorf("request without token: status %d, want 403", resp.StatusCode)
	}
	resp, err = http.Get(base + "/api/contents/00-quickstart.ipynb?content=0&token=" + token)
	if err != nil {
		t.Fatal(err)
	}
	resp.Body.Close()
	if resp.StatusCode != http.StatusOK {
		t.Errorf("notebooks/00-quickstart.ipynb through the server: status %d, want 200", resp.StatusCode)
	}
}
