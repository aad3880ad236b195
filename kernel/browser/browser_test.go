//go:build linux

package browser

import (
	"bytes"
	"context"
	"crypto/rand"
	"encoding/hex"
	"encoding/json"
	"fmt"
	"io"
	"net"
	"net/http"
	"net/url"
	"os"
	"os/exec"
	"os/signal"
	"path/filepath"
	"slices"
	"strconv"
	"strings"
	"sync"
	"syscall"
	"testing"
	"time"

	"github.com/beamnote/beamnote/kernel/install"
	"github.com/beamnote/beamnote/kernel/ipynb"
	"github.com/beamnote/beamnote/kernel/layout"
	nbrun "github.com/beamnote/beamnote/kernel/run"
	"github.com/beamnote/beamnote/kernel/serve"
	"github.com/beamnote/beamnote/opticslib/optplot"
)

const (
	// kernelTimeout bounds loading a notebook page and starting its kernel.
	kernelTimeout = 2 * time.Minute
	// runTimeout bounds Run All of one notebook. A warm notebook takes
	// seconds; the first cell of a fresh kernel can take about 20 s when
	// the build cache is cold.
	runTimeout = 5 * time.Minute
	// startTimeout bounds the start of the server and of Chromium.
	startTimeout = time.Minute
	// stopTimeout is how long the server and Chromium get to stop before
	// they are killed.
	stopTimeout = 10 * time.Second
	// notebooksVar names the notebooks to run instead of notebooks/*.ipynb:
	// file patterns separated by blanks, relative to the checkout.
	notebooksVar = "BEAMNOTE_BROWSER_NOTEBOOKS"
	// markerVar is the environment variable that tags every process the
	// test starts, and the processes those start.
	markerVar = "BEAMNOTE_BROWSER_TEST"
)

// pageReport is what driver.py prints.
type pageReport struct {
	Error  string `json:"error"`
	UI     string `json:"ui"`
	Kernel struct {
		Name   string `json:"name"`
		Status string `json:"status"`
	} `json:"kernel"`
	Seconds    map[string]float64 `json:"seconds"`
	Cells      []pageCell         `json:"cells"`
	Notebook   json.RawMessage    `json:"notebook"`
	Live       []liveReport       `json:"live"`
	Exceptions []string           `json:"exceptions"`
	Console    []string           `json:"console"`
	Warnings   []string           `json:"warnings"`
	Screenshot *struct {
		Path          string `json:"path"`
		Width, Height int
	} `json:"screenshot"`
}

// liveReport is what the driver did with one live what-if (kernel/nb/live):
// its moves, bursts and done.
type liveReport struct {
	ID      string `json:"id"`
	Cell    int    `json:"cell"`
	Sliders []struct {
		Name string `json:"name"`
		N    int    `json:"n"`
	} `json:"sliders"`
	Moves  []liveMove `json:"moves"`
	Bursts []liveMove `json:"bursts"`
	Done   bool       `json:"done"`
	Ended  string     `json:"ended"`
	Error  string     `json:"error"`
}

// liveMove is one move (or a burst of moves) of a slider and the figure's
// answer: ms from the input event to the new figure in the page's DOM,
// PaintedMS two animation frames later.
type liveMove struct {
	Slider    int     `json:"slider"`
	To        int     `json:"to"`
	Moves     int     `json:"moves"` // a burst's input events
	Want      string  `json:"want"`  // the value the figure must name
	MS        float64 `json:"ms"`
	PaintedMS float64 `json:"painted_ms"`
	Changed   bool    `json:"changed"`
	Updates   int     `json:"updates"` // figures shown meanwhile
	Error     string  `json:"error"`
}

// pageCell is one cell as the page shows it.
type pageCell struct {
	Index          int       `json:"index"`
	Type           string    `json:"type"`
	Source         string    `json:"source"`
	ExecutionCount *int      `json:"execution_count"`
	Prompt         string    `json:"prompt"`
	Running        bool      `json:"running"`
	Errors         []string  `json:"errors"`
	Stderr         []string  `json:"stderr"`
	Stdout         []string  `json:"stdout"`
	SVGs           []pageSVG `json:"svgs"`
}

// pageSVG is one inline <svg> element of a cell's outputs.
type pageSVG struct {
	Width         float64  `json:"width"`
	Height        float64  `json:"height"`
	Texts         int      `json:"texts"`
	HasFigureText bool     `json:"has_figure_text"`
	Caption       string   `json:"caption"`
	CutText       []string `json:"cut_text"`
	Fonts         []string `json:"fonts"`
}

// TestBrowserRunAll opens every notebook of notebooks/ (a temporary copy,
// so the files are never written) in headless Chromium, served by the
// notebook server as `beamnote-kernel serve` starts it, runs all cells from
// the page and checks what the page shows; see the package documentation.
// Each notebook is a subtest named after its file.
func TestBrowserRunAll(t *testing.T) {
	browse(t, func(root string) ([]string, error) { return notebookList(root, os.Getenv(notebooksVar)) }, nil)
}

// sliderNotebook is the notebook of TestBrowserSlider, relative to the
// checkout: the test notebook of kernel/nb/live (its headless run is
// kernel/nb/live's TestSliderCellHeadless).
var sliderNotebook = filepath.Join("kernel", "nb", "live", "testdata", "slider.ipynb")

// TestBrowserSlider runs the live what-if notebook of kernel/nb/live in the
// browser: the driver moves its slider (setting the range input's value
// and dispatching input and change events, as a drag does), checks that
// each move replaces the figure with one drawn at the new value, sends a
// burst of moves that must end at its last value, presses done, and the
// cell must complete with the controls replaced by their end line and the
// last figure kept. The round trip from a move to the new figure in the
// page is logged (go test -v); it is a measurement, not a pass mark.
func TestBrowserSlider(t *testing.T) {
	browse(t, func(root string) ([]string, error) {
		return notebookList(root, sliderNotebook)
	}, func(t *testing.T, name string, rep *pageReport) {
		if len(rep.Live) == 0 {
			t.Fatalf("%s: the driver met no live slider (no .beamnote-live controls went live)", name)
		}
		for _, lv := range rep.Live {
			if len(lv.Moves) < 4 || len(lv.Bursts) == 0 {
				t.Errorf("%s: cell %d: %d moves and %d bursts, want at least 4 and 1", name, lv.Cell, len(lv.Moves), len(lv.Bursts))
			}
		}
		var nb ipynb.Notebook
		if err := json.Unmarshal(rep.Notebook, &nb); err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		lv := rep.Live[0]
		if lv.Cell < 0 || lv.Cell >= len(nb.Cells) {
			t.Fatalf("%s: live cell index %d", name, lv.Cell)
		}
		// The notebook as the page holds it (what a save writes): the end
		// line in place of the controls, the figure at the last value.
		last := lv.Bursts[len(lv.Bursts)-1].Want
		var ended, figure bool
		for _, o := range nb.Cells[lv.Cell].Outputs {
			text := ipynb.Text(o.Data["text/plain"])
			if strings.Contains(text, "live what-if ended (done)") && strings.HasPrefix(text, last) {
				ended = true
			}
			if _, ok := o.Data["image/svg+xml"]; ok && strings.HasSuffix(text, "· "+last+"]") {
				figure = true
			}
			if h := ipynb.Text(o.Data["text/html"]); strings.Contains(h, `data-state="`) {
				t.Errorf("%s: cell %d keeps its live controls after done", name, lv.Cell)
			}
		}
		if !ended || !figure {
			t.Errorf("%s: cell %d after done: end line %v, figure at %q %v; outputs %s", name, lv.Cell, ended, last, figure, outputTexts(nb.Cells[lv.Cell]))
		}
	})
}

// outputTexts lists the text/plain of a cell's outputs, for messages.
func outputTexts(c ipynb.Cell) string {
	var ts []string
	for _, o := range c.Outputs {
		ts = append(ts, clip(ipynb.Text(o.Data["text/plain"])+ipynb.Text(o.Text)))
	}
	return strings.Join(ts, " | ")
}

// browse starts the notebook server and Chromium, and runs each notebook
// that list returns (given the checkout's root) as a subtest: Run All from
// the page, checkReport, then more, if not nil.
func browse(t *testing.T, list func(root string) ([]string, error), more func(t *testing.T, name string, rep *pageReport)) {
	if testing.Short() {
		t.Skip("starts a notebook server, kernels and Chromium")
	}
	ci := os.Getenv("CI") == "true"
	missing := func(format string, args ...any) {
		t.Helper()
		msg := fmt.Sprintf(format, args...)
		if ci {
			t.Fatalf("%s (CI=true: the browser test must run)", msg)
		}
		t.Skip(msg)
	}
	l, err := layout.FindLayout(".")
	if err != nil {
		t.Fatal(err)
	}
	if _, err := os.Stat(filepath.Join(layout.KernelDir(l.JupyterData()), "kernel.json")); err != nil || layout.Jupyter() == "" {
		missing("beamnote kernel not installed in %s (run make kernel)", l.State)
	}
	if err := install.CheckKernelspec(l, false); err != nil {
		missing("beamnote kernelspec unusable (run make kernel): %v", err)
	}
	chromium := os.Getenv("BEAMNOTE_CHROMIUM")
	if chromium == "" {
		chromium = "/usr/bin/chromium"
	}
	if st, err := os.Stat(chromium); err != nil || st.IsDir() || st.Mode()&0o111 == 0 {
		missing("no Chromium at %s (Debian: apt-get install chromium, or run kernel/install-deps.sh; BEAMNOTE_CHROMIUM names another binary)", chromium)
	}
	py := layout.Python()
	if py == "" {
		missing("no python3 for the browser driver")
	}
	if out, err := exec.Command(py, "-c", "import tornado.websocket").CombinedOutput(); err != nil {
		lines := strings.Split(strings.TrimSpace(string(out)), "\n")
		missing("%s cannot import tornado.websocket (Debian: apt-get install python3-tornado): %v: %s", py, err, lines[len(lines)-1])
	}
	driver, err := filepath.Abs("driver.py")
	if err != nil {
		t.Fatal(err)
	}
	trackInputs(t, l.Root, driver)
	notebooks, err := list(l.Root)
	if err != nil {
		t.Fatal(err)
	}
	artefacts := filepath.Join(l.Root, "build", "browser")
	if err := os.MkdirAll(artefacts, 0o755); err != nil {
		t.Fatalf("artefact directory: %v", err)
	}

	// The whole run must end, cleaned up, before go test's own timeout
	// kills the test binary (which would leave the process groups behind).
	ctx := context.Background()
	if d, ok := t.Deadline(); ok {
		var cancel context.CancelFunc
		ctx, cancel = context.WithDeadline(ctx, d.Add(-30*time.Second))
		defer cancel()
	}

	r := newRun(t)
	work := r.work
	served := filepath.Join(work, "notebooks")
	if err := os.Mkdir(served, 0o755); err != nil {
		t.Fatal(err)
	}
	for _, nb := range notebooks {
		b, err := os.ReadFile(nb)
		if err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(filepath.Join(served, filepath.Base(nb)), b, 0o644); err != nil {
			t.Fatalf("copying %s: %v", nb, err)
		}
	}
	// The notebooks' data files (data/ beside them), which cells open by
	// relative path.
	copied := map[string]bool{}
	for _, nb := range notebooks {
		data := filepath.Join(filepath.Dir(nb), "data")
		if st, err := os.Stat(data); err != nil || !st.IsDir() || copied[data] {
			continue
		}
		copied[data] = true
		if err := os.CopyFS(filepath.Join(served, "data"), os.DirFS(data)); err != nil {
			t.Fatalf("copying %s: %v", data, err)
		}
	}

	start := time.Now()
	srv := r.startServer(ctx, l, served, work, artefacts)
	devtools := r.startChromium(ctx, chromium, work, artefacts)
	t.Logf("notebook server %s and Chromium ready after %.1f s", srv.base, time.Since(start).Seconds())

	for _, nb := range notebooks {
		name := strings.TrimSuffix(filepath.Base(nb), ".ipynb")
		t.Run(name, func(t *testing.T) {
			if ctx.Err() != nil {
				t.Fatalf("no time left before the test deadline to run %s", name)
			}
			src, err := os.ReadFile(nb)
			if err != nil {
				t.Fatal(err)
			}
			defer srv.shutdownKernels(t, filepath.Base(nb))
			rep := r.runNotebook(ctx, t, py, driver, devtools, srv, filepath.Base(nb), artefacts)
			checkReport(t, name, rep, bytes.Contains(src, []byte("optplot.Caustic(")), artefacts)
			if more != nil {
				more(t, name, rep)
			}
		})
	}
	t.Logf("%d notebook(s) in %.1f s; screenshots in %s", len(notebooks), time.Since(start).Seconds(), artefacts)
}

// trackInputs looks at the files that the result depends on beyond this
// package's imports: the driver, and the Go code that the notebooks' cells
// compile (kernel/nb, opticslib, go.mod, go.sum). go test caches a test's
// result until a file that the test opened or looked at changes, so a
// change there now reruns the test as a change of the notebooks does.
func trackInputs(t *testing.T, root string, files ...string) {
	for _, f := range append(files, filepath.Join(root, "go.mod"), filepath.Join(root, "go.sum")) {
		if _, err := os.Stat(f); err != nil {
			t.Fatalf("input of the browser test: %v", err)
		}
	}
	for _, dir := range []string{filepath.Join(root, "kernel", "nb"), filepath.Join(root, "opticslib")} {
		err := filepath.WalkDir(dir, func(path string, d os.DirEntry, err error) error {
			if err == nil && !d.IsDir() {
				_, err = os.Stat(path)
			}
			return err
		})
		if err != nil {
			t.Fatalf("input of the browser test: %v", err)
		}
	}
}

// notebookList returns the notebooks that patterns (blank-separated
// file patterns relative to root; notebooks/*.ipynb if empty) match, or an
// error if they match none or two files with the same name, whose
// artefacts would overwrite each other's.
func notebookList(root, patterns string) ([]string, error) {
	if strings.TrimSpace(patterns) == "" {
		patterns = filepath.Join("notebooks", "*.ipynb")
	}
	var list []string
	names := map[string]string{}
	for _, p := range strings.Fields(patterns) {
		if !filepath.IsAbs(p) {
			p = filepath.Join(root, p)
		}
		m, err := filepath.Glob(p)
		if err != nil {
			return nil, fmt.Errorf("%s=%q: %w", notebooksVar, patterns, err)
		}
		for _, nb := range m {
			if prev, ok := names[filepath.Base(nb)]; ok && prev != nb {
				return nil, fmt.Errorf("%s and %s have the same file name; their artefacts would overwrite each other's", prev, nb)
			} else if !ok {
				names[filepath.Base(nb)] = nb
				list = append(list, nb)
			}
		}
	}
	if len(list) == 0 {
		return nil, fmt.Errorf("no notebooks match %q (in %s)", patterns, root)
	}
	return list, nil
}

// runNotebook runs driver.py on one notebook of srv and decodes its report.
// It fails t if the driver gives no report.
func (r *run) runNotebook(ctx context.Context, t *testing.T, py, driver, devtools string, srv *server, file, artefacts string) *pageReport {
	name := strings.TrimSuffix(file, ".ipynb")
	shot := filepath.Join(artefacts, name+".png")
	// Not an earlier run's.
	os.Remove(shot)
	os.Remove(filepath.Join(artefacts, name+".ipynb"))
	page := srv.base + "/notebooks/" + url.PathEscape(file) + "?token=" + url.QueryEscape(srv.token)
	cmd := exec.CommandContext(ctx, py, driver,
		"--devtools", devtools, "--url", page, "--screenshot", shot,
		"--figure-text", optplot.YLabel,
		"--kernel-timeout", strconv.Itoa(int(kernelTimeout.Seconds())),
		"--run-timeout", strconv.Itoa(int(runTimeout.Seconds())))
	cmd.Env = layout.Environ(map[string]string{markerVar: r.marker})
	cmd.SysProcAttr = &syscall.SysProcAttr{Setpgid: true}
	cmd.Cancel = func() error { return syscall.Kill(-cmd.Process.Pid, syscall.SIGKILL) }
	cmd.WaitDelay = 5 * time.Second
	var stdout, stderr bytes.Buffer
	cmd.Stdout, cmd.Stderr = &stdout, &stderr
	start := time.Now()
	runErr := cmd.Run()
	var rep pageReport
	if err := json.Unmarshal(stdout.Bytes(), &rep); err != nil {
		t.Fatalf("%s: driver.py gave no report (%v; exit: %v); stderr:\n%s", name, err, runErr, stderr.Bytes())
	}
	t.Logf("%s: %s front-end, kernel %q; page %.1f s, kernel ready %.1f s, Run All %.1f s; %.1f s in all",
		name, rep.UI, rep.Kernel.Name, rep.Seconds["load"], rep.Seconds["kernel"], rep.Seconds["run_all"], time.Since(start).Seconds())
	if e := bytes.TrimSpace(stderr.Bytes()); len(e) > 0 {
		t.Logf("%s: driver.py stderr:\n%s", name, e)
	}
	if len(rep.Notebook) > 0 && string(rep.Notebook) != "null" {
		var buf bytes.Buffer
		if err := json.Indent(&buf, rep.Notebook, "", " "); err == nil {
			if err := os.WriteFile(filepath.Join(artefacts, name+".ipynb"), buf.Bytes(), 0o644); err != nil {
				t.Errorf("%s: saving the notebook as the page holds it: %v", name, err)
			}
		}
	}
	return &rep
}

// checkReport fails t for every problem that rep shows: a driver error, a
// code cell without an execution count, an error output or "error:" line
// on the page, a problem of run.CheckExecuted in the notebook as the page
// holds it, a JavaScript exception, no inline figure, and no caustic figure
// when wantCaustic. Text cut off at a figure's edge is logged.
func checkReport(t *testing.T, name string, rep *pageReport, wantCaustic bool, artefacts string) {
	if rep.Screenshot != nil {
		t.Logf("%s: screenshot %s (%d×%d px)", name, rep.Screenshot.Path, rep.Screenshot.Width, rep.Screenshot.Height)
		if b, err := os.ReadFile(rep.Screenshot.Path); err != nil || !bytes.HasPrefix(b, []byte("\x89PNG\r\n\x1a\n")) {
			t.Errorf("%s: the screenshot %s is not a PNG file (%v)", name, rep.Screenshot.Path, err)
		}
	} else {
		t.Errorf("%s: no screenshot taken", name)
	}
	for _, w := range rep.Warnings {
		t.Logf("%s: driver: %s", name, w)
	}
	for _, c := range rep.Console {
		t.Logf("%s: browser console: %s", name, c)
	}
	if rep.Error != "" {
		t.Fatalf("%s: %s (page state in %s)", name, rep.Error, filepath.Join(artefacts, name+".png"))
	}
	if rep.Kernel.Name != layout.KernelName {
		t.Errorf("%s: the page runs kernel %q, want %q", name, rep.Kernel.Name, layout.KernelName)
	}
	for _, e := range rep.Exceptions {
		t.Errorf("%s: the page threw a JavaScript exception: %s", name, e)
	}
	figures, caustics := 0, 0
	code := 0
	for _, c := range rep.Cells {
		if c.Type != "code" {
			continue
		}
		code++
		where := fmt.Sprintf("%s: cell %d (%s)", name, c.Index, firstLine(c.Source))
		if c.ExecutionCount == nil && strings.TrimSpace(c.Source) != "" {
			t.Errorf("%s: has no execution count (prompt %q): it did not run", where, c.Prompt)
		}
		for _, e := range c.Errors {
			t.Errorf("%s: shows an error output: %s", where, clip(strings.Join(strings.Fields(e), " ")))
		}
		for _, stream := range []struct {
			name  string
			texts []string
		}{{"stderr", c.Stderr}, {"stdout", c.Stdout}} {
			for _, s := range stream.texts {
				if m := nbrun.ErrorLine(s); m != "" {
					t.Errorf("%s: shows an error line on %s: %s", where, stream.name, strings.TrimSpace(m))
				}
			}
		}
		for _, s := range c.SVGs {
			if s.Width < 1 || s.Height < 1 || s.Texts == 0 {
				t.Errorf("%s: an inline <svg> is not rendered: %.0f×%.0f px, %d text elements", where, s.Width, s.Height, s.Texts)
				continue
			}
			figures++
			if s.HasFigureText {
				caustics++
			}
			for _, cut := range s.CutText {
				t.Logf("%s: rendering: figure text drawn past the figure's edge (fonts %s; [left, right, top, bottom] margins in px): %s",
					where, strings.Join(s.Fonts, ", "), cut)
			}
		}
	}
	if code == 0 {
		t.Errorf("%s: the page shows no code cell", name)
	}
	checkLive(t, name, rep.Live)
	var nb ipynb.Notebook
	if err := json.Unmarshal(rep.Notebook, &nb); err != nil {
		t.Errorf("%s: the notebook from the page is not nbformat JSON: %v", name, err)
	} else {
		for _, p := range nbrun.CheckExecuted(nb) {
			t.Errorf("%s (notebook as the page holds it): %s", name, p)
		}
	}
	if figures == 0 {
		t.Errorf("%s: the page shows no inline <svg> figure", name)
	}
	if wantCaustic && caustics == 0 {
		t.Errorf("%s: the notebook calls optplot.Caustic but the page shows no inline <svg> with %q", name, optplot.YLabel)
	}
	t.Logf("%s: %d code cells ran, %d inline figures (%d caustics)", name, code, figures, caustics)
}

// checkLive fails t for a live what-if whose figure did not follow a move,
// whose burst did not end at its last value, or that did not end on done;
// it logs the round trips (move → new figure in the page).
func checkLive(t *testing.T, name string, lives []liveReport) {
	t.Helper()
	for _, lv := range lives {
		where := fmt.Sprintf("%s: live what-if in cell %d", name, lv.Cell)
		var ms, painted []float64
		for _, m := range lv.Moves {
			switch {
			case m.Error != "":
				t.Errorf("%s: move of slider %d to %d: %s", where, m.Slider, m.To, m.Error)
			case !m.Changed:
				t.Errorf("%s: move of slider %d to %d: the figure names %q but did not change", where, m.Slider, m.To, m.Want)
			default:
				ms, painted = append(ms, m.MS), append(painted, m.PaintedMS)
			}
		}
		for _, b := range lv.Bursts {
			if b.Error != "" {
				t.Errorf("%s: burst of %d moves of slider %d: %s", where, b.Moves, b.Slider, b.Error)
				continue
			}
			t.Logf("%s: a burst of %d moves (one drag) ended at %q after %.0f ms, with %d figures drawn meanwhile (only the latest position is drawn)",
				where, b.Moves, b.Want, b.MS, b.Updates)
		}
		if !lv.Done || lv.Ended == "" {
			t.Errorf("%s: done did not end it (pressed %v; %s)", where, lv.Done, lv.Error)
		} else {
			t.Logf("%s: after done: %s", where, strings.TrimSpace(lv.Ended))
		}
		if len(ms) > 0 {
			t.Logf("%s: round trip, slider move → new figure in the page, %d moves: median %.0f ms (min %.0f, max %.0f); painted: median %.0f ms (max %.0f)",
				where, len(ms), median(ms), slices.Min(ms), slices.Max(ms), median(painted), slices.Max(painted))
		}
	}
}

// median is the median of xs (not empty).
func median(xs []float64) float64 {
	s := slices.Sorted(slices.Values(xs))
	if n := len(s); n%2 == 1 {
		return s[n/2]
	}
	return (s[len(s)/2-1] + s[len(s)/2]) / 2
}

// firstLine is the first line of a cell that says what it does, shortened.
func firstLine(src string) string {
	for _, l := range strings.Split(src, "\n") {
		if l = strings.TrimSpace(l); l != "" && l != "%%" {
			return clip(l)
		}
	}
	return ""
}

// clip shortens s to its first line and at most 100 runes.
func clip(s string) string {
	s = strings.TrimSpace(s)
	if i := strings.IndexByte(s, '\n'); i >= 0 {
		s = s[:i] + " …"
	}
	if r := []rune(s); len(r) > 100 {
		s = string(r[:97]) + "..."
	}
	return s
}

// run owns the processes of one test run: it tags them with a marker in
// their environment and kills them all at the end.
type run struct {
	t      *testing.T
	marker string // markerVar=marker in every process started
	work   string // temporary directory, removed at the end
	mu     sync.Mutex
	groups []*group
}

// group is a process started as the leader of a process group of its own.
type group struct {
	name string
	cmd  *exec.Cmd
	done chan struct{} // closed when the process has exited
	err  error         // its exit, once done is closed
	stop func()        // asks it to stop (a graceful shutdown), or nil
}

// newRun returns a run with a new temporary directory, whose processes
// are stopped and killed, and the directory removed, when t ends, or when
// the test binary gets SIGINT, SIGTERM or SIGHUP (the processes are in
// process groups of their own, so a terminal's Ctrl-C does not reach them).
func newRun(t *testing.T) *run {
	b := make([]byte, 8)
	if _, err := rand.Read(b); err != nil {
		t.Fatal(err)
	}
	work, err := os.MkdirTemp("", "beamnote-browser-")
	if err != nil {
		t.Fatal(err)
	}
	r := &run{t: t, marker: hex.EncodeToString(b), work: work}
	sigs := make(chan os.Signal, 1)
	signal.Notify(sigs, os.Interrupt, syscall.SIGTERM, syscall.SIGHUP)
	quit := make(chan struct{})
	go func() {
		select {
		case sig := <-sigs:
			left := r.killMarked()
			fmt.Fprintf(os.Stderr, "TestBrowserRunAll: %v: killed the notebook server, kernels and Chromium", sig)
			if len(left) > 0 {
				fmt.Fprintf(os.Stderr, " (still running: %s)", strings.Join(left, "; "))
			}
			fmt.Fprintln(os.Stderr)
			os.RemoveAll(r.work)
			// At once, before the test goes on against dead processes;
			// the status a shell reports for death by that signal.
			os.Exit(128 + int(sig.(syscall.Signal)))
		case <-quit:
		}
	}()
	t.Cleanup(func() {
		signal.Stop(sigs)
		close(quit)
		r.cleanup()
		if err := os.RemoveAll(r.work); err != nil {
			t.Errorf("removing the temporary directory: %v", err)
		}
	})
	return r
}

// start starts argv with the current environment plus env and the marker,
// its output going to log, in a process group of its own.
func (r *run) start(name string, argv []string, env map[string]string, log io.Writer) (*group, error) {
	e := map[string]string{markerVar: r.marker}
	for k, v := range env {
		e[k] = v
	}
	cmd := exec.Command(argv[0], argv[1:]...)
	cmd.Env = layout.Environ(e)
	cmd.Stdout, cmd.Stderr = log, log
	cmd.SysProcAttr = &syscall.SysProcAttr{Setpgid: true}
	if err := cmd.Start(); err != nil {
		return nil, fmt.Errorf("starting %s (%s): %w", name, argv[0], err)
	}
	g := &group{name: name, cmd: cmd, done: make(chan struct{})}
	go func() { g.err = cmd.Wait(); close(g.done) }()
	r.mu.Lock()
	r.groups = append(r.groups, g)
	r.mu.Unlock()
	return g, nil
}

// cleanup stops every group gracefully (stop, then SIGTERM to the group),
// waits up to stopTimeout, then kills whatever still carries the marker or
// descends from the test, and fails the test if a process survives.
func (r *run) cleanup() {
	r.mu.Lock()
	groups := slices.Clone(r.groups)
	r.mu.Unlock()
	// The server first: it shuts its kernels down while it is still up.
	for _, g := range groups {
		if g.stop != nil {
			g.stop()
		}
		syscall.Kill(-g.cmd.Process.Pid, syscall.SIGTERM)
		select {
		case <-g.done:
		case <-time.After(stopTimeout):
			r.t.Logf("%s (pid %d) did not stop within %v of SIGTERM; killing it", g.name, g.cmd.Process.Pid, stopTimeout)
		}
	}
	if left := r.killMarked(); len(left) > 0 {
		r.t.Errorf("processes still running after the test killed them: %s", strings.Join(left, "; "))
	}
}

// killMarked sends SIGKILL to every process (and its process group) that
// carries the marker in its environment or descends from the test binary,
// waits up to 5 s for them to go, and returns those still running.
func (r *run) killMarked() []string {
	self, pgrp := os.Getpid(), syscall.Getpgrp()
	targets := r.ours(self)
	for _, p := range targets {
		if p.pgrp != pgrp && p.pgrp > 1 {
			syscall.Kill(-p.pgrp, syscall.SIGKILL)
		}
		syscall.Kill(p.pid, syscall.SIGKILL)
	}
	r.mu.Lock()
	for _, g := range r.groups {
		syscall.Kill(-g.cmd.Process.Pid, syscall.SIGKILL)
	}
	r.mu.Unlock()
	deadline := time.Now().Add(5 * time.Second)
	for {
		var left []string
		for _, p := range targets {
			if q, ok := readProc(p.pid); ok && q.start == p.start && q.state != 'Z' && q.state != 'X' {
				left = append(left, fmt.Sprintf("%d (%s)", p.pid, p.comm))
			}
		}
		if len(left) == 0 || time.Now().After(deadline) {
			return left
		}
		time.Sleep(100 * time.Millisecond)
	}
}

// proc is what the test reads of a process from /proc/<pid>/stat (proc(5)).
type proc struct {
	pid, ppid, pgrp int
	state           byte
	comm            string
	start           string // start time in clock ticks after boot, to tell a reused pid
}

// readProc reads /proc/<pid>/stat.
func readProc(pid int) (proc, bool) {
	b, err := os.ReadFile(fmt.Sprintf("/proc/%d/stat", pid))
	if err != nil {
		return proc{}, false
	}
	// comm is in parentheses and may itself contain spaces or parentheses.
	i, j := bytes.IndexByte(b, '('), bytes.LastIndexByte(b, ')')
	if i < 0 || j < i {
		return proc{}, false
	}
	f := strings.Fields(string(b[j+1:])) // state ppid pgrp session ... starttime is field 22 of stat
	if len(f) < 20 {
		return proc{}, false
	}
	p := proc{pid: pid, state: f[0][0], comm: string(b[i+1 : j]), start: f[19]}
	p.ppid, _ = strconv.Atoi(f[1])
	p.pgrp, _ = strconv.Atoi(f[2])
	return p, true
}

// ours lists the live processes, other than self, that carry the marker in
// their environment or descend from self.
func (r *run) ours(self int) []proc {
	dirs, _ := os.ReadDir("/proc")
	all := map[int]proc{}
	children := map[int][]int{}
	for _, d := range dirs {
		pid, err := strconv.Atoi(d.Name())
		if err != nil || pid == self {
			continue
		}
		if p, ok := readProc(pid); ok && p.state != 'Z' {
			all[pid] = p
			children[p.ppid] = append(children[p.ppid], pid)
		}
	}
	mark := []byte(markerVar + "=" + r.marker + "\x00")
	picked := map[int]bool{}
	for pid := range all {
		env, err := os.ReadFile(fmt.Sprintf("/proc/%d/environ", pid))
		if err == nil && (bytes.HasPrefix(env, mark) || bytes.Contains(env, append([]byte{0}, mark...))) {
			picked[pid] = true
		}
	}
	for queue := slices.Clone(children[self]); len(queue) > 0; queue = queue[1:] {
		picked[queue[0]] = true
		queue = append(queue, children[queue[0]]...)
	}
	var out []proc
	for pid := range picked {
		if p, ok := all[pid]; ok {
			out = append(out, p)
		}
	}
	return out
}

// server is a running notebook server.
type server struct {
	base, token string
	log         string
}

// startServer starts the notebook server that `beamnote-kernel serve`
// starts (serve.Command) on a free loopback port, serving dir,
// with Jupyter's per-user configuration and runtime files in work (so that a
// password or extension of the user's does not change the page, and the
// connection files stay out of .beamnote), and waits until it answers.
func (r *run) startServer(ctx context.Context, l layout.Layout, dir, work, artefacts string) *server {
	t := r.t
	t.Helper()
	logPath := filepath.Join(artefacts, "server.log")
	log, err := os.Create(logPath)
	if err != nil {
		t.Fatalf("server log: %v", err)
	}
	t.Cleanup(func() { log.Close() })
	var lastErr error
	for attempt := 0; attempt < 3; attempt++ { // the free port may be taken meanwhile
		ln, err := net.Listen("tcp", "127.0.0.1:0")
		if err != nil {
			t.Fatalf("finding a free loopback port: %v", err)
		}
		port := ln.Addr().(*net.TCPAddr).Port
		ln.Close()
		argv, env, treeURL, err := serve.Command(l, serve.Options{Port: port, Dir: dir})
		if err != nil {
			t.Fatalf("serve.Command: %v", err)
		}
		env["JUPYTER_CONFIG_DIR"] = filepath.Join(work, "jupyter-config")
		env["JUPYTER_RUNTIME_DIR"] = filepath.Join(work, "jupyter-runtime")
		u, err := url.Parse(treeURL)
		if err != nil {
			t.Fatalf("serve.Command URL %q: %v", treeURL, err)
		}
		srv := &server{base: u.Scheme + "://" + u.Host, token: env["JUPYTER_TOKEN"], log: logPath}
		g, err := r.start("notebook server", argv, env, log)
		if err != nil {
			t.Fatal(err)
		}
		g.stop = func() { srv.shutdownKernels(t, "") }
		wctx, cancel := context.WithTimeout(ctx, startTimeout)
		ready := make(chan error, 1)
		go func() { ready <- serve.WaitServing(wctx, treeURL) }()
		select {
		case err := <-ready:
			cancel()
			if err != nil {
				t.Fatalf("notebook server on port %d: %v (log: %s)", port, err, logPath)
			}
			return srv
		case <-g.done:
			cancel()
			lastErr = fmt.Errorf("the notebook server exited before it answered (%v); log: %s", g.err, logPath)
		}
	}
	t.Fatal(lastErr)
	return nil
}

// shutdownKernels deletes, through the server's REST API (GET and DELETE
// /api/sessions), the session of the notebook file, or every session if
// file is "", which shuts their kernels down.
func (s *server) shutdownKernels(t *testing.T, file string) {
	client := &http.Client{Timeout: 10 * time.Second}
	do := func(method, path string) (*http.Response, error) {
		req, err := http.NewRequest(method, s.base+path, nil)
		if err != nil {
			return nil, err
		}
		req.Header.Set("Authorization", "token "+s.token)
		return client.Do(req)
	}
	resp, err := do(http.MethodGet, "/api/sessions")
	if err != nil {
		t.Logf("listing the notebook sessions: %v", err)
		return
	}
	var sessions []struct {
		ID   string `json:"id"`
		Path string `json:"path"`
	}
	err = json.NewDecoder(resp.Body).Decode(&sessions)
	resp.Body.Close()
	if err != nil {
		t.Logf("listing the notebook sessions: %v", err)
		return
	}
	for _, ss := range sessions {
		if file != "" && ss.Path != file {
			continue
		}
		resp, err := do(http.MethodDelete, "/api/sessions/"+url.PathEscape(ss.ID))
		if err != nil {
			t.Logf("shutting down the kernel of %s: %v", ss.Path, err)
			continue
		}
		resp.Body.Close()
		if resp.StatusCode != http.StatusNoContent {
			t.Logf("shutting down the kernel of %s: status %s", ss.Path, resp.Status)
		}
	}
}

// startChromium starts headless Chromium with a profile in work and
// DevTools on a port it picks, and returns the browser's DevTools websocket
// address, read from the DevToolsActivePort file that Chromium writes in
// its profile directory.
func (r *run) startChromium(ctx context.Context, chromium, work, artefacts string) string {
	t := r.t
	t.Helper()
	profile := filepath.Join(work, "chromium-profile")
	logPath := filepath.Join(artefacts, "chromium.log")
	log, err := os.Create(logPath)
	if err != nil {
		t.Fatalf("Chromium log: %v", err)
	}
	t.Cleanup(func() { log.Close() })
	argv := []string{chromium,
		"--headless=new",
		"--no-sandbox", // root in a container: the sandbox needs user namespaces
		"--disable-gpu",
		"--disable-dev-shm-usage", // containers often have a 64 MB /dev/shm
		"--no-first-run",
		"--no-default-browser-check",
		"--disable-extensions",
		"--disable-background-networking",
		"--disable-component-update",
		"--disable-sync",
		"--hide-scrollbars",
		"--mute-audio",
		"--user-data-dir=" + profile,
		"--remote-debugging-address=127.0.0.1",
		"--remote-debugging-port=0",
		"about:blank",
	}
	// The crash handler keeps its database in XDG_CONFIG_HOME, not in the
	// profile: keep it in work too, out of the user's home.
	env := map[string]string{
		"XDG_CONFIG_HOME": filepath.Join(work, "chromium-config"),
		"XDG_CACHE_HOME":  filepath.Join(work, "chromium-cache"),
	}
	g, err := r.start("Chromium", argv, env, log)
	if err != nil {
		t.Fatal(err)
	}
	portFile := filepath.Join(profile, "DevToolsActivePort")
	deadline := time.Now().Add(startTimeout)
	for {
		// Two lines: the port, then the browser target's path.
		if b, err := os.ReadFile(portFile); err == nil {
			if lines := strings.Split(strings.TrimSpace(string(b)), "\n"); len(lines) == 2 {
				if port, err := strconv.Atoi(lines[0]); err == nil && port > 0 {
					return fmt.Sprintf("ws://127.0.0.1:%d%s", port, strings.TrimSpace(lines[1]))
				}
			}
		}
		select {
		case <-g.done:
			t.Fatalf("Chromium exited before it opened DevTools (%v); log: %s", g.err, logPath)
		case <-ctx.Done():
			t.Fatalf("Chromium: %v before it opened DevTools; log: %s", ctx.Err(), logPath)
		case <-time.After(100 * time.Millisecond):
		}
		if time.Now().After(deadline) {
			t.Fatalf("Chromium wrote no %s within %v; log: %s", portFile, startTimeout, logPath)
		}
	}
}
