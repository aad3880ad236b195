package trace

import (
	"math"

	"github.com/beamnote/beamnote/opticslib/table"
	"github.com/beamnote/beamnote/opticslib/units"
)

// airyFactor is the first zero of J₁ over π, 3.8317060/π = 1.2196699: the
// radius of the first dark ring of the Airy pattern is 1.21967 λ/(2 NA)
// (M. Born & E. Wolf, Principles of Optics, 7th ed., §8.5.2; the zero of
// J₁ is 3.8317059702).
const airyFactor = 3.8317059702075123 / math.Pi

// Spot returns the spot diagram of the source at the vacuum wavelength on
// the plane z = plane (metres, fixed frame; [System.ImagePlane] for the
// system's own image plane): each ray that reached the image plane is
// carried along its straight line to the plane.
//
// The statistics are weighted by the pupil intensity weights
// ([Source.Weight]): the weighted centroid, the RMS radius about it
//
//	RMS² = Σ wᵢ |rᵢ − r̄|² / Σ wᵢ,
//
// the largest distance from it, and the Airy radius 1.21967 λ₀/(2 NA′)
// with NA′ = n′ sin U′ from four rim rays (pupil points (0, ±1), (±1, 0),
// traced besides the pupil) about the chief ray (0 when none of them
// reaches the image plane). Each pupil point counts as an equal area of
// the pupil, so use [PupilGrid] or [PupilRandom] for the statistics.
//
// When no pupil ray reaches the plane, the Spot (with its lost counts) is
// returned with an error wrapping [ErrNoRays]. Other errors: a
// [*ParamError] for a bad source, pupil, wavelength or plane, and
// [ErrChief] when the chief ray is lost.
func (s System) Spot(vacuum units.Length, src Source, pupil []PupilPoint, plane units.Length) (Spot, error) {
	if !finite(float64(plane)) {
		return Spot{}, &ParamError{Param: "plane z", Value: plane, Reason: "must be finite"}
	}
	t, err := s.traceSource(vacuum, src, pupil)
	if err != nil {
		return Spot{}, err
	}
	return t.spot(vacuum, float64(plane))
}

// spot computes the spot diagram of a traced source on the plane z.
func (t traced) spot(vacuum units.Length, z float64) (Spot, error) {
	sp := Spot{Wavelength: vacuum, Field: t.field, Plane: units.Length(z)}
	if err := t.chiefErr(); err != nil {
		return sp, err
	}
	cx, cy := t.at(tracedChief, z)
	sp.ChiefX, sp.ChiefY = units.Length(cx), units.Length(cy)
	r := t.rays
	n := r.Len() - tracedPupil
	sp.X, sp.Y = make([]float64, 0, n), make([]float64, 0, n)
	sp.Pupil, sp.Weight = make([]PupilPoint, 0, n), make([]float64, 0, n)
	var sw, sx, sy float64
	for i := tracedPupil; i < r.Len(); i++ {
		if r.Status[i] != OK {
			sp.Lost[r.Status[i]]++
			continue
		}
		p := t.pupil[i-tracedPupil]
		x, y := t.at(i, z)
		w := t.src.Weight(p)
		sp.X, sp.Y = append(sp.X, x), append(sp.Y, y)
		sp.Pupil, sp.Weight = append(sp.Pupil, p), append(sp.Weight, w)
		sw += w
		sx += w * x
		sy += w * y
	}
	if len(sp.X) == 0 || !(sw > 0) {
		return sp, &ParamError{Subject: "spot", Param: "rays lost", Value: n, Reason: "of the pupil", Err: ErrNoRays}
	}
	mx, my := sx/sw, sy/sw
	sp.CentroidX, sp.CentroidY = units.Length(mx), units.Length(my)
	var s2, geo float64
	for i := range sp.X {
		sp.X[i] -= mx
		sp.Y[i] -= my
		r2 := sp.X[i]*sp.X[i] + sp.Y[i]*sp.Y[i]
		s2 += sp.Weight[i] * r2
		geo = math.Max(geo, r2)
	}
	sp.RMS = units.Length(math.Sqrt(s2 / sw))
	sp.Geometric = units.Length(math.Sqrt(geo))
	if na := t.nImg * t.imageSine(); na > 0 {
		sp.Airy = units.Length(airyFactor * float64(vacuum) / (2 * na))
	}
	return sp, nil
}

// fieldAngle returns the field angle of the source: Field for an object at
// infinity, the angle of the object point seen from the pupil centre for a
// finite object.
func (s System) fieldAngle(src Source) units.Angle {
	if src.collimated() {
		return src.Field
	}
	return units.Angle(math.Atan2(float64(src.ObjectHeight), float64(src.PupilZ)-s.objectZ(src)))
}

// Traced returns the number of pupil rays that reached the plane.
func (sp Spot) Traced() int { return len(sp.X) }

// LostTotal returns the number of pupil rays that did not reach the plane.
func (sp Spot) LostTotal() int {
	n := 0
	for _, c := range sp.Lost {
		n += c
	}
	return n
}

// Table returns the spot's summary: wavelength, field, plane, centroid,
// chief-ray crossing, RMS and geometric radius, Airy radius, and the rays
// traced and lost (by cause).
func (sp Spot) Table() table.Table {
	q := func(l units.Length) string { return table.LengthSig(l, 4) }
	t := table.Table{Caption: "Spot diagram", Header: []string{"quantity", "value"}}
	add := func(k, v string) { t.Rows = append(t.Rows, []string{k, v}) }
	add("wavelength λ0", q(sp.Wavelength))
	add("field angle", table.Fixed(sp.Field.Degrees(), 4)+"°")
	add("plane z (mm)", table.In(sp.Plane, units.Millimeter, 4))
	add("centroid (x, y)", q(sp.CentroidX)+", "+q(sp.CentroidY))
	add("chief ray (x, y)", q(sp.ChiefX)+", "+q(sp.ChiefY))
	add("RMS radius", q(sp.RMS))
	add("geometric radius", q(sp.Geometric))
	if sp.Airy > 0 {
		add("Airy radius", q(sp.Airy))
	}
	add("rays traced", table.Sig(float64(sp.Traced()), 6))
	for st, c := range sp.Lost {
		if c > 0 {
			add("lost: "+Status(st).String(), table.Sig(float64(c), 6))
		}
	}
	return t
}

// String returns the table as aligned text.
func (sp Spot) String() string { return sp.Table().Text() }

// BestFocus returns the plane of least RMS spot radius of the source at
// the vacuum wavelength, and the paraxial focus. Each ray's crossing of a
// plane moved by δ along z is linear in δ, rᵢ(δ) = rᵢ + δ·tᵢ with tᵢ =
// (L/N, M/N) its direction tangents, so the weighted RMS² about the
// centroid is the quadratic
//
//	RMS²(δ) = var(r) + 2δ cov(r, t) + δ² var(t),
//
// whose least value lies at δ* = −cov(r, t)/var(t) (weighted variances and
// covariances summed over x and y, the weights of [System.Spot]): no
// search. The paraxial focus is [System.ParaxialFocus].
//
// The error wraps [ErrAfocal] when the rays leave parallel (var(t) = 0),
// or when only the paraxial focus is missing (the paraxial marginal ray
// leaves parallel while the real rays converge: the Focus is returned
// with it, Paraxial zero); [ErrNoRays] when no ray reaches the image
// plane; otherwise as [System.Spot].
func (s System) BestFocus(vacuum units.Length, src Source, pupil []PupilPoint) (Focus, error) {
	t, err := s.traceSource(vacuum, src, pupil)
	if err != nil {
		return Focus{}, err
	}
	idx, _ := s.Indices(vacuum) // checked by the trace
	var f Focus
	f.Wavelength = vacuum
	zp, perr := s.paraxialFocus(s.signedIndices(idx), src)
	f.Paraxial = zp
	r := t.rays
	var sw, sx, sy, sa, sb float64
	for i := tracedPupil; i < r.Len(); i++ {
		if r.Status[i] != OK {
			continue
		}
		w := src.Weight(t.pupil[i-tracedPupil])
		sw += w
		sx += w * r.X[i]
		sy += w * r.Y[i]
		sa += w * r.L[i] / r.N[i]
		sb += w * r.M[i] / r.N[i]
	}
	if !(sw > 0) {
		return f, &ParamError{Subject: "best focus", Param: "pupil rays", Value: len(pupil), Reason: "none reached the image plane", Err: ErrNoRays}
	}
	mx, my, ma, mb := sx/sw, sy/sw, sa/sw, sb/sw
	var cov, vt float64
	for i := tracedPupil; i < r.Len(); i++ {
		if r.Status[i] != OK {
			continue
		}
		w := src.Weight(t.pupil[i-tracedPupil])
		da, db := r.L[i]/r.N[i]-ma, r.M[i]/r.N[i]-mb
		cov += w * ((r.X[i]-mx)*da + (r.Y[i]-my)*db)
		vt += w * (da*da + db*db)
	}
	if !(vt > 1e-30*sw) {
		if perr != nil {
			return f, perr
		}
		return f, &ParamError{Subject: "best focus", Reason: "the rays leave parallel", Err: ErrAfocal}
	}
	f.Plane = units.Length(t.zImg - cov/vt)
	sp, err := t.spot(vacuum, float64(f.Plane))
	if err != nil {
		return f, err
	}
	f.RMS = sp.RMS
	f.Airy = sp.Airy
	return f, perr
}

// Table returns the focus as a table: the plane of least RMS radius, the
// RMS radius there, the paraxial focus and their difference.
func (f Focus) Table() table.Table {
	t := table.Table{Caption: "Best focus (least RMS spot radius)", Header: []string{"quantity", "value"}}
	add := func(k, v string) { t.Rows = append(t.Rows, []string{k, v}) }
	add("least-RMS plane z (mm)", table.In(f.Plane, units.Millimeter, 4))
	add("RMS radius there", table.LengthSig(f.RMS, 4))
	if f.Airy > 0 {
		add("Airy radius", table.LengthSig(f.Airy, 4))
	}
	add("paraxial focus z (mm)", table.In(f.Paraxial, units.Millimeter, 4))
	add("least-RMS − paraxial", table.LengthSig(f.Plane-f.Paraxial, 4))
	return t
}
