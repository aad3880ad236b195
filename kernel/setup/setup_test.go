package setup

import (
	"bytes"
	"context"
	"encoding/json"
	"image/png"
	"net"
	"net/http"
	"net/http/httptest"
	"os"
	"os/exec"
	"path/filepath"
	"slices"
	"strings"
	"testing"
	"time"
	"unicode/utf8"
)

// These tests check the kernel plumbing against the formats it must speak:
// nbformat 4 (Jupyter's notebook format documentation, "The Notebook file
// format"), the kernelspec layout (jupyter_client documentation, "Kernel
// specs") and PNG (image/png). No physics here.

func readNotebook(t *testing.T, name string) Notebook {
	t.Helper()
	b, err := os.ReadFile(filepath.Join("..", "..", "testdata", "notebooks", name))
	if err != nil {
		t.Fatal(err)
	}
	var nb Notebook
	if err := json.Unmarshal(b, &nb); err != nil {
		t.Fatal(err)
	}
	return nb
}

func TestCheckExecuted(t *testing.T) {
	if p := CheckExecuted(readNotebook(t, "executed-good.ipynb")); len(p) != 0 {
		t.Errorf("CheckExecuted(good) = %q, want no problems", p)
	}
	p := CheckExecuted(readNotebook(t, "executed-bad.ipynb"))
	for _, want := range []string{
		`cell 0 (nb.SVG(nil, "x")): tagged "figure" but has no image/svg+xml output`,
		`cell 1 (var m map[string]int): the cell program crashed ("panic:`,
		`cell 2 (os.Exit(3)): the cell program crashed ("exit status 3"`,
		`cell 3 (undefined()): error ERROR: undefined: undefined`,
		`cell 4 (undefinedFunction()): does not compile: Cell[3]: Line 2: undefined: undefinedFunction`,
		`cell 5 (if err := errors.New("lens \"L2\": focal length = 0 m: mu...): the cell reported an error on stdout: error: lens "L2": focal length = 0 m: must be nonzero`,
		`cell 6 (fmt.Fprintln(os.Stderr, "error: beam: waist radius = -1 m...): the cell reported an error on stderr: error: beam: waist radius = -1 mm: must be positive (exit status 1)`,
		`cell 7 (fmt.Println("   Error: solver did not converge")): the cell reported an error on stdout: Error: solver did not converge`,
		`no cell produced an image/svg+xml figure`,
	} {
		found := false
		for _, got := range p {
			if strings.HasPrefix(got, want) || strings.Contains(got, want) {
				found = true
			}
		}
		if !found {
			t.Errorf("CheckExecuted(bad) = %q, want a problem like %q", p, want)
		}
	}
	// One problem per failing cell, none for cell 8, whose lines only
	// contain "error:".
	if len(p) != 9 {
		t.Errorf("CheckExecuted(bad) gave %d problems, want 9: %q", len(p), p)
	}
}

func TestMultiline(t *testing.T) {
	for _, test := range []struct{ raw, want string }{
		{`"a\nb"`, "a\nb"},
		{`["a\n", "b"]`, "a\nb"},
		{``, ""},
	} {
		if got := multiline(json.RawMessage(test.raw)); got != test.want {
			t.Errorf("multiline(%s) = %q, want %q", test.raw, got, test.want)
		}
	}
}

func TestServeCommandRefusesRemoteAndAlwaysHasToken(t *testing.T) {
	if Jupyter() == "" {
		t.Skip("no jupyter on this machine")
	}
	l := Layout{Root: "/r", State: "/r/.beamnote", RealGo: "/usr/local/go/bin/go"}
	for _, test := range []struct {
		opt    ServeOptions
		wantOK bool
	}{
		{ServeOptions{}, true},
		{ServeOptions{IP: "::1"}, true},
		{ServeOptions{IP: "0.0.0.0"}, false},
		{ServeOptions{IP: "192.168.1.20"}, false},
		{ServeOptions{IP: "192.168.1.20", AllowRemote: true}, true},
		{ServeOptions{IP: "localhost"}, false}, // not an IP address
		{ServeOptions{Port: 70000}, false},
	} {
		argv, env, url, err := l.ServeCommand(test.opt)
		if (err == nil) != test.wantOK {
			t.Errorf("ServeCommand(%+v) error = %v, want ok %v", test.opt, err, test.wantOK)
			continue
		}
		if err != nil {
			continue
		}
		tok := env["JUPYTER_TOKEN"]
		if len(tok) != 48 || !strings.Contains(url, "token="+tok) {
			t.Errorf("ServeCommand(%+v): JUPYTER_TOKEN %q, url %q; want a 48-hex-digit token in the URL", test.opt, tok, url)
		}
		if a := strings.Join(argv, " "); tok != "" && strings.Contains(a, tok) {
			t.Errorf("ServeCommand(%+v): the token is on the command line %q", test.opt, a)
		}
	}
}

// installShim writes l's go wrapper under l.ShimDir and checks that the
// go command it calls reads back from the script.
func installShim(t *testing.T, l Layout) {
	t.Helper()
	script := l.shimScript()
	if got := shimRealGo(script); got != l.RealGo {
		t.Errorf("shimRealGo(script) = %q, want %q", got, l.RealGo)
	}
	if err := os.MkdirAll(l.ShimDir(), 0o755); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(l.shimPath(), script, 0o755); err != nil {
		t.Fatal(err)
	}
}

// shimModInit runs "go mod init" through the wrapper in a new cell
// directory, as gonb does, and returns the directory.
func shimModInit(t *testing.T, l Layout) string {
	t.Helper()
	cell := t.TempDir()
	cmd := exec.Command(l.shimPath(), "mod", "init", "gonb_test")
	cmd.Dir = cell
	cmd.Env = append(os.Environ(), "GONB_TMP_DIR="+cell, "GOFLAGS=", "GOPROXY=off")
	if out, err := cmd.CombinedOutput(); err != nil {
		t.Fatalf("shim mod init: %v\n%s", err, out)
	}
	return cell
}

// shimCell installs the go wrapper in a temporary state directory of this
// checkout and makes a cell module with it, or skips without a go command.
func shimCell(t *testing.T) (Layout, string) {
	t.Helper()
	goCmd, err := exec.LookPath("go")
	if err != nil {
		t.Skip("no go command")
	}
	l, err := FindLayout(".")
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
	for _, want := range []string{"require " + ModulePath + " v0.0.0", "replace " + ModulePath + " => " + l.Root} {
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
	cmd := exec.Command(l.shimPath(), "get")
	cmd.Dir = cell
	cmd.Env = append(os.Environ(), "GONB_TMP_DIR="+cell, "GOFLAGS=", "GOPROXY=off")
	if out, err := cmd.CombinedOutput(); err != nil {
		t.Errorf("shim get with GOPROXY=off: %v\n%s", err, out)
	}
	cmd = exec.Command(l.shimPath(), "get")
	cmd.Dir = cell
	cmd.Env = append(os.Environ(), "GONB_TMP_DIR="+cell, "GOFLAGS=", "GOPROXY=https://127.0.0.1:1")
	if err := cmd.Run(); err == nil {
		t.Errorf("shim get with a proxy: skipped, want the real go get (which fails here)")
	}

	// Outside gonb's directory the wrapper only forwards.
	other := t.TempDir()
	cmd = exec.Command(l.shimPath(), "mod", "init", "plain")
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

func TestEnvironReplacesInheritedValues(t *testing.T) {
	t.Setenv("JUPYTER_DATA_DIR", "/inherited")
	t.Setenv("BEAMNOTE_TEST_KEEP", "kept")
	env := Environ(map[string]string{"JUPYTER_DATA_DIR": "/project"})
	var got []string
	keep := false
	for _, kv := range env {
		if v, ok := strings.CutPrefix(kv, "JUPYTER_DATA_DIR="); ok {
			got = append(got, v)
		}
		keep = keep || kv == "BEAMNOTE_TEST_KEEP=kept"
	}
	if len(got) != 1 || got[0] != "/project" {
		t.Errorf("Environ: JUPYTER_DATA_DIR values %q, want exactly [/project]", got)
	}
	if !keep {
		t.Errorf("Environ dropped an unrelated inherited variable")
	}
}

// A checkout path with a space and a single quote must survive the shim's
// quoting: into the script, back out of it, and into the cell's go.mod.
func TestShimQuotesOddCheckoutPath(t *testing.T) {
	goCmd, err := exec.LookPath("go")
	if err != nil {
		t.Skip("no go command")
	}
	real, err := FindLayout(".")
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
	l := Layout{Root: root, State: filepath.Join(root, ".beamnote")}
	l.RealGo, _ = filepath.Abs(goCmd)
	if got := shimRoot(l.shimScript()); got != root {
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
		l := Layout{Root: v, RealGo: v}
		s := l.shimScript()
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
	mine := Layout{Root: filepath.Join(dir, "mine"), State: filepath.Join(dir, "mine", ".beamnote")}
	other := Layout{Root: filepath.Join(dir, "other"), State: filepath.Join(dir, "other", ".beamnote")}
	for _, l := range []Layout{mine, other} {
		if err := os.MkdirAll(l.Bin(), 0o755); err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(filepath.Join(l.Bin(), "gonb"), nil, 0o755); err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(l.launcherPath(), l.launcherScript(), 0o755); err != nil {
			t.Fatal(err)
		}
	}
	write := func(l Layout) string {
		spec := kernelspec{
			Argv: []string{l.launcherPath(), "--kernel", "{connection_file}"},
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
	if err := mine.checkKernelspec(write(mine)); err != nil {
		t.Errorf("checkKernelspec(own kernelspec) = %v, want nil", err)
	}
	err := mine.checkKernelspec(write(other))
	if err == nil || !strings.Contains(err.Error(), other.Root) {
		t.Errorf("checkKernelspec(other checkout's kernelspec) = %v, want an error naming %s", err, other.Root)
	}
	// A kernelspec of an older beamnote-kernel: gonb directly, PATH in env.
	old := write(mine)
	b, _ := os.ReadFile(old)
	b = bytes.Replace(b, []byte(mine.launcherPath()), []byte(filepath.Join(mine.Bin(), "gonb")), 1)
	if err := os.WriteFile(old, b, 0o644); err != nil {
		t.Fatal(err)
	}
	if err := mine.checkKernelspec(old); err == nil {
		t.Errorf("checkKernelspec(kernelspec that starts gonb directly) = nil, want an error")
	}
	// A launcher written for another go command.
	if err := os.WriteFile(mine.launcherPath(), Layout{Root: mine.Root, State: mine.State, RealGo: "/opt/go/bin/go"}.launcherScript(), 0o755); err != nil {
		t.Fatal(err)
	}
	if err := mine.checkKernelspec(write(mine)); err == nil {
		t.Errorf("checkKernelspec with a launcher for another go command = nil, want an error")
	}
}

// TestKernelspecKeepsUserPath writes the kernelspec with a stand-in for gonb
// that prints its PATH, and starts it as Jupyter does (kernel.json's argv
// with its env over the server's environment): the go wrapper, the pinned
// tools and the go command's directory must come first, and the PATH the
// kernel inherited must follow, for "!" shell commands in cells.
func TestKernelspecKeepsUserPath(t *testing.T) {
	l, err := FindLayout(".")
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
	kdir, err := l.WriteKernelspec(data)
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
	if err := l.checkKernelspec(filepath.Join(kdir, "kernel.json")); err != nil {
		t.Errorf("checkKernelspec(written kernelspec) = %v, want nil", err)
	}
	// Compile errors as text in the error output (see the package doc).
	if !slices.Contains(spec.Argv, "--raw_error") {
		t.Errorf("kernel.json argv %q lacks --raw_error", spec.Argv)
	}
	userDir := filepath.Join(l.State, "user tools")
	t.Setenv("PATH", userDir+string(os.PathListSeparator)+"/usr/bin:/bin")
	cmd := exec.Command(spec.Argv[0], spec.Argv[1:]...)
	cmd.Env = Environ(spec.Env)
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

func TestFirstLineKeepsRunes(t *testing.T) {
	long := strings.Repeat("λ", 70) // 2 bytes each
	for _, test := range []struct{ in, want string }{
		{"\n%%\n  w0 := 1.2  \nmore", "w0 := 1.2"},
		{strings.Repeat("a", 60), strings.Repeat("a", 60)},
		{strings.Repeat("a", 61), strings.Repeat("a", 57) + "..."},
		{long, strings.Repeat("λ", 57) + "..."},
		{strings.Repeat("a", 28) + long, strings.Repeat("a", 28) + strings.Repeat("λ", 29) + "..."},
		{strings.Repeat("µ", 60), strings.Repeat("µ", 60)},
	} {
		got := firstLine(test.in)
		if got != test.want || !utf8.ValidString(got) {
			t.Errorf("firstLine(%q) = %q, want %q", test.in, got, test.want)
		}
	}
}

func TestUserJupyterDataFollowsXDG(t *testing.T) {
	if _, err := os.Stat("/System/Library"); err == nil {
		t.Skip("macOS keeps Jupyter data in ~/Library/Jupyter")
	}
	xdg := t.TempDir()
	t.Setenv("JUPYTER_DATA_DIR", "")
	t.Setenv("XDG_DATA_HOME", xdg)
	want := filepath.Join(xdg, "jupyter")
	// With the jupyter command (asked with `jupyter --data-dir`) and
	// without one (the XDG rule applied here).
	for _, jup := range []string{Jupyter(), ""} {
		if got, err := userJupyterData(jup); err != nil || got != want {
			t.Errorf("userJupyterData(%q) with XDG_DATA_HOME=%s = %q, %v; want %q", jup, xdg, got, err, want)
		}
	}
	t.Setenv("JUPYTER_DATA_DIR", "/elsewhere/jupyter")
	if got, err := UserJupyterData(); err != nil || got != "/elsewhere/jupyter" {
		t.Errorf("UserJupyterData() with JUPYTER_DATA_DIR=/elsewhere/jupyter = %q, %v", got, err)
	}
}

func TestCheckGoVersion(t *testing.T) {
	l := Layout{RealGo: "/usr/local/go/bin/go"}
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
		if err := l.checkGoVersion(test.goVersion); (err == nil) != test.wantOK {
			t.Errorf("checkGoVersion(%q) = %v, want ok %v", test.goVersion, err, test.wantOK)
		}
	}
}

func TestWaitServing(t *testing.T) {
	srv := httptest.NewServer(http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		http.Error(w, "forbidden", http.StatusForbidden) // any answer will do
	}))
	defer srv.Close()
	ctx, cancel := context.WithTimeout(context.Background(), 10*time.Second)
	defer cancel()
	if err := WaitServing(ctx, srv.URL+"/tree?token=x"); err != nil {
		t.Errorf("WaitServing(running server) = %v, want nil", err)
	}

	ln, err := net.Listen("tcp", "127.0.0.1:0")
	if err != nil {
		t.Fatal(err)
	}
	url := "http://" + ln.Addr().String() + "/tree"
	ln.Close()
	ctx, cancel = context.WithTimeout(context.Background(), 500*time.Millisecond)
	defer cancel()
	if err := WaitServing(ctx, url); err == nil {
		t.Errorf("WaitServing(nothing listening) = nil, want an error")
	}
}

func TestCrashOnlyOnStderr(t *testing.T) {
	out := func(name, text string) Output {
		raw, _ := json.Marshal(text)
		return Output{OutputType: "stream", Name: name, Text: raw}
	}
	svg := Output{OutputType: "display_data", Data: map[string]json.RawMessage{"image/svg+xml": json.RawMessage(`"<svg/>"`)}}
	for _, test := range []struct {
		out  Output
		want int
	}{
		{out("stdout", "signal: 3.2 dB\nexit status 1 is what the tool returned\n"), 0},
		{out("stderr", "exit status 3\n"), 1},
		{out("stderr", "signal: killed\n"), 1},
		{out("stderr", "the detector signal: 3 dB\n"), 0},
	} {
		nb := Notebook{Cells: []Cell{{CellType: "code", Source: json.RawMessage(`"x"`), Outputs: []Output{test.out, svg}}}}
		if got := CheckExecuted(nb); len(got) != test.want {
			t.Errorf("CheckExecuted(%s %q) = %q, want %d problems", test.out.Name, multiline(test.out.Text), got, test.want)
		}
	}
}

// TestErrorLine checks which stream lines make a cell fail: a line that
// starts with "error:" in any case after blanks, on stdout or stderr, even
// when Jupyter split the stream over several outputs; not "error:" inside a
// line.
func TestErrorLine(t *testing.T) {
	out := func(name string, text ...string) Output {
		raw, _ := json.Marshal(text)
		return Output{OutputType: "stream", Name: name, Text: raw}
	}
	for _, test := range []struct {
		outs []Output
		want string // "" for no problem
	}{
		{[]Output{out("stdout", "error: no focus\n")}, "the cell reported an error on stdout: error: no focus"},
		{[]Output{out("stdout", "w = 1 mm\n", "\tERROR: no focus\n")}, "the cell reported an error on stdout: ERROR: no focus"},
		{[]Output{out("stderr", "Error: x\n"), out("stderr", "exit status 1\n")}, "the cell reported an error on stderr: Error: x (exit status 1)"},
		{[]Output{out("stdout", "w = 1 mm\ner"), out("stdout", "ror: split\n")}, "the cell reported an error on stdout: error: split"},
		{[]Output{out("stdout", "focus error: 0.1 mm\n", "errors: none\n", "error 3 dB\n")}, ""},
		{[]Output{out("stderr", "warning: error: x\n")}, ""},
	} {
		if got := cellFailure(test.outs); got != test.want {
			t.Errorf("cellFailure(%+v) = %q, want %q", test.outs, got, test.want)
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
	l := Layout{Root: t.TempDir(), State: state, RealGo: fake}
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
		cmd := exec.Command(l.shimPath(), test.args...)
		cmd.Dir = test.dir
		cmd.Env = Environ(map[string]string{"GONB_TMP_DIR": cell})
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
	if err != nil || path != ModulePath {
		t.Fatalf("BuiltVersion(test binary) = %q, %q, %v; want %q", path, version, err, ModulePath)
	}
	if err := checkBuilt(self, ModulePath, version); err != nil {
		t.Errorf("checkBuilt(test binary, %s, %s) = %v, want nil", ModulePath, version, err)
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
