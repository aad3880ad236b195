package install

import (
	"bytes"
	"image"
	"image/color"
	"image/png"
	"math"
)

// LogoSVG is the kernel's logo: a Gaussian beam's ±w(z) envelope narrowing to
// a waist, on a rounded square. It is the same drawing as [LogoPNG].
const LogoSVG = `<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 64 64" width="64" height="64">
<rect x="0" y="0" width="64" height="64" rx="12" fill="#17324d"/>
<path d="` + logoPath + `" fill="#f2b134"/>
<line x1="32" y1="8" x2="32" y2="56" stroke="#9fd3c7" stroke-width="2"/>
</svg>
`

// logoPath is the envelope polygon for LogoSVG, w(x) = 4√(1+((x−32)/6)²)
// clipped at 22, sampled every 4 px (precomputed so the SVG is a constant).
const logoPath = "M6 14.2L10 16.8L14 19.4L18 21.8L22 24.2L26 26.3L30 27.8L32 28.0L34 27.8L38 26.3L42 24.2L46 21.8L50 19.4L54 16.8L58 14.2L58 49.8L54 47.2L50 44.6L46 42.2L42 39.8L38 37.7L34 36.2L32 36.0L30 36.2L26 37.7L22 39.8L18 42.2L14 44.6L10 47.2L6 49.8Z"

// LogoPNG draws the logo as a size×size PNG (Jupyter wants 32 and 64).
func LogoPNG(size int) []byte {
	img := image.NewRGBA(image.Rect(0, 0, size, size))
	bg := color.RGBA{0x17, 0x32, 0x4d, 0xff}
	beam := color.RGBA{0xf2, 0xb1, 0x34, 0xff}
	lens := color.RGBA{0x9f, 0xd3, 0xc7, 0xff}
	s := float64(size) / 64
	r := 12 * s
	for py := 0; py < size; py++ {
		for px := 0; px < size; px++ {
			x, y := (float64(px)+0.5)/s, (float64(py)+0.5)/s
			if !inRoundedSquare(float64(px)+0.5, float64(py)+0.5, float64(size), r) {
				continue
			}
			c := bg
			w := math.Min(4*math.Sqrt(1+math.Pow((x-32)/6, 2)), 22)
			if x >= 6 && x <= 58 && math.Abs(y-32) <= w {
				c = beam
			}
			if math.Abs(x-32) <= 1 && y >= 8 && y <= 56 {
				c = lens
			}
			img.SetRGBA(px, py, c)
		}
	}
	var b bytes.Buffer
	if err := png.Encode(&b, img); err != nil {
		panic("install: encoding logo: " + err.Error()) // in-memory encoding cannot fail
	}
	return b.Bytes()
}

func inRoundedSquare(x, y, size, r float64) bool {
	cx := math.Max(r, math.Min(x, size-r))
	cy := math.Max(r, math.Min(y, size-r))
	return math.Hypot(x-cx, y-cy) <= r
}
