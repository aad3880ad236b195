package nb

import (
	"math/rand/v2"
	"strconv"
	"sync/atomic"
)

// Display is an output area of the cell that each of its calls replaces in
// place: a progress bar, the figure of a slider, a status line. It is
// Jupyter's display_id (gonb's UpdateHTML): the first call adds the output,
// later ones send update_display_data, which the page and nbconvert apply
// to that output, so the notebook keeps the last content.
//
// Outside a notebook every call prints its text fallback, as the package's
// functions do. A Display is safe for use by one goroutine at a time.
type Display struct {
	id string
}

// displaySeq numbers the displays of the program.
var displaySeq atomic.Uint64

// NewDisplay returns a new, empty output area; nothing is shown before its
// first call. Its id is random: gonb remembers the ids of a kernel's whole
// session, and an id met before would update an output of an earlier cell.
func NewDisplay() *Display {
	// math/rand/v2's global source is seeded at random by the runtime
	// (crypto/rand would add to the link of every cell).
	return &Display{id: "beamnote-" + strconv.FormatUint(rand.Uint64(), 16) + "-" + strconv.FormatUint(displaySeq.Add(1), 10)}
}

// ID is the display id, also usable as an HTML id prefix (letters, digits
// and hyphens).
func (d *Display) ID() string { return d.id }

// Show shows v in the area, replacing what it showed, rendered as [Show]
// renders it; unlike Show it returns the error of a failed display or of
// v's own rendering, and a non-nil error v itself.
func (d *Display) Show(v any) error {
	if err, ok := v.(error); ok && err != nil {
		return err
	}
	return show1(d.id, v)
}

// HTML shows an HTML fragment in the area, with a plain-text alternative
// (see [HTML]).
func (d *Display) HTML(fragment, plain string) error { return htmlIn(d.id, fragment, plain) }
