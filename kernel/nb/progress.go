package nb

import (
	"fmt"
	"html"
	"strconv"
	"sync"
	"time"
)

// Progress is a progress bar for a long computation, drawn in one output
// area that each update replaces in place ([Display]). Its Update method
// has the signature of a progress callback (opticslib/tolerance's
// Options.Progress), and the computation takes the cell's [Context] so
// that the notebook's interrupt stops it:
//
//	bar := nb.NewProgress("Monte Carlo, 10⁵ builds")
//	res := nb.Must(study.MonteCarlo(nb.Context(), tolerance.Options{Trials: 100_000, Seed: 1, Progress: bar.Update}))
//	bar.Done()
//
// The bar shows the share done, the counts, the time taken and an
// estimate of the time left; Done leaves it complete or marked stopped.
// Outside a notebook it prints a line at the first update and at the first
// one past each quarter (25, 50, 75, 100 %). A failed
// display does not stop the computation: the connection's error is sticky
// and the cell's next display call reports it. A Progress is safe for
// concurrent use.
type Progress struct {
	caption string
	d       *Display

	mu          sync.Mutex
	start       time.Time
	shownAt     time.Time // when the bar was last drawn
	done, total int       // the latest update
	quarter     int       // outside a notebook: the quarters printed, 0 for none
	finished    bool
}

// ProgressInterval is the shortest time between two drawings of a
// [Progress] bar in a notebook: ten a second look continuous, and each
// drawing is a round trip to the kernel.
const ProgressInterval = 100 * time.Millisecond

// now is the clock of the progress bar; tests replace it.
var now = time.Now

// NewProgress returns a progress bar with a caption (what is counted),
// drawn at its first Update.
func NewProgress(caption string) *Progress {
	return &Progress{caption: caption, d: NewDisplay()}
}

// Update records that done of total steps are finished and draws the bar:
// the first update, one with done ≥ total, and otherwise at most one per
// [ProgressInterval]. Counts below zero count as zero. Updates after Done
// are ignored.
func (p *Progress) Update(done, total int) {
	p.mu.Lock()
	defer p.mu.Unlock()
	if p.finished {
		return
	}
	t := now()
	first := p.start.IsZero()
	if first {
		p.start = t
	}
	p.done, p.total = max(done, 0), max(total, 0)
	if !InNotebook() {
		p.printLocked()
		return
	}
	if first || p.done >= p.total || t.Sub(p.shownAt) >= ProgressInterval {
		p.drawLocked(t)
	}
}

// Done draws the bar's final state with the time taken: complete, or
// stopped at the last count Update gave (a run that was cancelled or
// failed). Later updates are ignored. A bar that never had an update
// draws nothing.
func (p *Progress) Done() {
	p.mu.Lock()
	defer p.mu.Unlock()
	if p.finished || p.start.IsZero() {
		p.finished = true
		return
	}
	p.finished = true
	if !InNotebook() {
		if p.done < p.total {
			fmt.Fprintf(out(), "%s: stopped at %d %% (%d of %d)\n", p.caption, percent(p.done, p.total), p.done, p.total)
		}
		return
	}
	p.drawLocked(now())
}

// printLocked prints a text line for each quarter reached outside a
// notebook (0 % at the first update).
func (p *Progress) printLocked() {
	q := 1 + 4*percent(p.done, p.total)/100 // 1 at 0 %, …, 5 at 100 %
	if q <= p.quarter {
		return
	}
	p.quarter = q
	fmt.Fprintf(out(), "%s: %d %% (%d of %d)\n", p.caption, percent(p.done, p.total), p.done, p.total)
}

func (p *Progress) drawLocked(t time.Time) {
	p.shownAt = t
	_ = p.d.HTML(progressHTML(p.caption, p.done, p.total, t.Sub(p.start), p.finished))
}

// percent is the share done in whole percent, rounded down so that 100 %
// means finished; 0 for no total.
func percent(done, total int) int {
	if total <= 0 {
		return 0
	}
	return int(min(int64(done), int64(total)) * 100 / int64(total))
}

// progressHTML draws the bar and its plain-text alternative.
func progressHTML(caption string, done, total int, elapsed time.Duration, finished bool) (string, string) {
	pc := percent(done, total)
	colour := "#2f7d4a"
	var state string
	switch {
	case total > 0 && done >= total, finished && total == 0:
		state = "done: " + count(done) + " in " + seconds(elapsed)
	case finished:
		state = "stopped at " + count(done) + " of " + count(total) + " after " + seconds(elapsed)
		colour = "#b3261e"
	default:
		state = strconv.Itoa(pc) + " % · " + count(done) + " of " + count(total) + " · " + seconds(elapsed)
		if done > 0 && elapsed >= time.Second/2 {
			left := time.Duration(float64(elapsed) * float64(total-done) / float64(done))
			state += ", about " + seconds(left) + " left"
		}
	}
	width := 0.0
	if total > 0 {
		width = 100 * float64(min(done, total)) / float64(total)
	}
	frag := `<div class="beamnote-progress" style="margin:3px 0;font-family:sans-serif;font-size:90%">` +
		`<span>` + html.EscapeString(caption) + `</span> ` +
		`<span style="display:inline-block;vertical-align:middle;width:240px;height:10px;background:#e4e4e4;border-radius:2px;overflow:hidden">` +
		`<span style="display:block;height:100%;width:` + strconv.FormatFloat(width, 'f', 1, 64) + `%;background:` + colour + `"></span></span> ` +
		`<span style="color:#444">` + html.EscapeString(state) + `</span></div>`
	return frag, caption + ": " + state
}

// count writes n with a narrow no-break space between groups of three
// digits (SI Brochure, 9th ed., 5.4.4).
func count(n int) string {
	s := strconv.Itoa(n)
	neg := n < 0
	if neg {
		s = s[1:]
	}
	for i := len(s) - 3; i > 0; i -= 3 {
		s = s[:i] + "\u202f" + s[i:]
	}
	if neg {
		s = "−" + s
	}
	return s
}

// seconds formats a duration as seconds with two significant digits below
// 10 s ("0.42 s"), whole seconds below 100 s, then minutes and seconds.
func seconds(d time.Duration) string {
	s := d.Seconds()
	switch {
	case s <= 0:
		return "0 s"
	case s < 10:
		return strconv.FormatFloat(s, 'f', max(0, 1-magnitude(s)), 64) + " s"
	case s < 100:
		return strconv.FormatFloat(s, 'f', 0, 64) + " s"
	}
	m := int(s) / 60
	return strconv.Itoa(m) + " min " + strconv.Itoa(int(s)-60*m) + " s"
}

// magnitude is the decimal exponent of s > 0 (0 for s ≤ 0), at least −2.
func magnitude(s float64) int {
	e := 0
	for s > 0 && s < 1 && e > -2 {
		s *= 10
		e--
	}
	return e
}
