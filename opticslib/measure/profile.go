package measure

// Beam profile frames and their ISO 11146-1 second moments: [Frame],
// its readers (profile_read.go) and [Frame.Profile].

import (
	"errors"
	"math"
	"strconv"

	"github.com/beamnote/beamnote/opticslib/units"
)

// MaxFramePixels is the largest number of pixels of a [Frame]
// (2²⁵ ≈ 33.5 million, 268 MB of float64): larger images exhaust a
// notebook machine's memory before the analysis ends.
const MaxFramePixels = 1 << 25

// Frame is a 2-D intensity image of a beam profile: Rows × Cols samples
// in the camera's units (counts), the pixel pitch in x and y, and the
// sensor's saturation level.
//
// # Pixel coordinates
//
// Data[r*Cols+c] is the pixel in row r and column c. The column index is
// x and the row index is y; the centre of pixel (c, r) lies at
//
//	x = c·PitchX,   y = r·PitchY
//
// so the origin is the centre of the first pixel of the first row (the
// top-left pixel of an image as it is displayed), x grows to the right
// and y downwards. An angle is measured from +x towards +y, which is
// clockwise on a displayed image; for y upwards, negate CentroidY,
// SigmaXY and Azimuth of a [Profile].
type Frame struct {
	// Rows and Cols are the number of rows (y) and columns (x).
	Rows, Cols int
	// Data holds Rows·Cols samples, row by row: Data[r*Cols+c] is the
	// pixel in row r (y) and column c (x).
	Data []float64
	// PitchX and PitchY are the pixel pitch (centre-to-centre spacing) in
	// x and y, in metres.
	PitchX, PitchY units.Length
	// FullScale is the value at which the sensor saturates (255 for an
	// 8-bit image, 65535 for 16 bits, as the image readers set it; a
	// 12-bit camera writing 16-bit files saturates at 4095 or at 65520,
	// depending on how it packs its data); 0 means unknown and no
	// saturation check.
	FullScale float64
	// Name names the frame in errors and reports, for example its file
	// name; it may be empty.
	Name string
}

// frameWhere returns the subject of a frame's errors: its name, or
// "profile frame".
func frameWhere(name string) string {
	if name == "" {
		return "profile frame"
	}
	return name
}

func frameFinite(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }

// framePitchError checks a pixel pitch.
func framePitchError(where, axis string, p units.Length) error {
	if !frameFinite(float64(p)) || !(p > 0) {
		return &ParamError{Where: where, Param: "pixel pitch " + axis, Value: p, Reason: "must be positive and finite", Err: ErrNotPhysical}
	}
	return nil
}

// frameSizeError checks a frame size before its pixels are allocated.
func frameSizeError(where string, rows, cols int) error {
	if rows < 1 || cols < 1 {
		return &ParamError{Where: where, Param: "size", Value: strconv.Itoa(cols) + " × " + strconv.Itoa(rows) + " pixels", Reason: "is empty", Err: ErrInput}
	}
	if rows > MaxFramePixels/cols {
		return &ParamError{Where: where, Param: "size", Value: strconv.Itoa(cols) + " × " + strconv.Itoa(rows) + " pixels", Reason: "must have at most " + strconv.Itoa(MaxFramePixels) + " pixels", Err: ErrInput}
	}
	return nil
}

// At returns the sample in column x and row y. It panics if x or y is
// outside the frame.
func (f Frame) At(x, y int) float64 {
	if x < 0 || x >= f.Cols || y < 0 || y >= f.Rows {
		panic("measure: Frame.At index out of range")
	}
	return f.Data[y*f.Cols+x]
}

// X returns the position of column c, c·PitchX, in metres.
func (f Frame) X(c int) units.Length { return units.Length(float64(c) * float64(f.PitchX)) }

// Y returns the position of row r, r·PitchY, in metres.
func (f Frame) Y(r int) units.Length { return units.Length(float64(r) * float64(f.PitchY)) }

// Validate returns nil if f has at least one row and column, Rows·Cols ≤
// [MaxFramePixels] finite samples, a positive finite pitch and a finite
// FullScale ≥ 0; otherwise a [*ParamError]. Samples may be negative (a
// frame that has already been corrected for its offset).
func (f Frame) Validate() error {
	where := frameWhere(f.Name)
	if err := frameSizeError(where, f.Rows, f.Cols); err != nil {
		return err
	}
	if len(f.Data) != f.Rows*f.Cols {
		return &ParamError{Where: where, Param: "sample count len(Data)", Value: len(f.Data), Reason: "must be Rows·Cols = " + strconv.Itoa(f.Rows*f.Cols), Err: ErrInput}
	}
	if err := framePitchError(where, "x", f.PitchX); err != nil {
		return err
	}
	if err := framePitchError(where, "y", f.PitchY); err != nil {
		return err
	}
	if !frameFinite(f.FullScale) || f.FullScale < 0 {
		return &ParamError{Where: where, Param: "full scale", Value: f.FullScale, Reason: "must be finite and ≥ 0 (0: unknown)", Err: ErrNotPhysical}
	}
	for i, v := range f.Data {
		if !frameFinite(v) {
			return &ParamError{Where: where, Param: framePixelName(i%f.Cols, i/f.Cols), Value: v, Reason: "must be finite", Err: ErrNotPhysical}
		}
	}
	return nil
}

// framePixelName names pixel (x, y) in errors.
func framePixelName(x, y int) string {
	return "pixel (x " + strconv.Itoa(x) + ", y " + strconv.Itoa(y) + ")"
}

// FrameFromRows returns a frame of the given rows of samples (rows[y][x],
// all of the same length; copied) and pixel pitch (metres). Its FullScale
// is 0 (unknown). It returns a [*ParamError] for an empty or ragged
// matrix, a non-finite sample or an invalid pitch.
func FrameFromRows(rows [][]float64, pitchX, pitchY units.Length) (Frame, error) {
	const where = "profile frame"
	cols := 0
	if len(rows) > 0 {
		cols = len(rows[0])
	}
	if err := frameSizeError(where, len(rows), cols); err != nil {
		return Frame{}, err
	}
	f := Frame{Rows: len(rows), Cols: cols, PitchX: pitchX, PitchY: pitchY, Data: make([]float64, 0, len(rows)*cols)}
	for y, r := range rows {
		if len(r) != cols {
			return Frame{}, &ParamError{Where: where, Param: "row " + strconv.Itoa(y) + " length", Value: len(r), Reason: "must be " + strconv.Itoa(cols) + " as row 0 (a ragged matrix)", Err: ErrInput}
		}
		f.Data = append(f.Data, r...)
	}
	return f, f.Validate()
}

// BaselineMethod selects how [Frame.Profile] estimates the baseline offset
// that it subtracts (after a dark frame, if one is given).
type BaselineMethod int

// Baseline methods.
const (
	// BorderOffset subtracts the mean of the pixels in a border region of
	// the frame, [ProfileOptions.BorderWidth] pixels wide along all four
	// edges (ISO/TR 11146-3 [from memory]). The region must be free of
	// beam light; [ErrBorderOverlap] warns when the integration area
	// reaches it.
	BorderOffset BaselineMethod = iota
	// NoOffset subtracts nothing beyond the dark frame: for frames that
	// are already corrected, or when the dark frame is the whole
	// correction.
	NoOffset
)

// String returns "border mean" or "none".
func (b BaselineMethod) String() string {
	switch b {
	case BorderOffset:
		return "border mean"
	case NoOffset:
		return "none"
	}
	return "BaselineMethod(" + strconv.Itoa(int(b)) + ")"
}

// Defaults of [ProfileOptions].
const (
	// DefaultMaxIterations is the number of integration-area refinements
	// after which [Frame.Profile] gives up with [ErrAreaNotConverged]. A
	// Gaussian converges in 2–6 in the tests; ISO 11146-1 sets no number.
	DefaultMaxIterations = 50
	// DefaultTolerance is the relative change of the widths (and of the
	// centroid, relative to the smaller width) between two refinements
	// below which the area has converged: 1e-4, far below the ≈ 1 %
	// repeatability of camera width measurements (common practice, no
	// single source).
	DefaultTolerance = 1e-4
)

// ProfileOptions are the settings of [Frame.Profile]; a nil *ProfileOptions
// or a zero field means the default.
type ProfileOptions struct {
	// Dark is a dark frame (the camera with the beam blocked, same
	// exposure), subtracted pixel by pixel before the baseline offset;
	// nil for none. It must have the frame's Rows and Cols.
	Dark *Frame
	// Baseline selects the offset correction; the zero value is
	// BorderOffset.
	Baseline BaselineMethod
	// BorderWidth is the width in pixels of the border region of
	// BorderOffset, which also gives the noise estimate; 0 means 5 % of
	// the smaller side, at least 1 pixel (common practice, no single
	// source). Twice it must be less than the smaller side.
	BorderWidth int
	// MaxIterations limits the integration-area refinements; 0 means
	// DefaultMaxIterations.
	MaxIterations int
	// Tolerance is the convergence tolerance of the integration area;
	// 0 means DefaultTolerance. The iteration also stops when the
	// changes are within the noise uncertainty of the widths
	// ([Profile.WidthNoise]): the pixels that enter and leave the area
	// carry noise, so a noisy frame alternates between two or more areas
	// whose results differ by less than that uncertainty, and a smaller
	// change would be chance.
	Tolerance float64
	// RejectSaturated makes saturated pixels an error instead of a
	// warning.
	RejectSaturated bool
	// WholeFrame computes the moments over the whole frame, without the
	// iterative integration area: not the procedure of ISO 11146-1, for
	// frames already cropped to the beam or for comparisons. The noise
	// of every pixel then enters the widths.
	WholeFrame bool
}

// Warnings and errors of [Frame.Profile]. The warnings come in
// [Profile.Warnings] as [*ParamError] values that wrap them and carry the
// numbers; test with errors.Is.
var (
	// ErrSaturated: pixels at or above the frame's FullScale. A clipped
	// peak flattens the profile, so the second-moment widths come out too
	// large. An error with [ProfileOptions.RejectSaturated], else a
	// warning.
	ErrSaturated = errors.New("measure: saturated pixels")
	// ErrBeamAtEdge (warning): the D4σ ellipse (the 1/e² contour of a
	// TEM₀₀ beam) reaches past the frame edge; the beam is cut off and the
	// widths are too small.
	ErrBeamAtEdge = errors.New("measure: beam too close to the frame edge")
	// ErrAreaClipped (warning): the ISO integration area (three times the
	// widths) extends beyond the frame, so the moments miss the tails
	// outside it; ISO 11146-1 asks for a frame that holds the area.
	ErrAreaClipped = errors.New("measure: integration area leaves the frame")
	// ErrFewPixels (warning): fewer than 10 pixels across the smaller D4σ
	// diameter. Pixels integrate the irradiance over their area, which
	// adds p²/12 to σ² (W. F. Sheppard, Proc. London Math. Soc. 29, 353
	// (1898), "Sheppard's correction" [from memory]): 0.7 % of the width
	// at 10 pixels, 3 % at 5. The threshold is common practice, no single
	// source.
	ErrFewPixels = errors.New("measure: too few pixels across the beam")
	// ErrLowSignal (warning): the pixel noise makes the widths uncertain
	// by more than 1 % ([Profile.WidthNoise]; the threshold is common
	// practice, no single source). Not reported with ErrBorderOverlap,
	// whose beam light in the border makes the noise estimate too large.
	ErrLowSignal = errors.New("measure: low signal-to-noise ratio")
	// ErrBorderOverlap (warning): the integration area reaches the border
	// region that gave the baseline offset and the noise estimate, so they
	// include beam light: the widths come out too small (with
	// BorderOffset) and the noise too large. Use a larger frame, a
	// narrower border or a dark frame.
	ErrBorderOverlap = errors.New("measure: integration area overlaps the baseline border")
	// ErrAreaNotConverged (error, returned with the last result): the
	// integration area did not converge within MaxIterations.
	ErrAreaNotConverged = errors.New("measure: integration area did not converge")
)

// MomentWidth is a second-moment beam width along one axis: the standard
// deviation σ of the irradiance distribution along it (ISO 11146-1).
type MomentWidth struct {
	// Sigma is σ in metres.
	Sigma units.Length
}

// D4Sigma returns the D4σ beam diameter 4σ of ISO 11146-1 (dσ), in
// metres.
func (w MomentWidth) D4Sigma() units.Length { return 4 * w.Sigma }

// Radius returns the second-moment radius 2σ in metres, which for a TEM₀₀
// beam equals its 1/e² intensity radius w (reference-checks R17 [C]).
func (w MomentWidth) Radius() units.Length { return 2 * w.Sigma }

// IntegrationArea is the rectangle inside which [Frame.Profile] computed
// the final moments.
type IntegrationArea struct {
	// CenterX and CenterY are the rectangle's centre in metres, the
	// centroid of the previous refinement (the frame's centre for the
	// whole frame).
	CenterX, CenterY units.Length
	// Azimuth is the angle from x to the rectangle's first side.
	Azimuth units.Angle
	// HalfU and HalfV are the half-sides along the principal axes, in
	// metres: 1.5 times the D4σ diameters of the previous refinement
	// (half the frame's width and height for the whole frame).
	HalfU, HalfV units.Length
	// Pixels is the number of pixels inside.
	Pixels int
	// Whole is true when the area is the whole frame
	// ([ProfileOptions.WholeFrame]).
	Whole bool
}

// Profile is the result of [Frame.Profile]: the ISO 11146-1 first and
// second moments of a beam profile, how they were obtained, and warnings.
type Profile struct {
	// Name is the frame's name.
	Name string
	// CentroidX and CentroidY are the beam centroid x̄, ȳ in metres from
	// the centre of pixel (0, 0).
	CentroidX, CentroidY units.Length
	// X and Y are the widths along the frame's axes (σx, σy).
	X, Y MomentWidth
	// SigmaXY is the mixed second moment σxy² = ⟨(x − x̄)(y − ȳ)⟩ in m²
	// (signed).
	SigmaXY float64
	// Azimuth is the angle φ from the x axis to the principal axis u,
	// within ±45°; it is 0 and meaningless for a round beam.
	Azimuth units.Angle
	// U and V are the widths along the principal axes: u at Azimuth,
	// v at Azimuth + 90° (ISO 11146-1's dσx and dσy of the beam's own
	// axes are U.D4Sigma() and V.D4Sigma()).
	U, V MomentWidth
	// Area is the final integration area; Iterations is the number of
	// refinements that led to it.
	Area       IntegrationArea
	Iterations int
	// Baseline is the offset method used, Dark whether a dark frame was
	// subtracted before it, Offset the subtracted offset (counts; 0 with
	// NoOffset) and Border the border width in pixels of the offset and
	// noise estimates.
	Baseline BaselineMethod
	Dark     bool
	Offset   float64
	Border   int
	// Noise is the standard deviation of the corrected pixels in the
	// border region (counts): the pixel noise if the border is dark.
	Noise float64
	// Peak is the largest corrected value inside the area and Total the
	// sum of the corrected values inside it (counts).
	Peak, Total float64
	// WidthNoise is the relative standard uncertainty of the widths U and
	// V (the larger of the two) that independent pixel noise of standard
	// deviation Noise causes, to first order, together with the
	// uncertainty δo = Noise/√n of a border offset from n pixels:
	//
	//	δ(σu²)² = (Noise² Σ (u_i² − σu²)² + δo² (Σ (u_i² − σu²))²) / P²
	//	δσu/σu = δ(σu²)/(2σu²)
	//
	// over the pixels of the area (u_i their distance from the centroid
	// along u; error propagation through the moment sums). The offset
	// term matters: a pedestal δo over the 3× area changes σ² by about
	// 250·δo/peak of itself for a Gaussian. A dark frame's own noise is
	// not included.
	WidthNoise float64
	// Saturated is the number of pixels at or above FullScale.
	Saturated int
	// Warnings lists the conditions that make the result doubtful, each a
	// [*ParamError] wrapping one of ErrSaturated, ErrBeamAtEdge,
	// ErrAreaClipped, ErrFewPixels, ErrLowSignal or ErrBorderOverlap.
	Warnings []error
}

// Ellipticity returns min(dσu, dσv)/max(dσu, dσv) of ISO 11146-1, between
// 0 and 1; ISO 11146-1 regards a beam with an ellipticity above 0.87 as
// round [from memory].
func (p Profile) Ellipticity() float64 {
	a, b := float64(p.U.Sigma), float64(p.V.Sigma)
	if a > b {
		a, b = b, a
	}
	return a / b
}

// Diameter returns the generalised D4σ diameter of ISO 11146-1 for a
// round beam, dσ = 2√2·√(σx² + σy²), in metres; it equals 4σ when
// σx = σy and does not depend on the axes.
func (p Profile) Diameter() units.Length {
	return units.Length(2 * math.Sqrt2 * math.Hypot(float64(p.X.Sigma), float64(p.Y.Sigma)))
}

// frameMoments are the moments over one integration area.
type frameMoments struct {
	p, mx, my, sxx, syy, sxy float64
	phi, suu, svv            float64
	peak                     float64
	pixels, inBorder         int
	noiseU, noiseV           float64 // √Σ(u² − σu²)², √Σ(v² − σv²)²
	offU, offV               float64 // Σ(u² − σu²), Σ(v² − σv²)
	widthNoise               float64 // relative, see Profile.WidthNoise
}

// frameArea is a rectangle in metres: centre, angle and half-sides; whole
// means every pixel, and seed every pixel whose value is at least above.
type frameArea struct {
	cx, cy, phi, a, b float64
	whole, seed       bool
	above             float64
}

// frameAnalysis holds the corrected frame while Profile works on it.
type frameAnalysis struct {
	e          []float64
	rows, cols int
	px, py     float64
	border     int
	// noise is the pixel noise and offNoise the standard uncertainty of
	// the subtracted offset (0 without one).
	noise, offNoise float64
}

func (fa *frameAnalysis) inBorder(c, r int) bool {
	b := fa.border
	return r < b || r >= fa.rows-b || c < b || c >= fa.cols-b
}

// frameIndexRange returns the indices i in [0, n) with lo ≤ i·pitch ≤ hi
// as i0 … i1 (empty when i0 > i1), clamped in floating point so that a
// huge or infinite bound cannot overflow the conversion to int.
func frameIndexRange(lo, hi, pitch float64, n int) (i0, i1 int) {
	a := math.Max(0, math.Ceil(lo/pitch))
	b := math.Min(float64(n-1), math.Floor(hi/pitch))
	if !(a <= b) {
		return 1, 0
	}
	return int(a), int(b)
}

// visit calls fn for every pixel inside area, in row-major order, with
// its column and row, its value and its position x, y.
func (fa *frameAnalysis) visit(area frameArea, fn func(c, r int, e, x, y float64)) {
	c0, c1, r0, r1 := 0, fa.cols-1, 0, fa.rows-1
	cos, sin := math.Cos(area.phi), math.Sin(area.phi)
	if !area.whole {
		ex := area.a*math.Abs(cos) + area.b*math.Abs(sin)
		ey := area.a*math.Abs(sin) + area.b*math.Abs(cos)
		c0, c1 = frameIndexRange(area.cx-ex, area.cx+ex, fa.px, fa.cols)
		r0, r1 = frameIndexRange(area.cy-ey, area.cy+ey, fa.py, fa.rows)
	}
	for r := r0; r <= r1; r++ {
		y := float64(r) * fa.py
		for c := c0; c <= c1; c++ {
			x := float64(c) * fa.px
			if !area.whole {
				dx, dy := x-area.cx, y-area.cy
				u := dx*cos + dy*sin
				v := -dx*sin + dy*cos
				if math.Abs(u) > area.a || math.Abs(v) > area.b {
					continue
				}
			}
			e := fa.e[r*fa.cols+c]
			if area.seed && e < area.above {
				continue
			}
			fn(c, r, e, x, y)
		}
	}
}

// moments returns the moments of the corrected frame inside area.
func (fa *frameAnalysis) moments(area frameArea, where string) (frameMoments, error) {
	var m frameMoments
	var sx, sy float64
	m.peak = math.Inf(-1)
	fa.visit(area, func(c, r int, e, x, y float64) {
		m.p += e
		sx += e * x
		sy += e * y
		m.peak = math.Max(m.peak, e)
		m.pixels++
		if fa.inBorder(c, r) {
			m.inBorder++
		}
	})
	if !(m.p > 0) {
		return m, &ParamError{Where: where, Param: "total corrected intensity in the integration area", Value: m.p, Reason: "must be positive: no beam above the baseline", Err: ErrNotPhysical}
	}
	m.mx, m.my = sx/m.p, sy/m.p
	fa.visit(area, func(_, _ int, e, x, y float64) {
		dx, dy := x-m.mx, y-m.my
		m.sxx += e * dx * dx
		m.syy += e * dy * dy
		m.sxy += e * dx * dy
	})
	m.sxx /= m.p
	m.syy /= m.p
	m.sxy /= m.p
	switch d := m.sxx - m.syy; {
	case d != 0:
		m.phi = 0.5 * math.Atan(2*m.sxy/d)
	case m.sxy > 0:
		m.phi = math.Pi / 4
	case m.sxy < 0:
		m.phi = -math.Pi / 4
	}
	cos, sin := math.Cos(m.phi), math.Sin(m.phi)
	m.suu = m.sxx*cos*cos + 2*m.sxy*sin*cos + m.syy*sin*sin
	m.svv = m.sxx*sin*sin - 2*m.sxy*sin*cos + m.syy*cos*cos
	if area.seed {
		// A seed of one pixel (or a line of them) has no width: start
		// from at least a pixel's, so that the first area is ±6 pixels.
		pix := math.Max(fa.px, fa.py)
		m.suu, m.svv = math.Max(m.suu, pix*pix), math.Max(m.svv, pix*pix)
	}
	if !(m.suu > 0) || !(m.svv > 0) {
		return m, &ParamError{Where: where, Param: "second moments σu², σv²", Value: strconv.FormatFloat(m.suu, 'g', 4, 64) + " m², " + strconv.FormatFloat(m.svv, 'g', 4, 64) + " m²", Reason: "must be positive: negative corrected values outweigh the beam (wrong baseline or dark frame, or a beam a pixel wide)", Err: ErrNotPhysical}
	}
	fa.visit(area, func(_, _ int, _, x, y float64) {
		dx, dy := x-m.mx, y-m.my
		u := dx*cos + dy*sin
		v := -dx*sin + dy*cos
		m.noiseU += (u*u - m.suu) * (u*u - m.suu)
		m.noiseV += (v*v - m.svv) * (v*v - m.svv)
		m.offU += u*u - m.suu
		m.offV += v*v - m.svv
	})
	m.noiseU, m.noiseV = math.Sqrt(m.noiseU), math.Sqrt(m.noiseV)
	rel := func(pix, off, s2 float64) float64 {
		return math.Hypot(fa.noise*pix, fa.offNoise*off) / (2 * m.p * s2)
	}
	m.widthNoise = math.Max(rel(m.noiseU, m.offU, m.suu), rel(m.noiseV, m.offV, m.svv))
	return m, nil
}

// next returns the ISO integration area of moments m: centred on the
// centroid, aligned with the principal axes, sides three times the D4σ
// diameters.
func (m frameMoments) next() frameArea {
	return frameArea{cx: m.mx, cy: m.my, phi: m.phi, a: 1.5 * 4 * math.Sqrt(m.suu), b: 1.5 * 4 * math.Sqrt(m.svv)}
}

// converged reports whether m and the previous moments prev agree within
// the relative tolerance tol, or the noise uncertainty of the widths if
// that is larger, in both principal widths and, relative to the smaller
// width, in the centroid.
func (m frameMoments) converged(prev frameMoments, tol float64) bool {
	tol = math.Max(tol, m.widthNoise)
	du, dv := math.Sqrt(m.suu), math.Sqrt(m.svv)
	pu, pv := math.Sqrt(prev.suu), math.Sqrt(prev.svv)
	s := math.Min(du, dv)
	return math.Abs(du-pu) <= tol*du && math.Abs(dv-pv) <= tol*dv &&
		math.Abs(m.mx-prev.mx) <= tol*s && math.Abs(m.my-prev.my) <= tol*s
}

// profileOptions returns opt with the defaults filled in and checked for
// frame f.
func profileOptions(f Frame, opt *ProfileOptions, where string) (ProfileOptions, error) {
	var o ProfileOptions
	if opt != nil {
		o = *opt
	}
	side := min(f.Rows, f.Cols)
	if o.BorderWidth == 0 {
		o.BorderWidth = max(1, side/20)
	}
	if o.BorderWidth < 1 || 2*o.BorderWidth >= side {
		return o, &ParamError{Where: where, Param: "border width", Value: o.BorderWidth, Reason: "must be at least 1 pixel and less than half the smaller side (" + strconv.Itoa(side) + " pixels)", Err: ErrInput}
	}
	if o.MaxIterations == 0 {
		o.MaxIterations = DefaultMaxIterations
	}
	if o.MaxIterations < 1 {
		return o, &ParamError{Where: where, Param: "MaxIterations", Value: o.MaxIterations, Reason: "must be positive (0: the default)", Err: ErrInput}
	}
	if o.Tolerance == 0 {
		o.Tolerance = DefaultTolerance
	}
	if !frameFinite(o.Tolerance) || !(o.Tolerance > 0) || o.Tolerance >= 1 {
		return o, &ParamError{Where: where, Param: "Tolerance", Value: o.Tolerance, Reason: "must be between 0 and 1 (0: the default)", Err: ErrInput}
	}
	if o.Baseline != BorderOffset && o.Baseline != NoOffset {
		return o, &ParamError{Where: where, Param: "Baseline", Value: o.Baseline, Reason: "must be BorderOffset or NoOffset", Err: ErrInput}
	}
	if o.Dark != nil {
		d := *o.Dark
		if d.Name == "" {
			d.Name = "dark frame"
		}
		if err := d.Validate(); err != nil {
			return o, err
		}
		if d.Rows != f.Rows || d.Cols != f.Cols {
			return o, &ParamError{Where: frameWhere(d.Name), Param: "size", Value: strconv.Itoa(d.Cols) + " × " + strconv.Itoa(d.Rows) + " pixels", Reason: "must match the frame (" + strconv.Itoa(f.Cols) + " × " + strconv.Itoa(f.Rows) + ")", Err: ErrInput}
		}
	}
	return o, nil
}

// Profile returns the ISO 11146-1 centroid, second-moment widths,
// principal axes and ellipticity of the beam in f, with the iterative
// integration area of ISO 11146-1 and the baseline correction of ISO/TR
// 11146-3; opt nil means the defaults of [ProfileOptions]. It modifies
// neither f nor the dark frame.
//
// # Method
//
// ISO 11146-1:2005 (clause 3 for the moments, beam widths, azimuth and
// ellipticity; clause 7 for the integration area) and ISO/TR
// 11146-3:2004 (baseline offset correction) [clause numbers from memory],
// in this order:
//
//  1. Saturation: pixels at or above [Frame.FullScale] are counted.
//  2. Dark frame: subtracted pixel by pixel when the caller gives one.
//  3. Baseline offset: the mean of a border region of the (dark-corrected)
//     frame is subtracted ([BorderOffset], the default), or nothing
//     ([NoOffset]); [Profile.Baseline], Dark and Offset say which. The
//     standard deviation of the same region is the pixel noise. Negative
//     values after the correction are kept, since clipping them at zero
//     biases the moments upwards (ISO/TR 11146-3 [from memory]).
//  4. Seed: the moments of the pixels at or above the 1/e² level of the
//     peak, or 4 noise standard deviations if that is higher (at most
//     half the peak), give the first area. This choice of start is the
//     package's; ISO 11146-1 only asks for an iteration that converges.
//  5. Integration area: a rectangle centred on the centroid, aligned with
//     the principal axes, with sides three times the D4σ beam widths
//     (half-sides 1.5·D4σ = 6σ); the moments inside it, with every value,
//     negative ones included, give the next rectangle, until the widths
//     and the centroid change by less than the tolerance (see
//     [ProfileOptions.Tolerance]). A pixel belongs to the area when its
//     centre lies inside the rectangle or on its edge. With
//     [ProfileOptions.WholeFrame] steps 4 and 5 are replaced by the
//     moments of the whole frame.
//
// The moments over the pixels in the area, with E the corrected values, are
//
//	P = Σ E,   x̄ = Σ E·x / P,   ȳ = Σ E·y / P
//	σx² = Σ E·(x − x̄)² / P,   σy² = Σ E·(y − ȳ)² / P
//	σxy² = Σ E·(x − x̄)(y − ȳ) / P
//	φ = ½·arctan(2σxy² / (σx² − σy²)),   φ = sgn(σxy²)·45° when σx² = σy²
//	σu² = σx² cos²φ + 2σxy² sinφ cosφ + σy² sin²φ
//	σv² = σx² sin²φ − 2σxy² sinφ cosφ + σy² cos²φ
//
// where σxy² is ISO's name for the mixed moment (it can be negative), φ
// the azimuth of the principal axis u that lies within 45° of x, and σu,
// σv the widths along the principal axes; ISO 11146-1 writes their
// diameters as dσx,y = 2√2·((σx² + σy²) ± γ·((σx² − σy²)² + 4(σxy²)²)^½)^½
// with γ = sgn(σx² − σy²), which equals 4σu and 4σv. The D4σ diameter is
// 4σ and, for a TEM₀₀ beam, the 1/e² radius w is 2σ (reference-checks
// R17 [C]).
//
// # Errors
//
// It returns a [*ParamError] if f or opt is invalid, f has fewer than 3
// rows or columns ([ErrTooFewPoints]), saturated pixels are rejected
// ([ErrSaturated]), or the corrected frame has no beam: a total or peak
// inside the area that is not positive, a most negative corrected pixel
// deeper than the peak is high (a dark frame or offset that does not fit
// the frame), or second moments that are not positive ([ErrNotPhysical]).
// When the area does not converge within MaxIterations it returns the last
// result together with an error wrapping [ErrAreaNotConverged]. Doubtful
// results come back with [Profile.Warnings].
func (f Frame) Profile(opt *ProfileOptions) (Profile, error) {
	where := frameWhere(f.Name)
	if err := f.Validate(); err != nil {
		return Profile{}, err
	}
	if f.Rows < 3 || f.Cols < 3 {
		return Profile{}, &ParamError{Where: where, Param: "size", Value: strconv.Itoa(f.Cols) + " × " + strconv.Itoa(f.Rows) + " pixels", Reason: "must be at least 3 × 3 for second moments and a border", Err: ErrTooFewPoints}
	}
	o, err := profileOptions(f, opt, where)
	if err != nil {
		return Profile{}, err
	}
	p := Profile{Name: f.Name, Baseline: o.Baseline, Dark: o.Dark != nil, Border: o.BorderWidth}

	if f.FullScale > 0 {
		for _, v := range f.Data {
			if v >= f.FullScale {
				p.Saturated++
			}
		}
	}
	if p.Saturated > 0 {
		w := &ParamError{Where: where, Param: "saturated pixels", Value: p.Saturated, Reason: "at or above the full scale " + strconv.FormatFloat(f.FullScale, 'g', -1, 64) + ": the clipped peak makes the widths too large; lower the exposure or attenuate", Err: ErrSaturated}
		if o.RejectSaturated {
			return Profile{}, w
		}
		p.Warnings = append(p.Warnings, w)
	}

	fa := &frameAnalysis{e: append([]float64(nil), f.Data...), rows: f.Rows, cols: f.Cols, px: float64(f.PitchX), py: float64(f.PitchY), border: o.BorderWidth}
	if o.Dark != nil {
		for i, d := range o.Dark.Data {
			fa.e[i] -= d
		}
	}
	mean, sd, n := fa.borderStats()
	if o.Baseline == BorderOffset {
		p.Offset = mean
		for i := range fa.e {
			fa.e[i] -= mean
		}
		fa.offNoise = sd / math.Sqrt(float64(n))
	}
	p.Noise, fa.noise = sd, sd
	lo, hi := math.Inf(1), math.Inf(-1)
	for _, v := range fa.e {
		lo, hi = math.Min(lo, v), math.Max(hi, v)
	}
	if !(hi > 0) {
		return Profile{}, &ParamError{Where: where, Param: "largest corrected value", Value: hi, Reason: "must be positive: no beam above the baseline (" + p.correction() + ")", Err: ErrNotPhysical}
	}
	if -lo > hi {
		return Profile{}, &ParamError{Where: where, Param: "most negative corrected value", Value: lo, Reason: "is deeper than the peak " + strconv.FormatFloat(hi, 'g', 6, 64) + " is high: the correction (" + p.correction() + ") does not fit the frame", Err: ErrNotPhysical}
	}

	// The first moments: the whole frame with WholeFrame, else the seed
	// of the iteration, the pixels above a threshold (the ISO iteration
	// then uses every pixel of its areas, negative ones included).
	area := frameArea{whole: true, cx: float64(f.Cols-1) * fa.px / 2, cy: float64(f.Rows-1) * fa.py / 2}
	if !o.WholeFrame {
		area.seed, area.above = true, frameSeedThreshold(hi, p.Noise)
	}
	m, err := fa.moments(area, where)
	if err != nil {
		return Profile{}, err
	}
	converged := o.WholeFrame
	for !converged && p.Iterations < o.MaxIterations {
		next := m.next()
		nm, err := fa.moments(next, where)
		if err != nil {
			return Profile{}, err
		}
		p.Iterations++
		prev := m
		m, area = nm, next
		converged = m.converged(prev, o.Tolerance)
	}
	p.fill(m, area, f)
	p.warn(fa, m, area, f, where)
	if !converged {
		return p, &ParamError{Where: where, Param: "iterations", Value: p.Iterations, Reason: "reached MaxIterations with widths " + p.U.D4Sigma().String() + " × " + p.V.D4Sigma().String() + " still moving by more than the tolerance " + strconv.FormatFloat(o.Tolerance, 'g', -1, 64), Err: ErrAreaNotConverged}
	}
	return p, nil
}

// frameSeedThreshold returns the level above which pixels seed the
// integration area: the 1/e² level of the peak, or 4 noise standard
// deviations if that is higher (so that noise alone rarely passes), but
// at most half the peak (so that the peak's neighbours always do).
func frameSeedThreshold(peak, noise float64) float64 {
	return math.Min(math.Max(peak*math.Exp(-2), 4*noise), peak/2)
}

// correction describes the baseline correction of p for messages.
func (p Profile) correction() string {
	s := "offset: " + p.Baseline.String()
	if p.Dark {
		s = "dark frame, " + s
	}
	return s
}

// borderStats returns the mean, the sample standard deviation and the
// number of the pixels in the border region (two passes).
func (fa *frameAnalysis) borderStats() (mean, sd float64, n int) {
	for r := range fa.rows {
		for c := range fa.cols {
			if fa.inBorder(c, r) {
				mean += fa.e[r*fa.cols+c]
				n++
			}
		}
	}
	mean /= float64(n)
	var s2 float64
	for r := range fa.rows {
		for c := range fa.cols {
			if fa.inBorder(c, r) {
				d := fa.e[r*fa.cols+c] - mean
				s2 += d * d
			}
		}
	}
	if n > 1 {
		sd = math.Sqrt(s2 / float64(n-1))
	}
	return mean, sd, n
}

// fill copies the moments m over area into p.
func (p *Profile) fill(m frameMoments, area frameArea, f Frame) {
	p.CentroidX, p.CentroidY = units.Length(m.mx), units.Length(m.my)
	p.X.Sigma, p.Y.Sigma = units.Length(math.Sqrt(m.sxx)), units.Length(math.Sqrt(m.syy))
	p.SigmaXY = m.sxy
	p.Azimuth = units.Angle(m.phi)
	p.U.Sigma, p.V.Sigma = units.Length(math.Sqrt(m.suu)), units.Length(math.Sqrt(m.svv))
	p.Area = IntegrationArea{CenterX: units.Length(area.cx), CenterY: units.Length(area.cy), Azimuth: units.Angle(area.phi), HalfU: units.Length(area.a), HalfV: units.Length(area.b), Pixels: m.pixels, Whole: area.whole}
	if area.whole {
		p.Area.HalfU, p.Area.HalfV = units.Length(float64(f.Cols)*float64(f.PitchX)/2), units.Length(float64(f.Rows)*float64(f.PitchY)/2)
	}
	p.Peak, p.Total = m.peak, m.p
	p.WidthNoise = m.widthNoise
}

// warn adds the warnings about the result p, with moments m over area of
// the corrected frame fa.
func (p *Profile) warn(fa *frameAnalysis, m frameMoments, area frameArea, f Frame, where string) {
	add := func(param string, v any, reason string, err error) {
		p.Warnings = append(p.Warnings, &ParamError{Where: where, Param: param, Value: v, Reason: reason, Err: err})
	}
	// Frame extent: pixel edges, half a pitch beyond the outer centres.
	px, py := float64(f.PitchX), float64(f.PitchY)
	x0, x1 := -px/2, (float64(f.Cols)-0.5)*px
	y0, y1 := -py/2, (float64(f.Rows)-0.5)*py
	outside := func(cx, cy, ex, ey float64) float64 {
		return math.Max(math.Max(x0-(cx-ex), (cx+ex)-x1), math.Max(y0-(cy-ey), (cy+ey)-y1))
	}
	// The D4σ ellipse extends ±2σx, ±2σy along the frame axes.
	if d := outside(m.mx, m.my, 2*math.Sqrt(m.sxx), 2*math.Sqrt(m.syy)); d > 0 {
		add("D4σ ellipse", units.Length(d), "reaches past the frame edge by this much: the beam is cut off and its widths are too small; centre the beam or use a larger sensor", ErrBeamAtEdge)
	}
	// The integration area of the result must fit.
	cos, sin := math.Abs(math.Cos(area.phi)), math.Abs(math.Sin(area.phi))
	if d := outside(area.cx, area.cy, area.a*cos+area.b*sin, area.a*sin+area.b*cos); !area.whole && d > 0 {
		add("integration area", units.Length(d), "extends beyond the frame by this much: the moments miss the beam's tails outside it (ISO 11146-1 asks for a frame holding three times the beam widths)", ErrAreaClipped)
	}
	pix := math.Max(px, py)
	if n := 4 * math.Sqrt(math.Min(m.suu, m.svv)) / pix; n < 10 {
		add("pixels across the smaller D4σ diameter", n, "fewer than 10: pixel averaging adds p²/12 to σ² (Sheppard), "+strconv.FormatFloat(100*(math.Sqrt(1+pix*pix/12/math.Min(m.suu, m.svv))-1), 'f', 1, 64)+" % of the width here; magnify the beam", ErrFewPixels)
	}
	// Beam light in the border: the area's pixels there, or for the whole
	// frame those of the ISO area the moments define.
	inBorder := m.inBorder
	if area.whole {
		inBorder = 0
		fa.visit(m.next(), func(c, r int, _, _, _ float64) {
			if fa.inBorder(c, r) {
				inBorder++
			}
		})
	}
	if inBorder > 0 {
		what := "noise estimate includes"
		if p.Baseline == BorderOffset {
			what = "baseline offset and the noise estimate include"
		}
		add("pixels of the integration area in the border region", inBorder, "the "+what+" beam light, so the widths come out too small and their noise too large; use a larger frame, a narrower border or a dark frame", ErrBorderOverlap)
	}
	// The noise estimate is only meaningful from a dark border.
	if inBorder == 0 && p.WidthNoise > 0.01 {
		add("width noise", p.WidthNoise, "relative uncertainty of the widths above 1 % (peak "+strconv.FormatFloat(p.Peak, 'g', 4, 64)+", noise "+strconv.FormatFloat(p.Noise, 'g', 4, 64)+"); raise the exposure or average frames", ErrLowSignal)
	}
}
