package install

import (
	"bytes"
	"debug/buildinfo"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"slices"
	"strings"
	"testing"
	"time"

	"github.com/beamnote/beamnote/kernel/layout"
)

// The go wrapper leaves out gonum/plot's back ends (cellSVGOnlyFlag) only
// in cells whose Go files do not mention ".Save", and builds with
// cellBuildGOGC: the stand-in go command records the flags and GOGC for
// cell sources with and without a Save call.
func TestShimSaveCellsGetWriters(t *testing.T) {
	state := t.TempDir()
	record := filepath.Join(state, "args")
	fake := filepath.Join(state, "fakego")
	gogc := filepath.Join(state, "gogc")
	if err := os.WriteFile(fake, []byte("#!/bin/sh\necho \"$@\" > "+shellQuote(record)+"\necho \"$GOGC\" > "+shellQuote(gogc)+"\n"), 0o755); err != nil {
		t.Fatal(err)
	}
	l := layout.Layout{Root: t.TempDir(), State: state, RealGo: fake}
	installShim(t, l)
	svgOnly := "build " + CellGoFlags + " " + cellSVGOnlyFlag + " -o bin"
	full := "build " + CellGoFlags + " -o bin"
	for _, test := range []struct {
		file, src, want string
	}{
		{"main.go", "nb.Show(optplot.Caustic(c, sys))", svgOnly},
		{"main.go", `nb.Check(fig.Save("caustic.png"))`, full},
		{"main_test.go", "save := fig.Save\n", full},
		{"other.go", "x.Save(p)", full},
		{"main.go", "fig.SaveAs(p); fig.Saved = true", svgOnly},
		{"notes.txt", "fig.Save(p)", svgOnly},
	} {
		cell := t.TempDir()
		if err := os.WriteFile(filepath.Join(cell, test.file), []byte("package main\n\nfunc main() {\n"+test.src+"\n}\n"), 0o644); err != nil {
			t.Fatal(err)
		}
		os.Remove(record)
		cmd := exec.Command(shimPath(l), "build", "-o", "bin")
		cmd.Dir = cell
		cmd.Env = layout.Environ(map[string]string{"GONB_TMP_DIR": cell})
		if out, err := cmd.CombinedOutput(); err != nil {
			t.Errorf("shim build: %v\n%s", err, out)
			continue
		}
		if g, _ := os.ReadFile(gogc); strings.TrimSpace(string(g)) != cellBuildGOGC {
			t.Errorf("go build ran with GOGC=%q, want %s", strings.TrimSpace(string(g)), cellBuildGOGC)
		}
		got, _ := os.ReadFile(record)
		if strings.TrimSpace(string(got)) != test.want {
			t.Errorf("%s holding %q: go called with %q, want %q", test.file, test.src, strings.TrimSpace(string(got)), test.want)
		}
	}
}

// A cell built the way the kernel builds it saves PNG and PDF when it calls
// Figure.Save, and a cell that does not is built with the tag that leaves
// the writers out (recorded in the binary's build settings).
func TestShimCellSavesPNG(t *testing.T) {
	if testing.Short() {
		t.Skip("builds two cell programs")
	}
	l, cell := shimCell(t)
	const prog = `package main

import (
	"fmt"
	"os"

	"github.com/beamnote/beamnote/opticslib/beam"
	"github.com/beamnote/beamnote/opticslib/optplot"
	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/units"
)

func main() {
	sys, err := paraxial.NewBuilder().Space(50 * units.Millimeter).ThinLens(100 * units.Millimeter).Label("L1").Space(200 * units.Millimeter).Build()
	if err != nil {
		fmt.Println(err)
		os.Exit(1)
	}
	in, err := beam.FromWaist(beam.WaistSpec{WaistRadius: 0.4 * units.Millimeter, Wavelength: 780 * units.Nanometer})
	if err != nil {
		fmt.Println(err)
		os.Exit(1)
	}
	c, err := beam.Sample(sys, in, 50)
	if err != nil {
		fmt.Println(err)
		os.Exit(1)
	}
	fig, err := optplot.Caustic(c, sys)
	if err != nil {
		fmt.Println(err)
		os.Exit(1)
	}
	SHOW
}
`
	build := func(show string) (bin string, settings map[string]string) {
		t.Helper()
		src := strings.Replace(prog, "SHOW", show, 1)
		if err := os.WriteFile(filepath.Join(cell, "main.go"), []byte(src), 0o644); err != nil {
			t.Fatal(err)
		}
		bin = filepath.Join(cell, "cell")
		cmd := exec.Command(shimPath(l), "build", "-o", bin)
		cmd.Dir = cell
		cmd.Env = append(os.Environ(), "GONB_TMP_DIR="+cell, "GOFLAGS=", "GOPROXY=off")
		if out, err := cmd.CombinedOutput(); err != nil {
			t.Fatalf("shim build: %v\n%s", err, out)
		}
		info, err := buildinfo.ReadFile(bin)
		if err != nil {
			t.Fatal(err)
		}
		settings = map[string]string{}
		for _, s := range info.Settings {
			settings[s.Key] = s.Value
		}
		return bin, settings
	}

	_, settings := build(`b, _ := fig.SVG(); fmt.Println(len(b) > 0)`)
	if settings["-tags"] != "minimal" {
		t.Errorf("cell without Save built with -tags %q, want minimal", settings["-tags"])
	}

	png := filepath.Join(t.TempDir(), "caustic.png")
	bin, settings := build(`if err := fig.Save(os.Args[1]); err != nil { fmt.Println(err); os.Exit(1) }`)
	if settings["-tags"] != "" {
		t.Errorf("cell with Save built with -tags %q, want none", settings["-tags"])
	}
	if out, err := exec.Command(bin, png).CombinedOutput(); err != nil {
		t.Fatalf("cell saving PNG: %v\n%s", err, out)
	}
	b, err := os.ReadFile(png)
	// PNG signature: PNG specification §5.2.
	if err != nil || !bytes.HasPrefix(b, []byte("\x89PNG\r\n\x1a\n")) {
		t.Errorf("saved PNG: %v, starts %q", err, b[:min(len(b), 8)])
	}
}

// The warm-up builds the program as is and once with a reference to
// Figure.Save, so that both kinds of cell find their packages compiled.
func TestWarmSource(t *testing.T) {
	pkgs := []string{layout.ModulePath + "/kernel/nb", optplotPkg}
	plain, save := string(warmSource(pkgs, false)), string(warmSource(pkgs, true))
	if strings.Contains(plain, ".Save") || !strings.Contains(plain, "_ \""+optplotPkg+"\"") {
		t.Errorf("warm source without Save:\n%s", plain)
	}
	if !strings.Contains(save, "var _ = optplot.Figure.Save") || !strings.Contains(save, "\t\""+optplotPkg+"\"") {
		t.Errorf("warm source with Save:\n%s", save)
	}
}

// The gopls that gonb finds on PATH ends when no kernel is connected: a
// kernel that was killed must not leave its language server running.
func TestGoplsScriptTimesOut(t *testing.T) {
	l := layout.Layout{Root: "/src/beamnote", State: "/src/beamnote/.beamnote"}
	s := string(goplsScript(l))
	if !strings.Contains(s, "exec '/src/beamnote/.beamnote/libexec/gopls' -listen.timeout="+goplsIdleTimeout+` "$@"`) {
		t.Errorf("gopls script:\n%s", s)
	}
}

// queryCell is a cell module for the go wrapper's query answers: a
// stand-in go command that prints the file "answer" and records each call
// in "calls", a cell directory whose go.mod replaces two modules with local
// directories (one relative, one absolute and quoted), and the files the
// answers depend on, all dated two hours back.
type queryCell struct {
	t                   *testing.T
	l                   layout.Layout
	state, cell, answer string
	calls, status, warn string
	rel, abs, goenv     string
	env                 []string
	inputs              []string
}

func newQueryCell(t *testing.T) *queryCell {
	t.Helper()
	q := &queryCell{t: t, state: t.TempDir(), cell: t.TempDir()}
	q.answer = filepath.Join(q.state, "answer")
	q.calls = filepath.Join(q.state, "calls")
	q.status = filepath.Join(q.state, "status")
	q.warn = filepath.Join(q.state, "warn")
	fake := filepath.Join(q.state, "fakego")
	script := "#!/bin/sh\necho \"$@\" >> " + shellQuote(q.calls) +
		"\n[ ! -f " + shellQuote(q.warn) + " ] || echo 'go: warning' >&2" +
		"\ncat " + shellQuote(q.answer) +
		"\n[ ! -f " + shellQuote(q.status) + " ] || exit 3\n"
	if err := os.WriteFile(fake, []byte(script), 0o755); err != nil {
		t.Fatal(err)
	}
	q.l = layout.Layout{Root: t.TempDir(), State: q.state, RealGo: fake}
	installShim(t, q.l)
	q.rel = filepath.Join(filepath.Dir(q.cell), filepath.Base(q.cell)+"-rel")
	q.abs = filepath.Join(t.TempDir(), "o'brien's optics")
	t.Cleanup(func() { os.RemoveAll(q.rel) })
	q.goenv = filepath.Join(q.state, "goenv")
	gomod := "module gonb_test\n\ngo 1.26\n\nrequire example.com/rel v0.0.0\n\n" +
		"replace example.com/rel => ../" + filepath.Base(q.rel) + " // local\n\n" +
		"replace (\n\texample.com/abs v1.0.0 => \"" + q.abs + "\"\n\texample.com/mod => example.com/other v1.2.0\n)\n"
	q.write(filepath.Join(q.cell, "go.mod"), gomod)
	q.write(filepath.Join(q.cell, "go.sum"), "example.com/x v1.0.0 h1:x=\n")
	q.write(filepath.Join(q.rel, "go.mod"), "module example.com/rel\n")
	q.write(filepath.Join(q.abs, "go.mod"), "module example.com/abs\n")
	q.write(q.answer, "answer 1\n")
	q.inputs = []string{filepath.Join(q.cell, "go.mod"), filepath.Join(q.cell, "go.sum"), filepath.Join(q.rel, "go.mod"), filepath.Join(q.abs, "go.mod"), fake}
	q.env = layout.Environ(map[string]string{"GONB_TMP_DIR": q.cell, "GOFLAGS": "", "GOWORK": "", "GOENV": q.goenv})
	q.settle()
	return q
}

func (q *queryCell) write(path, data string) {
	q.t.Helper()
	if err := os.MkdirAll(filepath.Dir(path), 0o755); err != nil {
		q.t.Fatal(err)
	}
	if err := os.WriteFile(path, []byte(data), 0o644); err != nil {
		q.t.Fatal(err)
	}
}

// settle dates the inputs two hours back and the kept answers one hour
// back, as if the answers had been given a while after the last change.
func (q *queryCell) settle() {
	q.t.Helper()
	answers, _ := filepath.Glob(filepath.Join(q.cell, shimQueryDir, "*"))
	for _, set := range []struct {
		files []string
		age   time.Duration
	}{{q.inputs, 2 * time.Hour}, {answers, time.Hour}} {
		when := time.Now().Add(-set.age)
		for _, f := range set.files {
			if !exists(f) {
				continue
			}
			if err := os.Chtimes(f, when, when); err != nil {
				q.t.Fatal(err)
			}
		}
	}
}

// change writes data to an input and dates it, and a directory made for
// it, half an hour back (newer than the answers, older than the next
// query); settle dates them back from then on.
func (q *queryCell) change(path, data string) {
	q.t.Helper()
	changed := []string{path}
	if dir := filepath.Dir(path); !exists(dir) {
		changed = append(changed, dir)
	}
	q.write(path, data)
	q.inputs = append(q.inputs, changed...)
	when := time.Now().Add(-30 * time.Minute)
	for _, f := range changed {
		if err := os.Chtimes(f, when, when); err != nil {
			q.t.Fatal(err)
		}
	}
}

func exists(path string) bool {
	_, err := os.Stat(path)
	return err == nil
}

// run runs the wrapper in dir (the cell module unless given) and reports
// its standard output and error, exit status, and whether it called go.
func (q *queryCell) run(env []string, dir string, args ...string) (stdout, stderr string, status int, ran bool) {
	q.t.Helper()
	before, _ := os.ReadFile(q.calls)
	cmd := exec.Command(shimPath(q.l), args...)
	cmd.Dir = dir
	cmd.Env = env
	var o, e bytes.Buffer
	cmd.Stdout, cmd.Stderr = &o, &e
	err := cmd.Run()
	if ee, ok := err.(*exec.ExitError); ok {
		status = ee.ExitCode()
	} else if err != nil {
		q.t.Fatal(err)
	}
	after, _ := os.ReadFile(q.calls)
	return o.String(), e.String(), status, len(after) != len(before)
}

// TestShimAnswersQueries checks the go wrapper's kept answers of module
// queries (shimQueryFuncs) against a stand-in go command: a repeated query
// is answered byte for byte without go, and any change of what the answer
// depends on (go.mod, go.sum, the go.mod of a local replacement, a new
// go.work or vendor directory, the go env file, the environment) makes the
// wrapper ask go again and keep the new answer; failures, warnings,
// queries that change something or need the network, and queries outside
// the cell module always go to go.
func TestShimAnswersQueries(t *testing.T) {
	q := newQueryCell(t)
	envQuery := []string{"env", "-json", "GO111MODULE", "GOFLAGS", "GOMOD", "GOMODCACHE", "GOROOT", "GOWORK"}
	listQuery := []string{"list", "-m", "-f", "{{.Path}}\n{{.Dir}}\n", "-e"}
	allQuery := []string{"list", "-m", "-e", "-json", "..."}

	// expect runs args and checks the answer and whether go ran.
	expect := func(what string, env []string, args []string, wantRan bool) {
		t.Helper()
		want, _ := os.ReadFile(q.answer)
		out, errOut, status, ran := q.run(env, q.cell, args...)
		if out != string(want) || errOut != "" || status != 0 {
			t.Errorf("%s: go %q printed %q, stderr %q, status %d; want %q", what, args, out, errOut, status, want)
		}
		if ran != wantRan {
			t.Errorf("%s: go %q ran go: %v, want %v", what, args, ran, wantRan)
		}
	}

	// An answer with quotes, blank lines and no final newline comes back
	// as it was.
	q.write(q.answer, "it's \"quoted\" '\\''\n\n\tx'\n\n")
	for _, args := range [][]string{envQuery, listQuery, allQuery} {
		expect("first query", q.env, args, true)
		expect("same query", q.env, args, false)
	}
	q.write(q.answer, "no newline")
	q.settle()
	q.change(filepath.Join(q.cell, "go.sum"), "example.com/x v1.0.0 h1:y=\n")
	expect("after go.sum changed", q.env, allQuery, true)
	expect("again", q.env, allQuery, false)

	for i, c := range []struct {
		what   string
		change func()
	}{
		{"go.mod changed", func() { q.change(filepath.Join(q.cell, "go.mod"), "module gonb_test\n\ngo 1.26\n") }},
		{"the relative replacement's go.mod changed", func() {
			q.change(filepath.Join(q.rel, "go.mod"), "module example.com/rel\n\nrequire example.com/y v1.0.0\n")
		}},
		{"the quoted replacement's go.mod changed", func() { q.change(filepath.Join(q.abs, "go.mod"), "module example.com/abs\n\ngo 1.22\n") }},
		{"go env -w", func() { q.change(q.goenv, "GOFLAGS=-mod=mod\n") }},
		{"a go.work appeared", func() { q.change(filepath.Join(q.cell, "go.work"), "go 1.26\n\nuse .\n") }},
		{"a vendor directory appeared", func() { q.change(filepath.Join(q.cell, "vendor", "modules.txt"), "") }},
	} {
		q.settle()
		// go.mod must come back for the later cases to read the replacements.
		if i == 1 {
			q.change(filepath.Join(q.cell, "go.mod"), "module gonb_test\n\nreplace example.com/rel => ../"+filepath.Base(q.rel)+"\n\nreplace example.com/abs => \""+q.abs+"\"\n")
			expect("go.mod restored", q.env, allQuery, true)
			q.settle()
		}
		expect("before: "+c.what, q.env, allQuery, false)
		q.write(q.answer, fmt.Sprintf("answer after %s\n", c.what))
		c.change()
		expect(c.what, q.env, allQuery, true)
		expect("again after "+c.what, q.env, allQuery, false)
	}
	q.settle()

	// Another environment is another query; the first one's answer stays.
	modEnv := append(slices.Clone(q.env), "GOFLAGS=-mod=mod")
	expect("GOFLAGS=-mod=mod", modEnv, allQuery, true)
	expect("GOFLAGS=-mod=mod again", modEnv, allQuery, false)
	want, _ := os.ReadFile(q.answer)
	q.write(q.answer, "not this\n")
	out, _, _, ran := q.run(q.env, q.cell, allQuery...)
	if ran || out != string(want) {
		t.Errorf("first environment again: ran go %v, printed %q; want the kept answer %q", ran, out, want)
	}

	// Always go itself.
	for _, args := range [][]string{
		{"env", "-w", "GOFLAGS=-mod=mod"},
		{"env"},
		{"env", "-json"},
		{"env", "CC", "GOMOD"},
		{"list", "-m", "-u", "all"},
		{"list", "-m", "-versions", "gonum.org/v1/gonum"},
		{"list", "-m", "-mod=mod", "all"},
		{"list", "-f", "{{.Dir}}", "./..."},
		{"mod", "edit", "-json"},
	} {
		for range 2 {
			if _, _, _, ran := q.run(q.env, q.cell, args...); !ran {
				t.Errorf("go %q: answered by the wrapper, want go to run", args)
			}
		}
	}
	if _, _, _, ran := q.run(append(slices.Clone(q.env), "GOFLAGS=-modfile=/tmp/x.mod"), q.cell, allQuery...); !ran {
		t.Errorf("with -modfile in GOFLAGS: answered by the wrapper, want go to run")
	}
	elsewhere := t.TempDir()
	for range 2 {
		if _, _, _, ran := q.run(q.env, elsewhere, envQuery...); !ran {
			t.Errorf("outside the cell module: answered by the wrapper, want go to run")
		}
	}

	// A failing query and one that warns are passed on and never kept.
	otherQuery := []string{"env", "GOPROXY"}
	q.write(q.status, "")
	for range 2 {
		if _, _, status, ran := q.run(q.env, q.cell, otherQuery...); status != 3 || !ran {
			t.Errorf("failing query: status %d, ran go %v; want 3, true", status, ran)
		}
	}
	os.Remove(q.status)
	q.write(q.warn, "")
	for range 2 {
		if _, errOut, _, ran := q.run(q.env, q.cell, otherQuery...); errOut != "go: warning\n" || !ran {
			t.Errorf("warning query: stderr %q, ran go %v; want the warning, true", errOut, ran)
		}
	}
	os.Remove(q.warn)
	expect("after the warning", q.env, otherQuery, true)
	expect("after the warning, again", q.env, otherQuery, false)
	if left, _ := filepath.Glob(filepath.Join(q.cell, shimQueryDir, "tmp.*")); len(left) != 0 {
		t.Errorf("temporary files left: %q", left)
	}
}

// In a cell module made by the wrapper, its answers to goimports' queries
// are byte for byte the go command's, before and after go.mod changes, and
// goimports (run as gonb runs it) rewrites a cell the same way with the
// kept answers as with the go command alone, including adding a gonum
// import that no earlier cell had.
func TestShimAnswersMatchGo(t *testing.T) {
	if testing.Short() {
		t.Skip("builds goimports")
	}
	l, cell := shimCell(t)
	env := append(os.Environ(), "GONB_TMP_DIR="+cell, "GOFLAGS=", "GOPROXY=off", "GOWORK=",
		"PATH="+l.ShimDir()+string(os.PathListSeparator)+os.Getenv("PATH"))
	realEnv := append(os.Environ(), "GOFLAGS=", "GOPROXY=off", "GOWORK=")
	// The cell module's files are older than any answer.
	old := time.Now().Add(-time.Hour)
	for _, f := range []string{"go.mod", "go.sum"} {
		if err := os.Chtimes(filepath.Join(cell, f), old, old); err != nil {
			t.Fatal(err)
		}
	}
	queries := [][]string{
		{"env", "-json", "GO111MODULE", "GOFLAGS", "GOINSECURE", "GOMOD", "GOMODCACHE", "GONOPROXY", "GONOSUMDB", "GOPATH", "GOPROXY", "GOROOT", "GOSUMDB", "GOWORK"},
		{"list", "-m", "-f", "{{.Path}}\n{{.Dir}}\n{{.GoMod}}\n{{.GoVersion}}\n{{range context.ReleaseTags}}{{if eq . \"go1.14\"}}{{.}}{{end}}{{end}}\n"},
		{"env", "GOFLAGS"},
		{"list", "-m", "-e", "-json", "..."},
	}
	check := func(when string) {
		t.Helper()
		for _, args := range queries {
			cmd := exec.Command(l.RealGo, args...)
			cmd.Dir, cmd.Env = cell, realEnv
			want, err := cmd.Output()
			if err != nil {
				t.Fatalf("go %q: %v", args, err)
			}
			for i := range 2 {
				cmd := exec.Command(shimPath(l), args...)
				cmd.Dir, cmd.Env = cell, env
				got, err := cmd.Output()
				if err != nil || !bytes.Equal(got, want) {
					t.Errorf("%s, call %d: wrapper's go %q = %q, %v; want %q", when, i+1, args, got, err, want)
				}
			}
		}
	}
	check("new cell module")
	if kept, _ := filepath.Glob(filepath.Join(cell, shimQueryDir, "list.*")); len(kept) != 2 {
		t.Errorf("kept answers of go list -m: %q, want 2", kept)
	}
	cmd := exec.Command(l.RealGo, "mod", "edit", "-require=gonum.org/v1/gonum@v0.17.0")
	cmd.Dir, cmd.Env = cell, realEnv
	if out, err := cmd.CombinedOutput(); err != nil {
		t.Fatalf("go mod edit: %v\n%s", err, out)
	}
	check("after go.mod changed")

	goimports := filepath.Join(t.TempDir(), "goimports")
	cmd = exec.Command(l.RealGo, "build", "-o", goimports, goimportsPkg)
	cmd.Dir, cmd.Env = l.Root, realEnv
	if out, err := cmd.CombinedOutput(); err != nil {
		t.Fatalf("building goimports: %v\n%s", err, out)
	}
	// What gonb writes for a body cell after a declaration cell: imports
	// of earlier cells that this one leaves unused, and none yet for the
	// packages it uses.
	const src = `package main

import (
	"github.com/beamnote/beamnote/opticslib/units"
	"github.com/beamnote/beamnote/opticslib/paraxial"
)

func main() {
	flag.Parse()
m := mat.NewDense(2, 2, []float64{1, 2, 3, 4})
fmt.Println(mat.Det(m), strings.ToUpper("x"), units.Millimeter)
}
`
	rewrite := func(env []string) string {
		t.Helper()
		main := filepath.Join(cell, "main.go")
		if err := os.WriteFile(main, []byte(src), 0o644); err != nil {
			t.Fatal(err)
		}
		cmd := exec.Command(goimports, "-w", main)
		cmd.Dir, cmd.Env = cell, env
		if out, err := cmd.CombinedOutput(); err != nil {
			t.Fatalf("goimports: %v\n%s", err, out)
		}
		b, _ := os.ReadFile(main)
		return string(b)
	}
	want := rewrite(append(slices.Clone(realEnv), "PATH="+filepath.Dir(l.RealGo)+string(os.PathListSeparator)+os.Getenv("PATH")))
	if !strings.Contains(want, `"gonum.org/v1/gonum/mat"`) || strings.Contains(want, "paraxial") {
		t.Fatalf("goimports with the go command alone:\n%s", want)
	}
	for i := range 2 {
		if got := rewrite(env); got != want {
			t.Errorf("goimports through the wrapper, run %d:\n%s\nwant\n%s", i+1, got, want)
		}
	}
}
