// Package live is the live what-if of a notebook: sliders over lengths
// (a spacing, a shift, a focal length) and a figure that is redrawn in
// place as they move.
//
// A cell declares the design's figure as a function of the length at the
// top, as the notebook idiom has it, and hands it to [Slider]:
//
//	// causticAt draws the caustic of the expander with the lens gap at gap.
//	func causticAt(gap units.Length) (optplot.Figure, error) { … }
//
//	%%
//	nb.Check(live.Slider(live.Range{Name: "L1–L2 gap", Min: 110 * mm, Max: 130 * mm, Step: 0.5 * mm, Start: 120 * mm}, causticAt))
//
// [Sliders] takes several ranges and a function of all their values.
//
// # Live and headless
//
// In a notebook open in a browser, the cell shows the sliders (with the
// value and its unit), a done button and the figure; each move redraws
// the figure in place, drawing only the latest positions when moves come
// faster than drawings. The loop ends on done or after an idle time
// without a move ([IdleTimeout], [DefaultIdleTimeout]), or on the
// notebook's interrupt; the cell then completes with the last figure in
// its output and the values it was drawn at in place of the controls.
//
// A cell that waits for a browser would hang a headless run (gonb's own
// slider waits for the page's first answer for ever). So when the notebook
// is executed without one — nb.Headless, BEAMNOTE_HEADLESS=1, which
// `beamnote-kernel run` and `make test` set, or outside a notebook — the
// call shows fixed figures instead (at the start and at the ends of each
// slider) and returns without waiting. An nbconvert run without that
// variable is caught too: the controls are shown and the page's answer
// awaited for [HandshakeTimeout]; without one the call falls back to the
// same figures. Either way the cell completes without an error.
//
// # How it talks to the page
//
// The controls are an HTML output and a script, the figure another output
// with a display id ([nb.Display]); the script sends each move to the cell
// program through gonb's comms ([nb.Listen]: the channel of gonb's own
// widgets, the page's gonb_comm.send), and the program answers with
// update_display_data for the figure. The script is transient (removed
// once it ran), and at the end the controls are replaced by a line of
// text, so the saved notebook holds no dead slider. The messages are
// strings: "ready" once the script is wired, "m seq k0,k1,…" for a move
// (the positions 0 … n of all sliders), "d seq k0,k1,…" for done; gonb
// hands each message to the program on a goroutine of its own, so they
// can overtake each other, and the program keeps the positions of the
// highest sequence number. A move costs one drawing and one display
// round trip; kernel/browser's TestBrowserSlider measures the time from a
// move to the new figure in the page.
//
// Errors follow the notebook idiom: Slider and Sliders return them, and
// the cell stops on them with nb.Check. A render error during the live
// loop is shown in place of the figure instead, and the sliders stay live.
package live
