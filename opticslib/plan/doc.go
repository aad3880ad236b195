// Package plan lays a paraxial system out on a breadboard seen from
// above: the unfolded path of package paraxial is folded at its mirrors,
// each part gets a board position, a footprint and the nearest hole, and
// the placement is checked for parts that collide, parts off the board,
// a beam that passes through a part it should miss, and a beam that
// leaves the board. [Lay] makes the [Plan]; [Plan.Table] is the position
// table a person builds from, and optplot.Plan draws it to scale.
//
// # Board coordinates
//
// The board is seen from above, with its origin at one corner (the
// front-left one as drawn): x runs along the board's first side
// ([Board.SizeX]), y along the second, away from the viewer. Positions
// are [Point]s in metres; directions are angles counterclockwise from +x
// (radians internally, degrees in the tables). Holes lie on a square grid
// of pitch [Board.Pitch] whose first hole is [Board.Margin] from the
// edges x = 0 and y = 0; they are numbered (column, row) from 1 at the
// origin. [MetricBoard] has M6 holes on a 25 mm pitch and [ImperialBoard]
// 1/4-20 holes on a 1 in pitch, each with its first hole half a pitch
// from the edges (12.5 mm, 0.5 in), as most breadboards are made (common
// practice, no single source; set Margin for another board). The table
// is in the board's unit (mm or inches); warnings give places in mm.
//
// # The path
//
// The input plane (z = 0) sits at [Spec.Start] with the beam going in
// [Spec.Direction]. A path position z (the unfolded axial position of
// package paraxial, so glass counts with its geometric path length) maps
// to the board by walking that far along the straight segments. Each
// mirror ends a segment; by the law of reflection the arriving and the
// leaving beams make the angle 2θ for an angle of incidence θ, so the
// beam's direction turns by
//
//	δ = 180° − 2θ
//
// (90° at θ = 45°; straight back at normal incidence), counterclockwise
// for [Left] and clockwise for [Right]. The paraxial model has the angle
// only, not the side, so [Spec.Folds] gives it by mirror label, and a
// mirror off normal incidence without one is an error naming it. All
// folds lie in the board plane: the tangential plane of package paraxial
// is the board's plane, and the beam band is drawn with the tangential
// (x) radius. The lateral shift of the beam in a tilted plate is not part
// of the paraxial model and is not drawn; the plate's footprint is turned
// by its angle of incidence, counterclockwise for a positive angle.
//
// # Parts and footprints
//
// A part is a thin lens, a cylindrical lens, a thick lens or a plate
// (their three elements), a mirror, a diaphragm, a user matrix, a run of
// consecutive elements with one label, or an unlabelled run of interfaces
// that leaves the input medium and returns to it. Its position is where
// the beam axis crosses its centre. Its footprint is an oriented
// rectangle ([Rect]): a lens, plate or iris centred on the beam and
// square to it, a mirror's mount behind its face, turned to its normal.
// Sizes come from the optic's diameter (its clear aperture over 0.9, or
// 1 in) by [DefaultMount] (common practice, no single source) unless
// [Spec.Mounts] overrides them for a label.
//
// # Checks
//
// Footprints collide when they overlap by more than 1 µm (the separating
// axis test, [Overlap]); a part is off the board when a corner of its
// footprint lies beyond an edge by more than 1 µm. Every beam segment is
// clipped (Liang–Barsky) against the footprint of every part that is not
// on it: the axis inside a footprint for more than 1 µm is
// [BeamThrough]; with [Spec.Beam] the 1/e² band is checked too
// ([BeamGrazes]) and every part gets its clearance to the beam. A segment
// whose axis leaves the board is [BeamOffBoard]. Warnings are findings,
// not errors: a plan with warnings is returned, and each warning names
// the parts and the place in board coordinates.
//
// # Errors
//
// Bad input (a board size that is not positive and finite, a start off
// the board, an unknown label, a mirror without a fold direction, a bad
// mount size) is a [*ParamError] naming the setting and the value with
// its unit and wrapping a sentinel for errors.Is. Nothing panics on user
// data, and the system is not modified.
package plan
