package measure

import (
	"io"
	"math"
	"slices"
	"strconv"
	"strings"

	"github.com/beamnote/beamnote/opticslib/units"
)

// WidthDefinition says how a beam width was measured: as a second moment
// of the irradiance profile (ISO 11146-1) or at the 1/e² level of the
// peak. It is what [ReadWidthScan] needs besides the file, whose column
// names say whether the widths are radii or diameters.
type WidthDefinition int

const (
	// SecondMomentWidths are computed from the second moments of the
	// profile: the diameter dσ = 4σ ("D4σ") and the radius 2σ of ISO
	// 11146-1, for any beam. M² is defined on these widths.
	SecondMomentWidths WidthDefinition = iota + 1
	// OneOverE2Widths are read where the irradiance falls to 1/e² of
	// the peak (a clip level, a Gaussian fit to a profile, a knife-edge
	// converted for a TEM₀₀ beam). For a TEM₀₀ beam they equal the
	// second-moment widths; for other beams they do not, and M² from them
	// is not ISO 11146's M² (the fit then warns).
	OneOverE2Widths
)

// String returns "second-moment" or "1/e²".
func (d WidthDefinition) String() string {
	switch d {
	case SecondMomentWidths:
		return "second-moment"
	case OneOverE2Widths:
		return "1/e²"
	}
	return "WidthDefinition(" + strconv.Itoa(int(d)) + ")"
}

// WidthKind says what the numbers of a [WidthScan] are: radii or
// diameters, second-moment or 1/e² (see [WidthDefinition]). There is no
// default: the zero value is an error that asks for one, because a radius
// read as a diameter halves the waist and quarters M², and nothing in the
// numbers shows it.
type WidthKind int

const (
	// SecondMomentDiameter is dσ = 4σ, "D4σ", the width of ISO 11146-1.
	SecondMomentDiameter WidthKind = iota + 1
	// SecondMomentRadius is dσ/2 = 2σ, which is w for a TEM₀₀ beam.
	SecondMomentRadius
	// OneOverE2Diameter is the full width 2w at 1/e² of the peak.
	OneOverE2Diameter
	// OneOverE2Radius is the 1/e² radius w.
	OneOverE2Radius
)

// String returns the kind in words, for example "second-moment diameters
// (D4σ)".
func (k WidthKind) String() string {
	switch k {
	case SecondMomentDiameter:
		return "second-moment diameters (D4σ)"
	case SecondMomentRadius:
		return "second-moment radii (2σ)"
	case OneOverE2Diameter:
		return "1/e² diameters"
	case OneOverE2Radius:
		return "1/e² radii"
	}
	return "WidthKind(" + strconv.Itoa(int(k)) + ")"
}

func (k WidthKind) valid() bool    { return k >= SecondMomentDiameter && k <= OneOverE2Radius }
func (k WidthKind) diameter() bool { return k == SecondMomentDiameter || k == OneOverE2Diameter }

// definition returns the WidthDefinition of k.
func (k WidthKind) definition() WidthDefinition {
	if k == OneOverE2Diameter || k == OneOverE2Radius {
		return OneOverE2Widths
	}
	return SecondMomentWidths
}

// MinCausticPlanes is the fewest planes [FitCaustic] fits: three
// coefficients and at least one degree of freedom for the residual. ISO
// 11146-1 asks for at least [ISOPlanes]; fewer give a warning, not an
// error.
const MinCausticPlanes = 4

// WidthScan is a caustic scan: beam widths measured at several planes
// along the beam, for [FitCaustic]. Read one from a CSV file with
// [ReadWidthScan] or fill it from Go slices:
//
//	scan := measure.WidthScan{Z: z, X: dx, Y: dy, Kind: measure.SecondMomentDiameter}
//
// Give Round for a round beam (one width per plane) or X and Y for the
// two principal axes, x the tangential and y the sagittal plane of
// package beam (the axes of a simple-astigmatic beam, ISO 11146-1). Each
// width slice is as long as Z; an uncertainty slice is nil or as long as
// its widths.
type WidthScan struct {
	// Source names the scan in messages (a file name); empty means
	// "width scan".
	Source string
	// Z holds the plane positions in metres along the axis of the scan,
	// from any origin (the rail's scale): the fitted waist positions are
	// on this axis.
	Z []units.Length
	// Round holds the widths of a round beam, in metres.
	Round []units.Length
	// X and Y hold the widths along x (tangential) and y (sagittal), in
	// metres.
	X, Y []units.Length
	// SigmaRound, SigmaX and SigmaY hold the standard uncertainties of the
	// widths (the same kind: a diameter's for diameters), in metres, or
	// are nil.
	SigmaRound, SigmaX, SigmaY []units.Length
	// Kind says what the widths are; it must be set.
	Kind WidthKind

	// lines holds the file line of each plane and names the file's
	// column of each role, when the scan was read by ReadWidthScan.
	lines []int
	names [causticRoles]string
}

// The roles of a WidthScan's slices, for messages.
const (
	causticRoleZ = iota
	causticRoleRound
	causticRoleX
	causticRoleY
	causticRoleSigmaRound
	causticRoleSigmaX
	causticRoleSigmaY
	causticRoles
)

var causticRoleFields = [causticRoles]string{"Z", "Round", "X", "Y", "SigmaRound", "SigmaX", "SigmaY"}

func (s WidthScan) source() string {
	if s.Source == "" {
		return "width scan"
	}
	return s.Source
}

// where names plane i: the file line if the scan came from a file.
func (s WidthScan) where(i int) string {
	if len(s.lines) == len(s.Z) && i >= 0 && i < len(s.lines) {
		return s.source() + " line " + strconv.Itoa(s.lines[i])
	}
	return s.source()
}

// param names the slice of role r at plane i: the file's column, or the
// field and index.
func (s WidthScan) param(r, i int) string {
	if len(s.lines) == len(s.Z) && s.names[r] != "" {
		return "column " + s.names[r]
	}
	if i < 0 {
		return causticRoleFields[r]
	}
	return causticRoleFields[r] + "[" + strconv.Itoa(i) + "]"
}

// slices returns the width and uncertainty slices by role.
func (s WidthScan) slices() [causticRoles][]units.Length {
	return [causticRoles][]units.Length{s.Z, s.Round, s.X, s.Y, s.SigmaRound, s.SigmaX, s.SigmaY}
}

// Validate returns nil if s can be fitted. Otherwise it returns a
// [*ParamError] that names the plane (the file and line for a scan read by
// [ReadWidthScan]) and wraps
//
//   - [ErrInput] for an unset Kind, both or neither of Round and X/Y, X
//     without Y, slices of different lengths, or two planes at the same z;
//   - [ErrTooFewPoints] for fewer than [MinCausticPlanes] planes;
//   - [ErrNotPhysical] for a width or uncertainty that is not positive and
//     finite, or a position that is not finite.
func (s WidthScan) Validate() error {
	src := s.source()
	if !s.Kind.valid() {
		return &ParamError{Where: src, Param: "Kind", Value: int(s.Kind), Reason: "state what the widths are: SecondMomentDiameter (D4σ, ISO 11146-1), SecondMomentRadius, OneOverE2Diameter or OneOverE2Radius", Err: ErrInput}
	}
	switch {
	case len(s.Round) > 0 && (len(s.X) > 0 || len(s.Y) > 0):
		return &ParamError{Where: src, Param: "Round", Reason: "give Round (a round beam) or X and Y, not both", Err: ErrInput}
	case len(s.Round) == 0 && len(s.X) == 0 && len(s.Y) == 0:
		return &ParamError{Where: src, Param: "widths", Reason: "none given: set Round (a round beam) or X and Y", Err: ErrInput}
	case len(s.Round) == 0 && (len(s.X) == 0 || len(s.Y) == 0):
		return &ParamError{Where: src, Param: "X, Y", Reason: "give both axes (or Round for a round beam)", Err: ErrInput}
	}
	if len(s.Round) > 0 && (s.SigmaX != nil || s.SigmaY != nil) || len(s.Round) == 0 && s.SigmaRound != nil {
		return &ParamError{Where: src, Param: "uncertainties", Reason: "SigmaRound goes with Round, SigmaX and SigmaY with X and Y", Err: ErrInput}
	}
	if len(s.Round) == 0 && (s.SigmaX == nil) != (s.SigmaY == nil) {
		return &ParamError{Where: src, Param: "uncertainties", Reason: "give SigmaX and SigmaY, or neither", Err: ErrInput}
	}
	n := len(s.Z)
	all := s.slices()
	for r, v := range all {
		if r == causticRoleZ || v == nil && r >= causticRoleSigmaRound || len(v) == 0 && r <= causticRoleY {
			continue
		}
		if len(v) != n {
			return &ParamError{Where: src, Param: s.param(r, -1), Value: len(v), Reason: "values, but Z has " + strconv.Itoa(n), Err: ErrInput}
		}
	}
	if n < MinCausticPlanes {
		return &ParamError{Where: src, Param: "planes", Value: n, Reason: "the hyperbolic fit needs at least " + strconv.Itoa(MinCausticPlanes) + " (ISO 11146-1 asks for " + strconv.Itoa(ISOPlanes) + ")", Err: ErrTooFewPoints}
	}
	for i, z := range s.Z {
		if !causticFinite(float64(z)) {
			return &ParamError{Where: s.where(i), Param: s.param(causticRoleZ, i), Value: z, Reason: "must be finite", Err: ErrNotPhysical}
		}
	}
	for r := causticRoleRound; r < causticRoles; r++ {
		what := "a width"
		if r >= causticRoleSigmaRound {
			what = "an uncertainty"
		}
		for i, v := range all[r] {
			if !causticFinite(float64(v)) || v <= 0 {
				return &ParamError{Where: s.where(i), Param: s.param(r, i), Value: v, Reason: what + " must be positive and finite", Err: ErrNotPhysical}
			}
		}
	}
	order := make([]int, n)
	for i := range order {
		order[i] = i
	}
	slices.SortStableFunc(order, func(a, b int) int {
		switch {
		case s.Z[a] < s.Z[b]:
			return -1
		case s.Z[a] > s.Z[b]:
			return 1
		}
		return 0
	})
	for k := 1; k < n; k++ {
		i, j := order[k-1], order[k]
		if s.Z[i] == s.Z[j] {
			first, second := s.where(min(i, j)), s.where(max(i, j))
			if first == second {
				first = s.param(causticRoleZ, min(i, j))
			}
			return &ParamError{Where: second, Param: s.param(causticRoleZ, max(i, j)), Value: s.Z[j],
				Reason: "repeats the position of " + first + "; average repeated readings into one plane (with their scatter as the uncertainty)", Err: ErrInput}
		}
	}
	return nil
}

func causticFinite(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }

// ReadWidthScan reads a caustic scan from a CSV file with units in the
// column names ([Columns] describes the format); source names the file in
// messages. The columns are
//
//	z        the plane position, a length (z_mm)
//	d or w   the diameter or the radius of a round beam (d_um)
//	dx, dy   or wx, wy: diameters or radii along x and y (dx_um, dy_um)
//	sigma_<width column's quantity>   optional standard uncertainties
//	         of the widths (sigma_dx_um), for all axes or none
//
// so the column letter says radius (w) or diameter (d), and def says
// whether the widths are second-moment widths ([SecondMomentWidths], ISO
// 11146-1's D4σ) or 1/e² widths ([OneOverE2Widths]): the numbers look the same
// either way, so the caller states it. Other columns are ignored. For
// example
//
//	# z on the rail scale; D4σ from the camera's second-moment analysis
//	z_mm,dx_um,dy_um,sigma_dx_um,sigma_dy_um
//	60,1120,1015,12,12
//
// It returns the errors of [ReadColumns] and of [WidthScan.Validate],
// each naming the file, line and column, and a [*ParamError] wrapping
// [ErrInput] for a missing z or width column, a mix of radii and
// diameters or of round and x/y widths, an uncertainty column that does
// not match the widths, a length column with an angle unit ("z_deg") or
// an unknown one, or an invalid def.
func ReadWidthScan(r io.Reader, source string, def WidthDefinition) (WidthScan, error) {
	cols, err := ReadColumns(r, source)
	if err != nil {
		return WidthScan{}, err
	}
	return causticScanFromColumns(cols, def)
}

func causticScanFromColumns(cols Columns, def WidthDefinition) (WidthScan, error) {
	src := cols.where()
	if def != SecondMomentWidths && def != OneOverE2Widths {
		return WidthScan{}, &ParamError{Where: src, Param: "width definition", Value: int(def), Reason: "must be SecondMomentWidths (D4σ, ISO 11146-1) or OneOverE2Widths", Err: ErrInput}
	}
	s := WidthScan{Source: cols.Source, lines: cols.lines}
	var err error
	if s.Z, err = cols.Lengths("z"); err != nil {
		return WidthScan{}, err
	}
	if zc, err := cols.Column("z"); err == nil {
		s.names[causticRoleZ] = zc.Name
	}
	hasD := cols.Has("d") || cols.Has("dx") || cols.Has("dy")
	hasW := cols.Has("w") || cols.Has("wx") || cols.Has("wy")
	if hasD && hasW {
		return WidthScan{}, &ParamError{Where: src, Param: "width columns", Reason: "mix diameters (d, dx, dy) and radii (w, wx, wy); give one kind", Err: ErrInput}
	}
	if !hasD && !hasW {
		return WidthScan{}, &ParamError{Where: src, Param: "width columns", Reason: "missing: name them d (a round beam's diameter) or w (its radius), or dx and dy (or wx and wy), with a length unit, for example d_um; the columns are " + strings.Join(cols.Names, ", "), Err: ErrInput}
	}
	l := "w"
	switch {
	case hasD && def == SecondMomentWidths:
		s.Kind, l = SecondMomentDiameter, "d"
	case hasD:
		s.Kind, l = OneOverE2Diameter, "d"
	case def == SecondMomentWidths:
		s.Kind = SecondMomentRadius
	default:
		s.Kind = OneOverE2Radius
	}
	round, axes := cols.Has(l), cols.Has(l+"x") || cols.Has(l+"y")
	switch {
	case round && axes:
		return WidthScan{}, &ParamError{Where: src, Param: "width columns", Reason: "give " + l + " (a round beam) or " + l + "x and " + l + "y, not both", Err: ErrInput}
	case axes && !(cols.Has(l+"x") && cols.Has(l+"y")):
		missing := l + "y"
		if !cols.Has(l + "x") {
			missing = l + "x"
		}
		return WidthScan{}, &ParamError{Where: src, Param: "column " + missing, Reason: "missing: give both " + l + "x and " + l + "y, or " + l + " for a round beam", Err: ErrInput}
	}
	// An uncertainty of the other kind (sigma_w beside d) is a mix-up.
	other := map[string]string{"d": "w", "w": "d"}[l]
	for _, suffix := range []string{"", "x", "y"} {
		if q := "sigma_" + other + suffix; cols.Has(q) {
			c, _ := cols.Column(q)
			return WidthScan{}, &ParamError{Where: src, Param: "column " + c.Name, Reason: "is the uncertainty of " + map[string]string{"d": "a diameter", "w": "a radius"}[other] + ", but the widths are " + map[string]string{"d": "diameters", "w": "radii"}[l] + ": name it sigma_" + l + suffix, Err: ErrInput}
		}
	}
	get := func(role int, q string, optional bool) ([]units.Length, error) {
		if optional && !cols.Has(q) {
			return nil, nil
		}
		v, err := cols.Lengths(q)
		if err != nil {
			return nil, err
		}
		c, _ := cols.Column(q)
		s.names[role] = c.Name
		return v, nil
	}
	if round {
		if s.Round, err = get(causticRoleRound, l, false); err != nil {
			return WidthScan{}, err
		}
		if cols.Has("sigma_"+l+"x") || cols.Has("sigma_"+l+"y") {
			return WidthScan{}, &ParamError{Where: src, Param: "uncertainty columns", Reason: "sigma_" + l + "x and sigma_" + l + "y go with " + l + "x and " + l + "y; for a round beam name it sigma_" + l, Err: ErrInput}
		}
		if s.SigmaRound, err = get(causticRoleSigmaRound, "sigma_"+l, true); err != nil {
			return WidthScan{}, err
		}
	} else {
		if s.X, err = get(causticRoleX, l+"x", false); err != nil {
			return WidthScan{}, err
		}
		if s.Y, err = get(causticRoleY, l+"y", false); err != nil {
			return WidthScan{}, err
		}
		if cols.Has("sigma_" + l) {
			return WidthScan{}, &ParamError{Where: src, Param: "uncertainty columns", Reason: "sigma_" + l + " goes with a round beam's " + l + "; for x and y name them sigma_" + l + "x and sigma_" + l + "y", Err: ErrInput}
		}
		if s.SigmaX, err = get(causticRoleSigmaX, "sigma_"+l+"x", true); err != nil {
			return WidthScan{}, err
		}
		if s.SigmaY, err = get(causticRoleSigmaY, "sigma_"+l+"y", true); err != nil {
			return WidthScan{}, err
		}
		if (s.SigmaX == nil) != (s.SigmaY == nil) {
			return WidthScan{}, &ParamError{Where: src, Param: "uncertainty columns", Reason: "give sigma_" + l + "x and sigma_" + l + "y, or neither", Err: ErrInput}
		}
	}
	if err := s.Validate(); err != nil {
		return WidthScan{}, err
	}
	return s, nil
}
