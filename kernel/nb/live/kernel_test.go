package live

import (
	"bytes"
	"io"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"github.com/beamnote/beamnote/kernel/internal/kerneltest"
	"github.com/beamnote/beamnote/kernel/ipynb"
	"github.com/beamnote/beamnote/kernel/layout"
	nbrun "github.com/beamnote/beamnote/kernel/run"
)

// The slider cell of testdata/slider.ipynb in the real kernel, without a
// browser. Both need `make kernel` and skip otherwise (kerneltest).

// TestSliderCellHeadless runs the notebook as `make test` runs notebooks
// (beamnote-kernel run -twice -require-figure, BEAMNOTE_HEADLESS=1): the
// slider cell completes at once with no error, its three fixed figures are
// byte-identical in both runs, and the cell after it runs.
func TestSliderCellHeadless(t *testing.T) {
	l := kerneltest.Installed(t)
	nbPath := copyNotebook(t)
	out := t.TempDir()
	var log bytes.Buffer
	start := time.Now()
	rs, err := nbrun.Rerun(l, []string{nbPath}, nbrun.Options{Out: out, Twice: true, RequireFigure: true, CellTimeout: time.Minute, Log: &log})
	if err != nil {
		t.Fatalf("Rerun: %v\n%s", err, log.Bytes())
	}
	if len(rs) != 1 || rs[0].Failed() {
		t.Fatalf("Rerun(slider.ipynb) = %+v\n%s", rs, log.Bytes())
	}
	t.Logf("headless run of slider.ipynb, twice: %.1f s", time.Since(start).Seconds())
	nb, err := ipynb.Read(filepath.Join(out, "slider.ipynb"))
	if err != nil {
		t.Fatal(err)
	}
	cell := sliderCell(t, nb)
	var figs []string
	for _, o := range cell.Outputs {
		if _, ok := o.Data["image/svg+xml"]; ok {
			figs = append(figs, ipynb.Text(o.Data["text/plain"]))
		}
	}
	want := []string{
		"[figure: 5× expander, lens gap 110 mm · L1–L2 gap = 110.0 mm]",
		"[figure: 5× expander, lens gap 120 mm · L1–L2 gap = 120.0 mm]",
		"[figure: 5× expander, lens gap 130 mm · L1–L2 gap = 130.0 mm]",
	}
	if strings.Join(figs, "\n") != strings.Join(want, "\n") {
		t.Errorf("the slider cell's figures %q, want %q", figs, want)
	}
	if !strings.Contains(string(mustRead(t, filepath.Join(out, "slider.ipynb"))), "the cells after the slider ran") {
		t.Error("the cell after the slider did not run")
	}
}

// TestSliderCellNoPage runs the notebook with nbconvert but without
// BEAMNOTE_HEADLESS=1 (as someone might by hand): nothing answers the
// controls, so after gonb's wait for the page (3 s) and HandshakeTimeout
// the cell falls back to the fixed figures and completes with no error.
func TestSliderCellNoPage(t *testing.T) {
	l := kerneltest.Installed(t)
	nbPath := copyNotebook(t)
	dir := t.TempDir()
	env := l.JupyterEnv(false)
	env["BEAMNOTE_HEADLESS"] = "" // not headless as far as the cells know
	cmd := exec.Command(layout.Jupyter(), "nbconvert", "--to", "notebook", "--execute",
		"--ExecutePreprocessor.kernel_name="+layout.KernelName, "--ExecutePreprocessor.timeout=120",
		"--ExecutePreprocessor.startup_timeout=120", "--allow-errors", "--output-dir", dir, "--output", "executed", nbPath)
	cmd.Env = layout.Environ(env)
	var stderr bytes.Buffer
	cmd.Stdout, cmd.Stderr = io.Discard, &stderr
	start := time.Now()
	if err := cmd.Run(); err != nil {
		t.Fatalf("nbconvert: %v\n%s", err, stderr.Bytes())
	}
	took := time.Since(start)
	t.Logf("nbconvert without BEAMNOTE_HEADLESS: %.1f s", took.Seconds())
	nb, err := ipynb.Read(filepath.Join(dir, "executed.ipynb"))
	if err != nil {
		t.Fatal(err)
	}
	for _, p := range nbrun.CheckExecuted(nb) {
		t.Errorf("executed notebook: %s", p)
	}
	cell := sliderCell(t, nb)
	var texts []string
	for _, o := range cell.Outputs {
		texts = append(texts, ipynb.Text(o.Data["text/plain"]))
	}
	all := strings.Join(texts, "\n")
	for _, want := range []string{
		"L1–L2 gap = 120.0 mm · no page answered the controls within 5 s",
		"[figure: 5× expander, lens gap 120 mm · L1–L2 gap = 120.0 mm]",
		"[figure: 5× expander, lens gap 110 mm · L1–L2 gap = 110.0 mm]",
		"[figure: 5× expander, lens gap 130 mm · L1–L2 gap = 130.0 mm]",
	} {
		if !strings.Contains(all, want) {
			t.Errorf("the slider cell's outputs lack %q:\n%s", want, all)
		}
	}
	// The controls' script is transient. (gonb's own connection script
	// stays: gonb erases it only once a page connects.)
	for _, o := range cell.Outputs {
		if h := ipynb.Text(o.Data["text/html"]); strings.Contains(h, "/beamnote/live/") {
			t.Errorf("the controls' script is left in the slider cell's outputs: %.200s", h)
		}
	}
}

// copyNotebook copies testdata/slider.ipynb into a temporary folder (the
// re-run keeps a record beside a notebook that shows targets).
func copyNotebook(t *testing.T) string {
	t.Helper()
	p := filepath.Join(t.TempDir(), "slider.ipynb")
	if err := os.WriteFile(p, mustRead(t, filepath.Join("testdata", "slider.ipynb")), 0o644); err != nil {
		t.Fatal(err)
	}
	return p
}

// sliderCell is the code cell that calls live.Slider.
func sliderCell(t *testing.T, nb ipynb.Notebook) ipynb.Cell {
	t.Helper()
	for _, c := range nb.Cells {
		if c.CellType == "code" && strings.Contains(ipynb.Text(c.Source), "live.Slider(") {
			return c
		}
	}
	t.Fatal("no live.Slider cell in slider.ipynb")
	return ipynb.Cell{}
}

func mustRead(t *testing.T, path string) []byte {
	t.Helper()
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	return b
}
