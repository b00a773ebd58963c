package figure

import (
	"fmt"
	"math"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/validity"
)

// MaxTaylorOrder is the highest truncation order Taylor draws; beyond it
// the style cycle repeats and the picture stops being readable.
const MaxTaylorOrder = 8

// DefaultTaylorOrder is the highest truncation order drawn when
// TaylorOptions.Order is zero.
const DefaultTaylorOrder = 4

// TaylorOptions controls Taylor. The zero value draws orders 0 to 4 over
// the default range with the validity limits at 1 %.
type TaylorOptions struct {
	// Name names the form in the title, e.g. "morse".
	Name string
	// Order is N, the highest truncation order drawn, 2 ≤ N ≤
	// MaxTaylorOrder and at most the form's MaxOrder; zero means
	// DefaultTaylorOrder (or the form's MaxOrder when lower).
	Order int
	// RMin and RMax are the range of separations in Å; both zero means
	// the default range (see the package constants compressionRise and
	// stretchRise). The range must overlap the domain of the form; the
	// exact curve is drawn only inside it.
	RMin, RMax float64
	// Tolerance is τ of the potential criterion that marks where the
	// harmonic truncation holds (package validity); zero means
	// validity.DefaultTolerance (1 %).
	Tolerance float64
}

// Taylor returns the picture of the exact potential V(r) of p and its
// Taylor truncations about re,
//
//	V_n(r) = Σ_{k=0}^{n} c_k (r − re)^k,  c_k = V⁽ᵏ⁾(re)/k!,
//
// for n = 0, …, N, with the range where the harmonic truncation V_2
// satisfies the potential criterion |V_2 − V| ≤ τ·(V − V(re)) shaded
// (validity.PotentialRange).
//
// Series, in order: "exact V(r)" (Reference), "order 0, 1" (V_0 = c_0;
// V_1 is the same curve because c_1 = V′(re) = 0), then "order 2
// (harmonic)" and "order n" for n = 3, …, N (Approximation): N + 1 series
// on a common grid of 601 separations. The exact series is NaN outside the
// domain of the form, where a hatched mark shows the excluded region (for
// Buckingham, below its inner barrier). The energy axis runs from
// V(re) − 0.2·D to V(re) + 2.5·D at most (D the depth), narrowed to the
// exact curve; the truncations are cut at its limits.
//
// Errors wrap core.ErrParam (bad options), core.ErrOrder (N beyond the
// form's derivatives), core.ErrDomain (a range outside the domain) or the
// well analysis' errors.
func Taylor(p core.Potential, o TaylorOptions) (*Figure, error) {
	n := o.Order
	if n == 0 {
		n = min(DefaultTaylorOrder, p.MaxOrder())
	}
	if n < 2 || n > MaxTaylorOrder {
		return nil, fmt.Errorf("figure: %w: truncation order %d, must be 2 to %d", core.ErrParam, n, MaxTaylorOrder)
	}
	if n > p.MaxOrder() {
		return nil, fmt.Errorf("figure: %w: truncation order %d, the form has derivatives up to %d", core.ErrOrder, n, p.MaxOrder())
	}
	w, err := core.AnalyzeWell(p, core.WellSettings{Order: n})
	if err != nil {
		return nil, fmt.Errorf("figure: %w", err)
	}
	v, err := newView(p, w)
	if err != nil {
		return nil, err
	}
	d := p.Domain()
	xmin, xmax := v.rmin, v.rmax
	if o.RMin != 0 || o.RMax != 0 {
		if err := checkRange(o.RMin, o.RMax, d); err != nil {
			return nil, err
		}
		xmin, xmax = o.RMin, o.RMax
	}
	rs := linspace(xmin, xmax, gridPoints)
	exact := make([]float64, len(rs))
	if err := batchInDomain(p, 0, rs, exact); err != nil {
		return nil, fmt.Errorf("figure: exact V: %w", err)
	}

	f := &Figure{
		Kind:   "taylor",
		Title:  fmt.Sprintf("%s: V(r) and its Taylor truncations about re = %.4g Å\norder n: V_n(r) = Σ c_k (r − re)ᵏ for k = 0 … n, with c_k = V^(k)(re)/k!", o.Name, w.Re),
		XLabel: "separation r [Å]",
		YLabel: "potential energy V [eV]",
		XMin:   xmin, XMax: xmax,
	}
	f.Series = append(f.Series, Series{Name: "exact V(r)", Role: Reference, X: rs, Y: exact})
	c0 := make([]float64, len(rs))
	for i := range c0 {
		c0[i] = w.Taylor[0]
	}
	f.Series = append(f.Series, Series{Name: "order 0, 1 (c₁ = 0)", Role: Approximation, X: rs, Y: c0})
	for k := 2; k <= n; k++ {
		tr, err := validity.NewTruncation(w, k)
		if err != nil {
			return nil, fmt.Errorf("figure: %w", err)
		}
		ys := make([]float64, len(rs))
		if err := tr.Taylor(0, rs, ys); err != nil {
			return nil, fmt.Errorf("figure: order-%d truncation: %w", k, err)
		}
		name := fmt.Sprintf("order %d", k)
		if k == 2 {
			name += " (harmonic)"
		}
		f.Series = append(f.Series, Series{Name: name, Role: Approximation, X: rs, Y: ys})
	}

	if d.Min > xmin {
		label := "outside the domain of the form"
		if d.Barrier {
			label = "below the inner barrier: V → −∞"
		}
		f.Marks = append(f.Marks, Mark{Kind: Hatch, X0: xmin, X1: math.Min(d.Min, xmax), Label: label})
	}
	if d.Max < xmax {
		f.Marks = append(f.Marks, Mark{Kind: Hatch, X0: math.Max(d.Max, xmin), X1: xmax, Label: "outside the domain of the form"})
	}
	tol := o.Tolerance
	if tol == 0 {
		tol = validity.DefaultTolerance
	}
	lim, err := validity.PotentialRange(p, w, 2, validity.Settings{Tolerance: tol})
	if err != nil {
		return nil, fmt.Errorf("figure: validity of the harmonic truncation: %w", err)
	}
	lo, hi := w.Re-lim.Compression, w.Re+lim.Stretch
	f.Marks = append(f.Marks, Mark{
		Kind: Band, X0: math.Max(lo, xmin), X1: math.Min(hi, xmax),
		Label: fmt.Sprintf("|V₂ − V| ≤ %g %% of V − V(re)", 100*tol),
	})
	f.Notes = append(f.Notes, fmt.Sprintf("harmonic truncation within %g %% of V − V(re) (potential criterion): %s",
		100*tol, rangeText(lim.Compression, lim.Stretch)))
	per, err := validity.PeriodRange(p, w, 2, validity.Settings{Tolerance: tol})
	if err != nil {
		return nil, fmt.Errorf("figure: period validity of the harmonic truncation: %w", err)
	}
	plabel := fmt.Sprintf("turning points: period of V₂ within %g %%", 100*tol)
	for _, r := range []float64{w.Re - per.Compression, w.Re + per.Stretch} {
		if !math.IsInf(r, 0) {
			f.Marks = append(f.Marks, Mark{Kind: VLine, X0: r, Label: plabel})
		}
	}
	f.Notes = append(f.Notes, fmt.Sprintf("harmonic period within %g %% of the exact one (period criterion) up to E = %s: %s",
		100*tol, limitText(per.Energy, "eV"), rangeText(per.Compression, per.Stretch)))

	dlo, dhi := extent(visible(rs, exact, xmin, xmax))
	ylo, yhi := v.yWindow()
	f.YMin, f.YMax = fitWindow(ylo, yhi, dlo, dhi)
	return f, nil
}

// visible returns the ys whose x lies in [lo, hi].
func visible(xs, ys []float64, lo, hi float64) []float64 {
	var out []float64
	for i, x := range xs {
		if x >= lo && x <= hi {
			out = append(out, ys[i])
		}
	}
	return out
}

// rangeText describes the displacements from re within which a criterion
// holds.
func rangeText(compression, stretch float64) string {
	if math.IsInf(compression, 1) && math.IsInf(stretch, 1) {
		return "at every separation"
	}
	return fmt.Sprintf("compression up to %s, stretch up to %s", limitText(compression, "Å"), limitText(stretch, "Å"))
}

// limitText formats a limit that may be infinite.
func limitText(v float64, unit string) string {
	switch {
	case math.IsInf(v, 1):
		return "∞ (no limit)"
	}
	return fmt.Sprintf("%.4g %s", v, unit)
}
