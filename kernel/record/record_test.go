package record

import (
	"bytes"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/beamnote/beamnote/kernel/ipynb"
	"github.com/beamnote/beamnote/opticslib/target"
	"github.com/beamnote/beamnote/opticslib/units"
)

// executed is an executed notebook as nbconvert writes it, with two
// target outputs (one met, one missed) in two cells.
const executed = `{"nbformat": 4, "nbformat_minor": 5, "metadata": {}, "cells": [
 {"cell_type": "code", "execution_count": 1, "metadata": {}, "source": "%%", "outputs": [
  {"output_type": "display_data", "metadata": {}, "data": {"text/plain": "…",
   "application/vnd.beamnote.target+json": ["relay magnification\t-2.00031\t-2 ± 0.01\tmet"]}}]},
 {"cell_type": "markdown", "metadata": {}, "source": "text"},
 {"cell_type": "code", "execution_count": 2, "metadata": {}, "source": "%%", "outputs": [
  {"output_type": "display_data", "metadata": {}, "data": {"text/plain": "…",
   "application/vnd.beamnote.target+json": ["working distance\t18 mm\t20 … 30 mm\tMISSED: is 2 mm below the range"]}}]}
]}`

func TestTargetsAndRecord(t *testing.T) {
	n, err := ipynb.Parse([]byte(executed))
	if err != nil {
		t.Fatal(err)
	}
	ts, err := Targets(n)
	if err != nil {
		t.Fatal(err)
	}
	if len(ts) != 2 || !ts[0].Met() || ts[1].Met() || math.Abs(ts[1].Value-18e-3) > 1e-15 {
		t.Fatalf("Targets = %+v", ts)
	}
	dir := t.TempDir()
	path := PathFor(filepath.Join(dir, "relay.ipynb"))
	if filepath.Base(path) != "relay.targets.txt" {
		t.Errorf("PathFor = %s", path)
	}
	rec := target.Record{Source: "relay.ipynb", Producer: "test", Targets: ts}
	ch, note, err := Keep(path, rec)
	if err != nil || ch != nil || !strings.HasPrefix(note, "first run") {
		t.Errorf("Keep without a record = %v, %q, %v; want a first-run note", ch, note, err)
	}
	if err := Write(path, rec); err != nil {
		t.Fatal(err)
	}
	moved := rec
	moved.Targets = []target.Target{ts[0], target.Between("working distance", 24*units.Millimeter, 20*units.Millimeter, 30*units.Millimeter)}
	ch, note, err = Keep(path, moved)
	if err != nil || note != "" || len(ch) != 1 || ch[0].Reason != "now met" {
		t.Errorf("Keep = %v, %q, %v; want working distance now met", ch, note, err)
	}
	// A previous record that does not parse is an error, and stays as it is.
	if err := os.WriteFile(path, []byte("garbage line\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	if _, _, err := Keep(path, rec); err == nil || !strings.Contains(err.Error(), "relay.targets.txt") {
		t.Errorf("Keep with a corrupt record: error = %v, want one naming the file", err)
	}
}

func TestReportAndSummary(t *testing.T) {
	n, _ := ipynb.Parse([]byte(executed))
	ts, _ := Targets(n)
	rs := []Result{
		{Notebook: "a.ipynb", Export: "a.html", Targets: ts, Note: "first run: no previous record at a.targets.txt"},
		{Notebook: "b.ipynb", Problems: []string{"cell 3 (x := 1): timed out after 60 s"}},
	}
	var out bytes.Buffer
	if Report(&out, rs) {
		t.Error("Report passed with a missed target and a problem")
	}
	for _, want := range []string{"a.ipynb: target working distance missed: is 2 mm below the range", "b.ipynb: cell 3 (x := 1): timed out after 60 s"} {
		if !strings.Contains(out.String(), want) {
			t.Errorf("report lacks %q:\n%s", want, out.String())
		}
	}
	page := string(Summary(rs, "beamnote abc, go1.26, 2026-12-02T06:00:00Z"))
	for _, want := range []string{"0 of 2 notebooks pass", `<a href="a.html">a.ipynb</a>`, "✗ missed: is 2 mm below the range", "timed out after 60 s", "<td class=\"num\">0.01</td>", "first run"} {
		if !strings.Contains(page, want) {
			t.Errorf("summary lacks %q", want)
		}
	}
}
