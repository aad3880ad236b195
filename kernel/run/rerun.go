package run

import (
	"bytes"
	"context"
	"errors"
	"fmt"
	"io"
	"os"
	"os/exec"
	"path/filepath"
	"runtime"
	"slices"
	"strconv"
	"strings"
	"syscall"
	"time"

	"github.com/beamnote/beamnote/internal/atomicfile"
	"github.com/beamnote/beamnote/kernel/ipynb"
	"github.com/beamnote/beamnote/kernel/layout"
	"github.com/beamnote/beamnote/kernel/record"
	"github.com/beamnote/beamnote/opticslib/target"
)

// DefaultCellTimeout is how long one cell may run before the re-run stops
// its notebook: far above any cell of this checkout (the first cell of a
// kernel with an empty build cache takes about 20 s), short enough that a
// hanging cell does not hold the run for long.
const DefaultCellTimeout = 120 * time.Second

// Options are the settings of [Rerun].
type Options struct {
	// Out is the folder for the executed notebooks, their HTML exports
	// and the summary page index.html.
	Out string
	// CellTimeout is how long one cell may run ([DefaultCellTimeout] if
	// 0).
	CellTimeout time.Duration
	// InPlace also writes each executed notebook over the user's file
	// (atomically); without it the user's notebooks are only read.
	InPlace bool
	// User uses the per-user Jupyter data dir's kernelspec.
	User bool
	// RequireFigure makes a notebook without any figure fail (this
	// checkout's notebooks all have one).
	RequireFigure bool
	// Twice runs every notebook a second time and fails it if a recorded
	// target or a figure differs between the two runs.
	Twice bool
	// Log receives the progress and the report ([record.Report]).
	Log io.Writer
}

// Notebooks expands paths into the notebooks to run: a folder stands for
// its *.ipynb files (sorted by name; Jupyter's checkpoint copies left out),
// a file for itself.
func Notebooks(paths []string) ([]string, error) {
	var out []string
	for _, p := range paths {
		st, err := os.Stat(p)
		if err != nil {
			return nil, err
		}
		if !st.IsDir() {
			out = append(out, p)
			continue
		}
		m, err := filepath.Glob(filepath.Join(p, "*.ipynb"))
		if err != nil {
			return nil, err
		}
		slices.Sort(m)
		out = append(out, m...)
	}
	if len(out) == 0 {
		return nil, fmt.Errorf("run: no notebooks in %s", strings.Join(paths, ", "))
	}
	return out, nil
}

// Rerun executes every notebook of paths (see [Notebooks]) headless with
// the beamnote kernel, one after the other, and for each
//
//   - checks its cells ([CheckExecuted]): a cell that does not compile,
//     crashes, exits nonzero or prints an "error:" line, a cell tagged
//     "figure" without one, and (with RequireFigure) a notebook without a
//     figure;
//   - collects the design targets its cells showed (nb.Show of a
//     target.Target) and records them in the executed notebook's metadata
//     ("beamnote": targets, producer);
//   - writes the executed notebook and its HTML export to opt.Out;
//   - compares the targets with the record beside the notebook
//     (record.PathFor) and writes the new record there when a target line
//     changed or there was none (a record whose targets did not change is
//     left as it is, so that its file changes only with the design);
//   - with opt.Twice, runs it again and compares.
//
// A notebook that is not a notebook, was written for another kernel, or
// whose cell hangs past the cell timeout is reported and the others still
// run. Every file is written atomically; the user's notebook only with
// opt.InPlace. The summary page goes to opt.Out/index.html and the report
// to opt.Log. The error is for what stops the whole run (no Jupyter, no
// notebooks, an output folder that cannot be made); the results say what
// failed in each notebook.
func Rerun(l layout.Layout, paths []string, opt Options) ([]record.Result, error) {
	if opt.CellTimeout <= 0 {
		opt.CellTimeout = DefaultCellTimeout
	}
	if opt.Log == nil {
		opt.Log = io.Discard
	}
	jup := layout.Jupyter()
	if jup == "" {
		return nil, errors.New("run: jupyter not found; run kernel/install-deps.sh (Debian/Ubuntu) or see README")
	}
	nbs, err := Notebooks(paths)
	if err != nil {
		return nil, err
	}
	out, err := filepath.Abs(opt.Out)
	if err != nil {
		return nil, err
	}
	if err := os.MkdirAll(out, 0o755); err != nil {
		return nil, fmt.Errorf("run: output folder: %w", err)
	}
	r := rerun{l: l, jup: jup, opt: opt, out: out, producer: record.Producer(l.Root, goVersion(l), time.Now())}
	var results []record.Result
	seen := map[string]string{}
	for _, p := range nbs {
		name := strings.TrimSuffix(filepath.Base(p), ".ipynb")
		if q, ok := seen[name]; ok {
			results = append(results, record.Result{Notebook: p, Problems: []string{"same file name as " + q + ": its results in " + out + " would overwrite the other's"}})
			continue
		}
		seen[name] = p
		fmt.Fprintf(opt.Log, "beamnote: running %s\n", p)
		results = append(results, r.notebook(p, name))
	}
	if err := atomicfile.Write(filepath.Join(out, "index.html"), record.Summary(results, r.producer), 0o644); err != nil {
		return results, fmt.Errorf("run: summary page: %w", err)
	}
	record.Report(opt.Log, results)
	fmt.Fprintf(opt.Log, "beamnote: summary page %s\n", filepath.Join(out, "index.html"))
	return results, nil
}

// rerun is one call of Rerun.
type rerun struct {
	l        layout.Layout
	jup      string
	opt      Options
	out      string
	producer string
}

// goVersion returns the version of the go command that builds the cells.
func goVersion(l layout.Layout) string {
	if out, err := exec.Command(l.RealGo, "env", "GOVERSION").Output(); err == nil {
		return strings.TrimSpace(string(out))
	}
	return runtime.Version()
}

// notebook re-runs the notebook at path (output name name).
func (r *rerun) notebook(path, name string) record.Result {
	res := record.Result{Notebook: path}
	problem := func(format string, args ...any) record.Result {
		res.Problems = append(res.Problems, fmt.Sprintf(format, args...))
		return res
	}
	src, err := ipynb.Read(path)
	if err != nil {
		return problem("%v", err)
	}
	if k := src.Metadata.Kernelspec.Name; k != "" && k != layout.KernelName {
		return problem("written for the kernel %q (%s), not %s: the re-run executes notebooks of the %s kernel only (change the notebook's kernel in Jupyter to run it here)",
			k, src.Metadata.Kernelspec.DisplayName, layout.KernelName, layout.KernelName)
	}
	tmp, err := os.MkdirTemp(r.out, "."+name+".run-*")
	if err != nil {
		return problem("working folder: %v", err)
	}
	defer os.RemoveAll(tmp)
	b, err := r.execute(path, src, tmp)
	if err != nil {
		return problem("%v", err)
	}
	executed, err := ipynb.Parse(b)
	if err != nil {
		return problem("executed notebook: %v", err)
	}
	for _, p := range CheckExecuted(executed) {
		if p == NoFigure && !r.opt.RequireFigure {
			continue
		}
		res.Problems = append(res.Problems, p)
	}
	if res.Targets, err = record.Targets(executed); err != nil {
		return problem("%v", err)
	}
	lines := make([]string, len(res.Targets))
	for i, t := range res.Targets {
		lines[i] = t.RecordLine()
	}
	if b, err = ipynb.SetMetadata(b, "beamnote", map[string]any{"targets": lines, "produced_by": r.producer}); err != nil {
		return problem("recording the targets in the executed notebook: %v", err)
	}
	if r.opt.Twice {
		res.Problems = append(res.Problems, r.again(path, src, tmp, executed)...)
	}
	outNB := filepath.Join(r.out, name+".ipynb")
	if err := atomicfile.Write(outNB, b, 0o644); err != nil {
		return problem("%v", err)
	}
	if err := r.export(outNB, name, tmp); err != nil {
		res.Problems = append(res.Problems, err.Error())
	} else {
		res.Export = name + ".html"
	}
	if html, err := os.ReadFile(filepath.Join(r.out, res.Export)); r.opt.RequireFigure && (err != nil || !bytes.Contains(html, []byte("<svg"))) {
		res.Problems = append(res.Problems, "the HTML export shows no inline SVG figure")
	}
	if r.opt.InPlace {
		if err := atomicfile.Write(path, b, 0o644); err != nil {
			res.Problems = append(res.Problems, "writing the executed notebook over "+path+": "+err.Error())
		}
	}
	r.record(path, &res)
	return res
}

// record keeps res's targets in the record beside the notebook (see
// record.Keep) and notes what moved.
func (r *rerun) record(path string, res *record.Result) {
	rec := target.Record{Source: filepath.Base(path), Producer: r.producer, Targets: res.Targets}
	changes, note, err := record.Keep(record.PathFor(path), rec)
	res.Changes, res.Note = changes, note
	if err != nil {
		res.Problems = append(res.Problems, "record beside the notebook left as it was: "+err.Error())
	}
}

// execute runs the notebook at path with nbconvert into dir and returns
// the executed notebook's bytes. A cell running past the cell timeout, a
// kernel that dies or a run that does not end is an error saying so.
func (r *rerun) execute(path string, src ipynb.Notebook, dir string) ([]byte, error) {
	abs, err := filepath.Abs(path)
	if err != nil {
		return nil, err
	}
	cells := 0
	for _, c := range src.Cells {
		if c.CellType == "code" {
			cells++
		}
	}
	secs := int(r.opt.CellTimeout.Round(time.Second) / time.Second)
	// The whole run: every cell at its limit, plus the kernel's start.
	whole := time.Duration(cells+1)*r.opt.CellTimeout + 2*time.Minute
	var stderr bytes.Buffer
	err = r.nbconvert(&stderr, whole, "--to", "notebook", "--execute",
		"--ExecutePreprocessor.kernel_name="+layout.KernelName,
		"--ExecutePreprocessor.timeout="+strconv.Itoa(max(secs, 1)),
		"--ExecutePreprocessor.startup_timeout=120",
		// Run every cell and report all failures, not only the first.
		"--allow-errors",
		"--output-dir", dir, "--output", "executed", abs)
	if err != nil {
		return nil, nbconvertError(err, stderr.String(), r.opt.CellTimeout, whole)
	}
	return os.ReadFile(filepath.Join(dir, "executed.ipynb"))
}

// errWhole is the error of a run that outlived its whole-run limit.
var errWhole = errors.New("run: the notebook run did not end")

// nbconvert runs jupyter nbconvert with the kernel's Jupyter environment,
// in its own process group so that the kernel it starts is stopped with it
// when the run outlives limit.
func (r *rerun) nbconvert(stderr io.Writer, limit time.Duration, args ...string) error {
	ctx, cancel := context.WithTimeout(context.Background(), limit)
	defer cancel()
	env := r.l.JupyterEnv(r.opt.User)
	env["BEAMNOTE_HEADLESS"] = "1"
	cmd := exec.CommandContext(ctx, r.jup, append([]string{"nbconvert"}, args...)...)
	cmd.Dir = r.l.Root
	cmd.Env = layout.Environ(env)
	cmd.Stdout, cmd.Stderr = io.Discard, io.MultiWriter(stderr, r.opt.Log)
	cmd.SysProcAttr = &syscall.SysProcAttr{Setpgid: true}
	cmd.Cancel = func() error { return syscall.Kill(-cmd.Process.Pid, syscall.SIGKILL) }
	cmd.WaitDelay = 10 * time.Second
	err := cmd.Run()
	if ctx.Err() != nil {
		return errWhole
	}
	return err
}

// nbconvertError says why nbconvert failed, from its standard error.
func nbconvertError(err error, stderr string, cell, whole time.Duration) error {
	switch {
	case errors.Is(err, errWhole):
		return fmt.Errorf("the run did not end within %v and was stopped (cells may wait for input or the kernel may hang)", whole)
	case strings.Contains(stderr, "CellTimeoutError"):
		return fmt.Errorf("a cell ran longer than the cell timeout of %v and the notebook was stopped there: %s", cell, cellPreview(stderr))
	case strings.Contains(stderr, "DeadKernelError"):
		return errors.New("the kernel died while running the notebook")
	case strings.Contains(stderr, "NoSuchKernel"):
		return fmt.Errorf("no %s kernel is installed: run `make kernel`", layout.KernelName)
	}
	return fmt.Errorf("jupyter nbconvert failed (%v): %s", err, lastLine(stderr))
}

// cellPreview returns the cell source nbclient quotes after a timeout, on
// one line.
func cellPreview(stderr string) string {
	_, after, ok := strings.Cut(stderr, "Here is a preview of the cell contents:")
	if !ok {
		return "(no preview of the cell)"
	}
	after = strings.Trim(after, "\n-")
	if i := strings.Index(after, "\n---"); i >= 0 {
		after = after[:i]
	}
	return firstLine(strings.Join(strings.Fields(after), " "))
}

func lastLine(s string) string {
	lines := strings.Split(strings.TrimSpace(s), "\n")
	return strings.TrimSpace(lines[len(lines)-1])
}

// export writes the HTML export of the executed notebook at nb to
// r.out/name.html, through dir.
func (r *rerun) export(nb, name, dir string) error {
	var stderr bytes.Buffer
	if err := r.nbconvert(&stderr, 5*time.Minute, "--to", "html", "--output-dir", dir, "--output", name, nb); err != nil {
		return fmt.Errorf("HTML export failed: %s", lastLine(stderr.String()))
	}
	html, err := os.ReadFile(filepath.Join(dir, name+".html"))
	if err != nil {
		return fmt.Errorf("HTML export: %w", err)
	}
	return atomicfile.Write(filepath.Join(r.out, name+".html"), html, 0o644)
}

// again runs the notebook a second time and returns what differs from the
// first run: recorded targets and figures, which must be identical.
func (r *rerun) again(path string, src ipynb.Notebook, tmp string, first ipynb.Notebook) []string {
	dir := filepath.Join(tmp, "again")
	if err := os.Mkdir(dir, 0o755); err != nil {
		return []string{"second run: " + err.Error()}
	}
	b, err := r.execute(path, src, dir)
	if err != nil {
		return []string{"second run: " + err.Error()}
	}
	second, err := ipynb.Parse(b)
	if err != nil {
		return []string{"second run: " + err.Error()}
	}
	var diffs []string
	t1, _ := record.Targets(first)
	t2, _ := record.Targets(second)
	if !record.SameLines(t1, t2) {
		diffs = append(diffs, fmt.Sprintf("not deterministic: the recorded targets differ between two runs (%s)", firstDifference(t1, t2)))
	}
	f1, f2 := figures(first), figures(second)
	if len(f1) != len(f2) {
		diffs = append(diffs, fmt.Sprintf("not deterministic: %d figures in the first run, %d in the second", len(f1), len(f2)))
	} else {
		for i := range f1 {
			if f1[i].svg != f2[i].svg {
				diffs = append(diffs, fmt.Sprintf("not deterministic: figure %d (cell %d) differs between two runs", i+1, f1[i].cell))
			}
		}
	}
	return diffs
}

func firstDifference(a, b []target.Target) string {
	for i := range min(len(a), len(b)) {
		if a[i].RecordLine() != b[i].RecordLine() {
			return a[i].Name + ": " + a[i].ValueText() + " then " + b[i].ValueText()
		}
	}
	return fmt.Sprintf("%d targets then %d", len(a), len(b))
}

type figure struct {
	cell int
	svg  string
}

// figures returns the notebook's image/svg+xml outputs in order.
func figures(n ipynb.Notebook) []figure {
	var fs []figure
	for i, c := range n.Cells {
		for _, o := range c.Outputs {
			if raw, ok := o.Data["image/svg+xml"]; ok {
				fs = append(fs, figure{cell: i, svg: ipynb.Text(raw)})
			}
		}
	}
	return fs
}
