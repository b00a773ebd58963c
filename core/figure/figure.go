// Package figure computes the data behind pairwell's pictures and renders
// them with gonum.org/v1/plot.
//
// Each picture is a Figure: named series of (x, y) points with a style role,
// shaded bands and vertical lines that mark ranges, axis labels with units
// and explicit axis limits. The builders (Taylor, Period, Compare, Motion)
// compute a Figure from a core.Potential alone, evaluating many points
// through Potential.Taylor, so plugin forms work like built-in ones; they do
// no I/O. Render and WriteFile draw a Figure as PNG, SVG or PDF.
//
// The series hold the computed values themselves, not values clipped for
// drawing: a Taylor truncation that runs off to −∞ keeps its values, and
// the renderer cuts every line at the axis limits (interpolating the
// crossing) so that nothing outside the limits flattens the picture. A NaN
// in a series is a gap: the line is broken there.
//
// Units are pairwell's: separations in Å, energies in eV, masses in u,
// times in fs.
package figure

import (
	"errors"
	"fmt"
	"math"
	"strings"
)

// Role is what a series stands for; it selects its style.
type Role int

const (
	// Reference is the curve the others are judged against (the exact
	// potential or period): black, solid, heavier.
	Reference Role = iota
	// Approximation is a model of the reference (a Taylor truncation,
	// the harmonic or perturbative period): each gets the next colour,
	// dash pattern and marker of the style cycle.
	Approximation
	// Measured is a set of discrete values from a simulation: markers
	// only, no line.
	Measured
	// Peer is one of several curves of equal standing (forms overlaid):
	// the k-th peer gets the k-th style of the cycle, never the black
	// solid line of a reference, so that no form reads as the reference.
	Peer
)

// String returns the role's name.
func (r Role) String() string {
	switch r {
	case Reference:
		return "reference"
	case Approximation:
		return "approximation"
	case Measured:
		return "measured"
	case Peer:
		return "peer"
	}
	return fmt.Sprintf("Role(%d)", int(r))
}

// Series is one named data set of a figure.
type Series struct {
	// Name is the legend entry.
	Name string
	// Role selects the style.
	Role Role
	// X and Y are the coordinates in the units of the figure's axes;
	// len(X) == len(Y). A NaN in Y breaks the line.
	X, Y []float64
}

// MarkKind is the kind of a Mark.
type MarkKind int

const (
	// Band shades the interval [X0, X1] over the full height.
	Band MarkKind = iota
	// Hatch hatches the interval [X0, X1]: a region where the curves are
	// not defined (outside a form's domain).
	Hatch
	// VLine draws a vertical line at X0.
	VLine
)

// Mark highlights a range or a position on the x axis.
type Mark struct {
	Kind   MarkKind
	X0, X1 float64
	// Label is the legend entry; marks with the same label share one.
	Label string
}

// Figure is the data behind one picture.
type Figure struct {
	// Kind names the builder: "taylor", "period", "compare", "motion" or
	// "fit".
	Kind string
	// Title is drawn above the plot; it may hold a second line after
	// "\n".
	Title string
	// XLabel and YLabel name the axes with their units.
	XLabel, YLabel string
	// XMin, XMax, YMin and YMax are the axis limits. Data outside them
	// is cut off when drawn.
	XMin, XMax, YMin, YMax float64
	// Series are drawn in order, later ones on top.
	Series []Series
	// Marks are drawn below the series.
	Marks []Mark
	// Notes are facts a reader needs that the curves do not show (a
	// form left out, a limit off the axes): they are written under the
	// plot, and the caller may print them too.
	Notes []string
	// Width and Height are the size of the picture in inches, MinSize to
	// MaxSize; zero means DefaultWidth × DefaultHeight (10 × 5).
	Width, Height float64
	// Below, when not nil, is a second panel drawn under this one with
	// the same x axis (its XMin and XMax are this figure's), such as the
	// residuals of a fit. Its series take the style of the series of
	// the same name above; it has no legend of its own.
	Below *Figure
}

// energySuffix ends the label of an axis that holds energies in eV.
const energySuffix = " [eV]"

// ConvertEnergy expresses the energy axes of f — those whose label ends in
// " [eV]" — in another unit: every value, limit and mark on such an axis is
// divided by perUnit, the value of the unit in eV, and the label names the
// unit (cm-1 as cm⁻¹, drawn as the font allows, see drawable). It reports
// whether f has an energy axis. perUnit must be finite and positive.
func (f *Figure) ConvertEnergy(name string, perUnit float64) bool {
	if !(perUnit > 0) || math.IsInf(perUnit, 0) {
		return false
	}
	if strings.EqualFold(name, "cm-1") {
		name = "cm⁻¹"
	}
	found := false
	if strings.HasSuffix(f.XLabel, energySuffix) {
		found = true
		f.XLabel = strings.TrimSuffix(f.XLabel, energySuffix) + " [" + name + "]"
		f.XMin, f.XMax = f.XMin/perUnit, f.XMax/perUnit
		for i := range f.Series {
			f.Series[i].X = scaled(f.Series[i].X, perUnit)
		}
		for i := range f.Marks {
			f.Marks[i].X0 /= perUnit
			f.Marks[i].X1 /= perUnit
		}
	}
	if strings.HasSuffix(f.YLabel, energySuffix) {
		found = true
		f.YLabel = strings.TrimSuffix(f.YLabel, energySuffix) + " [" + name + "]"
		f.YMin, f.YMax = f.YMin/perUnit, f.YMax/perUnit
		for i := range f.Series {
			f.Series[i].Y = scaled(f.Series[i].Y, perUnit)
		}
	}
	if f.Below != nil && f.Below.ConvertEnergy(name, perUnit) {
		found = true
	}
	return found
}

// scaled returns a copy of v divided by d (series may share slices).
func scaled(v []float64, d float64) []float64 {
	out := make([]float64, len(v))
	for i, x := range v {
		out[i] = x / d
	}
	return out
}

// SeriesByName returns the series called name, or nil.
func (f *Figure) SeriesByName(name string) *Series {
	for i := range f.Series {
		if f.Series[i].Name == name {
			return &f.Series[i]
		}
	}
	return nil
}

// Errors of the package. Errors from the builders wrap core's errors
// (core.ErrParam, core.ErrDomain, …) for bad input instead.
var (
	// ErrFormat means an output format or file extension is not one of
	// png, svg and pdf.
	ErrFormat = errors.New("unknown picture format")
	// ErrFigure means a Figure is not drawable: no series, series of
	// unequal lengths, or empty or non-finite axis limits.
	ErrFigure = errors.New("invalid figure")
)

// check reports whether f can be drawn.
func (f *Figure) check() error {
	lims := []float64{f.XMin, f.XMax, f.YMin, f.YMax}
	for _, v := range lims {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return fmt.Errorf("figure %s: %w: axis limits x [%g, %g], y [%g, %g] must be finite", f.Kind, ErrFigure, f.XMin, f.XMax, f.YMin, f.YMax)
		}
	}
	if !(f.XMin < f.XMax) || !(f.YMin < f.YMax) {
		return fmt.Errorf("figure %s: %w: empty axis range x [%g, %g], y [%g, %g]", f.Kind, ErrFigure, f.XMin, f.XMax, f.YMin, f.YMax)
	}
	if len(f.Series) == 0 {
		return fmt.Errorf("figure %s: %w: no series", f.Kind, ErrFigure)
	}
	for _, s := range f.Series {
		if len(s.X) != len(s.Y) {
			return fmt.Errorf("figure %s: %w: series %q has %d x and %d y values", f.Kind, ErrFigure, s.Name, len(s.X), len(s.Y))
		}
	}
	if f.Below != nil {
		if f.Below.Below != nil || f.Below.XMin != f.XMin || f.Below.XMax != f.XMax {
			return fmt.Errorf("figure %s: %w: the panel below must share the x range and have no panel of its own", f.Kind, ErrFigure)
		}
		return f.Below.check()
	}
	return nil
}
