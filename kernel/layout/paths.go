package layout

import (
	"bytes"
	"encoding/json"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"strings"

	"golang.org/x/mod/modfile"
)

// ModulePath is the module path of the beamnote checkout that cells import.
const ModulePath = "github.com/beamnote/beamnote"

// KernelName is the kernelspec name, as used in notebook metadata
// ("kernelspec": {"name": "beamnote"}).
const KernelName = "beamnote"

// DisplayName is the name Jupyter shows for the kernel.
const DisplayName = "beamnote · Go optics"

// Layout holds the absolute paths that the installer, the notebook server
// and the notebook runner read and write.
type Layout struct {
	Root   string // the checkout (directory holding go.mod of ModulePath)
	State  string // project-local state, Root/.beamnote by default
	RealGo string // absolute path of the go command used to build and run cells
}

// Bin is the directory of the tools built at the pinned versions.
func (l Layout) Bin() string { return filepath.Join(l.State, "bin") }

// ShimDir is the directory holding the go wrapper; it comes first on the
// kernel's PATH.
func (l Layout) ShimDir() string { return filepath.Join(l.State, "bin", "shim") }

// KernelLog is the file that gonb's log goes to.
func (l Layout) KernelLog() string { return filepath.Join(l.State, "logs", "gonb.log") }

// JupyterData is the project-local Jupyter data directory (JUPYTER_DATA_DIR).
func (l Layout) JupyterData() string { return filepath.Join(l.State, "jupyter") }

// KernelDir returns the kernelspec directory below a Jupyter data directory.
func KernelDir(dataDir string) string { return filepath.Join(dataDir, "kernels", KernelName) }

// UserJupyterData is the per-user Jupyter data directory on this system:
// $JUPYTER_DATA_DIR if set, else what `jupyter --data-dir` reports (it
// follows XDG_DATA_HOME and the platform's conventions), else, without a
// working jupyter command, $XDG_DATA_HOME/jupyter or ~/.local/share/jupyter
// (Linux) or ~/Library/Jupyter (macOS).
func UserJupyterData() (string, error) {
	return userJupyterData(Jupyter())
}

// userJupyterData is [UserJupyterData] asking the jupyter command jup, or
// no command if jup is "".
func userJupyterData(jup string) (string, error) {
	if d := os.Getenv("JUPYTER_DATA_DIR"); d != "" {
		return d, nil
	}
	if jup != "" {
		if out, err := exec.Command(jup, "--data-dir").Output(); err == nil {
			if d := strings.TrimSpace(string(out)); filepath.IsAbs(d) {
				return d, nil
			}
		}
	}
	_, err := os.Stat("/System/Library")
	macOS := err == nil
	// The XDG Base Directory Specification ignores a relative XDG_DATA_HOME.
	if xdg := os.Getenv("XDG_DATA_HOME"); !macOS && filepath.IsAbs(xdg) {
		return filepath.Join(xdg, "jupyter"), nil
	}
	home, err := os.UserHomeDir()
	if err != nil {
		return "", fmt.Errorf("layout: no home directory for a per-user kernelspec: %w", err)
	}
	if macOS {
		return filepath.Join(home, "Library", "Jupyter"), nil
	}
	return filepath.Join(home, ".local", "share", "jupyter"), nil
}

// FindLayout locates the checkout from dir (walking up to the go.mod whose
// module is ModulePath) and the go command on PATH.
func FindLayout(dir string) (Layout, error) {
	abs, err := filepath.Abs(dir)
	if err != nil {
		return Layout{}, err
	}
	root := ""
	for d := abs; ; d = filepath.Dir(d) {
		b, err := os.ReadFile(filepath.Join(d, "go.mod"))
		if err == nil && modfile.ModulePath(b) == ModulePath {
			root = d
			break
		}
		if filepath.Dir(d) == d {
			break
		}
	}
	if root == "" {
		return Layout{}, fmt.Errorf("layout: no go.mod of module %s at or above %s", ModulePath, abs)
	}
	goCmd, err := exec.LookPath("go")
	if err != nil {
		return Layout{}, fmt.Errorf("layout: the go command is not on PATH (install Go 1.26 from https://go.dev/dl): %w", err)
	}
	goCmd, err = filepath.Abs(goCmd)
	if err != nil {
		return Layout{}, err
	}
	// Resolve a go found through our own shim back to the real command.
	if b, err := os.ReadFile(goCmd); err == nil && bytes.HasPrefix(b, []byte("#!")) {
		if real := ShimVar(b, "REAL_GO"); real != "" {
			goCmd = real
		}
	}
	return Layout{Root: root, State: filepath.Join(root, ".beamnote"), RealGo: goCmd}, nil
}

// ShimMarker is the line that marks the go wrapper script that the
// installer writes (.beamnote/bin/shim/go).
const ShimMarker = "# beamnote go wrapper"

// ShimVar reads back an assignment name='value' (the value quoted as one
// POSIX shell word) from a go wrapper script, or returns "" if script is no
// wrapper or has no such assignment. [FindLayout] reads REAL_GO with it, to
// see through a wrapper found on PATH.
func ShimVar(script []byte, name string) string {
	if !bytes.Contains(script, []byte(ShimMarker)) {
		return ""
	}
	for _, line := range strings.Split(string(script), "\n") {
		if v, ok := strings.CutPrefix(line, name+"="); ok {
			v = strings.TrimSuffix(strings.TrimPrefix(v, "'"), "'")
			return strings.ReplaceAll(v, `'\''`, "'")
		}
	}
	return ""
}

// GoEnv returns the values of the named go environment variables, read
// with one `go env -json` call.
func (l Layout) GoEnv(names ...string) (map[string]string, error) {
	out, err := Output("", l.RealGo, append([]string{"env", "-json"}, names...)...)
	if err != nil {
		return nil, err
	}
	var m map[string]string
	if err := json.Unmarshal([]byte(out), &m); err != nil {
		return nil, fmt.Errorf("layout: %s env -json: %w", l.RealGo, err)
	}
	return m, nil
}

// DefaultPath is the PATH the kernel falls back to when it inherits none.
const DefaultPath = "/usr/local/sbin:/usr/local/bin:/usr/sbin:/usr/bin:/sbin:/bin"

// KernelPathDirs are the directories that come first on the kernel's PATH:
// the go wrapper, the pinned tools and the go command's directory.
func (l Layout) KernelPathDirs() []string {
	return []string{l.ShimDir(), l.Bin(), filepath.Dir(l.RealGo)}
}

// KernelEnv is the environment that cells build and run with, used by the
// installer's cache warm-up and by the doctor so that they build cells as
// the kernel does. kernel.json holds every entry but PATH. PATH here is
// [Layout.KernelPathDirs], then the current PATH; the kernel's launcher
// (see install.WriteKernelspec) puts the same directories before the PATH
// the kernel inherits, because kernelspec env values cannot refer to other
// variables and a PATH there would replace the user's, which "!" shell
// commands in cells need.
func (l Layout) KernelEnv() (map[string]string, error) {
	ge, err := l.GoEnv("GOCACHE", "GOMODCACHE", "GOPATH")
	if err != nil {
		return nil, err
	}
	inherited := os.Getenv("PATH")
	if inherited == "" {
		inherited = DefaultPath
	}
	path := strings.Join(append(l.KernelPathDirs(), inherited), string(os.PathListSeparator))
	return map[string]string{
		"PATH":          path,
		"GOPROXY":       "off",
		"GOTOOLCHAIN":   "local",
		"GOCACHE":       ge["GOCACHE"],
		"GOMODCACHE":    ge["GOMODCACHE"],
		"GOPATH":        ge["GOPATH"],
		"BEAMNOTE_ROOT": l.Root,
	}, nil
}
