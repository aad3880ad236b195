package run

import (
	"fmt"
	"html"
	"regexp"
	"slices"
	"strings"
	"unicode/utf8"

	"github.com/beamnote/beamnote/kernel/ipynb"
)

// FigureTag is the cell tag (cell metadata "tags") that marks a code cell
// whose executed outputs must include an image/svg+xml figure.
const FigureTag = "figure"

// NoFigure is the problem [CheckExecuted] reports for a notebook in which no
// cell produced an image/svg+xml figure.
const NoFigure = "no cell produced an image/svg+xml figure"

// crashRE matches what a cell program that panicked, was killed or called
// os.Exit with a nonzero code leaves on its standard error stream. The Go
// runtime writes "panic: " and "fatal error: " there, and gonb writes the
// *exec.ExitError ("exit status 3", "signal: killed") on stderr too. gonb
// up to v0.11.1 reported such a cell as done and nbconvert exited 0, so the
// outputs were the only evidence; v0.11.4 adds an error output, and the
// stream still says what happened. Only stderr is searched, so a cell that
// prints, say, "signal: 3.2 dB" with fmt.Println is not a crash; a cell that
// writes such a line to os.Stderr itself (or runs a failing "!" shell
// command, which gonb reports the same way) is reported, which is the safe
// side for a test.
var crashRE = regexp.MustCompile(`(?m)^(panic: |fatal error: |exit status [1-9]|signal: ).*$`)

// exitRE matches how gonb reports a cell program that exited nonzero or was
// killed, on stderr and in the error output.
var exitRE = regexp.MustCompile(`(?m)^(exit status [1-9]\d*|signal: .*)$`)

// errorLineRE matches a line in which a cell says it failed: "error:" in
// any case, after optional blanks, on stdout or stderr. That is how a cell
// in the print-and-return style reports (fmt.Println("error:", err);
// return), and how nb.Must and nb.Check report before they exit with
// status 1.
var errorLineRE = regexp.MustCompile(`(?im)^[ \t]*error:.*$`)

// ErrorLine returns the first line of s in which a cell says it failed (a
// line starting with "error:", any case, after blanks), or "": the rule
// [CheckExecuted] applies to a cell's streams.
func ErrorLine(s string) string { return errorLineRE.FindString(s) }

// cellLineRE matches gonb's mark of a cell line in a stack trace on stderr,
// "[[ Cell [1] Line 3 ]]", once ANSI escapes are removed.
var cellLineRE = regexp.MustCompile(`\[\[ (Cell (\[\d+\] )?Line \d+) \]\]`)

// ansiRE matches the ANSI colour and video escapes that gonb puts in
// tracebacks and stack traces.
var ansiRE = regexp.MustCompile("\x1b\\[[0-9;]*m")

// CheckExecuted returns the problems of an executed notebook: one per code
// cell that failed, and one per cell tagged [FigureTag] without an
// image/svg+xml output. A notebook with no figure at all is a problem too.
//
// A cell failed when it does not compile, when a line of its stdout or
// stderr starts with "error:" (see errorLineRE), when its program crashed or
// exited nonzero (see crashRE), or when it has any other error output. The
// problem says which, in that order of preference, with the compiler's
// messages by cell and line, the "error:" line, or the crash's first line.
func CheckExecuted(nb ipynb.Notebook) []string {
	var problems []string
	figures := 0
	for i, c := range nb.Cells {
		if c.CellType != "code" {
			continue
		}
		where := fmt.Sprintf("cell %d (%s)", i, firstLine(ipynb.Text(c.Source)))
		if p := cellFailure(c.Outputs); p != "" {
			problems = append(problems, where+": "+p)
		}
		hasSVG := false
		for _, o := range c.Outputs {
			if o.OutputType == "display_data" || o.OutputType == "execute_result" {
				if _, ok := o.Data["image/svg+xml"]; ok {
					hasSVG = true
				}
			}
		}
		if hasSVG {
			figures++
		}
		if slices.Contains(c.Metadata.Tags, FigureTag) && !hasSVG {
			problems = append(problems, fmt.Sprintf("%s: tagged %q but has no image/svg+xml output", where, FigureTag))
		}
	}
	if figures == 0 {
		problems = append(problems, NoFigure)
	}
	return problems
}

// cellFailure says why a cell with these outputs failed, or returns "".
func cellFailure(outs []ipynb.Output) string {
	// Jupyter may split a stream over several outputs: join them, so that
	// a line is a line.
	streams := map[string]string{}
	var errOut *ipynb.Output
	for i, o := range outs {
		switch o.OutputType {
		case "stream":
			streams[o.Name] += ansiRE.ReplaceAllString(ipynb.Text(o.Text), "")
		case "error":
			if errOut == nil {
				errOut = &outs[i]
			}
		}
	}
	if errOut != nil {
		if msgs := compilerMessages(outs); msgs != "" {
			return "does not compile: " + msgs
		}
	}
	exit := strings.TrimSpace(exitRE.FindString(streams["stderr"]))
	if exit == "" && errOut != nil && exitRE.MatchString(errOut.EValue) {
		exit = strings.TrimSpace(exitRE.FindString(errOut.EValue))
	}
	for _, name := range []string{"stderr", "stdout"} {
		loc := errorLineRE.FindStringIndex(streams[name])
		if loc == nil {
			continue
		}
		msg := fmt.Sprintf("the cell reported an error on %s: %s", name, strings.TrimSpace(streams[name][loc[0]:loc[1]]))
		// nb.Must and nb.Check name the call on the next line, "  in: …".
		var notes []string
		next, _, _ := strings.Cut(strings.TrimPrefix(streams[name][loc[1]:], "\n"), "\n")
		if next = strings.TrimSpace(next); strings.HasPrefix(next, "in: ") {
			notes = append(notes, next)
		}
		if exit != "" {
			notes = append(notes, exit)
		}
		if len(notes) > 0 {
			msg += " (" + strings.Join(notes, "; ") + ")"
		}
		return msg
	}
	if crash := strings.TrimSpace(crashRE.FindString(streams["stderr"])); crash != "" {
		msg := fmt.Sprintf("the cell program crashed (%q on stderr", crash)
		if m := cellLineRE.FindStringSubmatch(streams["stderr"]); m != nil {
			// "Cell [1] Line 3" → "Cell[1]: Line 3", as in compiler messages.
			msg += ", at " + strings.Replace(strings.Replace(m[1], "Cell [", "Cell[", 1), "] ", "]: ", 1)
		}
		return msg + ")"
	}
	if errOut != nil {
		return fmt.Sprintf("error %s: %s", errOut.EName, strings.TrimSpace(errOut.EValue))
	}
	return ""
}

// gonbErrRE matches one compiler message in gonb's HTML error report
// (without --raw_error): the cell line, then the message after the main.go
// location.
var gonbErrRE = regexp.MustCompile(`gonb-cell-line-info">([^<]*)</span>\s*<span class="gonb-err-location">[^<]*</span>\s*([^\n<]*)`)

var (
	tagRE       = regexp.MustCompile(`<[^>]*>`)
	goErrLineRE = regexp.MustCompile(`\.go:\d+:\d+: `)
)

// compilerMessages extracts "Cell[3]: Line 2: undefined: f" style messages,
// joined by "; ", from a cell's error output as gonb --raw_error writes it
// (one traceback entry per compiler message: "Cell[3]: Line 2", the code
// around it, then the message), or else from gonb's HTML error report. A
// message outside the cell (a library package failed to build) keeps the
// compiler's own file:line form. Runtime errors give "".
func compilerMessages(outs []ipynb.Output) string {
	var msgs []string
	for _, o := range outs {
		if o.OutputType != "error" {
			continue
		}
		for _, entry := range o.Traceback {
			entry = strings.TrimSpace(ansiRE.ReplaceAllString(entry, ""))
			lines := strings.Split(entry, "\n")
			first, last := strings.TrimSpace(lines[0]), strings.TrimSpace(lines[len(lines)-1])
			switch {
			case strings.HasPrefix(first, "Cell[") || strings.HasPrefix(first, "Cell Line "):
				msgs = append(msgs, first+": "+last)
			case len(lines) == 1 && goErrLineRE.MatchString(first):
				msgs = append(msgs, first)
			}
		}
	}
	if len(msgs) > 0 {
		return strings.Join(msgs, "; ")
	}
	for _, o := range outs {
		raw, ok := o.Data["text/html"]
		if !ok {
			continue
		}
		h := ipynb.Text(raw)
		for _, m := range gonbErrRE.FindAllStringSubmatch(h, -1) {
			msgs = append(msgs, strings.TrimSpace(m[1])+": "+html.UnescapeString(strings.TrimSpace(m[2])))
		}
		if len(msgs) == 0 {
			// Not in the cell (a library package failed to build): keep the
			// compiler's own file:line messages.
			text := html.UnescapeString(tagRE.ReplaceAllString(h, ""))
			for _, line := range strings.Split(text, "\n") {
				if line = strings.TrimSpace(line); goErrLineRE.MatchString(line) && len(msgs) < 3 {
					msgs = append(msgs, line)
				}
			}
		}
	}
	return strings.Join(msgs, "; ")
}

// firstLine returns the first line of a cell that says what it does,
// skipping blank lines and gonb's "%%" marker, shortened to 60 characters
// (runes, so that no multi-byte UTF-8 character is cut).
func firstLine(s string) string {
	line := ""
	for _, l := range strings.Split(s, "\n") {
		l = strings.TrimSpace(l)
		if l != "" && l != "%%" {
			line = l
			break
		}
	}
	if utf8.RuneCountInString(line) > 60 {
		line = string([]rune(line)[:57]) + "..."
	}
	return line
}
