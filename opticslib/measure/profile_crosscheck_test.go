package measure_test

import (
	"errors"
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"

	"github.com/beamnote/beamnote/opticslib/internal/pyref"
	"github.com/beamnote/beamnote/opticslib/measure"
	"github.com/beamnote/beamnote/opticslib/units"
)

type profileXCase struct {
	Rows     int       `json:"rows"`
	Cols     int       `json:"cols"`
	Data     []float64 `json:"data"`
	Dark     []float64 `json:"dark"`
	Px       float64   `json:"px"`
	Py       float64   `json:"py"`
	Border   int       `json:"border"`
	Baseline string    `json:"baseline"`
	Whole    bool      `json:"whole"`
	Tol      float64   `json:"tol"`
	MaxIter  int       `json:"max_iter"`
}

type profileXMoments struct {
	P          float64 `json:"p"`
	X          float64 `json:"x"`
	Y          float64 `json:"y"`
	Sxx        float64 `json:"sxx"`
	Syy        float64 `json:"syy"`
	Sxy        float64 `json:"sxy"`
	Phi        float64 `json:"phi"`
	Suu        float64 `json:"suu"`
	Svv        float64 `json:"svv"`
	Pixels     int     `json:"pixels"`
	Peak       float64 `json:"peak"`
	WidthNoise float64 `json:"width_noise"`
	Iterations int     `json:"iterations"`
	Converged  bool    `json:"converged"`
}

func TestCrossCheckProfileNumPy(t *testing.T) {
	// Independent reference: testdata/crosscheck/measure_profile.py, numpy
	// 1.24 (Debian 12): the same seeded frames, corrected and summed with
	// numpy, the principal axes from numpy.linalg.eigh of the covariance
	// (LAPACK) instead of ISO 11146-1's arctan and rotation formulas, the
	// border from numpy slicing, the integration area iterated with numpy
	// masks from the documented rule. Cases: rotated elliptical beams
	// with offset and noise, rectangular pixels, a dark frame with a fixed
	// pattern, no offset, the whole frame, a near-round beam, and an
	// iteration stopped after 2 areas.
	//
	// Tolerances. Both sides add the same 2·10⁴ terms in different orders
	// (numpy pairwise, Go in sequence): rounding ~1e-16·√N relative to
	// Σ|terms|, and noise makes the signed sums up to ~10 times smaller
	// than Σ|terms|, so rel 1e-11 on P and the second moments, abs 1e-11
	// of the pixel pitch on the centroid, abs 1e-9 rad on the azimuth
	// (the eigenvector's rounding over the eigenvalue gap, ≥ 1e-2 of σ²
	// here), rel 1e-9 on WidthNoise (square roots of sums of fourth
	// powers). The masks, iteration counts and pixel counts must agree
	// exactly: a pixel centre within ~1e-13 of a rectangle's edge would
	// flip, which the seeded geometry does not produce.
	rng := rand.New(rand.NewPCG(1, 1))
	type gcase struct {
		s    profileSynth
		opt  measure.ProfileOptions
		dark bool
	}
	var gcases []gcase
	for i := range 7 {
		s := profileSynth{
			rows: 120 + 10*i, cols: 160 - 5*i, px: 5 * profileUm, py: 5 * profileUm,
			wu: units.Length(50+40*rng.Float64()) * profileUm, theta: units.Angle((rng.Float64() - 0.5) * math.Pi),
			peak: 1000 + 3000*rng.Float64(), offset: 100 * rng.Float64(), noise: 2 + 4*rng.Float64(), seed: uint64(i + 1),
		}
		s.wv = s.wu * units.Length(0.5+0.4*rng.Float64())
		s.x0 = units.Length(float64(s.cols)*(0.4+0.2*rng.Float64())) * s.px
		s.y0 = units.Length(float64(s.rows)*(0.4+0.2*rng.Float64())) * s.py
		c := gcase{s: s}
		switch i {
		case 1:
			c.s.py = 4 * profileUm
			c.s.theta = -50 * profileDeg
		case 2:
			c.dark = true
		case 3:
			c.s.offset = 0
			c.opt.Baseline = measure.NoOffset
		case 4:
			c.opt.WholeFrame = true
		case 5:
			c.s.wv = c.s.wu * 0.97
		case 6:
			c.opt.MaxIterations = 2
		}
		c.opt.BorderWidth = 4 + i%3
		gcases = append(gcases, c)
	}
	var cases []profileXCase
	var frames []measure.Frame
	for i, c := range gcases {
		f := c.s.frame(t)
		xc := profileXCase{Rows: f.Rows, Cols: f.Cols, Data: f.Data, Px: float64(f.PitchX), Py: float64(f.PitchY), Border: c.opt.BorderWidth,
			Baseline: "border", Whole: c.opt.WholeFrame, Tol: measure.DefaultTolerance, MaxIter: measure.DefaultMaxIterations}
		if c.opt.Baseline == measure.NoOffset {
			xc.Baseline = "none"
		}
		if c.opt.MaxIterations > 0 {
			xc.MaxIter = c.opt.MaxIterations
		}
		if c.dark {
			d := measure.Frame{Rows: f.Rows, Cols: f.Cols, PitchX: f.PitchX, PitchY: f.PitchY, Data: make([]float64, len(f.Data))}
			prng := rand.New(rand.NewPCG(uint64(i), 2))
			for k := range d.Data {
				d.Data[k] = 50 + 20*prng.Float64()
				f.Data[k] += d.Data[k]
			}
			xc.Dark = d.Data
			gcases[i].opt.Dark = &d
		}
		xc.Data = f.Data
		cases = append(cases, xc)
		frames = append(frames, f)
	}
	var ref struct {
		Reference string `json:"reference"`
		Cases     []struct {
			Offset  float64          `json:"offset"`
			Noise   float64          `json:"noise"`
			NBorder int              `json:"n_border"`
			Whole   profileXMoments  `json:"whole"`
			ISO     *profileXMoments `json:"iso"`
		} `json:"cases"`
	}
	pyref.Run(t, "measure_profile.py", map[string]any{"cases": cases}, &ref)
	if len(ref.Cases) != len(cases) {
		t.Fatalf("reference returned %d cases, want %d", len(ref.Cases), len(cases))
	}
	const relTol, angTol, noiseTol = 1e-11, 1e-9, 1e-9
	var maxRel, maxAng float64
	for i, c := range gcases {
		r := ref.Cases[i]
		p, err := frames[i].Profile(&c.opt)
		if err != nil && !(c.opt.MaxIterations > 0 && errors.Is(err, measure.ErrAreaNotConverged)) {
			t.Errorf("case %d: Profile error: %v", i, err)
			continue
		}
		want := r.Whole
		if !c.opt.WholeFrame {
			if r.ISO == nil {
				t.Errorf("case %d: reference has no ISO result", i)
				continue
			}
			want = *r.ISO
			if p.Iterations != want.Iterations || (err == nil) != want.Converged {
				t.Errorf("case %d: %d iterations, converged %v; numpy %d, %v", i, p.Iterations, err == nil, want.Iterations, want.Converged)
			}
		}
		if p.Area.Pixels != want.Pixels {
			t.Errorf("case %d: area of %d pixels, numpy %d", i, p.Area.Pixels, want.Pixels)
		}
		rel := func(what string, got, w float64) {
			maxRel = math.Max(maxRel, math.Abs(got-w)/math.Abs(w))
			if !scalar.EqualWithinRel(got, w, relTol) {
				t.Errorf("case %d: %s = %.15g, numpy %.15g", i, what, got, w)
			}
		}
		sq := func(l units.Length) float64 { return float64(l * l) }
		rel("P (Total)", p.Total, want.P)
		rel("σx²", sq(p.X.Sigma), want.Sxx)
		rel("σy²", sq(p.Y.Sigma), want.Syy)
		rel("σu² (eigh)", sq(p.U.Sigma), want.Suu)
		rel("σv² (eigh)", sq(p.V.Sigma), want.Svv)
		if !scalar.EqualWithinAbs(p.SigmaXY, want.Sxy, relTol*math.Max(want.Sxx, want.Syy)) {
			t.Errorf("case %d: σxy² = %.15g, numpy %.15g", i, p.SigmaXY, want.Sxy)
		}
		if !scalar.EqualWithinAbs(float64(p.CentroidX), want.X, 1e-11*float64(frames[i].PitchX)) ||
			!scalar.EqualWithinAbs(float64(p.CentroidY), want.Y, 1e-11*float64(frames[i].PitchY)) {
			t.Errorf("case %d: centroid (%.15g, %.15g), numpy (%.15g, %.15g)", i, float64(p.CentroidX), float64(p.CentroidY), want.X, want.Y)
		}
		maxAng = math.Max(maxAng, math.Abs(float64(p.Azimuth)-want.Phi))
		if !scalar.EqualWithinAbs(float64(p.Azimuth), want.Phi, angTol) {
			t.Errorf("case %d: Azimuth = %.15g rad, numpy (eigh) %.15g rad", i, float64(p.Azimuth), want.Phi)
		}
		if !scalar.EqualWithinRel(p.WidthNoise, want.WidthNoise, noiseTol) {
			t.Errorf("case %d: WidthNoise = %.15g, numpy %.15g", i, p.WidthNoise, want.WidthNoise)
		}
		if !scalar.EqualWithinAbsOrRel(p.Offset, r.Offset, 1e-12, 1e-12) || !scalar.EqualWithinRel(p.Noise, r.Noise, 1e-12) {
			t.Errorf("case %d: offset %.15g, noise %.15g; numpy %.15g, %.15g", i, p.Offset, p.Noise, r.Offset, r.Noise)
		}
		if !scalar.EqualWithinRel(p.Peak, want.Peak, 1e-15) {
			t.Errorf("case %d: Peak = %.15g, numpy %.15g", i, p.Peak, want.Peak)
		}
	}
	t.Logf("%d frames against %s: max rel Δ %.3g, max |Δφ| %.3g rad", len(cases), ref.Reference, maxRel, maxAng)
}
