// Package nb shows beamnote results in a notebook cell: SVG figures, HTML
// tables and Markdown, through gonb's display channel.
//
// The same calls work outside a notebook (go run, go test): they print a
// plain-text fallback to standard output instead, and figures can be written
// to files with [SaveSVG]. Every display call waits until the kernel has
// taken the output (gonb's sync handshake, as gonbui.Sync), so nothing is
// lost when a cell ends. The package talks to gonb's pipes with
// gonbui/protocol and the standard library only (see pipe.go), so a cell
// that imports it links no more than that.
//
// # Figures
//
// A figure is sent as one display bundle carrying the SVG twice, as
// image/svg+xml and as inline HTML, plus a text/plain caption. Notebook
// front-ends prefer the HTML copy; nbconvert's HTML export keeps it too; the
// image/svg+xml copy is what tools that extract figures look for.
//
// # Output in place, progress, interrupts
//
// A [Display] is one output area that each call replaces (Jupyter's
// display_id, gonb's UpdateHTML): the last content stays in the notebook.
// [Progress] is a progress bar drawn in one, whose Update method is a
// progress callback (opticslib/tolerance's Options.Progress), throttled
// to ten drawings a second. [Context] is cancelled when the notebook
// interrupts the cell (gonb sends the program SIGINT), for long
// computations to stop early.
//
// # Headless runs and live controls
//
// [Headless] reports whether the notebook runs without a browser
// (BEAMNOTE_HEADLESS=1, set by `make test`). Interactive widgets wait for a
// browser that never comes, so code that uses them must check it first;
// package nb/live (sliders that redraw a figure) does, and falls back to
// fixed figures. [Listen] receives the values the page sends through
// gonb's comms, the channel under such controls.
package nb

import (
	"bytes"
	"fmt"
	"html"
	"io"
	"os"
	"path/filepath"
	"strings"

	"github.com/beamnote/beamnote/internal/atomicfile"
	"github.com/janpfeifer/gonb/gonbui/protocol"
)

// Out is where the plain-text fallbacks go outside a notebook; nil means
// the current os.Stdout.
var Out io.Writer

func out() io.Writer {
	if Out != nil {
		return Out
	}
	return os.Stdout
}

// InNotebook reports whether the program runs as a gonb notebook cell.
func InNotebook() bool { return inNotebook }

// Headless reports whether the notebook is being executed without a browser
// (BEAMNOTE_HEADLESS=1), as under `make test`.
func Headless() bool { return os.Getenv("BEAMNOTE_HEADLESS") == "1" }

// SVG shows an SVG document with a short caption (used as the text
// fallback and as the figure's accessible title). Outside a notebook it
// prints "[figure: caption (N bytes of SVG)]"; if BEAMNOTE_FIGURE_DIR is set
// it also writes the SVG there under a name made from the caption.
func SVG(svg []byte, caption string) error { return svgIn("", svg, caption) }

// svgIn is SVG into the display area id ("" for a new output).
func svgIn(id string, svg []byte, caption string) error {
	if len(bytes.TrimSpace(svg)) == 0 {
		return fmt.Errorf("nb: figure %q: empty SVG", caption)
	}
	if !InNotebook() {
		fmt.Fprintf(out(), "[figure: %s (%d bytes of SVG)]\n", caption, len(svg))
		if dir := os.Getenv("BEAMNOTE_FIGURE_DIR"); dir != "" {
			path := filepath.Join(dir, fileName(caption)+".svg")
			if err := SaveSVG(path, svg); err != nil {
				return err
			}
			fmt.Fprintf(out(), "[figure written to %s]\n", path)
		}
		return nil
	}
	return sendIn(id, map[protocol.MIMEType]any{
		protocol.MIMEImageSVG:  string(svg),
		protocol.MIMETextHTML:  figureHTML(svg, caption),
		protocol.MIMETextPlain: "[figure: " + caption + "]",
	})
}

// SaveSVG writes an SVG figure to path atomically.
func SaveSVG(path string, svg []byte) error {
	if err := atomicfile.Write(path, svg, 0o644); err != nil {
		return fmt.Errorf("nb: %w", err)
	}
	return nil
}

// Markdown shows Markdown text; outside a notebook it prints it as is.
func Markdown(md string) error { return markdownIn("", md) }

func markdownIn(id, md string) error {
	return show(id, map[protocol.MIMEType]any{
		protocol.MIMETextMarkdown: md,
		protocol.MIMETextPlain:    md,
	}, md)
}

// HTML shows an HTML fragment with a plain-text alternative for
// front-ends and terminals that cannot render it.
func HTML(fragment, plain string) error { return htmlIn("", fragment, plain) }

func htmlIn(id, fragment, plain string) error {
	return show(id, map[protocol.MIMEType]any{
		protocol.MIMETextHTML:  fragment,
		protocol.MIMETextPlain: plain,
	}, plain)
}

// show sends one display bundle in a notebook, into the display area id
// ("" for a new output), or prints plain outside.
func show(id string, data map[protocol.MIMEType]any, plain string) error {
	if !InNotebook() {
		fmt.Fprintln(out(), strings.TrimRight(plain, "\n"))
		return nil
	}
	return sendIn(id, data)
}

// send sends one display bundle to gonb as a new output and waits until
// gonb has taken it.
func send(data map[protocol.MIMEType]any) error { return sendIn("", data) }

// sendIn sends one display bundle into the display area id (gonb sends
// display_data the first time it sees an id, update_display_data after;
// "" is a new output every time) and waits until gonb has taken it.
func sendIn(id string, data map[protocol.MIMEType]any) error {
	if err := kernel.display(&protocol.DisplayData{Data: data, DisplayID: id}); err != nil {
		return fmt.Errorf("nb: sending output to the notebook: %w", err)
	}
	return nil
}

// figureHTML is the inline-HTML copy of a figure; the caption is escaped
// for an attribute value.
func figureHTML(svg []byte, caption string) string {
	return `<div class="beamnote-figure" title="` + html.EscapeString(caption) + `">` + stripXMLHeader(svg) + `</div>`
}

func stripXMLHeader(svg []byte) string {
	s := string(svg)
	if strings.HasPrefix(s, "<?xml") {
		if i := strings.Index(s, "?>"); i >= 0 {
			s = s[i+2:]
		}
	}
	return strings.TrimSpace(s)
}

// fileName makes a safe file name from a caption.
func fileName(caption string) string {
	var b strings.Builder
	for _, r := range strings.ToLower(caption) {
		switch {
		case r >= 'a' && r <= 'z', r >= '0' && r <= '9':
			b.WriteRune(r)
		case b.Len() > 0 && !strings.HasSuffix(b.String(), "-"):
			b.WriteByte('-')
		}
	}
	s := strings.Trim(b.String(), "-")
	if s == "" {
		s = "figure"
	}
	if len(s) > 60 { // s is ASCII
		s = strings.TrimRight(s[:60], "-")
	}
	return s
}
