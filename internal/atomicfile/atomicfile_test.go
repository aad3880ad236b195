package atomicfile

import (
	"os"
	"path/filepath"
	"testing"
)

func TestWriteReplacesAndCleansUp(t *testing.T) {
	dir := t.TempDir()
	path := filepath.Join(dir, "kernel.json")
	for _, test := range []struct {
		data string
		perm os.FileMode
	}{
		{"first", 0o644},
		{"second, longer", 0o755},
	} {
		if err := Write(path, []byte(test.data), test.perm); err != nil {
			t.Fatalf("Write(%q) = %v", test.data, err)
		}
		b, err := os.ReadFile(path)
		if err != nil || string(b) != test.data {
			t.Errorf("after Write(%q): content %q, %v", test.data, b, err)
		}
		if fi, err := os.Stat(path); err != nil || fi.Mode().Perm() != test.perm {
			t.Errorf("after Write(%q): mode %v, want %v", test.data, fi.Mode().Perm(), test.perm)
		}
	}
	ents, _ := os.ReadDir(dir)
	if len(ents) != 1 {
		t.Errorf("Write left %d entries in the directory, want 1", len(ents))
	}
	if err := Write(filepath.Join(dir, "missing", "f"), nil, 0o644); err == nil {
		t.Error("Write into a missing directory: no error")
	}
}
