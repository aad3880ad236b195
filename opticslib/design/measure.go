package design

import (
	"math"

	"github.com/beamnote/beamnote/opticslib/beam"
	"github.com/beamnote/beamnote/opticslib/couple"
	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/units"
)

// WaistRadius measures the radius w0 (1/e², metres) of the last waist of
// the beam in through the system: the beam's waist after the last element
// that changes it ([beam.Waists], the tangential plane for an astigmatic
// beam).
func WaistRadius(in beam.Input) Measure[units.Length] {
	return func(sys paraxial.System) (units.Length, error) {
		w, err := LastWaist(sys, in)
		return w.Radius, err
	}
}

// WaistZ measures the position of the last waist (metres from the input
// plane, along the unfolded axis; it may lie beyond the system's end).
func WaistZ(in beam.Input) Measure[units.Length] {
	return func(sys paraxial.System) (units.Length, error) {
		w, err := LastWaist(sys, in)
		return w.Z, err
	}
}

// WaistAfter measures the position of the last waist relative to the
// exit plane of the part labelled label, in metres: positive when the
// waist lies after the part, negative for a virtual waist before it. For
// a thin lens it is the lens-to-waist distance s″ of S. A. Self,
// "Focusing of spherical Gaussian beams", Appl. Opt. 22, 658–661 (1983),
// which moves with the lens when a spacing before it changes:
// Near(WaistAfter(in, "L2"), f2, tol) is the collimation condition of a
// two-lens telescope (the output waist in L2's back focal plane).
func WaistAfter(in beam.Input, label string) Measure[units.Length] {
	return func(sys paraxial.System) (units.Length, error) {
		p, err := sys.Part(label)
		if err != nil {
			return 0, err
		}
		w, err := LastWaist(sys, in)
		return w.Z - p.End, err
	}
}

// LastWaist returns the last waist of the beam in through sys (the output
// beam's, [beam.OutputWaist]), and an error for a system with no element after
// which to take one, where [beam.WaistList.Last] would give the zero
// Waist.
func LastWaist(sys paraxial.System, in beam.Input) (beam.Waist, error) {
	if sys.Len() == 0 {
		if err := sys.Validate(); err != nil {
			return beam.Waist{}, err
		}
		return beam.Waist{}, &ParamError{Param: "system", Reason: "has no element, so no output waist"}
	}
	return beam.OutputWaist(sys, in)
}

// RadiusAt measures the beam radius w (1/e², metres, tangential plane)
// just after the part labelled label; label "" means the system's end
// plane.
func RadiusAt(in beam.Input, label string) Measure[units.Length] {
	return func(sys paraxial.System) (units.Length, error) {
		z := sys.Length()
		if label != "" {
			p, err := sys.Part(label)
			if err != nil {
				return 0, err
			}
			z = p.End
		}
		g, err := beam.AtXY(sys, in, z)
		return g.X.Radius(), err
	}
}

// Divergence measures the far-field half-angle θ = M²λ/(π w0 n) (radians,
// tangential plane) of the beam leaving the system: the collimation goal
// is AtMost(Divergence(in), θmax). The beam's own θ after a perfect
// collimator is λ/(π w) of the collimated radius, never zero (A. E.
// Siegman, Lasers, University Science Books 1986, ch. 17 [from memory for
// the chapter]).
func Divergence(in beam.Input) Measure[units.Angle] {
	return func(sys paraxial.System) (units.Angle, error) {
		g, err := beam.AtXY(sys, in, sys.Length())
		return g.X.HalfDivergence(), err
	}
}

// ImageZ measures the position (metres from the input plane, tangential
// plane) of the paraxial image of the object plane at z = object
// ([paraxial.System.Image]).
func ImageZ(object units.Length) Measure[units.Length] {
	return func(sys paraxial.System) (units.Length, error) {
		c, err := sys.Image(object, paraxial.Tangential)
		return c.Image, err
	}
}

// Magnification measures the transverse magnification of the object
// plane at z = object (tangential plane).
func Magnification(object units.Length) Measure[float64] {
	return func(sys paraxial.System) (float64, error) {
		c, err := sys.Image(object, paraxial.Tangential)
		return c.Magnification, err
	}
}

// TotalLength measures the system's length from its input plane to its
// end plane, in metres (the length budget: AtMost(TotalLength(), L)).
func TotalLength() Measure[units.Length] {
	return func(sys paraxial.System) (units.Length, error) { return sys.Length(), nil }
}

// MinTransmission measures the smallest fraction of the power that any
// clear aperture of the system passes ([beam.Clipping]): the aperture
// clearance goal is AtLeast(MinTransmission(in), 0.99). A system without
// apertures gives 1.
func MinTransmission(in beam.Input) Measure[float64] {
	return func(sys paraxial.System) (float64, error) {
		cs, err := beam.Clipping(sys, in, 0)
		if err != nil {
			return 0, err
		}
		t := 1.0
		for _, c := range cs {
			t = math.Min(t, c.Transmission)
		}
		return t, nil
	}
}

// Coupling measures the power coupling efficiency η at the system's end
// plane of the beam in, through the system, into the TEM₀₀ mode (given at
// that plane): the mode overlap of [couple.Overlap], aligned.
func Coupling(in beam.Input, mode beam.Input) Measure[float64] {
	return func(sys paraxial.System) (float64, error) {
		g, err := beam.AtXY(sys, in, sys.Length())
		if err != nil {
			return 0, err
		}
		c, err := couple.Overlap(g, mode, couple.Misalignment{})
		return c.Efficiency, err
	}
}
