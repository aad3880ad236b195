package paraxial

import (
	"math"
	"strconv"
	"strings"

	"github.com/beamnote/beamnote/opticslib/internal/errtext"
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
//
// Each call adds one element, except [Builder.ThickLens] and
// [Builder.Plate], which add a [Component] of three elements (surface,
// glass space, surface), and [Builder.Append], which adds a whole
// sub-system. [Builder.Label] and [Builder.Aperture] act on what the most
// recent call added (nothing, after appending an empty system).
type Builder struct {
	elems []Element
	comps []Component
	n     float64 // index of the current medium
	err   error
	// start is the index of the first element added by the most recent
	// call, comp the index in comps of its component or -1.
	start, comp int
	// calls counts the calls that add elements; method is the name of the
	// current one; appended is set when it was Append.
	calls    int
	method   string
	appended bool
}

// NewBuilder returns an empty builder whose input medium has index 1
// (vacuum or, to paraxial accuracy, air).
func NewBuilder() *Builder {
	return &Builder{n: 1, comp: -1}
}

// MinIndex and MaxIndex bound the refractive indices the [Builder]
// accepts. Every optical material lies far inside (X-ray indices 1 − δ
// with δ ~ 1e-6, germanium ≈ 4 in the infrared), and the bounds keep the
// index ratios n/n' of a long system, and so det M, clear of float64
// underflow (an index of 1e-300 made det M round to 0).
const (
	MinIndex = 1e-3
	MaxIndex = 1e3
)

// indexReason is the requirement stated in errors for a bad index.
const indexReason = "must be finite and in [1e-3, 1e3]"

func validIndex(n float64) bool { return n >= MinIndex && n <= MaxIndex } // NaN fails

func finite(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }

// call starts builder call m: it counts the call and names it in errors.
func (b *Builder) call(m string) {
	b.calls++
	b.method = m
}

// fail keeps the first error: parameter param of the current call has
// value v (a units.Length, units.Angle or float64), which fails reason.
func (b *Builder) fail(k Kind, param string, v any, reason string) {
	b.err = &ElementError{Method: b.method, Call: b.calls, Index: len(b.elems), Kind: k, Param: param, Value: v, Reason: reason}
}

// checkRadius validates a radius that may be [Flat] (±Inf).
func (b *Builder) checkRadius(k Kind, param string, r units.Length, what string) bool {
	if math.IsNaN(float64(r)) || r == 0 {
		b.fail(k, param, r, "must be nonzero and not NaN (use paraxial.Flat for a flat "+what+")")
		return false
	}
	return true
}

// checkTilt validates an angle of incidence.
func (b *Builder) checkTilt(k Kind, aoi units.Angle) bool {
	if !finite(float64(aoi)) || math.Abs(float64(aoi)) >= math.Pi/2 {
		b.fail(k, "angle of incidence θ", aoi, "must be finite with |θ| < 90°")
		return false
	}
	return true
}

// checkFocal validates a thin-lens focal length: nonzero and finite.
func (b *Builder) checkFocal(k Kind, f units.Length) bool {
	if !finite(float64(f)) || f == 0 {
		b.fail(k, "focal length f", f, "must be nonzero and finite")
		return false
	}
	return true
}

// Medium sets the refractive index n (dimensionless, between [MinIndex]
// and [MaxIndex]) of the input medium. It must be called before the first
// element; later changes of index are made with [Builder.Interface] or
// [Builder.PlanarInterface]. The default is 1.
func (b *Builder) Medium(n float64) *Builder {
	if b.err != nil {
		return b
	}
	if len(b.elems) > 0 {
		b.err = &ElementError{Method: "Medium", Index: len(b.elems), Param: "index n", Value: n, Err: ErrMediumAfterElements}
		return b
	}
	if !validIndex(n) {
		b.err = &ElementError{Method: "Medium", Index: 0, Param: "index n", Value: n, Reason: indexReason}
		return b
	}
	b.n = n
	return b
}

// begin marks the start of a builder call that adds elements.
func (b *Builder) begin() {
	b.start, b.comp, b.appended = len(b.elems), -1, false
}

func (b *Builder) add(e Element) {
	e.Call, e.Method = b.calls, b.method
	b.elems = append(b.elems, e)
}

// Space appends a gap of length d (metres, ≥ 0, finite) in the current
// medium; its matrix is [Space](d). A zero-length space is allowed.
func (b *Builder) Space(d units.Length) *Builder {
	if b.err != nil {
		return b
	}
	b.call("Space")
	if !finite(float64(d)) || d < 0 {
		b.fail(KindSpace, "length d", d, "must be non-negative and finite")
		return b
	}
	b.begin()
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
	b.call("ThinLens")
	if !b.checkFocal(KindThinLens, f) {
		return b
	}
	b.begin()
	m := ThinLens(f)
	b.add(Element{Kind: KindThinLens, Focal: f, IndexIn: b.n, IndexOut: b.n, X: m, Y: m})
	return b
}

// Interface appends a spherical refracting surface of radius r (metres,
// nonzero, finite; r > 0 when the centre of curvature lies after the vertex)
// from the current medium into a medium of index n2 (between [MinIndex]
// and [MaxIndex]); its matrix is [SphericalInterface](r, n, n2). Use [Builder.PlanarInterface]
// for a flat surface.
func (b *Builder) Interface(r units.Length, n2 float64) *Builder {
	if b.err != nil {
		return b
	}
	b.call("Interface")
	if !finite(float64(r)) || r == 0 {
		b.fail(KindSphericalInterface, "radius R", r, "must be nonzero and finite (use PlanarInterface for a flat surface)")
		return b
	}
	if !validIndex(n2) {
		b.fail(KindSphericalInterface, "index n2", n2, indexReason)
		return b
	}
	b.begin()
	m := SphericalInterface(r, b.n, n2)
	b.add(Element{Kind: KindSphericalInterface, Radius: r, IndexIn: b.n, IndexOut: n2, X: m, Y: m})
	b.n = n2
	return b
}

// PlanarInterface appends a flat refracting surface from the current medium
// into a medium of index n2 (between [MinIndex] and [MaxIndex]); its matrix is
// [PlanarInterface](n, n2).
func (b *Builder) PlanarInterface(n2 float64) *Builder {
	if b.err != nil {
		return b
	}
	b.call("PlanarInterface")
	if !validIndex(n2) {
		b.fail(KindPlanarInterface, "index n2", n2, indexReason)
		return b
	}
	b.begin()
	m := PlanarInterface(b.n, n2)
	b.add(Element{Kind: KindPlanarInterface, IndexIn: b.n, IndexOut: n2, X: m, Y: m})
	b.n = n2
	return b
}

// surface returns the element of a lens surface of radius r (possibly
// [Flat]) from index n1 into n2.
func surface(r units.Length, n1, n2 float64) Element {
	if math.IsInf(float64(r), 0) {
		m := PlanarInterface(n1, n2)
		return Element{Kind: KindPlanarInterface, IndexIn: n1, IndexOut: n2, X: m, Y: m}
	}
	m := SphericalInterface(r, n1, n2)
	return Element{Kind: KindSphericalInterface, Radius: r, IndexIn: n1, IndexOut: n2, X: m, Y: m}
}

// ThickLens appends a lens of front radius r1, back radius r2 (metres,
// nonzero, not NaN; [Flat] for a plane side), centre thickness t (metres,
// > 0, finite) and index n (between [MinIndex] and [MaxIndex]) in the
// current medium. It adds three elements: the front surface at the current position, a space of
// length t in index n, and the back surface at the current position + t,
// grouped as a [Component] of kind [KindThickLens]. The matrix of the
// three is [ThickLens](r1, r2, t, n, n0).
//
// A plano-convex lens with its curved side towards the light is
// ThickLens(R, paraxial.Flat, t, n). Errors name the call, as any other.
func (b *Builder) ThickLens(r1, r2, t units.Length, n float64) *Builder {
	if b.err != nil {
		return b
	}
	b.call("ThickLens")
	if !b.checkRadius(KindThickLens, "front radius R1", r1, "side") || !b.checkRadius(KindThickLens, "back radius R2", r2, "side") {
		return b
	}
	if !finite(float64(t)) || t <= 0 {
		b.fail(KindThickLens, "centre thickness t", t, "must be positive and finite")
		return b
	}
	if !validIndex(n) {
		b.fail(KindThickLens, "index n", n, indexReason)
		return b
	}
	b.begin()
	n0 := b.n
	gap := Space(t)
	b.add(surface(r1, n0, n))
	b.add(Element{Kind: KindSpace, Length: t, IndexIn: n, IndexOut: n, X: gap, Y: gap})
	b.add(surface(r2, n, n0))
	b.comp = len(b.comps)
	b.comps = append(b.comps, Component{Kind: KindThickLens, First: b.start, Last: b.start + 2})
	return b
}

// Plate appends a plane-parallel plate (window, cover glass, filter) of
// thickness t (metres, > 0, finite) and index n (between [MinIndex] and
// [MaxIndex]) in the current medium, tilted so that the axis ray meets it at angle of
// incidence aoi (radians, |aoi| < π/2; 0 for normal incidence). It adds a
// [Component] of kind [KindPlate]: a planar entrance surface, a space in
// the glass whose length is the axis ray's path t/cos θ', and a planar
// exit surface, with n0 sin θ = n sin θ'. At normal incidence the plate
// acts as an air-equivalent gap t·n0/n and moves an image by
// [PlateShift]; when tilted, the surfaces carry the astigmatic matrices of
// [TiltedPlanarInterface]. The lateral offset of the axis ray
// ([PlateDisplacement]) is not part of the paraxial model, whose axis is
// the axis ray itself.
//
// It is an error if the axis ray is totally reflected (n < n0 at a steep
// angle).
func (b *Builder) Plate(t units.Length, n float64, aoi units.Angle) *Builder {
	if b.err != nil {
		return b
	}
	b.call("Plate")
	if !finite(float64(t)) || t <= 0 {
		b.fail(KindPlate, "thickness t", t, "must be positive and finite")
		return b
	}
	if !validIndex(n) {
		b.fail(KindPlate, "index n", n, indexReason)
		return b
	}
	if !b.checkTilt(KindPlate, aoi) {
		return b
	}
	n0 := b.n
	sin2 := n0 * math.Sin(float64(aoi)) / n
	if math.Abs(sin2) >= 1 {
		b.fail(KindPlate, "angle of incidence θ", aoi, "is beyond the critical angle for n0 = "+strconv.FormatFloat(n0, 'g', -1, 64)+" into n = "+strconv.FormatFloat(n, 'g', -1, 64))
		return b
	}
	inner := units.Angle(math.Asin(sin2))
	path := t / units.Length(math.Cos(float64(inner)))
	b.begin()
	x1, y1 := TiltedPlanarInterface(n0, n, aoi)
	x2, y2 := TiltedPlanarInterface(n, n0, inner)
	gap := Space(path)
	b.add(Element{Kind: KindPlanarInterface, Tilt: aoi, IndexIn: n0, IndexOut: n, X: x1, Y: y1})
	b.add(Element{Kind: KindSpace, Length: path, IndexIn: n, IndexOut: n, X: gap, Y: gap})
	b.add(Element{Kind: KindPlanarInterface, Tilt: inner, IndexIn: n, IndexOut: n0, X: x2, Y: y2})
	b.comp = len(b.comps)
	b.comps = append(b.comps, Component{Kind: KindPlate, First: b.start, Last: b.start + 2, Thickness: t, Tilt: aoi})
	return b
}

// ConcaveMirror appends a concave (converging) mirror of radius of
// curvature r, the positive number printed on the part (metres, > 0,
// finite; focal length r/2), met at angle of incidence aoi (radians,
// |aoi| < π/2; 0 at normal incidence) in the current medium. The path is
// unfolded: light leaves towards +z, and the element's matrices are those
// of [Mirror] with the signed radius −r of the package's convention, with
// tangential focal length f·cos θ and sagittal f/cos θ.
func (b *Builder) ConcaveMirror(r units.Length, aoi units.Angle) *Builder {
	return b.mirror("ConcaveMirror", "radius of curvature R", r, -r, aoi)
}

// ConvexMirror appends a convex (diverging) mirror of radius of curvature
// r, the positive number printed on the part (metres, > 0, finite; focal
// length −r/2), met at angle of incidence aoi (radians, |aoi| < π/2). See
// [Builder.ConcaveMirror].
func (b *Builder) ConvexMirror(r units.Length, aoi units.Angle) *Builder {
	return b.mirror("ConvexMirror", "radius of curvature R", r, r, aoi)
}

// MirrorOfFocalLength appends a curved mirror of focal length f (metres,
// nonzero, finite; f > 0 for a concave mirror, f < 0 for a convex one, as
// a focal length is signed for any converging or diverging element) met at
// angle of incidence aoi. Its radius of curvature is 2|f|.
func (b *Builder) MirrorOfFocalLength(f units.Length, aoi units.Angle) *Builder {
	if b.err != nil {
		return b
	}
	if !finite(float64(f)) || f == 0 {
		b.call("MirrorOfFocalLength")
		b.fail(KindMirror, "focal length f", f, "must be nonzero and finite (positive for a concave mirror)")
		return b
	}
	return b.mirror("MirrorOfFocalLength", "", 2*abs(f), -2*f, aoi)
}

// FlatMirror appends a flat fold mirror met at angle of incidence aoi
// (radians, |aoi| < π/2). It leaves the beam unchanged in the unfolded
// path; its clear aperture is what matters, see [Builder.Aperture].
func (b *Builder) FlatMirror(aoi units.Angle) *Builder {
	return b.mirror("FlatMirror", "", Flat, Flat, aoi)
}

func abs(l units.Length) units.Length { return units.Length(math.Abs(float64(l))) }

// mirror adds a mirror of printed radius printed (> 0, checked when param
// is not empty) and signed radius r in the package's convention.
func (b *Builder) mirror(method, param string, printed, r units.Length, aoi units.Angle) *Builder {
	if b.err != nil {
		return b
	}
	b.call(method)
	if param != "" && (!finite(float64(printed)) || printed <= 0) {
		b.fail(KindMirror, param, printed, "must be positive and finite: give the number printed on the part and choose ConcaveMirror or ConvexMirror (FlatMirror for a flat one)")
		return b
	}
	if !b.checkTilt(KindMirror, aoi) {
		return b
	}
	b.begin()
	x, y := Mirror(r, aoi)
	e := Element{Kind: KindMirror, Tilt: aoi, IndexIn: b.n, IndexOut: b.n, X: x, Y: y}
	if !math.IsInf(float64(r), 0) {
		e.Radius, e.Focal = r, -r/2
	}
	b.add(e)
	return b
}

// CylindricalLens appends a thin cylindrical lens of focal length f
// (metres, nonzero, finite) with power in plane p only; its matrices are
// [CylindricalLens](f, p). A plane other than Tangential and Sagittal is an
// error wrapping [ErrPlane].
func (b *Builder) CylindricalLens(f units.Length, p Plane) *Builder {
	if b.err != nil {
		return b
	}
	b.call("CylindricalLens")
	if !b.checkFocal(KindCylindricalLens, f) {
		return b
	}
	if !p.valid() {
		b.fail(KindCylindricalLens, "plane", int(p), "")
		b.err.(*ElementError).Err = ErrPlane
		return b
	}
	b.begin()
	x, y := CylindricalLens(f, p)
	b.add(Element{Kind: KindCylindricalLens, Focal: f, Plane: p, IndexIn: b.n, IndexOut: b.n, X: x, Y: y})
	return b
}

// Diaphragm appends an opaque screen with an opening o, such as an iris
// that serves as aperture stop, a field diaphragm, a pinhole or a slit:
// Diaphragm(paraxial.ClearDiameter(50*units.Micrometer)) is a 50 µm
// pinhole. It does not deflect rays (identity matrices); its Aperture is
// o, which must limit the beam (Radius > 0).
func (b *Builder) Diaphragm(o Opening) *Builder {
	if b.err != nil {
		return b
	}
	b.call("Diaphragm")
	if param, v, reason := o.validate(); param != "" {
		b.fail(KindDiaphragm, param, v, reason)
		return b
	}
	if !o.Limited() {
		b.fail(KindDiaphragm, "clear radius", o.Radius, "must be positive: a diaphragm has an opening")
		return b
	}
	b.begin()
	b.add(Element{Kind: KindDiaphragm, Aperture: o, IndexIn: b.n, IndexOut: b.n, X: Identity(), Y: Identity()})
	return b
}

// detTolerance is the relative tolerance on det = 1 for user matrices:
// loose enough for matrices typed with nine or more significant digits,
// tight enough to catch a wrong entry.
const detTolerance = 1e-9

// Matrix appends a user-supplied element of zero length in the current
// medium with tangential matrix x and sagittal matrix y (pass the same
// matrix twice for a symmetric element). The entries must be finite and
// each determinant must be 1 within a relative 1e-9, as for any element
// that starts and ends in the same medium (det M = n_in/n_out). Put a
// [Builder.Space] after it for a black box with length.
func (b *Builder) Matrix(x, y Matrix) *Builder {
	if b.err != nil {
		return b
	}
	b.call("Matrix")
	for _, m := range []struct {
		name string
		m    Matrix
	}{{"X", x}, {"Y", y}} {
		for _, v := range []struct {
			name string
			v    float64
		}{{"A", m.m.A}, {"B", m.m.B}, {"C", m.m.C}, {"D", m.m.D}} {
			if !finite(v.v) {
				b.fail(KindMatrix, m.name+"."+v.name, v.v, "must be finite")
				return b
			}
		}
		if d := m.m.Det(); !finite(d) || math.Abs(d-1) > detTolerance {
			b.fail(KindMatrix, "det "+m.name, d, "must be 1 (the element keeps the medium)")
			return b
		}
	}
	b.begin()
	b.add(Element{Kind: KindMatrix, IndexIn: b.n, IndexOut: b.n, X: x, Y: y})
	return b
}

// Append appends every element of sub, a system built earlier, so that a
// sub-assembly (a telescope, a relay) can be used several times. sub's
// input index must equal the current index (relative 1e-12); the current
// index becomes sub's output index. Apertures, components and labels are
// kept; the appended elements count as this one call, and messages name
// them by it and their own method, for example `Append/ThinLens "L1"
// (call 3)`. Label after Append names the sub-assembly: it prefixes the
// labels inside ("tele/L1") and labels the unlabelled elements ("tele"),
// so that [System.Part] finds the whole assembly by "tele" and one of its
// parts by "tele/L1". An empty sub adds nothing.
func (b *Builder) Append(sub System) *Builder {
	if b.err != nil {
		return b
	}
	b.call("Append")
	if !sub.built {
		b.err = &ElementError{Method: "Append", Call: b.calls, Index: len(b.elems), Param: "sub-system", Err: ErrNotBuilt}
		return b
	}
	if math.Abs(sub.nIn-b.n) > 1e-12*b.n {
		b.err = &ElementError{Method: "Append", Call: b.calls, Index: len(b.elems), Param: "sub-system input index", Value: sub.nIn, Reason: "must equal the current index " + strconv.FormatFloat(b.n, 'g', -1, 64)}
		return b
	}
	b.begin()
	b.appended = true
	for _, c := range sub.comps {
		c.First += b.start
		c.Last += b.start
		b.comps = append(b.comps, c)
	}
	for _, e := range sub.elems {
		e.Call, e.Method = b.calls, "Append/"+e.Method
		b.elems = append(b.elems, e)
	}
	b.n = sub.nOut
	return b
}

// Label names what the most recent call added: the element, the three
// elements and the component of a thick lens or plate, or an appended
// system (see [Builder.Append]). Labels are free text without "/"; the
// edits and lookups by label ([System.Part], [System.Move], …) refuse a
// label that names two separate parts. Calling Label before any element is
// an error wrapping [ErrNoElement]. If the most recent call failed, its
// error takes the label, so that the message names the part.
func (b *Builder) Label(name string) *Builder {
	if b.err != nil {
		if e, ok := b.err.(*ElementError); ok && e.Call == b.calls && e.Call > 0 && e.Label == "" {
			e.Label = name
		}
		return b
	}
	if len(b.elems) == 0 {
		b.err = &ElementError{Method: "Label", Index: 0, Param: "label", Value: errtext.Quote(name), Err: ErrNoElement}
		return b
	}
	if strings.Contains(name, "/") {
		b.err = &ElementError{Method: "Label", Call: b.calls, Index: b.start, Param: "label", Value: errtext.Quote(name), Reason: `must not contain "/" (it separates an appended assembly from its parts)`}
		return b
	}
	prefix := func(l string) string { return l }
	if b.appended {
		prefix = func(l string) string {
			if l == "" {
				return name
			}
			return name + "/" + l
		}
		for i := range b.comps {
			if b.comps[i].First >= b.start {
				b.comps[i].Label = prefix(b.comps[i].Label)
			}
		}
	} else if b.comp >= 0 {
		b.comps[b.comp].Label = name
	}
	for i := b.start; i < len(b.elems); i++ {
		if b.appended {
			b.elems[i].Label = prefix(b.elems[i].Label)
		} else {
			b.elems[i].Label = name
		}
	}
	return b
}

// Aperture sets the clear aperture o of what the most recent call added:
// the element, both surfaces of a thick lens or plate, or every surface of
// an appended system. After [Builder.Space] it is a tube, checked along
// the whole gap. Give it as the part is specified:
//
//	Aperture(paraxial.ClearDiameter(25.4 * units.Millimeter))
//	Aperture(paraxial.OneInchOptic())
//
// The opening (its radius plus its offset) must not reach beyond the
// radius of any spherical surface it is set on, and on a thick lens it
// must leave a positive edge thickness
//
//	t_edge = t − s(R1, a) + s(R2, a),   s(R, a) = R − sign(R)·√(R² − a²)
//
// (the sag of a spherical surface; W. J. Smith, Modern Optical Engineering,
// 4th ed., 2008, ch. 13 [from memory]). Calling Aperture before any element
// is an error wrapping [ErrNoElement].
func (b *Builder) Aperture(o Opening) *Builder {
	if b.err != nil {
		return b
	}
	if len(b.elems) == 0 {
		b.err = &ElementError{Method: "Aperture", Index: 0, Param: "clear radius", Value: o.Radius, Err: ErrNoElement}
		return b
	}
	last := len(b.elems) - 1
	k, idx, label := b.elems[last].Kind, last, b.elems[last].Label
	if b.comp >= 0 {
		k, idx = b.comps[b.comp].Kind, b.start
	}
	bad := func(param string, v any, reason string) *Builder {
		b.err = &ElementError{Method: b.method + ".Aperture", Call: b.calls, Label: label, Index: idx, Kind: k, Param: param, Value: v, Reason: reason}
		return b
	}
	if param, v, reason := o.validate(); param != "" {
		return bad(param, v, reason)
	}
	if o.Limited() {
		a := float64(o.Radius) + math.Hypot(float64(o.OffsetX), float64(o.OffsetY))
		for i := b.start; i <= last; i++ {
			if e := b.elems[i]; e.Kind == KindSphericalInterface && a > math.Abs(float64(e.Radius)) {
				return bad("clear radius", o.Radius, "reaches beyond the radius of curvature |R| = "+abs(e.Radius).String()+" of a spherical surface (the opening plus its offset must stay within |R|)")
			}
		}
		for _, c := range b.comps {
			if c.Kind != KindThickLens || c.First < b.start {
				continue
			}
			front, back := b.elems[c.First], b.elems[c.Last]
			t := float64(b.elems[c.First+1].Length)
			if edge := t - sag(front, a) + sag(back, a); edge <= 0 {
				return bad("clear radius", o.Radius, "leaves an edge thickness of "+units.Length(edge).String()+" (centre "+units.Length(t).String()+"): no such lens")
			}
		}
	}
	single := b.start == last
	for i := b.start; i <= last; i++ {
		if single || b.elems[i].IsSurface() {
			b.elems[i].Aperture = o
		}
	}
	return b
}

// sag returns the signed sag (metres, positive towards +z) at height a of
// a lens surface element: zero for a flat one.
func sag(e Element, a float64) float64 {
	if e.Kind != KindSphericalInterface {
		return 0
	}
	r := float64(e.Radius)
	return r - math.Copysign(math.Sqrt(float64(r*r)-float64(a*a)), r)
}

// Err returns the first error met so far, or nil.
func (b *Builder) Err() error { return b.err }

// Build returns the assembled system, or the first error met by the
// setters. If the total length or an entry of the system matrix is not
// finite (finite but extreme inputs, such as Space(1e300) followed by
// ThinLens(1e-300), can overflow), it returns an [*ElementError] naming
// the element at which the running product overflowed and wrapping
// [ErrOverflow]. An empty
// builder yields an empty system of length 0 whose matrix is the identity;
// the analyses ([System.Cardinal], [System.Image], [System.Stops])
// reject it with [ErrEmpty].
func (b *Builder) Build() (System, error) {
	if b.err != nil {
		return System{}, b.err
	}
	return assemble(b.elems, b.comps, b.nIn(), b.n, "Build")
}

func (b *Builder) nIn() float64 {
	if len(b.elems) == 0 {
		return b.n
	}
	return b.elems[0].IndexIn
}
