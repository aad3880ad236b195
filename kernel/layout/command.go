package layout

import (
	"errors"
	"fmt"
	"io"
	"maps"
	"os"
	"os/exec"
	"slices"
	"strings"
)

// Environ returns the current environment with the variables of m set, in
// os/exec form: every name of m replaces any inherited value of the same name
// (removed, not shadowed, since programs differ in which duplicate they read:
// Python's os.environ keeps the first), and m's entries follow in sorted
// order.
func Environ(m map[string]string) []string {
	var env []string
	for _, kv := range os.Environ() {
		name, _, _ := strings.Cut(kv, "=")
		if _, ok := m[name]; !ok {
			env = append(env, kv)
		}
	}
	for _, k := range slices.Sorted(maps.Keys(m)) {
		env = append(env, k+"="+m[k])
	}
	return env
}

// Run runs a command in dir with the extra environment env (none if nil),
// copying its output to log.
func Run(log io.Writer, dir string, env map[string]string, name string, args ...string) error {
	cmd := exec.Command(name, args...)
	cmd.Dir = dir
	if env != nil {
		cmd.Env = Environ(env)
	}
	cmd.Stdout, cmd.Stderr = log, log
	if err := cmd.Run(); err != nil {
		return fmt.Errorf("layout: %s (in %s): %w", strings.Join(cmd.Args, " "), dir, err)
	}
	return nil
}

// Output runs a command in dir and returns its standard output; the error
// carries the command's standard error.
func Output(dir string, name string, args ...string) (string, error) {
	cmd := exec.Command(name, args...)
	cmd.Dir = dir
	out, err := cmd.Output()
	if err != nil {
		msg := ""
		var ee *exec.ExitError
		if errors.As(err, &ee) {
			msg = ": " + strings.TrimSpace(string(ee.Stderr))
		}
		return "", fmt.Errorf("layout: %s: %w%s", strings.Join(cmd.Args, " "), err, msg)
	}
	return string(out), nil
}
