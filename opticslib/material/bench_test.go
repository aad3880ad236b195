package material_test

import (
	"testing"

	"github.com/beamnote/beamnote/opticslib/material"
	"github.com/beamnote/beamnote/opticslib/units"
)

var sink float64

func BenchmarkIndex(b *testing.B) {
	for _, name := range []string{"N-BK7", "air", "water", "vacuum"} {
		m, err := material.ByName(name)
		if err != nil {
			b.Fatal(err)
		}
		b.Run(name, func(b *testing.B) {
			b.ReportAllocs()
			l := 632.8 * units.Nanometer
			for b.Loop() {
				n, _ := m.Index(l)
				sink += n
			}
		})
	}
}

func BenchmarkDispersion(b *testing.B) {
	m, _ := material.ByName("N-BK7")
	b.ReportAllocs()
	for b.Loop() {
		d, _ := m.Dispersion(632.8 * units.Nanometer)
		sink += d.D2N
	}
}
