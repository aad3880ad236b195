package live

import (
	"html"
	"strconv"
	"strings"
	"time"
)

// The look of the controls: a blue bar on the left, like the design-target
// marks of package nb (green or red there).
const (
	panelStyle = `margin:4px 0;padding:5px 10px;border-left:5px solid #1f5fa8;background:#eef3fa;font-family:sans-serif;font-size:95%`
	endedStyle = `margin:4px 0;padding:3px 10px;border-left:5px solid #8aa6c8;background:#f3f6fa;font-family:sans-serif;font-size:95%;color:#333`
)

// panelHTML is the controls: per slider its name, the range input over the
// positions 0 … n, the value and the span; the done button and a status
// line, which the page's script fills in.
func panelHTML(id string, ss []slider, pos []int, idle time.Duration) (string, string) {
	var b strings.Builder
	b.WriteString(`<div class="beamnote-live" id="` + id + `" data-state="starting" style="` + panelStyle + `">`)
	for i, s := range ss {
		in := id + "-" + strconv.Itoa(i)
		b.WriteString(`<div style="display:flex;align-items:center;gap:8px;margin:2px 0">`)
		b.WriteString(`<label for="` + in + `" style="min-width:9em">` + html.EscapeString(s.Name) + `</label>`)
		b.WriteString(`<input type="range" id="` + in + `" min="0" max="` + strconv.Itoa(s.n) + `" step="1" value="` + strconv.Itoa(pos[i]) + `"` +
			` data-min="` + plain(float64(s.Min/s.unit)) + `" data-step="` + plain(float64(s.Step/s.unit)) + `" data-max="` + plain(float64(s.Max/s.unit)) + `"` +
			` data-dec="` + strconv.Itoa(s.dec) + `" data-unit="` + html.EscapeString(s.sym) + `" style="width:320px">`)
		b.WriteString(`<output for="` + in + `" style="min-width:6em;font-variant-numeric:tabular-nums;font-weight:bold">` + html.EscapeString(s.text(s.value(pos[i]))) + `</output>`)
		b.WriteString(`<span style="color:#666">` + html.EscapeString(s.text(s.Min)+" – "+s.text(s.Max)) + `</span></div>`)
	}
	b.WriteString(`<div style="margin-top:3px"><button type="button" class="beamnote-live-done">done</button> `)
	b.WriteString(`<span class="beamnote-live-status" style="color:#555">waiting for the page…</span></div></div>`)
	return b.String(), "live what-if: " + describe(ss, pos) + " (waiting for the page; ends on done or after " + human(idle) + " without a move)"
}

// panelScript wires the controls of panel id to the cell program at
// address: each move sends "m seq k0,k1,…" (the positions of all sliders),
// the button "d seq k0,k1,…", and the script says "ready" once it is
// wired. gonb_comm is the
// page's end of gonb's comms, which gonb installed when the program
// subscribed to address.
func panelScript(id, address string, idle time.Duration) string {
	// $IDLE before $ID: the replacer tries the pairs in argument order.
	r := strings.NewReplacer("$IDLE", strconv.Quote(human(idle)), "$ID", strconv.Quote(id), "$ADDRESS", strconv.Quote(address))
	return r.Replace(`(() => {
  const root = document.getElementById($ID);
  if (!root || root.dataset.state !== "starting") return;
  const status = root.querySelector(".beamnote-live-status");
  const comm = globalThis.gonb_comm;
  if (!comm) {
    status.textContent = "no connection to the kernel (gonb_comm): the figure cannot follow the sliders";
    return;
  }
  const text = (el) => {
    const k = Number(el.value), n = Number(el.max);
    const v = k >= n ? Number(el.dataset.max) : Number(el.dataset.min) + k * Number(el.dataset.step);
    return v.toFixed(Number(el.dataset.dec)) + " " + el.dataset.unit;
  };
  // gonb handles each message on a goroutine of its own, so they may
  // overtake each other: each carries a sequence number and every
  // position, and the program keeps the newest.
  const inputs = [...root.querySelectorAll("input[type=range]")];
  const positions = () => inputs.map((el) => el.value).join(",");
  let seq = 0, sent = positions();
  inputs.forEach((el) => {
    const out = root.querySelector('output[for="' + el.id + '"]');
    const moved = () => {
      out.textContent = text(el);
      el.setAttribute("value", el.value);
      if (positions() === sent) return;
      sent = positions();
      comm.send($ADDRESS, "m " + (++seq) + " " + sent);
    };
    el.addEventListener("input", moved);
    el.addEventListener("change", moved);
  });
  root.querySelector(".beamnote-live-done").addEventListener("click", (e) => {
    e.target.disabled = true;
    inputs.forEach((el) => { el.disabled = true; });
    status.textContent = "ending…";
    comm.send($ADDRESS, "d " + (++seq) + " " + positions());
  });
  root.dataset.state = "live";
  status.textContent = "live: the figure follows the sliders; done ends (so does " + $IDLE + " without a move)";
  comm.send($ADDRESS, "ready");
})();`)
}

// endedHTML replaces the controls at the end: the values of the figure
// below them and why the loop ended.
func endedHTML(ss []slider, pos []int, why string, moves, redraws int) (string, string) {
	at := describe(ss, pos)
	tail := "live what-if ended (" + why + ") after " + strconv.Itoa(moves) + " moves, " + strconv.Itoa(redraws) + " redraws"
	frag := `<div class="beamnote-live-ended" style="` + endedStyle + `"><b>` + html.EscapeString(at) + `</b> · ` +
		html.EscapeString(tail) + `; the figure below is drawn at these values</div>`
	return frag, at + " · " + tail
}

// noPageHTML replaces the controls when no page answered.
func noPageHTML(ss []slider, pos []int) (string, string) {
	at := describe(ss, pos)
	why := "no page answered the controls within " + human(handshake) + " (a run without a browser): the figure below is at the start, fixed figures follow"
	return `<div class="beamnote-live-ended" style="` + endedStyle + `"><b>` + html.EscapeString(at) + `</b> · ` + html.EscapeString(why) + `</div>`, at + " · " + why
}

// errorHTML shows a render error in place of the figure (the sliders stay
// live). Its text does not start with "error:", which the notebook checks
// read as a failed cell: the cell has not failed.
func errorHTML(err error) (string, string) {
	return `<div class="beamnote-live-error" style="margin:4px 0;padding:6px 10px;border-left:5px solid #b3261e;background:#fbeeed;font-family:sans-serif;font-size:95%">` +
		`cannot draw: ` + html.EscapeString(err.Error()) + `</div>`, "cannot draw: " + err.Error()
}

// human writes a duration as a person would: "5 min", "90 s", "1.5 s".
func human(d time.Duration) string {
	switch {
	case d >= time.Minute && d%time.Minute == 0:
		return strconv.FormatInt(int64(d/time.Minute), 10) + " min"
	case d >= time.Second:
		return strconv.FormatFloat(d.Seconds(), 'f', -1, 64) + " s"
	}
	return d.String()
}
