package trace

import (
	"math"

	"github.com/beamnote/beamnote/opticslib/table"
	"github.com/beamnote/beamnote/opticslib/units"
)

// Wavefront returns the wavefront error of the source at the vacuum
// wavelength on the plane z = plane (metres, fixed frame;
// [System.ImagePlane] for the system's own): the optical path difference
// of each pupil ray to a reference sphere centred on the chief ray's
// crossing Q of the plane.
//
// The sphere passes through the chief ray's point E on the paraxial exit
// pupil plane (the image of the entrance pupil, from the paraxial chief
// ray), so its radius is |QE| along the chief ray; when the exit pupil is
// at infinity (image-space telecentric) or more than 1000 times farther
// from the plane than the last vertex, E is the chief ray's point on the
// last vertex plane instead. The choice matters little: for a wave that
// converges to Q, the path is the same to every point of any sphere
// centred on Q; a different radius changes the OPD only in second order of
// the aberration. Each ray is carried back (or on) along its straight line
// in image space from the image plane to the sphere, which adds n′·t to
// its optical path, t the signed length (the standard route of ray
// tracing for the wavefront; e.g. Welford 1986, §6.2 [from memory]):
//
//	OPDᵢ = (OPLᵢ + n′ tᵢ) − (OPL_chief + n′ t_chief),  |Pᵢ + tᵢ dᵢ − Q| = |QE|.
//
// The optical paths start on the source's plane wavefront or object
// sphere ([System.Launch]). Positive OPD is a longer path than the chief
// ray's: the opposite sign to Welford's wavefront aberration W (his W > 0
// is a wavefront ahead of the reference), so a positive S_I gives
// OPD ≈ −(S_I/8) ρ⁴ on the paraxial image plane.
//
// Piston is then removed with the weighted mean, and RMS and PV are
// computed, weighting each ray by its pupil amplitude a = √Weight
// (exp(−r²/w²) for a Gaussian source, 1 for uniform): so that
// 1 − (2πσ/λ)² approximates the amplitude-weighted pupil average
// |Σ a e^{iφ}|²/(Σ a)² that [Wavefront.Strehl] computes. Each pupil point
// counts as an equal area: use [PupilGrid] or [PupilRandom].
//
// Errors: as [System.Spot]; [ErrChief] when the chief ray is lost,
// [ErrNoRays] when no pupil ray reaches the sphere (the Wavefront with its
// lost counts is returned with it).
func (s System) Wavefront(vacuum units.Length, src Source, pupil []PupilPoint, plane units.Length) (Wavefront, error) {
	if !finite(float64(plane)) {
		return Wavefront{}, &ParamError{Param: "plane z", Value: plane, Reason: "must be finite"}
	}
	t, err := s.traceSource(vacuum, src, pupil)
	if err != nil {
		return Wavefront{}, err
	}
	idx, _ := s.Indices(vacuum)
	nu := s.signedIndices(idx)
	w := Wavefront{Wavelength: vacuum, Reference: plane}
	zx, ok := s.exitPupil(nu, src)
	z := float64(plane)
	zLast := t.zImg
	if len(s.surfs) > 0 {
		zLast = s.vertex[len(s.surfs)-1]
	}
	if ok && math.Abs(zx-z) <= 1000*math.Abs(zLast-z) {
		w.ExitPupil, w.ExitPupilFinite = units.Length(zx), true
	} else {
		zx = zLast
		w.ExitPupil = units.Length(zx)
	}
	return t.wavefront(w, zx, z)
}

// wavefront fills w with the OPD of the traced rays to the reference
// sphere centred on the chief ray's crossing of plane z through its point
// on the plane zx.
func (t traced) wavefront(w Wavefront, zx, z float64) (Wavefront, error) {
	if err := t.chiefErr(); err != nil {
		return w, err
	}
	r := t.rays
	c := tracedChief
	qx, qy := t.at(c, z)
	w.CentreX, w.CentreY = units.Length(qx), units.Length(qy)
	// E, the chief ray's point on the plane zx, and the signed radius
	// sE = (zx − z)/N along the chief ray from Q.
	sE := (zx - z) / r.N[c]
	if sE == 0 {
		sE = -math.Copysign(1e-3*math.Abs(t.zImg-z)+1e-3, r.N[c])
	}
	w.Radius = units.Length(sE)
	R2 := sE * sE
	sigma := math.Copysign(1, sE)
	n := r.Len() - tracedPupil
	w.Pupil, w.OPD, w.Weight = make([]PupilPoint, 0, n), make([]float64, 0, n), make([]float64, 0, n)
	// The path to the sphere of ray i.
	path := func(i int) (float64, bool) {
		// w = P − Q on the image plane's ray.
		wx, wy, wz := r.X[i]-qx, r.Y[i]-qy, r.Z[i]-z
		b := wx*r.L[i] + wy*r.M[i] + wz*r.N[i]
		cc := wx*wx + wy*wy + wz*wz - R2
		d := b*b - cc
		if !(d >= 0) {
			return 0, false
		}
		// The root on E's side: t = −b + σ√d, in the form that does not
		// cancel.
		var tt float64
		if q := -b - sigma*math.Sqrt(d); sigma*b > 0 && q != 0 {
			tt = cc / q
		} else {
			tt = -b + sigma*math.Sqrt(d)
		}
		return r.OPL[i] + t.nImg*tt, true
	}
	ref, ok := path(c)
	if !ok {
		return w, &ParamError{Subject: "chief ray", Reason: "does not meet its reference sphere", Err: ErrChief}
	}
	var sa, sp float64
	for i := tracedPupil; i < r.Len(); i++ {
		if r.Status[i] != OK {
			w.Lost[r.Status[i]]++
			continue
		}
		p, ok := path(i)
		if !ok {
			w.Lost[Missed]++
			continue
		}
		pp := t.pupil[i-tracedPupil]
		wt := t.src.Weight(pp)
		w.Pupil = append(w.Pupil, pp)
		w.OPD = append(w.OPD, p-ref)
		w.Weight = append(w.Weight, wt)
		a := math.Sqrt(wt)
		sa += a
		sp += a * (p - ref)
	}
	if len(w.OPD) == 0 || !(sa > 0) {
		return w, &ParamError{Subject: "wavefront", Param: "rays lost", Value: n, Reason: "of the pupil", Err: ErrNoRays}
	}
	piston := sp / sa
	var s2, lo, hi float64
	lo, hi = math.Inf(1), math.Inf(-1)
	for i := range w.OPD {
		w.OPD[i] -= piston
		s2 += math.Sqrt(w.Weight[i]) * w.OPD[i] * w.OPD[i]
		lo, hi = math.Min(lo, w.OPD[i]), math.Max(hi, w.OPD[i])
	}
	w.RMS = units.Length(math.Sqrt(s2 / sa))
	w.PV = units.Length(hi - lo)
	return w, nil
}

// Strehl returns the Strehl ratio of the wavefront by three forms:
//
//	Pupil    = |Σ aᵢ e^{i2π OPDᵢ/λ0}|² / (Σ aᵢ)²   (aᵢ = √Weightᵢ, the pupil amplitude)
//	Marechal = 1 − (2πσ/λ0)²
//	Mahajan  = exp(−(2πσ/λ0)²)
//
// with σ = RMS and λ0 the vacuum wavelength (the OPD is an optical path,
// so the phase is 2π·OPD/λ0 in any medium). Pupil is the peak irradiance
// against that of the same pupil without aberration in the Fraunhofer
// approximation, exact for the sampled pupil; the other two approximate
// it for small σ (Maréchal's form, M. Born & E. Wolf, Principles of
// Optics, §9.1 [from memory]; the exponential, V. N. Mahajan, J. Opt. Soc.
// Am. 72, 1258 (1982)); Marechal goes negative beyond σ = λ0/(2π), where
// it has no meaning. A wavefront with no samples has Pupil = 0.
func (w Wavefront) Strehl() Strehl {
	k := 2 * math.Pi / float64(w.Wavelength)
	var sa, re, im float64
	for i, o := range w.OPD {
		a := 1.0
		if i < len(w.Weight) {
			a = math.Sqrt(w.Weight[i])
		}
		s, c := math.Sincos(k * o)
		re += a * c
		im += a * s
		sa += a
	}
	var st Strehl
	if sa > 0 {
		st.Pupil = (re*re + im*im) / (sa * sa)
	}
	x := k * float64(w.RMS)
	if !finite(x) {
		x = 0
	}
	st.Marechal = 1 - x*x
	st.Mahajan = math.Exp(-x * x)
	return st
}

// Table returns the wavefront summary: RMS and PV in waves and in
// nanometres, the Strehl ratios, the reference sphere and the rays.
func (w Wavefront) Table() table.Table {
	lam := float64(w.Wavelength)
	waves := func(l units.Length) string {
		if lam == 0 {
			return ""
		}
		return table.Sig(float64(l)/lam, 4)
	}
	t := table.Table{Caption: "Wavefront error, λ0 = " + table.LengthSig(w.Wavelength, 6),
		Header: []string{"quantity", "value", "waves"}}
	add := func(k, v, wv string) { t.Rows = append(t.Rows, []string{k, v, wv}) }
	add("RMS", table.LengthSig(w.RMS, 4), waves(w.RMS))
	add("peak to valley", table.LengthSig(w.PV, 4), waves(w.PV))
	st := w.Strehl()
	add("Strehl ratio (pupil average)", table.Fixed(st.Pupil, 4), "")
	add("Strehl ratio exp(−(2πσ/λ)²)", table.Fixed(st.Mahajan, 4), "")
	add("reference centre z (mm)", table.In(w.Reference, units.Millimeter, 4), "")
	add("reference radius", table.LengthSig(w.Radius, 4), "")
	n := 0
	for _, c := range w.Lost {
		n += c
	}
	add("rays", table.Sig(float64(len(w.OPD)), 6)+" ("+table.Sig(float64(n), 6)+" lost)", "")
	return t
}

// Table returns the three Strehl ratios.
func (st Strehl) Table() table.Table {
	return table.Table{Caption: "Strehl ratio", Header: []string{"form", "value"}, Rows: [][]string{
		{"pupil average |Σ a e^{iφ}|²/(Σ a)²", table.Fixed(st.Pupil, 5)},
		{"Maréchal 1 − (2πσ/λ)²", table.Fixed(st.Marechal, 5)},
		{"Mahajan exp(−(2πσ/λ)²)", table.Fixed(st.Mahajan, 5)},
	}}
}
