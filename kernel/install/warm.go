package install

import (
	"bytes"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"slices"
	"strings"

	"github.com/beamnote/beamnote/kernel/layout"
)

// CellModule creates a cell module in dir exactly as the kernel does: it runs
// "go mod init" through the installed go wrapper with GONB_TMP_DIR=dir. It
// returns the environment to build in that module with.
func CellModule(l layout.Layout, dir string, log io.Writer) (map[string]string, error) {
	env, err := l.KernelEnv()
	if err != nil {
		return nil, err
	}
	env["GONB_TMP_DIR"] = dir
	if _, err := os.Stat(shimPath(l)); err != nil {
		return nil, fmt.Errorf("install: the go wrapper %s is missing (run beamnote-kernel install): %w", shimPath(l), err)
	}
	if err := layout.Run(log, dir, env, shimPath(l), "mod", "init", "beamnote_cell"); err != nil {
		return nil, err
	}
	return env, nil
}

// ImportablePackages lists the non-main packages of the checkout that cells
// may import (opticslib and the notebook display package), sorted.
func ImportablePackages(l layout.Layout) ([]string, error) {
	out, err := layout.Output(l.Root, l.RealGo, "list", "-f", "{{if ne .Name \"main\"}}{{.ImportPath}}{{end}}",
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
// packages and their dependencies (gonum, gonum/plot, gonb's protocol) sit in
// the build cache before the first cell. It builds the program twice, as
// cells are built: once as it is (with the wrapper's [cellSVGOnlyFlag]) and
// once with a reference to optplot's Figure.Save, which the wrapper builds
// without that tag, with the PNG and PDF writers.
func Warm(l layout.Layout, log io.Writer) error {
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
	for _, save := range []bool{false, true} {
		if err := os.WriteFile(filepath.Join(dir, "main.go"), warmSource(pkgs, save), 0o644); err != nil {
			return err
		}
		// The same two steps gonb takes for every cell: go get, then go build.
		if err := layout.Run(log, dir, env, shimPath(l), "get"); err != nil {
			return err
		}
		if err := layout.Run(log, dir, env, shimPath(l), "build", "-o", filepath.Join(dir, "warm")); err != nil {
			return err
		}
	}
	return nil
}

// optplotPkg is the figure package, whose Figure.Save makes the go wrapper
// build a cell with the PNG and PDF writers.
const optplotPkg = layout.ModulePath + "/opticslib/optplot"

// warmSource is the warm-up program: it imports every package of pkgs and,
// if save is set and optplot is among them, refers to Figure.Save.
func warmSource(pkgs []string, save bool) []byte {
	var src bytes.Buffer
	src.WriteString("// Command warm links every beamnote package once to fill the build cache.\npackage main\n\nimport (\n")
	saveRef := false
	for _, p := range pkgs {
		if save && p == optplotPkg {
			fmt.Fprintf(&src, "\t%q\n", p)
			saveRef = true
			continue
		}
		fmt.Fprintf(&src, "\t_ %q\n", p)
	}
	src.WriteString(")\n\n")
	if saveRef {
		src.WriteString("var _ = optplot.Figure.Save\n\n")
	}
	src.WriteString("func main() {}\n")
	return src.Bytes()
}
