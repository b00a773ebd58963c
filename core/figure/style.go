package figure

import (
	"image/color"
	"math"

	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
)

// style is how one series is drawn. Three cues tell the series apart:
// colour, dash pattern and marker shape, so that a picture stays readable
// printed in grayscale and for readers with any form of colour-vision
// deficiency, where colour alone would fail.
type style struct {
	color  color.Color
	width  vg.Length
	dashes []vg.Length // nil: solid
	glyph  draw.GlyphDrawer
	// markers reports whether markers are drawn along the line.
	markers bool
}

// The colours are those of the palette proposed for colour-blind readers
// by M. Okabe and K. Ito, "Color Universal Design (CUD): how to make
// figures and presentations that are friendly to colorblind people"
// (2008), also recommended by B. Wong, "Points of view: Color blindness",
// Nature Methods 8, 441 (2011). Their yellow (#F0E442) is left out: it is
// too light on white. In grayscale the colours map to mid grays of
// similar lightness, which is why each also has its own dash pattern and
// marker.
var (
	black         = color.NRGBA{0x00, 0x00, 0x00, 0xff}
	blue          = color.NRGBA{0x00, 0x72, 0xb2, 0xff} // #0072B2
	vermillion    = color.NRGBA{0xd5, 0x5e, 0x00, 0xff} // #D55E00
	bluishGreen   = color.NRGBA{0x00, 0x9e, 0x73, 0xff} // #009E73
	reddishPurple = color.NRGBA{0xcc, 0x79, 0xa7, 0xff} // #CC79A7
	orange        = color.NRGBA{0xe6, 0x9f, 0x00, 0xff} // #E69F00
	skyBlue       = color.NRGBA{0x56, 0xb4, 0xe9, 0xff} // #56B4E9
	darkGray      = color.NRGBA{0x55, 0x55, 0x55, 0xff}
)

// Colours of the marks: a light translucent gray for a band (it darkens
// where bands overlap), a mid gray for hatching and vertical lines.
var (
	bandFill  = color.NRGBA{0x00, 0x00, 0x00, 0x1c}
	hatchLine = color.NRGBA{0x80, 0x80, 0x80, 0xff}
	markLine  = color.NRGBA{0x60, 0x60, 0x60, 0xff}
)

// numStyles is the number of distinct styles: the reference's and
// numStyles−1 others, each with its own colour, dash pattern and marker.
const numStyles = 14

// Darker companions of the palette, for pictures with more than seven
// curves besides the reference: each keeps a hue of the palette at about
// 60 % of its lightness, with its own dash pattern and marker.
var (
	darkBlue       = color.NRGBA{0x00, 0x44, 0x6b, 0xff}
	darkVermillion = color.NRGBA{0x80, 0x38, 0x00, 0xff}
	darkGreen      = color.NRGBA{0x00, 0x5f, 0x45, 0xff}
	darkPurple     = color.NRGBA{0x7a, 0x48, 0x64, 0xff}
	darkOrange     = color.NRGBA{0x8a, 0x5f, 0x00, 0xff}
	darkSkyBlue    = color.NRGBA{0x2a, 0x6c, 0x8c, 0xff}
)

// styleAt returns the k-th style (k ≥ 0). Style 0, the black solid line,
// is the reference's and no other: k > 0 cycles through the other
// numStyles−1 styles, none of them black or solid.
func styleAt(k int) style {
	pt := vg.Points
	if k == 0 {
		return style{color: black, width: pt(2.2)}
	}
	switch 1 + (k-1)%(numStyles-1) {
	case 1:
		return style{color: blue, width: pt(1.6), dashes: []vg.Length{pt(7), pt(3)}, glyph: draw.RingGlyph{}, markers: true}
	case 2:
		return style{color: vermillion, width: pt(1.6), dashes: []vg.Length{pt(9), pt(3), pt(2), pt(3)}, glyph: draw.TriangleGlyph{}, markers: true}
	case 3:
		return style{color: bluishGreen, width: pt(1.8), dashes: []vg.Length{pt(2), pt(2.5)}, glyph: draw.SquareGlyph{}, markers: true}
	case 4:
		return style{color: reddishPurple, width: pt(1.6), dashes: []vg.Length{pt(13), pt(4)}, glyph: draw.CrossGlyph{}, markers: true}
	case 5:
		return style{color: orange, width: pt(1.6), dashes: []vg.Length{pt(8), pt(2.5), pt(2), pt(2.5), pt(2), pt(2.5)}, glyph: draw.PlusGlyph{}, markers: true}
	case 6:
		return style{color: skyBlue, width: pt(1.8), dashes: []vg.Length{pt(4), pt(3)}, glyph: draw.PyramidGlyph{}, markers: true}
	case 7:
		return style{color: darkGray, width: pt(1.4), dashes: []vg.Length{pt(5), pt(2), pt(1), pt(2)}, glyph: draw.BoxGlyph{}, markers: true}
	case 8:
		return style{color: darkBlue, width: pt(1.5), dashes: []vg.Length{pt(11), pt(2), pt(3), pt(2)}, glyph: draw.CircleGlyph{}, markers: true}
	case 9:
		return style{color: darkVermillion, width: pt(1.5), dashes: []vg.Length{pt(3), pt(4)}, glyph: draw.RingGlyph{}, markers: true}
	case 10:
		return style{color: darkGreen, width: pt(1.5), dashes: []vg.Length{pt(15), pt(3), pt(2), pt(3), pt(2), pt(3)}, glyph: draw.TriangleGlyph{}, markers: true}
	case 11:
		return style{color: darkPurple, width: pt(1.5), dashes: []vg.Length{pt(6), pt(5)}, glyph: draw.SquareGlyph{}, markers: true}
	case 12:
		return style{color: darkOrange, width: pt(1.5), dashes: []vg.Length{pt(1), pt(2)}, glyph: draw.CrossGlyph{}, markers: true}
	default:
		return style{color: darkSkyBlue, width: pt(1.5), dashes: []vg.Length{pt(10), pt(2), pt(10), pt(2), pt(2), pt(2)}, glyph: draw.PlusGlyph{}, markers: true}
	}
}

// styles assigns a style index to every series: a Reference gets 0, the
// black solid line, which no other series ever gets; Peer series (forms of
// equal standing, none of them the reference) get 1, 2, … in their own
// count, and Approximation and Measured series 1, 2, … in theirs, in the
// order of the series.
func styles(ss []Series) []int {
	out := make([]int, len(ss))
	peer, other := 1, 1
	for i, s := range ss {
		switch s.Role {
		case Reference:
			out[i] = 0
		case Peer:
			out[i] = peer
			peer++
		default:
			out[i] = other
			other++
		}
	}
	return out
}

// markerPhase returns the offset, as a fraction of the spacing between
// markers, of the markers of style k: different styles put their markers
// at different places, so that coinciding curves still show theirs.
func markerPhase(k int) float64 {
	_, f := math.Modf(0.5 + 0.29*float64(k))
	return f
}

// markersPerLine is the number of markers along the full width of a plot.
const markersPerLine = 7
