package nb

import (
	"bytes"
	"encoding/gob"
	"io"
	"os"
	"path/filepath"
	"reflect"
	"strings"
	"sync"
	"syscall"
	"testing"

	"github.com/janpfeifer/gonb/gonbui"
	"github.com/janpfeifer/gonb/gonbui/protocol"

	"github.com/beamnote/beamnote/opticslib/target"
	"github.com/beamnote/beamnote/opticslib/units"
)

// fakeGonb plays gonb v0.11.4's side of the cell pipes the way its
// internal/jpyexec does: it makes the two named pipes, reads gob-encoded
// *protocol.DisplayData from $GONB_PIPE and answers each sync request
// (a protocol.CommValue at protocol.GonbuiSyncAddress) with a
// *protocol.CommValue at protocol.GonbuiSyncAckAddress on $GONB_PIPE_BACK.
// It keeps the raw bytes it read and the bundles other than sync requests.
type fakeGonb struct {
	raw     bytes.Buffer
	display []map[protocol.MIMEType]any
	syncs   []int
	done    chan error
}

// startFakeGonb sets $GONB_PIPE and $GONB_PIPE_BACK for the test and serves
// until it has seen n sync requests.
func startFakeGonb(t *testing.T, n int) *fakeGonb {
	t.Helper()
	dir := t.TempDir()
	toKernel, fromKernel := filepath.Join(dir, "gonb_pipe_1"), filepath.Join(dir, "gonb_pipe_2")
	for _, p := range []string{toKernel, fromKernel} {
		if err := syscall.Mkfifo(p, 0o600); err != nil {
			t.Skipf("named pipes unavailable: %v", err)
		}
	}
	t.Setenv(protocol.GONB_PIPE_ENV, toKernel)
	t.Setenv(protocol.GONB_PIPE_BACK_ENV, fromKernel)
	g := &fakeGonb{done: make(chan error, 1)}
	go func() { g.done <- g.serve(toKernel, fromKernel, n) }()
	return g
}

func (g *fakeGonb) serve(toKernel, fromKernel string, n int) error {
	r, err := os.Open(toKernel)
	if err != nil {
		return err
	}
	defer r.Close()
	w, err := os.OpenFile(fromKernel, os.O_WRONLY, 0o600)
	if err != nil {
		return err
	}
	defer w.Close()
	dec, enc := gob.NewDecoder(io.TeeReader(r, &g.raw)), gob.NewEncoder(w)
	for len(g.syncs) < n {
		data := &protocol.DisplayData{}
		if err := dec.Decode(data); err != nil {
			return err
		}
		if v, ok := data.Data[protocol.MIMECommValue]; ok {
			req, ok := v.(protocol.CommValue)
			if !ok || req.Address != protocol.GonbuiSyncAddress {
				return io.ErrUnexpectedEOF
			}
			id, _ := req.Value.(int)
			g.syncs = append(g.syncs, id)
			if err := enc.Encode(&protocol.CommValue{Address: protocol.GonbuiSyncAckAddress, Value: id}); err != nil {
				return err
			}
			continue
		}
		g.display = append(g.display, data.Data)
	}
	return nil
}

func (g *fakeGonb) wait(t *testing.T) {
	t.Helper()
	if err := <-g.done; err != nil {
		t.Fatalf("fake gonb: %v", err)
	}
}

// With one MIME entry per bundle (gob writes a map in Go's random
// iteration order), the bytes this package writes to gonb's pipe are
// gonbui's own: gonbui.SendData then gonbui.Sync, twice, against two
// display calls of this package. Both streams start with a fresh gob
// encoder, so both carry the type definitions first.
func TestWireFormatMatchesGonbui(t *testing.T) {
	bundles := []map[protocol.MIMEType]any{
		{protocol.MIMETextMarkdown: "**w0** = 0.42 mm"},
		{protocol.MIMETextHTML: `<table class="beamnote-table"></table>`},
	}

	// gonbui keeps its pipes open for the life of the process, so its
	// stream is recorded once (go test -count=N).
	gonbuiOnce.Do(func() {
		theirs := startFakeGonb(t, len(bundles))
		gonbui.IsNotebook = true
		for _, b := range bundles {
			gonbui.SendData(&protocol.DisplayData{Data: b})
			gonbui.Sync()
		}
		theirs.wait(t)
		if err := gonbui.Error(); err != nil {
			t.Fatalf("gonbui: %v", err)
		}
		gonbuiStream = theirs
	})
	theirs := gonbuiStream
	if theirs == nil {
		t.Fatal("gonbui's stream was not recorded")
	}

	ours := startFakeGonb(t, len(bundles))
	defer swapPipe(t)()
	for _, b := range bundles {
		if err := send(b); err != nil {
			t.Fatal(err)
		}
	}
	ours.wait(t)

	if theirs.raw.Len() == 0 {
		t.Fatal("gonbui wrote nothing")
	}
	if !bytes.Equal(ours.raw.Bytes(), theirs.raw.Bytes()) {
		t.Errorf("bytes on $GONB_PIPE differ from gonbui's:\nours   %q\ngonbui %q", ours.raw.Bytes(), theirs.raw.Bytes())
	}
	if !reflect.DeepEqual(ours.syncs, theirs.syncs) || !reflect.DeepEqual(ours.syncs, []int{0, 1}) {
		t.Errorf("sync ids: ours %v, gonbui %v, want [0 1]", ours.syncs, theirs.syncs)
	}
}

var (
	gonbuiOnce   sync.Once
	gonbuiStream *fakeGonb
)

// swapPipe makes the package believe it runs in a notebook with a fresh
// connection, and returns the function that restores it.
func swapPipe(t *testing.T) func() {
	t.Helper()
	oldIn := inNotebook
	inNotebook = true
	kernel = pipe{}
	return func() {
		kernel.mu.Lock()
		if kernel.w != nil {
			kernel.w.Close()
			kernel.r.Close()
		}
		kernel.mu.Unlock()
		kernel = pipe{}
		inNotebook = oldIn
	}
}

// In a notebook, a figure, a table and Markdown arrive at gonb as one
// display bundle each, every one followed by a sync that gonb answered.
func TestDisplayThroughGonbPipes(t *testing.T) {
	g := startFakeGonb(t, 3)
	defer swapPipe(t)()
	svg := []byte(`<?xml version="1.0"?><svg xmlns="http://www.w3.org/2000/svg"/>`)
	if err := SVG(svg, "Caustic"); err != nil {
		t.Fatal(err)
	}
	Show(fakeTable{})
	if err := Markdown("done"); err != nil {
		t.Fatal(err)
	}
	g.wait(t)
	if len(g.display) != 3 {
		t.Fatalf("gonb got %d bundles, want 3: %v", len(g.display), g.display)
	}
	fig := g.display[0]
	if fig[protocol.MIMEImageSVG] != string(svg) || fig[protocol.MIMETextPlain] != "[figure: Caustic]" ||
		fig[protocol.MIMETextHTML] != `<div class="beamnote-figure" title="Caustic"><svg xmlns="http://www.w3.org/2000/svg"/></div>` {
		t.Errorf("figure bundle = %v", fig)
	}
	if html, _ := g.display[1][protocol.MIMETextHTML].(string); !bytes.Contains([]byte(html), []byte("<caption>Cardinal points</caption>")) {
		t.Errorf("table bundle = %v", g.display[1])
	}
	if g.display[2][protocol.MIMETextMarkdown] != "done" {
		t.Errorf("markdown bundle = %v", g.display[2])
	}
	if !reflect.DeepEqual(g.syncs, []int{0, 1, 2}) {
		t.Errorf("sync ids %v, want [0 1 2]", g.syncs)
	}
}

// When gonb goes away, the display call fails with an error (and keeps
// failing), instead of hanging or passing silently.
func TestDisplayErrorWhenGonbGone(t *testing.T) {
	dir := t.TempDir()
	toKernel, fromKernel := filepath.Join(dir, "p1"), filepath.Join(dir, "p2")
	for _, p := range []string{toKernel, fromKernel} {
		if err := syscall.Mkfifo(p, 0o600); err != nil {
			t.Skipf("named pipes unavailable: %v", err)
		}
	}
	t.Setenv(protocol.GONB_PIPE_ENV, toKernel)
	t.Setenv(protocol.GONB_PIPE_BACK_ENV, fromKernel)
	done := make(chan struct{})
	go func() { // opens both ends, reads one bundle, then exits
		defer close(done)
		r, _ := os.Open(toKernel)
		w, _ := os.OpenFile(fromKernel, os.O_WRONLY, 0o600)
		var d protocol.DisplayData
		_ = gob.NewDecoder(r).Decode(&d)
		w.Close()
		r.Close()
	}()
	defer swapPipe(t)()
	if err := Markdown("x"); err == nil {
		t.Error("Markdown with gonb gone: no error")
	}
	<-done
	if err := Markdown("y"); err == nil {
		t.Error("second Markdown after a failed one: no error")
	}
}

// A shown target reaches gonb as one bundle: its mark, its text line and
// its record line under MIMETarget, a []string that gob carries without
// registration on gonb's side.
func TestTargetThroughGonbPipes(t *testing.T) {
	g := startFakeGonb(t, 1)
	defer swapPipe(t)()
	missed := target.AtLeast("fold-mirror transmission", 0.9364, 0.99)
	Show([]target.Target{target.Near("output radius", 2.031*units.Millimeter, 2*units.Millimeter, 0.1*units.Millimeter), missed})
	g.wait(t)
	if len(g.display) != 1 {
		t.Fatalf("gonb got %d bundles, want 1: %v", len(g.display), g.display)
	}
	b := g.display[0]
	want := []string{"output radius\t2.031 mm\t2 ± 0.1 mm\tmet", missed.RecordLine()}
	if got, _ := b[MIMETarget].([]string); !reflect.DeepEqual(got, want) {
		t.Errorf("record lines = %#v, want %#v", b[MIMETarget], want)
	}
	html, _ := b[protocol.MIMETextHTML].(string)
	if !strings.Contains(html, "✓") || !strings.Contains(html, "missed: is 0.0536 (5.4 %) below the limit") {
		t.Errorf("marks = %s", html)
	}
	if b[protocol.MIMETextPlain] != "target output radius: 2.031 mm (wanted 2 ± 0.1 mm): met\n"+missed.String()+"\n" {
		t.Errorf("text = %q", b[protocol.MIMETextPlain])
	}
}
