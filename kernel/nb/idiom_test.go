package nb

import (
	"encoding/json"
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"
)

// The notebooks of the project stop a cell on an error in one way
// (Must, Check, Show) and build no figure with the plotting library by
// hand: the project's own cell style (DEVELOPERS.md), checked on every
// notebook in notebooks/.
func TestNotebooksUseOneIdiom(t *testing.T) {
	files, err := filepath.Glob(filepath.Join("..", "..", "notebooks", "*.ipynb"))
	if err != nil || len(files) == 0 {
		t.Fatalf("no notebooks found: %v", err)
	}
	banned := []struct {
		re   *regexp.Regexp
		why  string
		body bool // only in the cell's program body (after %%)
	}{
		{regexp.MustCompile(`\bpanic\(`), "panic: use nb.Must or nb.Check", false},
		{regexp.MustCompile(`\bos\.Exit\(`), "os.Exit: use nb.Must or nb.Check", false},
		{regexp.MustCompile(`if err != nil`), "hand-written error check in a cell body: use nb.Must, nb.Check or nb.Show(v, err)", true},
		{regexp.MustCompile(`fmt\.Print(ln|f)?\("error`), "print-and-return: use nb.Must or nb.Check", false},
		{regexp.MustCompile(`gonum\.org/v1/plot`), "plotting-library code in a cell: use optplot", false},
		// gonbui opens the pipes that nb uses; its widgets wait for a
		// browser for ever and hang a headless run.
		{regexp.MustCompile(`janpfeifer/gonb/gonbui`), "gonbui in a cell: use nb (display) and nb/live (sliders)", false},
	}
	for _, f := range files {
		b, err := os.ReadFile(f)
		if err != nil {
			t.Fatal(err)
		}
		var nb struct {
			Cells []struct {
				Type   string   `json:"cell_type"`
				Source []string `json:"source"`
			} `json:"cells"`
		}
		if err := json.Unmarshal(b, &nb); err != nil {
			t.Fatalf("%s: %v", f, err)
		}
		for i, c := range nb.Cells {
			if c.Type != "code" {
				continue
			}
			src := strings.Join(c.Source, "")
			body := ""
			if i := strings.Index(src, "%%"); i >= 0 {
				body = src[i:]
			}
			for _, bn := range banned {
				in := src
				if bn.body {
					in = body
				}
				if bn.re.MatchString(in) {
					t.Errorf("%s, cell %d: %s", filepath.Base(f), i, bn.why)
				}
			}
		}
	}
}
