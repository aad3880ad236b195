package setup

import (
	"bytes"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"slices"
	"strings"
)

// CellModule creates a cell module in dir exactly as the kernel does: it runs
// "go mod init" through the installed go wrapper with GONB_TMP_DIR=dir. It
// returns the environment to build in that module with.
func CellModule(l Layout, dir string, log io.Writer) (map[string]string, error) {
	env, err := l.KernelEnv()
	if err != nil {
		return nil, err
	}
	env["GONB_TMP_DIR"] = dir
	if _, err := os.Stat(l.shimPath()); err != nil {
		return nil, fmt.Errorf("setup: the go wrapper %s is missing (run beamnote-kernel install): %w", l.shimPath(), err)
	}
	if err := l.run(log, dir, env, l.shimPath(), "mod", "init", "beamnote_cell"); err != nil {
		return nil, err
	}
	return env, nil
}

// ImportablePackages lists the non-main packages of the checkout that cells
// may import (opticslib and the notebook display package), sorted.
func ImportablePackages(l Layout) ([]string, error) {
	out, err := l.output(l.Root, l.RealGo, "list", "-f", "{{if ne .Name \"main\"}}{{.ImportPath}}{{end}}",
		"./opticslib/...", "./kernel/nb/...")
	if err != nil {
		return nil, err
	}
	var pkgs []string
	for _, p := range strings.Fields(out) {
		if !strings.Contains(p, "/internal/") {
			pkgs = append(pkgs, p)
		}
	}
	slices.Sort(pkgs)
	return pkgs, nil
}

// Warm compiles, in a cell module with the kernel's environment and flags, a
// program that imports every package of [ImportablePackages], so that the
// packages and their dependencies (gonum, gonum/plot, gonbui) sit in the build
// cache before the first cell.
func Warm(l Layout, log io.Writer) error {
	dir, err := os.MkdirTemp("", "beamnote-warm-")
	if err != nil {
		return err
	}
	defer os.RemoveAll(dir)
	env, err := CellModule(l, dir, log)
	if err != nil {
		return err
	}
	pkgs, err := ImportablePackages(l)
	if err != nil {
		return err
	}
	var src bytes.Buffer
	src.WriteString("// Command warm links every beamnote package once to fill the build cache.\npackage main\n\nimport (\n")
	for _, p := range pkgs {
		fmt.Fprintf(&src, "\t_ %q\n", p)
	}
	src.WriteString(")\n\nfunc main() {}\n")
	if err := os.WriteFile(filepath.Join(dir, "main.go"), src.Bytes(), 0o644); err != nil {
		return err
	}
	// The same two steps gonb takes for every cell: go get, then go build.
	if err := l.run(log, dir, env, l.shimPath(), "get"); err != nil {
		return err
	}
	return l.run(log, dir, env, l.shimPath(), "build", "-o", filepath.Join(dir, "warm"))
}
