// Package design states what a design must do and which of its values may
// change: goals on a paraxial system (a waist size and position, a
// divergence, an image distance, a total length, clearance at the
// apertures, coupling into a mode), each a [target.Target] with a wanted
// range, and variables (a labelled spacing, a lens position, a thin lens's
// focal length) with bounds. A [Problem] ties them to a starting system;
// its [Problem.Evaluate] gives the targets and a weighted cost, so the
// solvers, the lab-stock search and the tolerancing all judge a design
// the same way, and a solved design's targets are the design log's
// targets, checked on every re-run.
//
// # Cost
//
// Each goal's residual is how far its value lies outside the wanted range
// ([target.Target.Miss]) divided by the goal's scale: the tolerance of a
// Near goal, the half-width of a Between goal, and the magnitude of the
// limit of a one-sided goal (see [Goal.Scale]). The cost is Σ wᵢ rᵢ²
// (weights wᵢ, 1 unless given), zero exactly when every goal is met. A
// goal whose value cannot be computed (no waist after the system, an
// unstable beam) makes the evaluation an error naming the goal.
//
// # Solvers
//
// [SolveOne] solves a single condition, one goal in one variable: the
// zeros of the goal's miss from its aim, found by a scan of the bounds
// and Brent's method ([Root]); every root is reported, in order (the
// spacing that puts a waist at a given distance has two). [Minimize]
// minimises the cost over several variables with gonum/optimize's
// Nelder–Mead method through a smooth map onto the bounds, from a fixed
// set of starts (the start point, a grid, seeded random points), and
// returns a [Solution] with the values, the bounds that are active, the
// targets and how the optimiser ended. Both say which goal is missed and
// which bound is at fault when the bounds exclude every solution
// ([ErrInfeasible]), and [ErrNotConverged] when the optimiser was cut
// off.
//
// # Units
//
// Lengths are metres ([units.Length]), angles radians ([units.Angle]);
// efficiencies and transmissions are fractions in [0, 1].
//
// # Errors
//
// Functions return a [*ParamError] naming the goal or variable and the
// value at fault, with its unit; nothing panics on user data.
package design
