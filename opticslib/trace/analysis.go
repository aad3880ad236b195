package trace

import (
	"github.com/beamnote/beamnote/opticslib/units"
)

// This file holds the result types of the analyses (spot diagrams, ray
// fans, longitudinal aberration, chromatic focal shift, third-order sums,
// wavefront error and Strehl ratio, the focus of a Gaussian beam). The
// analyses themselves are in the files named after them.

// PupilPoint is a point of the entrance pupil in normalised coordinates:
// (0, 0) is the centre, the unit circle the rim; Y is in the meridional
// (tangential, y–z) plane, X in the sagittal one.
type PupilPoint struct{ X, Y float64 }

// Source says how the system is lit: a collimated beam from an object at
// infinity, or a point source at a finite distance, filling a round
// entrance pupil, uniformly or with a Gaussian profile.
type Source struct {
	// Field is the angle of the incoming collimated beam to the axis, in
	// the meridional (y–z) plane, for an object at infinity.
	Field units.Angle
	// ObjectDistance is the distance in metres from the object point to
	// vertex 0 (the object lies at z = Vertex(0) − ObjectDistance, that
	// is −ObjectDistance for a system from [New]); zero means an object
	// at infinity.
	ObjectDistance units.Length
	// ObjectHeight is the object point's height in y, in metres, for a
	// finite object.
	ObjectHeight units.Length
	// PupilRadius is the radius in metres of the entrance pupil (for a
	// collimated beam, the radius of the beam that is traced).
	PupilRadius units.Length
	// PupilZ is the z of the entrance pupil plane in metres in the fixed
	// frame (zero: z = 0, the plane of vertex 0 for a system from [New]).
	// It may lie after vertex 0 (a virtual entrance pupil): the rays are
	// aimed at it.
	PupilZ units.Length
	// GaussianRadius is the 1/e² intensity radius in metres of a Gaussian
	// beam filling the pupil; zero means uniform illumination. It weights
	// the spot statistics and the pupil average of the Strehl ratio by
	// the pupil amplitude exp(−r²/w²).
	GaussianRadius units.Length
}

// Spot is a spot diagram: where the rays from one field point at one
// wavelength cross a plane near the image.
type Spot struct {
	// Wavelength is the vacuum wavelength.
	Wavelength units.Length
	// Field is the source's field angle (or the object height's angle).
	Field units.Angle
	// Plane is the z of the plane in metres, in the fixed frame.
	Plane units.Length
	// X, Y are each ray's crossing in metres relative to the centroid.
	X, Y []float64
	// Pupil is each plotted ray's pupil point.
	Pupil []PupilPoint
	// Weight is each ray's pupil intensity weight (all 1 for uniform
	// illumination).
	Weight []float64
	// CentroidX, CentroidY is the weighted centroid in metres on the
	// plane (absolute transverse coordinates).
	CentroidX, CentroidY units.Length
	// ChiefX, ChiefY is the chief ray's crossing in metres.
	ChiefX, ChiefY units.Length
	// RMS is the weighted root-mean-square radius about the centroid.
	RMS units.Length
	// Geometric is the largest distance of a ray from the centroid.
	Geometric units.Length
	// Airy is the radius of the first dark ring of the aberration-free
	// focus, 1.21967 λ/(2 NA′), from the image-space numerical aperture
	// of the traced marginal rays; for comparison with the spot.
	Airy units.Length
	// Lost counts the rays that did not reach the plane, by status.
	Lost [Invalid + 1]int
}

// Focus is a best-focus search: the plane of least RMS spot radius.
type Focus struct {
	// Plane is the z in metres of the plane of least RMS radius.
	Plane units.Length
	// RMS is the RMS radius there.
	RMS units.Length
	// Paraxial is the z in metres of the paraxial focus (the image of
	// the source by the paraxial trace), for comparison.
	Paraxial units.Length
	// Wavelength is the vacuum wavelength.
	Wavelength units.Length
	// Airy is the Airy radius (as in [Spot]) at the least-RMS plane.
	Airy units.Length
}

// Fan is a transverse ray-aberration curve: the crossing of rays from one
// line of the pupil relative to the chief ray, on an image plane.
type Fan struct {
	// Tangential is true for the meridional fan (pupil points (0, p),
	// errors in y) and false for the sagittal one ((p, 0), errors in x).
	Tangential bool
	// Wavelength is the vacuum wavelength.
	Wavelength units.Length
	// Plane is the z in metres of the image plane.
	Plane units.Length
	// Pupil is each ray's normalised pupil coordinate p in [−1, 1].
	Pupil []float64
	// Error is each ray's transverse error in metres (y or x crossing
	// minus the chief ray's); a ray that did not reach the plane is left
	// out of both slices.
	Error []float64
}

// LongitudinalAberration is the longitudinal spherical aberration of an
// axial beam: where each ray from the pupil's rim inwards crosses the
// axis, against the paraxial focus.
type LongitudinalAberration struct {
	// Wavelength is the vacuum wavelength.
	Wavelength units.Length
	// Height is each ray's height in the entrance pupil, metres.
	Height []float64
	// Shift is each ray's axis crossing minus the paraxial focus, metres
	// (negative: the ray crosses before the paraxial focus, the sign of
	// undercorrected spherical aberration of a positive singlet).
	Shift []float64
	// Paraxial is the z in metres of the paraxial focus.
	Paraxial units.Length
}

// FocalShift is the chromatic focal shift: the paraxial focus against
// wavelength, relative to the focus at a reference wavelength.
type FocalShift struct {
	// Reference is the vacuum wavelength whose focus is the zero.
	Reference units.Length
	// Wavelengths are the vacuum wavelengths, ascending.
	Wavelengths []units.Length
	// Shift is each wavelength's paraxial focus z minus the reference
	// one, metres.
	Shift []float64
	// PupilRadius is the radius in metres of the axial collimated beam
	// whose rim ray gives Marginal.
	PupilRadius units.Length
	// Marginal is each wavelength's axis crossing of the exact rim ray
	// (height PupilRadius) minus the reference paraxial focus, metres:
	// Shift plus the longitudinal spherical aberration at that
	// wavelength (spherochromatism); 0 where the rim ray was lost (see
	// MarginalLost).
	Marginal []float64
	// MarginalLost is true for each wavelength whose rim ray did not
	// reach the image plane.
	MarginalLost []bool
}

// SeidelTerms are the five third-order (Seidel) aberration sums of one
// surface or of a system, in metres, in the convention of W. T. Welford,
// Aberrations of Optical Systems (Adam Hilger, 1986), chapter 8: S_I
// spherical aberration, S_II coma, S_III astigmatism, S_IV Petzval field
// curvature, S_V distortion. The wavefront coefficients are W040 = S_I/8,
// W131 = S_II/2, W222 = S_III/2, W220 = (S_III + S_IV)/4, W311 = S_V/2.
type SeidelTerms struct {
	SI, SII, SIII, SIV, SV float64
}

// Seidel is the third-order analysis of a system from its paraxial
// marginal and chief rays.
type Seidel struct {
	// Wavelength is the vacuum wavelength of the indices used.
	Wavelength units.Length
	// Surfaces holds the sums of each surface, in order; a conic's term
	// is included in its S_I … S_V.
	Surfaces []SeidelTerms
	// Sum is the system's sums.
	Sum SeidelTerms
	// Lagrange is the Lagrange invariant H = ν(ū h − u h̄) of the paraxial
	// marginal (h, u) and chief (h̄, ū) rays, in metres (ν the signed
	// index, negative after an odd number of mirrors).
	Lagrange float64
	// Petzval is the Petzval sum Σ c Δ(1/ν) in 1/m, so that
	// S_IV = −H² · Petzval (the field curvature without the field).
	Petzval float64
	// ImageIndex is the signed index ν′ of image space and MarginalSlope
	// the paraxial marginal ray's slope u′ = dy/dz there, which turn the
	// sums into ray aberrations ([Seidel.LongitudinalSpherical]).
	ImageIndex, MarginalSlope float64
}

// Wavefront is the wavefront error of one field point at one wavelength:
// the optical path difference to a reference sphere centred on the image
// point, over the exit pupil.
type Wavefront struct {
	// Wavelength is the vacuum wavelength.
	Wavelength units.Length
	// Pupil is each sampled ray's entrance-pupil point.
	Pupil []PupilPoint
	// OPD is each ray's optical path difference in metres (positive: the
	// ray's path is longer than the chief ray's), with piston removed.
	OPD []float64
	// Weight is each ray's pupil intensity weight (all 1 for uniform).
	Weight []float64
	// RMS and PV are the weighted root-mean-square and the peak-to-valley
	// of the OPD, in metres.
	RMS, PV units.Length
	// Reference is the z in metres of the reference sphere's centre (the
	// image plane analysed).
	Reference units.Length
	// CentreX, CentreY are the reference sphere's centre in metres on the
	// plane: the chief ray's crossing.
	CentreX, CentreY units.Length
	// Radius is the reference sphere's radius in metres, signed along
	// the chief ray (negative: the sphere lies before its centre, a
	// converging wave), from the centre to the chief ray's point on the
	// exit pupil plane.
	Radius units.Length
	// ExitPupil is the z in metres of the paraxial exit pupil, and
	// ExitPupilFinite false when it lies at infinity (then the sphere
	// passes through the chief ray's point on the last vertex plane).
	ExitPupil       units.Length
	ExitPupilFinite bool
	// Lost counts the pupil rays that did not reach the reference
	// sphere, by status (a ray that reached the image plane but misses
	// the sphere counts as Missed).
	Lost [Invalid + 1]int
}

// Strehl holds the Strehl ratio of a wavefront by three forms.
type Strehl struct {
	// Pupil is |Σ a e^{i2πW/λ}|² / (Σ a)², the pupil average weighted by
	// the pupil amplitude a (uniform or Gaussian): the ratio of the peak
	// irradiance to that of the same pupil without aberration, in the
	// Fraunhofer approximation (V. N. Mahajan, Optical Imaging and
	// Aberrations, Part II, SPIE 2001 [from memory]).
	Pupil float64
	// Marechal is 1 − (2πσ/λ)², Maréchal's approximation (M. Born &
	// E. Wolf, Principles of Optics, §9.1), σ the RMS wavefront error.
	Marechal float64
	// Mahajan is exp(−(2πσ/λ)²), the extended form (V. N. Mahajan,
	// J. Opt. Soc. Am. 72, 1258 (1982)).
	Mahajan float64
}

// GaussianFocus is the focus of a Gaussian beam through the (aberrated)
// system: the irradiance near the focus from the field in the exit pupil
// (Gaussian amplitude, phase from the traced wavefront error), against
// the same beam through an aberration-free system.
type GaussianFocus struct {
	// Wavelength is the vacuum wavelength.
	Wavelength units.Length
	// Planes are the z values in metres where the focal field was
	// computed, and Peak the peak irradiance at each, relative to the
	// aberration-free peak at its best plane.
	Planes []units.Length
	Peak   []float64
	// Best is the z of the plane of highest peak irradiance, PeakRatio
	// that peak relative to the aberration-free one (a Strehl ratio of
	// the Gaussian beam), and Radius the second-moment (D4σ/2) radius
	// of the focus there, against IdealRadius without aberration.
	Best        units.Length
	PeakRatio   float64
	Radius      units.Length
	IdealRadius units.Length
	// Samples is the number of pupil samples across the diameter, and
	// Padded the size of the transform (Padded × Padded).
	Samples, Padded int
	// Dx is the sample spacing in metres of the focal field.
	Dx units.Length
	// GaussianRadius is the source's 1/e² pupil radius (0: uniform), and
	// Sine the paraxial image-space sine per unit of normalised pupil
	// radius (the marginal ray's |u′|), which set the ideal focus:
	// w_f = λ0·a/(π n′ Sine w), λ0 f/(π w) for a lens of focal length f
	// (Kogelnik & Li 1966).
	GaussianRadius units.Length
	Sine           float64
}
