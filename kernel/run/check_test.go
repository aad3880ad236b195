package run

import (
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"unicode/utf8"

	"github.com/beamnote/beamnote/kernel/ipynb"
)

// These tests check the notebook checks against the format the runner
// reads: nbformat 4 (Jupyter's notebook format documentation, "The Notebook
// file format"). No physics here.

func readNotebook(t *testing.T, name string) ipynb.Notebook {
	t.Helper()
	b, err := os.ReadFile(filepath.Join("..", "..", "testdata", "notebooks", name))
	if err != nil {
		t.Fatal(err)
	}
	var nb ipynb.Notebook
	if err := json.Unmarshal(b, &nb); err != nil {
		t.Fatal(err)
	}
	return nb
}

func TestCheckExecuted(t *testing.T) {
	if p := CheckExecuted(readNotebook(t, "executed-good.ipynb")); len(p) != 0 {
		t.Errorf("CheckExecuted(good) = %q, want no problems", p)
	}
	p := CheckExecuted(readNotebook(t, "executed-bad.ipynb"))
	for _, want := range []string{
		`cell 0 (nb.SVG(nil, "x")): tagged "figure" but has no image/svg+xml output`,
		`cell 1 (var m map[string]int): the cell program crashed ("panic:`,
		`cell 2 (os.Exit(3)): the cell program crashed ("exit status 3"`,
		`cell 3 (undefined()): error ERROR: undefined: undefined`,
		`cell 4 (undefinedFunction()): does not compile: Cell[3]: Line 2: undefined: undefinedFunction`,
		`cell 5 (if err := errors.New("lens \"L2\": focal length = 0 m: mu...): the cell reported an error on stdout: error: lens "L2": focal length = 0 m: must be nonzero`,
		`cell 6 (fmt.Fprintln(os.Stderr, "error: beam: waist radius = -1 m...): the cell reported an error on stderr: error: beam: waist radius = -1 mm: must be positive (exit status 1)`,
		`cell 7 (fmt.Println("   Error: solver did not converge")): the cell reported an error on stdout: Error: solver did not converge`,
		`no cell produced an image/svg+xml figure`,
	} {
		found := false
		for _, got := range p {
			if strings.HasPrefix(got, want) || strings.Contains(got, want) {
				found = true
			}
		}
		if !found {
			t.Errorf("CheckExecuted(bad) = %q, want a problem like %q", p, want)
		}
	}
	// One problem per failing cell, none for cell 8, whose lines only
	// contain "error:".
	if len(p) != 9 {
		t.Errorf("CheckExecuted(bad) gave %d problems, want 9: %q", len(p), p)
	}
}

func TestCrashOnlyOnStderr(t *testing.T) {
	out := func(name, text string) ipynb.Output {
		raw, _ := json.Marshal(text)
		return ipynb.Output{OutputType: "stream", Name: name, Text: raw}
	}
	svg := ipynb.Output{OutputType: "display_data", Data: map[string]json.RawMessage{"image/svg+xml": json.RawMessage(`"<svg/>"`)}}
	for _, test := range []struct {
		out  ipynb.Output
		want int
	}{
		{out("stdout", "signal: 3.2 dB\nexit status 1 is what the tool returned\n"), 0},
		{out("stderr", "exit status 3\n"), 1},
		{out("stderr", "signal: killed\n"), 1},
		{out("stderr", "the detector signal: 3 dB\n"), 0},
	} {
		nb := ipynb.Notebook{Cells: []ipynb.Cell{{CellType: "code", Source: json.RawMessage(`"x"`), Outputs: []ipynb.Output{test.out, svg}}}}
		if got := CheckExecuted(nb); len(got) != test.want {
			t.Errorf("CheckExecuted(%s %q) = %q, want %d problems", test.out.Name, ipynb.Text(test.out.Text), got, test.want)
		}
	}
}

// TestErrorLine checks which stream lines make a cell fail: a line that
// starts with "error:" in any case after blanks, on stdout or stderr, even
// when Jupyter split the stream over several outputs; not "error:" inside a
// line.
func TestErrorLine(t *testing.T) {
	out := func(name string, text ...string) ipynb.Output {
		raw, _ := json.Marshal(text)
		return ipynb.Output{OutputType: "stream", Name: name, Text: raw}
	}
	for _, test := range []struct {
		outs []ipynb.Output
		want string // "" for no problem
	}{
		{[]ipynb.Output{out("stdout", "error: no focus\n")}, "the cell reported an error on stdout: error: no focus"},
		{[]ipynb.Output{out("stdout", "w = 1 mm\n", "\tERROR: no focus\n")}, "the cell reported an error on stdout: ERROR: no focus"},
		{[]ipynb.Output{out("stderr", "Error: x\n"), out("stderr", "exit status 1\n")}, "the cell reported an error on stderr: Error: x (exit status 1)"},
		{[]ipynb.Output{out("stdout", "w = 1 mm\ner"), out("stdout", "ror: split\n")}, "the cell reported an error on stdout: error: split"},
		{[]ipynb.Output{out("stdout", "focus error: 0.1 mm\n", "errors: none\n", "error 3 dB\n")}, ""},
		{[]ipynb.Output{out("stderr", "warning: error: x\n")}, ""},
	} {
		if got := cellFailure(test.outs); got != test.want {
			t.Errorf("cellFailure(%+v) = %q, want %q", test.outs, got, test.want)
		}
	}
}

func TestFirstLineKeepsRunes(t *testing.T) {
	long := strings.Repeat("λ", 70) // 2 bytes each
	for _, test := range []struct{ in, want string }{
		{"\n%%\n  w0 := 1.2  \nmore", "w0 := 1.2"},
		{strings.Repeat("a", 60), strings.Repeat("a", 60)},
		{strings.Repeat("a", 61), strings.Repeat("a", 57) + "..."},
		{long, strings.Repeat("λ", 57) + "..."},
		{strings.Repeat("a", 28) + long, strings.Repeat("a", 28) + strings.Repeat("λ", 29) + "..."},
		{strings.Repeat("µ", 60), strings.Repeat("µ", 60)},
	} {
		got := firstLine(test.in)
		if got != test.want || !utf8.ValidString(got) {
			t.Errorf("firstLine(%q) = %q, want %q", test.in, got, test.want)
		}
	}
}
