package trace

import (
	"math"
	"slices"

	"github.com/beamnote/beamnote/opticslib/table"
	"github.com/beamnote/beamnote/opticslib/units"
)

// RayFans returns the tangential and sagittal ray fans of the source at the
// vacuum wavelength on the plane z = plane (metres, fixed frame;
// [System.ImagePlane] for the system's own): n rays on each pupil line,
// at p = −1 + 2j/(n−1), j = 0 … n−1, the tangential ones at pupil points
// (0, p) with their y crossing minus the chief ray's, the sagittal ones at
// (p, 0) with their x crossing minus the chief ray's. Rays that do not
// reach the image plane are left out. The illumination profile is not
// used.
//
// Errors: a [*ParamError] for n < 2, a non-finite plane, a bad source or
// wavelength; [ErrChief] when the chief ray is lost.
func (s System) RayFans(vacuum units.Length, src Source, n int, plane units.Length) (tan, sag Fan, err error) {
	if n < 2 {
		return Fan{}, Fan{}, &ParamError{Subject: "ray fan", Param: "rays n", Value: n, Reason: "must be at least 2"}
	}
	if !finite(float64(plane)) {
		return Fan{}, Fan{}, &ParamError{Param: "plane z", Value: plane, Reason: "must be finite"}
	}
	pupil := make([]PupilPoint, 2*n)
	for j := range n {
		p := gridCoord(j, n, 2/float64(n-1))
		pupil[j] = PupilPoint{Y: p}
		pupil[n+j] = PupilPoint{X: p}
	}
	t, err := s.traceSource(vacuum, src, pupil)
	if err != nil {
		return Fan{}, Fan{}, err
	}
	if err := t.chiefErr(); err != nil {
		return Fan{}, Fan{}, err
	}
	z := float64(plane)
	cx, cy := t.at(tracedChief, z)
	tan = Fan{Tangential: true, Wavelength: vacuum, Plane: plane}
	sag = Fan{Wavelength: vacuum, Plane: plane}
	for j := range 2 * n {
		i := tracedPupil + j
		if t.rays.Status[i] != OK {
			continue
		}
		x, y := t.at(i, z)
		if j < n {
			tan.Pupil = append(tan.Pupil, pupil[j].Y)
			tan.Error = append(tan.Error, y-cy)
		} else {
			sag.Pupil = append(sag.Pupil, pupil[j].X)
			sag.Error = append(sag.Error, x-cx)
		}
	}
	return tan, sag, nil
}

// Table returns the fan as a table of pupil coordinate and transverse
// error (µm).
func (f Fan) Table() table.Table {
	name, axis := "Sagittal ray fan", "x"
	if f.Tangential {
		name, axis = "Tangential ray fan", "y"
	}
	t := table.Table{Caption: name + " at z = " + table.In(f.Plane, units.Millimeter, 4) + " mm, λ0 = " + table.LengthSig(f.Wavelength, 6),
		Header: []string{"pupil p", "ε" + axis + " (µm)"}}
	for i, p := range f.Pupil {
		t.Rows = append(t.Rows, []string{table.Fixed(p, 4), table.Fixed(f.Error[i]/1e-6, 4)})
	}
	return t
}

// SphericalAberration returns the longitudinal spherical aberration of an
// axial collimated beam of radius pupilRadius (metres) at the vacuum
// wavelength: n rays parallel to the axis at heights h_j = pupilRadius·j/(n−1),
// j = 0 … n−1, each one's exact axis crossing minus the paraxial focus
// ([System.ParaxialFocus]); the axial ray (j = 0) has shift 0 by
// definition. Rays that do not reach the image plane, or leave parallel to
// the axis, are left out. A positive singlet gives negative shifts
// (undercorrected: the rim crosses first).
//
// Errors: a [*ParamError] for n < 2 or a pupil radius not positive;
// [ErrAfocal] when the system has no focus.
func (s System) SphericalAberration(vacuum, pupilRadius units.Length, n int) (LongitudinalAberration, error) {
	if n < 2 {
		return LongitudinalAberration{}, &ParamError{Subject: "spherical aberration", Param: "rays n", Value: n, Reason: "must be at least 2"}
	}
	src := Source{PupilRadius: pupilRadius}
	if err := src.Validate(); err != nil {
		return LongitudinalAberration{}, err
	}
	pupil := make([]PupilPoint, n-1)
	for j := range pupil {
		pupil[j] = PupilPoint{Y: float64(j+1) / float64(n-1)}
	}
	pupil[n-2].Y = 1 // exactly the rim
	t, err := s.traceSource(vacuum, src, pupil)
	if err != nil {
		return LongitudinalAberration{}, err
	}
	idx, _ := s.Indices(vacuum)
	zp, err := s.paraxialFocus(s.signedIndices(idx), src)
	if err != nil {
		return LongitudinalAberration{Wavelength: vacuum}, err
	}
	la := LongitudinalAberration{Wavelength: vacuum, Paraxial: zp, Height: []float64{0}, Shift: []float64{0}}
	for j, p := range pupil {
		i := tracedPupil + j
		if t.rays.Status[i] != OK || t.rays.M[i] == 0 {
			continue
		}
		zc := t.rays.Z[i] - t.rays.Y[i]*t.rays.N[i]/t.rays.M[i]
		if !finite(zc) {
			continue
		}
		la.Height = append(la.Height, p.Y*float64(pupilRadius))
		la.Shift = append(la.Shift, zc-float64(zp))
	}
	return la, nil
}

// Table returns the aberration as a table of height (mm) and shift (µm).
func (la LongitudinalAberration) Table() table.Table {
	t := table.Table{Caption: "Longitudinal spherical aberration, λ0 = " + table.LengthSig(la.Wavelength, 6) +
		", paraxial focus z = " + table.In(la.Paraxial, units.Millimeter, 4) + " mm",
		Header: []string{"height (mm)", "crossing − paraxial (µm)"}}
	for i, h := range la.Height {
		t.Rows = append(t.Rows, []string{table.Fixed(h/1e-3, 4), table.Fixed(la.Shift[i]/1e-6, 3)})
	}
	return t
}

// ChromaticFocalShift returns the paraxial focus of an axial collimated
// beam at each vacuum wavelength (sorted ascending, duplicates kept) minus
// the focus at the reference wavelength ref, from the paraxial trace with
// the media's indices at each wavelength ([System.ParaxialFocus]), and,
// besides, the exact crossing of the rim ray at height pupilRadius against
// the same reference (Marginal).
//
// Errors: a [*ParamError] for no wavelengths, a pupil radius not positive
// or a wavelength without indices (naming it); [ErrAfocal].
func (s System) ChromaticFocalShift(ref units.Length, wavelengths []units.Length, pupilRadius units.Length) (FocalShift, error) {
	if len(wavelengths) == 0 {
		return FocalShift{}, &ParamError{Subject: "chromatic focal shift", Param: "wavelengths", Reason: "none given"}
	}
	src := Source{PupilRadius: pupilRadius}
	z0, err := s.ParaxialFocus(ref, src)
	if err != nil {
		return FocalShift{}, err
	}
	fs := FocalShift{Reference: ref, Wavelengths: slices.Clone(wavelengths), PupilRadius: pupilRadius}
	slices.Sort(fs.Wavelengths)
	rim := []PupilPoint{{Y: 1}}
	for _, l := range fs.Wavelengths {
		z, err := s.ParaxialFocus(l, src)
		if err != nil {
			return FocalShift{}, err
		}
		fs.Shift = append(fs.Shift, float64(z-z0))
		t, err := s.traceSource(l, src, rim)
		if err != nil {
			return FocalShift{}, err
		}
		i := tracedPupil
		zc := math.NaN()
		if t.rays.Status[i] == OK && t.rays.M[i] != 0 {
			zc = t.rays.Z[i] - t.rays.Y[i]*t.rays.N[i]/t.rays.M[i]
		}
		if finite(zc) {
			fs.Marginal = append(fs.Marginal, zc-float64(z0))
			fs.MarginalLost = append(fs.MarginalLost, false)
		} else {
			fs.Marginal = append(fs.Marginal, 0)
			fs.MarginalLost = append(fs.MarginalLost, true)
		}
	}
	return fs, nil
}

// Table returns the focal shift as a table of wavelength (nm), paraxial
// shift and rim-ray crossing (µm).
func (fs FocalShift) Table() table.Table {
	t := table.Table{Caption: "Chromatic focal shift against λ0 = " + table.LengthSig(fs.Reference, 6),
		Header: []string{"λ0 (nm)", "paraxial focus shift (µm)", "rim ray crossing (µm)"}}
	for i, l := range fs.Wavelengths {
		m := ""
		if i < len(fs.Marginal) && !fs.MarginalLost[i] {
			m = table.Fixed(fs.Marginal[i]/1e-6, 3)
		}
		t.Rows = append(t.Rows, []string{table.Fixed(float64(l/units.Nanometer), 2), table.Fixed(fs.Shift[i]/1e-6, 3), m})
	}
	return t
}
