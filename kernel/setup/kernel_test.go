package setup

import (
	"encoding/json"
	"io"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// TestKernelSurvivesCrashes executes testdata/notebooks/reliability.ipynb with
// the installed beamnote kernel: a cell that panics, one that calls os.Exit
// and one that does not compile must each be reported as a problem, and the
// last cell must still run. It needs `make kernel` first and skips otherwise.
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
		`cell 1 (var m map[string]int): the cell program crashed ("panic:`,
		`cell 2 (os.Exit(3)): the cell program crashed ("exit status 3"`,
		`cell 3 (undefinedFunction()): does not compile: Cell[3]: Line 2: undefined: undefinedFunction`,
	} {
		if !strings.Contains(err.Error(), want) {
			t.Errorf("ExecuteNotebooks error lacks %q:\n%v", want, err)
		}
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
