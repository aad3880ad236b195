package main

import (
	"errors"
	"fmt"
	"os/exec"
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
		{"wrapped exit 3", fmt.Errorf("install: step: %w", sh("exit 3")), 3},
		{"twice wrapped exit 42", fmt.Errorf("outer: %w", fmt.Errorf("inner: %w", sh("exit 42"))), 42},
		{"killed by SIGKILL", fmt.Errorf("wrapped: %w", sh("kill -9 $$")), 128 + 9},
		{"not a child's exit", errors.New("layout: no go.mod"), 1},
	} {
		if got := exitCode(test.err); got != test.want {
			t.Errorf("exitCode(%s: %v) = %d, want %d", test.name, test.err, got, test.want)
		}
	}
}
