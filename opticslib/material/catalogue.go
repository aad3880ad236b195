package material

import (
	"strings"

	"github.com/beamnote/beamnote/opticslib/internal/errtext"

	"github.com/beamnote/beamnote/opticslib/units"
)

// entry is one named material of the catalogue.
type entry struct {
	name  string
	build func() (Material, error)
}

const um = units.Micrometer

func resonances(name string, B, L []float64, lo, hi units.Length, source string) func() (Material, error) {
	return func() (Material, error) { return SellmeierFromResonances(name, B, L, lo, hi, RelativeToAir, source) }
}

func schott(name string, B, C []float64, lo, hi units.Length) func() (Material, error) {
	return func() (Material, error) {
		return Sellmeier(name, B, C, lo, hi, RelativeToAir, "SCHOTT optical glass data sheet "+name+" (Sellmeier coefficients B1–B3, C1–C3)")
	}
}

// catalogue lists the named materials in the order [Names] returns them.
var catalogue = []entry{
	{"vacuum", func() (Material, error) { return Vacuum(), nil }},
	{"air", func() (Material, error) { m, err := AirOf(ReferenceAir()); m.name = "air"; return m, err }},
	{"water", func() (Material, error) { m, err := Water(20, 101325); m.name = "water"; return m, err }},
	// I. H. Malitson, "Interspecimen comparison of the refractive index of
	// fused silica", J. Opt. Soc. Am. 55, 1205–1208 (1965): 0.21–3.71 µm,
	// 20 °C [C coefficients via reference-checks R01].
	{"fused silica", resonances("fused silica", []float64{0.6961663, 0.4079426, 0.8974794}, []float64{0.0684043, 0.1162414, 9.896161},
		0.21*um, 3.71*um, "I. H. Malitson, \"Interspecimen comparison of the refractive index of fused silica\", J. Opt. Soc. Am. 55, 1205–1208 (1965)")},
	// I. H. Malitson, "A redetermination of some optical properties of
	// calcium fluoride", Appl. Opt. 2, 1103–1107 (1963): 0.23–9.7 µm
	// [C coefficients via reference-checks R03; range from memory].
	{"CaF2", resonances("CaF2", []float64{0.5675888, 0.4710914, 3.8484723}, []float64{0.050263605, 0.1003909, 34.649040},
		0.23*um, 9.7*um, "I. H. Malitson, \"A redetermination of some optical properties of calcium fluoride\", Appl. Opt. 2, 1103–1107 (1963)")},
	// I. H. Malitson & M. J. Dodge, "Refractive index and birefringence
	// of synthetic sapphire", J. Opt. Soc. Am. 62, 1405 (1972) (abstract);
	// coefficients in M. J. Dodge, "Refractive index", Handbook of Laser
	// Science and Technology, vol. IV, CRC Press (1986), p. 30 [C: as
	// distributed by the refractiveindex.info database, which cites both].
	{"sapphire-o", resonances("sapphire-o", []float64{1.4313493, 0.65054713, 5.3414021}, []float64{0.0726631, 0.1193242, 18.028251},
		0.2*um, 5.0*um, "I. H. Malitson & M. J. Dodge, J. Opt. Soc. Am. 62, 1405 (1972); M. J. Dodge, Handbook of Laser Science and Technology IV, CRC (1986), p. 30: ordinary ray, 20 °C")},
	{"sapphire-e", resonances("sapphire-e", []float64{1.5039759, 0.55069141, 6.5927379}, []float64{0.0740288, 0.1216529, 20.072248},
		0.2*um, 5.0*um, "I. H. Malitson & M. J. Dodge, J. Opt. Soc. Am. 62, 1405 (1972); M. J. Dodge, Handbook of Laser Science and Technology IV, CRC (1986), p. 30: extraordinary ray, 20 °C")},
	// SCHOTT data sheets [C: coefficients as reproduced identically in
	// several independent stored catalogues; ranges from memory].
	{"N-BK7", schott("N-BK7", []float64{1.03961212, 0.231792344, 1.01046945}, []float64{0.00600069867, 0.0200179144, 103.560653}, 0.3*um, 2.5*um)},
	{"N-SF11", schott("N-SF11", []float64{1.73759695, 0.313747346, 1.89878101}, []float64{0.013188707, 0.0623068142, 155.23629}, 0.37*um, 2.5*um)},
	{"F2", schott("F2", []float64{1.34533359, 0.209073176, 0.937357162}, []float64{0.00997743871, 0.0470450767, 111.886764}, 0.365*um, 2.5*um)},
	{"N-F2", schott("N-F2", []float64{1.39757037, 0.159201403, 1.2686543}, []float64{0.00995906143, 0.0546931752, 119.248346}, 0.365*um, 2.5*um)},
}

// Names returns the names that [ByName] knows, in a fixed order.
func Names() []string {
	s := make([]string, len(catalogue))
	for i, e := range catalogue {
		s[i] = e.name
	}
	return s
}

// ByName returns the named material of the catalogue: "vacuum", "air"
// ([ReferenceAir], Ciddor), "water" (20 °C, 101 325 Pa, IAPWS R9-97),
// "fused silica" (Malitson 1965), "CaF2" (Malitson 1963), "sapphire-o"
// and "sapphire-e" (Malitson & Dodge 1972), and the Schott glasses
// "N-BK7", "N-SF11", "F2", "N-F2". Case and surrounding spaces are
// ignored. An unknown name gives a [*Error] wrapping [ErrUnknownName]
// whose message lists the known names.
func ByName(name string) (Material, error) {
	key := strings.TrimSpace(name)
	for _, e := range catalogue {
		if strings.EqualFold(e.name, key) {
			return e.build()
		}
	}
	return Material{}, &Error{Param: "name", Value: errtext.Quote(name), Reason: "known names are " + strings.Join(Names(), ", "), Err: ErrUnknownName}
}
