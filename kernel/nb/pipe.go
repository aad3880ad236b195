package nb

import (
	"encoding/gob"
	"errors"
	"fmt"
	"io"
	"os"
	"sync"

	"github.com/janpfeifer/gonb/gonbui/protocol"
)

// The display channel to gonb, spoken with gonb's wire types
// (gonbui/protocol) and encoding/gob only.
//
// gonb v0.11.4 runs a cell program with two named pipes: $GONB_PIPE, which
// the program writes gob-encoded *protocol.DisplayData values to, and
// $GONB_PIPE_BACK, from which it reads gob-encoded *protocol.CommValue
// values. gonbui (the package gonb offers for this) does the same and
// nothing more for what this package needs — open $GONB_PIPE for writing,
// then $GONB_PIPE_BACK for reading, one gob stream each way; Sync sends a
// DisplayData whose only entry is protocol.MIMECommValue →
// &protocol.CommValue{Address: protocol.GonbuiSyncAddress, Value: id} with
// ids 0, 1, 2, … and waits for the CommValue with Address
// protocol.GonbuiSyncAckAddress and the same Value — but importing gonbui
// links klog, uuid, pkg/errors and their dependencies (151 packages against
// protocol's standard library only) into every cell, which made a warm
// plotting cell's link about a third slower. The bytes on the pipes are the
// same as gonbui's (TestWireFormatMatchesGonbui).
//
// Like gonbui, the package reads the back pipe in a goroutine of its own
// once the pipes are open: sync acknowledgements go to the display call
// that waits for them, values the page sends to an address go to the
// function that [Listen] registered for it (gonbui hands them to
// gonbui/comms), anything else is dropped. A cell program should not mix
// this package with gonbui's own display or widget calls: both would open
// the same pipes.

// inNotebook is whether the program runs as a gonb cell: gonb sets
// $GONB_PIPE (gonbui.IsNotebook is the same test).
var inNotebook = os.Getenv(protocol.GONB_PIPE_ENV) != ""

// pipe is the connection to gonb; the zero value is unopened.
type pipe struct {
	mu       sync.Mutex
	w        io.WriteCloser // $GONB_PIPE
	enc      *gob.Encoder
	r        io.ReadCloser // $GONB_PIPE_BACK
	back     *backReader   // reads r, from the open on
	nextSync int
	err      error // sticky, as gonbui's
}

// backReader reads the gob stream of $GONB_PIPE_BACK in a goroutine of its
// own: sync acknowledgements go to acks (one sync waits at a time, under
// pipe.mu), values for an address to its listener; when the stream ends,
// err is set and done closed.
type backReader struct {
	acks chan any
	done chan struct{}
	err  error // valid once done is closed
}

func (b *backReader) read(dec *gob.Decoder) {
	for {
		var v protocol.CommValue
		if err := dec.Decode(&v); err != nil {
			b.err = err
			close(b.done)
			return
		}
		if v.Address == protocol.GonbuiSyncAckAddress {
			b.acks <- v.Value
			continue
		}
		deliver(v.Address, v.Value)
	}
}

var kernel pipe

// openLocked opens both pipes once, in gonbui's order (the writer first:
// gonb opens its reading end before it starts the program, and opens the
// back pipe for writing only once the program opens it for reading).
func (p *pipe) openLocked() error {
	if p.err != nil {
		return p.err
	}
	if p.enc != nil {
		return nil
	}
	if !inNotebook {
		return errors.New("not running in a gonb notebook ($" + protocol.GONB_PIPE_ENV + " unset)")
	}
	wpath, rpath := os.Getenv(protocol.GONB_PIPE_ENV), os.Getenv(protocol.GONB_PIPE_BACK_ENV)
	w, err := os.OpenFile(wpath, os.O_WRONLY, 0o600)
	if err != nil {
		p.err = fmt.Errorf("opening gonb's pipe %q for writing: %w", wpath, err)
		return p.err
	}
	r, err := os.OpenFile(rpath, os.O_RDONLY, 0o600)
	if err != nil {
		w.Close()
		p.err = fmt.Errorf("opening gonb's pipe %q for reading: %w", rpath, err)
		return p.err
	}
	p.w, p.r = w, r
	p.enc = gob.NewEncoder(w)
	p.back = &backReader{acks: make(chan any, 1), done: make(chan struct{})}
	go p.back.read(gob.NewDecoder(r))
	return nil
}

// fail records err as the connection's sticky error and closes the pipes.
func (p *pipe) fail(err error) error {
	p.err = err
	if p.w != nil {
		p.w.Close()
	}
	if p.r != nil {
		p.r.Close()
	}
	return err
}

// send encodes one display bundle.
func (p *pipe) sendLocked(d *protocol.DisplayData) error {
	if err := p.openLocked(); err != nil {
		return err
	}
	if err := p.enc.Encode(d); err != nil {
		return p.fail(fmt.Errorf("writing to gonb's pipe: %w", err))
	}
	return nil
}

// display sends one display bundle and waits until gonb has taken it: the
// sync request after it is answered only once gonb has read, and
// published, everything sent before.
func (p *pipe) display(d *protocol.DisplayData) error {
	p.mu.Lock()
	defer p.mu.Unlock()
	if err := p.sendLocked(d); err != nil {
		return err
	}
	return p.syncLocked()
}

// post sends one message without waiting for gonb (a subscription).
func (p *pipe) post(d *protocol.DisplayData) error {
	p.mu.Lock()
	defer p.mu.Unlock()
	return p.sendLocked(d)
}

// syncLocked is gonbui.Sync's handshake.
func (p *pipe) syncLocked() error {
	id := p.nextSync
	p.nextSync++
	err := p.sendLocked(&protocol.DisplayData{Data: map[protocol.MIMEType]any{
		protocol.MIMECommValue: &protocol.CommValue{Address: protocol.GonbuiSyncAddress, Value: id},
	}})
	if err != nil {
		return err
	}
	select {
	case v := <-p.back.acks:
		return p.ackLocked(v, id)
	case <-p.back.done:
		select {
		case v := <-p.back.acks: // the acknowledgement came before the end
			return p.ackLocked(v, id)
		default:
		}
		return p.fail(fmt.Errorf("reading gonb's acknowledgement of sync %d: %w", id, p.back.err))
	}
}

// ackLocked checks the acknowledgement v of sync id. An acknowledgement of
// an older sync cannot come (each waits for its own); anything else means
// the stream is out of step.
func (p *pipe) ackLocked(v any, id int) error {
	if got, ok := v.(int); ok && got == id {
		return nil
	}
	return p.fail(fmt.Errorf("gonb acknowledged sync %v, want %d", v, id))
}
