package figure

import (
	"fmt"
	"math"
	"path/filepath"

	"github.com/pairwell/pairwell/core"
)

// VirialOptions is the data of the B₂(T) picture, computed by the caller
// (package virial): temperatures in K, B₂ in cm³/mol.
type VirialOptions struct {
	// Name names the form in the title.
	Name string
	// T, Classical and Total are the curves: the classical B₂ and, when
	// Total is not nil, B₂ with the ħ² correction.
	T, Classical, Total []float64
	// DataT, DataB2 are measured points (may be empty), from DataFile.
	DataT, DataB2 []float64
	DataFile      string
	// Boyle is the Boyle temperature in K (NaN: none), marked by a line.
	Boyle float64
}

// Virial returns the picture of B₂ against T: "B₂ classical" (Reference),
// "B₂ with ħ² correction" (Approximation, when o.Total is given) and the
// measured points (Measured), with a dotted line at the Boyle temperature.
// Errors wrap core.ErrParam for curves of unequal length or fewer than two
// points.
func Virial(o VirialOptions) (*Figure, error) {
	if len(o.T) < 2 || len(o.Classical) != len(o.T) || (o.Total != nil && len(o.Total) != len(o.T)) || len(o.DataT) != len(o.DataB2) {
		return nil, fmt.Errorf("figure: %w: B₂ curves need ≥ 2 points of equal length", core.ErrParam)
	}
	f := &Figure{Kind: "virial", Title: "Second virial coefficient, " + o.Name,
		XLabel: "T [K]", YLabel: "B₂ [cm³/mol]"}
	f.Series = append(f.Series, Series{Name: "B₂ classical", Role: Reference, X: o.T, Y: o.Classical})
	if o.Total != nil {
		f.Series = append(f.Series, Series{Name: "B₂ with ħ² correction", Role: Approximation, X: o.T, Y: o.Total})
	}
	if len(o.DataT) > 0 {
		f.Series = append(f.Series, Series{Name: "measured (" + filepath.Base(o.DataFile) + ")", Role: Measured, X: o.DataT, Y: o.DataB2})
		f.Notes = append(f.Notes, "measured uncertainties are not drawn; the table of pairwell virial --data lists them")
	}
	xlo, xhi := extent(o.T, o.DataT)
	ylo, yhi := extent(o.Classical, o.Total, o.DataB2)
	if !(xlo < xhi) || math.IsNaN(ylo) {
		return nil, fmt.Errorf("figure: %w: empty temperature range", core.ErrParam)
	}
	if !(ylo < yhi) {
		ylo, yhi = ylo-1, yhi+1
	}
	m := 0.06 * (yhi - ylo)
	f.XMin, f.XMax, f.YMin, f.YMax = xlo, xhi, ylo-m, yhi+m
	if o.Boyle > xlo && o.Boyle < xhi {
		f.Marks = append(f.Marks, Mark{Kind: VLine, X0: o.Boyle, Label: fmt.Sprintf("Boyle temperature %.4g K", o.Boyle)})
	} else if !math.IsNaN(o.Boyle) {
		f.Notes = append(f.Notes, fmt.Sprintf("the Boyle temperature %.6g K is outside the range drawn", o.Boyle))
	}
	return f, nil
}

// ExpansionOptions is the data of the thermal-expansion picture, computed
// by the caller (package thermal): temperatures in K, ⟨r⟩ in Å.
type ExpansionOptions struct {
	Name string
	// T and the curves of ⟨r⟩; Quantum may be nil or hold NaN.
	T, Classical, Cubic, Quantum []float64
	// Re is the equilibrium distance, drawn as a line.
	Re float64
}

// Expansion returns the picture of ⟨r⟩ against T: "classical"
// (Reference), "cubic-term estimate" (Approximation), "quantum (levels)"
// (Approximation, when given) and "re" (a constant line, Approximation).
func Expansion(o ExpansionOptions) (*Figure, error) {
	n := len(o.T)
	if n < 2 || len(o.Classical) != n || len(o.Cubic) != n || (o.Quantum != nil && len(o.Quantum) != n) {
		return nil, fmt.Errorf("figure: %w: expansion curves need ≥ 2 points of equal length", core.ErrParam)
	}
	f := &Figure{Kind: "expansion", Title: "Mean bond length, " + o.Name, XLabel: "T [K]", YLabel: "mean r [Å]"}
	f.Series = append(f.Series,
		Series{Name: "classical", Role: Reference, X: o.T, Y: o.Classical},
		Series{Name: "cubic-term estimate", Role: Approximation, X: o.T, Y: o.Cubic})
	ys := [][]float64{o.Classical, o.Cubic, {o.Re}}
	if o.Quantum != nil {
		if lo, _ := extent(o.Quantum); !math.IsNaN(lo) {
			f.Series = append(f.Series, Series{Name: "quantum (levels)", Role: Approximation, X: o.T, Y: o.Quantum})
			ys = append(ys, o.Quantum)
		}
	}
	f.Series = append(f.Series, Series{Name: "re", Role: Approximation, X: []float64{o.T[0], o.T[n-1]}, Y: []float64{o.Re, o.Re}})
	xlo, xhi := extent(o.T)
	ylo, yhi := extent(ys...)
	if !(xlo < xhi) || !(ylo < yhi) {
		return nil, fmt.Errorf("figure: %w: empty range", core.ErrParam)
	}
	m := 0.06 * (yhi - ylo)
	f.XMin, f.XMax, f.YMin, f.YMax = xlo, xhi, ylo-m, yhi+m
	return f, nil
}
