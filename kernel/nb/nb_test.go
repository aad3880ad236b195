package nb

import (
	"bytes"
	"errors"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/beamnote/beamnote/opticslib/table"
)

// Plain-text fallbacks and HTML fragments of the display package. The HTML
// escaping follows the HTML5 specification's rules for text content
// (html.EscapeString); nothing here is physics.

func capture(t *testing.T, f func() error) string {
	t.Helper()
	var b bytes.Buffer
	old := Out
	Out = &b
	defer func() { Out = old }()
	if err := f(); err != nil {
		t.Fatal(err)
	}
	return b.String()
}

func TestTableText(t *testing.T) {
	got := capture(t, func() error {
		return Table(table.Table{Caption: "Waists", Header: []string{"element", "w0 (µm)", "z (mm)"}, Rows: [][]string{
			{"L1", "412.0", "0.0"},
			{"L2", "35.2"},
		}})
	})
	want := "Waists\n" +
		"element  w0 (µm)  z (mm)\n" +
		"-------  -------  ------\n" +
		"L1       412.0    0.0\n" +
		"L2       35.2\n"
	if got != want {
		t.Errorf("Table text =\n%q\nwant\n%q", got, want)
	}
}

func TestTableHTMLEscapes(t *testing.T) {
	got := tableHTML(table.Table{Caption: "a<b", Header: []string{"x&y"}, Rows: [][]string{{"<script>"}}})
	for _, want := range []string{"<caption>a&lt;b</caption>", "<th>x&amp;y</th>", "<td>&lt;script&gt;</td>"} {
		if !strings.Contains(got, want) {
			t.Errorf("tableHTML = %s, want it to contain %s", got, want)
		}
	}
}

func TestTableRowTooLong(t *testing.T) {
	if err := Table(table.Table{Caption: "t", Header: []string{"a"}, Rows: [][]string{{"1", "2"}}}); err == nil {
		t.Error("Table with a row longer than the header: no error")
	}
}

func TestSVGFallbackWritesFile(t *testing.T) {
	dir := t.TempDir()
	t.Setenv("BEAMNOTE_FIGURE_DIR", dir)
	svg := []byte(`<?xml version="1.0"?><svg xmlns="http://www.w3.org/2000/svg"></svg>`)
	got := capture(t, func() error { return SVG(svg, "Caustic: expander 3×") })
	if !strings.Contains(got, "[figure: Caustic: expander 3× (") {
		t.Errorf("SVG fallback printed %q", got)
	}
	b, err := os.ReadFile(filepath.Join(dir, "caustic-expander-3.svg"))
	if err != nil || !bytes.Equal(b, svg) {
		t.Errorf("figure file: %v, content %q", err, b)
	}
	if err := SVG(nil, "empty"); err == nil {
		t.Error("SVG(nil): no error")
	}
}

func TestStripXMLHeader(t *testing.T) {
	if got := stripXMLHeader([]byte("<?xml version=\"1.0\"?>\n<svg/>")); got != "<svg/>" {
		t.Errorf("stripXMLHeader = %q", got)
	}
}

func TestFigureHTMLEscapesCaption(t *testing.T) {
	got := figureHTML([]byte(`<?xml version="1.0"?><svg/>`), `w0 < 1 "mm" & 'f'`)
	want := `<div class="beamnote-figure" title="w0 &lt; 1 &#34;mm&#34; &amp; &#39;f&#39;"><svg/></div>`
	if got != want {
		t.Errorf("figureHTML = %s, want %s", got, want)
	}
}

func TestFileName(t *testing.T) {
	for _, test := range []struct{ caption, want string }{
		{"Caustic: expander 3×", "caustic-expander-3"},
		{"  ", "figure"},
		{"µ", "figure"},
		{strings.Repeat("a", 59) + " b", strings.Repeat("a", 59)},
	} {
		if got := fileName(test.caption); got != test.want {
			t.Errorf("fileName(%q) = %q, want %q", test.caption, got, test.want)
		}
	}
}

type fakeTable struct{}

func (fakeTable) Table() table.Table {
	return table.Table{Caption: "Cardinal points", Header: []string{"quantity", "value"}, Rows: [][]string{{"EFL (mm)", "100.000"}}}
}

type fakeFigure struct{}

func (fakeFigure) SVG() ([]byte, error) {
	return []byte(`<svg xmlns="http://www.w3.org/2000/svg"/>`), nil
}
func (fakeFigure) String() string { return "Caustic of the expander" }

// Show renders what it is given by the interfaces it implements, and
// stops the cell (here: records the stop) on an error, naming the line.
func TestShowAndMust(t *testing.T) {
	got := capture(t, func() error { Show(fakeTable{}); return nil })
	if !strings.Contains(got, "Cardinal points") || !strings.Contains(got, "EFL (mm)  100.000") {
		t.Errorf("Show(Tabler) printed %q", got)
	}
	got = capture(t, func() error { Show(fakeFigure{}); return nil })
	if !strings.Contains(got, "[figure: Caustic of the expander (") {
		t.Errorf("Show(SVGer) printed %q", got)
	}
	var stderr bytes.Buffer
	errOut = &stderr
	stopped := 0
	oldStop := stop
	stop = func() { stopped++ }
	defer func() { errOut, stop = nil, oldStop }()
	v := Must(42, nil)
	if v != 42 || stopped != 0 {
		t.Errorf("Must(42, nil) = %d, stopped %d times", v, stopped)
	}
	Must(0, errors.New("paraxial: ThinLens \"L1\" (call 2): focal length f = 0 m: must be nonzero and finite"))
	if stopped != 1 || !strings.HasPrefix(stderr.String(), "error: paraxial: ThinLens \"L1\" (call 2)") ||
		!strings.Contains(stderr.String(), `in: Must(0, errors.New("paraxial: ThinLens`) {
		t.Errorf("Must(err): stopped %d, stderr %q", stopped, stderr.String())
	}
	stderr.Reset()
	Show(fakeTable{}, errors.New("beam: bad"))
	if stopped != 2 || !strings.Contains(stderr.String(), "error: beam: bad") {
		t.Errorf("Show(v, err): stopped %d, stderr %q", stopped, stderr.String())
	}
	stderr.Reset()
	Show(errors.New("sweep: bad"))
	if stopped != 3 || !strings.Contains(stderr.String(), "error: sweep: bad") || !strings.Contains(stderr.String(), "  at: nb_test.go:") {
		t.Errorf("Show(err): stopped %d, stderr %q", stopped, stderr.String())
	}
	Check(nil)
	if stopped != 3 {
		t.Errorf("Check(nil) stopped the cell")
	}
}
