package nb

import (
	"fmt"
	"html"
	"strings"
	"unicode/utf8"
)

// Table shows a table with a caption, a header row and data rows. Cells are
// plain text (escaped for HTML). Outside a notebook it prints the table with
// aligned columns. Rows shorter than the header are padded with empty cells;
// a row longer than the header is an error.
func Table(caption string, header []string, rows [][]string) error {
	for i, r := range rows {
		if len(r) > len(header) {
			return fmt.Errorf("nb: table %q: row %d has %d cells, header has %d", caption, i, len(r), len(header))
		}
	}
	return HTML(tableHTML(caption, header, rows), tableText(caption, header, rows))
}

func cell(r []string, j int) string {
	if j < len(r) {
		return r[j]
	}
	return ""
}

func tableHTML(caption string, header []string, rows [][]string) string {
	var b strings.Builder
	b.WriteString(`<table class="beamnote-table">`)
	if caption != "" {
		fmt.Fprintf(&b, "<caption>%s</caption>", html.EscapeString(caption))
	}
	b.WriteString("<thead><tr>")
	for _, h := range header {
		fmt.Fprintf(&b, "<th>%s</th>", html.EscapeString(h))
	}
	b.WriteString("</tr></thead><tbody>")
	for _, r := range rows {
		b.WriteString("<tr>")
		for j := range header {
			fmt.Fprintf(&b, "<td>%s</td>", html.EscapeString(cell(r, j)))
		}
		b.WriteString("</tr>")
	}
	b.WriteString("</tbody></table>")
	return b.String()
}

func tableText(caption string, header []string, rows [][]string) string {
	width := make([]int, len(header))
	for j, h := range header {
		width[j] = utf8.RuneCountInString(h)
		for _, r := range rows {
			width[j] = max(width[j], utf8.RuneCountInString(cell(r, j)))
		}
	}
	var b strings.Builder
	if caption != "" {
		b.WriteString(caption + "\n")
	}
	line := func(r []string) {
		for j := range header {
			if j > 0 {
				b.WriteString("  ")
			}
			c := cell(r, j)
			b.WriteString(c)
			if j < len(header)-1 {
				b.WriteString(strings.Repeat(" ", width[j]-utf8.RuneCountInString(c)))
			}
		}
		b.WriteString("\n")
	}
	line(header)
	rule := make([]string, len(header))
	for j := range rule {
		rule[j] = strings.Repeat("-", width[j])
	}
	line(rule)
	for _, r := range rows {
		line(r)
	}
	return b.String()
}
