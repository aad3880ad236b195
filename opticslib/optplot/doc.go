// Package optplot draws beamnote results with gonum.org/v1/plot. It is the
// only package of the library that imports gonum/plot; the physics packages
// (units, paraxial, beam) do not depend on it.
//
// # Units
//
// Data arrive in metres (the library's internal unit) and are plotted in
// millimetres on both axes, which suits bench-top optics; axis labels state
// the unit.
//
// # Look
//
// The caustic plot draws the x (tangential) envelope ±w(z) as two lines
// over a pale band, the optical axis as a thin dotted line, and each
// zero-thickness element as a vertical bar at its position with a short
// label above it. Thin lenses carry small end marks that open outwards for
// a converging lens and inwards for a diverging one; other surfaces are
// plain bars in a second colour. A clear aperture shows as a pair of short
// stops at ±a; stops that pass less than the threshold are heavier and
// vermilion, and the element label then states the transmitted fraction.
// When the beam differs in x and y, the y (sagittal) envelope is drawn
// dashed in brick red and a small key appears on the side where the beam
// is narrower. Every real waist gets short bars at ±w0 and a dotted leader
// down to a one-line note "w₀ 16.9 µm @ 99.9 mm" along the bottom of the
// plot; notes that would overlap move up a row. An optional paraxial ray
// fan ([Rays]) is drawn in thin translucent slate violet. The palette
// (deep teal, brick, warm ochre, muted plum, slate violet on white) is this
// package's own.
//
// The layout drawing ([Layout]) is to scale along z and stretched in y by a
// factor it prints in the lower left corner ("y scale ×3.2"). Lenses are
// outlined from their radii and thickness and filled pale; plates are
// outlined rectangles, mirrors a heavy line with a hatched back, diaphragms
// two short stops, and
// the aperture stop and pupils are labelled. Ray fans from each field point
// ([FanLines]) share one colour per field point, with a small key.
//
// # Determinism and globals
//
// Rendering the same input twice gives byte-identical SVG: the package
// iterates only over slices, and gonum/plot's SVG back end writes numbers
// with fixed precision. The package never modifies gonum/plot's
// package-level defaults (plotter.Default*); every style is set on the
// plotters it creates, so concurrent notebook cells do not interfere.
//
// # Errors and panics
//
// [Caustic] returns an error for empty or inconsistent data and for
// non-finite values; [SVG] returns rendering errors. Nothing panics on user
// data, and arguments are not modified.
package optplot
