package polar

import (
	"math"
	"strconv"

	"github.com/beamnote/beamnote/opticslib/units"
)

// Polarizer returns the Jones matrix of an ideal linear polarizer whose
// transmission axis lies at the angle θ from x (towards y):
//
//	P(θ) = ⎡cos²θ        cos θ sin θ⎤
//	       ⎣cos θ sin θ  sin²θ      ⎦
//
// Light along the axis passes unchanged, light across it is blocked, so
// linear light at ψ keeps the fraction cos²(ψ − θ) of its power (Malus's
// law; D. H. Goldstein, Polarized Light, 3rd ed., 2011 [from memory]). It returns a
// [*ParamError] for a non-finite angle.
func Polarizer(axis units.Angle) (JonesMatrix, error) {
	if err := checkAngle("Polarizer", "transmission axis θ", axis); err != nil {
		return JonesMatrix{}, err
	}
	return diagonalAt(1, 0, axis), nil
}

// PartialPolarizer returns the Jones matrix of a linear polarizer with its
// transmission axis at θ from x and the power extinction ratio
// ER = Tmax/Tmin ≥ 1 (1000 for a part sold as 1000:1): light along the
// axis passes unchanged, light across it keeps the fraction 1/ER of its
// power. With the amplitude leak e = 1/√ER,
//
//	J(θ) = R(−θ) diag(1, e) R(θ) = ⎡cos²θ + e sin²θ    (1 − e) cos θ sin θ⎤
//	                               ⎣(1 − e) cos θ sin θ  sin²θ + e cos²θ  ⎦
//
// (the diattenuator of E. Collett, Field Guide to Polarization, SPIE 2005
// [from memory], with principal amplitude transmissions 1 and e; the
// insertion loss of a real part is left out). ER = +Inf gives the ideal
// [Polarizer], ER = 1 the identity. It returns a [*ParamError] for a
// non-finite angle or ER < 1 or NaN.
func PartialPolarizer(axis units.Angle, extinction float64) (JonesMatrix, error) {
	if err := checkAngle("PartialPolarizer", "transmission axis θ", axis); err != nil {
		return JonesMatrix{}, err
	}
	if err := checkExtinction("PartialPolarizer", "extinction ratio Tmax/Tmin", extinction); err != nil {
		return JonesMatrix{}, err
	}
	return diagonalAt(1, complex(1/math.Sqrt(extinction), 0), axis), nil
}

// diagonalAt returns R(−θ) diag(a, b) R(θ) in closed form.
func diagonalAt(a, b complex128, theta units.Angle) JonesMatrix {
	s, c := math.Sincos(float64(theta))
	cc, ss, cs := complex(c*c, 0), complex(s*s, 0), complex(c*s, 0)
	return JonesMatrix{XX: a*cc + b*ss, XY: (a - b) * cs, YX: (a - b) * cs, YY: a*ss + b*cc}
}

// Retarder returns the Jones matrix of a linear retarder (waveplate) with
// retardance Γ and its fast axis at θ from x. In the frame of the plate
// the fast component is advanced and the slow one delayed by Γ/2 each
// (the symmetric phase convention, det J = 1), and with the package's time
// convention e^{iωt}:
//
//	J(θ, Γ) = R(−θ) diag(e^{iΓ/2}, e^{−iΓ/2}) R(θ)
//	        = ⎡cos(Γ/2) + i sin(Γ/2) cos 2θ   i sin(Γ/2) sin 2θ            ⎤
//	          ⎣i sin(Γ/2) sin 2θ              cos(Γ/2) − i sin(Γ/2) cos 2θ ⎦
//
// (E. Collett, Field Guide to Polarization, SPIE 2005, the linear retarder
// [from memory]). Γ = π is a half-wave plate ([HalfWave]), Γ = π/2 a
// quarter-wave plate ([QuarterWave]); Γ is the retardance 2π(n_slow −
// n_fast)d/λ0 at the working wavelength, any finite value (a negative Γ
// swaps the fast and slow axes). It returns a [*ParamError] for
// non-finite angles.
func Retarder(fastAxis, retardance units.Angle) (JonesMatrix, error) {
	if err := checkAngle("Retarder", "fast axis θ", fastAxis); err != nil {
		return JonesMatrix{}, err
	}
	if err := checkAngle("Retarder", "retardance Γ", retardance); err != nil {
		return JonesMatrix{}, err
	}
	return retarder(float64(fastAxis), float64(retardance)), nil
}

// retarder returns J(θ, Γ) of [Retarder] without checks, θ and Γ in rad.
// θ is first reduced modulo π (exactly, by math.Mod), so that 2θ cannot
// overflow for a huge finite θ.
func retarder(theta, gamma float64) JonesMatrix {
	theta = math.Mod(theta, math.Pi)
	s, c := math.Sincos(gamma / 2)
	s2, c2 := math.Sincos(2 * theta)
	off := complex(0, s*s2)
	return JonesMatrix{XX: complex(c, s*c2), XY: off, YX: off, YY: complex(c, -s*c2)}
}

// HalfWave returns the Jones matrix of a half-wave plate (Γ = π) with its
// fast axis at θ from x:
//
//	J = i ⎡cos 2θ   sin 2θ⎤
//	      ⎣sin 2θ  −cos 2θ⎦
//
// It mirrors the polarization ellipse about the fast axis: linear light at
// ψ leaves at 2θ − ψ, so light along x is turned by 2θ, and the
// handedness is reversed (D. H. Goldstein, Polarized Light, 3rd ed., 2011 [from
// memory]). It returns a [*ParamError] for a non-finite angle.
func HalfWave(fastAxis units.Angle) (JonesMatrix, error) {
	if err := checkAngle("HalfWave", "fast axis θ", fastAxis); err != nil {
		return JonesMatrix{}, err
	}
	return retarder(float64(fastAxis), math.Pi), nil
}

// QuarterWave returns the Jones matrix of a quarter-wave plate (Γ = π/2)
// with its fast axis at θ from x. Linear light at 45° to the fast axis
// leaves circular: at θ = ψ + 45° right-handed, at θ = ψ − 45° left-handed
// (with the conventions of [Handedness]; light along x through a plate at
// +45° becomes (1, i)/√2). It returns a [*ParamError] for a non-finite
// angle.
func QuarterWave(fastAxis units.Angle) (JonesMatrix, error) {
	if err := checkAngle("QuarterWave", "fast axis θ", fastAxis); err != nil {
		return JonesMatrix{}, err
	}
	return retarder(float64(fastAxis), math.Pi/2), nil
}

// Rotator returns the Jones matrix of a reciprocal polarization rotator
// (optical activity, as of a quartz plate cut across its axis or a sugar
// solution) that turns every polarization ellipse by ρ from x towards y,
// that is anticlockwise as seen facing the source:
//
//	R(ρ) = ⎡cos ρ  −sin ρ⎤
//	       ⎣sin ρ   cos ρ⎦
//
// A dextrorotatory medium turns clockwise as seen facing the source
// (D. H. Goldstein, Polarized Light, 3rd ed., 2011 [from memory]), which is ρ < 0
// here. Optical activity is reciprocal: on the way back, in the return
// frame of [JonesMatrix.Reverse], the matrix is again R(ρ), so a double
// pass through the rotator and a mirror undoes the rotation. It returns a
// [*ParamError] for a non-finite angle.
func Rotator(rotation units.Angle) (JonesMatrix, error) {
	if err := checkAngle("Rotator", "rotation ρ", rotation); err != nil {
		return JonesMatrix{}, err
	}
	return rotation2(float64(rotation)), nil
}

func rotation2(rho float64) JonesMatrix {
	s, c := math.Sincos(rho)
	return JonesMatrix{XX: complex(c, 0), XY: complex(-s, 0), YX: complex(s, 0), YY: complex(c, 0)}
}

// Direction is the direction in which light crosses a non-reciprocal
// element.
type Direction int

// The two directions.
const (
	// Forward: along the beam frame's +z, the frame of the element's
	// definition.
	Forward Direction = iota + 1
	// Backward: returning along −z, in the return frame of
	// [JonesMatrix.Reverse] (x reversed, y kept).
	Backward
)

// String returns "forward" or "backward", or "Direction(n)".
func (d Direction) String() string {
	switch d {
	case Forward:
		return "forward"
	case Backward:
		return "backward"
	}
	return "Direction(" + strconv.Itoa(int(d)) + ")"
}

// FaradayRotator returns the Jones matrix of a Faraday rotator that turns
// the polarization of forward light by ρ from x towards y (ρ = V·B·L for
// a Verdet constant V, a field B along the beam and a length L), crossed
// in the direction dir.
//
// The Faraday effect is not reciprocal: the sense of rotation is fixed by
// the magnetic field, not by the direction of the light, so a beam that
// comes back is turned by ρ in the same sense in the laboratory. In the
// return frame (x reversed) that is a rotation by −ρ:
//
//	Forward:  R(ρ)
//	Backward: R(−ρ)   (not FaradayRotator(ρ, Forward).Reverse(), which is R(ρ))
//
// with R of [Rotator]. A double pass through the rotator and a mirror at
// normal incidence is modelled in beam order as
//
//	f, _ := FaradayRotator(ρ, Forward)
//	b, _ := FaradayRotator(ρ, Backward)
//	roundTrip := f.Then(Mirror()).Then(b)   // = R(−2ρ)·Mirror(): turned by 2ρ
//
// so the rotations add instead of cancelling; with ρ = 45° the light comes
// back crossed with the light that went in, whatever reciprocal
// birefringence lies before the rotator (the Faraday mirror of
// M. Martinelli, "A universal compensator for polarization changes induced
// by birefringence on a retracing beam", Opt. Commun. 72, 341–344 (1989)
// [from memory]). It returns a [*ParamError] for a non-finite angle or
// another Direction value.
func FaradayRotator(rotation units.Angle, dir Direction) (JonesMatrix, error) {
	if err := checkAngle("FaradayRotator", "rotation ρ", rotation); err != nil {
		return JonesMatrix{}, err
	}
	switch dir {
	case Forward:
		return rotation2(float64(rotation)), nil
	case Backward:
		return rotation2(-float64(rotation)), nil
	}
	return JonesMatrix{}, &ParamError{Element: "FaradayRotator", Param: "direction", Value: int(dir), Reason: "must be Forward or Backward"}
}

// Mirror returns the Jones matrix of an ideal metal mirror at normal
// incidence, from the beam frame into the return frame of
// [JonesMatrix.Reverse] (x reversed, y kept, z reversed):
//
//	M = diag(1, −1)
//
// It is the Fresnel reflection diag(r_p, r_s) of [Fresnel.Reflection] in
// the limit of a perfect conductor (r_p → 1, r_s → −1): in the laboratory
// the reflected field is −E, and a right-handed beam returns left-handed
// (the handedness reverses with the direction of travel).
func Mirror() JonesMatrix { return JonesMatrix{XX: 1, YY: -1} }

// Ports holds the two output ports of a polarizing beam splitter: the
// Jones matrix into the transmitted beam (in the input frame) and into the
// reflected beam (in the reflected beam's right-handed frame, x = p
// reversed as for [Fresnel.Reflection], y = s).
type Ports struct {
	Transmitted, Reflected JonesMatrix
}

// PolarizingBeamSplitter returns the ports of a polarizing beam splitter
// that transmits p (x, the plane of reflection holding the beam axis and
// x) and reflects s (y):
//
//	Transmitted = diag(1, 1/√ERt),   Reflected = diag(1/√ERr, 1)
//
// where ERt = Tp/Ts ≥ 1 is the power extinction ratio of the transmitted
// port and ERr = Rs/Rp ≥ 1 that of the reflected port (+Inf for an ideal
// splitter; data sheets quote, for example, Tp:Ts > 1000:1). The leaks are
// taken as real: the coating's phases and its small insertion loss are not
// modelled, so the ports give the power split and the state of the
// dominant component, and the leaked component's phase is this package's
// choice. For an ideal splitter the two port powers add up to the input
// power (Transmittedᴴ·Transmitted + Reflectedᴴ·Reflected = I). It
// returns a [*ParamError] for an extinction ratio below 1 or NaN.
func PolarizingBeamSplitter(transmittedExtinction, reflectedExtinction float64) (Ports, error) {
	if err := checkExtinction("PolarizingBeamSplitter", "transmitted extinction ratio Tp/Ts", transmittedExtinction); err != nil {
		return Ports{}, err
	}
	if err := checkExtinction("PolarizingBeamSplitter", "reflected extinction ratio Rs/Rp", reflectedExtinction); err != nil {
		return Ports{}, err
	}
	return Ports{
		Transmitted: JonesMatrix{XX: 1, YY: complex(1/math.Sqrt(transmittedExtinction), 0)},
		Reflected:   JonesMatrix{XX: complex(1/math.Sqrt(reflectedExtinction), 0), YY: 1},
	}, nil
}
