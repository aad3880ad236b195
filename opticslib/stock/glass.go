package stock

import "strings"

// glasses are the named materials of a stock file with their refractive
// index nd at the helium d line (587.56 nm):
//
//	N-BK7         1.5168   SCHOTT optical glass data sheet [from memory]
//	fused silica  1.4585   I. H. Malitson, "Interspecimen comparison of the
//	                       refractive index of fused silica", J. Opt. Soc.
//	                       Am. 55, 1205–1209 (1965) [from memory for the value]
//	N-SF11        1.7847   SCHOTT optical glass data sheet [from memory]
//
// The names are matched without regard to case, spaces, hyphens and
// underscores, so "n-bk7", "NBK7" and "N_BK7" are all N-BK7.
var glasses = []struct {
	name    string
	aliases []string
	nd      float64
}{
	{"N-BK7", []string{"nbk7", "bk7"}, 1.5168},
	{"fused silica", []string{"fusedsilica", "uvfs", "silica"}, 1.4585},
	{"N-SF11", []string{"nsf11", "sf11"}, 1.7847},
}

// GlassIndex returns the refractive index nd (at 587.56 nm) of a named
// material and its canonical name: N-BK7 1.5168, fused silica 1.4585 and
// N-SF11 1.7847 (SCHOTT data sheets and Malitson 1965, [from memory]).
// The name is matched without regard to case, spaces, hyphens and
// underscores; "BK7", "SF11", "UVFS" and "silica" are accepted too. It
// returns ok = false for any other name: give such a glass's index in the
// stock file's index column instead.
func GlassIndex(name string) (nd float64, canonical string, ok bool) {
	key := strings.Map(func(r rune) rune {
		switch r {
		case ' ', '-', '_':
			return -1
		}
		return r
	}, strings.ToLower(strings.TrimSpace(name)))
	for _, g := range glasses {
		for _, a := range g.aliases {
			if key == a {
				return g.nd, g.name, true
			}
		}
	}
	return 0, "", false
}

// glassList names the known glasses for messages.
func glassList() string {
	s := ""
	for i, g := range glasses {
		if i > 0 {
			s += ", "
		}
		s += g.name
	}
	return s
}
