package couple

import (
	"math"

	"github.com/beamnote/beamnote/opticslib/beam"
	"github.com/beamnote/beamnote/opticslib/units"
)

// LP11Cutoff is the V-number above which a step-index fibre guides the
// LP₁₁ mode as well as LP₀₁: the first zero of the Bessel function J₀,
// 2.404825557695773 (D. Gloge, "Weakly guiding fibers", Appl. Opt. 10,
// 2252–2258 (1971) [from memory]; the zero from Abramowitz & Stegun,
// table 9.5).
const LP11Cutoff = 2.404825557695773

// MarcuseMinV is the smallest V-number [FibreFromCore] accepts: Marcuse
// gives his fit as accurate to about 1 % for 1.2 ≤ V ≤ 2.4 (Marcuse 1977
// [from memory]); measured against the exact LP₀₁ mode it is within
// 0.81 % up to the cut-off (see [MarcuseRatio]).
const MarcuseMinV = 1.2

// MarcuseRatio returns Marcuse's fit of the mode-field radius w of the
// LP₀₁ mode of a step-index fibre to its core radius a, as a function of
// the V-number:
//
//	w/a = 0.65 + 1.619 V^(−3/2) + 2.879 V^(−6)
//
// (D. Marcuse, "Loss analysis of single-mode fiber splices", Bell Syst.
// Tech. J. 56, 703–718 (1977) [from memory]). At V = 2.405 it is 1.0990.
//
// Against the radius of the Gaussian that overlaps the exact LP₀₁ mode
// best (from the eigenvalue equation u J1(u)/J0(u) = w K1(w)/K0(w), u² +
// w² = V², of D. Gloge, "Weakly guiding fibers", Appl. Opt. 10,
// 2252–2258 (1971) [from memory], with SciPy; the package's cross-check
// couple_lp01.py) the fit is within 0.81 % over 1.2 ≤ V ≤ 2.405: largest
// +0.80 % at V ≈ 2.27, −0.22 % at V ≈ 1.38. That best Gaussian itself
// collects 0.944 of the mode's power at V = 1.2, 0.992 at V = 2 and 0.997
// at the cut-off, so at low V the Gaussian model of the mode, not the
// fit, limits the accuracy of a coupling estimate.
//
// It is pure arithmetic: NaN for V ≤ 0 or NaN; [FibreFromCore] checks the
// range of the fit.
func MarcuseRatio(v float64) float64 {
	if !(v > 0) {
		return math.NaN()
	}
	return 0.65 + 1.619/math.Pow(v, 1.5) + 2.879/math.Pow(v, 6)
}

// Fibre is a single-mode fibre at its working wavelength, described by
// the radius of its fundamental mode. The mode at the end face is taken
// as a Gaussian waist of radius ModeRadius with a flat wavefront.
type Fibre struct {
	// ModeRadius is the 1/e² intensity radius w of the mode, half the
	// mode-field diameter, in metres.
	ModeRadius units.Length
	// Wavelength is the vacuum wavelength λ0 in metres at which the mode
	// radius holds.
	Wavelength units.Length
	// CoreRadius (metres), NA (the core's numerical aperture √(n₁² −
	// n₂²)) and V (the V-number 2πa·NA/λ0) are set by [FibreFromCore]
	// and zero for a fibre given by its mode-field diameter.
	CoreRadius units.Length
	NA, V      float64
}

// FibreFromMFD returns the fibre with mode-field diameter mfd (metres,
// the data sheet's MFD at the working wavelength, w = MFD/2) at vacuum
// wavelength λ0 (metres). It returns a *ParamError unless both are
// positive and finite (a NaN MFD included), and one wrapping
// [beam.ErrNotParaxial] if the mode's divergence λ0/(πw) exceeds
// [beam.MaxDivergence]. It cannot tell whether the fibre is single-mode
// at λ0 (a data sheet's MFD implies it); [FibreFromCore] can.
func FibreFromMFD(mfd, wavelength units.Length) (Fibre, error) {
	if !(mfd > 0) || bad(float64(mfd)) {
		return Fibre{}, &ParamError{Subject: "fibre", Param: "mode-field diameter MFD", Value: mfd, Reason: "must be positive and finite"}
	}
	if !(wavelength > 0) || bad(float64(wavelength)) {
		return Fibre{}, &ParamError{Subject: "fibre", Param: "vacuum wavelength λ0", Value: wavelength, Reason: "must be positive and finite"}
	}
	f := Fibre{ModeRadius: mfd / 2, Wavelength: wavelength}
	if _, err := f.Mode(1); err != nil {
		return Fibre{}, err
	}
	return f, nil
}

// FibreFromCore returns the step-index fibre with core diameter
// coreDiameter (metres) and core numerical aperture na at vacuum
// wavelength λ0 (metres), with the mode radius from Marcuse's fit
// ([MarcuseRatio]):
//
//	V = 2πa·NA/λ0,  w = a·(0.65 + 1.619 V^(−3/2) + 2.879 V^(−6)),  a = coreDiameter/2
//
// The NA is the core's (√(n₁² − n₂²), what a data sheet lists); it enters
// only through V. It is not the divergence of the mode, which is
// λ0/(πw) and smaller. It returns a *ParamError for a non-positive or
// non-finite diameter, NA (also NA ≥ 1) or wavelength, one wrapping
// [ErrNotSingleMode] for V > [LP11Cutoff] (the fibre is multimode at λ0;
// the message gives the cut-off wavelength 2πa·NA/2.405 above which it is
// single-mode) and one wrapping [ErrOutsideFit] for V < [MarcuseMinV]
// (with the longest wavelength of the fit, 2πa·NA/1.2).
//
// The accuracy of the fit and of the Gaussian model of the mode are given
// at [MarcuseRatio].
func FibreFromCore(coreDiameter units.Length, na float64, wavelength units.Length) (Fibre, error) {
	switch {
	case !(coreDiameter > 0) || bad(float64(coreDiameter)):
		return Fibre{}, &ParamError{Subject: "fibre", Param: "core diameter", Value: coreDiameter, Reason: "must be positive and finite"}
	case !(na > 0 && na < 1):
		return Fibre{}, &ParamError{Subject: "fibre", Param: "core numerical aperture NA", Value: na, Reason: "must lie between 0 and 1"}
	case !(wavelength > 0) || bad(float64(wavelength)):
		return Fibre{}, &ParamError{Subject: "fibre", Param: "vacuum wavelength λ0", Value: wavelength, Reason: "must be positive and finite"}
	}
	a := coreDiameter / 2
	v := 2 * math.Pi * float64(a) * na / float64(wavelength)
	// The wavelength at which V reaches vc: λ = 2πa·NA/vc.
	at := func(vc float64) string { return units.Length(2 * math.Pi * float64(a) * na / vc).String() }
	switch {
	case v > LP11Cutoff:
		return Fibre{}, &ParamError{Subject: "fibre", Param: "V-number 2πa·NA/λ0", Value: v,
			Reason: "core " + coreDiameter.String() + ", NA " + formatG(na) + " at λ0 = " + wavelength.String() +
				"; single-mode only above the cut-off wavelength 2πa·NA/2.405 = " + at(LP11Cutoff), Err: ErrNotSingleMode}
	case v < MarcuseMinV:
		return Fibre{}, &ParamError{Subject: "fibre", Param: "V-number 2πa·NA/λ0", Value: v,
			Reason: "core " + coreDiameter.String() + ", NA " + formatG(na) + " at λ0 = " + wavelength.String() +
				"; the fit holds up to λ0 = 2πa·NA/1.2 = " + at(MarcuseMinV), Err: ErrOutsideFit}
	}
	return Fibre{ModeRadius: a * units.Length(MarcuseRatio(v)), Wavelength: wavelength, CoreRadius: a, NA: na, V: v}, nil
}

// MFD returns the mode-field diameter 2w in metres.
func (f Fibre) MFD() units.Length { return 2 * f.ModeRadius }

// Mode returns the fibre's mode at the end face as a beam in a medium of
// refractive index n in front of the face (0 means 1): a waist of radius
// ModeRadius at the face (WaistZ = 0). It returns the errors of
// [beam.FromWaist] wrapped in a *ParamError.
func (f Fibre) Mode(n float64) (beam.Gaussian, error) {
	g, err := beam.FromWaist(beam.WaistSpec{Wavelength: f.Wavelength, WaistRadius: f.ModeRadius, Index: n})
	if err != nil {
		return beam.Gaussian{}, &ParamError{Subject: "fibre mode", Err: err}
	}
	return g, nil
}

// FibreCoupling is the coupling of a beam into a fibre at its end face.
type FibreCoupling struct {
	Fibre Fibre
	Coupling
}

// Couple returns the coupling efficiency of the beam in, given at the
// fibre's end face, into the fibre's mode, with the beam's axis offset
// and tilted by m relative to the fibre's (see [Overlap]; tilts are in the
// medium in front of the face, of the beam's index). The mode's medium is
// the beam's. Fresnel reflection at the face is not included. Alignment
// tolerances follow from [Coupling.OffsetTolerance] and
// [Coupling.TiltTolerance]. It returns the errors of [Overlap], and one
// wrapping [ErrMismatch] when the beam's wavelength is not the fibre's.
func (f Fibre) Couple(in beam.Input, m Misalignment) (FibreCoupling, error) {
	ast, err := asAstigmatic(in, "beam")
	if err != nil {
		return FibreCoupling{}, err
	}
	mode, err := f.Mode(ast.X.Index)
	if err != nil {
		return FibreCoupling{}, err
	}
	c, err := Overlap(mode, ast, m)
	if err != nil {
		return FibreCoupling{}, err
	}
	return FibreCoupling{Fibre: f, Coupling: c}, nil
}
