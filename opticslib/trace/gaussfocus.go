package trace

import (
	"math"
	"math/cmplx"

	"gonum.org/v1/gonum/dsp/fourier"

	"github.com/beamnote/beamnote/opticslib/table"
	"github.com/beamnote/beamnote/opticslib/units"
)

// GaussianFocus returns the focus of the source's beam (a Gaussian beam
// for GaussianRadius > 0, a uniform one otherwise) through the system at
// the vacuum wavelength, on each of the planes (z in metres, fixed frame;
// nil: the system's image plane alone).
//
// The pupil field is sampled on the PupilGrid(samples) points: amplitude
// a = exp(−r²/w²) ([Source.Weight]'s square root) and phase 2π·OPD/λ0,
// the OPD to the reference sphere about the chief ray's crossing of each
// plane ([System.Wavefront]); rays that are lost carry no field. The focal
// field is its Fraunhofer transform in the Debye approximation,
//
//	U(x, y) ∝ Σ a e^{i2π OPD/λ0} e^{−i k0 n′ s (ρx x + ρy y)},
//
// with k0 = 2π/λ0, n′ the image-space index and s the paraxial image-space
// sine per unit of normalised pupil radius (the paraxial marginal ray's
// |u′|; exact for a lens that obeys the sine condition at small
// apertures), computed by a zero-padded FFT of size Padded = the power of
// two ≥ 4·samples (gonum dsp/fourier), so the focal samples are Dx =
// λ0/(n′ s Padded dρ) apart, dρ = 2/(samples − 1), in the plane normal to
// the axis about the chief ray's crossing (the fields are small enough
// that the chief ray's tilt is ignored). The peak is refined by a
// parabola through the largest sample and its neighbours.
//
// Peak[j] is the peak irradiance on plane j against the peak of the same
// pupil without aberration, (Σ a)² (at any plane: the reference follows
// the plane), so it is a Strehl ratio of the beam that includes the
// defocus to that plane and, at the chief ray's point, equals the pupil
// average of [Wavefront.Strehl] with Gaussian weights. Best is the plane
// of highest Peak, PeakRatio that value, Radius the second-moment radius
// √(2(σx² + σy²)) of the irradiance there (D4σ/2 per axis averaged, the
// 1/e² radius for a Gaussian spot, as ISO 11146 defines it), and
// IdealRadius the same for the aberration-free pupil: for a Gaussian
// filling less than about 0.4 of the aperture it is the Gaussian beam's
// focus λ0 a/(π n′ s w), λ0 f/(π w) for a collimated beam and a lens of
// focal length f (H. Kogelnik & T. Li, "Laser beams and resonators",
// Appl. Opt. 5, 1550 (1966); A. E. Siegman, Lasers, University Science
// Books 1986, ch. 17). A hard-edged (uniform or strongly truncated) pupil
// has an Airy pattern whose second moment grows with the window, so its
// radii are not meaningful.
//
// Errors: a [*ParamError] for samples outside [8, 256], a plane not
// finite, or as [System.Wavefront]; [ErrAfocal] for an afocal system.
func (s System) GaussianFocus(vacuum units.Length, src Source, samples int, planes []units.Length) (GaussianFocus, error) {
	if samples < 8 || samples > 256 {
		return GaussianFocus{}, &ParamError{Subject: "Gaussian focus", Param: "samples", Value: samples, Reason: "must be in [8, 256] across the pupil"}
	}
	if planes == nil {
		planes = []units.Length{s.ImagePlane()}
	}
	for _, z := range planes {
		if !finite(float64(z)) {
			return GaussianFocus{}, &ParamError{Subject: "Gaussian focus", Param: "plane z", Value: z, Reason: "must be finite"}
		}
	}
	pupil := PupilGrid(samples)
	t, err := s.traceSource(vacuum, src, pupil)
	if err != nil {
		return GaussianFocus{}, err
	}
	idx, _ := s.Indices(vacuum)
	nu := s.signedIndices(idx)
	m := s.marginal(nu, src)
	sine := math.Abs(m.u[len(m.u)-1])
	if !(sine > 0) {
		return GaussianFocus{}, &ParamError{Subject: "paraxial marginal ray", Reason: "leaves the system parallel to the axis", Err: ErrAfocal}
	}
	zx, ok := s.exitPupil(nu, src)
	if !ok {
		zx = t.zImg
		if len(s.surfs) > 0 {
			zx = s.vertex[len(s.surfs)-1]
		}
	}
	M := 1
	for M < 4*samples {
		M *= 2
	}
	drho := 2 / float64(samples-1)
	g := GaussianFocus{Wavelength: vacuum, Planes: append([]units.Length(nil), planes...), Samples: samples, Padded: M,
		GaussianRadius: src.GaussianRadius, Sine: sine,
		Dx: units.Length(float64(vacuum) / (t.nImg * sine * float64(M) * drho))}
	cell := func(p PupilPoint) int {
		i := int(math.Round((p.X + 1) / drho))
		j := int(math.Round((p.Y + 1) / drho))
		return j*M + i
	}
	fft := fourier.NewCmplxFFT(M)
	u := make([]complex128, M*M)
	work := make([]complex128, 2*M)
	// The aberration-free pupil: its peak and radius.
	var sa float64
	for _, p := range pupil {
		a := math.Sqrt(src.Weight(p))
		u[cell(p)] = complex(a, 0)
		sa += a
	}
	fft2(fft, u, M, work)
	_, g.IdealRadius = focusStats(u, M, float64(g.Dx))
	norm := sa * sa
	var best []complex128
	g.Peak = make([]float64, len(planes))
	for j, z := range planes {
		w, err := t.wavefront(Wavefront{Wavelength: vacuum, Reference: z}, zx, float64(z))
		if err != nil {
			return GaussianFocus{}, err
		}
		clear(u)
		k := 2 * math.Pi / float64(vacuum)
		for i, p := range w.Pupil {
			u[cell(p)] = complex(math.Sqrt(w.Weight[i]), 0) * cmplx.Exp(complex(0, k*w.OPD[i]))
		}
		fft2(fft, u, M, work)
		peak, _ := focusPeak(u, M)
		g.Peak[j] = peak / norm
		if j == 0 || g.Peak[j] > g.PeakRatio {
			g.PeakRatio, g.Best = g.Peak[j], z
			best = append(best[:0], u...)
		}
	}
	_, g.Radius = focusStats(best, M, float64(g.Dx))
	return g, nil
}

// fft2 transforms the M × M field u (row-major) in place, rows then
// columns; work holds 2M values.
func fft2(t *fourier.CmplxFFT, u []complex128, m int, work []complex128) {
	in, out := work[:m], work[m:2*m]
	for j := range m {
		t.Coefficients(out, u[j*m:(j+1)*m])
		copy(u[j*m:(j+1)*m], out)
	}
	for i := range m {
		for j := range m {
			in[j] = u[j*m+i]
		}
		t.Coefficients(out, in)
		for j := range m {
			u[j*m+i] = out[j]
		}
	}
}

// focusPeak returns the peak of |u|², refined by a parabola through the
// largest sample and its neighbours along each axis (periodic), and the
// index of the largest sample.
func focusPeak(u []complex128, m int) (float64, int) {
	k, b := 0, -1.0
	for i, v := range u {
		if a := real(v)*real(v) + imag(v)*imag(v); a > b {
			k, b = i, a
		}
	}
	at := func(i, j int) float64 {
		v := u[((j+m)%m)*m+(i+m)%m]
		return real(v)*real(v) + imag(v)*imag(v)
	}
	i0, j0 := k%m, k/m
	peak := b
	for _, d := range [][2]int{{1, 0}, {0, 1}} {
		lo, hi := at(i0-d[0], j0-d[1]), at(i0+d[0], j0+d[1])
		if den := lo - 2*b + hi; den < 0 {
			peak -= (hi - lo) * (hi - lo) / (8 * den)
		}
	}
	return peak, k
}

// focusStats returns the power and the second-moment radius
// √(2(σx² + σy²)) in metres of the irradiance |u|² on the periodic M × M
// grid of spacing dx, with the window centred on the largest sample.
func focusStats(u []complex128, m int, dx float64) (float64, units.Length) {
	_, k := focusPeak(u, m)
	i0, j0 := k%m, k/m
	var p, sx, sy, sxx, syy float64
	for j := range m {
		y := float64((j-j0+m+m/2)%m - m/2)
		for i := range m {
			x := float64((i-i0+m+m/2)%m - m/2)
			v := u[j*m+i]
			a := real(v)*real(v) + imag(v)*imag(v)
			p += a
			sx += a * x
			sy += a * y
			sxx += a * x * x
			syy += a * y * y
		}
	}
	if !(p > 0) {
		return 0, 0
	}
	mx, my := sx/p, sy/p
	vx, vy := sxx/p-mx*mx, syy/p-my*my
	return p, units.Length(dx * math.Sqrt(2*math.Max(0, vx+vy)))
}

// Table returns the focus: the peak ratio on each plane, then the best
// plane, its radius and the aberration-free radius.
func (g GaussianFocus) Table() table.Table {
	t := table.Table{Caption: "Focus of the beam, λ0 = " + table.LengthSig(g.Wavelength, 6) +
		": best plane z = " + table.In(g.Best, units.Millimeter, 4) + " mm, peak ratio " + table.Fixed(g.PeakRatio, 4) +
		", radius " + table.LengthSig(g.Radius, 4) + " (aberration-free " + table.LengthSig(g.IdealRadius, 4) + ")",
		Header: []string{"plane z (mm)", "peak / aberration-free peak"}}
	for i, z := range g.Planes {
		t.Rows = append(t.Rows, []string{table.In(z, units.Millimeter, 4), table.Fixed(g.Peak[i], 4)})
	}
	return t
}
