package formula

import (
	"errors"
	"math"
	"strings"
	"testing"
	"unicode/utf8"

	"github.com/pairwell/pairwell/core/jet"
	"github.com/pairwell/pairwell/core/units"
)

var fuzzSeeds = []string{
	"De*(1 - exp(-a*(r - re)))^2 - De",
	"4*epsilon*((sigma/r)^12 - (sigma/r)^6)",
	"A*exp(-r/rho) - C6/r^6",
	"De*(1 - (re/r)*exp(-beta*(r^2 - re^2)))^2 - De",
	"E*sqrt(r/L)*tanh(r/L) + C6/r^6*erf(sqrt(beta)*r)",
	"pow(E, 1)*(r/L)^-3^2", "E*(((r/L)))", "-(-(E))*r/L", "E*sin(pi*r/L)*cos(r/L)",
	"E*2e-3*log(r/L)", "E*(r/L)^(1/3)", "(", ")", "E*", "r^", "1e", ".", "sigam", "exp()", "pow(r,)",
}

// fuzzParams are the parameters the fuzz targets declare.
var fuzzParams = func() []Param {
	beta, _ := units.NewDimension(0, -2, 0, 0, 0)
	c6, _ := units.NewDimension(1, 6, 0, 0, 0)
	return []Param{{"E", units.Energy}, {"L", units.Length}, {"beta", beta}, {"C6", c6}, {"n", units.Dimensionless},
		{"De", units.Energy}, {"a", units.InverseLength}, {"re", units.Length}, {"epsilon", units.Energy},
		{"sigma", units.Length}, {"A", units.Energy}, {"rho", units.Length}}
}()

// FuzzParse: the parser never panics; an error is an *Error wrapping
// ErrFormula, one line, with its column inside the formula (or just past
// its end).
func FuzzParse(f *testing.F) {
	for _, s := range fuzzSeeds {
		f.Add(s)
	}
	names := make([]string, len(fuzzParams))
	for i, p := range fuzzParams {
		names[i] = p.Name
	}
	f.Fuzz(func(t *testing.T, src string) {
		_, err := parse(src, names)
		if err == nil {
			return
		}
		var fe *Error
		if !errors.As(err, &fe) || !errors.Is(err, ErrFormula) {
			t.Fatalf("parse(%q): %v is not an *Error", src, err)
		}
		if fe.Column < 1 || fe.Column > utf8.RuneCountInString(src)+1 {
			t.Fatalf("parse(%q): column %d", src, fe.Column)
		}
		if strings.Contains(err.Error(), "\n") {
			t.Fatalf("parse(%q): multi-line message %q", src, err)
		}
		_ = fe.Caret()
	})
}

// FuzzDims: Compile never panics, and a formula it accepts as an energy is
// dimensionally homogeneous: with lengths in units 4 times smaller and
// energies in units 16 times smaller (r → 4r, each parameter of dimension
// energyᵉ·lengthˡ → 16ᵉ·4ˡ times itself), V becomes 16 V. Powers of 2 keep
// the scaling exact for products, quotients, sums and square roots; other
// rational powers round, hence the tolerance 1e-9 relative.
func FuzzDims(f *testing.F) {
	for _, s := range fuzzSeeds {
		f.Add(s, 1.3)
	}
	f.Fuzz(func(t *testing.T, src string, r float64) {
		form, err := Compile(src, fuzzParams)
		if err != nil {
			if !errors.Is(err, ErrFormula) || strings.Contains(err.Error(), "\n") {
				t.Fatalf("Compile(%q): %v", src, err)
			}
			return
		}
		if !(r > 0.1 && r < 100) {
			return
		}
		vals := []float64{1.1, 2.3, 0.7, 31, 1.5, 4.6, 1.87, 1.27, 0.0104, 3.4, 1500, 0.3}
		scaled := make([]float64, len(vals))
		for i, p := range fuzzParams {
			e, l, _, _, _ := p.Dimension.Exponents()
			scaled[i] = vals[i] * math.Pow(16, float64(e)) * math.Pow(4, float64(l))
		}
		v, ok1 := value0(form, vals, r)
		w, ok2 := value0(form, scaled, 4*r)
		if !ok1 || !ok2 || math.Abs(v) < 1e-200 || math.Abs(v) > 1e200 {
			return
		}
		if math.Abs(w-16*v) > 1e-9*math.Abs(16*v) {
			t.Fatalf("%q is not homogeneous: V = %g, scaled %g (want %g)", src, v, w, 16*v)
		}
	})
}

// value0 returns V(r) and whether it and the scalars are finite.
func value0(f *Formula, params []float64, r float64) (float64, bool) {
	s, err := f.prog.Scalars(params)
	if err != nil {
		return 0, false
	}
	l := jet.Layout{Order: 0, Points: 1}
	v := f.prog.Eval(f.prog.NewWorkspace(l), l, s, []float64{r})[0]
	return v, !math.IsNaN(v) && !math.IsInf(v, 0)
}
