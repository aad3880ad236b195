package nb

import (
	"html"
	"strings"

	"github.com/janpfeifer/gonb/gonbui/protocol"

	"github.com/beamnote/beamnote/opticslib/target"
)

// MIMETarget is the MIME type under which shown design targets are
// recorded in the notebook's outputs: a JSON array of their record lines
// (target.Target.RecordLine), which the re-run collects. Record lines
// rather than numbers, since JSON has no NaN or infinity (and gonb's pipe
// carries []string as it is).
const MIMETarget protocol.MIMEType = "application/vnd.beamnote.target+json"

// Target shows design targets: in a notebook one mark per target (met,
// or missed and by how much) recorded under [MIMETarget]; outside one
// text line each. Show calls it for a target.Target or a []target.Target.
// A missed target does not stop the cell: the re-run reports it.
func Target(ts ...target.Target) error { return targetIn("", ts...) }

func targetIn(id string, ts ...target.Target) error {
	var marks, plain strings.Builder
	records := make([]string, len(ts))
	for i, t := range ts {
		marks.WriteString(targetHTML(t))
		plain.WriteString(t.String() + "\n")
		records[i] = t.RecordLine()
	}
	return show(id, map[protocol.MIMEType]any{
		protocol.MIMETextHTML:  marks.String(),
		protocol.MIMETextPlain: plain.String(),
		MIMETarget:             records,
	}, plain.String())
}

// targetHTML is one target's mark: a bar on the left, green with a check
// for a met target, red with a cross and the miss for a missed one.
func targetHTML(t target.Target) string {
	bar, bg, sign, verdict := "#2f7d4a", "#eef6f0", "✓", "met"
	if !t.Met() {
		bar, bg, sign, verdict = "#b3261e", "#fbeeed", "✗", "missed: "+t.Problem()
	}
	return `<div class="beamnote-target" style="margin:3px 0;padding:3px 10px;border-left:5px solid ` + bar +
		`;background:` + bg + `;font-family:sans-serif;font-size:95%">` +
		`<span style="color:` + bar + `;font-weight:bold">` + sign + `</span> ` +
		html.EscapeString(t.Name) + `: <b>` + html.EscapeString(t.ValueText()) + `</b>` +
		` <span style="color:#555">(wanted ` + html.EscapeString(t.Wanted()) + `)</span> · ` +
		`<span style="color:` + bar + `">` + html.EscapeString(verdict) + `</span></div>`
}
