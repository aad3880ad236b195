package material

import (
	"math"
	"strconv"

	"github.com/beamnote/beamnote/opticslib/units"
)

// Sellmeier returns a material following the Sellmeier formula
//
//	n² − 1 = Σᵢ Bᵢ λ²/(λ² − Cᵢ)
//
// with λ in µm and the Cᵢ in µm² (the form of the Schott data sheets), of
// 1 to 6 terms, valid from lo to hi, in the convention basis (wavelengths
// and index relative to [ReferenceAir] for [RelativeToAir], vacuum for
// [Absolute]), and with source the citation of the coefficients. The
// slices are copied. It returns a [*Error] when B and C differ in length
// or have 0 or more than 6 terms, when a coefficient is not finite, when
// a Cᵢ is negative, when lo and hi are not 0 < lo < hi < +Inf, or when
// basis is not one of the two.
func Sellmeier(name string, B, C []float64, lo, hi units.Length, basis Basis, source string) (Material, error) {
	if len(B) != len(C) {
		return Material{}, &Error{Material: name, Param: "len(C)", Value: len(C), Reason: "must equal len(B) = " + strconv.Itoa(len(B))}
	}
	if len(B) == 0 || len(B) > maxTerms {
		return Material{}, &Error{Material: name, Param: "number of terms", Value: len(B), Reason: "must be 1 to 6"}
	}
	m := Material{name: name, source: source, kind: kindSellmeier, nterm: len(B)}
	for i := range B {
		if math.IsNaN(B[i]) || math.IsInf(B[i], 0) {
			return Material{}, &Error{Material: name, Param: "B" + strconv.Itoa(i+1), Value: B[i], Reason: "must be finite"}
		}
		if !(C[i] >= 0) || math.IsInf(C[i], 1) {
			return Material{}, &Error{Material: name, Param: "C" + strconv.Itoa(i+1), Value: withUnit(C[i], "µm²"), Reason: "must be non-negative and finite"}
		}
		m.b[i], m.c[i] = B[i], C[i]
	}
	if err := m.setRange(lo, hi, basis); err != nil {
		return Material{}, err
	}
	return m, nil
}

// SellmeierFromResonances is [Sellmeier] with the resonance wavelengths
// Lᵢ in µm (the form of Malitson's papers), Cᵢ = Lᵢ²:
//
//	n² − 1 = Σᵢ Bᵢ λ²/(λ² − Lᵢ²)
//
// Errors as for [Sellmeier], with an Lᵢ < 0 refused.
func SellmeierFromResonances(name string, B, L []float64, lo, hi units.Length, basis Basis, source string) (Material, error) {
	if len(L) > maxTerms {
		return Sellmeier(name, B, L, lo, hi, basis, source) // reports the count
	}
	var c [maxTerms]float64
	for i, l := range L {
		if !(l >= 0) || math.IsInf(l, 1) {
			return Material{}, &Error{Material: name, Param: "L" + strconv.Itoa(i+1), Value: withUnit(l, "µm"), Reason: "must be non-negative and finite"}
		}
		c[i] = l * l
	}
	return Sellmeier(name, B, c[:len(L)], lo, hi, basis, source)
}

// setRange validates and sets the range and basis.
func (m *Material) setRange(lo, hi units.Length, basis Basis) error {
	if basis != Absolute && basis != RelativeToAir {
		return &Error{Material: m.name, Param: "basis", Value: int(basis), Reason: "must be Absolute or RelativeToAir"}
	}
	if !(lo > 0) || !(hi > lo) || math.IsInf(float64(hi), 1) {
		return &Error{Material: m.name, Param: "validity range lo – hi", Value: lo.String() + " – " + hi.String(), Reason: "must satisfy 0 < lo < hi < +Inf"}
	}
	m.lo, m.hi, m.basis = lo, hi, basis
	if basis == RelativeToAir {
		m.ref = referenceAir
	}
	return nil
}

// ModelGlass returns a model glass of the catalogue values nd (at the
// helium d line) and Abbe number vd: the two-term Cauchy formula
//
//	n(λ) = A + B/λ²,   B = (nd − 1)/(vd·(1/λF² − 1/λC²)),   A = nd − B/λd²
//
// relative to [ReferenceAir] at air wavelengths ([RelativeToAir]), with
// the lines [LineD], [LineF], [LineC]. It reproduces nd and
// nF − nC = (nd − 1)/vd, hence vd, to rounding. The model is meant for
// the visible, 0.4–0.7 µm (its range, which [Material.CheckRange] warns
// outside); it has no infrared pole, so it overestimates the index in the
// near infrared (for N-BK7's nd and vd: 9e-5 above N-BK7 at 0.4 µm, 1.3e-4
// at 0.7 µm, 1.7e-3 at 1.064 µm; see the tests). The
// two-term Cauchy form is A. L. Cauchy's (1836); its use as a model glass
// from (nd, vd) is common practice, no single source. It returns a
// [*Error] unless nd > 1 and vd > 0 are finite.
func ModelGlass(nd, vd float64) (Material, error) {
	name := "model glass nd = " + strconv.FormatFloat(nd, 'f', -1, 64) + ", vd = " + strconv.FormatFloat(vd, 'f', -1, 64)
	if !(nd > 1) || math.IsInf(nd, 1) {
		return Material{}, &Error{Material: name, Param: "nd", Value: nd, Reason: "must be greater than 1 and finite"}
	}
	if !(vd > 0) || math.IsInf(vd, 1) {
		return Material{}, &Error{Material: name, Param: "vd", Value: vd, Reason: "must be positive and finite"}
	}
	ld, lf, lc := LineD.Micrometers(), LineF.Micrometers(), LineC.Micrometers()
	B := (nd - 1) / vd / (1/(lf*lf) - 1/(lc*lc))
	m := Material{
		name:   name,
		source: "two-term Cauchy model through nd and nF − nC = (nd − 1)/vd (common practice, no single source)",
		kind:   kindCauchy,
	}
	m.b[0], m.b[1] = nd-B/(ld*ld), B
	if err := m.setRange(0.4*units.Micrometer, 0.7*units.Micrometer, RelativeToAir); err != nil {
		panic("material: " + err.Error()) // constant range: cannot fail
	}
	return m, nil
}

// Constant returns a non-dispersive material of absolute index n at every
// wavelength ([Absolute], range 0 – +Inf, so [Material.CheckRange] never
// warns). Its Abbe number is infinite. It returns a [*Error] unless n is
// positive and finite.
func Constant(name string, n float64) (Material, error) {
	if !(n > 0) || math.IsInf(n, 1) {
		return Material{}, &Error{Material: name, Param: "index n", Value: n, Reason: "must be positive and finite"}
	}
	m := Material{name: name, source: "constant index", kind: kindConstant, basis: Absolute, hi: units.Length(math.Inf(1))}
	m.b[0] = n
	return m, nil
}

// Vacuum returns the vacuum: n = 1 exactly at every wavelength.
func Vacuum() Material {
	m, _ := Constant("vacuum", 1)
	m.source = "definition"
	return m
}
