package trace

import (
	"strconv"

	"github.com/beamnote/beamnote/opticslib/table"
	"github.com/beamnote/beamnote/opticslib/units"
)

// Seidel returns the third-order (Seidel) aberration sums of the system
// for the source at the vacuum wavelength, from the paraxial marginal ray
// (h, u: from the axial object point, or parallel to the axis, through the
// rim of the entrance pupil, height PupilRadius at PupilZ) and the
// paraxial chief ray (h̄, ū: through the pupil centre, slope tan θ for an
// object at infinity, −ObjectHeight/(PupilZ − z_object) for a finite
// one). With the refraction invariants A = ν(u + hc), Ā = ν(ū + h̄c), the
// Lagrange invariant H = ν(ū h − u h̄) and Δ(x) = x′ − x across the
// surface, each refracting or reflecting surface contributes
//
//	S_I   = −A² h Δ(u/ν)
//	S_II  = −A Ā h Δ(u/ν)
//	S_III = −Ā² h Δ(u/ν)
//	S_IV  = −H² c Δ(1/ν)
//	S_V   = (Ā/A)(S_III + S_IV) = −Ā³ h Δ(1/ν²) − c Δ(1/ν) Ā (A h̄² − 2 Ā h h̄)
//
// (W. T. Welford, Aberrations of Optical Systems, Adam Hilger 1986,
// §8.3 [section from memory]; the last form is the same sum rewritten with
// Δ(u/ν) = A Δ(1/ν²) − h c Δ(1/ν) and H = Ā h − A h̄, which does not divide
// by A, so a flat surface in a collimated beam (A = 0) is no special
// case), and a conic of constant k, whose sag exceeds the sphere's by
// k c³ r⁴/8 at fourth order, adds
//
//	δS_I = k c³ Δν h⁴,  δS_II = k c³ Δν h³ h̄,  δS_III = k c³ Δν h² h̄²,  δS_V = k c³ Δν h h̄³
//
// (Welford 1986, §8.4 [from memory]; the sign checked against exact
// traces: a paraboloid mirror, k = −1, has S_I = 0 for an object at
// infinity). ν is the signed index, negative after an odd number of
// mirrors (so a mirror has Δν = −2n); stops add nothing, and an ideal lens
// adds nothing (it images every conjugate without aberration). The sums
// are in metres; S_II … S_V vanish for a zero field.
//
// Errors: a [*ParamError] for a bad source or a wavelength without
// indices.
func (s System) Seidel(vacuum units.Length, src Source) (Seidel, error) {
	if err := s.Validate(); err != nil {
		return Seidel{}, err
	}
	if err := src.Validate(); err != nil {
		return Seidel{}, err
	}
	if !src.collimated() && !(float64(src.PupilZ) > s.objectZ(src)) {
		return Seidel{}, &ParamError{Subject: "source", Param: "pupil z", Value: src.PupilZ,
			Reason: "must lie after the object point (z = " + units.Length(s.objectZ(src)).String() + ")"}
	}
	idx, err := s.Indices(vacuum)
	if err != nil {
		return Seidel{}, err
	}
	nu := s.signedIndices(idx)
	m, c := s.marginal(nu, src), s.chief(nu, src)
	out := Seidel{Wavelength: vacuum, Surfaces: make([]SeidelTerms, len(s.surfs))}
	out.ImageIndex, out.MarginalSlope = nu[len(nu)-1], m.u[len(m.u)-1]
	// H at the entrance pupil, where h = a and h̄ = 0 (it is invariant).
	out.Lagrange = nu[0] * c.u[0] * float64(src.PupilRadius)
	H := out.Lagrange
	for i, f := range s.surfs {
		if f.Kind != Refract && f.Kind != Reflect {
			continue
		}
		cv := f.Curvature()
		n0, n1 := nu[i], nu[i+1]
		h, u, u1 := m.h[i], m.u[i], m.u[i+1]
		hb, ub := c.h[i], c.u[i]
		A := n0 * (u + h*cv)
		Ab := n0 * (ub + hb*cv)
		du := u1/n1 - u/n0
		dinv := 1/n1 - 1/n0
		dinv2 := 1/(n1*n1) - 1/(n0*n0)
		t := SeidelTerms{
			SI:   -A * A * h * du,
			SII:  -A * Ab * h * du,
			SIII: -Ab * Ab * h * du,
			SIV:  -H * H * cv * dinv,
			SV:   -Ab*Ab*Ab*h*dinv2 - cv*dinv*Ab*(A*hb*hb-2*Ab*h*hb),
		}
		out.Petzval += cv * dinv
		if f.Conic != 0 {
			k := f.Conic * cv * cv * cv * (n1 - n0)
			t.SI += k * h * h * h * h
			t.SII += k * h * h * h * hb
			t.SIII += k * h * h * hb * hb
			t.SV += k * h * hb * hb * hb
		}
		out.Surfaces[i] = t
		out.Sum.SI += t.SI
		out.Sum.SII += t.SII
		out.Sum.SIII += t.SIII
		out.Sum.SIV += t.SIV
		out.Sum.SV += t.SV
	}
	return out, nil
}

// LongitudinalSpherical returns the third-order longitudinal spherical
// aberration of the rim ray, its axis crossing minus the paraxial focus
// along z, in metres:
//
//	δz = −S_I / (2 ν′ u′²)
//
// with ν′ the signed image-space index and u′ the paraxial marginal slope
// there: the transverse aberration of the rim ray on the paraxial image
// plane is S_I/(2ν′u′) (Welford 1986, §8.2, up to his sign of angles
// [from memory]), divided by −u′; the sign is fixed by exact traces (a
// positive singlet, S_I > 0, gives δz < 0 in the direction of travel). It
// is 0 for an afocal system (u′ = 0), where it has no meaning.
func (sd Seidel) LongitudinalSpherical() units.Length {
	if sd.MarginalSlope == 0 || sd.ImageIndex == 0 {
		return 0
	}
	return units.Length(-sd.Sum.SI / (2 * sd.ImageIndex * sd.MarginalSlope * sd.MarginalSlope))
}

// Wavefront returns the wavefront coefficients of the sums in metres, at
// the rim of the pupil and the edge of the field (Welford 1986, §8.2
// [from memory]): W040 = S_I/8, W131 = S_II/2, W222 = S_III/2,
// W220 = (S_III + S_IV)/4, W311 = S_V/2.
func (t SeidelTerms) Wavefront() (w040, w131, w222, w220, w311 float64) {
	return t.SI / 8, t.SII / 2, t.SIII / 2, (t.SIII + t.SIV) / 4, t.SV / 2
}

// Table returns the sums of each surface and their total, in µm.
func (sd Seidel) Table() table.Table {
	t := table.Table{Caption: "Seidel sums, λ0 = " + table.LengthSig(sd.Wavelength, 6),
		Header: []string{"surface", "S_I (µm)", "S_II (µm)", "S_III (µm)", "S_IV (µm)", "S_V (µm)"}}
	row := func(name string, s SeidelTerms) {
		f := func(v float64) string { return table.Sig(v/1e-6, 5) }
		t.Rows = append(t.Rows, []string{name, f(s.SI), f(s.SII), f(s.SIII), f(s.SIV), f(s.SV)})
	}
	for i, s := range sd.Surfaces {
		row(strconv.Itoa(i), s)
	}
	row("sum", sd.Sum)
	return t
}
