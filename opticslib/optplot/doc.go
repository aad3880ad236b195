// Package optplot draws beamnote results with gonum.org/v1/plot. It is the
// only package of the library that imports gonum/plot; the physics packages
// (units, paraxial, beam) do not depend on it.
//
// # Figures
//
// Every figure function returns a [Figure]: the finished plot, its size
// (default 16 cm × 9 cm) and a caption. A notebook cell makes one in one
// call and the notebook layer renders it with [Figure.SVG], showing
// [Figure.String] (the caption) where no image can be shown;
// [Figure.Save] writes SVG, PNG or PDF by the file's extension.
//
//   - [Caustic]: the beam envelope ±w(z) with the elements, stops and
//     waists; [ZRange] and [Zoom] choose the range, [Also] overlays
//     what-if variants.
//   - [AlongZ]: any per-z quantity against z ([BeamRadius],
//     [WavefrontCurvature], [Ellipticity], [IrradianceFor], [GouyPhase]).
//   - [Lines]: a line figure of [Series], for what-if sweeps.
//   - [Layout]: a to-scale drawing of the system with ray fans.
//   - [PowerBudget] and [IrradianceBudget]: the power and the peak
//     irradiance along a bench path.
//   - [Stability]: a cavity's stability diagram in the g1–g2 plane
//     (a ring as its equivalent symmetric two-mirror cavity).
//   - [CavityTransmission]: the Airy resonance against detuning with the
//     transverse-mode frequencies; [CavityCaustic]: the eigenmode around
//     the round trip.
//   - [PolarizationEllipse] and [PolarizationBudget]: polarization
//     ellipses with their sense of rotation, overlaid or one panel each.
//   - [CouplingMisalignment]: coupling efficiency against offset and tilt
//     with the alignment tolerances marked.
//   - [Sweep2D]: a quantity of a two-parameter what-if study as a heat map
//     with the goal band outlined ([BandOf] a design goal).
//   - [ToleranceHistogram]: a Monte Carlo histogram of a goal with its
//     wanted range shaded.
//   - [Plan]: a folded path laid out on a breadboard, to scale from above,
//     with the hole grid, the part footprints, the beam band and the
//     warnings of [plan.Lay].
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
// Cylindrical lenses are two thin parallel bars with the same end marks
// and the letter of their power plane (x or y) beside the top end; an
// unlabelled one is labelled "fx 60 mm" or "fy -50 mm". When the beam
// differs in x and y, the y (sagittal) envelope is drawn dashed in brick
// red. A key, on a pale backing, goes in the corner of the data area
// where it covers the fewest labels and beam lines; stops left out
// because they lie far outside the beam are listed in it with their
// clear diameter. Element labels are moved inwards at the edges and up a
// row where they would overlap. Tick labels step 1–2–5 and carry as many
// decimals as the step needs, so adjacent labels always differ. Every real waist gets short bars at ±w0 and a dotted leader
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
// The cavity, polarization and coupling figures share this look. The
// stability diagram shades the stable region 0 < g1·g2 < 1 in the pale
// teal of the beam band, draws its hyperbola boundary in teal, the axes
// in grey and the symmetric cavities dotted, and marks the design as a
// teal dot (the sagittal plane in brick when it differs). The
// transmission figure draws the Airy curve in teal and each transverse
// mode as a dotted grey line labelled along the top, ochre when it lies
// within 2 % of an FSR of TEM00 and vermilion when within a linewidth.
// Polarization ellipses are drawn in a square field plane with a dotted
// unit circle and filled arrowheads for the sense of rotation, so that
// a circle stays a circle whatever the figure's size. The coupling
// figure is two panels side by side, each with its own axes and key; the
// tolerances are dotted drops from the level line to the axis.
//
// # Determinism and globals
//
// Rendering the same input twice gives byte-identical SVG: the package
// iterates only over slices, and gonum/plot's SVG back end writes numbers
// with fixed precision. (PNG and PDF files are not claimed to be
// byte-identical.) The package never modifies gonum/plot's
// package-level defaults (plotter.Default*); every style is set on the
// plotters it creates, so concurrent notebook cells do not interfere.
//
// # Errors and panics
//
// Errors are [*ParamError] values in the library's one format ("optplot:
// Zoom: half width = -1 mm: must be positive and finite"), wrapping a
// sentinel ([ErrOption], [ErrCaustic], [ErrSeries], [ErrLayout],
// [ErrFanLines], [ErrFigure], [ErrBudget], [ErrCavity],
// [ErrPolarization], [ErrCoupling]) for errors.Is; the cavity figures'
// errors wrap the cavity package's error too (errors.Is(err,
// cavity.ErrUnstable)). Nothing panics on user data, and arguments are
// not modified.
//
// # Laser safety
//
// A figure that shows irradiance ([IrradianceFor]) carries a short
// laser-safety caution in its key, deferring to local rules and the laser
// safety officer, and its caption ends with [beam.SafetyNote] in full.
package optplot
