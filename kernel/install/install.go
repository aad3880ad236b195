package install

import (
	"debug/buildinfo"
	"encoding/json"
	"fmt"
	"go/version"
	"io"
	"os"
	"path/filepath"
	"strings"

	"github.com/beamnote/beamnote/internal/atomicfile"
	"github.com/beamnote/beamnote/kernel/layout"
)

// Pinned tools, built from the module cache at the versions go.mod requires.
const (
	gonbPkg      = "github.com/janpfeifer/gonb"
	goimportsPkg = "golang.org/x/tools/cmd/goimports"
)

// goplsPkg is the language server that gonb asks for completion and
// contextual help; gonb finds it on PATH when the kernel starts. It is a
// tool of its own module, [GoplsModule], because gopls pins an
// x/tools of its own that goimports' cannot replace (gopls v0.23.0 does not
// build against x/tools v0.52.0).
const goplsPkg = "golang.org/x/tools/gopls"

// GoplsModule is the directory of the tool module that pins gopls
// (kernel/tools/gopls, with its own go.mod and go.sum; "go vet ./..." and
// "go test ./..." in the checkout do not descend into a nested module).
func GoplsModule(l layout.Layout) string { return filepath.Join(l.Root, "kernel", "tools", "gopls") }

// MinGo is the oldest Go release the checkout builds with (go.mod's go line).
const MinGo = "1.26"

// Options selects where the kernelspec goes and whether the build cache
// is warmed.
type Options struct {
	// User installs the kernelspec into the per-user Jupyter data directory
	// (see [layout.UserJupyterData]) instead of the project-local one.
	User bool
	// SkipWarm leaves the build cache alone.
	SkipWarm bool
}

// Install builds gonb, goimports and gopls at their pinned versions, writes the go
// wrapper and the kernelspec, and warms the build cache. Progress goes to log.
// It returns the kernelspec directory.
func Install(l layout.Layout, opt Options, log io.Writer) (string, error) {
	if err := CheckGoVersion(l); err != nil {
		return "", err
	}
	fmt.Fprintf(log, "beamnote: downloading modules named in go.mod (once; later runs need no network)\n")
	if err := layout.Run(log, l.Root, nil, l.RealGo, "mod", "download"); err != nil {
		return "", err
	}
	fmt.Fprintf(log, "beamnote: building gonb and goimports at the versions pinned in go.mod\n")
	if err := os.MkdirAll(l.ShimDir(), 0o755); err != nil {
		return "", err
	}
	if err := layout.Run(log, l.Root, nil, l.RealGo, "build", "-o", l.Bin()+string(os.PathSeparator), gonbPkg, goimportsPkg); err != nil {
		return "", err
	}
	fmt.Fprintf(log, "beamnote: building gopls at the version pinned in %s (completion and help in cells; the first build takes a minute)\n",
		filepath.Join(GoplsModule(l), "go.mod"))
	if err := os.MkdirAll(filepath.Dir(goplsBinary(l)), 0o755); err != nil {
		return "", err
	}
	if err := layout.Run(log, GoplsModule(l), nil, l.RealGo, "build", "-o", goplsBinary(l), goplsPkg); err != nil {
		return "", err
	}
	if err := atomicfile.Write(filepath.Join(l.Bin(), "gopls"), goplsScript(l), 0o755); err != nil {
		return "", err
	}
	if err := atomicfile.Write(shimPath(l), shimScript(l), 0o755); err != nil {
		return "", err
	}
	dataDir := l.JupyterData()
	if opt.User {
		d, err := layout.UserJupyterData()
		if err != nil {
			return "", err
		}
		dataDir = d
	}
	kdir, err := WriteKernelspec(l, dataDir)
	if err != nil {
		return "", err
	}
	fmt.Fprintf(log, "beamnote: kernelspec %q written to %s\n", layout.KernelName, kdir)
	if !opt.SkipWarm {
		fmt.Fprintf(log, "beamnote: warming the Go build cache for notebook cells\n")
		if err := Warm(l, log); err != nil {
			return kdir, err
		}
	}
	return kdir, nil
}

// kernelspec is the kernel.json document (Jupyter client documentation,
// "Kernel specs").
type kernelspec struct {
	Argv          []string          `json:"argv"`
	DisplayName   string            `json:"display_name"`
	Language      string            `json:"language"`
	InterruptMode string            `json:"interrupt_mode"`
	Env           map[string]string `json:"env"`
	Metadata      map[string]any    `json:"metadata"`
}

// WriteKernelspec writes kernel.json and the logos under dataDir, and the
// kernel launcher .beamnote/bin/gonb-kernel that kernel.json runs, and
// returns the kernelspec directory. kernel.json's env is
// [layout.Layout.KernelEnv] without PATH: the launcher puts the kernel's
// directories before the PATH that the kernel inherits, so that "!"
// commands in cells keep the user's.
func WriteKernelspec(l layout.Layout, dataDir string) (string, error) {
	env, err := l.KernelEnv()
	if err != nil {
		return "", err
	}
	delete(env, "PATH")
	gonbVersion, err := PinnedVersion(l, gonbPkg)
	if err != nil {
		return "", err
	}
	spec := kernelspec{
		// gonb's own log (klog) goes to a file instead of the server's
		// terminal, where it buried the URL and the cell errors.
		// --raw_error makes a compile error the cell's error output itself
		// (evalue the compiler's output, one traceback entry per message
		// with "Cell[N]: Line L"), which a terminal, nbconvert and an HTML
		// export all show, instead of an HTML block beside an error that
		// reads only `failed to run ".../go build ...": exit status 1`.
		Argv: []string{launcherPath(l), "--kernel", "{connection_file}",
			"--raw_error",
			"--logtostderr=false", "--stderrthreshold=FATAL",
			"--log_file=" + l.KernelLog(), "--log_file_max_size=20"},
		DisplayName:   layout.DisplayName,
		Language:      "go",
		InterruptMode: "message",
		Env:           env,
		Metadata: map[string]any{
			"beamnote": map[string]string{"root": l.Root, "gonb": gonbVersion},
		},
	}
	b, err := json.MarshalIndent(spec, "", "  ")
	if err != nil {
		return "", err
	}
	kdir := layout.KernelDir(dataDir)
	for _, d := range []string{filepath.Dir(l.KernelLog()), l.Bin(), kdir} {
		if err := os.MkdirAll(d, 0o755); err != nil {
			return "", err
		}
	}
	if err := atomicfile.Write(launcherPath(l), launcherScript(l), 0o755); err != nil {
		return "", err
	}
	files := []struct {
		name string
		data []byte
	}{
		{"kernel.json", append(b, '\n')},
		{"logo-svg.svg", []byte(LogoSVG)},
		{"logo-32x32.png", LogoPNG(32)},
		{"logo-64x64.png", LogoPNG(64)},
	}
	for _, f := range files {
		if err := atomicfile.Write(filepath.Join(kdir, f.name), f.data, 0o644); err != nil {
			return "", err
		}
	}
	return kdir, nil
}

// PinnedVersion returns the version of module mod that the checkout's go.mod
// selects.
func PinnedVersion(l layout.Layout, mod string) (string, error) {
	return pinnedVersion(l, l.Root, mod)
}

// pinnedVersion returns the version of module mod that the go.mod in dir
// selects.
func pinnedVersion(l layout.Layout, dir, mod string) (string, error) {
	out, err := layout.Output(dir, l.RealGo, "list", "-m", "-f", "{{.Version}}", mod)
	if err != nil {
		return "", err
	}
	return strings.TrimSpace(out), nil
}

// BuiltVersion returns the path and version of the main module that the Go
// binary bin was built from, as recorded in it (what `go version -m bin`
// prints). A tool's own version string can lag behind: gonb v0.11.4 reports
// "v0.11.1" for -V.
func BuiltVersion(bin string) (path, version string, err error) {
	info, err := buildinfo.ReadFile(bin)
	if err != nil {
		return "", "", err
	}
	return info.Main.Path, info.Main.Version, nil
}

// checkBuilt reports an error unless bin was built from module mod at
// version want.
func checkBuilt(bin, mod, want string) error {
	path, got, err := BuiltVersion(bin)
	if err != nil {
		return err
	}
	if path != mod || got != want {
		return fmt.Errorf("%s is %s %s, want %s %s", bin, path, got, mod, want)
	}
	return nil
}

// CheckGoVersion reports an error if the go command is older than [MinGo].
func CheckGoVersion(l layout.Layout) error {
	ge, err := l.GoEnv("GOVERSION")
	if err != nil {
		return err
	}
	return checkGoVersion(l, ge["GOVERSION"])
}

// checkGoVersion reports an error if goVersion, the go command's GOVERSION
// ("go1.26.8", or "devel go1.27-abcdef …" for a development build), is
// older than [MinGo] or unreadable.
func checkGoVersion(l layout.Layout, goVersion string) error {
	v := ""
	for _, f := range strings.Fields(goVersion) {
		if version.IsValid(f) {
			v = f
			break
		}
	}
	if v == "" {
		return fmt.Errorf("install: cannot read the Go version from %q", goVersion)
	}
	if version.Compare(v, "go"+MinGo) < 0 {
		return fmt.Errorf("install: %s is %s; beamnote needs Go %s or newer (https://go.dev/dl)", l.RealGo, goVersion, MinGo)
	}
	return nil
}
