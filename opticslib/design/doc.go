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
