package beam

import (
	"math"
	"strconv"

	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/table"
	"github.com/beamnote/beamnote/opticslib/units"
)

// WaistList is the waist after each element of a system, as [Waists]
// returns it.
type WaistList []Waist

// Last returns the waist after the last element (the output beam's waist),
// or the zero Waist for an empty list.
func (ws WaistList) Last() Waist {
	if len(ws) == 0 {
		return Waist{}
	}
	return ws[len(ws)-1]
}

// Surfaces returns the waists after the elements that are not spaces (a
// space moves the beam, not its waist).
func (ws WaistList) Surfaces(sys paraxial.System) WaistList {
	var out WaistList
	for _, w := range ws {
		if w.Element < sys.Len() && sys.Element(w.Element).Kind != paraxial.KindSpace {
			out = append(out, w)
		}
	}
	return out
}

// Table returns the waists as a table: the element, the waist position
// from the input plane and from the element (negative for a virtual waist
// before it), the waist radius, the Rayleigh range and the index after the
// element; x and y columns when the beam is astigmatic. Positions are in
// mm; waist radii and Rayleigh ranges, which span decades along a path (a
// focus next to a collimated beam), carry their unit in each cell, with
// four significant digits.
func (ws WaistList) Table() table.Table {
	astig := false
	for _, w := range ws {
		astig = astig || w.ZY != w.Z || w.RadiusY != w.Radius
	}
	t := table.Table{Caption: "Waists after each element", Header: []string{"after", "waist z (mm)", "from the element (mm)", "w0", "zR", "n"}}
	if astig {
		t.Header = []string{"after", "x waist z (mm)", "y waist z (mm)", "w0x", "w0y", "zRx", "zRy", "n"}
	}
	q := func(l units.Length) string { return table.LengthSig(l, 4) }
	for _, w := range ws {
		name := w.Name
		if name == "" {
			name = "element " + strconv.Itoa(w.Element)
		}
		if astig {
			t.Rows = append(t.Rows, []string{name, table.In(w.Z, units.Millimeter, 2), table.In(w.ZY, units.Millimeter, 2),
				q(w.Radius), q(w.RadiusY), q(w.RayleighRange), q(w.RayleighRangeY), table.Fixed(w.Index, 4)})
			continue
		}
		t.Rows = append(t.Rows, []string{name, table.In(w.Z, units.Millimeter, 2), table.In(w.AfterElement, units.Millimeter, 2),
			q(w.Radius), q(w.RayleighRange), table.Fixed(w.Index, 4)})
	}
	return t
}

// Clips is the result of [Clipping]: one check per clear aperture.
type Clips []Clip

// Low returns the checks that fall below their threshold.
func (cs Clips) Low() Clips {
	var out Clips
	for _, c := range cs {
		if c.Low {
			out = append(out, c)
		}
	}
	return out
}

// Table returns the clipping check as a table: element, position, clear
// diameter, tilt, the 1/e² beam radius across the beam and the x semi-axis
// of its footprint on the part (both radii, mm), transmitted fraction and threshold (%), and a status ("ok",
// "clips", or "clips (own threshold)").
func (cs Clips) Table() table.Table {
	t := table.Table{Caption: "Clipping at the clear apertures", Header: []string{"element", "z (mm)", "clear Ø (mm)", "tilt (°)", "beam radius w (mm)", "footprint x semi-axis (mm)", "passes (%)", "threshold (%)", "status"}}
	for _, c := range cs {
		status := "ok"
		if c.Low {
			status = "clips"
			if c.OwnThreshold {
				status = "clips (own threshold)"
			}
		}
		name := c.Label
		if name == "" {
			name = c.Name
		}
		d := table.In(c.Opening.Diameter(), units.Millimeter, 2)
		if c.Opening.Shape == paraxial.Slit {
			d += " slit"
		}
		t.Rows = append(t.Rows, []string{name, table.In(c.Z, units.Millimeter, 1), d, table.Fixed(c.Tilt.Degrees(), 0),
			table.In(c.W, units.Millimeter, 3), table.In(c.Footprint(), units.Millimeter, 3), strconv.FormatFloat(100*c.Transmission, 'f', 2, 64),
			strconv.FormatFloat(100*c.MinTransmission, 'f', 0, 64), status})
	}
	return t
}

// Table returns the beam at its plane as a two-column table: beam radius,
// wavefront radius of curvature (∞ at a waist), waist radius and its
// position from the plane, Rayleigh range, half and full divergence, M²,
// vacuum wavelength and index.
func (g Gaussian) Table() table.Table {
	t := table.Table{Caption: "Gaussian beam", Header: []string{"quantity", "value"}}
	add := func(k, v string) { t.Rows = append(t.Rows, []string{k, v}) }
	// At a waist to rounding (|z| below 1e-9 zR) the wavefront is flat and
	// the waist here: print ∞ and 0, not 4e14 m and 1e-14 nm.
	atWaist := math.Abs(real(g.Q)) <= 1e-9*imag(g.Q)
	r, off := table.Quantity(g.WavefrontRadius()), table.Quantity(g.WaistOffset())
	if atWaist {
		r, off = "∞", "0 (at the waist)"
	}
	add("beam radius w (1/e²)", table.Quantity(g.Radius()))
	add("wavefront radius R", r)
	add("waist radius w0", table.Quantity(g.WaistRadius()))
	add("waist position from here", off)
	add("Rayleigh range zR", table.Quantity(g.RayleighRange()))
	add("half-divergence θ", table.AngleSig(g.HalfDivergence(), 4))
	add("full divergence Θ (ISO 11146)", table.AngleSig(g.FullDivergence(), 4))
	add("M²", table.Sig(g.BeamQuality(), 4))
	add("vacuum wavelength λ0", table.Quantity(g.Wavelength))
	add("index n", table.Sig(g.Index, 6))
	return t
}

// Table returns the beam at its plane with one column per plane (x
// tangential, y sagittal); see [Gaussian.Table].
func (a Astigmatic) Table() table.Table {
	tx, ty := a.X.Table(), a.Y.Table()
	t := table.Table{Caption: "Astigmatic Gaussian beam", Header: []string{"quantity", "x (tangential)", "y (sagittal)"}}
	for i := range tx.Rows {
		t.Rows = append(t.Rows, []string{tx.Rows[i][0], tx.Rows[i][1], ty.Rows[i][1]})
	}
	return t
}

// String returns [Irradiance.Summary], which ends with [SafetyNote]: a
// notebook shows the caution with the numbers.
func (ir Irradiance) String() string { return ir.Summary() }
