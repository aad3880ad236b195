package nb

import (
	"context"
	"encoding/gob"
	"errors"
	"os"
	"path/filepath"
	"strings"
	"sync"
	"syscall"
	"testing"
	"time"

	"github.com/janpfeifer/gonb/gonbui/protocol"
)

// gonbSim plays gonb v0.11.4's side of the pipes in the process (see
// fakeGonb in pipe_test.go) for in-place displays and comms: it
// acknowledges syncs, records every other message, and can send a value
// from the page, as gonb forwards a comm_msg of the page's gonb_comm.
type gonbSim struct {
	mu   sync.Mutex
	msgs []protocol.DisplayData
	emu  sync.Mutex
	enc  *gob.Encoder
	w    *os.File
}

func startGonbSim(t *testing.T) *gonbSim {
	t.Helper()
	dir := t.TempDir()
	toKernel, fromKernel := filepath.Join(dir, "p1"), filepath.Join(dir, "p2")
	for _, p := range []string{toKernel, fromKernel} {
		if err := syscall.Mkfifo(p, 0o600); err != nil {
			t.Skipf("named pipes unavailable: %v", err)
		}
	}
	t.Setenv(protocol.GONB_PIPE_ENV, toKernel)
	t.Setenv(protocol.GONB_PIPE_BACK_ENV, fromKernel)
	// O_RDWR: the opens do not wait for the package (Linux fifo(7)).
	r, err := os.OpenFile(toKernel, os.O_RDWR, 0)
	if err != nil {
		t.Fatal(err)
	}
	w, err := os.OpenFile(fromKernel, os.O_RDWR, 0)
	if err != nil {
		t.Fatal(err)
	}
	g := &gonbSim{enc: gob.NewEncoder(w), w: w}
	done := make(chan struct{})
	go func() {
		defer close(done)
		dec := gob.NewDecoder(r)
		for {
			var d protocol.DisplayData
			if err := dec.Decode(&d); err != nil {
				return
			}
			if v, ok := d.Data[protocol.MIMECommValue].(protocol.CommValue); ok && v.Address == protocol.GonbuiSyncAddress {
				g.send(v.Address+"_ack", v.Value)
				continue
			}
			g.mu.Lock()
			g.msgs = append(g.msgs, d)
			g.mu.Unlock()
		}
	}()
	restore := swapPipe(t)
	t.Cleanup(func() { restore(); r.Close(); w.Close(); <-done })
	return g
}

func (g *gonbSim) send(address string, v any) {
	g.emu.Lock()
	defer g.emu.Unlock()
	_ = g.enc.Encode(&protocol.CommValue{Address: address, Value: v})
}

func (g *gonbSim) messages() []protocol.DisplayData {
	g.mu.Lock()
	defer g.mu.Unlock()
	return append([]protocol.DisplayData(nil), g.msgs...)
}

// A Display sends every call with its display id, so gonb updates one
// output in place; an error value is returned, not shown.
func TestDisplayUpdatesInPlace(t *testing.T) {
	if protocol.GonbuiSyncAckAddress != protocol.GonbuiSyncAddress+"_ack" {
		t.Fatalf("gonb's sync addresses changed: %q, %q", protocol.GonbuiSyncAddress, protocol.GonbuiSyncAckAddress)
	}
	g := startGonbSim(t)
	d := NewDisplay()
	if err := d.HTML("<b>1 %</b>", "1 %"); err != nil {
		t.Fatal(err)
	}
	if err := d.Show(fakeFigure{}); err != nil {
		t.Fatal(err)
	}
	if err := d.Show(errors.New("beam: bad")); err == nil || err.Error() != "beam: bad" {
		t.Errorf("Display.Show(error) = %v, want the error back", err)
	}
	ms := g.messages()
	if len(ms) != 2 {
		t.Fatalf("gonb got %d bundles, want 2: %v", len(ms), ms)
	}
	for i, m := range ms {
		if m.DisplayID != d.ID() || !strings.HasPrefix(d.ID(), "beamnote-") {
			t.Errorf("bundle %d: display id %q, want %q", i, m.DisplayID, d.ID())
		}
	}
	if ms[1].Data[protocol.MIMETextPlain] != "[figure: Caustic of the expander]" || ms[1].Data[protocol.MIMEImageSVG] == nil {
		t.Errorf("second bundle = %v, want the figure", ms[1].Data)
	}
	if NewDisplay().ID() == d.ID() {
		t.Error("two displays with one id")
	}
}

// Listen subscribes at gonb, gets the values for its address (also while
// display calls wait for their acknowledgements), and unsubscribes.
func TestListen(t *testing.T) {
	g := startGonbSim(t)
	got := make(chan any, 8)
	stop, err := Listen("/beamnote/test", func(v any) { got <- v })
	if err != nil {
		t.Fatal(err)
	}
	if _, err := Listen("/beamnote/test", func(any) {}); err == nil {
		t.Error("a second Listen on one address: no error")
	}
	g.send("/elsewhere", "dropped")
	g.send("/beamnote/test", "0=3")
	if err := Markdown("between"); err != nil {
		t.Fatal(err)
	}
	g.send("/beamnote/test", 2.5)
	for _, want := range []any{"0=3", 2.5} {
		select {
		case v := <-got:
			if v != want {
				t.Errorf("Listen got %v, want %v", v, want)
			}
		case <-time.After(5 * time.Second):
			t.Fatalf("Listen: no value %v within 5 s", want)
		}
	}
	stop()
	stop() // once only
	// The unsubscription comes before this output.
	if err := Markdown("after"); err != nil {
		t.Fatal(err)
	}
	var subs []string
	for _, m := range g.messages() {
		if s, ok := m.Data[protocol.MIMECommSubscribe].(protocol.CommSubscription); ok {
			subs = append(subs, s.Address+map[bool]string{false: " +", true: " -"}[s.Unsubscribe])
		}
	}
	if strings.Join(subs, ", ") != "/beamnote/test +, /beamnote/test -" {
		t.Errorf("subscriptions %q", subs)
	}
}

func TestListenOutsideNotebook(t *testing.T) {
	if InNotebook() {
		t.Skip("runs in a notebook")
	}
	if _, err := Listen("/x", func(any) {}); err == nil {
		t.Error("Listen outside a notebook: no error")
	}
}

// The bar is drawn at the first update, at most once per
// ProgressInterval after that, and always at the end; Done marks a run
// that stopped early.
func TestProgressInPlace(t *testing.T) {
	g := startGonbSim(t)
	clock := time.Date(2026, 12, 3, 9, 0, 0, 0, time.UTC)
	old := now
	now = func() time.Time { return clock }
	defer func() { now = old }()
	bar := NewProgress("Monte Carlo")
	for done := 0; done <= 1000; done += 10 {
		if done > 0 {
			clock = clock.Add(5 * time.Millisecond) // 100 updates in 0.5 s
		}
		bar.Update(done, 1000)
	}
	bar.Done()
	bar.Update(1, 1000) // ignored
	ms := g.messages()
	// 0 ms, then every 100 ms (20 updates apart) of 0.5 s, the end, Done.
	if len(ms) < 5 || len(ms) > 8 {
		t.Errorf("%d drawings of 101 updates, want about 7", len(ms))
	}
	for _, m := range ms {
		if m.DisplayID != ms[0].DisplayID {
			t.Errorf("drawings in more than one output: %q, %q", m.DisplayID, ms[0].DisplayID)
		}
	}
	if got := ms[0].Data[protocol.MIMETextPlain]; got != "Monte Carlo: 0 % · 0 of 1\u202f000 · 0 s" {
		t.Errorf("first drawing %q", got)
	}
	if got := ms[len(ms)-1].Data[protocol.MIMETextPlain]; got != "Monte Carlo: done: 1\u202f000 in 0.50 s" {
		t.Errorf("last drawing %q", got)
	}
	stopped := NewProgress("trials")
	stopped.Update(370, 1000)
	stopped.Done()
	ms = g.messages()
	if got := ms[len(ms)-1].Data[protocol.MIMETextPlain]; got != "trials: stopped at 370 of 1\u202f000 after 0 s" {
		t.Errorf("stopped bar %q", got)
	}
	html, _ := ms[len(ms)-1].Data[protocol.MIMETextHTML].(string)
	if !strings.Contains(html, "width:37.0%;background:#b3261e") {
		t.Errorf("stopped bar HTML %s", html)
	}
}

func TestSeconds(t *testing.T) {
	for _, test := range []struct {
		d    time.Duration
		want string
	}{
		{0, "0 s"}, {42 * time.Millisecond, "0.042 s"}, {420 * time.Millisecond, "0.42 s"},
		{4200 * time.Millisecond, "4.2 s"}, {42 * time.Second, "42 s"}, {125 * time.Second, "2 min 5 s"},
	} {
		if got := seconds(test.d); got != test.want {
			t.Errorf("seconds(%v) = %q, want %q", test.d, got, test.want)
		}
	}
	if got := count(1234567); got != "1\u202f234\u202f567" {
		t.Errorf("count(1234567) = %q", got)
	}
}

// Context is cancelled by the interrupt gonb sends (SIGINT), which then no
// longer ends the program.
func TestContextInterrupt(t *testing.T) {
	ctx := Context()
	if ctx.Err() == nil {
		if err := syscall.Kill(os.Getpid(), syscall.SIGINT); err != nil {
			t.Fatal(err)
		}
	}
	select {
	case <-ctx.Done():
		if !errors.Is(ctx.Err(), context.Canceled) {
			t.Errorf("Context().Err() = %v", ctx.Err())
		}
	case <-time.After(5 * time.Second):
		t.Fatal("SIGINT did not cancel Context() within 5 s")
	}
	if Context() != ctx {
		t.Error("Context() is not one context per program")
	}
}
