package stock_test

import (
	"fmt"
	"strings"

	"github.com/beamnote/beamnote/opticslib/beam"
	"github.com/beamnote/beamnote/opticslib/design"
	"github.com/beamnote/beamnote/opticslib/stock"
	"github.com/beamnote/beamnote/opticslib/units"
)

// A small drawer, as a lab writes it: focal lengths for catalogue
// singlets and an achromat, radii and thickness for a lens whose box
// states them (the focal length then follows from the lensmaker's
// equation; radii in parentheses are the kind's shape, derived).
func ExampleRead() {
	const file = `# Drawer 3 of an invented optics lab
label,kind,f_mm,r1_mm,r2_mm,ct_mm,diameter_mm,material,count,note
PCX-050-A,plano-convex,50,,,,25.4,N-BK7,2,
BCX-100-A,biconvex,,102.4,-102.4,3.6,25.4,N-BK7,1,"scratch at edge, fine for alignment"
PCV-025-H,plano-concave,-25,,,,12.7,fused silica,1,
ACH-200-A,achromat,200,,,,25.4,,1,
`
	st, err := stock.Read(strings.NewReader(file), "drawer-3.csv")
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Print(st.Table().Text())
	l, _ := st.Lens("BCX-100-A")
	_, back := l.PrincipalPlanes()
	fmt.Printf("BCX-100-A: f = %.2f mm, q = %.1f, H′ %.3f mm from the back vertex\n", l.Focal.Millimeters(), l.ShapeFactor(), back.Millimeters())

	_, err = stock.Read(strings.NewReader("label,kind,f_mm,diameter_mm,material,count\nPCX-075-A,plano-convex,75,-25.4,N-BK7,1\n"), "drawer-4.csv")
	fmt.Println(err)
	// Output:
	// Lens stock drawer-3.csv (4 entries, 5 lenses)
	// label      kind                         f (mm)  R1 (mm)   R2 (mm)  ct (mm)  Ø (mm)  clear Ø (mm)  index   count  note
	// ---------  ---------------------------  ------  --------  -------  -------  ------  ------------  ------  -----  -----------------------------------
	// PCX-050-A  plano-convex, N-BK7          50.00   (25.84)   (∞)               25.4    22.86         1.5168  2
	// BCX-100-A  biconvex, N-BK7              99.67   102.40    -102.40  3.60     25.4    22.86         1.5168  1      scratch at edge, fine for alignment
	// PCV-025-H  plano-concave, fused silica  -25.00  (-11.46)  (∞)               12.7    11.43         1.4585  1
	// ACH-200-A  achromat                     200.00                              25.4    22.86                 1
	// BCX-100-A: f = 99.67 mm, q = 0.0, H′ -1.194 mm from the back vertex
	// stock: drawer-4.csv line 2: column diameter_mm = -25.4 mm: must be positive and at most 1 m: bad input
}

// Expand and collimate a HeNe laser's 0.5 mm waist to 1.5 mm (3×) with
// two lenses from the drawer, within a 350 mm path. The spacing is
// solved for collimation (the output waist in L2's back focal plane,
// within a tenth of its Rayleigh range); the output radius and length
// are goals. The Galilean pairs (a negative lens first) are shorter and
// win; the table says how to mount each lens and how precisely to set
// the spacing. The first pair turns its plano-concave lens flat side
// first, so that its spherical aberration (of the opposite sign to the
// positive lens's) cancels part of the second lens's.
func ExampleSearch_Run() {
	const mm = units.Millimeter
	const file = `label,kind,f_mm,diameter_mm,material,count
PCV-050-A,plano-concave,-50,25.4,N-BK7,1
PCX-050-A,plano-convex,50,25.4,N-BK7,2
PCX-100-A,plano-convex,100,25.4,N-BK7,1
PCX-150-A,plano-convex,150,25.4,N-BK7,1
PCX-200-A,plano-convex,200,25.4,N-BK7,1
ACH-150-A,achromat,150,25.4,,1
`
	st, _ := stock.Read(strings.NewReader(file), "drawer.csv")
	laser, _ := beam.FromWaist(beam.WaistSpec{WaistRadius: 0.5 * mm, Wavelength: 633 * units.Nanometer})
	s := stock.Search{
		In:     laser,
		Before: 80 * mm, // from the laser's waist to the first lens mount
		Lenses: 2,
		Solve:  []stock.Condition{stock.Collimate(0.1)},
		Goals: []design.Goal{
			design.Near("output radius", design.WaistRadius(laser), 1.5*mm, 0.05*mm),
			design.AtMost("path length", design.TotalLength(), 350*mm),
		},
	}
	r, err := s.Run(st)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Print(r.Table().Text())
	fmt.Print(r.RejectionTable().Text())
	best, _ := r.Best()
	fmt.Print(best.Table().Text())
	// Output:
	// Best lens pairs: 4 solutions of 31 combinations meet every goal
	// rank  lenses               mount                     spacings (mm)  length (mm)  spacing tol ± (mm)  fill w/a (%)  SA rms (λ)  score
	// ----  -------------------  ------------------------  -------------  -----------  ------------------  ------------  ----------  ------
	// 1     PCV-050-A+PCX-150-A  flat first, flat first    100.21         180.21       0.199               13.2          7.4e-05     0.815
	// 2     PCV-050-A+ACH-150-A  curved first, –           100.21         180.21       0.199               13.2          8.22e-05    0.8151
	// 3     PCX-050-A+ACH-150-A  curved first, –           200.05         280.05       0.201               13.1          8.26e-05    0.9091
	// 4     PCX-050-A+PCX-150-A  curved first, flat first  200.05         280.05       0.201               13.1          0.000328    0.9125
	// Why lens pairs were rejected (31 combinations, 29 solutions within the bounds, 4 meet every goal)
	// reason                         count
	// -----------------------------  -----
	// a spacing below MinGap = 5 mm  2
	// misses goal "output radius"    25
	// Candidate 1: PCV-050-A+PCX-150-A, length 180.21 mm; score 0.815 = length 0.18 + tolerance 0.502 + aperture 0.132 + aberration 0.00104
	// lens  label      kind           f (mm)  mount       spacing after (mm)  glass gap after (mm)  w (mm)  clear radius (mm)
	// ----  ---------  -------------  ------  ----------  ------------------  --------------------  ------  -----------------
	// L1    PCV-050-A  plano-concave  -50     flat first  100.209             100.209               0.501   11.43
	// L2    PCX-150-A  plano-convex   150     flat first                                            1.508   11.43
}

// Thin-lens shape-factor theory for a plano-convex N-BK7 lens of 100 mm
// in a collimated beam (conjugate factor −1) at a 5 mm marginal height:
// curved side first (q = +1) is close to Coddington's best form
// (q = 0.740 for n = 1.5168); turned round (q = −1) it has about four
// times the spherical aberration. (The exact ray trace of the tests gives
// −0.2747 mm and −1.0809 mm for 0.2 mm thick lenses.)
func ExampleSphericalSeidel() {
	const mm = units.Millimeter
	n, c := 1.5168, -1.0
	for _, q := range []float64{1, -1, stock.BestShape(n, c)} {
		s := stock.SphericalSeidel(5*mm, 100*mm, n, q, c)
		u := -5.0 / 100 // marginal ray slope after the lens
		la := -float64(s) / (2 * u * u)
		fmt.Printf("q = %+.3f: S_I = %.4f µm, longitudinal %.4f mm, RMS %.1f nm\n", q, float64(s)/1e-6, la/1e-3, float64(stock.SphericalRMS(s))/1e-9)
	}
	// Output:
	// q = +1.000: S_I = 1.3705 µm, longitudinal -0.2741 mm, RMS 12.8 nm
	// q = -1.000: S_I = 5.3838 µm, longitudinal -1.0768 mm, RMS 50.2 nm
	// q = +0.740: S_I = 1.2786 µm, longitudinal -0.2557 mm, RMS 11.9 nm
}
