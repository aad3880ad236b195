package run

import (
	"bytes"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"github.com/beamnote/beamnote/kernel/internal/kerneltest"
	"github.com/beamnote/beamnote/kernel/ipynb"
	"github.com/beamnote/beamnote/kernel/layout"
	"github.com/beamnote/beamnote/kernel/record"
)

// copyFixtures copies testdata/rerun/*.ipynb of the checkout to a
// temporary folder, so that the records the re-run writes beside the
// notebooks do not land in the checkout.
func copyFixtures(t *testing.T, l layout.Layout, names ...string) string {
	t.Helper()
	dir := t.TempDir()
	for _, n := range names {
		b, err := os.ReadFile(filepath.Join(l.Root, "testdata", "rerun", n))
		if err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(filepath.Join(dir, n), b, 0o644); err != nil {
			t.Fatal(err)
		}
	}
	return dir
}

func find(t *testing.T, rs []record.Result, base string) record.Result {
	t.Helper()
	for _, r := range rs {
		if filepath.Base(r.Notebook) == base {
			return r
		}
	}
	t.Fatalf("no result for %s in %+v", base, rs)
	return record.Result{}
}

// TestRerun runs the fixtures of testdata/rerun with the installed kernel:
// a notebook with a deliberately failing target fails, naming it; a cell
// that sleeps for an hour is stopped at the cell timeout with a clear
// message while the other notebooks still run; a notebook of another
// kernel and a corrupt file are reported, not run. The user's notebooks
// are not written, the record is written beside the notebook, and a second
// run finds it and reports what moved.
func TestRerun(t *testing.T) {
	l := kerneltest.Installed(t)
	dir := copyFixtures(t, l, "failing-target.ipynb", "hanging-cell.ipynb", "other-kernel.ipynb", "corrupt.ipynb")
	before, err := os.ReadFile(filepath.Join(dir, "failing-target.ipynb"))
	if err != nil {
		t.Fatal(err)
	}
	out := t.TempDir()
	var log bytes.Buffer
	rs, err := Rerun(l, []string{dir}, Options{Out: out, CellTimeout: 15 * time.Second, Log: &log})
	if err != nil {
		t.Fatalf("Rerun error: %v\n%s", err, log.String())
	}
	if len(rs) != 4 {
		t.Fatalf("Rerun gave %d results, want 4", len(rs))
	}
	var report bytes.Buffer
	if record.Report(&report, rs) {
		t.Errorf("the report passes:\n%s", report.String())
	}
	for _, want := range []string{
		"failing-target.ipynb: target deliberately failing beam radius missed: is 0.5 mm above the limit",
		"hanging-cell.ipynb: a cell ran longer than the cell timeout of 15s and the notebook was stopped there: %% time.Sleep(time.Hour)",
		`other-kernel.ipynb: written for the kernel "python3" (Python 3), not beamnote`,
		"corrupt.ipynb: not a Jupyter notebook (nbformat 4): broken JSON at line 4",
	} {
		if !strings.Contains(report.String(), want) {
			t.Errorf("report lacks %q:\n%s", want, report.String())
		}
	}
	ft := find(t, rs, "failing-target.ipynb")
	if len(ft.Targets) != 2 || !ft.Targets[0].Met() || ft.Targets[1].Met() || len(ft.Problems) != 0 {
		t.Errorf("failing-target: targets %v, problems %v; want one met, one missed, no problem", ft.Targets, ft.Problems)
	}
	if !strings.HasPrefix(ft.Note, "first run") {
		t.Errorf("failing-target: note %q, want a first-run note", ft.Note)
	}
	after, _ := os.ReadFile(filepath.Join(dir, "failing-target.ipynb"))
	if !bytes.Equal(before, after) {
		t.Error("the re-run wrote the user's notebook without InPlace")
	}
	for _, f := range []string{"failing-target.ipynb", "failing-target.html", "index.html"} {
		if _, err := os.Stat(filepath.Join(out, f)); err != nil {
			t.Errorf("output %s: %v", f, err)
		}
	}
	exec, err := ipynb.Read(filepath.Join(out, "failing-target.ipynb"))
	if err != nil {
		t.Fatal(err)
	}
	if got, _ := record.Targets(exec); len(got) != 2 {
		t.Errorf("executed notebook records %d targets, want 2", len(got))
	}
	meta, _ := os.ReadFile(filepath.Join(out, "failing-target.ipynb"))
	if !bytes.Contains(meta, []byte(`"produced_by": "beamnote `)) {
		t.Error("executed notebook has no beamnote metadata")
	}
	recPath := record.PathFor(filepath.Join(dir, "failing-target.ipynb"))
	rec, err := record.Read(recPath)
	if err != nil || len(rec.Targets) != 2 {
		t.Fatalf("record beside the notebook: %+v, %v", rec, err)
	}
	// The next day someone edits the record's value of the first target
	// (as if the design had changed since): the re-run lists it as moved.
	text, _ := os.ReadFile(recPath)
	edited := strings.Replace(string(text), "100.2 mm", "99.6 mm", 1)
	if err := os.WriteFile(recPath, []byte(edited), 0o644); err != nil {
		t.Fatal(err)
	}
	rs, err = Rerun(l, []string{filepath.Join(dir, "failing-target.ipynb")}, Options{Out: out, Log: &log})
	if err != nil {
		t.Fatal(err)
	}
	if len(rs[0].Changes) != 1 || !strings.Contains(rs[0].Changes[0].String(), "test lens focal length: moved by +0.6 mm (tolerance 0.5 mm) (99.6 mm → 100.2 mm)") {
		t.Errorf("second run changes = %v, want the focal length moved", rs[0].Changes)
	}
}
