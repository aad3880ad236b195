// Package tolerance answers "how precisely must I place the parts?": the
// sensitivity of each goal of a design to each error a build makes, the
// linear estimate of each goal's spread, and a Monte Carlo of many builds
// with random errors, giving the yield (the share of builds meeting the
// goals), each goal's statistics and histogram, and the spread of a
// compensator re-adjusted in every build as on a bench.
//
// A [Study] holds the nominal system, the [Perturbation]s (a part's
// placement along the axis, a spacing, a relative focal-length error, a
// tilt), each with a [Distribution] (normal with σ, or uniform within
// ±t), and the goals of package design ([design.Goal]), judged exactly as
// a design is: a build meets a goal when the goal's target is met.
//
//	st := tolerance.Study{System: sys, Goals: goals, Perturbations: []tolerance.Perturbation{
//		tolerance.Placement("L2", tolerance.Normal(50*units.Micrometer)),
//		tolerance.FocalError("L1", tolerance.Uniform(0.01)),
//		tolerance.Tilt("L2", tolerance.Normal(2*units.Milliradian)),
//	}}
//	sens, err := st.Sensitivity()            // slopes, linear spread
//	res, err := st.MonteCarlo(ctx, tolerance.Options{Trials: 100000, Seed: 1})
//
// # Units
//
// Lengths are metres, angles radians, relative errors plain numbers
// (0.01 is 1 %), as in the rest of the library; the tables show
// placements and spacings per millimetre, focal lengths per per cent and
// tilts per milliradian.
//
// # Perturbation models
//
// A placement moves a part with its neighbours fixed ([paraxial.System.Move]);
// a spacing error adds to one space, moving everything after it
// ([paraxial.System.WithSpace]); length errors add. A focal error scales
// a thin lens's or curved mirror's focal length by 1 + ε. A tilt of a
// thin lens makes it astigmatic by Coddington's equations ([TiltedLens]:
// both foci shorten, f_s ≈ f(1 − θ²/(2n)), f_t ≈ f_s cos²θ); a tilt of a
// curved mirror adds to its angle of incidence, with the tangential and
// sagittal focal lengths f cos θ and f/cos θ of [paraxial.Mirror]
// (Kogelnik, Ippen, Dienes & Shank 1972 [from memory]). A tilt is a
// change in the tangential plane. The paraxial ABCD model carries no
// pointing: the beam stays on the axis, so the steering of a tilted
// mirror or of a decentred or tilted lens is not modelled (the lateral
// and angular errors of [couple.Misalignment] are the place for them),
// and a flat mirror's tilt, which only steers, is refused. A tilted
// lens's clear aperture is not foreshortened (cos θ ≈ 1 for tolerances).
//
// # Sensitivity
//
// [Study.Sensitivity] takes central differences with the step
// h = σ/10 of each tolerance ([StepFraction]). The step is relative to the
// tolerance because that is the scale on which the goal must be linear
// for the estimate to mean anything, and a tenth of it balances the two
// errors of a difference quotient: truncation, h²|g”'|/6, which is
// ~(h/L)² ≈ 10⁻⁸ of the slope for h = 10 µm on a path of lenses with
// focal lengths L ~ 100 mm, against rounding, ~ε|g|/h, which is
// ~εL/h ≈ 2·10⁻¹² of the slope per rounding unit of g (ε ≈ 2.2·10⁻¹⁶;
// the hundred units a long path may lose still leave 10⁻¹⁰). The
// optimum, h ~ ε^(1/3)L, is broad. The linear spread of a goal is √Σ(slope·σ)² over independent
// errors (JCGM 100:2008 "GUM", eq. (10) [from memory]), with the
// standard deviation of a uniform error t/√3. The second differences give
// the second-order shift of the mean, ½Σ g”σ², which is all a tilt of a
// lens at normal incidence contributes (its effect is even in the angle).
//
// # Monte Carlo, seeds and workers
//
// Build i draws its errors, one per perturbation in the study's order,
// from a PCG generator (math/rand/v2) seeded with (Seed,
// SplitMix64(Seed, i)), through gonum's distuv. The errors of a build
// depend on the seed and the build's index only, and the statistics are
// reduced in build order, so the result is bit-identical whatever the
// number of workers. Builds run in parallel on Workers goroutines (one per
// core by default), which take blocks of 256 builds. A run can report
// progress ([Options.Progress], from the calling goroutine, at most 20
// times a second) and stops when its context is cancelled, returning the
// first builds finished. The yield carries the binomial standard error
// √(p(1−p)/n); a goal's sample standard deviation s carries its own,
// s/√(2(n−1)) (normal values), which is what a comparison with the
// linear estimate must allow for.
//
// # Two routes
//
// Each build of the generic route rebuilds the system by the edits of
// package paraxial and measures the goals with their own measures: any
// goal, but tens of microseconds and some kilobytes of garbage per build.
// When the study gives a fast form of every goal ([Study.Fast]: a
// function of the beam at the end plane, [Output]; [WaistRadius],
// [WaistZ], [Divergence], [RadiusAtEnd], [TotalLength], [Coupling] are
// the fast forms of the design measures of those names), the fast route
// copies the element matrices once per worker, perturbs them in place,
// composes them with [paraxial.Matrix.Then] and carries the beam with
// [beam.Gaussian.Transform]: under a microsecond and no allocation per
// build for a ten-element path. Both routes compute the same matrices
// from the same errors ([Study.Validate] checks that each fast measure
// agrees with its goal's measure, nominal and with every error at 1σ, to
// 1e-9); they compose them in another order, so their results agree to
// rounding, not bit for bit.
//
// # Errors
//
// Functions return a [*ParamError] naming the perturbation, goal,
// compensator or option at fault and its value with its unit, wrapping
// a sentinel ([ErrDistribution], [ErrPerturbation], [ErrCompensator],
// [ErrFast], [ErrTrial], [ErrOptions]); nothing panics on user data. A
// build that cannot be made or measured (a part pushed through its
// neighbour) is not an error of the run: it counts as a failed build,
// meets no goal, and the first such failure is reported.
package tolerance
