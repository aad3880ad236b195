package live

import (
	"context"
	"errors"
	"fmt"
	"slices"
	"strconv"
	"strings"
	"sync"
	"time"

	"github.com/beamnote/beamnote/kernel/nb"
	"github.com/beamnote/beamnote/opticslib/table"
	"github.com/beamnote/beamnote/opticslib/units"
)

// DefaultIdleTimeout is how long a live what-if waits for a move before it
// ends by itself (see [IdleTimeout]).
const DefaultIdleTimeout = 5 * time.Minute

// HandshakeTimeout is how long a live what-if waits, once its controls are
// shown, for the page to answer; without an answer it falls back to the
// static figures of a headless run. A page that is open answers within a
// fraction of a second; gonb itself has waited up to 3 s for the page
// before the controls are sent.
const HandshakeTimeout = 5 * time.Second

// handshake is HandshakeTimeout; tests shorten it.
var handshake = HandshakeTimeout

// An Option changes how a live what-if runs.
type Option func(*config)

type config struct {
	idle time.Duration
}

// IdleTimeout ends the live what-if d after the last move (default
// [DefaultIdleTimeout]), as the done button does: a forgotten slider cell
// must not hold the kernel, and every cell after it, for ever. d must be
// positive.
func IdleTimeout(d time.Duration) Option {
	return func(c *config) { c.idle = d }
}

// Slider shows a slider for one length and the result that render makes
// for its value, and redraws the result in place as the slider moves; see
// [Sliders]. In a cell, with the design's figure as a function of the
// spacing declared at the top:
//
//	nb.Check(live.Slider(live.Range{Name: "L1–L2 gap", Min: 110 * mm, Max: 130 * mm, Step: 0.5 * mm, Start: 120 * mm}, causticAt))
func Slider[T any](r Range, render func(units.Length) (T, error), opts ...Option) error {
	if render == nil {
		return errors.New("live: Slider: render is nil")
	}
	return Sliders([]Range{r}, func(v []units.Length) (T, error) { return render(v[0]) }, opts...)
}

// Sliders shows one slider per range and the result that render makes for
// their values (a figure, a table, anything nb.Show shows), and redraws it
// in place each time a slider moves, until the done button is pressed or
// no slider has moved for the idle timeout ([IdleTimeout]). The cell then
// completes, with the last result in its output and, in place of the
// controls, a line with the values it was drawn at. render gets the values
// in the order of rs.
//
// # In a live notebook
//
// The controls talk to the cell program through gonb's comms (the channel
// of gonb's widgets, [nb.Listen]), and each result replaces the one before
// through a display id ([nb.Display]). Moves that come while a result is
// being drawn are not queued: the next drawing is for the latest
// positions only (gonb's LatestOnly). A render error is shown in place of
// the figure and the sliders stay live. The notebook's interrupt
// ([nb.Context]) ends the loop too, with the context's error.
//
// # Headless runs
//
// Executed without a browser (nb.Headless: `make test`, `beamnote-kernel
// run`) or outside a notebook, nothing waits: Sliders shows the results
// at the start, and at each slider's minimum and maximum with the others
// at their start, each under a line with its values, and returns. So it
// does when a page does not answer within [HandshakeTimeout] of the
// controls being shown (an nbconvert run without BEAMNOTE_HEADLESS=1).
//
// # Errors
//
// Sliders returns an error for an invalid range (naming the slider and
// the value), an invalid option, a render error at the start or at a
// value of the static figures (naming the values), a failed display, and
// an interrupt.
func Sliders[T any](rs []Range, render func([]units.Length) (T, error), opts ...Option) error {
	if render == nil {
		return errors.New("live: Sliders: render is nil")
	}
	ss, err := check(rs)
	if err != nil {
		return err
	}
	cfg := config{idle: DefaultIdleTimeout}
	for _, o := range opts {
		o(&cfg)
	}
	if cfg.idle <= 0 {
		return fmt.Errorf("live: IdleTimeout = %v: must be positive", cfg.idle)
	}
	draw := func(pos []int) (any, error) {
		v, err := render(values(ss, pos))
		if err != nil {
			return nil, fmt.Errorf("live: at %s: %w", describe(ss, pos), err)
		}
		return v, nil
	}
	switch {
	case !nb.InNotebook():
		return static(ss, draw, points(ss), "a run outside a notebook")
	case nb.Headless():
		return static(ss, draw, points(ss), "a headless run")
	}
	return run(nb.Context(), ss, draw, cfg)
}

// point is a set of positions with what it is ("minimum").
type point struct {
	pos  []int
	what string
}

// points are the positions of the static figures: the start, then each
// slider at its minimum and maximum with the others at their start; one
// slider's three come in the order minimum, start, maximum. A position
// equal to the start is left out.
func points(ss []slider) []point {
	start := make([]int, len(ss))
	for i, s := range ss {
		start[i] = s.start
	}
	var ps []point
	at := func(i, k int, what string) {
		pos := slices.Clone(start)
		pos[i] = k
		if !slices.Equal(pos, start) {
			ps = append(ps, point{pos, what})
		}
	}
	if len(ss) == 1 {
		at(0, 0, "minimum")
		ps = append(ps, point{start, "start"})
		at(0, ss[0].n, "maximum")
		return ps
	}
	ps = append(ps, point{start, "start"})
	for i, s := range ss {
		at(i, 0, s.Name+" at its minimum")
		at(i, s.n, s.Name+" at its maximum")
	}
	return ps
}

// static shows the results at ps, each under a line with its values.
func static(ss []slider, draw func([]int) (any, error), ps []point, why string) error {
	if len(ps) == 0 {
		return nil
	}
	var what []string
	for _, s := range ss {
		what = append(what, fmt.Sprintf("%s from %s to %s", s.Name, s.text(s.Min), s.text(s.Max)))
	}
	if err := nb.Markdown(fmt.Sprintf("*Live what-if (%s), shown as fixed figures in %s:*", strings.Join(what, "; "), why)); err != nil {
		return err
	}
	for _, p := range ps {
		v, err := draw(p.pos)
		if err != nil {
			return err
		}
		at := describe(ss, p.pos)
		if err := nb.Markdown("**" + at + "** (" + p.what + ")"); err != nil {
			return err
		}
		if err := nb.NewDisplay().Show(captioned(v, at)); err != nil {
			return err
		}
	}
	return nil
}

// captionedSVG is a figure whose caption names the values it was drawn at.
type captionedSVG struct {
	nb.SVGer
	caption string
}

func (c captionedSVG) String() string { return c.caption }

// captioned adds the values at to a figure's caption (its text/plain and
// title); other results are returned as they are.
func captioned(v any, at string) any {
	switch v.(type) {
	case table.Table, nb.Tabler:
		return v // shown as a table, as nb.Show does
	}
	f, ok := v.(nb.SVGer)
	if !ok {
		return v
	}
	caption := at
	if s, ok := v.(fmt.Stringer); ok && s.String() != "" {
		caption = s.String() + " · " + at
	}
	return captionedSVG{f, caption}
}

// state is what the page has sent, written by the pipe's reader (receive)
// and read by the loop.
type state struct {
	mu    sync.Mutex
	pos   []int
	n     []int // the last position of each slider
	seq   int   // of the message pos comes from
	ready bool
	done  bool
	moves int
	wake  chan struct{} // one token: something changed
}

// receive takes one value from the page: "ready", "m seq k0,k1,…" (a
// move: the positions of all sliders) or "d seq k0,k1,…" (done, at those
// positions). gonb delivers the page's messages on goroutines of their
// own, so they may come out of order: positions from a message older than
// the newest applied are dropped (done still counts). Malformed messages
// are ignored, positions clamped. It must not block (nb.Listen).
func (s *state) receive(v any) {
	msg, ok := v.(string)
	if !ok {
		return
	}
	s.mu.Lock()
	if msg == "ready" {
		s.ready = true
	} else if kind, seq, pos, ok := parseMove(msg, len(s.pos)); ok {
		if kind == "d" {
			s.done = true
		} else {
			s.moves++
		}
		if seq > s.seq {
			s.seq = seq
			for i, k := range pos {
				s.pos[i] = max(0, min(k, s.n[i]))
			}
		}
	} else {
		s.mu.Unlock()
		return
	}
	s.mu.Unlock()
	select {
	case s.wake <- struct{}{}:
	default: // a wake-up is pending: the loop reads the latest state
	}
}

// parseMove parses "m seq k0,k1,…" or "d seq k0,k1,…" with n positions.
func parseMove(msg string, n int) (kind string, seq int, pos []int, ok bool) {
	f := strings.Fields(msg)
	if len(f) != 3 || (f[0] != "m" && f[0] != "d") {
		return "", 0, nil, false
	}
	seq, err := strconv.Atoi(f[1])
	if err != nil {
		return "", 0, nil, false
	}
	ks := strings.Split(f[2], ",")
	if len(ks) != n {
		return "", 0, nil, false
	}
	pos = make([]int, n)
	for i, k := range ks {
		if pos[i], err = strconv.Atoi(k); err != nil {
			return "", 0, nil, false
		}
	}
	return f[0], seq, pos, true
}

func (s *state) snapshot() (pos []int, ready, done bool, moves int) {
	s.mu.Lock()
	defer s.mu.Unlock()
	return slices.Clone(s.pos), s.ready, s.done, s.moves
}

// run is the live what-if: controls, figure, the loop, the end.
func run(ctx context.Context, ss []slider, draw func([]int) (any, error), cfg config) error {
	panel, fig, script := nb.NewDisplay(), nb.NewDisplay(), nb.NewDisplay()
	id := panel.ID()
	address := "/beamnote/live/" + id
	st := &state{wake: make(chan struct{}, 1)}
	for _, s := range ss {
		st.pos = append(st.pos, s.start)
		st.n = append(st.n, s.n)
	}
	stop, err := nb.Listen(address, st.receive)
	if err != nil {
		return fmt.Errorf("live: %w", err)
	}
	defer stop()

	shown := slices.Clone(st.pos)
	first, err := draw(shown)
	if err != nil {
		return err
	}
	if err := panel.HTML(panelHTML(id, ss, shown, cfg.idle)); err != nil {
		return err
	}
	if err := fig.Show(captioned(first, describe(ss, shown))); err != nil {
		return err
	}
	// The script runs when the page renders it, then goes: it is not kept
	// in the notebook (gonb's dom.TransientJavascript does the same).
	if err := script.HTML("<script>"+panelScript(id, address, cfg.idle)+"</script>", ""); err != nil {
		return err
	}
	if err := script.HTML("", ""); err != nil {
		return err
	}

	// The page's answer.
	hand := time.NewTimer(handshake)
	defer hand.Stop()
	for ready := false; !ready; {
		select {
		case <-st.wake:
			_, ready, _, _ = st.snapshot()
		case <-hand.C:
			stop()
			if err := panel.HTML(noPageHTML(ss, shown)); err != nil {
				return err
			}
			ps := points(ss)
			ps = slices.DeleteFunc(ps, func(p point) bool { return p.what == "start" }) // shown above
			return static(ss, draw, ps, "a run whose page did not answer")
		case <-ctx.Done():
			return end(panel, ss, shown, "interrupted", 0, 0, ctx.Err())
		}
	}

	idle := time.NewTimer(cfg.idle)
	defer idle.Stop()
	redraws := 0
	// redraw draws the latest positions if they are not the ones shown.
	redraw := func(pos []int) error {
		if slices.Equal(pos, shown) {
			return nil
		}
		shown = pos
		redraws++
		v, err := draw(pos)
		if err != nil {
			return fig.HTML(errorHTML(err))
		}
		return fig.Show(captioned(v, describe(ss, pos)))
	}
	for {
		pos, _, done, moves := st.snapshot()
		if err := redraw(pos); err != nil {
			return err
		}
		if done {
			return end(panel, ss, shown, "done", moves, redraws, nil)
		}
		select {
		case <-st.wake:
			idle.Reset(cfg.idle) // Go ≥ 1.23: no stale tick to drain
		case <-idle.C:
			return end(panel, ss, shown, "no move for "+human(cfg.idle), moves, redraws, nil)
		case <-ctx.Done():
			return end(panel, ss, shown, "interrupted", moves, redraws, ctx.Err())
		}
	}
}

// end replaces the controls with the values of the figure shown and why
// the live what-if ended, and returns err.
func end(panel *nb.Display, ss []slider, pos []int, why string, moves, redraws int, err error) error {
	if derr := panel.HTML(endedHTML(ss, pos, why, moves, redraws)); derr != nil && err == nil {
		err = derr
	}
	if err != nil && !strings.HasPrefix(err.Error(), "live:") {
		err = fmt.Errorf("live: %s: %w", why, err)
	}
	return err
}
