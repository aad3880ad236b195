package nb

import (
	"bytes"
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
