package measure_test

import (
	"bytes"
	"encoding/binary"
	"errors"
	"image"
	"image/color"
	"image/png"
	"io/fs"
	"math"
	"os"
	"path/filepath"
	"slices"
	"strconv"
	"strings"
	"testing"

	"golang.org/x/image/tiff"

	"github.com/beamnote/beamnote/opticslib/measure"
)

func TestReadFrameCSV(t *testing.T) {
	want := []float64{1, 2.5, -3, 4e2, 0, 6}
	for _, test := range []struct {
		name, in string
	}{
		{"comma", "1,2.5,-3\n400,0,6\n"},
		{"spaces around fields, no final newline", " 1 , 2.5 ,-3\n4e2, 0 , 6"},
		{"semicolon", "1;2.5;-3\n400;0;6\n"},
		{"tab, trailing tab", "1\t2.5\t-3\t\n400\t0\t6\t\n"},
		{"spaces", "1   2.5 -3\n 400 0   6\n"},
		{"CRLF, BOM, blank and comment lines", "\uFEFF# camera dump\r\n1,2.5,-3\r\n\r\n400,0,6\r\n\r\n"},
		{"trailing comma", "1,2.5,-3,\n400,0,6,\n"},
	} {
		f, err := measure.ReadFrameCSV(strings.NewReader(test.in), "f.csv", 5*profileUm, 6*profileUm)
		if err != nil {
			t.Errorf("%s: ReadFrameCSV error: %v", test.name, err)
			continue
		}
		if f.Rows != 2 || f.Cols != 3 || !slices.Equal(f.Data, want) || f.PitchX != 5*profileUm || f.PitchY != 6*profileUm || f.Name != "f.csv" || f.FullScale != 0 {
			t.Errorf("%s: ReadFrameCSV = %+v, want 2 × 3 %v", test.name, f, want)
		}
	}
	for _, test := range []struct {
		name, in, where string
		want            error
	}{
		{"empty", "", "f.csv", measure.ErrInput},
		{"only comments", "# nothing\n\n", "f.csv", measure.ErrInput},
		{"header", "x,y,z\n1,2,3\n", "f.csv line 1", measure.ErrInput},
		{"ragged", "1,2,3\n4,5\n", "f.csv line 2", measure.ErrInput},
		{"empty cell", "1,,3\n", "f.csv line 1", measure.ErrInput},
		{"NaN", "1,2\nNaN,4\n", "f.csv line 2", measure.ErrNotPhysical},
		{"Inf", "1,-Inf\n", "f.csv line 1", measure.ErrNotPhysical},
		{"out of range", "1,1e999\n", "f.csv line 1", measure.ErrNotPhysical},
		{"decimal comma", "1,5;2,5\n", "f.csv line 1", measure.ErrInput},
	} {
		_, err := measure.ReadFrameCSV(strings.NewReader(test.in), "f.csv", profileUm, profileUm)
		var pe *measure.ParamError
		if !errors.Is(err, test.want) || !errors.As(err, &pe) || pe.Where != test.where {
			t.Errorf("%s: ReadFrameCSV error %v, want a *ParamError at %q wrapping %v", test.name, err, test.where, test.want)
		}
	}
	if _, err := measure.ReadFrameCSV(strings.NewReader("1"), "f.csv", 0, profileUm); !errors.Is(err, measure.ErrNotPhysical) {
		t.Errorf("zero pitch: error %v, want ErrNotPhysical", err)
	}
}

// profileCSV writes f as a CSV matrix with the shortest exact decimals.
func profileCSV(f measure.Frame) string {
	var b strings.Builder
	for r := range f.Rows {
		for c := range f.Cols {
			if c > 0 {
				b.WriteByte(',')
			}
			b.WriteString(strconv.FormatFloat(f.At(c, r), 'g', -1, 64))
		}
		b.WriteByte('\n')
	}
	return b.String()
}

func FuzzReadFrameCSV(f *testing.F) {
	// Any input: no panic; an accepted frame is valid (finite samples,
	// Rows·Cols of them) and survives a write and read unchanged; a
	// rejected one is a *ParamError wrapping ErrInput or ErrNotPhysical.
	for _, seed := range []string{
		"1,2,3\n4,5,6\n", "1 2\n3 4", "1;2\n3;4\n", "1\t2\t\n", "\uFEFF#c\r\n1,2\r\n",
		"", "x", "1,,2", "1,2\n3\n", "NaN", "1e999", "-0,0x1p-2,+5", ",", ";\n;", "\t\t", "1,2,\n3,4,",
	} {
		f.Add(seed)
	}
	f.Fuzz(func(t *testing.T, in string) {
		fr, err := measure.ReadFrameCSV(strings.NewReader(in), "fuzz.csv", profileUm, profileUm)
		if err != nil {
			var pe *measure.ParamError
			if !errors.As(err, &pe) || !(errors.Is(err, measure.ErrInput) || errors.Is(err, measure.ErrNotPhysical)) {
				t.Fatalf("ReadFrameCSV(%q) error %v (%T), want a *ParamError wrapping ErrInput or ErrNotPhysical", in, err, err)
			}
			return
		}
		if err := fr.Validate(); err != nil || fr.Rows < 1 || fr.Cols < 1 || len(fr.Data) != fr.Rows*fr.Cols {
			t.Fatalf("ReadFrameCSV(%q) = %d × %d, %d samples, Validate %v", in, fr.Rows, fr.Cols, len(fr.Data), err)
		}
		again, err := measure.ReadFrameCSV(strings.NewReader(profileCSV(fr)), "again.csv", profileUm, profileUm)
		if err != nil || again.Rows != fr.Rows || again.Cols != fr.Cols || !slices.Equal(again.Data, fr.Data) {
			t.Fatalf("ReadFrameCSV(%q): write and read back gave %+v, %v; want %+v", in, again, err, fr)
		}
	})
}

// profileImageFrame returns a synthetic beam frame of integer counts up to
// full, for the image round trips.
func profileImageFrame(t *testing.T, full float64) measure.Frame {
	t.Helper()
	return profileSynth{rows: 48, cols: 64, px: 5 * profileUm, py: 5 * profileUm, x0: 160 * profileUm, y0: 115 * profileUm, wu: 40 * profileUm, wv: 30 * profileUm, theta: 30 * profileDeg, peak: 0.9 * full, offset: 0.02 * full, noise: 0.002 * full, seed: 9, round: true}.frame(t)
}

// profileDeg is a degree, for the synthetic frames.
const profileDeg = math.Pi / 180

// profileWrite writes data to a file in a temporary directory and
// returns its path.
func profileWrite(t *testing.T, name string, data []byte) string {
	t.Helper()
	path := filepath.Join(t.TempDir(), name)
	if err := os.WriteFile(path, data, 0o600); err != nil {
		t.Fatalf("WriteFile error: %v", err)
	}
	return path
}

// profileEncode encodes img as PNG.
func profileEncode(t *testing.T, img image.Image) []byte {
	t.Helper()
	var b bytes.Buffer
	if err := png.Encode(&b, img); err != nil {
		t.Fatalf("png.Encode error: %v", err)
	}
	return b.Bytes()
}

func TestReadFramePNG(t *testing.T) {
	// Round trips: 8- and 16-bit gray PNGs written with image/png from a
	// synthetic frame of integer counts read back exactly, with FullScale
	// 255 or 65535; so do a gray image stored as RGB and a palette of
	// grays (the gray rule). The analysis of the read frame equals that of
	// the original frame (same numbers, so bit for bit).
	for _, depth := range []int{8, 16} {
		full := float64(int(1)<<depth - 1)
		src := profileImageFrame(t, full)
		var img image.Image
		if depth == 8 {
			g := image.NewGray(image.Rect(0, 0, src.Cols, src.Rows))
			for i, v := range src.Data {
				g.Pix[i] = uint8(v)
			}
			img = g
		} else {
			g := image.NewGray16(image.Rect(0, 0, src.Cols, src.Rows))
			for i, v := range src.Data {
				binary.BigEndian.PutUint16(g.Pix[2*i:], uint16(v))
			}
			img = g
		}
		path := profileWrite(t, "beam.png", profileEncode(t, img))
		got, err := measure.ReadFrameFile(path, src.PitchX, src.PitchY)
		if err != nil {
			t.Errorf("%d-bit: ReadFrameFile error: %v", depth, err)
			continue
		}
		if got.Rows != src.Rows || got.Cols != src.Cols || !slices.Equal(got.Data, src.Data) || got.FullScale != full || got.Name != "beam.png" {
			t.Errorf("%d-bit: read %d × %d, FullScale %g, name %q; want the %d × %d frame written, FullScale %g", depth, got.Cols, got.Rows, got.FullScale, got.Name, src.Cols, src.Rows, full)
		}
		src.FullScale, src.Name = full, "beam.png"
		p0, p1 := profileOf(t, src, nil), profileOf(t, got, nil)
		if p0.U != p1.U || p0.V != p1.V || p0.CentroidX != p1.CentroidX {
			t.Errorf("%d-bit: profile of the read frame %v, want %v", depth, p1, p0)
		}
	}

	src := profileImageFrame(t, 255)
	rgb := image.NewRGBA(image.Rect(0, 0, src.Cols, src.Rows))
	pal := image.NewPaletted(image.Rect(0, 0, src.Cols, src.Rows), nil)
	for i := range 256 {
		pal.Palette = append(pal.Palette, color.Gray{Y: uint8(i)})
	}
	for i, v := range src.Data {
		rgb.Set(i%src.Cols, i/src.Cols, color.RGBA{R: uint8(v), G: uint8(v), B: uint8(v), A: 255})
		pal.SetColorIndex(i%src.Cols, i/src.Cols, uint8(v))
	}
	for _, test := range []struct {
		name string
		img  image.Image
	}{{"gray RGB", rgb}, {"gray palette", pal}} {
		got, err := measure.ReadFramePNG(bytes.NewReader(profileEncode(t, test.img)), "x.png", profileUm, profileUm)
		if err != nil || !slices.Equal(got.Data, src.Data) || got.FullScale != 255 {
			t.Errorf("%s: ReadFramePNG = FullScale %g, error %v; want the frame written, FullScale 255", test.name, got.FullScale, err)
		}
	}

	colour := image.NewRGBA(image.Rect(0, 0, 4, 4))
	transparent := image.NewNRGBA(image.Rect(0, 0, 4, 4))
	twoColour := image.NewPaletted(image.Rect(0, 0, 4, 4), color.Palette{color.Gray{}, color.Gray{Y: 255}})
	for i := range 16 {
		colour.Set(i%4, i/4, color.RGBA{R: 200, G: 10, B: 10, A: 255})
		transparent.Set(i%4, i/4, color.NRGBA{R: 9, G: 9, B: 9, A: 100})
	}
	eight := profileEncode(t, image.NewGray(image.Rect(0, 0, 4, 4)))
	for _, test := range []struct {
		name  string
		data  []byte
		param string
	}{
		{"colour", profileEncode(t, colour), "pixel (x 0, y 0) (R, G, B)"},
		{"transparent", profileEncode(t, transparent), "pixel (x 0, y 0) alpha"},
		{"1-bit palette", profileEncode(t, twoColour), "bit depth"},
		{"not a PNG", []byte("GIF89a not a png at all, certainly"), ""},
		{"truncated", eight[:len(eight)-20], ""},
		{"empty", nil, ""},
	} {
		_, err := measure.ReadFramePNG(bytes.NewReader(test.data), "x.png", profileUm, profileUm)
		var pe *measure.ParamError
		if !errors.Is(err, measure.ErrInput) || !errors.As(err, &pe) || pe.Param != test.param || pe.Where != "x.png" {
			t.Errorf("%s: ReadFramePNG error %v, want a *ParamError for x.png, parameter %q, wrapping ErrInput", test.name, err, test.param)
		}
	}
}

// profileTIFF returns a minimal uncompressed little-endian TIFF of a
// w × h gray image with the given bits per sample and sample format, and
// pixel bytes pix (TIFF 6.0 specification, Adobe 1992, §2 and §8; tags in
// ascending order).
func profileTIFF(w, h, bits, format uint16, pix []byte) []byte {
	type entry struct {
		tag, typ uint16
		value    uint32
	}
	const pixOffset = 8 + 2 + 10*12 + 4
	entries := []entry{
		{256, 3, uint32(w)}, {257, 3, uint32(h)}, {258, 3, uint32(bits)}, {259, 3, 1},
		{262, 3, 1}, {273, 4, pixOffset}, {277, 3, 1}, {278, 3, uint32(h)},
		{279, 4, uint32(len(pix))}, {339, 3, uint32(format)},
	}
	le := binary.LittleEndian
	out := []byte("II*\x00")
	out = le.AppendUint32(out, 8)
	out = le.AppendUint16(out, uint16(len(entries)))
	for _, e := range entries {
		out = le.AppendUint16(out, e.tag)
		out = le.AppendUint16(out, e.typ)
		out = le.AppendUint32(out, 1)
		if e.typ == 3 {
			out = le.AppendUint16(out, uint16(e.value))
			out = le.AppendUint16(out, 0)
		} else {
			out = le.AppendUint32(out, e.value)
		}
	}
	out = le.AppendUint32(out, 0) // no next IFD
	return append(out, pix...)
}

func TestReadFrameTIFF(t *testing.T) {
	// Round trips: a 16-bit gray TIFF (uncompressed and Deflate) and an
	// 8-bit one written with golang.org/x/image/tiff read back exactly,
	// FullScale 65535 or 255. Rejected: colour and palette images, bit
	// depths other than 8 and 16 and signed samples (in minimal TIFFs
	// written by hand, which x/image/tiff cannot write), and files that
	// are not TIFF.
	src := profileImageFrame(t, 65535)
	g16 := image.NewGray16(image.Rect(0, 0, src.Cols, src.Rows))
	for i, v := range src.Data {
		binary.BigEndian.PutUint16(g16.Pix[2*i:], uint16(v))
	}
	for _, opt := range []*tiff.Options{nil, {Compression: tiff.Deflate}} {
		var b bytes.Buffer
		if err := tiff.Encode(&b, g16, opt); err != nil {
			t.Fatalf("tiff.Encode error: %v", err)
		}
		path := profileWrite(t, "beam.tiff", b.Bytes())
		got, err := measure.ReadFrameFile(path, src.PitchX, src.PitchY)
		if err != nil || got.Rows != src.Rows || got.Cols != src.Cols || !slices.Equal(got.Data, src.Data) || got.FullScale != 65535 {
			t.Errorf("16-bit TIFF (%+v): read %d × %d, FullScale %g, error %v; want the frame written", opt, got.Cols, got.Rows, got.FullScale, err)
		}
	}
	src8 := profileImageFrame(t, 255)
	g8 := image.NewGray(image.Rect(0, 0, src8.Cols, src8.Rows))
	for i, v := range src8.Data {
		g8.Pix[i] = uint8(v)
	}
	var b8, rgb bytes.Buffer
	if err := tiff.Encode(&b8, g8, nil); err != nil {
		t.Fatalf("tiff.Encode error: %v", err)
	}
	got, err := measure.ReadFrameTIFF(bytes.NewReader(b8.Bytes()), "x.tif", profileUm, profileUm)
	if err != nil || !slices.Equal(got.Data, src8.Data) || got.FullScale != 255 {
		t.Errorf("8-bit TIFF: FullScale %g, error %v; want the frame written, FullScale 255", got.FullScale, err)
	}

	if err := tiff.Encode(&rgb, image.NewRGBA(image.Rect(0, 0, 4, 4)), nil); err != nil {
		t.Fatalf("tiff.Encode error: %v", err)
	}
	var pal bytes.Buffer
	if err := tiff.Encode(&pal, image.NewPaletted(image.Rect(0, 0, 4, 4), color.Palette{color.Gray{}, color.Gray{Y: 90}}), nil); err != nil {
		t.Fatalf("tiff.Encode error: %v", err)
	}
	// The hand-made TIFF reads as intended when its header is valid.
	pix := []byte{1, 0, 2, 0, 3, 0, 4, 1}
	if got, err := measure.ReadFrameTIFF(bytes.NewReader(profileTIFF(2, 2, 16, 1, pix)), "x.tif", profileUm, profileUm); err != nil || !slices.Equal(got.Data, []float64{1, 2, 3, 260}) {
		t.Errorf("hand-made 16-bit TIFF: %v, %v; want [1 2 3 260]", got.Data, err)
	}
	for _, test := range []struct {
		name  string
		data  []byte
		param string
	}{
		{"RGB", rgb.Bytes(), "samples per pixel"},
		{"palette", pal.Bytes(), "photometric interpretation"},
		{"12-bit", profileTIFF(2, 2, 12, 1, pix[:6]), "bit depth"},
		{"32-bit float", profileTIFF(1, 2, 32, 3, pix), "bit depth"},
		{"signed 16-bit", profileTIFF(2, 2, 16, 2, pix), "sample format"},
		{"not a TIFF", []byte("II*\x00\xff\xff\xff\xff"), ""},
		{"PNG bytes", profileEncode(t, g8), ""},
	} {
		_, err := measure.ReadFrameTIFF(bytes.NewReader(test.data), "x.tif", profileUm, profileUm)
		var pe *measure.ParamError
		if !errors.Is(err, measure.ErrInput) || !errors.As(err, &pe) || pe.Param != test.param {
			t.Errorf("%s: ReadFrameTIFF error %v, want a *ParamError, parameter %q, wrapping ErrInput", test.name, err, test.param)
		}
	}
}

func TestReadFrameFile(t *testing.T) {
	// By extension; a missing file and an unknown extension are errors
	// wrapping ErrInput (and fs.ErrNotExist for the missing file).
	path := profileWrite(t, "frame.CSV", []byte("0,1,0\n1,5,1\n0,1,0\n"))
	f, err := measure.ReadFrameFile(path, profileUm, profileUm)
	if err != nil || f.Rows != 3 || f.At(1, 1) != 5 || f.Name != "frame.CSV" {
		t.Errorf("ReadFrameFile(%s) = %+v, %v; want the 3 × 3 matrix", path, f, err)
	}
	missing := filepath.Join(t.TempDir(), "none.png")
	if _, err := measure.ReadFrameFile(missing, profileUm, profileUm); !errors.Is(err, measure.ErrInput) || !errors.Is(err, fs.ErrNotExist) {
		t.Errorf("ReadFrameFile(missing) error %v, want ErrInput and fs.ErrNotExist", err)
	}
	if _, err := measure.ReadFrameFile(profileWrite(t, "frame.bmp", []byte("BM")), profileUm, profileUm); !errors.Is(err, measure.ErrInput) {
		t.Errorf("ReadFrameFile(.bmp) error %v, want ErrInput", err)
	}
	// A directory opens but cannot be read.
	dir := filepath.Join(t.TempDir(), "dir.csv")
	if err := os.Mkdir(dir, 0o700); err != nil {
		t.Fatalf("Mkdir error: %v", err)
	}
	if _, err := measure.ReadFrameFile(dir, profileUm, profileUm); !errors.Is(err, measure.ErrInput) {
		t.Errorf("ReadFrameFile(directory) error %v, want ErrInput", err)
	}
}
