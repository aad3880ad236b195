package live

import (
	"bytes"
	"encoding/gob"
	"errors"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strings"
	"sync"
	"sync/atomic"
	"syscall"
	"testing"
	"time"

	"github.com/janpfeifer/gonb/gonbui/protocol"

	"github.com/beamnote/beamnote/kernel/nb"
	"github.com/beamnote/beamnote/opticslib/units"
)

// The live loop as a cell program: the test binary runs itself as the
// program of a gonb cell (cellVar names the scenario), and the test plays
// gonb v0.11.4's side of the two named pipes (as nb's own pipe tests do)
// and the page's script: it answers "ready", moves the slider, presses
// done. What it checks is the protocol of doc.go, not timing: the burst
// case asserts only that a burst of moves costs fewer drawings than moves.

const cellVar = "BEAMNOTE_LIVE_TEST_CELL"

func TestMain(m *testing.M) {
	if sc := os.Getenv(cellVar); sc != "" {
		os.Exit(cellProgram(sc))
	}
	os.Exit(m.Run())
}

// testFigure is a stand-in for optplot.Figure: an SVG that names the gap.
type testFigure struct{ gap units.Length }

func (f testFigure) SVG() ([]byte, error) {
	return []byte(fmt.Sprintf(`<svg xmlns="http://www.w3.org/2000/svg" width="10" height="10"><text>%v</text></svg>`, f.gap)), nil
}
func (testFigure) String() string { return "test caustic" }

// cellProgram is the cell of scenario sc; it prints renders=N and returns
// the exit status, 1 with the error on stderr as nb.Check would.
func cellProgram(sc string) int {
	r := Range{Name: "gap", Min: 110 * mm, Max: 130 * mm, Step: mm, Start: 120 * mm}
	var renders atomic.Int32
	render := func(gap units.Length) (nb.SVGer, error) {
		renders.Add(1)
		switch {
		case sc == "burst":
			time.Sleep(30 * time.Millisecond)
		case sc == "error" && gap > 125.5*mm:
			return nil, errors.New("beam: clipped at L2")
		case sc == "starterror":
			return nil, errors.New("paraxial: no such label")
		}
		return testFigure{gap}, nil
	}
	var opts []Option
	switch sc {
	case "idle":
		opts = append(opts, IdleTimeout(300*time.Millisecond))
	case "nopage":
		handshake = 300 * time.Millisecond
	}
	err := Slider(r, render, opts...)
	fmt.Printf("renders=%d\n", renders.Load())
	if err != nil {
		fmt.Fprintf(os.Stderr, "error: %v\n", err)
		return 1
	}
	return 0
}

// output is one output area as gonb would publish it.
type output struct {
	id      string
	data    map[protocol.MIMEType]any
	updates int
}

func (o output) text() string   { s, _ := o.data[protocol.MIMETextPlain].(string); return s }
func (o output) html() string   { s, _ := o.data[protocol.MIMETextHTML].(string); return s }
func (o output) isFigure() bool { _, ok := o.data[protocol.MIMEImageSVG]; return ok }

// fakeGonb is gonb's end of the pipes for one cell program.
type fakeGonb struct {
	mu      sync.Mutex
	outputs []*output
	byID    map[string]*output
	subs    []string // "+address" and "-address" in order
	changed chan struct{}
	scripts chan string // the address of each script, as it comes (the page runs it then)

	emu sync.Mutex
	enc *gob.Encoder

	pid int // the cell program's

	seq, at int // the page's last message and slider position
}

// runCell starts the cell program of scenario sc with env, and serves it.
// page plays the page's script; it gets the cell's address once the
// script has been shown. runCell returns when the program has ended.
func runCell(t *testing.T, sc string, env []string, page func(g *fakeGonb, address string)) (g *fakeGonb, stdout, stderr string, exitErr error) {
	t.Helper()
	dir := t.TempDir()
	toKernel, fromKernel := filepath.Join(dir, "gonb_pipe_1"), filepath.Join(dir, "gonb_pipe_2")
	for _, p := range []string{toKernel, fromKernel} {
		if err := syscall.Mkfifo(p, 0o600); err != nil {
			t.Skipf("named pipes unavailable: %v", err)
		}
	}
	// O_RDWR: neither open waits for the program, which may never open
	// the pipes (Linux fifo(7)).
	r, err := os.OpenFile(toKernel, os.O_RDWR, 0)
	if err != nil {
		t.Fatal(err)
	}
	w, err := os.OpenFile(fromKernel, os.O_RDWR, 0)
	if err != nil {
		t.Fatal(err)
	}
	defer w.Close()
	g = &fakeGonb{byID: map[string]*output{}, changed: make(chan struct{}, 1), scripts: make(chan string, 8), enc: gob.NewEncoder(w)}

	cmd := exec.Command(os.Args[0], "-test.run=^$")
	// No second of sleep at exit under -race.
	cmd.Env = append(os.Environ(), "GORACE=atexit_sleep_ms=0", cellVar+"="+sc, protocol.GONB_PIPE_ENV+"="+toKernel, protocol.GONB_PIPE_BACK_ENV+"="+fromKernel)
	cmd.Env = append(cmd.Env, env...)
	var out, errb bytes.Buffer
	cmd.Stdout, cmd.Stderr = &out, &errb
	if err := cmd.Start(); err != nil {
		t.Fatal(err)
	}
	g.pid = cmd.Process.Pid
	served := make(chan struct{})
	go func() { defer close(served); g.serve(r) }()
	if page != nil {
		go func() {
			if address, ok := g.waitScript(10 * time.Second); ok {
				page(g, address)
			}
		}()
	}
	waited := make(chan error, 1)
	go func() { waited <- cmd.Wait() }()
	select {
	case exitErr = <-waited:
	case <-time.After(60 * time.Second):
		cmd.Process.Kill()
		exitErr = <-waited
		t.Errorf("scenario %s: the cell program did not end within 60 s", sc)
	}
	r.Close()
	<-served
	return g, out.String(), errb.String(), exitErr
}

// serve reads the program's messages: it acknowledges syncs, records
// subscriptions and outputs (an id seen before updates its output).
func (g *fakeGonb) serve(r *os.File) {
	dec := gob.NewDecoder(r)
	for {
		var d protocol.DisplayData
		if err := dec.Decode(&d); err != nil {
			return
		}
		if v, ok := d.Data[protocol.MIMECommValue]; ok {
			if req, ok := v.(protocol.CommValue); ok && req.Address == protocol.GonbuiSyncAddress {
				g.send(&protocol.CommValue{Address: protocol.GonbuiSyncAckAddress, Value: req.Value})
			}
			continue
		}
		if h, ok := d.Data[protocol.MIMETextHTML].(string); ok {
			if m := addressRE.FindStringSubmatch(h); m != nil {
				g.scripts <- m[1]
			}
		}
		g.mu.Lock()
		if v, ok := d.Data[protocol.MIMECommSubscribe]; ok {
			if s, ok := v.(protocol.CommSubscription); ok {
				sign := "+"
				if s.Unsubscribe {
					sign = "-"
				}
				g.subs = append(g.subs, sign+s.Address)
			}
		} else if o := g.byID[d.DisplayID]; o != nil && d.DisplayID != "" {
			o.data = d.Data
			o.updates++
		} else {
			o := &output{id: d.DisplayID, data: d.Data}
			g.outputs = append(g.outputs, o)
			if d.DisplayID != "" {
				g.byID[d.DisplayID] = o
			}
		}
		g.mu.Unlock()
		select {
		case g.changed <- struct{}{}:
		default:
		}
	}
}

// send writes one value to the program, as gonb forwards the page's.
func (g *fakeGonb) send(v *protocol.CommValue) {
	g.emu.Lock()
	defer g.emu.Unlock()
	_ = g.enc.Encode(v)
}

// say is the page's script sending msg to address.
func (g *fakeGonb) say(address, msg string) {
	g.send(&protocol.CommValue{Address: address, Value: msg})
}

// move is the page's script moving the slider to position k (the next
// message).
func (g *fakeGonb) move(address string, k int) {
	g.seq++
	g.at = k
	g.say(address, fmt.Sprintf("m %d %d", g.seq, k))
}

// done is the page's done button.
func (g *fakeGonb) done(address string) {
	g.seq++
	g.say(address, fmt.Sprintf("d %d %d", g.seq, g.at))
}

// wait waits until cond holds for the outputs (under g.mu).
func (g *fakeGonb) wait(timeout time.Duration, cond func() bool) bool {
	deadline := time.After(timeout)
	for {
		g.mu.Lock()
		ok := cond()
		g.mu.Unlock()
		if ok {
			return true
		}
		select {
		case <-g.changed:
		case <-time.After(20 * time.Millisecond):
		case <-deadline:
			return false
		}
	}
}

var addressRE = regexp.MustCompile(`comm\.send\("([^"]+)", "ready"\)`)

// waitScript waits for the controls' script and returns its address.
func (g *fakeGonb) waitScript(timeout time.Duration) (string, bool) {
	select {
	case address := <-g.scripts:
		return address, true
	case <-time.After(timeout):
		return "", false
	}
}

// figure returns the text of the live figure (the first figure output).
func (g *fakeGonb) figureText() string {
	for _, o := range g.outputs {
		if o.isFigure() || strings.Contains(o.html(), "beamnote-live-error") {
			return o.text()
		}
	}
	return ""
}

func (g *fakeGonb) waitFigure(t *testing.T, want string) {
	t.Helper()
	if !g.wait(10*time.Second, func() bool { return strings.Contains(g.figureText(), want) }) {
		g.mu.Lock()
		defer g.mu.Unlock()
		t.Errorf("the figure never showed %q; it shows %q", want, g.figureText())
	}
}

func (g *fakeGonb) panel() *output {
	for _, o := range g.outputs {
		if strings.Contains(o.html(), "beamnote-live") && !o.isFigure() {
			return o
		}
	}
	return nil
}

func (g *fakeGonb) figures() []string {
	var fs []string
	for _, o := range g.outputs {
		if o.isFigure() {
			fs = append(fs, o.text())
		}
	}
	return fs
}

// A live session: the page answers, a move redraws the figure in place,
// done ends the cell with the controls replaced by the values.
func TestLiveMoveAndDone(t *testing.T) {
	g, stdout, stderr, err := runCell(t, "live", nil, func(g *fakeGonb, address string) {
		g.say(address, "ready")
		g.at = 10
		g.move(address, 15)
		g.waitFigure(t, "gap = 125 mm")
		g.done(address)
	})
	if err != nil {
		t.Fatalf("cell program: %v\nstdout %s\nstderr %s", err, stdout, stderr)
	}
	if got := g.figures(); len(got) != 1 || got[0] != "[figure: test caustic · gap = 125 mm]" {
		t.Errorf("figure outputs %q, want one, at the last value", got)
	}
	p := g.panel()
	if p == nil || !strings.Contains(p.html(), "beamnote-live-ended") || !strings.Contains(p.text(), "gap = 125 mm · live what-if ended (done) after 1 moves, 1 redraws") {
		t.Errorf("the controls at the end: %+v", p)
	}
	if len(g.subs) != 2 || !strings.HasPrefix(g.subs[0], "+/beamnote/live/") || g.subs[1] != "-"+g.subs[0][1:] {
		t.Errorf("subscriptions %q, want one, then its end", g.subs)
	}
	// The script is transient: its output is empty at the end.
	for _, o := range g.outputs {
		if strings.Contains(o.html(), "<script>") {
			t.Errorf("a script is left in the outputs: %q", o.html())
		}
	}
	if stdout != "renders=2\n" {
		t.Errorf("stdout %q, want renders=2 (start and one move)", stdout)
	}
}

// Moves that come while a figure is being drawn are not queued: a burst of
// 20 moves during a 30 ms drawing ends at the last value with a few
// drawings (LatestOnly).
func TestLiveBurstDrawsLatestOnly(t *testing.T) {
	g, stdout, stderr, err := runCell(t, "burst", nil, func(g *fakeGonb, address string) {
		g.say(address, "ready")
		for k := 1; k <= 20; k++ {
			g.move(address, k)
		}
		// A message that gonb delivered late (it hands each to a
		// goroutine of its own) changes nothing.
		g.say(address, "m 3 3")
		g.waitFigure(t, "gap = 130 mm")
		g.done(address)
	})
	if err != nil {
		t.Fatalf("cell program: %v\nstdout %s\nstderr %s", err, stdout, stderr)
	}
	var n int
	if _, err := fmt.Sscanf(stdout, "renders=%d", &n); err != nil || n < 2 || n > 6 {
		t.Errorf("stdout %q: want between 2 and 6 drawings for the start and 20 moves", stdout)
	}
	if p := g.panel(); p == nil || !strings.Contains(p.text(), "gap = 130 mm · live what-if ended (done) after 21 moves") {
		t.Errorf("the controls at the end: %+v", p)
	}
}

// A render error during the loop shows in place of the figure, the
// sliders stay live, and the cell still completes.
func TestLiveRenderError(t *testing.T) {
	g, stdout, stderr, err := runCell(t, "error", nil, func(g *fakeGonb, address string) {
		g.say(address, "ready")
		g.move(address, 18)
		g.waitFigure(t, "cannot draw: live: at gap = 128 mm: beam: clipped at L2")
		g.move(address, 5)
		g.waitFigure(t, "gap = 115 mm")
		g.done(address)
	})
	if err != nil {
		t.Fatalf("cell program: %v\nstdout %s\nstderr %s", err, stdout, stderr)
	}
	if strings.Contains(stderr, "error:") {
		t.Errorf("stderr %q: a render error in the loop must not fail the cell", stderr)
	}
	if p := g.panel(); p == nil || !strings.Contains(p.text(), "gap = 115 mm") {
		t.Errorf("the controls at the end: %+v", p)
	}
}

// Without a move the loop ends after the idle timeout by itself.
func TestLiveIdleTimeout(t *testing.T) {
	g, stdout, stderr, err := runCell(t, "idle", nil, func(g *fakeGonb, address string) { g.say(address, "ready") })
	if err != nil {
		t.Fatalf("cell program: %v\nstdout %s\nstderr %s", err, stdout, stderr)
	}
	if p := g.panel(); p == nil || !strings.Contains(p.text(), "live what-if ended (no move for 300ms) after 0 moves") {
		t.Errorf("the controls at the end: %+v", p)
	}
}

// The notebook's interrupt (SIGINT to the cell program) ends the loop
// with the context's error, and the controls say so.
func TestLiveInterrupt(t *testing.T) {
	g, stdout, stderr, err := runCell(t, "interrupt", nil, func(g *fakeGonb, address string) {
		g.say(address, "ready")
		time.Sleep(200 * time.Millisecond) // the loop is waiting
		syscall.Kill(g.pid, syscall.SIGINT)
	})
	if err == nil || !strings.Contains(stderr, "error: live: interrupted: context canceled") {
		t.Errorf("cell program: exit %v, stderr %q, want the interrupt reported", err, stderr)
	}
	if p := g.panel(); p == nil || !strings.Contains(p.text(), "ended (interrupted)") {
		t.Errorf("the controls at the end: %+v (stdout %s)", p, stdout)
	}
}

// Headless (BEAMNOTE_HEADLESS=1): no controls, no subscription, no wait:
// the figures at the minimum, the start and the maximum, each named.
func TestHeadlessFallback(t *testing.T) {
	start := time.Now()
	g, stdout, stderr, err := runCell(t, "headless", []string{"BEAMNOTE_HEADLESS=1"}, nil)
	if err != nil {
		t.Fatalf("cell program: %v\nstdout %s\nstderr %s", err, stdout, stderr)
	}
	if len(g.subs) != 0 || g.panel() != nil {
		t.Errorf("headless: subscriptions %q, controls %v: want none", g.subs, g.panel())
	}
	want := []string{"[figure: test caustic · gap = 110 mm]", "[figure: test caustic · gap = 120 mm]", "[figure: test caustic · gap = 130 mm]"}
	if got := g.figures(); strings.Join(got, "\n") != strings.Join(want, "\n") {
		t.Errorf("headless figures %q, want %q", got, want)
	}
	if len(g.outputs) != 7 || !strings.Contains(g.outputs[0].text(), "shown as fixed figures in a headless run") ||
		g.outputs[1].text() != "**gap = 110 mm** (minimum)" {
		t.Errorf("headless outputs: %d, first %q, second %q", len(g.outputs), g.outputs[0].text(), g.outputs[1].text())
	}
	if d := time.Since(start); d > 20*time.Second {
		t.Errorf("the headless cell took %v", d)
	}
}

// A page that never answers (nbconvert without BEAMNOTE_HEADLESS): after
// the handshake timeout the controls say so and the fixed figures follow.
func TestNoPageFallback(t *testing.T) {
	g, stdout, stderr, err := runCell(t, "nopage", nil, nil)
	if err != nil {
		t.Fatalf("cell program: %v\nstdout %s\nstderr %s", err, stdout, stderr)
	}
	if p := g.panel(); p == nil || !strings.Contains(p.text(), "no page answered the controls within 300ms") {
		t.Errorf("the controls after no answer: %+v", p)
	}
	want := []string{"[figure: test caustic · gap = 120 mm]", "[figure: test caustic · gap = 110 mm]", "[figure: test caustic · gap = 130 mm]"}
	if got := g.figures(); strings.Join(got, "\n") != strings.Join(want, "\n") {
		t.Errorf("figures %q, want %q", got, want)
	}
}

// A render error at the start is the cell's error, naming the value.
func TestStartRenderError(t *testing.T) {
	_, _, stderr, err := runCell(t, "starterror", nil, nil)
	if err == nil || !strings.Contains(stderr, "error: live: at gap = 120 mm: paraxial: no such label") {
		t.Errorf("exit %v, stderr %q", err, stderr)
	}
}
