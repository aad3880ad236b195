package nb

import (
	"html"
	"strings"

	"github.com/beamnote/beamnote/opticslib/table"
)

// Table shows t, the one table type of beamnote (opticslib/table), as an
// HTML table in a notebook and as aligned text ([table.Table.Text])
// outside one. Cells are plain text and escaped. A row longer than the
// header is an error ([table.Table.Validate]).
//
//	nb.Table(sys.Table())
func Table(t table.Table) error { return tableIn("", t) }

func tableIn(id string, t table.Table) error {
	if err := t.Validate(); err != nil {
		return err
	}
	return htmlIn(id, tableHTML(t), t.Text())
}

// tableHTML renders t as an HTML table fragment with every cell escaped;
// the class attribute is "beamnote-table".
func tableHTML(t table.Table) string {
	var b strings.Builder
	b.WriteString(`<table class="beamnote-table">`)
	if t.Caption != "" {
		b.WriteString("<caption>" + html.EscapeString(t.Caption) + "</caption>")
	}
	b.WriteString("<thead><tr>")
	for _, h := range t.Header {
		b.WriteString("<th>" + html.EscapeString(h) + "</th>")
	}
	b.WriteString("</tr></thead><tbody>")
	for i := range t.Rows {
		b.WriteString("<tr>")
		for j := range t.Header {
			b.WriteString("<td>" + html.EscapeString(t.Cell(i, j)) + "</td>")
		}
		b.WriteString("</tr>")
	}
	b.WriteString("</tbody></table>")
	return b.String()
}
