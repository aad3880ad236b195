package setup

import (
	"bytes"
	"debug/buildinfo"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"
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
	l := Layout{Root: t.TempDir(), State: state, RealGo: fake}
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
		cmd := exec.Command(l.shimPath(), "build", "-o", "bin")
		cmd.Dir = cell
		cmd.Env = Environ(map[string]string{"GONB_TMP_DIR": cell})
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
		cmd := exec.Command(l.shimPath(), "build", "-o", bin)
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
	pkgs := []string{ModulePath + "/kernel/nb", optplotPkg}
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
	l := Layout{Root: "/src/beamnote", State: "/src/beamnote/.beamnote"}
	s := string(l.goplsScript())
	if !strings.Contains(s, "exec '/src/beamnote/.beamnote/libexec/gopls' -listen.timeout="+goplsIdleTimeout+` "$@"`) {
		t.Errorf("gopls script:\n%s", s)
	}
}
