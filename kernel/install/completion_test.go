package install

import (
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"github.com/beamnote/beamnote/kernel/internal/kerneltest"
)

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
	l := kerneltest.Installed(t)
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
	kerneltest.Client(t, l, "complete", &res)
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
