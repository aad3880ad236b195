package polar

import (
	"math"
	"strconv"

	"github.com/beamnote/beamnote/opticslib/table"
)

// Element is a named Jones matrix, one part of a chain for [Trace].
type Element struct {
	// Name labels the part in the budget, for example "HWP1" or "PBS
	// transmitted"; an empty name prints as "element k" (k from 1).
	Name string
	// Matrix is the part's power-normalised Jones matrix.
	Matrix JonesMatrix
}

// Step is the beam after one element of a [Budget].
type Step struct {
	// Name is the element's name.
	Name string
	// Out is the Jones vector after the element, in the caller's power
	// normalisation.
	Out Jones
	// Power is |Out|², in the caller's power unit.
	Power float64
	// Fraction is Power over the input power (dimensionless).
	Fraction float64
	// Transmission is Power over the power before the element
	// (dimensionless); 0 when no light reached the element.
	Transmission float64
	// Ellipse is the polarization ellipse of Out (zero when Out carries
	// no light).
	Ellipse Ellipse
}

// Budget is the power and polarization state along a chain of elements,
// as [Trace] returns it.
type Budget struct {
	// Input is the Jones vector entering the first element.
	Input Jones
	// Steps holds the beam after each element, in beam order.
	Steps []Step
	// PowerUnit is the unit symbol of |Ex|² + |Ey|², as the caller
	// normalised the input ("W", "mW"), for the table header; empty
	// prints "power (input units)".
	PowerUnit string
}

// Output returns the Jones vector after the last element, or the input
// for an empty chain.
func (b Budget) Output() Jones {
	if len(b.Steps) == 0 {
		return b.Input
	}
	return b.Steps[len(b.Steps)-1].Out
}

// Trace follows the fully polarized beam in through the elements in beam
// order (the first element met is applied first) and returns the power
// and polarization state after each one. The power unit is the caller's:
// normalise in so that |Ex|² + |Ey|² is the power in W (or mW, and set
// [Budget.PowerUnit] for the table).
//
// It returns a [*ParamError] for an input with non-finite components or
// zero power (wrapping [ErrNoLight]), or an element with a non-finite
// entry.
func Trace(in Jones, elements ...Element) (Budget, error) {
	if err := checkState("Trace", "input", in, true); err != nil {
		return Budget{}, err
	}
	for k, e := range elements {
		if err := checkMatrix("Trace", "element "+elementName(e.Name, k), e.Matrix); err != nil {
			return Budget{}, err
		}
	}
	p0 := in.Power()
	b := Budget{Input: in, Steps: make([]Step, 0, len(elements))}
	v, prev := in, p0
	for k, e := range elements {
		v = e.Matrix.Apply(v)
		p := v.Power()
		if !finite(p) {
			return Budget{}, &ParamError{Element: "Trace", Param: "power after element " + elementName(e.Name, k), Value: p, Reason: "overflows"}
		}
		s := Step{Name: e.Name, Out: v, Power: p, Fraction: p / p0}
		if prev > 0 {
			s.Transmission = p / prev
		}
		if !dark(p, p0) {
			s.Ellipse = v.Ellipse()
		}
		b.Steps = append(b.Steps, s)
		prev = p
	}
	return b, nil
}

// dark reports a power below 1e-15 of the input power: no light left to
// speak of (rounding leaves about 1e-32 behind crossed ideal polarizers),
// so the state is not shown.
func dark(p, p0 float64) bool { return p <= 1e-15*p0 }

func elementName(name string, k int) string {
	if name != "" {
		return strconv.Quote(name)
	}
	return strconv.Itoa(k + 1)
}

// Table returns the budget as a table: one row for the input and one per
// element with the power after it (four significant digits), the
// fraction of the input power and the element's own transmission (in %,
// three decimals), the ellipse azimuth ψ and ellipticity angle χ (in
// degrees, two decimals) and the state in words ("linear", "right
// elliptical", "left circular", …, judged on the printed χ: linear when
// it rounds to 0.00°, circular when it rounds to ±45.00°, and then the
// azimuth cell is empty). Where no light is left (below 1e-15 of the
// input) the state cells are empty and the state reads "no light".
func (b Budget) Table() table.Table {
	unit := "input units"
	if b.PowerUnit != "" {
		unit = b.PowerUnit
	}
	t := table.Table{
		Caption: "Power and polarization after each element",
		Header:  []string{"after", "power (" + unit + ")", "of input (%)", "transmission (%)", "azimuth ψ (°)", "ellipticity χ (°)", "state"},
	}
	p0 := b.Input.Power()
	t.Rows = append(t.Rows, stateRow("input", p0, 1, "", b.Input.Ellipse(), p0 == 0))
	for k, s := range b.Steps {
		name := s.Name
		if name == "" {
			name = "element " + strconv.Itoa(k+1)
		}
		tr := ""
		if k == 0 || b.Steps[k-1].Power > 0 {
			tr = table.Fixed(100*s.Transmission, 3)
		}
		t.Rows = append(t.Rows, stateRow(name, s.Power, s.Fraction, tr, s.Ellipse, dark(s.Power, p0)))
	}
	return t
}

func stateRow(name string, p, frac float64, tr string, e Ellipse, isDark bool) []string {
	row := []string{name, table.Sig(p, 4), table.Fixed(100*frac, 3), tr}
	if isDark {
		return append(row, "", "", "no light")
	}
	words := stateWords(e)
	az := table.Fixed(e.Azimuth.Degrees(), 2)
	if words == "right circular" || words == "left circular" {
		az = "" // circular light has no azimuth
	}
	return append(row, az, table.Fixed(e.Ellipticity.Degrees(), 2), words)
}

// stateWords names the state judged on χ as printed with two decimals.
func stateWords(e Ellipse) string {
	chi := math.Round(e.Ellipticity.Degrees() * 100)
	switch {
	case chi == 0:
		return "linear"
	case chi == 4500:
		return "right circular"
	case chi == -4500:
		return "left circular"
	case chi > 0:
		return "right elliptical"
	}
	return "left elliptical"
}
