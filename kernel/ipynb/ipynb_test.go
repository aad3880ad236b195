package ipynb

import (
	"encoding/json"
	"errors"
	"strings"
	"testing"
)

func TestParseErrors(t *testing.T) {
	for _, test := range []struct{ in, want string }{
		{"{\n \"cells\": [\n  {,\n ]}", "broken JSON at line 3, column 4"},
		{`{"nbformat": 3, "cells": []}`, "nbformat = 3, want 4"},
		{`{"nbformat": 4}`, `no "cells" list`},
		{`[1, 2]`, "cannot unmarshal array"},
	} {
		_, err := Parse([]byte(test.in))
		if !errors.Is(err, ErrFormat) || !strings.Contains(err.Error(), test.want) {
			t.Errorf("Parse(%q) error = %v, want ErrFormat containing %q", test.in, err, test.want)
		}
	}
}

func TestSetMetadataKeepsFields(t *testing.T) {
	in := `{"cells": [{"cell_type": "markdown", "metadata": {}, "source": "a <b> & c", "id": "x1"}],
 "metadata": {"kernelspec": {"name": "beamnote", "display_name": "beamnote · Go optics"}, "custom": [1, 2]},
 "nbformat": 4, "nbformat_minor": 5}`
	out, err := SetMetadata([]byte(in), "beamnote", map[string]any{"targets": []string{"a\t1 mm\t≥ 0 mm\tmet"}})
	if err != nil {
		t.Fatal(err)
	}
	var a, b map[string]any
	if err := json.Unmarshal([]byte(in), &a); err != nil {
		t.Fatal(err)
	}
	if err := json.Unmarshal(out, &b); err != nil {
		t.Fatalf("SetMetadata output is not JSON: %v\n%s", err, out)
	}
	meta := b["metadata"].(map[string]any)
	if got := meta["beamnote"].(map[string]any)["targets"].([]any)[0]; got != "a\t1 mm\t≥ 0 mm\tmet" {
		t.Errorf("metadata.beamnote.targets[0] = %v", got)
	}
	delete(meta, "beamnote")
	ja, _ := json.Marshal(a)
	jb, _ := json.Marshal(b)
	if string(ja) != string(jb) {
		t.Errorf("SetMetadata changed other fields:\n%s\n%s", ja, jb)
	}
	if !strings.Contains(string(out), "a <b> & c") || !strings.HasPrefix(string(out), "{\n \"cells\"") {
		t.Errorf("output escapes HTML or is not nbformat-indented:\n%s", out)
	}
	if nb, err := Parse(out); err != nil || nb.Metadata.Kernelspec.Name != "beamnote" {
		t.Errorf("Parse(output) = %+v, %v", nb, err)
	}
}

func TestText(t *testing.T) {
	for _, test := range []struct{ raw, want string }{
		{`"a\nb"`, "a\nb"},
		{`["a\n", "b"]`, "a\nb"},
		{``, ""},
	} {
		if got := Text(json.RawMessage(test.raw)); got != test.want {
			t.Errorf("Text(%s) = %q, want %q", test.raw, got, test.want)
		}
	}
}
