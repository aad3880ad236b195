package nb

import (
	"errors"
	"fmt"
	"sync"

	"github.com/janpfeifer/gonb/gonbui/protocol"
)

// listeners maps an address to the function that [Listen] registered for
// it; the back-pipe reader calls it for each value the page sends there.
var listeners = struct {
	sync.Mutex
	m map[string]func(any)
}{m: map[string]func(any){}}

func deliver(address string, value any) {
	listeners.Lock()
	fn := listeners.m[address]
	listeners.Unlock()
	if fn != nil {
		fn(value)
	}
}

// Listen calls fn with each value that the notebook page sends to address
// (gonb's comms: gonb_comm.send(address, value) in the page's JavaScript,
// the channel gonb's widgets use), until the returned stop is called. It is
// the plumbing of interactive controls such as package nb/live, not
// something a cell calls.
//
// The first subscription of a cell program makes gonb install its
// connection script in the page and wait, up to 3 s, for the page to
// connect; without a browser (a headless run) no value ever comes. A value
// is whatever the page's JSON decodes to and gob carries: a string or a
// float64 (JavaScript's number), not an object or array. fn runs on the
// goroutine that reads gonb's pipe, so it must not block, and in
// particular must not show anything: display calls wait for that goroutine.
//
// Listen fails outside a notebook, on a broken connection, or when address
// is already listened to.
func Listen(address string, fn func(value any)) (stop func(), err error) {
	if !InNotebook() {
		return nil, errors.New("nb: Listen: not running in a gonb notebook")
	}
	if address == "" || fn == nil {
		return nil, errors.New("nb: Listen: empty address or nil function")
	}
	listeners.Lock()
	if _, dup := listeners.m[address]; dup {
		listeners.Unlock()
		return nil, fmt.Errorf("nb: Listen: address %q is already listened to", address)
	}
	listeners.m[address] = fn
	listeners.Unlock()
	drop := func() {
		listeners.Lock()
		delete(listeners.m, address)
		listeners.Unlock()
	}
	err = kernel.post(&protocol.DisplayData{Data: map[protocol.MIMEType]any{
		protocol.MIMECommSubscribe: &protocol.CommSubscription{Address: address},
	}})
	if err != nil {
		drop()
		return nil, fmt.Errorf("nb: Listen %q: %w", address, err)
	}
	var once sync.Once
	return func() {
		once.Do(func() {
			drop()
			// Best effort: gonb forgets the cell's subscriptions when
			// the program ends anyway.
			_ = kernel.post(&protocol.DisplayData{Data: map[protocol.MIMEType]any{
				protocol.MIMECommSubscribe: &protocol.CommSubscription{Address: address, Unsubscribe: true},
			}})
		})
	}, nil
}
