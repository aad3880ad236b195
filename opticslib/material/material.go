package material

import (
	"math"

	"github.com/beamnote/beamnote/opticslib/units"
)

// Basis says which convention a dispersion formula uses.
type Basis uint8

// The two conventions of published index data.
const (
	// Absolute: the formula gives the index relative to vacuum as a
	// function of the vacuum wavelength (Ciddor air, IAPWS water,
	// Daimon & Masumura water, [Constant], [Vacuum]).
	Absolute Basis = iota
	// RelativeToAir: the formula gives the index relative to the
	// reference air ([ReferenceAir]) as a function of the wavelength in
	// that air: the convention of glass catalogues (Schott) and of
	// Malitson's crystal and silica data.
	RelativeToAir
)

// String returns "absolute (vacuum wavelengths)" or "relative to air (air
// wavelengths)".
func (b Basis) String() string {
	switch b {
	case Absolute:
		return "absolute (vacuum wavelengths)"
	case RelativeToAir:
		return "relative to air (air wavelengths)"
	}
	return "invalid basis"
}

// kind is the formula behind a Material.
type kind uint8

const (
	kindZero kind = iota
	kindConstant
	kindSellmeier
	kindCauchy
	kindAir
	kindWater
)

// maxTerms is the largest number of Sellmeier terms a Material holds.
const maxTerms = 6

// Material is a value: a named dispersion formula with its validity range,
// its convention ([Basis]) and its source. Make one with [ByName],
// [Sellmeier], [SellmeierFromResonances], [ModelGlass], [Constant],
// [Vacuum], [AirOf], [Water] or [WaterDaimonMasumura]; the zero Material
// is invalid and its methods return [ErrZeroMaterial].
//
// A Material holds its coefficients in fixed arrays, so copies are
// independent and its methods do not allocate.
type Material struct {
	name   string
	source string
	kind   kind
	basis  Basis
	lo, hi units.Length // validity range, in the basis's wavelength

	nterm int
	b, c  [maxTerms]float64 // Sellmeier B and C (µm²); Cauchy: b[0] = A, b[1] = B (µm²); constant: b[0] = n

	ref   airCoef // the reference air (RelativeToAir); the air itself (kindAir)
	state Air     // the air's state (kindAir), for CheckRange

	w waterCoef // IAPWS R9-97 state (kindWater)
}

// Name returns the material's name, for example "N-BK7".
func (m Material) Name() string { return m.name }

// Source returns the bibliographic source of the formula and its
// coefficients.
func (m Material) Source() string { return m.source }

// Basis returns the convention of the formula: [Absolute] or
// [RelativeToAir]. [Material.Index] is absolute whatever the basis.
func (m Material) Basis() Basis { return m.basis }

// Range returns the wavelength range over which the formula was fitted, in
// the formula's convention: air wavelengths for [RelativeToAir], vacuum
// wavelengths for [Absolute]. A constant index has the range 0 – +Inf.
func (m Material) Range() (lo, hi units.Length) { return m.lo, m.hi }

// Index returns the absolute refractive index (relative to vacuum) at the
// vacuum wavelength λ0. For a [RelativeToAir] formula it is
//
//	n_abs(λ0) = n_rel(λ_air)·n_air(λ0),   λ_air = λ0/n_air(λ0)
//
// with n_air the formula's reference air ([ReferenceAir], Ciddor 1996).
//
// Outside the validity range Index still returns the formula's value with
// a nil error; [Material.CheckRange] says so. It returns a [*Error] for
// λ0 ≤ 0, NaN or ±Inf, for the zero Material, and (wrapping
// [ErrNoRealIndex]) where the formula gives no real finite index, which
// happens only far outside the validity range, at the model's absorption
// poles. It never returns NaN or ±Inf with a nil error, and does not
// allocate.
func (m Material) Index(vacuum units.Length) (float64, error) {
	if err := m.checkWavelength(vacuum, "vacuum wavelength λ0"); err != nil {
		return 0, err
	}
	l0 := float64(vacuum / units.Micrometer)
	var n float64
	if m.basis == RelativeToAir {
		na := m.ref.index(l0)
		n = m.formula(l0/na) * na
	} else {
		n = m.formula(l0)
	}
	if !(n > 0) || math.IsInf(n, 0) {
		return 0, m.noIndex(vacuum)
	}
	return n, nil
}

// IndexInAir returns the index relative to the reference air
// ([ReferenceAir]) at the wavelength λ_air in that air: the convention of
// glass catalogues, in which the Schott data sheets state nd and Vd. For a
// [RelativeToAir] formula this is the formula itself; for an [Absolute]
// one it is n_abs(λ0)/n_air(λ0) with λ0 = λ_air·n_air(λ0) (solved by
// fixed-point iteration, to the last bit in three steps since
// dn_air/dλ·λ ≈ 1e-6). Errors as for [Material.Index].
func (m Material) IndexInAir(air units.Length) (float64, error) {
	if err := m.checkWavelength(air, "air wavelength λ"); err != nil {
		return 0, err
	}
	la := float64(air / units.Micrometer)
	var n float64
	if m.basis == RelativeToAir {
		n = m.formula(la)
	} else {
		l0 := referenceAir.vacuum(la)
		n = m.formula(l0) / referenceAir.index(l0)
	}
	if !(n > 0) || math.IsInf(n, 0) {
		return 0, m.noIndex(air)
	}
	return n, nil
}

// Dispersion is a refractive index with its first two derivatives with
// respect to the vacuum wavelength.
type Dispersion struct {
	// N is the absolute index at the vacuum wavelength λ0.
	N float64
	// DN is dn/dλ0 in 1/m.
	DN float64
	// D2N is d²n/dλ0² in 1/m².
	D2N float64
}

// Dispersion returns the absolute index n(λ0) and its analytic
// derivatives dn/dλ0 (1/m) and d²n/dλ0² (1/m²) with respect to the vacuum
// wavelength. For a [RelativeToAir] formula the chain rule runs through
// λ_air = λ0/n_air(λ0) and the factor n_air(λ0):
//
//	n_abs = r(u)·a,   u = λ0/a,   a = n_air(λ0)
//	n_abs′ = r′u′a + r a′
//	n_abs″ = (r″u′² + r′u″)a + 2r′u′a′ + r a″
//
// Errors as for [Material.Index].
func (m Material) Dispersion(vacuum units.Length) (Dispersion, error) {
	if err := m.checkWavelength(vacuum, "vacuum wavelength λ0"); err != nil {
		return Dispersion{}, err
	}
	l0 := float64(vacuum / units.Micrometer)
	var n, d1, d2 float64
	if m.basis == RelativeToAir {
		a, a1, a2 := m.ref.derivs(l0)
		u := l0 / a
		u1 := (a - l0*a1) / (a * a)
		u2 := -2*a1/(a*a) - l0*a2/(a*a) + 2*l0*a1*a1/(a*a*a)
		r, r1, r2 := m.derivs(u)
		n = r * a
		d1 = r1*u1*a + r*a1
		d2 = (r2*u1*u1+r1*u2)*a + 2*r1*u1*a1 + r*a2
	} else {
		n, d1, d2 = m.derivs(l0)
	}
	if !(n > 0) || math.IsInf(n, 0) || math.IsNaN(d1) || math.IsInf(d1, 0) || math.IsNaN(d2) || math.IsInf(d2, 0) {
		return Dispersion{}, m.noIndex(vacuum)
	}
	const um = 1e-6 // derivatives per µm → per m
	return Dispersion{N: n, DN: d1 / um, D2N: d2 / (um * um)}, nil
}

// GroupIndex returns the group index at the vacuum wavelength λ0,
//
//	n_g = n − λ0·dn/dλ0
//
// (absolute; Born & Wolf, Principles of Optics, §1.3.4 [from memory for
// the section]). Errors as for [Material.Index].
func (m Material) GroupIndex(vacuum units.Length) (float64, error) {
	d, err := m.Dispersion(vacuum)
	if err != nil {
		return 0, err
	}
	return d.N - float64(vacuum)*d.DN, nil
}

// Fraunhofer lines of the Abbe number Vd, air wavelengths: helium d,
// hydrogen F and C (Schott, TIE-29 "Refractive index and dispersion",
// 2016, table of spectral lines [from memory]; the brief's values).
const (
	LineD = 587.5618 * units.Nanometer
	LineF = 486.1327 * units.Nanometer
	LineC = 656.2725 * units.Nanometer
)

// Abbe returns the Abbe number
//
//	Vd = (nd − 1)/(nF − nC)
//
// at the lines [LineD], [LineF] and [LineC] (air wavelengths), with the
// indices in the formula's own convention: relative to the reference air
// at the air wavelengths for a [RelativeToAir] formula (the catalogue
// convention, [Material.IndexInAir]), absolute at the corresponding
// vacuum wavelengths λ0 = λ_air·n_air(λ0) for an [Absolute] one. It
// returns +Inf and an error wrapping [ErrNoDispersion] when nF = nC (a
// [Constant] or [Vacuum]), and the errors of [Material.Index].
func (m Material) Abbe() (float64, error) {
	var n [3]float64
	for i, l := range [3]units.Length{LineD, LineF, LineC} {
		var err error
		if m.basis == RelativeToAir {
			n[i], err = m.IndexInAir(l)
		} else {
			n[i], err = m.Index(units.Length(referenceAir.vacuum(l.Micrometers())) * units.Micrometer)
		}
		if err != nil {
			return 0, err
		}
	}
	if n[1] == n[2] {
		return math.Inf(1), &Error{Material: m.name, Param: "nF − nC", Value: 0.0, Err: ErrNoDispersion}
	}
	return (n[0] - 1) / (n[1] - n[2]), nil
}

// CheckRange returns nil when the vacuum wavelength λ0 lies inside the
// formula's validity range (and, for air, when the air's state lies inside
// the range Ciddor tested), and otherwise a [*RangeError]: a warning to
// show, since [Material.Index] still returns the extrapolated value. For
// a [RelativeToAir] formula the range is in air wavelengths and the
// message gives both. It returns a [*Error] for an invalid wavelength or
// the zero Material.
func (m Material) CheckRange(vacuum units.Length) error {
	if err := m.checkWavelength(vacuum, "vacuum wavelength λ0"); err != nil {
		return err
	}
	w := vacuum
	if m.basis == RelativeToAir {
		w = units.Length(float64(vacuum) / m.ref.index(float64(vacuum/units.Micrometer)))
	}
	if w < m.lo || w > m.hi {
		return &RangeError{Material: m.name, Vacuum: vacuum, Wavelength: w, Lo: m.lo, Hi: m.hi, Basis: m.basis}
	}
	if m.kind == kindAir {
		if s := m.state.outsideTested(); s != "" {
			return &RangeError{Material: m.name, Vacuum: vacuum, Wavelength: w, Lo: m.lo, Hi: m.hi, Basis: m.basis, State: s}
		}
	}
	return nil
}

// checkWavelength validates a wavelength argument and the Material.
func (m Material) checkWavelength(l units.Length, param string) error {
	if m.kind == kindZero {
		return &Error{Param: param, Value: l, Err: ErrZeroMaterial}
	}
	if !(l > 0) || math.IsInf(float64(l), 1) {
		return &Error{Material: m.name, Param: param, Value: l, Reason: "must be positive and finite"}
	}
	return nil
}

func (m Material) noIndex(l units.Length) error {
	return &Error{Material: m.name, Param: "wavelength λ", Value: l, Err: ErrNoRealIndex}
}

// formula returns the index of the formula in its own convention at the
// wavelength x in µm (air wavelength for RelativeToAir). It is NaN or
// ±Inf where the formula gives no real index.
func (m Material) formula(x float64) float64 {
	switch m.kind {
	case kindConstant:
		return m.b[0]
	case kindSellmeier:
		x2 := x * x
		s := 1.0
		for i := 0; i < m.nterm; i++ {
			s += m.b[i] * x2 / (x2 - m.c[i])
		}
		return math.Sqrt(s)
	case kindCauchy:
		return m.b[0] + m.b[1]/(x*x)
	case kindAir:
		return m.ref.index(x)
	case kindWater:
		return m.w.index(x)
	}
	return math.NaN()
}

// derivs returns the formula's value and its first two derivatives with
// respect to its own wavelength x (µm, 1/µm, 1/µm²).
func (m Material) derivs(x float64) (n, d1, d2 float64) {
	switch m.kind {
	case kindConstant:
		return m.b[0], 0, 0
	case kindSellmeier:
		// N = n² = 1 + Σ B y/(y − C), y = x².
		y := x * x
		N, Ny, Nyy := 1.0, 0.0, 0.0
		for i := 0; i < m.nterm; i++ {
			q := y - m.c[i]
			N += m.b[i] * y / q
			Ny -= m.b[i] * m.c[i] / (q * q)
			Nyy += 2 * m.b[i] * m.c[i] / (q * q * q)
		}
		return sqrtDerivs(N, Ny*2*x, Nyy*4*y+Ny*2)
	case kindCauchy:
		return m.b[0] + m.b[1]/(x*x), -2 * m.b[1] / (x * x * x), 6 * m.b[1] / (x * x * x * x)
	case kindAir:
		return m.ref.derivs(x)
	case kindWater:
		return m.w.derivs(x)
	}
	return math.NaN(), math.NaN(), math.NaN()
}

// sqrtDerivs returns n = √N and its derivatives from those of N = n²:
// N′ = 2nn′, N″ = 2n′² + 2nn″.
func sqrtDerivs(N, N1, N2 float64) (n, n1, n2 float64) {
	n = math.Sqrt(N)
	n1 = N1 / (2 * n)
	n2 = (N2 - 2*n1*n1) / (2 * n)
	return n, n1, n2
}
