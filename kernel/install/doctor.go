package install

import (
	"bytes"
	"encoding/json"
	"fmt"
	"io"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"unicode/utf8"

	"github.com/beamnote/beamnote/kernel/layout"
)

// Check is one line of the doctor's report.
type Check struct {
	Name   string // what was checked
	OK     bool
	Detail string // what was found
	Fix    string // what to do when not OK
}

const fixDeps = "run `make notebook` (it calls kernel/install-deps.sh: Debian/Ubuntu packages " +
	"jupyter-notebook python3-nbconvert python3-nbclient jupyter-client); elsewhere install " +
	"Jupyter Notebook 6.x, nbconvert and nbclient with your package manager"

// Doctor inspects the machine and the checkout and reports what is missing,
// with the fix for each item. user selects the per-user kernelspec.
func Doctor(l layout.Layout, user bool) []Check {
	var cs []Check
	add := func(name string, err error, detail, fix string) {
		c := Check{Name: name, OK: err == nil, Detail: detail, Fix: fix}
		if err != nil {
			c.Detail = err.Error()
		}
		cs = append(cs, c)
	}

	ge, err := l.GoEnv("GOVERSION")
	if err == nil {
		err = checkGoVersion(l, ge["GOVERSION"])
	}
	add("Go ≥ "+MinGo, err, ge["GOVERSION"]+" at "+l.RealGo, "install Go "+MinGo+" or newer from https://go.dev/dl and put it on PATH")

	jup := layout.Jupyter()
	var jerr error
	detail := jup
	if jup == "" {
		jerr = fmt.Errorf("no jupyter command")
	}
	add("jupyter", jerr, detail, fixDeps)
	py := layout.Python()
	for _, mod := range []struct{ name, module string }{
		{"nbconvert (headless execution)", "nbconvert"},
		{"nbclient", "nbclient"},
		{"jupyter_client (kernelspec)", "jupyter_client"},
		{"notebook server", "notebook"},
	} {
		var err error
		var out []byte
		if py == "" {
			err = fmt.Errorf("no python3")
		} else {
			out, err = exec.Command(py, "-c", "import "+mod.module+"; print("+mod.module+".__version__)").CombinedOutput()
			if err != nil {
				err = fmt.Errorf("%s cannot import %s", py, mod.module)
			}
		}
		add(mod.name, err, strings.TrimSpace(string(out)), fixDeps)
	}

	// The versions the binaries were built from (their build information),
	// not what they print: gonb v0.11.4 says v0.11.1 for -V.
	for _, tool := range []struct {
		name, mod, dir, what string
	}{
		{"gonb", gonbPkg, l.Root, ""},
		{"goimports", "golang.org/x/tools", l.Root, ""},
		{"gopls", goplsPkg, GoplsModule(l), " (completion, help)"},
	} {
		bin := filepath.Join(l.Bin(), tool.name)
		if tool.name == "gopls" {
			bin = goplsBinary(l) // .beamnote/bin/gopls is the script that starts it
		}
		want, err := pinnedVersion(l, tool.dir, tool.mod)
		if err == nil {
			err = checkBuilt(bin, tool.mod, want)
		}
		add(tool.name+" "+want+tool.what, err, bin, "run `make kernel`")
	}
	b, serr := os.ReadFile(shimPath(l))
	if serr == nil && shimRealGo(b) != l.RealGo {
		serr = fmt.Errorf("%s calls %s, but go is %s", shimPath(l), shimRealGo(b), l.RealGo)
	}
	if serr == nil && shimRoot(b) != l.Root {
		serr = fmt.Errorf("%s makes cells import the checkout at %s, but this checkout is %s (moved or copied)", shimPath(l), shimRoot(b), l.Root)
	}
	add("go wrapper for cells", serr, shimPath(l), "run `make kernel`")

	kj, kerr := KernelspecPath(l, user)
	if kerr == nil {
		kerr = checkKernelspec(l, kj)
	}
	add("kernelspec "+layout.KernelName, kerr, kj, "run `make kernel` (or `make kernel KERNEL_SCOPE=user`)")

	add("warm build cache", checkWarm(l), "opticslib and its dependencies compiled for cells", "run `make kernel`")
	return cs
}

// KernelspecPath returns the kernel.json that the kernel uses: the
// project-local one, or the per-user one if user is set.
func KernelspecPath(l layout.Layout, user bool) (string, error) {
	dataDir := l.JupyterData()
	if user {
		d, err := layout.UserJupyterData()
		if err != nil {
			return "", err
		}
		dataDir = d
	}
	return filepath.Join(layout.KernelDir(dataDir), "kernel.json"), nil
}

// CheckKernelspec reports an error unless the kernelspec (project-local, or
// per-user if user is set) exists and launches this checkout's kernel.
func CheckKernelspec(l layout.Layout, user bool) error {
	kj, err := KernelspecPath(l, user)
	if err != nil {
		return err
	}
	return checkKernelspec(l, kj)
}

// checkKernelspec reports an error unless the kernelspec at path starts
// this checkout's gonb through this checkout's launcher, which puts the go
// wrapper first on PATH. kernel.json and the launcher hold absolute paths,
// so a checkout that moved, or a per-user kernelspec written from another
// checkout, runs the wrong code or nothing.
func checkKernelspec(l layout.Layout, path string) error {
	b, err := os.ReadFile(path)
	if err != nil {
		return err
	}
	var spec struct {
		Argv     []string          `json:"argv"`
		Env      map[string]string `json:"env"`
		Metadata struct {
			Beamnote struct {
				Root string `json:"root"`
			} `json:"beamnote"`
		} `json:"metadata"`
	}
	if err := json.Unmarshal(b, &spec); err != nil {
		return fmt.Errorf("%s: %w", path, err)
	}
	if len(spec.Argv) == 0 {
		return fmt.Errorf("%s: empty argv", path)
	}
	root := spec.Metadata.Beamnote.Root
	if root == "" {
		root = spec.Env["BEAMNOTE_ROOT"]
	}
	if root != l.Root {
		return fmt.Errorf("%s was written for the checkout at %q, not this one (%s): the checkout moved, or another checkout installed it", path, root, l.Root)
	}
	if want := launcherPath(l); spec.Argv[0] != want {
		return fmt.Errorf("%s launches %s, want %s", path, spec.Argv[0], want)
	}
	if _, ok := spec.Env["PATH"]; ok {
		return fmt.Errorf("%s sets PATH, which hides the user's PATH from the kernel", path)
	}
	b, err = os.ReadFile(spec.Argv[0])
	if err != nil {
		return fmt.Errorf("%s launches %s, which is missing", path, spec.Argv[0])
	}
	if !bytes.Equal(b, launcherScript(l)) {
		return fmt.Errorf("%s was written for another checkout or go command", spec.Argv[0])
	}
	if _, err := os.Stat(filepath.Join(l.Bin(), "gonb")); err != nil {
		return fmt.Errorf("%s starts %s, which is missing", spec.Argv[0], filepath.Join(l.Bin(), "gonb"))
	}
	return nil
}

// checkWarm asks the go command, in a cell module with the kernel's
// environment, whether every importable package is up to date in the build
// cache.
func checkWarm(l layout.Layout) error {
	dir, err := os.MkdirTemp("", "beamnote-doctor-")
	if err != nil {
		return err
	}
	defer os.RemoveAll(dir)
	env, err := CellModule(l, dir, io.Discard)
	if err != nil {
		return err
	}
	pkgs, err := ImportablePackages(l)
	if err != nil {
		return err
	}
	cmd := exec.Command(shimPath(l), append([]string{"list", "-mod=mod", "-f", "{{if .Stale}}{{.ImportPath}}: {{.StaleReason}}{{end}}"}, pkgs...)...)
	cmd.Dir = dir
	cmd.Env = layout.Environ(env)
	out, err := cmd.Output()
	if err != nil {
		return fmt.Errorf("go list in a cell module: %w", err)
	}
	if s := strings.TrimSpace(string(out)); s != "" {
		return fmt.Errorf("not in the build cache: %s", shortLine(s))
	}
	return nil
}

// shortLine returns the first line of s, without surrounding blanks,
// shortened to 60 characters (runes, so that no multi-byte UTF-8 character
// is cut).
func shortLine(s string) string {
	line, _, _ := strings.Cut(strings.TrimSpace(s), "\n")
	line = strings.TrimSpace(line)
	if utf8.RuneCountInString(line) > 60 {
		line = string([]rune(line)[:57]) + "..."
	}
	return line
}

// WriteReport prints the doctor's checks, one per line, with fixes, and
// returns whether all passed.
func WriteReport(w io.Writer, cs []Check) bool {
	ok := true
	for _, c := range cs {
		mark := "ok     "
		if !c.OK {
			mark = "MISSING"
			ok = false
		}
		fmt.Fprintf(w, "%s  %-32s %s\n", mark, c.Name, c.Detail)
		if !c.OK {
			fmt.Fprintf(w, "         fix: %s\n", c.Fix)
		}
	}
	return ok
}
