package paraxial

import (
	"math"

	"github.com/beamnote/beamnote/opticslib/units"
)

// Builder assembles a [System] element by element. Create one with
// [NewBuilder], chain the setters, and finish with [Builder.Build]:
//
//	sys, err := paraxial.NewBuilder().
//		Space(100 * units.Millimeter).
//		ThinLens(100 * units.Millimeter).Label("L1").
//		Space(200 * units.Millimeter).
//		Build()
//
// The setters never panic on user data. The first invalid value is kept
// (a sticky error); later calls are ignored, and Build returns that error.
// A Builder is not safe for concurrent use. Build may be called more than
// once; each System it returns is independent of later builder calls.
type Builder struct {
	elems []Element
	n     float64      // index of the current medium
	z     units.Length // position of the end of the last element
	err   error
}

// NewBuilder returns an empty builder whose input medium has index 1
// (vacuum or, to paraxial accuracy, air).
func NewBuilder() *Builder {
	return &Builder{n: 1}
}

func validIndex(n float64) bool { return n > 0 && !math.IsInf(n, 0) } // NaN fails n > 0

func finite(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }

func (b *Builder) fail(k Kind, param string, v float64, length bool, reason string) {
	b.err = &ElementError{Index: len(b.elems), Kind: k, Param: param, Value: v, Length: length, Reason: reason}
}

// Medium sets the refractive index n (dimensionless, > 0, finite) of the
// input medium. It must be called before the first element; later changes
// of index are made with [Builder.Interface] or
// [Builder.PlanarInterface]. The default is 1.
func (b *Builder) Medium(n float64) *Builder {
	if b.err != nil {
		return b
	}
	if len(b.elems) > 0 {
		b.err = &ElementError{Index: len(b.elems), Op: "Medium", Param: "index n", Value: n, Err: ErrMediumAfterElements}
		return b
	}
	if !validIndex(n) {
		b.err = &ElementError{Index: 0, Op: "Medium", Param: "index n", Value: n, Reason: "must be positive and finite"}
		return b
	}
	b.n = n
	return b
}

func (b *Builder) add(e Element) {
	e.Z = b.z
	b.z += e.Length
	b.elems = append(b.elems, e)
}

// Space appends a gap of length d (metres, ≥ 0, finite) in the current
// medium; its matrix is [Space](d). A zero-length space is allowed.
func (b *Builder) Space(d units.Length) *Builder {
	if b.err != nil {
		return b
	}
	if !finite(float64(d)) || d < 0 {
		b.fail(KindSpace, "length d", float64(d), true, "must be non-negative and finite")
		return b
	}
	m := Space(d)
	b.add(Element{Kind: KindSpace, Length: d, IndexIn: b.n, IndexOut: b.n, X: m, Y: m})
	return b
}

// ThinLens appends a thin lens of focal length f (metres, nonzero, finite;
// f > 0 converges) at the current position, in the current medium; its
// matrix is [ThinLens](f).
func (b *Builder) ThinLens(f units.Length) *Builder {
	if b.err != nil {
		return b
	}
	if !finite(float64(f)) || f == 0 {
		b.fail(KindThinLens, "focal length f", float64(f), true, "must be nonzero and finite")
		return b
	}
	m := ThinLens(f)
	b.add(Element{Kind: KindThinLens, Focal: f, IndexIn: b.n, IndexOut: b.n, X: m, Y: m})
	return b
}

// Interface appends a spherical refracting surface of radius r (metres,
// nonzero, finite; r > 0 when the centre of curvature lies after the vertex)
// from the current medium into a medium of index n2 (> 0, finite); its
// matrix is [SphericalInterface](r, n, n2). Use [Builder.PlanarInterface]
// for a flat surface.
func (b *Builder) Interface(r units.Length, n2 float64) *Builder {
	if b.err != nil {
		return b
	}
	if !finite(float64(r)) || r == 0 {
		b.fail(KindSphericalInterface, "radius R", float64(r), true, "must be nonzero and finite (use PlanarInterface for a flat surface)")
		return b
	}
	if !validIndex(n2) {
		b.fail(KindSphericalInterface, "index n2", n2, false, "must be positive and finite")
		return b
	}
	m := SphericalInterface(r, b.n, n2)
	b.add(Element{Kind: KindSphericalInterface, Radius: r, IndexIn: b.n, IndexOut: n2, X: m, Y: m})
	b.n = n2
	return b
}

// PlanarInterface appends a flat refracting surface from the current medium
// into a medium of index n2 (> 0, finite); its matrix is
// [PlanarInterface](n, n2).
func (b *Builder) PlanarInterface(n2 float64) *Builder {
	if b.err != nil {
		return b
	}
	if !validIndex(n2) {
		b.fail(KindPlanarInterface, "index n2", n2, false, "must be positive and finite")
		return b
	}
	m := PlanarInterface(b.n, n2)
	b.add(Element{Kind: KindPlanarInterface, IndexIn: b.n, IndexOut: n2, X: m, Y: m})
	b.n = n2
	return b
}

// Label names the most recently added element. Labels are free text and
// need not be unique. Calling Label before any element is an error
// wrapping [ErrNoElement].
func (b *Builder) Label(name string) *Builder {
	if b.err != nil {
		return b
	}
	if len(b.elems) == 0 {
		b.err = &ElementError{Index: 0, Op: "Label(" + quote(name) + ")", Err: ErrNoElement}
		return b
	}
	b.elems[len(b.elems)-1].Label = name
	return b
}

// Aperture sets the clear-aperture radius (metres, ≥ 0, finite; 0 means
// unlimited) of the most recently added element. Calling Aperture before
// any element is an error wrapping [ErrNoElement].
func (b *Builder) Aperture(radius units.Length) *Builder {
	if b.err != nil {
		return b
	}
	if len(b.elems) == 0 {
		b.err = &ElementError{Index: 0, Op: "Aperture", Param: "radius", Value: float64(radius), Length: true, Err: ErrNoElement}
		return b
	}
	last := len(b.elems) - 1
	if !finite(float64(radius)) || radius < 0 {
		b.err = &ElementError{Index: last, Kind: b.elems[last].Kind, Param: "aperture radius", Value: float64(radius), Length: true, Reason: "must be non-negative and finite"}
		return b
	}
	b.elems[last].Aperture = radius
	return b
}

// Err returns the first error met so far, or nil.
func (b *Builder) Err() error { return b.err }

// Build returns the assembled system, or the first error met by the
// setters. It returns [ErrOverflow] if the total length or an entry of the
// system matrix is not finite (finite but extreme inputs, such as
// Space(1e300) followed by ThinLens(1e-300), can overflow). An empty builder yields an empty system of length 0 whose
// matrix is the identity.
func (b *Builder) Build() (System, error) {
	if b.err != nil {
		return System{}, b.err
	}
	s := System{
		elems:   append([]Element(nil), b.elems...),
		nIn:     b.nIn(),
		nOut:    b.n,
		length:  b.z,
		matrixX: Identity(),
		matrixY: Identity(),
	}
	for _, e := range s.elems {
		s.matrixX = s.matrixX.Then(e.X)
		s.matrixY = s.matrixY.Then(e.Y)
	}
	if !s.matrixX.finite() || !s.matrixY.finite() || !finite(float64(s.length)) {
		return System{}, ErrOverflow
	}
	return s, nil
}

func (b *Builder) nIn() float64 {
	if len(b.elems) == 0 {
		return b.n
	}
	return b.elems[0].IndexIn
}

func quote(s string) string {
	const max = 32
	r := []rune(s)
	if len(r) > max {
		s = string(r[:max]) + "…"
	}
	return "\"" + s + "\""
}
