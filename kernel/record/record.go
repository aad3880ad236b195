// Package record is the last step of the notebook flow (install → serve →
// run and check → record): it collects the design targets an executed
// notebook recorded, keeps them in a plain-text record beside the
// notebook, says what moved since the previous record, and writes the
// summary page of a re-run.
//
// A record is the text form of target.Record, one line per target in the
// order the notebook states them, units in every line, so that a
// version-control diff of the record shows a design change. Its header
// says what produced it (beamnote commit, Go version, date); comparisons
// ignore the header.
package record

import (
	"encoding/json"
	"errors"
	"fmt"
	"io/fs"
	"os"
	"os/exec"
	"slices"
	"strings"
	"time"

	"github.com/beamnote/beamnote/internal/atomicfile"
	"github.com/beamnote/beamnote/kernel/ipynb"
	"github.com/beamnote/beamnote/kernel/nb"
	"github.com/beamnote/beamnote/opticslib/target"
)

// Suffix is what a record's file name adds to its notebook's name without
// ".ipynb": 01-imaging-relay.ipynb → 01-imaging-relay.targets.txt.
const Suffix = ".targets.txt"

// PathFor returns the path of the record beside the notebook at path.
func PathFor(notebook string) string {
	return strings.TrimSuffix(notebook, ".ipynb") + Suffix
}

// Targets returns the design targets an executed notebook recorded (the
// record lines under nb.MIMETarget in its outputs), in cell order. A
// recorded line that does not parse is an error naming the cell.
func Targets(n ipynb.Notebook) ([]target.Target, error) {
	var ts []target.Target
	for i, c := range n.Cells {
		for _, o := range c.Outputs {
			raw, ok := o.Data[string(nb.MIMETarget)]
			if !ok {
				continue
			}
			var lines []string
			if err := json.Unmarshal(raw, &lines); err != nil {
				return nil, fmt.Errorf("cell %d: %s output is not a list of record lines: %v", i, nb.MIMETarget, err)
			}
			for _, l := range lines {
				t, err := target.ParseRecordLine(l)
				if err != nil {
					return nil, fmt.Errorf("cell %d: recorded target %q: %v", i, l, err)
				}
				ts = append(ts, t)
			}
		}
	}
	return ts, nil
}

// Producer says what produces a record now: "beamnote <commit>[+changes],
// <Go version>, <UTC date and time>". The commit is the checkout's at
// root (git rev-parse --short HEAD; "+changes" when tracked files differ
// from it, "unknown commit" without git); goVersion is the Go that built
// the cells (go env GOVERSION).
func Producer(root, goVersion string, now time.Time) string {
	commit := "unknown commit"
	if out, err := exec.Command("git", "-C", root, "rev-parse", "--short", "HEAD").Output(); err == nil {
		commit = strings.TrimSpace(string(out))
		if err := exec.Command("git", "-C", root, "diff", "--quiet", "HEAD", "--").Run(); err != nil {
			commit += "+changes"
		}
	}
	return "beamnote " + commit + ", " + goVersion + ", " + now.UTC().Format(time.RFC3339)
}

// Read reads the record at path. A missing file is an error wrapping
// fs.ErrNotExist (no previous record: a first run).
func Read(path string) (target.Record, error) {
	f, err := os.Open(path)
	if err != nil {
		return target.Record{}, err
	}
	defer f.Close()
	r, err := target.ReadRecord(f)
	if err != nil {
		return target.Record{}, fmt.Errorf("%s: %w", path, err)
	}
	return r, nil
}

// Write writes r to path atomically: an interrupted run leaves the
// previous record whole.
func Write(path string, r target.Record) error {
	return atomicfile.Write(path, []byte(r.String()), 0o644)
}

// Keep compares r with the record at path (the previous run's) and writes
// r there when a target line changed or there was no record, so that the
// file changes with the design and not with the date. It returns what
// moved and a note: "" when there was a previous record, "first run: no
// previous record at <path>" when there was none (and nothing is written
// for a notebook that states no target). A previous record that does not
// parse is an error, and is left as it is.
func Keep(path string, r target.Record) ([]target.Change, string, error) {
	old, err := Read(path)
	var changes []target.Change
	note := ""
	switch {
	case errors.Is(err, fs.ErrNotExist) && len(r.Targets) == 0:
		return nil, "", nil
	case errors.Is(err, fs.ErrNotExist):
		note = "first run: no previous record at " + path
	case err != nil:
		return nil, "", err
	default:
		changes = target.Compare(old, r)
		if SameLines(old.Targets, r.Targets) {
			return changes, "", nil
		}
	}
	if err := Write(path, r); err != nil {
		return changes, note, fmt.Errorf("writing the record: %w", err)
	}
	return changes, note, nil
}

// SameLines reports whether two lists of targets give the same record
// lines, in order.
func SameLines(a, b []target.Target) bool {
	return slices.EqualFunc(a, b, func(x, y target.Target) bool { return x.RecordLine() == y.RecordLine() })
}
