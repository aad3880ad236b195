package stock

import (
	"math"
	"strconv"
	"strings"

	"github.com/beamnote/beamnote/opticslib/design"
	"github.com/beamnote/beamnote/opticslib/table"
	"github.com/beamnote/beamnote/opticslib/units"
)

// Score holds the weighted terms of a candidate's score and their sum,
// Total; lower is better (see [Search] for the terms).
type Score struct {
	Length, Tolerance, Aperture, Aberration, Total float64
}

// Candidate is a combination of stock lenses with its spacings solved
// that meets every condition and goal of a [Search].
type Candidate struct {
	// Rank is the candidate's place, from 1 for the best.
	Rank int
	// Lenses are the lenses in order along the beam, each turned the way
	// it should be mounted: Reversed[i] says lens i is turned round from
	// how the stock lists it ([Lens.Reversed]; [Lens.Facing] says which
	// side of a plano lens comes first).
	Lenses   []Lens
	Reversed []bool
	// Gaps are the solved spacings between the lenses' principal planes
	// (the thin-lens spacings d1, d2), VertexGaps the glass-to-glass
	// distances they mean (see [Lens.PrincipalPlanes]; equal to Gaps for
	// lenses given without a thickness), metres.
	Gaps, VertexGaps []units.Length
	// Length is Before + Σ Gaps + After, metres.
	Length units.Length
	// Problem is the candidate as a design problem (its System, the
	// spacings as variables within the bounds, the conditions and goals),
	// ready for tolerancing; Evaluation judges its System (the targets to
	// record).
	Problem    design.Problem
	Evaluation design.Evaluation
	// Radii are the 1/e² beam radii at the lenses (tangential plane),
	// metres; Fill is the largest beam radius over clear radius, and
	// Transmission the smallest fraction of the power a clear aperture
	// passes ([beam.CircularTransmission]).
	Radii        []units.Length
	Fill         float64
	Transmission float64
	// Sensitivity is the tolerance term before weighting: how many of its
	// tolerances the main condition moves for a placement error of
	// Search.Placement in the spacings; GapTolerance is the placement
	// error that uses up the tolerance (metres).
	Sensitivity  float64
	GapTolerance units.Length
	// Seidel is Σ S_I of third-order spherical aberration at the
	// marginal heights 1.5 w ([SphericalSeidel], metres) and RMS the RMS
	// wavefront error it means, best focus, in waves of the beam's vacuum
	// wavelength ([SphericalRMS]); with Search.Aberration = [RealRays],
	// RMS is the real-ray estimate instead (Seidel stays third order).
	Seidel units.Length
	RMS    float64
	// Score is the ranking score with its terms.
	Score Score
}

// Labels returns the stock labels joined by "+": "PCX-050-A+PCX-150-A".
func (c Candidate) Labels() string {
	s := make([]string, len(c.Lenses))
	for i, l := range c.Lenses {
		s[i] = l.Label
	}
	return strings.Join(s, "+")
}

// mount says how lens l (turned round if rev) is mounted: which side of a
// plano lens first, "reversed" or "as listed" for an asymmetric lens, and
// "" for a symmetric lens or an achromat.
func mount(l Lens, rev bool) string {
	switch {
	case l.Kind == PlanoConvex || l.Kind == PlanoConcave:
		return strings.TrimSuffix(l.Facing(), " side first") + " first"
	case l.Kind == Achromat || math.Abs(l.ShapeFactor()) < 1e-9:
		return ""
	case rev:
		return "reversed"
	}
	return "as listed"
}

// Mount says for each lens how to mount it, joined by ", " ("curved
// first, flat first"; see [Candidate.Reversed]); a symmetric lens or an
// achromat gives "–".
func (c Candidate) Mount() string {
	s := make([]string, len(c.Lenses))
	for i, l := range c.Lenses {
		s[i] = mount(l, c.Reversed[i])
		if s[i] == "" {
			s[i] = "–"
		}
	}
	return strings.Join(s, ", ")
}

func mmList(ls []units.Length, sig int) string {
	s := make([]string, len(ls))
	for i, l := range ls {
		s[i] = table.Sig(l.Millimeters(), sig)
	}
	return strings.Join(s, ", ")
}

// resultHeader is the header of [Result.Table] and the row of
// [Candidate.Row].
var resultHeader = []string{"rank", "lenses", "mount", "spacings (mm)", "length (mm)", "spacing tol ± (mm)", "fill w/a (%)", "SA rms (λ)", "score"}

// Row returns the candidate's row of [Result.Table]: rank, lenses, how
// to mount them, spacings, length, the spacing tolerance, the largest
// fill, the RMS spherical aberration in waves and the score.
func (c Candidate) Row() []string {
	return []string{strconv.Itoa(c.Rank), c.Labels(), c.Mount(), mmList(c.Gaps, 5), table.Sig(c.Length.Millimeters(), 5),
		table.Sig(c.GapTolerance.Millimeters(), 3), table.Fixed(100*c.Fill, 1), table.Sig(c.RMS, 3), table.Sig(c.Score.Total, 4)}
}

// Table returns the candidate lens by lens: position, label, kind, focal
// length, how to mount it, the spacing after it (principal planes) and
// the glass-to-glass gap, the beam radius and the clear radius there, and
// the score's terms in the caption.
func (c Candidate) Table() table.Table {
	t := table.Table{
		Caption: "Candidate " + strconv.Itoa(c.Rank) + ": " + c.Labels() + ", length " + table.Sig(c.Length.Millimeters(), 5) + " mm; score " +
			table.Sig(c.Score.Total, 4) + " = length " + table.Sig(c.Score.Length, 3) + " + tolerance " + table.Sig(c.Score.Tolerance, 3) +
			" + aperture " + table.Sig(c.Score.Aperture, 3) + " + aberration " + table.Sig(c.Score.Aberration, 3),
		Header: []string{"lens", "label", "kind", "f (mm)", "mount", "spacing after (mm)", "glass gap after (mm)", "w (mm)", "clear radius (mm)"},
	}
	for i, l := range c.Lenses {
		gap, glass := "", ""
		if i < len(c.Gaps) {
			gap, glass = table.Sig(c.Gaps[i].Millimeters(), 6), table.Sig(c.VertexGaps[i].Millimeters(), 6)
		}
		t.Rows = append(t.Rows, []string{label(i), l.Label, l.Kind.String(), table.Sig(l.Focal.Millimeters(), 5), mount(l, c.Reversed[i]),
			gap, glass, table.Sig(c.Radii[i].Millimeters(), 4), table.Sig(l.ClearRadius().Millimeters(), 4)})
	}
	return t
}

// String returns the table as text.
func (c Candidate) String() string { return c.Table().Text() }

// Rejection is one reason candidates were rejected and how many: each
// solution (a combination at one set of spacings) counts once, under the
// first test it fails; a combination with no solution counts once.
type Rejection struct {
	Reason string
	Count  int
}

// Result is the outcome of [Search.Run].
type Result struct {
	// Lenses is the number of lenses per combination.
	Lenses int
	// Combinations is the number of ordered combinations tried, Solutions
	// the number of solutions within the bounds, Met the number that met
	// every condition and goal.
	Combinations, Solutions, Met int
	// Candidates are the best of them, ranked (at most Search.Keep).
	Candidates []Candidate
	// Rejections say why the others were rejected, in the order of the
	// tests.
	Rejections []Rejection
	// Weights are the score weights used.
	Weights Weights
}

// Best returns the best candidate and whether there is one.
func (r Result) Best() (Candidate, bool) {
	if len(r.Candidates) == 0 {
		return Candidate{}, false
	}
	return r.Candidates[0], true
}

func (r Result) noun() string {
	if r.Lenses == 3 {
		return "triples"
	}
	return "pairs"
}

// Table returns one row per kept candidate ([Candidate.Row]), best first.
func (r Result) Table() table.Table {
	t := table.Table{
		Caption: "Best lens " + r.noun() + ": " + strconv.Itoa(r.Met) + " solutions of " + strconv.Itoa(r.Combinations) + " combinations meet every goal",
		Header:  resultHeader,
	}
	if len(r.Candidates) < r.Met {
		t.Caption += " (top " + strconv.Itoa(len(r.Candidates)) + " shown)"
	}
	for _, c := range r.Candidates {
		t.Rows = append(t.Rows, c.Row())
	}
	return t
}

// String returns the table as text.
func (r Result) String() string { return r.Table().Text() }

// RejectionTable returns one row per reason of rejection with its count.
func (r Result) RejectionTable() table.Table {
	t := table.Table{
		Caption: "Why lens " + r.noun() + " were rejected (" + strconv.Itoa(r.Combinations) + " combinations, " + strconv.Itoa(r.Solutions) +
			" solutions within the bounds, " + strconv.Itoa(r.Met) + " meet every goal)",
		Header: []string{"reason", "count"},
	}
	for _, j := range r.Rejections {
		t.Rows = append(t.Rows, []string{j.Reason, strconv.Itoa(j.Count)})
	}
	return t
}
