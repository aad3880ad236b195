// Package ipynb reads the Jupyter notebook files (nbformat 4) that the
// notebook runner executes and checks, and writes metadata into them
// without losing any field it does not know.
package ipynb

import (
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"os"
	"strings"
)

// Notebook is the part of an nbformat 4 document that beamnote reads.
type Notebook struct {
	NBFormat int    `json:"nbformat"`
	Cells    []Cell `json:"cells"`
	Metadata struct {
		Kernelspec struct {
			Name        string `json:"name"`
			DisplayName string `json:"display_name"`
		} `json:"kernelspec"`
	} `json:"metadata"`
}

// Cell is one notebook cell.
type Cell struct {
	CellType string          `json:"cell_type"`
	Source   json.RawMessage `json:"source"` // a string or a list of strings
	Metadata struct {
		Tags []string `json:"tags"`
	} `json:"metadata"`
	ExecutionCount *int     `json:"execution_count"`
	Outputs        []Output `json:"outputs"`
}

// Output is one cell output.
type Output struct {
	OutputType string                     `json:"output_type"`
	Name       string                     `json:"name"` // stream name
	Text       json.RawMessage            `json:"text"`
	Data       map[string]json.RawMessage `json:"data"`
	EName      string                     `json:"ename"`
	EValue     string                     `json:"evalue"`
	Traceback  []string                   `json:"traceback"`
}

// Text decodes nbformat's "string or list of strings" (a cell's source, a
// stream's text, a text MIME value).
func Text(raw json.RawMessage) string {
	if len(raw) == 0 {
		return ""
	}
	var s string
	if json.Unmarshal(raw, &s) == nil {
		return s
	}
	var parts []string
	if json.Unmarshal(raw, &parts) == nil {
		return strings.Join(parts, "")
	}
	return string(raw)
}

// ErrFormat is the error of a file that is not an nbformat 4 notebook.
var ErrFormat = errors.New("not a Jupyter notebook (nbformat 4)")

// Parse decodes a notebook file's bytes. It returns an error wrapping
// [ErrFormat] that says where the JSON breaks (line and column) or what
// is missing, for a file that is not an nbformat 4 notebook.
func Parse(b []byte) (Notebook, error) {
	var nb Notebook
	if err := json.Unmarshal(b, &nb); err != nil {
		var se *json.SyntaxError
		if errors.As(err, &se) {
			line, col := position(b, se.Offset)
			return Notebook{}, fmt.Errorf("%w: broken JSON at line %d, column %d: %v", ErrFormat, line, col, err)
		}
		return Notebook{}, fmt.Errorf("%w: %v", ErrFormat, err)
	}
	if nb.NBFormat != 4 {
		return Notebook{}, fmt.Errorf("%w: nbformat = %d, want 4 (save it with Jupyter Notebook 6 or later)", ErrFormat, nb.NBFormat)
	}
	if nb.Cells == nil {
		return Notebook{}, fmt.Errorf("%w: no \"cells\" list", ErrFormat)
	}
	return nb, nil
}

// Read reads and parses the notebook at path; errors name the file.
func Read(path string) (Notebook, error) {
	b, err := os.ReadFile(path)
	if err != nil {
		return Notebook{}, err
	}
	nb, err := Parse(b)
	if err != nil {
		return Notebook{}, fmt.Errorf("%s: %w", path, err)
	}
	return nb, nil
}

// position returns the line and column (from 1) of byte offset off.
func position(b []byte, off int64) (line, col int) {
	off = min(max(off, 0), int64(len(b)))
	before := b[:off]
	line = bytes.Count(before, []byte("\n")) + 1
	col = int(off) - (bytes.LastIndexByte(before, '\n') + 1)
	return line, max(col, 1)
}

// SetMetadata returns the notebook file b with metadata[key] set to
// value, every other field kept as it was (as JSON values; key order and
// spacing follow nbformat's writer: sorted keys, one-space indent, no
// escaping of <, > and &).
func SetMetadata(b []byte, key string, value any) ([]byte, error) {
	var doc map[string]json.RawMessage
	if err := json.Unmarshal(b, &doc); err != nil {
		return nil, fmt.Errorf("%w: %v", ErrFormat, err)
	}
	meta := map[string]json.RawMessage{}
	if raw, ok := doc["metadata"]; ok {
		if err := json.Unmarshal(raw, &meta); err != nil {
			return nil, fmt.Errorf("%w: metadata is not an object: %v", ErrFormat, err)
		}
	}
	v, err := marshal(value)
	if err != nil {
		return nil, err
	}
	meta[key] = v
	if doc["metadata"], err = marshal(meta); err != nil {
		return nil, err
	}
	out, err := marshal(doc)
	if err != nil {
		return nil, err
	}
	var ind bytes.Buffer
	if err := json.Indent(&ind, out, "", " "); err != nil {
		return nil, err
	}
	ind.WriteByte('\n')
	return ind.Bytes(), nil
}

func marshal(v any) (json.RawMessage, error) {
	var buf bytes.Buffer
	enc := json.NewEncoder(&buf)
	enc.SetEscapeHTML(false)
	if err := enc.Encode(v); err != nil {
		return nil, err
	}
	return bytes.TrimRight(buf.Bytes(), "\n"), nil
}
