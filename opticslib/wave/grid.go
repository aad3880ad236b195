package wave

import (
	"math"
	"strconv"

	"gonum.org/v1/gonum/dsp/fourier"

	"github.com/beamnote/beamnote/opticslib/beam"
	"github.com/beamnote/beamnote/opticslib/units"
)

// Grid is a 2-D sampled field on an N×N square grid: U[j*N+i] is the field
// at (x_i, y_j), with x_i = (i − N/2)·Dx and y_j = (j − N/2)·Dx.
type Grid struct {
	// U holds the N² complex samples, row by row (y index major).
	U []complex128
	// N is the number of samples per side.
	N int
	// Dx is the sample spacing in metres, in x and y.
	Dx units.Length
	// Wavelength is the vacuum wavelength λ0 in metres.
	Wavelength units.Length
	// Index is the refractive index of the medium.
	Index float64
}

// Validate returns nil if g has N ≥ 2, N² finite samples and a positive
// finite spacing, wavelength and index; otherwise an [*Error].
func (g Grid) Validate() error {
	if g.N >= 2 && len(g.U) != g.N*g.N {
		return &Error{Param: "sample count len(U)", Value: len(g.U), Reason: "must be N² = " + strconv.Itoa(g.N*g.N)}
	}
	return check(g.N, g.Dx, g.Wavelength, g.Index, g.U)
}

func (g Grid) coord(i int) float64 { return float64(i-g.N/2) * float64(g.Dx) }

// GridFromBeam samples the field of the simple-astigmatic TEM₀₀ beam b on
// an n×n grid of spacing dx (metres):
//
//	u(x, y) = √(i zRx/qx)·√(i zRy/qy) · exp(−i k x²/(2qx) − i k y²/(2qy))
//
// unit amplitude on axis at a waist (Kogelnik & Li 1966). For a round beam
// pass beam.Astigmatic{X: g, Y: g}; the prefactor is then i zR/q and the
// on-axis Gouy phase arctan(z/zR). It returns an error if b is invalid,
// has M² ≠ 1, or n or dx is invalid.
func GridFromBeam(b beam.Astigmatic, n int, dx units.Length) (Grid, error) {
	if n > MaxGridSide {
		return Grid{}, &Error{Param: "grid side n", Value: n, Reason: "must be at most " + strconv.Itoa(MaxGridSide) + " (an n×n grid of complex128 takes 16n² bytes)"}
	}
	if err := b.Validate(); err != nil {
		return Grid{}, err
	}
	if err := checkBeam(b.X, "x "); err != nil {
		return Grid{}, err
	}
	if err := checkBeam(b.Y, "y "); err != nil {
		return Grid{}, err
	}
	if err := check(n, dx, b.X.Wavelength, b.X.Index, nil); err != nil {
		return Grid{}, err
	}
	g := Grid{N: n, Dx: dx, Wavelength: b.X.Wavelength, Index: b.X.Index, U: make([]complex128, n*n)}
	px := make([]complex128, n)
	py := make([]complex128, n)
	for i := range n {
		px[i] = profile(b.X, g.coord(i))
		py[i] = profile(b.Y, g.coord(i))
	}
	for j := range n {
		for i := range n {
			g.U[j*n+i] = px[i] * py[j]
		}
	}
	return g, g.Validate()
}

// fft2 transforms u (n×n, row-major) in place: forward (Coefficients) or
// inverse (Sequence, unnormalised).
func fft2(t *fourier.CmplxFFT, u []complex128, n int, inverse bool) {
	row := make([]complex128, n)
	out := make([]complex128, n)
	do := func() {
		if inverse {
			t.Sequence(out, row)
		} else {
			t.Coefficients(out, row)
		}
	}
	for j := range n {
		copy(row, u[j*n:(j+1)*n])
		do()
		copy(u[j*n:(j+1)*n], out)
	}
	for i := range n {
		for j := range n {
			row[j] = u[j*n+i]
		}
		do()
		for j := range n {
			u[j*n+i] = out[j]
		}
	}
}

// Propagate is [Line.Propagate] for a 2-D field: u → F⁻¹[H(κ)·F[u]] with
// κ² = κx² + κy². It returns an [*Error] for invalid input, and the result
// together with [ErrUndersampled] or [ErrWrap] as [Line.Propagate] does.
func (g Grid) Propagate(z units.Length, kern Kernel) (Grid, error) {
	if err := g.Validate(); err != nil {
		return Grid{}, err
	}
	if err := checkZ(z, kern); err != nil {
		return Grid{}, err
	}
	n := g.N
	t := fourier.NewCmplxFFT(n)
	u := append([]complex128(nil), g.U...)
	fft2(t, u, n, false)
	aliased := nyquistAmplitude(u, n) > EdgeLimit
	k := 2 * math.Pi * g.Index / float64(g.Wavelength)
	k2 := make([]float64, n)
	for i := range n {
		k2[i] = kappa2(t, i, float64(g.Dx))
	}
	inv := complex(1/float64(n*n), 0)
	for j := range n {
		for i := range n {
			u[j*n+i] *= transfer(kern, k, float64(z), k2[i]+k2[j]) * inv
		}
	}
	fft2(t, u, n, true)
	out := Grid{U: u, N: n, Dx: g.Dx, Wavelength: g.Wavelength, Index: g.Index}
	return out, sampling(aliased, out.EdgeAmplitude())
}

// EdgeAmplitude returns the largest |u| in the outer frame of the window
// (N/16 samples wide), relative to the largest |u| anywhere (0 for a zero
// field).
func (g Grid) EdgeAmplitude() float64 { return windowAmplitude(g.U, g.N) }

// SecondMomentRadii returns the second-moment (D4σ/2) radii in x and y,
// 2√(⟨x²⟩ − ⟨x⟩²) and 2√(⟨y²⟩ − ⟨y⟩²) with intensity weights |u|², in
// metres (ISO 11146-1; equal to the 1/e² radii for a Gaussian). They are
// 0 for a zero field.
func (g Grid) SecondMomentRadii() (wx, wy units.Length) {
	n := g.N
	var s0, sx, sy, sxx, syy float64
	for j := range n {
		y := g.coord(j)
		for i := range n {
			v := g.U[j*n+i]
			p := real(v)*real(v) + imag(v)*imag(v)
			x := g.coord(i)
			s0 += p
			sx += p * x
			sy += p * y
			sxx += p * x * x
			syy += p * y * y
		}
	}
	if s0 == 0 {
		return 0, 0
	}
	mx, my := sx/s0, sy/s0
	return units.Length(2 * math.Sqrt(math.Max(0, sxx/s0-mx*mx))), units.Length(2 * math.Sqrt(math.Max(0, syy/s0-my*my)))
}

// MaxDiff returns the peak-normalised largest difference between g and
// ref, as [Line.MaxDiff].
func (g Grid) MaxDiff(ref Grid) (float64, error) {
	if g.N != ref.N || len(g.U) != len(ref.U) || g.Dx != ref.Dx {
		return 0, &Error{Param: "reference grid size N", Value: ref.N, Reason: "must match the field (N = " + strconv.Itoa(g.N) + ", same Dx)"}
	}
	return maxDiff(g.U, ref.U), nil
}
