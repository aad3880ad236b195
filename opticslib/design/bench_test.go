package design_test

import (
	"testing"

	"github.com/beamnote/beamnote/opticslib/design"
)

var sinkCost float64

// BenchmarkMinimize solves the two-lens expander of TestMinimizeExpander
// (input waist distance and gap free; a 3× waist in L2's back focal
// plane): starts, Nelder–Mead runs and the centring run, as a notebook
// cell does it.
func BenchmarkMinimize(b *testing.B) {
	p := expander(b)
	b.ReportAllocs()
	for b.Loop() {
		s, err := design.Minimize(p, nil)
		if err != nil {
			b.Fatal(err)
		}
		sinkCost = s.Evaluation.Cost
	}
}

// BenchmarkSolveOne finds the collimating gap of TestSolveOneAfocal (200
// scan intervals and a Brent search).
func BenchmarkSolveOne(b *testing.B) {
	p := collimation(b, hene(b, 0.1*mm), 50*mm, 50*mm, 150*mm, 100*mm, 400*mm)
	b.ReportAllocs()
	for b.Loop() {
		r, err := design.SolveOne(p, nil)
		if err != nil {
			b.Fatal(err)
		}
		sinkCost = float64(r.Values[0])
	}
}
