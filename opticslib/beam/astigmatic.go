package beam

import (
	"errors"

	"github.com/beamnote/beamnote/opticslib/paraxial"
)

// ErrMismatchedPlanes is returned (wrapped in a [*ParamError]) for an
// [Astigmatic] beam whose x and y parts have different wavelengths or
// indices.
var ErrMismatchedPlanes = errors.New("x and y parts of the beam must have the same wavelength and index")

// Astigmatic is a simple-astigmatic (or elliptical) beam at one plane: a
// Gaussian in x and an independent Gaussian in y, with principal axes along
// x and y (Siegman, Lasers, 1986, ch. 17 and 20 [from memory]). The
// x direction is the tangential plane ([paraxial.Tangential], Element.X,
// [paraxial.System.MatrixTo]) and y the sagittal plane ([paraxial.Sagittal],
// Element.Y, [paraxial.System.MatrixTo] with [paraxial.Sagittal]). The intensity is
//
//	I(x, y) = I0 exp(−2x²/Wx² − 2y²/Wy²),   I0 = 2P/(π Wx Wy)
//
// Each part propagates by the ABCD law with its own matrix (Element.X for
// X, Element.Y for Y), which is what cylindrical lenses and mirrors used
// off normal incidence need. The parts may have different waist sizes,
// waist positions and M², but must share the wavelength and the index.
//
// A round beam is Astigmatic{X: g, Y: g}; every function of the package
// that takes an [Input] accepts a plain [Gaussian] for that case.
type Astigmatic struct {
	X, Y Gaussian
}

// Validate returns nil if both parts are valid beams with the same
// wavelength and index; otherwise a [*ParamError] naming the plane.
func (a Astigmatic) Validate() error {
	if err := a.X.Validate(); err != nil {
		return planeError(paraxial.Tangential, err)
	}
	if err := a.Y.Validate(); err != nil {
		return planeError(paraxial.Sagittal, err)
	}
	if a.X.Wavelength != a.Y.Wavelength {
		return &ParamError{Param: "y wavelength λ0", Value: a.Y.Wavelength, Reason: "x wavelength is " + a.X.Wavelength.String(), Err: ErrMismatchedPlanes}
	}
	if a.X.Index != a.Y.Index {
		return &ParamError{Param: "y index n", Value: a.Y.Index, Reason: "x index is " + formatFloat(a.X.Index), Err: ErrMismatchedPlanes}
	}
	return nil
}

// planeError prefixes the parameter name of a *ParamError with the plane.
func planeError(p paraxial.Plane, err error) error {
	var pe *ParamError
	if errors.As(err, &pe) {
		c := *pe
		c.Param = planeName(p) + " " + c.Param
		return &c
	}
	return err
}

// Transform returns the beam after the tangential matrix mx (acting on X)
// and the sagittal matrix my (acting on Y), in an output medium of index
// nOut, by the ABCD law in each plane ([Gaussian.Transform]). It is pure
// arithmetic; see [Gaussian.Transform] for degenerate matrices.
func (a Astigmatic) Transform(mx, my paraxial.Matrix, nOut float64) Astigmatic {
	return Astigmatic{X: a.X.Transform(mx, nOut), Y: a.Y.Transform(my, nOut)}
}

// Ellipticity returns Wy/Wx, the ratio of the 1/e² radii at the plane
// (1 for a round beam).
func (a Astigmatic) Ellipticity() float64 {
	return float64(a.Y.Radius() / a.X.Radius())
}

// Input is the beam at the input plane of a system: a [Gaussian] (the same
// beam in x and y) or an [Astigmatic] beam. The interface is closed; no
// other types implement it.
type Input interface {
	planes() Astigmatic
}

func (g Gaussian) planes() Astigmatic   { return Astigmatic{X: g, Y: g} }
func (a Astigmatic) planes() Astigmatic { return a }

// planeName returns "x" for the tangential and "y" for the sagittal plane.
func planeName(p paraxial.Plane) string {
	if p == paraxial.Sagittal {
		return "y"
	}
	return "x"
}
