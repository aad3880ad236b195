package measure

import (
	"bufio"
	"bytes"
	"encoding/binary"
	"fmt"
	"image"
	"image/png"
	"io"
	"os"
	"path/filepath"
	"strconv"
	"strings"

	"golang.org/x/image/tiff"

	"github.com/beamnote/beamnote/opticslib/units"
)

// frameMaxLine is the longest CSV line the reader accepts (64 MiB: a row of
// 16384 numbers of 20 characters is 0.3 MiB).
const frameMaxLine = 64 << 20

// ReadFrameCSV reads a frame from a CSV matrix of plain numbers: one image
// row per line (the first line is row y = 0), one pixel per field (the
// first field is column x = 0). The separator is the first of ',', ';'
// and tab that the first data line contains, else runs of spaces. Fields
// may have spaces around them; a single separator at the end of a line is
// ignored (as some instruments write it); blank lines and lines starting
// with '#' are skipped; a UTF-8 byte-order mark and CRLF line ends are
// accepted. Values are parsed by strconv.ParseFloat and may be negative.
//
// name names the input in errors ("frame.csv line 7") and becomes the
// frame's Name; pitchX and pitchY are the pixel pitch in metres. The
// frame's FullScale is 0 (unknown): set it for a saturation check.
// It returns a [*ParamError] wrapping [ErrInput] for an empty or ragged
// matrix, a field that is not a number, or a read error, and wrapping
// [ErrNotPhysical] for a value that is not finite or an invalid pitch.
func ReadFrameCSV(r io.Reader, name string, pitchX, pitchY units.Length) (Frame, error) {
	where := frameWhere(name)
	if err := framePitchesError(where, pitchX, pitchY); err != nil {
		return Frame{}, err
	}
	f := Frame{PitchX: pitchX, PitchY: pitchY, Name: name}
	sc := bufio.NewScanner(r)
	sc.Buffer(make([]byte, 0, 64<<10), frameMaxLine)
	var sep byte
	line := 0
	for sc.Scan() {
		line++
		text := strings.TrimSpace(sc.Text())
		if line == 1 {
			text = strings.TrimSpace(strings.TrimPrefix(text, "\uFEFF"))
		}
		if text == "" || text[0] == '#' {
			continue
		}
		at := where + " line " + strconv.Itoa(line)
		if f.Rows == 0 {
			sep = frameCSVSeparator(text)
		}
		fields := frameCSVFields(text, sep)
		if f.Rows == 0 {
			f.Cols = len(fields)
		} else if len(fields) != f.Cols {
			return Frame{}, &ParamError{Where: at, Param: "cells", Value: len(fields), Reason: "must be " + strconv.Itoa(f.Cols) + " as in the first row (a ragged matrix)", Err: ErrInput}
		}
		if f.Rows+1 > MaxFramePixels/f.Cols {
			return Frame{}, &ParamError{Where: at, Param: "size", Value: strconv.Itoa(f.Cols) + " × " + strconv.Itoa(f.Rows+1) + " pixels", Reason: "must have at most " + strconv.Itoa(MaxFramePixels) + " pixels", Err: ErrInput}
		}
		for j, s := range fields {
			param := "column " + strconv.Itoa(j+1)
			if s == "" {
				return Frame{}, &ParamError{Where: at, Param: param, Reason: "is empty: want a number", Err: ErrInput}
			}
			v, err := strconv.ParseFloat(s, 64)
			if err != nil {
				if ne, ok := err.(*strconv.NumError); ok && ne.Err == strconv.ErrRange {
					return Frame{}, &ParamError{Where: at, Param: param, Value: s, Reason: "is out of the float64 range", Err: ErrNotPhysical}
				}
				return Frame{}, &ParamError{Where: at, Param: param, Value: strconv.Quote(frameShort(s)), Reason: "is not a number (the matrix must hold plain numbers, no header)", Err: ErrInput}
			}
			if !frameFinite(v) {
				return Frame{}, &ParamError{Where: at, Param: param, Value: v, Reason: "must be finite", Err: ErrNotPhysical}
			}
			f.Data = append(f.Data, v)
		}
		f.Rows++
	}
	if err := sc.Err(); err != nil {
		return Frame{}, &ParamError{Where: where + " line " + strconv.Itoa(line+1), Reason: "cannot be read", Err: fmt.Errorf("%w (%w)", ErrInput, err)}
	}
	if f.Rows == 0 {
		return Frame{}, &ParamError{Where: where, Param: "matrix", Value: "no numbers", Reason: "needs at least one row", Err: ErrInput}
	}
	return f, f.Validate()
}

// frameShort cuts s after 32 bytes for a message.
func frameShort(s string) string {
	if len(s) <= 32 {
		return s
	}
	r := []rune(s)
	if len(r) > 32 {
		r = r[:32]
	}
	return string(r) + "…"
}

// frameCSVSeparator returns ',', ';' or '\t', the first of them that text
// contains, or 0 for runs of spaces.
func frameCSVSeparator(text string) byte {
	for _, c := range []byte{',', ';', '\t'} {
		if strings.IndexByte(text, c) >= 0 {
			return c
		}
	}
	return 0
}

// frameCSVFields splits a trimmed line at sep (runs of white space for 0),
// trims the fields and drops one empty field after a trailing separator.
func frameCSVFields(text string, sep byte) []string {
	if sep == 0 {
		return strings.Fields(text)
	}
	fields := strings.Split(text, string(sep))
	for i := range fields {
		fields[i] = strings.TrimSpace(fields[i])
	}
	if len(fields) > 1 && fields[len(fields)-1] == "" {
		fields = fields[:len(fields)-1]
	}
	return fields
}

// pngSignature starts every PNG file (PNG specification, W3C 2003, §5.2).
const pngSignature = "\x89PNG\r\n\x1a\n"

// ReadFramePNG reads a frame from a PNG image: 8- or 16-bit grayscale,
// with the pixel values as the samples (0…255 or 0…65535) and FullScale
// 255 or 65535 (set it lower for a camera with fewer bits than the file,
// see [Frame.FullScale]). Other colour models are accepted only when every pixel is
// opaque and gray (R = G = B: a gray image stored as RGB, gray with alpha
// or a palette of grays), at 8 or 16 bits per sample, with that value as
// the sample. A false-colour or colour image is rejected: its pixels are
// not proportional to the irradiance, and any weighting of R, G and B
// into a luminance would be a guess.
//
// name names the input in errors and becomes the frame's Name; pitchX and
// pitchY are the pixel pitch in metres. It returns a [*ParamError]
// wrapping [ErrInput] for a file that is not a PNG or cannot be decoded, a
// bit depth other than 8 or 16 (1, 2 and 4-bit images), a colour or
// transparent pixel, or more than [MaxFramePixels] pixels, and wrapping
// [ErrNotPhysical] for an invalid pitch.
func ReadFramePNG(r io.Reader, name string, pitchX, pitchY units.Length) (Frame, error) {
	where, data, err := frameImageData(r, name, pitchX, pitchY)
	if err != nil {
		return Frame{}, err
	}
	// The IHDR chunk comes first (PNG specification §5.6, §11.2.2):
	// length, "IHDR", width, height, bit depth, colour type.
	if len(data) < 26 || string(data[:8]) != pngSignature || string(data[12:16]) != "IHDR" {
		return Frame{}, &ParamError{Where: where, Reason: "is not a PNG image (no PNG signature and IHDR header)", Err: ErrInput}
	}
	w, h := binary.BigEndian.Uint32(data[16:20]), binary.BigEndian.Uint32(data[20:24])
	depth := int(data[24])
	if depth != 8 && depth != 16 {
		return Frame{}, &ParamError{Where: where, Param: "bit depth", Value: depth, Reason: "must be 8 or 16 bits per sample", Err: ErrInput}
	}
	if w > MaxFramePixels || h > MaxFramePixels {
		return Frame{}, &ParamError{Where: where, Param: "size", Value: strconv.FormatUint(uint64(w), 10) + " × " + strconv.FormatUint(uint64(h), 10) + " pixels", Reason: "must have at most " + strconv.Itoa(MaxFramePixels) + " pixels", Err: ErrInput}
	}
	img, err := frameDecode(where, "PNG", data, int(h), int(w), png.Decode)
	if err != nil {
		return Frame{}, err
	}
	return frameImage(img, where, depth, name, pitchX, pitchY)
}

// framePitchesError checks both pixel pitches of a frame reader's
// arguments.
func framePitchesError(where string, pitchX, pitchY units.Length) error {
	if err := framePitchError(where, "x", pitchX); err != nil {
		return err
	}
	return framePitchError(where, "y", pitchY)
}

// frameImageData returns the subject of the errors of the image named
// name, checks the pixel pitch and reads the whole encoded image from r:
// the first steps of [ReadFramePNG] and [ReadFrameTIFF].
func frameImageData(r io.Reader, name string, pitchX, pitchY units.Length) (where string, data []byte, err error) {
	where = frameWhere(name)
	if err = framePitchesError(where, pitchX, pitchY); err != nil {
		return where, nil, err
	}
	data, err = io.ReadAll(r)
	if err != nil {
		return where, nil, &ParamError{Where: where, Reason: "cannot be read", Err: fmt.Errorf("%w (%w)", ErrInput, err)}
	}
	return where, data, nil
}

// frameDecode checks the size rows × cols that the header of the encoded
// image data gives, before any pixels are allocated, and decodes data
// with decode; format names the file format in errors.
func frameDecode(where, format string, data []byte, rows, cols int, decode func(io.Reader) (image.Image, error)) (image.Image, error) {
	if err := frameSizeError(where, rows, cols); err != nil {
		return nil, err
	}
	img, err := decode(bytes.NewReader(data))
	if err != nil {
		return nil, frameDecodeError(where, format, err)
	}
	return img, nil
}

// frameDecodeError reports that the decoder of format failed with err.
func frameDecodeError(where, format string, err error) error {
	return &ParamError{Where: where, Reason: "cannot be decoded as " + format, Err: fmt.Errorf("%w (%w)", ErrInput, err)}
}

// frameImage makes the frame of a decoded image of the given bit depth
// (8 or 16), with FullScale 255 or 65535, the pixel pitch and the name,
// and validates it: the last steps of [ReadFramePNG] and [ReadFrameTIFF].
func frameImage(img image.Image, where string, depth int, name string, pitchX, pitchY units.Length) (Frame, error) {
	f, err := frameFromImage(img, where, depth)
	if err != nil {
		return Frame{}, err
	}
	full := 255.0
	if depth == 16 {
		full = 65535
	}
	f.PitchX, f.PitchY, f.FullScale, f.Name = pitchX, pitchY, full, name
	return f, f.Validate()
}

// frameFromImage copies a decoded image of the given bit depth into a
// frame: *image.Gray and *image.Gray16 directly, other images pixel by
// pixel under the gray rule of [ReadFramePNG].
func frameFromImage(img image.Image, where string, depth int) (Frame, error) {
	b := img.Bounds()
	f := Frame{Rows: b.Dy(), Cols: b.Dx()}
	f.Data = make([]float64, 0, f.Rows*f.Cols)
	switch m := img.(type) {
	case *image.Gray:
		for y := b.Min.Y; y < b.Max.Y; y++ {
			for _, v := range m.Pix[m.PixOffset(b.Min.X, y):m.PixOffset(b.Max.X, y)] {
				f.Data = append(f.Data, float64(v))
			}
		}
		return f, nil
	case *image.Gray16:
		for y := b.Min.Y; y < b.Max.Y; y++ {
			row := m.Pix[m.PixOffset(b.Min.X, y):m.PixOffset(b.Max.X, y)]
			for i := 0; i+1 < len(row); i += 2 {
				f.Data = append(f.Data, float64(uint16(row[i])<<8|uint16(row[i+1])))
			}
		}
		return f, nil
	}
	for y := b.Min.Y; y < b.Max.Y; y++ {
		for x := b.Min.X; x < b.Max.X; x++ {
			r, g, bl, a := img.At(x, y).RGBA()
			px := framePixelName(x-b.Min.X, y-b.Min.Y)
			if a != 0xffff {
				return Frame{}, &ParamError{Where: where, Param: px + " alpha", Value: float64(a) / 0xffff, Reason: "must be opaque (1): a transparent pixel has no defined intensity", Err: ErrInput}
			}
			if r != g || g != bl {
				return Frame{}, &ParamError{Where: where, Param: px + " (R, G, B)", Value: fmt.Sprintf("(%d, %d, %d)", r>>8, g>>8, bl>>8), Reason: "must be gray (R = G = B): an image with colour pixels (false colour?) is not an intensity measurement; save the camera's gray image", Err: ErrInput}
			}
			v := float64(r)
			if depth == 8 {
				v = float64(r / 0x101) // color.RGBA64 scales 8-bit v to v·0x101
			}
			f.Data = append(f.Data, v)
		}
	}
	return f, nil
}

// TIFF tags read by frameTIFFTags (TIFF 6.0 specification, Adobe 1992,
// section 8 and 19).
const (
	tiffBitsPerSample   = 258
	tiffPhotometric     = 262
	tiffSamplesPerPixel = 277
	tiffSampleFormat    = 339
)

// frameTIFFTags returns the first value of the tags of interest in the
// first image file directory of a TIFF file (TIFF 6.0 §2), with the
// specification's defaults for absent ones (BitsPerSample 1,
// SamplesPerPixel 1, SampleFormat 1). It returns false for a file that is
// not a TIFF or is cut short.
func frameTIFFTags(data []byte) (map[uint16]uint32, bool) {
	if len(data) < 8 {
		return nil, false
	}
	var bo binary.ByteOrder
	switch string(data[:4]) {
	case "II*\x00":
		bo = binary.LittleEndian
	case "MM\x00*":
		bo = binary.BigEndian
	default:
		return nil, false
	}
	off := uint64(bo.Uint32(data[4:8]))
	if off+2 > uint64(len(data)) {
		return nil, false
	}
	n := uint64(bo.Uint16(data[off : off+2]))
	if off+2+12*n > uint64(len(data)) {
		return nil, false
	}
	tags := map[uint16]uint32{tiffBitsPerSample: 1, tiffSamplesPerPixel: 1, tiffSampleFormat: 1}
	for i := range n {
		e := data[off+2+12*i : off+2+12*i+12]
		tag, typ, count := bo.Uint16(e[0:2]), bo.Uint16(e[2:4]), uint64(bo.Uint32(e[4:8]))
		if tag != tiffBitsPerSample && tag != tiffPhotometric && tag != tiffSamplesPerPixel && tag != tiffSampleFormat {
			continue
		}
		var size uint64
		switch typ {
		case 3: // SHORT
			size = 2
		case 4: // LONG
			size = 4
		default:
			return nil, false
		}
		val := e[8:12]
		if count*size > 4 {
			p := uint64(bo.Uint32(e[8:12]))
			if p+size > uint64(len(data)) {
				return nil, false
			}
			val = data[p : p+size]
		}
		if size == 2 {
			tags[tag] = uint32(bo.Uint16(val[0:2]))
		} else {
			tags[tag] = bo.Uint32(val[0:4])
		}
	}
	return tags, true
}

// ReadFrameTIFF reads a frame from the first image of a TIFF file:
// grayscale (one sample per pixel, black or white is zero) with 16 or 8
// bits per sample, unsigned integers, uncompressed or with the
// compressions golang.org/x/image/tiff decodes (LZW, Deflate, PackBits);
// FullScale is 65535 or 255 (set it lower for a camera with fewer bits
// than the file, see [Frame.FullScale]). A white-is-zero image is inverted by the
// decoder, so the samples are intensities either way.
//
// name names the input in errors and becomes the frame's Name; pitchX and
// pitchY are the pixel pitch in metres. It returns a [*ParamError]
// wrapping [ErrInput] for a file that is not a TIFF or cannot be decoded,
// a bit depth other than 8 or 16 (for example 12-bit packed or 32-bit
// float data), signed or floating-point samples, more than one sample per
// pixel (colour), or more than [MaxFramePixels] pixels, and wrapping
// [ErrNotPhysical] for an invalid pitch.
func ReadFrameTIFF(r io.Reader, name string, pitchX, pitchY units.Length) (Frame, error) {
	where, data, err := frameImageData(r, name, pitchX, pitchY)
	if err != nil {
		return Frame{}, err
	}
	tags, ok := frameTIFFTags(data)
	if !ok {
		return Frame{}, &ParamError{Where: where, Reason: "is not a TIFF image (no readable TIFF header and first directory)", Err: ErrInput}
	}
	if s := tags[tiffSamplesPerPixel]; s != 1 {
		return Frame{}, &ParamError{Where: where, Param: "samples per pixel", Value: int(s), Reason: "must be 1 (grayscale); a colour image is not an intensity measurement", Err: ErrInput}
	}
	if b := tags[tiffBitsPerSample]; b != 8 && b != 16 {
		return Frame{}, &ParamError{Where: where, Param: "bit depth", Value: int(b), Reason: "must be 8 or 16 bits per sample", Err: ErrInput}
	}
	if s := tags[tiffSampleFormat]; s != 1 {
		return Frame{}, &ParamError{Where: where, Param: "sample format", Value: int(s), Reason: "must be 1 (unsigned integers); signed (2) and floating-point (3) samples are not read", Err: ErrInput}
	}
	cfg, err := tiff.DecodeConfig(bytes.NewReader(data))
	if err != nil {
		return Frame{}, frameDecodeError(where, "TIFF", err)
	}
	img, err := frameDecode(where, "TIFF", data, cfg.Height, cfg.Width, tiff.Decode)
	if err != nil {
		return Frame{}, err
	}
	depth := int(tags[tiffBitsPerSample])
	switch img.(type) {
	case *image.Gray, *image.Gray16:
	default:
		return Frame{}, &ParamError{Where: where, Param: "photometric interpretation", Value: int(tags[tiffPhotometric]), Reason: "must be 0 or 1 (grayscale)", Err: ErrInput}
	}
	return frameImage(img, where, depth, name, pitchX, pitchY)
}

// ReadFrameFile reads a frame from the file at path by its extension
// (case-insensitive): .csv and .txt with [ReadFrameCSV], .png with
// [ReadFramePNG], .tif and .tiff with [ReadFrameTIFF]. The frame's Name is
// the file's base name. It returns a [*ParamError] wrapping [ErrInput]
// (and the os error, for errors.Is with fs.ErrNotExist) for a file that
// cannot be opened, an unknown extension, or the errors of the readers.
func ReadFrameFile(path string, pitchX, pitchY units.Length) (Frame, error) {
	name := filepath.Base(path)
	var read func(io.Reader, string, units.Length, units.Length) (Frame, error)
	switch strings.ToLower(filepath.Ext(path)) {
	case ".csv", ".txt":
		read = ReadFrameCSV
	case ".png":
		read = ReadFramePNG
	case ".tif", ".tiff":
		read = ReadFrameTIFF
	default:
		return Frame{}, &ParamError{Where: path, Param: "extension", Value: strconv.Quote(filepath.Ext(path)), Reason: "must be .csv, .txt, .png, .tif or .tiff", Err: ErrInput}
	}
	fh, err := os.Open(path)
	if err != nil {
		return Frame{}, &ParamError{Where: path, Reason: "cannot be opened", Err: fmt.Errorf("%w (%w)", ErrInput, err)}
	}
	defer fh.Close()
	return read(bufio.NewReader(fh), name, pitchX, pitchY)
}
