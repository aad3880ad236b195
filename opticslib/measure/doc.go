// Package measure turns beam measurements into beams: widths at several
// planes (a caustic scan), knife-edge scans and camera frames of the
// profile, read from CSV files with units in the column names, from PNG or
// TIFF images, or from Go slices. The results are ordinary beams of
// package beam (possibly astigmatic, with M²), so a design starts from the
// measured beam, with the measurement's uncertainties carried along.
//
// The methods are those of ISO 11146-1 (second-moment widths, the
// hyperbolic fit of the caustic, the measurement-plane rule), ISO/TR
// 11146-3 (baseline offset correction of profile images) and, for
// knife-edge scans, the error-function fit with the direct inversion of
// J. M. Khosrofian & B. A. Garetz, Appl. Opt. 22, 3406–3410 (1983) as a
// cross-check.
//
// Like the other physics packages it never imports plotting, presentation
// or the kernel. Errors are [*ParamError] values that name the parameter,
// the value with its unit and the requirement, wrapping a sentinel.
package measure
