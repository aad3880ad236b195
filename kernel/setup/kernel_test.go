package setup

import (
	"bytes"
	"context"
	"encoding/json"
	"fmt"
	"io"
	"maps"
	"net"
	"net/http"
	"os"
	"os/exec"
	"path/filepath"
	"slices"
	"strings"
	"testing"
	"time"
)

// TestKernelSurvivesCrashes executes testdata/notebooks/reliability.ipynb with
// the installed beamnote kernel: a cell that panics, one that calls os.Exit,
// one that does not compile, one that prints "error: …" and returns, one
// that writes "error: …" to stderr and exits 1, and an nb.Must that fails
// must each be reported as a problem of that cell, with the message; a line
// that only contains "error:" is not a problem; and the cells after them
// must still run. The HTML export must show the compiler's message by cell
// and line as text (gonb's --raw_error). It needs `make kernel` first and skips otherwise.
func TestKernelSurvivesCrashes(t *testing.T) {
	if testing.Short() {
		t.Skip("runs a Jupyter kernel")
	}
	l, err := FindLayout(".")
	if err != nil {
		t.Fatal(err)
	}
	if _, err := os.Stat(filepath.Join(KernelDir(l.JupyterData()), "kernel.json")); err != nil || Jupyter() == "" {
		t.Skip("beamnote kernel not installed (run make kernel)")
	}
	out := t.TempDir()
	nbPath := filepath.Join(l.Root, "testdata", "notebooks", "reliability.ipynb")
	err = l.ExecuteNotebooks([]string{nbPath}, out, false, io.Discard)
	if err == nil {
		t.Fatal("ExecuteNotebooks(reliability.ipynb) = nil, want the crashes reported")
	}
	for _, want := range []string{
		// gonb adds the panic's cell line to stderr when it maps the
		// stack trace in time; the report carries it then, so only the
		// part before it is required.
		`cell 1 (var m map[string]int): the cell program crashed ("panic: assignment to entry in nil map" on stderr`,
		`cell 2 (os.Exit(3)): the cell program crashed ("exit status 3" on stderr)`,
		`cell 3 (undefinedFunction()): does not compile: Cell[3]: Line 2: undefined: undefinedFunction`,
		`: the cell reported an error on stdout: error: lens "L2": focal length = 0 m: must be nonzero` + "\n",
		`: the cell reported an error on stderr: error: beam: waist radius = -1 mm: must be positive (exit status 1)`,
		`cell 6 (fmt.Println("   Error: solver did not converge")): the cell reported an error on stdout: Error: solver did not converge`,
		`cell 8 (import "github.com/beamnote/beamnote/kernel/nb"): the cell reported an error on stderr: error: strconv.ParseFloat: parsing "0.42 mm": invalid syntax (in: w := nb.Must(strconv.ParseFloat("0.42 mm", 64)); exit status 1)`,
	} {
		if !strings.Contains(err.Error(), want) {
			t.Errorf("ExecuteNotebooks error lacks %q:\n%v", want, err)
		}
	}
	for _, cell := range []string{"cell 4 (", "cell 5 (", "cell 8 ("} {
		if n := strings.Count(err.Error(), cell); n != 1 {
			t.Errorf("ExecuteNotebooks error names %s %d times, want once:\n%v", cell, n, err)
		}
	}
	if strings.Contains(err.Error(), "cell 7 (") {
		t.Errorf("ExecuteNotebooks reports cell 7, whose lines only contain \"error:\":\n%v", err)
	}
	b, rerr := os.ReadFile(filepath.Join(out, "reliability.ipynb"))
	if rerr != nil {
		t.Fatal(rerr)
	}
	var nb Notebook
	if err := json.Unmarshal(b, &nb); err != nil {
		t.Fatal(err)
	}
	html, err := os.ReadFile(filepath.Join(out, "reliability.html"))
	if err != nil {
		t.Fatal(err)
	}
	for _, want := range []string{"Cell[3]: Line 2", "undefined: undefinedFunction"} {
		if !bytes.Contains(html, []byte(want)) {
			t.Errorf("the HTML export of reliability.ipynb lacks %q", want)
		}
	}
	last := nb.Cells[len(nb.Cells)-1]
	alive := false
	for _, o := range last.Outputs {
		if o.OutputType == "stream" && strings.Contains(multiline(o.Text), "kernel still alive") {
			alive = true
		}
	}
	if !alive {
		t.Errorf("the cell after the crashes did not run: outputs %+v", last.Outputs)
	}
}

// TestServeSmoke starts the notebook server the way `make notebook` does
// (ServeCommand), on a free loopback port, and checks through the Jupyter
// REST API (jupyter_server documentation, "REST API": /api/kernelspecs,
// /api/contents) that it serves notebooks/ with the beamnote kernel as the
// default and refuses requests without the token, and that the token is
// on no process's command line (/proc/<pid>/cmdline, which every local user
// can read). It needs `make kernel` first and skips otherwise.
func TestServeSmoke(t *testing.T) {
	if testing.Short() {
		t.Skip("starts a Jupyter server")
	}
	l, err := FindLayout(".")
	if err != nil {
		t.Fatal(err)
	}
	if _, err := os.Stat(filepath.Join(KernelDir(l.JupyterData()), "kernel.json")); err != nil || Jupyter() == "" {
		t.Skip("beamnote kernel not installed (run make kernel)")
	}
	ln, err := net.Listen("tcp", "127.0.0.1:0")
	if err != nil {
		t.Fatal(err)
	}
	port := ln.Addr().(*net.TCPAddr).Port
	ln.Close()
	argv, env, url, err := l.ServeCommand(ServeOptions{Port: port})
	if err != nil {
		t.Fatal(err)
	}
	cmd := exec.Command(argv[0], argv[1:]...)
	cmd.Env = Environ(env)
	if err := cmd.Start(); err != nil {
		t.Fatal(err)
	}
	defer func() {
		cmd.Process.Signal(os.Interrupt)
		cmd.Process.Signal(os.Interrupt) // the notebook server asks to confirm
		done := make(chan error, 1)
		go func() { done <- cmd.Wait() }()
		select {
		case <-done:
		case <-time.After(10 * time.Second):
			cmd.Process.Kill()
		}
	}()
	token := url[strings.Index(url, "token=")+len("token="):]
	base := fmt.Sprintf("http://127.0.0.1:%d", port)
	ctx, cancel := context.WithTimeout(context.Background(), 60*time.Second)
	defer cancel()
	if err := WaitServing(ctx, url); err != nil {
		t.Fatalf("notebook server on port %d: %v", port, err)
	}
	if _, err := os.Stat("/proc/self/cmdline"); err == nil {
		// `jupyter notebook` execs jupyter-notebook in the same process.
		b, err := os.ReadFile(fmt.Sprintf("/proc/%d/cmdline", cmd.Process.Pid))
		if err != nil {
			t.Errorf("reading the server's command line: %v", err)
		}
		if !bytes.Contains(b, []byte("notebook")) {
			t.Errorf("process %d is not the notebook server: command line %q", cmd.Process.Pid, b)
		}
		if bytes.Contains(b, []byte(token)) {
			t.Errorf("the token is on the server's command line %q", b)
		}
		// Nor on any other process's, such as a helper the server started.
		procs, _ := filepath.Glob("/proc/[0-9]*/cmdline")
		for _, p := range procs {
			if b, err := os.ReadFile(p); err == nil && bytes.Contains(b, []byte(token)) {
				t.Errorf("the token is on the command line of %s: %q", p, b)
			}
		}
	}
	var specs struct {
		Default     string                     `json:"default"`
		Kernelspecs map[string]json.RawMessage `json:"kernelspecs"`
	}
	resp, err := http.Get(base + "/api/kernelspecs?token=" + token)
	if err != nil {
		t.Fatal(err)
	}
	err = json.NewDecoder(resp.Body).Decode(&specs)
	resp.Body.Close()
	if err != nil {
		t.Fatalf("/api/kernelspecs: %v", err)
	}
	if _, ok := specs.Kernelspecs[KernelName]; !ok || specs.Default != KernelName {
		t.Errorf("kernelspecs: default %q, names %v; want %q present and default", specs.Default, slices.Sorted(maps.Keys(specs.Kernelspecs)), KernelName)
	}
	resp, err = http.Get(base + "/api/kernelspecs")
	if err != nil {
		t.Fatal(err)
	}
	resp.Body.Close()
	if resp.StatusCode != http.StatusForbidden {
		t.Errorf("request without token: status %d, want 403", resp.StatusCode)
	}
	resp, err = http.Get(base + "/api/contents/00-quickstart.ipynb?content=0&token=" + token)
	if err != nil {
		t.Fatal(err)
	}
	resp.Body.Close()
	if resp.StatusCode != http.StatusOK {
		t.Errorf("notebooks/00-quickstart.ipynb through the server: status %d, want 200", resp.StatusCode)
	}
}

// kernelInstalled skips t unless the beamnote kernel is installed in the
// project-local Jupyter data directory.
func kernelInstalled(t *testing.T) Layout {
	t.Helper()
	if testing.Short() {
		t.Skip("runs a Jupyter kernel")
	}
	l, err := FindLayout(".")
	if err != nil {
		t.Fatal(err)
	}
	if _, err := os.Stat(filepath.Join(KernelDir(l.JupyterData()), "kernel.json")); err != nil || Jupyter() == "" || Python() == "" {
		t.Skip("beamnote kernel not installed (run make kernel)")
	}
	return l
}

// kernelClient runs testdata/kernelclient.py in mode with the project-local
// kernelspec and decodes the JSON it prints into v.
func kernelClient(t *testing.T, l Layout, mode string, v any) {
	t.Helper()
	cmd := exec.Command(Python(), filepath.Join("testdata", "kernelclient.py"), mode)
	cmd.Env = Environ(l.JupyterEnv(false))
	var stderr bytes.Buffer
	cmd.Stderr = &stderr
	out, err := cmd.Output()
	if err != nil {
		t.Fatalf("kernelclient.py %s: %v\n%s", mode, err, stderr.Bytes())
	}
	if err := json.Unmarshal(out, v); err != nil {
		t.Fatalf("kernelclient.py %s: %v\n%s", mode, err, out)
	}
}

// TestKernelCompileErrorText executes, with nbclient, a cell that calls an
// undefined function on its line 3, and the cell after it. The compiler's
// message and the cell line must be in the cell's error output itself
// (nbformat "error" output: ename, evalue, traceback), which is what a
// terminal, nbconvert and an HTML export show, and in the message that
// nbclient raises (what `jupyter nbconvert --execute` prints); the next
// cell must still run.
func TestKernelCompileErrorText(t *testing.T) {
	l := kernelInstalled(t)
	var res struct {
		Terminal string     `json:"terminal"`
		Outputs  [][]Output `json:"outputs"`
	}
	kernelClient(t, l, "errors", &res)
	if len(res.Outputs) != 2 {
		t.Fatalf("kernelclient.py errors: %d cells, want 2", len(res.Outputs))
	}
	var text strings.Builder
	for _, o := range res.Outputs[0] {
		if o.OutputType == "error" {
			fmt.Fprintln(&text, o.EName, o.EValue, strings.Join(o.Traceback, "\n"))
		}
	}
	for _, want := range []string{"undefined: nosuchname", "Cell[1]: Line 3"} {
		if !strings.Contains(text.String(), want) {
			t.Errorf("error output of the cell lacks %q: %+v", want, res.Outputs[0])
		}
		if !strings.Contains(res.Terminal, want) {
			t.Errorf("nbclient's CellExecutionError lacks %q:\n%s", want, res.Terminal)
		}
	}
	if got := CheckExecuted(Notebook{Cells: []Cell{{CellType: "code", Source: json.RawMessage(`"x"`), Outputs: res.Outputs[0]}}}); len(got) == 0 ||
		!strings.Contains(got[0], "does not compile: Cell[1]: Line 3: undefined: nosuchname") {
		t.Errorf("CheckExecuted(compile error) = %q, want %q", got, "does not compile: Cell[1]: Line 3: undefined: nosuchname")
	}
	ran := false
	for _, o := range res.Outputs[1] {
		ran = ran || strings.Contains(multiline(o.Text), "still running")
	}
	if !ran {
		t.Errorf("the cell after the compile error did not run: %+v", res.Outputs[1])
	}
}

// procUsage is what kernelclient.py reads from /proc/<pid>/status and
// /proc/<pid>/stat (proc(5)) for gopls.
type procUsage struct {
	RSSKB       int     `json:"rss_kb"`
	PeakRSSKB   int     `json:"peak_rss_kb"`
	CPU         float64 `json:"cpu_s"`
	ChildrenCPU float64 `json:"children_cpu_s"`
}

// completeReply is the content of a complete_reply (Jupyter messaging
// protocol, "Completion").
type completeReply struct {
	Status  string   `json:"status"`
	Matches []string `json:"matches"`
}

// TestKernelCompletion asks the kernel, with jupyter_client, for the
// completion of "paraxial.NewBuil" and for help on "beam.FromWaist" in a
// cell that imports them (complete_request and inspect_request of the
// Jupyter messaging protocol), which gonb answers through gopls, found on
// the kernel's PATH in .beamnote/bin. It logs the wall time of the first
// and a later completion, and gopls's memory and CPU time (run with -v to
// see them). The first completion waits for gonb's first connection to
// gopls, about 12 s after the kernel starts.
func TestKernelCompletion(t *testing.T) {
	l := kernelInstalled(t)
	if _, err := os.Stat(filepath.Join(l.Bin(), "gopls")); err != nil {
		t.Skip("gopls not installed (run make kernel)")
	}
	t.Parallel() // mostly waiting for gonb's connection to gopls
	var res struct {
		KernelStart     float64       `json:"kernel_start_s"`
		SetupStatus     string        `json:"setup_status"`
		GoplsAtStart    bool          `json:"gopls_running_at_start"`
		FirstAt         float64       `json:"first_complete_at_s"`
		FirstS          float64       `json:"first_complete_s"`
		First           completeReply `json:"first_complete"`
		LaterS          float64       `json:"later_complete_s"`
		Later           completeReply `json:"later_complete"`
		OtherS          float64       `json:"other_complete_s"`
		Other           completeReply `json:"other_complete"`
		InspectS        float64       `json:"inspect_s"`
		GoplsAfterFirst *procUsage    `json:"gopls_after_first"`
		GoplsAtEnd      *procUsage    `json:"gopls_at_end"`
		Inspect         struct {
			Status string            `json:"status"`
			Found  bool              `json:"found"`
			Data   map[string]string `json:"data"`
		} `json:"inspect"`
	}
	kernelClient(t, l, "complete", &res)
	if res.SetupStatus != "ok" {
		t.Errorf("the set-up cell importing opticslib: status %q, want ok", res.SetupStatus)
	}
	if !res.GoplsAtStart {
		t.Errorf("no gopls process under the kernel after it started")
	}
	for _, test := range []struct {
		name  string
		reply completeReply
		want  string
	}{
		{"paraxial.NewBuil (first)", res.First, "NewBuilder"},
		{"paraxial.NewBuil (again)", res.Later, "NewBuilder"},
		{"beam.FromWai", res.Other, "FromWaist"},
	} {
		if test.reply.Status != "ok" || !slices.Contains(test.reply.Matches, test.want) {
			t.Errorf("complete %s = %s %q, want ok with %q", test.name, test.reply.Status, test.reply.Matches, test.want)
		}
	}
	doc := res.Inspect.Data["text/markdown"]
	if !res.Inspect.Found || !strings.Contains(doc, "func beam.FromWaist(s beam.WaistSpec) (beam.Gaussian, error)") ||
		!strings.Contains(doc, "FromWaist returns the beam at the plane where s gives it") {
		t.Errorf("inspect beam.FromWaist = found %v, %q; want its signature and doc comment", res.Inspect.Found, doc)
	}
	t.Logf("kernel start %.2f s; first completion %.2f s (asked %.2f s after the start), later %.3f s, other package %.3f s; inspect %.3f s",
		res.KernelStart, res.FirstS, res.FirstAt, res.LaterS, res.OtherS, res.InspectS)
	for _, u := range []struct {
		when string
		p    *procUsage
	}{{"after the first completion", res.GoplsAfterFirst}, {"at the end", res.GoplsAtEnd}} {
		if u.p != nil {
			t.Logf("gopls %s: RSS %.0f MB (peak %.0f MB), CPU %.2f s (+ %.2f s in the go commands it ran)", u.when,
				float64(u.p.RSSKB)/1024, float64(u.p.PeakRSSKB)/1024, u.p.CPU, u.p.ChildrenCPU)
		}
	}
}
