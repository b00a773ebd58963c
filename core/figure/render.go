package figure

import (
	"bytes"
	"fmt"
	"github.com/pairwell/pairwell/core/fileio"
	"image/color"
	"image/png"
	"io"
	"math"
	"path/filepath"
	"strings"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/font"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
	"gonum.org/v1/plot/vg/vgimg"
	"gonum.org/v1/plot/vg/vgpdf"
	"gonum.org/v1/plot/vg/vgsvg"
)

// Format is an output format.
type Format string

// The output formats.
const (
	PNG Format = "png"
	SVG Format = "svg"
	PDF Format = "pdf"
)

// Picture size and resolution.
const (
	// DefaultWidth and DefaultHeight are the size of a picture in
	// inches when Figure.Width and Figure.Height are zero;
	// DefaultHeightTwoPanels is the default height of a figure with a
	// panel Below.
	DefaultWidth           = 10
	DefaultHeight          = 5
	DefaultHeightTwoPanels = 7
	// DPI is the resolution of PNG output: 1500×750 pixels at the
	// default size (1500×1050 with a panel below).
	DPI = 150
	// MinSize and MaxSize bound Figure.Width and Figure.Height, in
	// inches.
	MinSize = 3
	MaxSize = 40
)

// size returns the picture's size.
func (f *Figure) size() (w, h vg.Length, err error) {
	wi, hi := f.Width, f.Height
	if wi == 0 {
		wi = DefaultWidth
	}
	if hi == 0 {
		hi = DefaultHeight
		if f.Below != nil {
			hi = DefaultHeightTwoPanels
		}
	}
	for _, v := range []float64{wi, hi} {
		if !(v >= MinSize && v <= MaxSize) {
			return 0, 0, fmt.Errorf("figure %s: %w: size %g × %g in, each side must be %d to %d in", f.Kind, ErrFigure, wi, hi, MinSize, MaxSize)
		}
	}
	return vg.Length(wi) * vg.Inch, vg.Length(hi) * vg.Inch, nil
}

// FormatFor returns the format of the file path from its extension,
// case-insensitively: .png, .svg or .pdf. Anything else is an error
// wrapping ErrFormat.
func FormatFor(path string) (Format, error) {
	ext := strings.ToLower(strings.TrimPrefix(filepath.Ext(path), "."))
	switch Format(ext) {
	case PNG, SVG, PDF:
		return Format(ext), nil
	}
	if ext == "" {
		return "", fmt.Errorf("%w: %q has no extension: use .png, .svg or .pdf", ErrFormat, path)
	}
	return "", fmt.Errorf("%w: .%s (%s): use .png, .svg or .pdf", ErrFormat, ext, path)
}

// WriteFile renders f in the format given by the extension of path and
// writes it there atomically: the picture is rendered in memory, written
// to a temporary file in the same directory and renamed over path, so
// that path is either left as it was or holds the complete picture. Errors
// wrap ErrFormat (unknown extension), ErrFigure, or the file system's
// error.
func (f *Figure) WriteFile(path string) error {
	format, err := FormatFor(path)
	if err != nil {
		return err
	}
	var buf bytes.Buffer
	if err := f.Render(&buf, format); err != nil {
		return err
	}
	return writeAtomic(path, buf.Bytes())
}

// writeAtomic writes data to path under pairwell's output-file policy
// (core/fileio).
func writeAtomic(path string, data []byte) error {
	return fileio.WriteFile(path, func(w io.Writer) error {
		_, err := w.Write(data)
		return err
	})
}

// Render draws f in the given format to w.
func (f *Figure) Render(w io.Writer, format Format) error {
	if err := f.check(); err != nil {
		return err
	}
	width, h, err := f.size()
	if err != nil {
		return err
	}
	var (
		c  vg.CanvasSizer
		wt io.WriterTo
	)
	switch format {
	case PNG:
		img := vgimg.NewWith(vgimg.UseWH(width, h), vgimg.UseDPI(DPI), vgimg.UseBackgroundColor(color.White))
		c, wt = img, pngWriter{img}
	case SVG:
		s := vgsvg.New(width, h)
		c, wt = s, s
	case PDF:
		p := vgpdf.New(width, h)
		c, wt = p, p
	default:
		return fmt.Errorf("%w %q: use png, svg or pdf", ErrFormat, format)
	}
	dc := draw.New(c)
	if format != PNG { // the PNG canvas starts white
		dc.SetColor(color.White)
		dc.Fill(dc.Rectangle.Path())
	}
	if err := f.draw(dc); err != nil {
		return err
	}
	if _, err := wt.WriteTo(w); err != nil {
		return fmt.Errorf("rendering %s: %w", format, err)
	}
	return nil
}

// pngWriter encodes a raster canvas as PNG at the fastest compression:
// about half the time of the default level for files about 1.3 times as
// large.
type pngWriter struct{ c *vgimg.Canvas }

func (p pngWriter) WriteTo(w io.Writer) (int64, error) {
	cw := &countWriter{w: w}
	enc := png.Encoder{CompressionLevel: png.BestSpeed}
	err := enc.Encode(cw, p.c.Image())
	return cw.n, err
}

// countWriter counts the bytes written through it.
type countWriter struct {
	w io.Writer
	n int64
}

func (c *countWriter) Write(b []byte) (int, error) {
	n, err := c.w.Write(b)
	c.n += int64(n)
	return n, err
}

// sans is the typeface of every text, from the Liberation fonts that
// gonum/plot embeds (no system font is needed).
var sans = font.Font{Typeface: "Liberation", Variant: "Sans"}

// draw lays the picture out on dc: the plot on the left, the legend in a
// column on the right, so that the legend never hides a curve. A panel
// Below takes the lower 30 % of the height, its data area aligned with the
// one above.
func (f *Figure) draw(dc draw.Canvas) error {
	p, leg, styleOf, err := f.plot(nil)
	if err != nil {
		return err
	}
	has := fontGlyphs(font.From(sans, 12))
	title := p.Title.Text // drawable(f.Title), set by plot
	gap := vg.Points(14)
	// Notes go under the plot, across the whole width, so that a form
	// left out or a limit off the axes is said on the picture itself.
	noteStyle := p.Title.TextStyle
	noteStyle.Font = font.From(sans, 9)
	noteStyle.XAlign, noteStyle.YAlign = draw.XLeft, draw.YBottom
	var noteLines []string
	for _, n := range f.Notes {
		noteLines = append(noteLines, wrapText(noteStyle, drawable("Note: "+n, has), dc.Max.X-dc.Min.X-2*gap)...)
	}
	if len(noteLines) > 0 {
		r := noteStyle.Rectangle("Ag")
		lineH := r.Max.Y - r.Min.Y + vg.Points(2)
		for i, l := range noteLines {
			y := dc.Min.Y + vg.Points(4) + vg.Length(len(noteLines)-1-i)*lineH
			dc.FillText(noteStyle, vg.Point{X: dc.Min.X + gap, Y: y}, l)
		}
		dc = draw.Crop(dc, 0, 0, vg.Length(len(noteLines))*lineH+vg.Points(8), 0)
	}
	lr := leg.Rectangle(dc)
	lw := lr.Max.X - lr.Min.X
	// Shrink a title too wide for the plot, down to 8 points.
	avail := dc.Max.X - dc.Min.X - lw - 2*gap
	for size := vg.Points(13); size > vg.Points(8); size -= vg.Points(0.5) {
		p.Title.TextStyle.Font = font.From(sans, size)
		if r := p.Title.TextStyle.Rectangle(title); r.Max.X-r.Min.X <= avail {
			break
		}
	}
	area := draw.Crop(dc, 0, -(lw + 2*gap), 0, 0)
	if f.Below == nil {
		p.Draw(area)
	} else {
		q, _, _, err := f.Below.plot(styleOf)
		if err != nil {
			return err
		}
		h := area.Max.Y - area.Min.Y
		top := draw.Crop(area, 0, 0, 0.3*h, 0)
		bottom := draw.Crop(area, 0, 0, 0, -0.7*h)
		// Align the left edges of the two data areas.
		if d := p.DataCanvas(top).Min.X - q.DataCanvas(bottom).Min.X; d > 0 {
			bottom = draw.Crop(bottom, d, 0, 0, 0)
		} else if d < 0 {
			top = draw.Crop(top, -d, 0, 0, 0)
		}
		p.Draw(top)
		q.Draw(bottom)
	}
	tr := p.Title.TextStyle.Rectangle(title)
	top := tr.Max.Y - tr.Min.Y + p.Title.Padding + vg.Points(4)
	leg.Draw(draw.Crop(dc, dc.Max.X-dc.Min.X-lw-gap, -gap, 0, -top))
	return nil
}

// plot builds the gonum plot of f and its legend. inherit, when not nil,
// gives the style of series by name (a panel below takes the styles of the
// one above); styleOf returns the style of every series of f by name.
func (f *Figure) plot(inherit map[string]int) (p *plot.Plot, leg plot.Legend, styleOf map[string]int, err error) {
	p = plot.New()
	has := fontGlyphs(font.From(sans, 12))
	p.Title.Text = drawable(f.Title, has)
	p.Title.TextStyle.Font = font.From(sans, 13)
	p.Title.Padding = vg.Points(8)
	for _, a := range []*plot.Axis{&p.X, &p.Y} {
		a.Label.TextStyle.Font = font.From(sans, 12)
		a.Tick.Label.Font = font.From(sans, 10)
		a.Padding = 0
	}
	p.X.Label.Text, p.Y.Label.Text = drawable(f.XLabel, has), drawable(f.YLabel, has)
	grid := plotter.NewGrid()
	grid.Vertical.Color = color.Gray{Y: 0xe0}
	grid.Horizontal.Color = color.Gray{Y: 0xe0}
	p.Add(grid)

	leg = plot.NewLegend()
	leg.TextStyle.Font = font.From(sans, 10.5)
	leg.Left, leg.Top = true, true
	leg.ThumbnailWidth = vg.Points(34)
	leg.Padding = vg.Points(3)

	var marks []*markPlotter
	for _, m := range f.Marks {
		mp := &markPlotter{mark: m, fig: f}
		p.Add(mp)
		marks = append(marks, mp)
	}
	styleOf = map[string]int{}
	for i, idx := range styles(f.Series) {
		s := f.Series[i]
		if k, ok := inherit[s.Name]; ok {
			idx = k
		}
		styleOf[s.Name] = idx
		if err := f.addSeries(p, &leg, s, idx); err != nil {
			return nil, leg, nil, err
		}
	}
	seen := map[string]bool{}
	for _, mp := range marks {
		if l := mp.mark.Label; l != "" && !seen[l] {
			seen[l] = true
			leg.Add(drawable(l, has), mp)
		}
	}
	p.X.Tick.Marker, p.Y.Tick.Marker = niceTicks{}, niceTicks{}
	p.X.Min, p.X.Max = f.XMin, f.XMax
	p.Y.Min, p.Y.Max = f.YMin, f.YMax
	return p, leg, styleOf, nil
}

// addSeries adds the visible part of s to p, with style k, and its entry
// to the legend.
func (f *Figure) addSeries(p *plot.Plot, leg *plot.Legend, s Series, k int) error {
	st := styleAt(k)
	ls := draw.LineStyle{Color: st.color, Width: st.width, Dashes: st.dashes}
	var thumbs []plot.Thumbnailer
	if s.Role == Measured {
		pts := f.visiblePoints(s)
		sc, err := plotter.NewScatter(pts)
		if err != nil {
			return fmt.Errorf("figure: series %q: %w", s.Name, err)
		}
		sc.GlyphStyle = draw.GlyphStyle{Color: st.color, Radius: vg.Points(4), Shape: draw.CircleGlyph{}}
		ring, _ := plotter.NewScatter(pts)
		ring.GlyphStyle = draw.GlyphStyle{Color: black, Radius: vg.Points(4.5), Shape: draw.RingGlyph{}}
		p.Add(sc, ring)
		leg.Add(drawable(s.Name, fontGlyphs(leg.TextStyle.Font)), sc, ring)
		return nil
	}
	for _, seg := range f.clip(s) {
		l, err := plotter.NewLine(seg)
		if err != nil {
			return fmt.Errorf("figure: series %q: %w", s.Name, err)
		}
		l.LineStyle = ls
		p.Add(l)
	}
	thumb := &plotter.Line{LineStyle: ls}
	thumbs = append(thumbs, thumb)
	if st.markers {
		gs := draw.GlyphStyle{Color: st.color, Radius: vg.Points(3.5), Shape: st.glyph}
		if pts := f.markerPoints(s, k); len(pts) > 0 {
			sc, err := plotter.NewScatter(pts)
			if err != nil {
				return fmt.Errorf("figure: series %q: %w", s.Name, err)
			}
			sc.GlyphStyle = gs
			p.Add(sc)
		}
		thumbs = append(thumbs, glyphThumb{gs})
	}
	leg.Add(drawable(s.Name, fontGlyphs(leg.TextStyle.Font)), thumbs...)
	return nil
}

// glyphThumb draws one glyph in the middle of a legend thumbnail.
type glyphThumb struct{ sty draw.GlyphStyle }

func (g glyphThumb) Thumbnail(c *draw.Canvas) {
	c.DrawGlyphNoClip(g.sty, c.Center())
}

// inside reports whether (x, y) lies within the axis limits.
func (f *Figure) inside(x, y float64) bool {
	return x >= f.XMin && x <= f.XMax && y >= f.YMin && y <= f.YMax
}

// visiblePoints returns the points of s within the axis limits.
func (f *Figure) visiblePoints(s Series) plotter.XYs {
	var pts plotter.XYs
	for i, x := range s.X {
		if y := s.Y[i]; f.inside(x, y) {
			pts = append(pts, plotter.XY{X: x, Y: y})
		}
	}
	return pts
}

// markerPoints picks the data points of s where markers of style k go:
// the visible points nearest to markersPerLine evenly spaced abscissae,
// shifted by the style's phase.
func (f *Figure) markerPoints(s Series, k int) plotter.XYs {
	pts := f.visiblePoints(s)
	if len(pts) == 0 {
		return nil
	}
	span := (f.XMax - f.XMin) / markersPerLine
	var out plotter.XYs
	for j := 0; j < markersPerLine; j++ {
		target := f.XMin + (float64(j)+markerPhase(k))*span
		best, dist := -1, 0.3*span
		for i, q := range pts {
			if d := math.Abs(q.X - target); d < dist {
				best, dist = i, d
			}
		}
		if best >= 0 {
			out = append(out, pts[best])
		}
	}
	return out
}

// clip cuts the polyline of s at the axis limits and at NaN values and
// returns the visible pieces; where a segment crosses a limit the piece
// ends (or starts) at the crossing.
func (f *Figure) clip(s Series) []plotter.XYs {
	var (
		out []plotter.XYs
		cur plotter.XYs
	)
	flush := func() {
		if len(cur) >= 2 {
			out = append(out, cur)
		}
		cur = nil
	}
	for i := 1; i < len(s.X); i++ {
		x0, y0, x1, y1 := s.X[i-1], s.Y[i-1], s.X[i], s.Y[i]
		if anyNaN(x0, y0, x1, y1) {
			flush()
			continue
		}
		a, b, ok := clipSegment(x0, y0, x1, y1, f.XMin, f.XMax, f.YMin, f.YMax)
		if !ok {
			flush()
			continue
		}
		if n := len(cur); n == 0 || cur[n-1] != a {
			flush()
			cur = append(cur, a)
		}
		cur = append(cur, b)
		if b.X != x1 || b.Y != y1 {
			flush() // the segment leaves the window
		}
	}
	flush()
	return out
}

func anyNaN(v ...float64) bool {
	for _, x := range v {
		if math.IsNaN(x) || math.IsInf(x, 0) {
			return true
		}
	}
	return false
}

// clipSegment clips the segment (x0, y0)–(x1, y1) to the rectangle by the
// Liang–Barsky algorithm; ok is false when no part of it is inside.
func clipSegment(x0, y0, x1, y1, xmin, xmax, ymin, ymax float64) (a, b plotter.XY, ok bool) {
	dx, dy := x1-x0, y1-y0
	t0, t1 := 0.0, 1.0
	for _, e := range [4][2]float64{
		{-dx, x0 - xmin}, {dx, xmax - x0}, {-dy, y0 - ymin}, {dy, ymax - y0},
	} {
		p, q := e[0], e[1]
		if p == 0 {
			if q < 0 {
				return a, b, false
			}
			continue
		}
		t := q / p
		if p < 0 {
			if t > t1 {
				return a, b, false
			}
			t0 = math.Max(t0, t)
		} else {
			if t < t0 {
				return a, b, false
			}
			t1 = math.Min(t1, t)
		}
	}
	a = plotter.XY{X: x0, Y: y0}
	b = plotter.XY{X: x1, Y: y1}
	if t0 > 0 {
		a = plotter.XY{X: x0 + t0*dx, Y: y0 + t0*dy}
	}
	if t1 < 1 {
		b = plotter.XY{X: x0 + t1*dx, Y: y0 + t1*dy}
	}
	return a, b, true
}

// markPlotter draws a Mark.
type markPlotter struct {
	mark Mark
	fig  *Figure
}

// Plot implements plot.Plotter.
func (m *markPlotter) Plot(c draw.Canvas, plt *plot.Plot) {
	trX, _ := plt.Transforms(&c)
	f := m.fig
	switch m.mark.Kind {
	case VLine:
		x := m.mark.X0
		if x < f.XMin || x > f.XMax {
			return
		}
		cx := trX(x)
		m.line(c, cx, c.Min.Y, cx, c.Max.Y)
	default:
		lo, hi := math.Max(m.mark.X0, f.XMin), math.Min(m.mark.X1, f.XMax)
		if !(lo < hi) {
			return
		}
		r := vg.Rectangle{Min: vg.Point{X: trX(lo), Y: c.Min.Y}, Max: vg.Point{X: trX(hi), Y: c.Max.Y}}
		m.fill(c, r)
	}
}

// Thumbnail implements plot.Thumbnailer.
func (m *markPlotter) Thumbnail(c *draw.Canvas) {
	if m.mark.Kind == VLine {
		x := (c.Min.X + c.Max.X) / 2
		m.line(*c, x, c.Min.Y, x, c.Max.Y)
		return
	}
	m.fill(*c, c.Rectangle)
}

func (m *markPlotter) line(c draw.Canvas, x0, y0, x1, y1 vg.Length) {
	c.StrokeLine2(draw.LineStyle{Color: markLine, Width: vg.Points(1), Dashes: []vg.Length{vg.Points(1.5), vg.Points(2.5)}}, x0, y0, x1, y1)
}

// fill shades or hatches the rectangle r.
func (m *markPlotter) fill(c draw.Canvas, r vg.Rectangle) {
	if m.mark.Kind == Band {
		c.SetColor(bandFill)
		c.Fill(r.Path())
		edge := draw.LineStyle{Color: markLine, Width: vg.Points(0.8)}
		for _, x := range []vg.Length{r.Min.X, r.Max.X} {
			c.StrokeLine2(edge, x, r.Min.Y, x, r.Max.Y)
		}
		return
	}
	// Hatch: lines at 45°, y − x = const, clipped to r.
	ls := draw.LineStyle{Color: hatchLine, Width: vg.Points(0.7)}
	step := vg.Points(6)
	w, h := r.Max.X-r.Min.X, r.Max.Y-r.Min.Y
	for d := -w; d < h; d += step {
		// Points (x, y) = (r.Min.X + u, r.Min.Y + u + d), u ∈ [0, w],
		// with u + d ∈ [0, h].
		u0 := math.Max(0, float64(-d))
		u1 := math.Min(float64(w), float64(h-d))
		if u0 >= u1 {
			continue
		}
		c.StrokeLine2(ls, r.Min.X+vg.Length(u0), r.Min.Y+vg.Length(u0)+d, r.Min.X+vg.Length(u1), r.Min.Y+vg.Length(u1)+d)
	}
}

// wrapText breaks txt at spaces into lines no wider than w in style ts; a
// single word wider than w stays whole.
func wrapText(ts draw.TextStyle, txt string, w vg.Length) []string {
	var lines []string
	line := ""
	for _, word := range strings.Fields(txt) {
		try := word
		if line != "" {
			try = line + " " + word
		}
		if r := ts.Rectangle(try); line != "" && r.Max.X-r.Min.X > w {
			lines = append(lines, line)
			line = word
			continue
		}
		line = try
	}
	if line != "" {
		lines = append(lines, line)
	}
	return lines
}
