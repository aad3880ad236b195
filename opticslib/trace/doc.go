// Package trace traces real rays exactly through sequential systems of
// spheres, planes and conics (refracting and reflecting), with clear
// apertures, stops and ideal thin lenses, and analyses the result: spot
// diagrams, ray-aberration curves, longitudinal spherical aberration,
// chromatic focal shift, third-order sums, wavefront error and Strehl
// ratio, and the focus of a Gaussian beam through an aberrated lens.
//
// # Conventions
//
// Lengths are in metres, angles in radians ([units.Length],
// [units.Angle]). Wavelengths are vacuum wavelengths, and every medium's
// index is absolute (relative to vacuum), so that the optical path
// lengths and the wavefront errors are in units of the vacuum wavelength.
// Glass data are usually stated relative to air at air wavelengths; the
// materials of package material convert them, and [Media.Air] gives the
// air its own index (about 1.00027) so the ratios at each surface are
// right.
//
// The system has a fixed frame: z is the optical axis, y the meridional
// (tangential) direction, x the sagittal one. Light enters travelling
// towards +z. A surface's radius is positive when its centre of
// curvature lies at larger z than its vertex; the signed Thickness after
// a mirror is negative, because the light then travels towards −z. A
// system from [FromParaxial] keeps the paraxial system's z (along the
// unfolded axis until the first mirror) and the paraxial signs, turned
// into this frame.
//
// # Rays
//
// A [Ray] is a point, a unit direction (the direction cosines L, M, N)
// and the optical path length travelled, Σ n·s. A batch of rays is a
// [Rays] value in structure-of-arrays layout, traced in place by
// [System.Trace] on several cores; [System.TraceRay] and [System.Path]
// trace one ray with the same kernel. Each ray ends with a [Status] (ok,
// missed the surface, total internal reflection, blocked, surface behind
// the ray, invalid start) and the index of the surface where it stopped;
// a ray that stops keeps its last valid values, so no coordinate is NaN.
//
// The intersection with each conic and the refraction follow G. H. Spencer
// and M. V. R. K. Murty, "General ray-tracing procedure", J. Opt. Soc. Am.
// 52, 672–678 (1962): transfer to the vertex's tangent plane, then the
// root of the conic's quadratic nearest to it, then Snell's law in vector
// form. Only the branch of a conic through its vertex is traced.
//
// # Analyses
//
// A [Source] lights the system: a collimated beam at a field angle, or a
// point at a finite distance, filling a round entrance pupil uniformly or
// with a Gaussian profile; [PupilGrid], [PupilHexapolar] and
// [PupilRandom] sample the pupil. From the rays:
//
//   - [System.Spot] and [System.BestFocus]: spot diagrams with RMS and
//     geometric radii about the centroid, and the plane of least RMS
//     radius in closed form (the crossings are linear in the plane's
//     shift);
//   - [System.RayFans], [System.SphericalAberration] and
//     [System.ChromaticFocalShift]: transverse ray-aberration curves,
//     longitudinal spherical aberration against pupil height, and the
//     paraxial focus against wavelength;
//   - [System.Seidel]: third-order sums from the paraxial marginal and chief
//     rays with the conic terms, in the convention of W. T. Welford,
//     Aberrations of Optical Systems (1986), chapter 8;
//   - [System.Wavefront]: the optical path difference to a reference sphere
//     centred on the chief ray's image point, positive where a ray's path is
//     longer than the chief ray's (the opposite sign of Welford's W, so a
//     positive S_I gives OPD ≈ −(S_I/8)ρ⁴), and [Wavefront.Strehl] by the
//     pupil average, Maréchal's and Mahajan's forms;
//   - [System.GaussianFocus]: the focus of a Gaussian beam through the
//     aberrated system, by a Fraunhofer transform of the pupil field.
//
// # Errors and panics
//
// Bad surfaces, media and wavelengths are reported by [*ParamError] values
// naming the surface, the parameter and the value with its unit; an
// element of a paraxial system that has no real-ray model wraps
// [ErrNotTraceable]. Ray failures are per-ray statuses, never errors.
// The functions panic only on programmer errors: an index out of range, or
// the slices of a [Rays] of different lengths.
package trace
