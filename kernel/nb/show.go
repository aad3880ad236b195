package nb

import (
	"bufio"
	"fmt"
	"html"
	"io"
	"os"
	"path/filepath"
	"runtime"
	"strings"

	"github.com/beamnote/beamnote/opticslib/table"
	"github.com/beamnote/beamnote/opticslib/target"
)

// The notebook idiom. A cell states what is new and lets results render
// themselves:
//
//	sys := nb.Must(expander(120 * mm))   // a value, or stop the cell
//	nb.Show(sys.Cardinal(paraxial.Tangential))
//	nb.Show(optplot.Caustic(c, sys))
//	nb.Check(err)                        // an error alone
//
// Must, Check and Show stop the cell on an error in one way: they print
//
//	error: <the error>
//	  in: <the source line of the call>
//
// to standard error and end the cell program with exit status 1, which the
// kernel and the notebook checker report as a failed cell. No goroutine
// dump, and the next cells still run.

// Tabler is a result that renders itself as a table: the element list of
// a system, cardinal points, an imaging solution, waists, a clipping check,
// a beam. The physics packages implement it without importing this
// package.
type Tabler interface {
	Table() table.Table
}

// SVGer is a result that renders itself as an SVG figure, such as
// optplot.Figure. If it is also a fmt.Stringer, its String is the caption.
type SVGer interface {
	SVG() ([]byte, error)
}

// stop is what ends a cell on an error: os.Exit(1) after the message. Tests
// replace it.
var stop = func() { os.Exit(1) }

// errOut is where the error messages go; nil means os.Stderr.
var errOut io.Writer

// Must returns v when err is nil and otherwise stops the cell with err,
// naming the source line of the call:
//
//	in := nb.Must(beam.FromWaist(beam.WaistSpec{WaistRadius: 0.42 * mm, Wavelength: 488 * nm}))
func Must[T any](v T, err error) T {
	if err != nil {
		fail(err, 2)
	}
	return v
}

// Check stops the cell with err when err is not nil (see [Must]).
func Check(err error) {
	if err != nil {
		fail(err, 2)
	}
}

// Show displays v and stops the cell if one of errs is not nil (or v is
// itself a non-nil error), so that a
// result and its error can be passed straight from the call that made
// them: nb.Show(sys.Cardinal(paraxial.Tangential)). It shows
//
//   - a target.Target or []target.Target as design-target marks ([Target]);
//   - a [Tabler] or a table.Table as a table;
//   - an [SVGer] as a figure (its String, if any, is the caption);
//   - a string as Markdown;
//   - a fmt.Stringer as text, anything else with fmt's %+v.
//
// A display that fails stops the cell too.
func Show(v any, errs ...error) {
	for _, err := range errs {
		if err != nil {
			fail(err, 2)
		}
	}
	if err, ok := v.(error); ok && err != nil {
		fail(err, 2) // nb.Show(err): an error is never shown as a result
	}
	if err := show1("", v); err != nil {
		fail(err, 2)
	}
}

// show1 shows v, as Show describes, into the display area id ("" for a
// new output).
func show1(id string, v any) error {
	switch x := v.(type) {
	case target.Target:
		return targetIn(id, x)
	case []target.Target:
		return targetIn(id, x...)
	case table.Table:
		return tableIn(id, x)
	case Tabler:
		return tableIn(id, x.Table())
	case SVGer:
		svg, err := x.SVG()
		if err != nil {
			return err
		}
		caption := "figure"
		if s, ok := v.(fmt.Stringer); ok && s.String() != "" {
			caption = s.String()
		}
		return svgIn(id, svg, caption)
	case string:
		return markdownIn(id, x)
	case fmt.Stringer:
		return preformatted(id, x.String())
	}
	return preformatted(id, fmt.Sprintf("%+v", v))
}

// preformatted shows plain text as it is, in a <pre> block that wraps
// long lines at spaces (Notebook 6 breaks output lines inside words).
func preformatted(id, s string) error {
	return htmlIn(id, `<pre style="white-space:pre-wrap;word-break:normal;overflow-wrap:break-word">`+html.EscapeString(s)+"</pre>", s)
}

// fail prints err with the source line of the caller skip frames up and
// stops the cell.
func fail(err error, skip int) {
	w := errOut
	if w == nil {
		w = os.Stderr
	}
	fmt.Fprintf(w, "error: %v\n", err)
	if _, file, line, ok := runtime.Caller(skip); ok {
		if src := sourceLine(file, line); src != "" {
			fmt.Fprintf(w, "  in: %s\n", src)
		}
		// The file and line of the generated program, which gonb maps to
		// the cell and its line.
		fmt.Fprintf(w, "  at: %s:%d\n", filepath.Base(file), line)
	}
	stop()
}

// sourceLine returns line n (from 1) of file, trimmed, or "".
func sourceLine(file string, n int) string {
	f, err := os.Open(file)
	if err != nil {
		return ""
	}
	defer f.Close()
	sc := bufio.NewScanner(f)
	for i := 1; sc.Scan(); i++ {
		if i == n {
			return strings.TrimSpace(sc.Text())
		}
	}
	return ""
}
