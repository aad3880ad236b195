package layout

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
)

func TestEnvironReplacesInheritedValues(t *testing.T) {
	t.Setenv("JUPYTER_DATA_DIR", "/inherited")
	t.Setenv("BEAMNOTE_TEST_KEEP", "kept")
	env := Environ(map[string]string{"JUPYTER_DATA_DIR": "/project"})
	var got []string
	keep := false
	for _, kv := range env {
		if v, ok := strings.CutPrefix(kv, "JUPYTER_DATA_DIR="); ok {
			got = append(got, v)
		}
		keep = keep || kv == "BEAMNOTE_TEST_KEEP=kept"
	}
	if len(got) != 1 || got[0] != "/project" {
		t.Errorf("Environ: JUPYTER_DATA_DIR values %q, want exactly [/project]", got)
	}
	if !keep {
		t.Errorf("Environ dropped an unrelated inherited variable")
	}
}

func TestUserJupyterDataFollowsXDG(t *testing.T) {
	if _, err := os.Stat("/System/Library"); err == nil {
		t.Skip("macOS keeps Jupyter data in ~/Library/Jupyter")
	}
	xdg := t.TempDir()
	t.Setenv("JUPYTER_DATA_DIR", "")
	t.Setenv("XDG_DATA_HOME", xdg)
	want := filepath.Join(xdg, "jupyter")
	// With the jupyter command (asked with `jupyter --data-dir`) and
	// without one (the XDG rule applied here).
	for _, jup := range []string{Jupyter(), ""} {
		if got, err := userJupyterData(jup); err != nil || got != want {
			t.Errorf("userJupyterData(%q) with XDG_DATA_HOME=%s = %q, %v; want %q", jup, xdg, got, err, want)
		}
	}
	t.Setenv("JUPYTER_DATA_DIR", "/elsewhere/jupyter")
	if got, err := UserJupyterData(); err != nil || got != "/elsewhere/jupyter" {
		t.Errorf("UserJupyterData() with JUPYTER_DATA_DIR=/elsewhere/jupyter = %q, %v", got, err)
	}
}
