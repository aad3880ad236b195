package polar

import (
	"math"
	"math/cmplx"

	"github.com/beamnote/beamnote/opticslib/table"
	"github.com/beamnote/beamnote/opticslib/units"
)

// Fresnel holds the Fresnel coefficients of a plane wave at a flat
// interface between two lossless dielectrics, as [Interface] computes
// them.
//
// # Conventions
//
// s is the component normal to the plane of incidence, p the one in it.
// The amplitude coefficients follow the field directions of M. Born &
// E. Wolf (Principles of Optics, §1.5.2 [from memory]) and E. Collett
// (Field Guide to Polarization, SPIE 2005 [from memory]), with
// θt the angle of refraction (n1 sin θi = n2 sin θt):
//
//	r_s = (n1 cos θi − n2 cos θt)/(n1 cos θi + n2 cos θt)
//	t_s = 2 n1 cos θi/(n1 cos θi + n2 cos θt)
//	r_p = (n2 cos θi − n1 cos θt)/(n2 cos θi + n1 cos θt)
//	t_p = 2 n1 cos θi/(n2 cos θi + n1 cos θt)
//
// so that at normal incidence r_p = −r_s = (n2 − n1)/(n2 + n1). In
// these directions the Jones frames of the incident, reflected and
// transmitted beams are all right-handed with x = p and y = s
// ([Fresnel.Reflection], [Fresnel.Transmission]); at normal incidence the
// reflected frame's x is the incident −x (the return frame of
// [JonesMatrix.Reverse]).
//
// Powers: the reflectance is R = |r|², the transmittance
//
//	T = (n2 cos θt)/(n1 cos θi) |t|²
//
// where n2/n1 converts the field into an irradiance and cos θt/cos θi the
// beam cross-sections, so that R + T = 1 for s and for p.
//
// # Total internal reflection
//
// Beyond the critical angle (n1 sin θi > n2) sin θt = n1 sin θi/n2 > 1
// and cos θt is imaginary. With the package's time convention e^{iωt} the
// transmitted field e^{−i k2 (x sin θt + z cos θt)} decays into the second
// medium when
//
//	cos θt = −i √(sin²θt − 1)
//
// Then |r_s| = |r_p| = 1, T = 0, and the reflected components are advanced
// by the phases φs = arg r_s, φp = arg r_p, with n = n2/n1:
//
//	tan(φs/2) = √(sin²θi − n²)/cos θi
//	tan(φp/2) = √(sin²θi − n²)/(n² cos θi)
//	tan((φp − φs)/2) = cos θi √(sin²θi − n²)/sin²θi
//
// (Born & Wolf, §1.5.4 [from memory]; with the opposite time convention
// e^{−iωt} every phase changes sign). The transmitted coefficients then
// describe the evanescent field, which carries no power.
type Fresnel struct {
	// N1 and N2 are the refractive indices before and after the interface.
	N1, N2 float64
	// Incidence is the angle of incidence θi in [0°, 90°).
	Incidence units.Angle
	// RS, RP, TS and TP are the amplitude coefficients r_s, r_p, t_s, t_p
	// (dimensionless, complex under total internal reflection).
	RS, RP, TS, TP complex128
	// TIR is true beyond the critical angle (n1 sin θi > n2; the critical
	// angle itself, where θt = 90° and T = 0, counts as refraction).
	TIR bool
	// cosT is cos θt, imaginary under TIR.
	cosT complex128
}

// Interface returns the Fresnel coefficients for light in the medium of
// index n1 meeting a flat interface with the medium of index n2 at the
// angle of incidence θi (from the normal, 0 ≤ θi < 90°); see [Fresnel] for
// the formulas, the sign conventions and total internal reflection. The
// media are lossless dielectrics: indices are real.
//
// It returns a [*ParamError] for an index that is not positive and finite,
// an angle outside [0°, 90°) (grazing incidence, where every interface
// reflects all the light, is left out), or indices so far apart that the
// coefficients overflow float64.
func Interface(n1, n2 float64, incidence units.Angle) (Fresnel, error) {
	if err := checkIndex("Interface", "index n1", n1); err != nil {
		return Fresnel{}, err
	}
	if err := checkIndex("Interface", "index n2", n2); err != nil {
		return Fresnel{}, err
	}
	if th := float64(incidence); !finite(th) || th < 0 || th >= math.Pi/2 {
		return Fresnel{}, &ParamError{Element: "Interface", Param: "angle of incidence θi", Value: incidence, Reason: "must be in [0°, 90°)"}
	}
	sinI, cosI := math.Sincos(float64(incidence))
	sinT := n1 * sinI / n2
	f := Fresnel{N1: n1, N2: n2, Incidence: incidence}
	if sinT <= 1 {
		f.cosT = complex(math.Sqrt((1-sinT)*(1+sinT)), 0)
	} else {
		f.TIR = true
		f.cosT = complex(0, -math.Sqrt((sinT-1)*(sinT+1)))
	}
	a := complex(n1*cosI, 0)     // n1 cos θi
	b := complex(n2, 0) * f.cosT // n2 cos θt
	c := complex(n2*cosI, 0)     // n2 cos θi
	d := complex(n1, 0) * f.cosT // n1 cos θt
	f.RS = (a - b) / (a + b)
	f.TS = 2 * a / (a + b)
	f.RP = (c - d) / (c + d)
	f.TP = 2 * a / (c + d)
	ts, tp := f.powerAmplitudes()
	for _, z := range [6]complex128{f.RS, f.RP, f.TS, f.TP, ts, tp} {
		if !finiteC(z) {
			return Fresnel{}, &ParamError{Element: "Interface", Param: "index ratio n2/n1", Value: n2 / n1,
				Reason: "the coefficients at θi = " + formatG(incidence.Degrees()) + "° are not representable in float64"}
		}
	}
	return f, nil
}

// Refraction returns the angle of refraction θt = asin(n1 sin θi/n2) and
// true, or 0 and false under total internal reflection, where no
// refracted beam exists.
func (f Fresnel) Refraction() (units.Angle, bool) {
	if f.TIR {
		return 0, false
	}
	return units.Angle(math.Asin(math.Min(1, f.N1*math.Sin(float64(f.Incidence))/f.N2))), true
}

// Reflectance returns the power reflectances Rs = |r_s|² and Rp = |r_p|²
// (dimensionless, in [0, 1]).
func (f Fresnel) Reflectance() (s, p float64) {
	return sq(f.RS), sq(f.RP)
}

// Transmittance returns the power transmittances
//
//	Ts = (n2 cos θt)/(n1 cos θi) |t_s|²,   Tp = (n2 cos θt)/(n1 cos θi) |t_p|²
//
// (dimensionless, in [0, 1]; 0 under total internal reflection), so that
// Rs + Ts = Rp + Tp = 1 up to rounding (energy conservation at a lossless
// interface; Born & Wolf, §1.5.3 [from memory]). They are
// evaluated as 4 n1 cos θi n2 cos θt/|n1 cos θi + n2 cos θt|² (s) and
// 4 n1 cos θi n2 cos θt/|n2 cos θi + n1 cos θt|² (p), the same values
// without the ratio that overflows at grazing incidence.
func (f Fresnel) Transmittance() (s, p float64) {
	ts, tp := f.powerAmplitudes()
	return sq(ts), sq(tp)
}

// powerAmplitudes returns the power-normalised transmission amplitudes
// √((n2 cos θt)/(n1 cos θi))·t for s and p, evaluated as
// 2 √(n1 cos θi) √(Re n2 cos θt)/(denominator of t); 0 under TIR.
func (f Fresnel) powerAmplitudes() (s, p complex128) {
	cosI := math.Cos(float64(f.Incidence))
	a := f.N1 * cosI
	b := complex(f.N2, 0) * f.cosT
	c := complex(f.N2*cosI, 0)
	d := complex(f.N1, 0) * f.cosT
	k := complex(2*math.Sqrt(a)*math.Sqrt(real(b)), 0)
	return k / (complex(a, 0) + b), k / (c + d)
}

// ReflectionPhase returns the phases φs = arg r_s and φp = arg r_p of the
// reflected components, in (−180°, 180°]. Below the critical angle they
// are 0 or 180° (the signs of the real coefficients); under total internal
// reflection they follow the closed forms of [Fresnel].
func (f Fresnel) ReflectionPhase() (s, p units.Angle) {
	return units.Angle(cmplx.Phase(f.RS)), units.Angle(cmplx.Phase(f.RP))
}

// Reflection returns the Jones matrix of the reflection, from the incident
// beam frame (x = p, y = s) into the reflected beam's right-handed frame
// (x = p, y = s; see [Fresnel]):
//
//	J_r = diag(r_p, r_s)
//
// Both beams are in the first medium, so the matrix is power-normalised
// as it stands: |J_r v|² is the reflected power. A plane of incidence at
// an angle φ to the beam's x axis is handled by turning the input first:
// J_r·R(φ) with R of [JonesMatrix.Rotated].
func (f Fresnel) Reflection() JonesMatrix {
	return JonesMatrix{XX: f.RP, YY: f.RS}
}

// Transmission returns the power-normalised Jones matrix of the
// transmission, from the incident beam frame into the transmitted one
// (x = p, y = s):
//
//	J_t = √((n2 cos θt)/(n1 cos θi)) · diag(t_p, t_s)
//
// so that |J_t v|² is the transmitted power in the unit of v (the field
// amplitudes themselves are t_p, t_s). Under total internal reflection it
// is the zero matrix: the evanescent field carries no power.
func (f Fresnel) Transmission() JonesMatrix {
	ts, tp := f.powerAmplitudes()
	return JonesMatrix{XX: tp, YY: ts}
}

// Table returns the coefficients as a table: for s and p, |r|, the phase
// of r, R, |t| and T, with the indices and the angle in the caption.
func (f Fresnel) Table() table.Table {
	t := table.Table{
		Caption: "Fresnel coefficients, n1 = " + table.Sig(f.N1, 6) + " → n2 = " + table.Sig(f.N2, 6) + " at θi = " + table.Fixed(f.Incidence.Degrees(), 3) + "°",
		Header:  []string{"component", "|r|", "arg r (°)", "R", "|t|", "T"},
	}
	if f.TIR {
		t.Caption += " (total internal reflection)"
	}
	rs, rp := f.Reflectance()
	ts, tp := f.Transmittance()
	ps, pp := f.ReflectionPhase()
	t.Rows = [][]string{
		{"s", table.Fixed(cmplx.Abs(f.RS), 6), table.Fixed(ps.Degrees(), 3), table.Fixed(rs, 6), table.Fixed(cmplx.Abs(f.TS), 6), table.Fixed(ts, 6)},
		{"p", table.Fixed(cmplx.Abs(f.RP), 6), table.Fixed(pp.Degrees(), 3), table.Fixed(rp, 6), table.Fixed(cmplx.Abs(f.TP), 6), table.Fixed(tp, 6)},
	}
	return t
}

// Brewster returns Brewster's angle for light in the medium n1 meeting the
// medium n2, the angle of incidence at which r_p = 0 and the reflected
// light is purely s-polarized:
//
//	tan θB = n2/n1
//
// (Born & Wolf, §1.5.3 [from memory]; 56.3099° from air into n = 1.5).
// It returns a [*ParamError] for an index that is not positive and finite.
func Brewster(n1, n2 float64) (units.Angle, error) {
	if err := checkIndex("Brewster", "index n1", n1); err != nil {
		return 0, err
	}
	if err := checkIndex("Brewster", "index n2", n2); err != nil {
		return 0, err
	}
	return units.Angle(math.Atan2(n2, n1)), nil
}

// CriticalAngle returns the critical angle of total internal reflection
// for light in the medium n1 meeting the medium n2 < n1:
//
//	sin θc = n2/n1
//
// (Snell's law with θt = 90°; 41.8103° from n = 1.5 into air). It returns
// a [*ParamError] for an index that is not positive and finite, or for
// n2 ≥ n1, where no total internal reflection occurs.
func CriticalAngle(n1, n2 float64) (units.Angle, error) {
	if err := checkIndex("CriticalAngle", "index n1", n1); err != nil {
		return 0, err
	}
	if err := checkIndex("CriticalAngle", "index n2", n2); err != nil {
		return 0, err
	}
	if n2 >= n1 {
		return 0, &ParamError{Element: "CriticalAngle", Param: "index n2", Value: n2, Reason: "must be below n1 = " + table.Sig(n1, 6) + " for total internal reflection"}
	}
	return units.Angle(math.Asin(n2 / n1)), nil
}

func sq(z complex128) float64 {
	return float64(real(z)*real(z)) + float64(imag(z)*imag(z))
}
