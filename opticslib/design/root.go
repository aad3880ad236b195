package design

import "math"

// Root returns x in [lo, hi] with f(x) = 0, for f continuous with a sign
// change over the interval (f(lo)·f(hi) ≤ 0), to within xtol (> 0) in x:
// Brent's method, which combines bisection with secant and inverse
// quadratic interpolation and never needs more than about (log2((hi −
// lo)/xtol))² evaluations (R. P. Brent, Algorithms for Minimization
// without Derivatives, Prentice-Hall 1973, ch. 4; the algorithm "zero").
// Use it for single conditions such as the spacing that collimates a beam
// (the zero of the output wavefront curvature) or places a waist.
//
// It returns a *ParamError wrapping [ErrNoBracket] with both end values
// when f does not change sign, [ErrNotFinite] when f returns NaN or ±Inf,
// [ErrBounds] for an empty or non-finite interval, and f's own error
// (wrapped) when f fails.
func Root(f func(x float64) (float64, error), lo, hi, xtol float64) (float64, error) {
	if math.IsNaN(lo) || math.IsNaN(hi) || math.IsInf(lo, 0) || math.IsInf(hi, 0) || !(lo < hi) {
		return 0, &ParamError{Param: "interval lo", Value: lo, Reason: "need lo < hi (= " + fmtG(hi) + "), both finite", Err: ErrBounds}
	}
	if !(xtol > 0) || math.IsInf(xtol, 0) {
		return 0, &ParamError{Param: "tolerance xtol", Value: xtol, Reason: "must be positive and finite"}
	}
	eval := func(x float64) (float64, error) {
		y, err := f(x)
		if err != nil {
			return 0, &ParamError{Param: "x", Value: x, Err: err}
		}
		if math.IsNaN(y) || math.IsInf(y, 0) {
			return 0, &ParamError{Param: "f(x) at x", Value: x, Reason: "is " + fmtG(y), Err: ErrNotFinite}
		}
		return y, nil
	}
	a, b := lo, hi
	fa, err := eval(a)
	if err != nil {
		return 0, err
	}
	fb, err := eval(b)
	if err != nil {
		return 0, err
	}
	if fa == 0 {
		return a, nil
	}
	if fb == 0 {
		return b, nil
	}
	if (fa > 0) == (fb > 0) {
		return 0, &ParamError{Param: "interval", Value: "[" + fmtG(lo) + ", " + fmtG(hi) + "]",
			Reason: "f(lo) = " + fmtG(fa) + " and f(hi) = " + fmtG(fb) + " have the same sign", Err: ErrNoBracket}
	}
	c, fc := a, fa
	d := b - a
	e := d
	const eps = 0x1p-52
	for i := 0; i < 200; i++ {
		if (fb > 0) == (fc > 0) {
			c, fc = a, fa
			d = b - a
			e = d
		}
		if math.Abs(fc) < math.Abs(fb) {
			a, b, c = b, c, b
			fa, fb, fc = fb, fc, fb
		}
		tol := 2*eps*math.Abs(b) + xtol/2
		m := (c - b) / 2
		if math.Abs(m) <= tol || fb == 0 {
			return b, nil
		}
		if math.Abs(e) >= tol && math.Abs(fa) > math.Abs(fb) {
			// Interpolate: secant when a = c, inverse quadratic otherwise.
			s := fb / fa
			var p, q float64
			if a == c {
				p = 2 * m * s
				q = 1 - s
			} else {
				q = fa / fc
				r := fb / fc
				p = s * (2*m*q*(q-r) - (b-a)*(r-1))
				q = (q - 1) * (r - 1) * (s - 1)
			}
			if p > 0 {
				q = -q
			} else {
				p = -p
			}
			if 2*p < math.Min(3*m*q-math.Abs(tol*q), math.Abs(e*q)) {
				e, d = d, p/q
			} else {
				d, e = m, m
			}
		} else {
			d, e = m, m
		}
		a, fa = b, fb
		if math.Abs(d) > tol {
			b += d
		} else if m > 0 {
			b += tol
		} else {
			b -= tol
		}
		if fb, err = eval(b); err != nil {
			return 0, err
		}
	}
	return b, nil
}
