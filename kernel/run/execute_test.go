package run

import (
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/beamnote/beamnote/kernel/internal/kerneltest"
	"github.com/beamnote/beamnote/kernel/ipynb"
)

// TestKernelSurvivesCrashes executes testdata/notebooks/reliability.ipynb with
// the installed beamnote kernel: a cell that panics, one that calls os.Exit,
// one that does not compile, one that prints "error: …" and returns, one
// that writes "error: …" to stderr and exits 1, and an nb.Must that fails
// must each be reported as a problem of that cell, with the message; a line
// that only contains "error:" is not a problem; and the cells after them
// must still run. The HTML export must show the compiler's message by cell
// and line as text (gonb's --raw_error). It needs `make kernel` first and skips otherwise.
func TestKernelSurvivesCrashes(t *testing.T) {
	l := kerneltest.Installed(t)
	out := t.TempDir()
	nbPath := filepath.Join(l.Root, "testdata", "notebooks", "reliability.ipynb")
	rs, rerr := Rerun(l, []string{nbPath}, Options{Out: out, Log: io.Discard})
	if rerr != nil {
		t.Fatalf("Rerun error: %v", rerr)
	}
	if len(rs) != 1 || !rs[0].Failed() {
		t.Fatalf("Rerun(reliability.ipynb) = %+v, want the crashes reported", rs)
	}
	err := errors.New(strings.Join(rs[0].Problems, "\n") + "\n")
	for _, want := range []string{
		// gonb adds the panic's cell line to stderr when it maps the
		// stack trace in time; the report carries it then, so only the
		// part before it is required.
		`cell 1 (var m map[string]int): the cell program crashed ("panic: assignment to entry in nil map" on stderr`,
		`cell 2 (os.Exit(3)): the cell program crashed ("exit status 3" on stderr)`,
		`cell 3 (undefinedFunction()): does not compile: Cell[3]: Line 2: undefined: undefinedFunction`,
		`: the cell reported an error on stdout: error: lens "L2": focal length = 0 m: must be nonzero` + "\n",
		`: the cell reported an error on stderr: error: beam: waist radius = -1 mm: must be positive (exit status 1)`,
		`cell 6 (fmt.Println("   Error: solver did not converge")): the cell reported an error on stdout: Error: solver did not converge`,
		`cell 8 (import "github.com/beamnote/beamnote/kernel/nb"): the cell reported an error on stderr: error: strconv.ParseFloat: parsing "0.42 mm": invalid syntax (in: w := nb.Must(strconv.ParseFloat("0.42 mm", 64)); exit status 1)`,
	} {
		if !strings.Contains(err.Error(), want) {
			t.Errorf("Rerun problems lack %q:\n%v", want, err)
		}
	}
	for _, cell := range []string{"cell 4 (", "cell 5 (", "cell 8 ("} {
		if n := strings.Count(err.Error(), cell); n != 1 {
			t.Errorf("Rerun problems name %s %d times, want once:\n%v", cell, n, err)
		}
	}
	if strings.Contains(err.Error(), "cell 7 (") {
		t.Errorf("Rerun reports cell 7, whose lines only contain \"error:\":\n%v", err)
	}
	b, rerr := os.ReadFile(filepath.Join(out, "reliability.ipynb"))
	if rerr != nil {
		t.Fatal(rerr)
	}
	// The fixture states no target: no record is left beside it.
	if _, err := os.Stat(filepath.Join(l.Root, "testdata", "notebooks", "reliability.targets.txt")); err == nil {
		t.Error("Rerun wrote a record for a notebook without targets")
	}
	var nb ipynb.Notebook
	if err := json.Unmarshal(b, &nb); err != nil {
		t.Fatal(err)
	}
	html, err := os.ReadFile(filepath.Join(out, "reliability.html"))
	if err != nil {
		t.Fatal(err)
	}
	for _, want := range []string{"Cell[3]: Line 2", "undefined: undefinedFunction"} {
		if !bytes.Contains(html, []byte(want)) {
			t.Errorf("the HTML export of reliability.ipynb lacks %q", want)
		}
	}
	last := nb.Cells[len(nb.Cells)-1]
	alive := false
	for _, o := range last.Outputs {
		if o.OutputType == "stream" && strings.Contains(ipynb.Text(o.Text), "kernel still alive") {
			alive = true
		}
	}
	if !alive {
		t.Errorf("the cell after the crashes did not run: outputs %+v", last.Outputs)
	}
}

// TestKernelCompileErrorText executes, with nbclient, a cell that calls an
// undefined function on its line 3, and the cell after it. The compiler's
// message and the cell line must be in the cell's error output itself
// (nbformat "error" output: ename, evalue, traceback), which is what a
// terminal, nbconvert and an HTML export show, and in the message that
// nbclient raises (what `jupyter nbconvert --execute` prints); the next
// cell must still run.
func TestKernelCompileErrorText(t *testing.T) {
	l := kerneltest.Installed(t)
	var res struct {
		Terminal string           `json:"terminal"`
		Outputs  [][]ipynb.Output `json:"outputs"`
	}
	kerneltest.Client(t, l, "errors", &res)
	if len(res.Outputs) != 2 {
		t.Fatalf("kernelclient.py errors: %d cells, want 2", len(res.Outputs))
	}
	var text strings.Builder
	for _, o := range res.Outputs[0] {
		if o.OutputType == "error" {
			fmt.Fprintln(&text, o.EName, o.EValue, strings.Join(o.Traceback, "\n"))
		}
	}
	for _, want := range []string{"undefined: nosuchname", "Cell[1]: Line 3"} {
		if !strings.Contains(text.String(), want) {
			t.Errorf("error output of the cell lacks %q: %+v", want, res.Outputs[0])
		}
		if !strings.Contains(res.Terminal, want) {
			t.Errorf("nbclient's CellExecutionError lacks %q:\n%s", want, res.Terminal)
		}
	}
	if got := CheckExecuted(ipynb.Notebook{Cells: []ipynb.Cell{{CellType: "code", Source: json.RawMessage(`"x"`), Outputs: res.Outputs[0]}}}); len(got) == 0 ||
		!strings.Contains(got[0], "does not compile: Cell[1]: Line 3: undefined: nosuchname") {
		t.Errorf("CheckExecuted(compile error) = %q, want %q", got, "does not compile: Cell[1]: Line 3: undefined: nosuchname")
	}
	ran := false
	for _, o := range res.Outputs[1] {
		ran = ran || strings.Contains(ipynb.Text(o.Text), "still running")
	}
	if !ran {
		t.Errorf("the cell after the compile error did not run: %+v", res.Outputs[1])
	}
}
