package measure

import (
	"math"
	"strconv"
	"strings"

	"github.com/beamnote/beamnote/opticslib/table"
	"github.com/beamnote/beamnote/opticslib/units"
)

// causticUncertaintyNote says where the uncertainties of f come from.
func (f CausticFit) causticUncertaintyNote() string {
	if f.Scaled {
		return "standard uncertainties from the covariance scaled by the residual variance χ²/(n − 3)"
	}
	return "standard uncertainties from the covariance of the stated width uncertainties, taken as absolute"
}

// Table returns the fit as a table, one row per axis: the waist radius
// w0, its position z0 on the scan's axis, the Rayleigh length zR, the
// full divergence Θ and M², each as value ± standard uncertainty, the RMS
// residual of the radii, and the plane counts of ISO 11146-1's rule
// (within zR / beyond 2zR / all). Lengths are in the unit that suits each
// column, named in its header. The caption says what was fitted (width
// kind, weighting, wavelength, where the uncertainties come from) and
// carries the warnings, so that a notebook shows them with the numbers.
func (f CausticFit) Table() table.Table {
	axes := f.Axes()
	var w0s, z0s, zrs, res []units.Length
	var th float64
	for _, a := range axes {
		w0s, z0s, zrs, res = append(w0s, a.W0.Value), append(z0s, a.Z0.Value), append(zrs, a.RayleighRange.Value), append(res, a.Residual)
		th = math.Max(th, math.Abs(float64(a.Divergence.Value)))
	}
	uw, sw := table.LengthUnit(w0s...)
	uz, sz := table.LengthUnit(z0s...)
	ur, sr := table.LengthUnit(zrs...)
	ue, se := table.LengthUnit(append(res, w0s...)...)
	ua, sa := causticAngleUnit(th)
	caption := "Caustic fit (ISO 11146-1 hyperbola) of " + f.Source + ": " + f.Kind.String() + ", " + f.Weighting.String() +
		", λ0 = " + table.LengthSig(f.Wavelength, 6) + "; " + f.causticUncertaintyNote()
	if f.Index != 1 {
		caption += "; index " + table.Sig(f.Index, 6)
	}
	for _, w := range f.Warnings {
		caption += ". Warning: " + w
	}
	t := table.Table{
		Caption: caption,
		Header: []string{"axis", "w0 (" + sw + ")", "z0 (" + sz + ")", "zR (" + sr + ")", "Θ (" + sa + ")", "M²",
			"rms residual (" + se + ")", "planes ≤ zR / ≥ 2zR / all"},
	}
	for _, a := range axes {
		t.Rows = append(t.Rows, []string{
			a.Axis,
			causticPM(float64(a.W0.Value/uw), float64(a.W0.Sigma/uw)),
			causticPM(float64(a.Z0.Value/uz), float64(a.Z0.Sigma/uz)),
			causticPM(float64(a.RayleighRange.Value/ur), float64(a.RayleighRange.Sigma/ur)),
			causticPM(float64(a.Divergence.Value)/ua, float64(a.Divergence.Sigma)/ua),
			causticPM(a.M2.Value, a.M2.Sigma),
			table.Sig(float64(a.Residual/ue), 3),
			strconv.Itoa(a.Check.Inside) + " / " + strconv.Itoa(a.Check.Outside) + " / " + strconv.Itoa(a.Check.Planes),
		})
	}
	return t
}

// String returns a summary of the fit: what was fitted, one line per
// axis, how it was weighted and where the uncertainties come from, then
// the warnings, one per line.
func (f CausticFit) String() string {
	if f.fitted() != nil {
		return "caustic fit: none"
	}
	var b strings.Builder
	b.WriteString("Caustic fit of " + f.Source + " (ISO 11146-1 hyperbola, " + strconv.Itoa(f.X.Planes) + " planes): " + f.Kind.String() + ", λ0 = " + table.LengthSig(f.Wavelength, 6) + "\n")
	for _, a := range f.Axes() {
		b.WriteString(a.Axis + ": w0 = " + a.W0.String() + " at z0 = " + a.Z0.String() + ", zR = " + a.RayleighRange.String() +
			", Θ = " + a.Divergence.String() + ", M² = " + a.M2.String() + ", rms residual " + table.LengthSig(a.Residual, 3))
		if f.Weighting == UncertaintyWeighted && a.DOF > 0 {
			b.WriteString(", χ²/ν = " + table.Sig(a.ChiSquare/float64(a.DOF), 3) + " (ν = " + strconv.Itoa(a.DOF) + ")")
		}
		b.WriteString("\n")
	}
	b.WriteString("weighting: " + f.Weighting.String() + "; " + f.causticUncertaintyNote() + "\n")
	for _, w := range f.Warnings {
		b.WriteString("warning: " + w + "\n")
	}
	return strings.TrimSuffix(b.String(), "\n")
}

// Table returns the output waists as a table, one row per plane (one
// "round" row when the two agree): the waist position from the system's
// input plane and from its output plane, the waist radius and the
// Rayleigh length, each as value ± standard uncertainty; the caption
// says how the uncertainty was propagated.
func (w PropagatedWaist) Table() table.Table {
	rows := []WaistEstimate{w.X, w.Y}
	if w.Round {
		rows = rows[:1]
		rows[0].Axis = "round"
	}
	var zs, as, rs, zrs []units.Length
	for _, r := range rows {
		zs, as, rs, zrs = append(zs, r.Z.Value), append(as, r.AfterSystem.Value), append(rs, r.Radius.Value), append(zrs, r.RayleighRange.Value)
	}
	uz, sz := table.LengthUnit(append(zs, as...)...)
	ur, sr := table.LengthUnit(rs...)
	uq, sq := table.LengthUnit(zrs...)
	t := table.Table{
		Caption: "Output waist from the caustic fit of " + w.Source + " entering at z = " + table.LengthSig(w.At, 6) + " on the scan's axis; " + w.causticMethodNote(),
		Header:  []string{"axis", "waist z from the input (" + sz + ")", "after the system (" + sz + ")", "w0 (" + sr + ")", "zR (" + sq + ")"},
	}
	pm := func(u Uncertain[units.Length], scale units.Length) string {
		return causticPM(float64(u.Value/scale), float64(u.Sigma/scale))
	}
	for _, r := range rows {
		t.Rows = append(t.Rows, []string{r.Axis, pm(r.Z, uz), pm(r.AfterSystem, uz), pm(r.Radius, ur), pm(r.RayleighRange, uq)})
	}
	return t
}

func (w PropagatedWaist) causticMethodNote() string {
	s := "uncertainty by " + w.Method.String()
	if w.Method == MonteCarlo {
		s += " (" + strconv.Itoa(w.Samples) + " draws"
		if w.Rejected > 0 {
			s += ", " + strconv.Itoa(w.Rejected) + " without a waist left out"
		}
		s += ")"
	}
	return s
}

// String returns a summary: one line per plane with the waist position
// after the system and its radius, and how the uncertainty was
// propagated.
func (w PropagatedWaist) String() string {
	rows := []WaistEstimate{w.X, w.Y}
	if w.Round {
		rows = rows[:1]
		rows[0].Axis = "round"
	}
	var b strings.Builder
	b.WriteString("Output waist (fit of " + w.Source + " entering at z = " + table.LengthSig(w.At, 6) + "):\n")
	for _, r := range rows {
		b.WriteString(r.Axis + ": w0 = " + r.Radius.String() + " at " + r.AfterSystem.String() + " after the system (z = " + r.Z.String() + "), zR = " + r.RayleighRange.String() + "\n")
	}
	b.WriteString(w.causticMethodNote())
	return b.String()
}
