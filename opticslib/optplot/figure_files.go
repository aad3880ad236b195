//go:build !minimal

package optplot

// The PNG and PDF writers of [Figure.Save]. This file is left out under
// the build tag "minimal", like gonum/plot's vgall.go, which imports every
// gonum/plot back end: vgimg and vgpdf register themselves with
// vg/draw when imported, so importing them links the raster and PDF
// canvases (the gg rasteriser, JPEG/TIFF encoders, the PDF writer) into a
// program whether or not it saves a figure.

import (
	"bytes"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/vgimg"
	"gonum.org/v1/plot/vg/vgpdf"
)

func init() {
	fileWriters[".png"] = func(p *plot.Plot, w, h vg.Length, buf *bytes.Buffer) error {
		c := vgimg.NewWith(vgimg.UseWH(w, h), vgimg.UseDPI(PNGDPI), vgimg.UseBackgroundColor(whiteColor))
		drawPlot(p, c)
		_, err := vgimg.PngCanvas{Canvas: c}.WriteTo(buf)
		return err
	}
	fileWriters[".pdf"] = func(p *plot.Plot, w, h vg.Length, buf *bytes.Buffer) error {
		c := vgpdf.New(w, h)
		drawPlot(p, c)
		_, err := c.WriteTo(buf)
		return err
	}
}
