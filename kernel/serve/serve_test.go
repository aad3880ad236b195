package serve

import (
	"bytes"
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"maps"
	"net"
	"net/http"
	"net/http/httptest"
	"os"
	"os/exec"
	"path/filepath"
	"slices"
	"strings"
	"testing"
	"time"

	"github.com/beamnote/beamnote/kernel/layout"
)

func TestCommandRefusesRemoteAndAlwaysHasToken(t *testing.T) {
	if layout.Jupyter() == "" {
		t.Skip("no jupyter on this machine")
	}
	l := layout.Layout{Root: "/r", State: "/r/.beamnote", RealGo: "/usr/local/go/bin/go"}
	for _, test := range []struct {
		opt    Options
		wantOK bool
	}{
		{Options{}, true},
		{Options{IP: "::1"}, true},
		{Options{IP: "0.0.0.0"}, false},
		{Options{IP: "192.168.1.20"}, false},
		{Options{IP: "192.168.1.20", AllowRemote: true}, true},
		{Options{IP: "localhost"}, false}, // not an IP address
		{Options{Port: 70000}, false},
	} {
		argv, env, url, err := Command(l, test.opt)
		if (err == nil) != test.wantOK {
			t.Errorf("Command(%+v) error = %v, want ok %v", test.opt, err, test.wantOK)
			continue
		}
		if err != nil {
			continue
		}
		tok := env["JUPYTER_TOKEN"]
		if len(tok) != 48 || !strings.Contains(url, "token="+tok) {
			t.Errorf("Command(%+v): JUPYTER_TOKEN %q, url %q; want a 48-hex-digit token in the URL", test.opt, tok, url)
		}
		if a := strings.Join(argv, " "); tok != "" && strings.Contains(a, tok) {
			t.Errorf("Command(%+v): the token is on the command line %q", test.opt, a)
		}
	}
}

func TestWaitServing(t *testing.T) {
	srv := httptest.NewServer(http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		http.Error(w, "forbidden", http.StatusForbidden) // any answer will do
	}))
	defer srv.Close()
	ctx, cancel := context.WithTimeout(context.Background(), 10*time.Second)
	defer cancel()
	if err := WaitServing(ctx, srv.URL+"/tree?token=x"); err != nil {
		t.Errorf("WaitServing(running server) = %v, want nil", err)
	}

	ln, err := net.Listen("tcp", "127.0.0.1:0")
	if err != nil {
		t.Fatal(err)
	}
	url := "http://" + ln.Addr().String() + "/tree"
	ln.Close()
	ctx, cancel = context.WithTimeout(context.Background(), 500*time.Millisecond)
	defer cancel()
	if err := WaitServing(ctx, url); err == nil {
		t.Errorf("WaitServing(nothing listening) = nil, want an error")
	}
}

// TestServeSmoke starts the notebook server the way `make notebook` does
// ([Command]), on a free loopback port, and checks through the Jupyter
// REST API (jupyter_server documentation, "REST API": /api/kernelspecs,
// /api/contents) that it serves notebooks/ with the beamnote kernel as the
// default and refuses requests without the token, and that the token is
// on no process's command line (/proc/<pid>/cmdline, which every local user
// can read). It needs `make kernel` first and skips otherwise.
func TestServeSmoke(t *testing.T) {
	if testing.Short() {
		t.Skip("starts a Jupyter server")
	}
	l, err := layout.FindLayout(".")
	if err != nil {
		t.Fatal(err)
	}
	if _, err := os.Stat(filepath.Join(layout.KernelDir(l.JupyterData()), "kernel.json")); err != nil || layout.Jupyter() == "" {
		t.Skip("beamnote kernel not installed (run make kernel)")
	}
	ln, err := net.Listen("tcp", "127.0.0.1:0")
	if err != nil {
		t.Fatal(err)
	}
	port := ln.Addr().(*net.TCPAddr).Port
	ln.Close()
	argv, env, url, err := Command(l, Options{Port: port})
	if err != nil {
		t.Fatal(err)
	}
	cmd := exec.Command(argv[0], argv[1:]...)
	cmd.Env = layout.Environ(env)
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
	if _, ok := specs.Kernelspecs[layout.KernelName]; !ok || specs.Default != layout.KernelName {
		t.Errorf("kernelspecs: default %q, names %v; want %q present and default", specs.Default, slices.Sorted(maps.Keys(specs.Kernelspecs)), layout.KernelName)
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

// TestRunURLOnlyOnceAnswering runs [Run] over stand-ins for the notebook
// server: one that exits before it answers must not get its URL printed,
// and its exit code must come back; one that answers must.
func TestRunURLOnlyOnceAnswering(t *testing.T) {
	ln, err := net.Listen("tcp", "127.0.0.1:0")
	if err != nil {
		t.Fatal(err)
	}
	addr := ln.Addr().(*net.TCPAddr)
	ln.Close()
	url := fmt.Sprintf("http://127.0.0.1:%d/tree?token=x", addr.Port)

	var out bytes.Buffer
	err = Run([]string{"/bin/sh", "-c", "sleep 0.5; exit 4"}, nil, url, &out)
	var ee *exec.ExitError
	if !errors.As(err, &ee) || ee.ExitCode() != 4 {
		t.Errorf("Run(server that exits 4) = %v, want exit code 4", err)
	}
	if strings.Contains(out.String(), url) {
		t.Errorf("Run printed the URL of a server that never answered: %q", out.String())
	}

	python, err := exec.LookPath("python3")
	if err != nil {
		t.Skip("no python3 for a stand-in HTTP server")
	}
	// Listens only after a second, answers one request, then exits.
	script := fmt.Sprintf(`import time, http.server
class Quiet(http.server.BaseHTTPRequestHandler):
    def log_message(self, *args): pass
time.sleep(1)
http.server.HTTPServer(("127.0.0.1", %d), Quiet).handle_request()
`, addr.Port)
	out.Reset()
	if err := Run([]string{python, "-c", script}, nil, url, &out); err != nil {
		t.Errorf("Run(answering server) = %v", err)
	}
	if !strings.Contains(out.String(), "open "+url) {
		t.Errorf("Run(answering server) wrote %q, want the URL", out.String())
	}
}
