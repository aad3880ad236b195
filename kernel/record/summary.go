package record

import (
	"fmt"
	"html"
	"io"
	"strings"

	"github.com/beamnote/beamnote/opticslib/target"
)

// Result is what a re-run found for one notebook.
type Result struct {
	// Notebook is the notebook's path as given to the re-run.
	Notebook string
	// Export is the file name of its HTML export, relative to the summary
	// page ("" if there is none).
	Export string
	// Targets are the design targets it recorded, in order.
	Targets []target.Target
	// Changes are what moved since the previous record, Note says when
	// there was none to compare with.
	Changes []target.Change
	Note    string
	// Problems are the failures other than missed targets: cells that did
	// not compile, crashed or printed an error, a cell that timed out, a
	// file that is not a notebook of this kernel.
	Problems []string
}

// Missed returns the targets that are not met.
func (r Result) Missed() []target.Target {
	var m []target.Target
	for _, t := range r.Targets {
		if !t.Met() {
			m = append(m, t)
		}
	}
	return m
}

// Failed reports whether the notebook has a problem or a missed target.
func (r Result) Failed() bool { return len(r.Problems) > 0 || len(r.Missed()) > 0 }

// change returns what moved for target i of r since the previous record.
func (r Result) change(t target.Target, k int) string {
	seen := 0
	for _, c := range r.Changes {
		if c.Name != t.Name || c.New.Name == "" {
			continue
		}
		if seen == k {
			return c.Reason
		}
		seen++
	}
	if r.Note != "" {
		return "first run"
	}
	return "unchanged"
}

// Report writes the text report of a re-run: per notebook its targets
// (met or missed), what moved, and its problems; then a last line that
// names every failed target and notebook, or says that all passed. It
// returns whether everything passed.
func Report(w io.Writer, results []Result) bool {
	var failed []string
	for _, r := range results {
		fmt.Fprintf(w, "beamnote: %s\n", r.Notebook)
		for _, t := range r.Targets {
			fmt.Fprintf(w, "  %s\n", t)
		}
		if r.Note != "" {
			fmt.Fprintf(w, "  %s\n", r.Note)
		}
		for _, c := range r.Changes {
			fmt.Fprintf(w, "  moved: %s\n", c)
		}
		for _, p := range r.Problems {
			fmt.Fprintf(w, "  problem: %s\n", p)
			failed = append(failed, r.Notebook+": "+p)
		}
		for _, t := range r.Missed() {
			failed = append(failed, r.Notebook+": target "+t.Name+" missed: "+t.Problem())
		}
	}
	if len(failed) > 0 {
		fmt.Fprintf(w, "beamnote: re-run FAILED (%d):\n  %s\n", len(failed), strings.Join(failed, "\n  "))
		return false
	}
	fmt.Fprintf(w, "beamnote: re-run passed: %d notebook(s), every target met\n", len(results))
	return true
}

// Summary returns the summary page of a re-run: one row per target
// (notebook, target, value, wanted, tolerance, result, change since the
// last run) and every notebook's problems, with links to the HTML exports.
// producer says what produced the run (see [Producer]).
func Summary(results []Result, producer string) []byte {
	var b strings.Builder
	e := html.EscapeString
	pass := 0
	for _, r := range results {
		if !r.Failed() {
			pass++
		}
	}
	b.WriteString(`<!DOCTYPE html>
<html lang="en"><head><meta charset="utf-8"><title>beamnote re-run</title>
<style>
body{font-family:sans-serif;margin:2em;color:#222}
table{border-collapse:collapse;margin:1em 0}
th,td{border-bottom:1px solid #ddd;padding:4px 10px;text-align:left;vertical-align:top}
th{background:#f4f4f4}
td.num{font-variant-numeric:tabular-nums;white-space:nowrap}
.met{color:#2f7d4a;font-weight:bold;white-space:nowrap}.missed{color:#b3261e;font-weight:bold}
.moved{color:#8a5a00}
.problem{color:#b3261e}
</style></head><body>
`)
	fmt.Fprintf(&b, "<h1>beamnote re-run: %d of %d notebooks pass</h1>\n<p>%s</p>\n", pass, len(results), e(producer))
	b.WriteString("<table>\n<tr><th>notebook</th><th>target</th><th>value</th><th>wanted</th><th>tolerance</th><th>result</th><th>change since the last run</th></tr>\n")
	for _, r := range results {
		name := e(r.Notebook)
		if r.Export != "" {
			name = `<a href="` + e(r.Export) + `">` + name + `</a>`
		}
		if len(r.Targets) == 0 {
			fmt.Fprintf(&b, "<tr><td>%s</td><td colspan=\"6\">no design targets stated</td></tr>\n", name)
		}
		seen := map[string]int{}
		for _, t := range r.Targets {
			result := `<span class="met">✓ met</span>`
			if !t.Met() {
				result = `<span class="missed">✗ missed: ` + e(t.Problem()) + `</span>`
			}
			ch := r.change(t, seen[t.Name])
			seen[t.Name]++
			class := ""
			if ch != "unchanged" && ch != "first run" {
				class = ` class="moved"`
			}
			fmt.Fprintf(&b, "<tr><td>%s</td><td>%s</td><td class=\"num\">%s</td><td class=\"num\">%s</td><td class=\"num\">%s</td><td>%s</td><td%s>%s</td></tr>\n",
				name, e(t.Name), e(t.ValueText()), e(t.Wanted()), e(t.ToleranceText()), result, class, e(ch))
		}
		for _, c := range r.Changes {
			if c.New.Name == "" {
				fmt.Fprintf(&b, "<tr><td>%s</td><td>%s</td><td class=\"num\">—</td><td colspan=\"3\"></td><td class=\"moved\">%s</td></tr>\n", name, e(c.Name), e(c.String()))
			}
		}
		for _, p := range r.Problems {
			fmt.Fprintf(&b, "<tr><td>%s</td><td colspan=\"6\" class=\"problem\">%s</td></tr>\n", name, e(p))
		}
	}
	b.WriteString("</table>\n</body></html>\n")
	return []byte(b.String())
}
