package cavity

import (
	"cmp"
	"math"
	"slices"
	"strconv"

	"github.com/beamnote/beamnote/opticslib/beam"
	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/units"
)

// MaxReentrantOrder is the largest denominator Q of a rational Gouy
// fraction ψ/2π ≈ P/Q that [Cavity.ModeSpacing] reports as a degeneracy:
// the modes of order m + n = Q then fall on TEM₀₀ (re-entrant ray paths
// that close after Q round trips). Low orders matter most because they
// are the ones a misaligned or mismatched beam excites; 10 is common
// practice, no single source.
const MaxReentrantOrder = 10

// DegeneracyWindow is how close, as a fraction of the FSR, the modes of
// order Q must come to TEM₀₀ for [Cavity.ModeSpacing] to report a
// degeneracy: |Q·ψ/2π − P| ≤ 0.01. One per cent of an FSR is several
// linewidths even at a finesse of a few hundred, close enough for a
// family of higher-order modes to be pulled into a lock or to blur a
// mode-matching scan; common practice, no single source.
const DegeneracyWindow = 0.01

// exactFraction is the detuning (in FSR) below which a degeneracy or an
// overlap counts as exact: rounding leaves ~1e-15 in ψ/2π, a deliberate
// detuning is ≳ 1e-7 (a linewidth at a finesse of 10⁷).
const exactFraction = 1e-9

// Degeneracy is a rational Gouy fraction: ψ/2π ≈ P/Q in lowest terms
// with Q ≤ [MaxReentrantOrder], so that the transverse modes of order
// m + n = Q lie within [DegeneracyWindow] of an FSR of TEM₀₀ (for a
// two-mirror cavity the well-known cases are planar ψ = 0, confocal
// ψ = π and concentric ψ = 2π; reference-checks R23 and facts of the
// trade 6). The zero value (Q = 0) means none.
type Degeneracy struct {
	// P and Q are the numerator and denominator; P may exceed Q when the
	// round trip passes several foci.
	P, Q int
	// Detuning is Q·ψ/2π − P: where the order-Q modes sit relative to
	// TEM₀₀, as a fraction of the FSR (0 for an exact degeneracy).
	Detuning float64
	// Exact reports |Detuning| ≤ 1e-9, a degeneracy to rounding.
	Exact bool
	// Name is "planar", "confocal", "concentric" (linear cavities;
	// "planar-like" and so on for rings) or "re-entrant P/Q", with
	// "near-" unless Exact.
	Name string
}

// Gouy is the round-trip Gouy phase of the eigenmode in one plane and
// the transverse-mode spacing it gives.
type Gouy struct {
	// Plane is Tangential or Sagittal.
	Plane paraxial.Plane
	// Phase is the round-trip Gouy phase ψ in radians, accumulated
	// element by element along the loop (not reduced modulo 2π; it can
	// exceed 2π when the round trip passes several foci). For a
	// two-mirror cavity ψ = 2·arccos(±√(g1 g2)), the sign of g1 (and g2).
	Phase units.Angle
	// Spacing is the transverse-mode spacing FSR·ψ/2π in Hz: the
	// frequency of TEM with one more index in this plane, relative to
	// the same longitudinal order (it can exceed the FSR).
	Spacing float64
	// Degeneracy is the lowest-order rational Gouy fraction, or zero.
	Degeneracy Degeneracy
}

// Spacing is the transverse-mode structure of a cavity: the round-trip
// Gouy phase per plane and the FSR.
type Spacing struct {
	// FSR is the free spectral range in Hz ([Cavity.FSR]).
	FSR float64
	// X and Y are the tangential and sagittal planes; equal for a
	// cavity without tilted or cylindrical parts.
	X, Y Gouy
	// Inversion reports a ring with an odd number of mirrors: each
	// reflection mirrors the beam across the plane of incidence, so after
	// a round trip the tangential coordinate is inverted, and Hermite–
	// Gaussian modes with odd m (odd in x: H_m(−x) = (−1)^m H_m(x), an
	// analytic identity) pick up an extra phase π, half an FSR. The
	// unfolded paraxial model, in which heights keep their sign across a
	// fold, does not show it; [Spacing.Offset] adds it. A linear cavity
	// meets every mirror twice per round trip and never inverts.
	Inversion bool
}

// ModeSpacing returns the round-trip Gouy phase in each plane and the
// transverse-mode spacing.
//
// The round-trip Gouy phase is the phase of A + B/q for the eigenmode q:
// the on-axis amplitude after the round trip is ∝ 1/(A + B/q), and
// A + B/q = C q + D = e^{−iψ} is the eigenvalue of the round-trip matrix
// that belongs to the mode (A. E. Siegman, Lasers, 1986, ch. 20–21 [from
// memory]). arccos((A + D)/2) gives only |ψ| modulo 2π, the wrong branch
// whenever ψ > π, as in every two-mirror cavity with g1, g2 < 0: for
// g1 = g2 = −0.9, ψ/2π = arccos(−0.9)/π = 0.856, not 0.144
// (reference-checks R25). So ψ is accumulated along the loop, −arg(A + B/q)
// of each element in turn with q carried through it (as package beam
// does); the sum equals the phase of the round trip's A + B/q modulo 2π
// and is on the right branch. The frequency of TEM_mn relative to TEM₀₀
// of the same longitudinal order is then [Spacing.Offset]
//
//	Δν_mn = FSR·(m ψx + n ψy)/2π   (+ FSR/2 for odd m with Inversion)
//
// (H. Kogelnik & T. Li, Appl. Opt. 5, 1550 (1966), resonance
// frequencies ν = FSR·[q + (m + n + 1) arccos(±√(g1 g2))/π] for a
// two-mirror cavity [from memory for the equation number]; per plane for
// simple astigmatism, each transverse index with its own plane's ψ).
//
// For a round trip of ±I every q is self-consistent and gives the same
// accumulated phase (π for −I, 2πk for +I), so the spacing is defined
// though the mode is not. Other unstable or marginal planes are a
// [*ParamError] wrapping [ErrUnstable].
func (c Cavity) ModeSpacing() (Spacing, error) {
	if err := c.check(); err != nil {
		return Spacing{}, err
	}
	s := Spacing{FSR: c.FSR(), Inversion: c.kind == KindRing && len(c.mirrors)%2 == 1}
	for _, p := range []paraxial.Plane{paraxial.Tangential, paraxial.Sagittal} {
		st := c.st[p]
		var q complex128
		switch {
		case st.Class == Stable:
			// The mode at the input plane, before the surfaces at z = 0,
			// whose round trip is the loop's own matrix.
			q = eigenQ(c.loop.Matrix(p))
		case st.Boundary == MinusIdentity || st.Boundary == PlusIdentity:
			// Any beam will do: the accumulated phase is the same for all.
			q = complex(0, float64(c.loop.Length())/4)
		default:
			_, _, err := c.selfConsistent(p, 0, st.RoundTrip)
			return Spacing{}, err
		}
		psi := c.gouy(p, q)
		g := Gouy{Plane: p, Phase: units.Angle(psi), Spacing: s.FSR * psi / (2 * math.Pi), Degeneracy: c.degeneracy(psi)}
		if p == paraxial.Sagittal {
			s.Y = g
		} else {
			s.X = g
		}
	}
	return s, nil
}

// gouy accumulates the Gouy phase −arg(A + B/q) over the pieces of the
// loop in plane p, starting with q at the input plane. A space of
// positive length adds a phase in (0, π); thin elements add none.
func (c Cavity) gouy(p paraxial.Plane, q complex128) float64 {
	g := beam.Gaussian{Q: q, Wavelength: c.lambda, Index: c.loop.IndexIn()}
	psi := 0.0
	for pc := range c.loop.Walk(0, c.loop.Length()) {
		m := pc.X
		if p == paraxial.Sagittal {
			m = pc.Y
		}
		psi += float64(g.GouyShift(m))
		g = g.Transform(m, pc.IndexOut)
	}
	return psi
}

// degeneracy returns the lowest-order rational approximation of ψ/2π
// within the window, or zero.
func (c Cavity) degeneracy(psi float64) Degeneracy {
	f := psi / (2 * math.Pi)
	for q := 1; q <= MaxReentrantOrder; q++ {
		p := math.Round(f * float64(q))
		if p < 0 || gcd(int(p), q) != 1 {
			continue
		}
		det := f*float64(q) - p
		if math.Abs(det) > DegeneracyWindow {
			continue
		}
		d := Degeneracy{P: int(p), Q: q, Detuning: det, Exact: math.Abs(det) <= exactFraction}
		switch {
		case d.P == 0 && d.Q == 1:
			d.Name = "planar"
		case d.P == 1 && d.Q == 1:
			d.Name = "concentric"
		case d.P == 1 && d.Q == 2:
			d.Name = "confocal"
		default:
			d.Name = "re-entrant " + strconv.Itoa(d.P) + "/" + strconv.Itoa(d.Q)
		}
		if c.kind == KindRing && d.Q <= 2 && d.P <= 1 {
			d.Name += "-like"
		}
		if !d.Exact {
			d.Name = "near-" + d.Name
		}
		return d
	}
	return Degeneracy{}
}

func gcd(a, b int) int {
	for b != 0 {
		a, b = b, a%b
	}
	if a < 0 {
		return -a
	}
	return a
}

// Offset returns the frequency of TEM_mn relative to TEM₀₀ of the same
// longitudinal order, in Hz, m the tangential (x) and n the sagittal (y)
// index:
//
//	Δν_mn = FSR·(m ψx + n ψy)/2π,   plus FSR/2 for odd m when s.Inversion
//
// It is not reduced modulo the FSR; see [Cavity.Spectrum] for that. It
// panics if m or n is negative.
func (s Spacing) Offset(m, n int) float64 {
	if m < 0 || n < 0 {
		panic("cavity: negative transverse mode index")
	}
	v := (float64(m)*float64(s.X.Phase) + float64(n)*float64(s.Y.Phase)) / (2 * math.Pi) * s.FSR
	if s.Inversion && m%2 == 1 {
		v += s.FSR / 2
	}
	return v
}

// MaxSpectrumOrder is the largest transverse order m + n that
// [Cavity.Spectrum] lists (496 modes).
const MaxSpectrumOrder = 30

// Line is one transverse mode TEM_mn of a [Spectrum].
type Line struct {
	// M and N are the tangential and sagittal indices.
	M, N int
	// Offset is the frequency relative to TEM₀₀ of the same longitudinal
	// order in Hz ([Spacing.Offset]).
	Offset float64
	// Within is Offset reduced into [0, FSR): where the mode falls in
	// the spectrum of one FSR, with TEM₀₀ at 0.
	Within float64
	// Overlaps holds the indices in [Spectrum.Lines] of the other modes
	// within [Spectrum.Window] of this one (distances taken round the
	// FSR), in order.
	Overlaps []int
}

// Spectrum lists the transverse modes of a cavity within one FSR.
type Spectrum struct {
	// FSR is the free spectral range in Hz.
	FSR float64
	// Order is the largest m + n listed.
	Order int
	// Linewidth is the FWHM of the resonances in Hz ([Airy.Linewidth]),
	// or 0 when the reflectivities are not given.
	Linewidth float64
	// Window is the distance in Hz below which two modes overlap: the
	// Linewidth (their half-maximum bands touch; common practice, no
	// single source), or 1e-9·FSR (coincident to rounding) without one.
	Window float64
	// Lines holds every TEM_mn with m + n ≤ Order, sorted by Within
	// (then by order and m).
	Lines []Line
}

// Spectrum returns the frequencies of the transverse modes TEM_mn with
// m + n ≤ order (0 ≤ order ≤ [MaxSpectrumOrder]) within one FSR,
// relative to TEM₀₀ ([Spacing.Offset] reduced modulo the FSR), and which
// of them overlap: lie closer than a linewidth when the reflectivities
// are given, coincide otherwise. In a round cavity the modes of one
// order always coincide with each other; the overlaps that matter are
// those between different orders. It returns the errors of
// [Cavity.ModeSpacing] and a [*ParamError] for an order out of range.
func (c Cavity) Spectrum(order int) (Spectrum, error) {
	if err := c.check(); err != nil {
		return Spectrum{}, err
	}
	if order < 0 || order > MaxSpectrumOrder {
		return Spectrum{}, &ParamError{Param: "order m + n", Value: order, Reason: "must be in [0, " + strconv.Itoa(MaxSpectrumOrder) + "]"}
	}
	sp, err := c.ModeSpacing()
	if err != nil {
		return Spectrum{}, err
	}
	s := Spectrum{FSR: sp.FSR, Order: order, Window: exactFraction * sp.FSR}
	if c.haveR {
		if a, err := c.Airy(); err == nil {
			s.Linewidth, s.Window = a.Linewidth, a.Linewidth
		}
	}
	for k := 0; k <= order; k++ {
		for m := k; m >= 0; m-- {
			off := sp.Offset(m, k-m)
			w := math.Mod(off, s.FSR)
			if w < 0 {
				w += s.FSR
			}
			if s.FSR-w <= exactFraction*s.FSR {
				w = 0
			}
			s.Lines = append(s.Lines, Line{M: m, N: k - m, Offset: off, Within: w})
		}
	}
	slices.SortStableFunc(s.Lines, func(a, b Line) int {
		return cmp.Or(cmp.Compare(a.Within, b.Within), cmp.Compare(a.M+a.N, b.M+b.N), cmp.Compare(b.M, a.M))
	})
	for i := range s.Lines {
		for j := range s.Lines {
			if i == j {
				continue
			}
			d := math.Abs(s.Lines[i].Within - s.Lines[j].Within)
			if math.Min(d, s.FSR-d) <= s.Window {
				s.Lines[i].Overlaps = append(s.Lines[i].Overlaps, j)
			}
		}
	}
	return s, nil
}

// Nearest returns the transverse mode (m + n ≥ 1) of s that lies closest
// to TEM₀₀ of some longitudinal order, and its distance from it in Hz,
// taken round the FSR: min(Within, FSR − Within). This is the figure of
// merit of a reference or filter cavity's geometry: a mode closer than a
// few linewidths is excited by any residual mismatch or misalignment and
// shows beside the fundamental resonance (common practice, no single
// source). ok is false when s lists no transverse mode (Order 0).
func (s Spectrum) Nearest() (l Line, distance float64, ok bool) {
	distance = math.Inf(1)
	for _, c := range s.Lines {
		if c.M+c.N == 0 {
			continue
		}
		if d := math.Min(c.Within, s.FSR-c.Within); d < distance {
			l, distance, ok = c, d, true
		}
	}
	if !ok {
		return Line{}, 0, false
	}
	return l, distance, true
}
