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
// One difference: gonbui reads the back pipe in a goroutine and hands
// widget updates to gonbui/comms; this package reads it only while it
// waits for a sync acknowledgement and drops anything else. A cell
// program should therefore not mix this package with gonbui's own display
// or widget calls: both would open the same pipes.

// inNotebook is whether the program runs as a gonb cell: gonb sets
// $GONB_PIPE (gonbui.IsNotebook is the same test).
var inNotebook = os.Getenv(protocol.GONB_PIPE_ENV) != ""

// pipe is the connection to gonb; the zero value is unopened.
type pipe struct {
	mu       sync.Mutex
	w        io.WriteCloser // $GONB_PIPE
	enc      *gob.Encoder
	r        io.ReadCloser // $GONB_PIPE_BACK
	dec      *gob.Decoder
	nextSync int
	err      error // sticky, as gonbui's
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
	p.enc, p.dec = gob.NewEncoder(w), gob.NewDecoder(r)
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
	for {
		var v protocol.CommValue
		if err := p.dec.Decode(&v); err != nil {
			return p.fail(fmt.Errorf("reading gonb's acknowledgement of sync %d: %w", id, err))
		}
		if v.Address != protocol.GonbuiSyncAckAddress {
			continue // a front-end value for widgets, which this package has none of
		}
		if got, ok := v.Value.(int); ok && got == id {
			return nil
		}
		// An acknowledgement of an older sync cannot come (each waits for
		// its own); anything else means the stream is out of step.
		return p.fail(fmt.Errorf("gonb acknowledged sync %v, want %d", v.Value, id))
	}
}
