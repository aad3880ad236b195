package install

import (
	"bytes"
	"encoding/json"
	"image/png"
	"os"
	"os/exec"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"github.com/beamnote/beamnote/kernel/layout"
)

// These tests check the installer against the formats it must speak: the
// kernelspec layout (jupyter_client documentation, "Kernel specs") and PNG
// (image/png). No physics here.

// installShim writes l's go wrapper under l.ShimDir and checks that the
// go command it calls reads back from the script.
func installShim(t *testing.T, l layout.Layout) {
	t.Helper()
	script := shimScript(l)
	if got := shimRealGo(script); got != l.RealGo {
		t.Errorf("shimRealGo(script) = %q, want %q", got, l.RealGo)
	}
	if err := os.MkdirAll(l.ShimDir(), 0o755); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(shimPath(l), script, 0o755); err != nil {
		t.Fatal(err)
	}
}

// shimModInit runs "go mod init" through the wrapper in a new cell
// directory, as gonb does, and returns the directory.
func shimModInit(t *testing.T, l layout.Layout) string {
	t.Helper()
	cell := t.TempDir()
	cmd := exec.Command(shimPath(l), "mod", "init", "gonb_test")
	cmd.Dir = cell
	cmd.Env = append(os.Environ(), "GONB_TMP_DIR="+cell, "GOFLAGS=", "GOPROXY=off")
	if out, err := cmd.CombinedOutput(); err != nil {
		t.Fatalf("shim mod init: %v\n%s", err, out)
	}
	return cell
}

// shimCell installs the go wrapper in a temporary state directory of this
// checkout and makes a cell module with it, or skips without a go command.
func shimCell(t *testing.T) (layout.Layout, string) {
	t.Helper()
	goCmd, err := exec.LookPath("go")
	if err != nil {
		t.Skip("no go command")
	}
	l, err := layout.FindLayout(".")
	if err != nil {
		t.Fatal(err)
	}
	l.State = t.TempDir()
	l.RealGo, _ = filepath.Abs(goCmd)
	installShim(t, l)
	return l, shimModInit(t, l)
}

func TestShimMakesCellModule(t *testing.T) {
	l, cell := shimCell(t)
	gomod, _ := os.ReadFile(filepath.Join(cell, "go.mod"))
	for _, want := range []string{"require " + layout.ModulePath + " v0.0.0", "replace " + layout.ModulePath + " => " + l.Root} {
		if !strings.Contains(string(gomod), want) {
			t.Errorf("cell go.mod lacks %q:\n%s", want, gomod)
		}
	}
	sum, _ := os.ReadFile(filepath.Join(cell, "go.sum"))
	rootSum, _ := os.ReadFile(filepath.Join(l.Root, "go.sum"))
	if !bytes.Equal(sum, rootSum) {
		t.Errorf("cell go.sum differs from the checkout's")
	}

	// With GOPROXY=off a bare "go get" in the cell module is skipped: it
	// must succeed even with a main.go importing a module that is not
	// required yet (go build -mod=mod adds it later).
	if err := os.WriteFile(filepath.Join(cell, "main.go"), []byte("package main\nimport _ \"example.com/not/required\"\nfunc main() {}\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	cmd := exec.Command(shimPath(l), "get")
	cmd.Dir = cell
	cmd.Env = append(os.Environ(), "GONB_TMP_DIR="+cell, "GOFLAGS=", "GOPROXY=off")
	if out, err := cmd.CombinedOutput(); err != nil {
		t.Errorf("shim get with GOPROXY=off: %v\n%s", err, out)
	}
	cmd = exec.Command(shimPath(l), "get")
	cmd.Dir = cell
	cmd.Env = append(os.Environ(), "GONB_TMP_DIR="+cell, "GOFLAGS=", "GOPROXY=https://127.0.0.1:1")
	if err := cmd.Run(); err == nil {
		t.Errorf("shim get with a proxy: skipped, want the real go get (which fails here)")
	}

	// Outside gonb's directory the wrapper only forwards.
	other := t.TempDir()
	cmd = exec.Command(shimPath(l), "mod", "init", "plain")
	cmd.Dir = other
	cmd.Env = append(os.Environ(), "GONB_TMP_DIR="+cell, "GOFLAGS=")
	if out, err := cmd.CombinedOutput(); err != nil {
		t.Fatalf("shim mod init elsewhere: %v\n%s", err, out)
	}
	if gomod, _ := os.ReadFile(filepath.Join(other, "go.mod")); strings.Contains(string(gomod), "replace") {
		t.Errorf("wrapper edited a module outside GONB_TMP_DIR:\n%s", gomod)
	}
}

func TestLogoPNG(t *testing.T) {
	for _, size := range []int{32, 64} {
		img, err := png.Decode(bytes.NewReader(LogoPNG(size)))
		if err != nil {
			t.Errorf("LogoPNG(%d): %v", size, err)
			continue
		}
		if b := img.Bounds(); b.Dx() != size || b.Dy() != size {
			t.Errorf("LogoPNG(%d) is %v", size, b)
		}
	}
	if !bytes.Equal(LogoPNG(32), LogoPNG(32)) {
		t.Error("LogoPNG is not deterministic")
	}
}

func TestShellQuote(t *testing.T) {
	for _, test := range []struct{ in, want string }{
		{"/usr/local/go/bin/go", "'/usr/local/go/bin/go'"},
		{"/home/o'brien/go", `'/home/o'\''brien/go'`},
	} {
		if got := shellQuote(test.in); got != test.want {
			t.Errorf("shellQuote(%q) = %s, want %s", test.in, got, test.want)
		}
	}
}

// A checkout path with a space and a single quote must survive the shim's
// quoting: into the script, back out of it, and into the cell's go.mod.
func TestShimQuotesOddCheckoutPath(t *testing.T) {
	goCmd, err := exec.LookPath("go")
	if err != nil {
		t.Skip("no go command")
	}
	real, err := layout.FindLayout(".")
	if err != nil {
		t.Fatal(err)
	}
	root := filepath.Join(t.TempDir(), `o'brien's "optics" $HOME`)
	if err := os.MkdirAll(root, 0o755); err != nil {
		t.Fatal(err)
	}
	sum, err := os.ReadFile(filepath.Join(real.Root, "go.sum"))
	if err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(filepath.Join(root, "go.sum"), sum, 0o644); err != nil {
		t.Fatal(err)
	}
	l := layout.Layout{Root: root, State: filepath.Join(root, ".beamnote")}
	l.RealGo, _ = filepath.Abs(goCmd)
	if got := shimRoot(shimScript(l)); got != root {
		t.Errorf("shimRoot(script) = %q, want %q", got, root)
	}
	installShim(t, l)
	cell := shimModInit(t, l)
	cmd := exec.Command(l.RealGo, "mod", "edit", "-json")
	cmd.Dir = cell
	out, err := cmd.Output()
	if err != nil {
		t.Fatal(err)
	}
	var mod struct {
		Replace []struct{ New struct{ Path string } }
	}
	if err := json.Unmarshal(out, &mod); err != nil {
		t.Fatal(err)
	}
	if len(mod.Replace) != 1 || mod.Replace[0].New.Path != root {
		t.Errorf("cell go.mod replace = %+v, want => %q", mod.Replace, root)
	}
}

func TestShimVarRoundTrip(t *testing.T) {
	for _, v := range []string{"/usr/local/go/bin/go", "/a'", "'/b", "/c d/''/e"} {
		l := layout.Layout{Root: v, RealGo: v}
		s := shimScript(l)
		if got := shimRoot(s); got != v {
			t.Errorf("shimRoot(script for %q) = %q", v, got)
		}
		if got := shimRealGo(s); got != v {
			t.Errorf("shimRealGo(script for %q) = %q", v, got)
		}
	}
}

// The doctor must not pass a kernelspec written by another checkout (a
// moved checkout, or a per-user kernelspec installed from a second clone).
func TestCheckKernelspecStale(t *testing.T) {
	dir := t.TempDir()
	mine := layout.Layout{Root: filepath.Join(dir, "mine"), State: filepath.Join(dir, "mine", ".beamnote")}
	other := layout.Layout{Root: filepath.Join(dir, "other"), State: filepath.Join(dir, "other", ".beamnote")}
	for _, l := range []layout.Layout{mine, other} {
		if err := os.MkdirAll(l.Bin(), 0o755); err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(filepath.Join(l.Bin(), "gonb"), nil, 0o755); err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(launcherPath(l), launcherScript(l), 0o755); err != nil {
			t.Fatal(err)
		}
	}
	write := func(l layout.Layout) string {
		spec := kernelspec{
			Argv: []string{launcherPath(l), "--kernel", "{connection_file}"},
			Env:  map[string]string{"BEAMNOTE_ROOT": l.Root},
			Metadata: map[string]any{
				"beamnote": map[string]string{"root": l.Root},
			},
		}
		b, err := json.Marshal(spec)
		if err != nil {
			t.Fatal(err)
		}
		p := filepath.Join(t.TempDir(), "kernel.json")
		if err := os.WriteFile(p, b, 0o644); err != nil {
			t.Fatal(err)
		}
		return p
	}
	if err := checkKernelspec(mine, write(mine)); err != nil {
		t.Errorf("checkKernelspec(own kernelspec) = %v, want nil", err)
	}
	err := checkKernelspec(mine, write(other))
	if err == nil || !strings.Contains(err.Error(), other.Root) {
		t.Errorf("checkKernelspec(other checkout's kernelspec) = %v, want an error naming %s", err, other.Root)
	}
	// A kernelspec of an older beamnote-kernel: gonb directly, PATH in env.
	old := write(mine)
	b, _ := os.ReadFile(old)
	b = bytes.Replace(b, []byte(launcherPath(mine)), []byte(filepath.Join(mine.Bin(), "gonb")), 1)
	if err := os.WriteFile(old, b, 0o644); err != nil {
		t.Fatal(err)
	}
	if err := checkKernelspec(mine, old); err == nil {
		t.Errorf("checkKernelspec(kernelspec that starts gonb directly) = nil, want an error")
	}
	// A launcher written for another go command.
	if err := os.WriteFile(launcherPath(mine), launcherScript(layout.Layout{Root: mine.Root, State: mine.State, RealGo: "/opt/go/bin/go"}), 0o755); err != nil {
		t.Fatal(err)
	}
	if err := checkKernelspec(mine, write(mine)); err == nil {
		t.Errorf("checkKernelspec with a launcher for another go command = nil, want an error")
	}
}

// TestKernelspecKeepsUserPath writes the kernelspec with a stand-in for gonb
// that prints its PATH, and starts it as Jupyter does (kernel.json's argv
// with its env over the server's environment): the go wrapper, the pinned
// tools and the go command's directory must come first, and the PATH the
// kernel inherited must follow, for "!" shell commands in cells.
func TestKernelspecKeepsUserPath(t *testing.T) {
	l, err := layout.FindLayout(".")
	if err != nil {
		t.Fatal(err)
	}
	l.State = t.TempDir()
	record := filepath.Join(l.State, "path")
	if err := os.MkdirAll(l.Bin(), 0o755); err != nil {
		t.Fatal(err)
	}
	fake := "#!/bin/sh\nprintf %s \"$PATH\" > " + shellQuote(record) + "\n"
	if err := os.WriteFile(filepath.Join(l.Bin(), "gonb"), []byte(fake), 0o755); err != nil {
		t.Fatal(err)
	}
	data := filepath.Join(l.State, "jupyter")
	kdir, err := WriteKernelspec(l, data)
	if err != nil {
		t.Fatal(err)
	}
	b, err := os.ReadFile(filepath.Join(kdir, "kernel.json"))
	if err != nil {
		t.Fatal(err)
	}
	var spec kernelspec
	if err := json.Unmarshal(b, &spec); err != nil {
		t.Fatal(err)
	}
	if err := checkKernelspec(l, filepath.Join(kdir, "kernel.json")); err != nil {
		t.Errorf("checkKernelspec(written kernelspec) = %v, want nil", err)
	}
	// Compile errors as text in the error output (see the package doc).
	if !slices.Contains(spec.Argv, "--raw_error") {
		t.Errorf("kernel.json argv %q lacks --raw_error", spec.Argv)
	}
	userDir := filepath.Join(l.State, "user tools")
	t.Setenv("PATH", userDir+string(os.PathListSeparator)+"/usr/bin:/bin")
	cmd := exec.Command(spec.Argv[0], spec.Argv[1:]...)
	cmd.Env = layout.Environ(spec.Env)
	if out, err := cmd.CombinedOutput(); err != nil {
		t.Fatalf("%s: %v\n%s", spec.Argv[0], err, out)
	}
	got, err := os.ReadFile(record)
	if err != nil {
		t.Fatal(err)
	}
	want := strings.Join([]string{l.ShimDir(), l.Bin(), filepath.Dir(l.RealGo), userDir, "/usr/bin", "/bin"}, string(os.PathListSeparator))
	if string(got) != want {
		t.Errorf("kernel PATH = %q, want %q", got, want)
	}
}

func TestCheckGoVersion(t *testing.T) {
	l := layout.Layout{RealGo: "/usr/local/go/bin/go"}
	for _, test := range []struct {
		goVersion string
		wantOK    bool
	}{
		{"go1.26.8", true},
		{"go" + MinGo, true},
		{"go1.27rc1", true},
		{"go1.100.0", true},
		{"devel go1.27-0123abc Mon Jan 2 15:04:05 2027 +0000", true},
		{"go1.26.8 X:boringcrypto", true},
		{"go1.25.9", false},
		{"go1.9", false},
		{"", false},
		{"unknown", false},
	} {
		if err := checkGoVersion(l, test.goVersion); (err == nil) != test.wantOK {
			t.Errorf("checkGoVersion(%q) = %v, want ok %v", test.goVersion, err, test.wantOK)
		}
	}
}

// TestShimAddsCellFlags runs the wrapper over a stand-in for the real go
// command that records its arguments: in the cell module "go build" and
// "go test" get CellGoFlags and cellSVGOnlyFlag (no Go file of the cell
// calls Save here; see TestShimSaveCellsGetWriters); elsewhere, and for
// other commands, the arguments pass unchanged.
func TestShimAddsCellFlags(t *testing.T) {
	state := t.TempDir()
	record := filepath.Join(state, "args")
	fake := filepath.Join(state, "fakego")
	if err := os.WriteFile(fake, []byte("#!/bin/sh\necho \"$@\" > "+shellQuote(record)+"\n"), 0o755); err != nil {
		t.Fatal(err)
	}
	l := layout.Layout{Root: t.TempDir(), State: state, RealGo: fake}
	installShim(t, l)
	cell, other := t.TempDir(), t.TempDir()
	for _, test := range []struct {
		dir  string
		args []string
		want string
	}{
		{cell, []string{"build", "-o", "bin"}, "build " + CellGoFlags + " " + cellSVGOnlyFlag + " -o bin"},
		{cell, []string{"test", "-c", "-o", "bin"}, "test " + CellGoFlags + " " + cellSVGOnlyFlag + " -c -o bin"},
		{cell, []string{"vet", "."}, "vet ."},
		{other, []string{"build", "-o", "bin"}, "build -o bin"},
	} {
		os.Remove(record)
		cmd := exec.Command(shimPath(l), test.args...)
		cmd.Dir = test.dir
		cmd.Env = layout.Environ(map[string]string{"GONB_TMP_DIR": cell})
		if out, err := cmd.CombinedOutput(); err != nil {
			t.Errorf("shim %v: %v\n%s", test.args, err, out)
			continue
		}
		got, _ := os.ReadFile(record)
		if strings.TrimSpace(string(got)) != test.want {
			t.Errorf("shim %v in %s called go with %q, want %q", test.args, test.dir, strings.TrimSpace(string(got)), test.want)
		}
	}
}

// TestCheckBuilt reads the build information of a Go binary (debug/buildinfo,
// what `go version -m` prints): the test binary is built from this module at
// version "(devel)", so it is not gonb v0.11.4, and a file that is not a Go
// binary is an error too.
func TestCheckBuilt(t *testing.T) {
	self, err := os.Executable()
	if err != nil {
		t.Skip(err)
	}
	path, version, err := BuiltVersion(self)
	if err != nil || path != layout.ModulePath {
		t.Fatalf("BuiltVersion(test binary) = %q, %q, %v; want %q", path, version, err, layout.ModulePath)
	}
	if err := checkBuilt(self, layout.ModulePath, version); err != nil {
		t.Errorf("checkBuilt(test binary, %s, %s) = %v, want nil", layout.ModulePath, version, err)
	}
	if err := checkBuilt(self, gonbPkg, "v0.11.4"); err == nil || !strings.Contains(err.Error(), "want "+gonbPkg+" v0.11.4") {
		t.Errorf("checkBuilt(test binary, gonb v0.11.4) = %v, want an error naming the wanted version", err)
	}
	notGo := filepath.Join(t.TempDir(), "gonb")
	if err := os.WriteFile(notGo, []byte("#!/bin/sh\n"), 0o755); err != nil {
		t.Fatal(err)
	}
	if err := checkBuilt(notGo, gonbPkg, "v0.11.4"); err == nil {
		t.Errorf("checkBuilt(shell script) = nil, want an error")
	}
}
