package couple

import (
	"math"
	"strconv"

	"github.com/beamnote/beamnote/opticslib/table"
	"github.com/beamnote/beamnote/opticslib/units"
)

func formatG(v float64) string { return strconv.FormatFloat(v, 'g', -1, 64) }

func pct(v float64) string { return table.Sig(100*v, 6) }

func lossDB(v float64) string {
	if v <= 0 {
		return "∞"
	}
	return table.Fixed(-10*math.Log10(v), 3)
}

// rows returns the rows of c shared by Coupling.Table and
// FibreCoupling.Table: quantity, x, y, total.
func (c Coupling) rows() [][]string {
	ox, oy, _ := c.OffsetTolerance(OneDecibel)
	tx, ty, _ := c.TiltTolerance(OneDecibel)
	m := c.Misalignment
	return [][]string{
		{"efficiency η (%)", pct(c.X.Efficiency), pct(c.Y.Efficiency), pct(c.Efficiency)},
		{"loss (dB)", lossDB(c.X.Efficiency), lossDB(c.Y.Efficiency), lossDB(c.Efficiency)},
		{"aligned (%)", pct(c.X.Aligned), pct(c.Y.Aligned), pct(c.Aligned)},
		{"offset (µm)", table.Sig(m.DX.Micrometers(), 4), table.Sig(m.DY.Micrometers(), 4), ""},
		{"tilt (mrad)", table.Sig(m.TiltX.Milliradians(), 4), table.Sig(m.TiltY.Milliradians(), 4), ""},
		{"1 dB offset tolerance (µm)", table.Sig(ox.Micrometers(), 4), table.Sig(oy.Micrometers(), 4), ""},
		{"1 dB tilt tolerance (mrad)", table.Sig(tx.Milliradians(), 4), table.Sig(ty.Milliradians(), 4), ""},
		{"M² of the partial beam", table.Sig(c.X.M2, 4), table.Sig(c.Y.M2, 4), ""},
		{"bound of the model (%)", "", "", pct(c.Bound)},
		{"model", "", "", c.Model},
	}
}

// Table returns the coupling as a table with one column per direction
// and the total: efficiency (%), loss (dB), the aligned efficiency, the
// misalignment (µm, mrad), the 1 dB offset and tilt tolerances
// ([Coupling.OffsetTolerance], [Coupling.TiltTolerance] with
// [OneDecibel]), M², the model's bound and the model.
func (c Coupling) Table() table.Table {
	return table.Table{Caption: "Mode overlap", Header: []string{"quantity", "x (tangential)", "y (sagittal)", "total"}, Rows: c.rows()}
}

// Table returns the fibre (mode-field diameter, wavelength and, for a
// fibre from its core, core diameter, NA and V) followed by the rows of
// [Coupling.Table].
func (fc FibreCoupling) Table() table.Table {
	f := fc.Fibre
	t := table.Table{Caption: "Coupling into a single-mode fibre", Header: []string{"quantity", "x (tangential)", "y (sagittal)", "total"}}
	src := "given"
	if f.V != 0 {
		src = "Marcuse's fit, V = " + table.Sig(f.V, 5)
	}
	t.Rows = append(t.Rows,
		[]string{"fibre MFD (µm)", "", "", table.Sig(f.MFD().Micrometers(), 5) + " (" + src + ")"},
		[]string{"vacuum wavelength (nm)", "", "", table.Sig(f.Wavelength.Nanometers(), 6)},
	)
	if f.V != 0 {
		t.Rows = append(t.Rows,
			[]string{"core diameter (µm)", "", "", table.Sig((2 * f.CoreRadius).Micrometers(), 5)},
			[]string{"core NA (enters V only)", "", "", table.Sig(f.NA, 4)},
		)
	}
	t.Rows = append(t.Rows, []string{"mode divergence λ0/(πw) (mrad)", "", "", table.Sig(units.Angle(float64(f.Wavelength)/(math.Pi*float64(f.ModeRadius))).Milliradians(), 4)})
	t.Rows = append(t.Rows, fc.Coupling.rows()...)
	return t
}

// Table returns the solution: each lens's focal length and position
// (mm), the target-plane position (mm), the efficiency (%), the loss (dB)
// and the method.
func (m Match) Table() table.Table {
	t := table.Table{Caption: "Mode matching", Header: []string{"quantity", "value"}}
	for _, l := range m.Lenses {
		t.Rows = append(t.Rows,
			[]string{strconv.Quote(l.Label) + " focal length f (mm)", table.Sig(l.Focal.Millimeters(), 7)},
			[]string{strconv.Quote(l.Label) + " position z (mm)", table.Sig(l.Z.Millimeters(), 7)},
		)
	}
	t.Rows = append(t.Rows,
		[]string{"target plane z (mm)", table.Sig(m.Length.Millimeters(), 7)},
		[]string{"output beam radius (µm)", table.Sig(m.Output.Radius().Micrometers(), 5)},
		[]string{"efficiency η (%)", pct(m.Coupling.Efficiency)},
		[]string{"loss (dB)", lossDB(m.Coupling.Efficiency)},
		[]string{"model", m.Coupling.Model},
		[]string{"method", m.Method},
	)
	return t
}
