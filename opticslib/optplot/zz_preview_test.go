package optplot

import (
	"os"
	"testing"

	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
	"gonum.org/v1/plot/vg/vgimg"
)

func TestZZPreviewOld(t *testing.T) {
	_ = astigmatic(t)
	p := lastPlot
	cv := vgimg.PngCanvas{Canvas: vgimg.NewWith(vgimg.UseWH(16*vg.Centimeter, 9*vg.Centimeter), vgimg.UseDPI(150))}
	p.Draw(draw.New(cv))
	f, _ := os.Create("/tmp/prev/old_expander.png")
	cv.WriteTo(f)
	f.Close()
}
