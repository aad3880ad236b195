package main

import (
	"bytes"
	"errors"
	"fmt"
	"net"
	"os/exec"
	"strings"
	"testing"
)

func TestExitCode(t *testing.T) {
	sh := func(script string) error { return exec.Command("/bin/sh", "-c", script).Run() }
	for _, test := range []struct {
		name string
		err  error
		want int
	}{
		{"exit 3", sh("exit 3"), 3},
		{"wrapped exit 3", fmt.Errorf("setup: step: %w", sh("exit 3")), 3},
		{"twice wrapped exit 42", fmt.Errorf("outer: %w", fmt.Errorf("inner: %w", sh("exit 42"))), 42},
		{"killed by SIGKILL", fmt.Errorf("wrapped: %w", sh("kill -9 $$")), 128 + 9},
		{"not a child's exit", errors.New("setup: no go.mod"), 1},
	} {
		if got := exitCode(test.err); got != test.want {
			t.Errorf("exitCode(%s: %v) = %d, want %d", test.name, test.err, got, test.want)
		}
	}
}

// TestServeURLOnlyOnceAnswering runs serve over stand-ins for the notebook
// server: one that exits before it answers must not get its URL printed,
// and its exit code must come back; one that answers must.
func TestServeURLOnlyOnceAnswering(t *testing.T) {
	ln, err := net.Listen("tcp", "127.0.0.1:0")
	if err != nil {
		t.Fatal(err)
	}
	addr := ln.Addr().(*net.TCPAddr)
	ln.Close()
	url := fmt.Sprintf("http://127.0.0.1:%d/tree?token=x", addr.Port)

	var out bytes.Buffer
	err = serve([]string{"/bin/sh", "-c", "sleep 0.5; exit 4"}, nil, url, &out)
	if exitCode(err) != 4 {
		t.Errorf("serve(server that exits 4) = %v, exit code %d, want 4", err, exitCode(err))
	}
	if strings.Contains(out.String(), url) {
		t.Errorf("serve printed the URL of a server that never answered: %q", out.String())
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
	if err := serve([]string{python, "-c", script}, nil, url, &out); err != nil {
		t.Errorf("serve(answering server) = %v", err)
	}
	if !strings.Contains(out.String(), "open "+url) {
		t.Errorf("serve(answering server) wrote %q, want the URL", out.String())
	}
}
