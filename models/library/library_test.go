package library_test

import (
	"math"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
	"gonum.org/v1/gonum/mathext"

	"github.com/pairwell/pairwell/conformance"
	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/models"
	"github.com/pairwell/pairwell/models/library"
)

func forms(t *testing.T) map[string]*library.Form {
	t.Helper()
	fs, err := library.Forms()
	require.NoError(t, err)
	out := map[string]*library.Form{}
	for _, f := range fs {
		out[f.Info().Key] = f
	}
	return out
}

func build(t *testing.T, key string, params ...float64) core.Potential {
	t.Helper()
	p, err := forms(t)[key].New(params)
	require.NoError(t, err)
	return p
}

// TestKeys pins the library's keys and that each has a reference, a
// formula and units, and that the file compiles without warnings.
func TestKeys(t *testing.T) {
	fs, err := library.Forms()
	require.NoError(t, err)
	var keys []string
	for _, f := range fs {
		info := f.Info()
		keys = append(keys, info.Key)
		assert.NotEmpty(t, info.Reference, info.Key)
		assert.NotEmpty(t, info.Formula, info.Key)
		assert.Contains(t, info.Origin, library.Source+":", info.Key)
		assert.Empty(t, f.Warnings(), info.Key)
		for _, p := range info.Params {
			assert.NotEmpty(t, p.Meaning, info.Key+"."+p.Name)
		}
	}
	assert.Equal(t, []string{"mie", "exp6", "born-mayer", "rydberg", "varshni", "kratzer",
		"poschl-teller", "hulburt-hirschfelder", "tang-toennies"}, keys)
	// No clash with the built-in forms.
	reg := models.NewRegistry()
	for _, f := range fs {
		assert.NoError(t, reg.Add(f), f.Info().Key)
	}
}

// TestConformance runs the conformance suite on every library form at its
// representative parameter set.
func TestConformance(t *testing.T) {
	fs, err := library.Forms()
	require.NoError(t, err)
	for _, f := range fs {
		t.Run(f.Info().Key, func(t *testing.T) { conformance.Test(t, f) })
	}
}

// TestMinima checks position, value and curvature of each form's minimum
// (found by the well analysis, which knows nothing of the closed forms)
// against the published identities. Tolerances: re to 1e-9 relative, V(re)
// and V″(re) to 1e-9 relative (the minimum is located to a few ulp).
func TestMinima(t *testing.T) {
	const De, re = 4.6, 1.27 // eV, Å: invented, HCl-like
	cases := []struct {
		name, key  string
		params     []float64
		re, v, vpp float64 // Å, eV, eV/Å²
		source     string
	}{
		{"mie 12-6", "mie", []float64{0.0104, 3.4, 12, 6}, 3.4 * math.Pow(2, 1.0/6), -0.0104,
			72 * 0.0104 / math.Pow(3.4*math.Pow(2, 1.0/6), 2),
			"G. Mie 1903: r_m = σ(n/m)^{1/(n−m)}, V = −ε; n = 12, m = 6 is Lennard-Jones, V″(r_m) = 72ε/r_m²"},
		{"mie 14-7", "mie", []float64{0.02, 3, 14, 7}, 3 * math.Pow(2, 1.0/7), -0.02,
			14 * 7 * 0.02 / math.Pow(3*math.Pow(2, 1.0/7), 2),
			"G. Mie 1903: r_m = σ(n/m)^{1/(n−m)}, V = −ε; V″(r_m) = nmε/r_m² (differentiate the form)"},
		{"exp6", "exp6", []float64{0.0104, 3.8, 13}, 3.8, -0.0104,
			0.0104 / (1 - 6.0/13) * (6.0/13*13*13 - 42) / (3.8 * 3.8),
			"E. A. Mason 1954: minimum −ε at r_m; V″(r_m) = ε/(1−6/α)·(6α − 42)/r_m² (differentiate the form)"},
		{"rydberg", "rydberg", []float64{De, 2.6, re}, re, -De, De * 2.6 * 2.6,
			"R. Rydberg 1931: V(re) = −De, V″(re) = De·a²"},
		{"varshni", "varshni", []float64{De, re, 0.5}, re, -De, 2 * De * math.Pow(1/re+2*0.5*re, 2),
			"Y. P. Varshni 1957: V(re) = −De; V″(re) = 2De(1/re + 2βre)² (differentiate the form)"},
		{"kratzer", "kratzer", []float64{De, re}, re, -De, 2 * De / (re * re),
			"A. Kratzer 1920: V = De((r − re)/r)² − De has its minimum −De at re and V″(re) = 2De/re² (k = 2De/re²)"},
		{"poschl-teller", "poschl-teller", []float64{De, 1.9, re}, re, -De, 2 * De * 1.9 * 1.9,
			"Pöschl & Teller 1933: −De sech²(a(r−re)), sech²x = 1 − x² + …, so V″(re) = 2De·a²"},
		{"hulburt-hirschfelder", "hulburt-hirschfelder", []float64{De, 1.87, re, 0.1, 0.05}, re, -De, 2 * De * 1.87 * 1.87,
			"Hulburt & Hirschfelder 1941: the correction is O(x³), so re, −De and V″ = 2De·a² are Morse's"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			w, err := core.AnalyzeWell(build(t, c.key, c.params...), core.WellSettings{})
			require.NoError(t, err)
			assert.InEpsilon(t, c.re, w.Re, 1e-9, c.source)
			assert.InEpsilon(t, c.v, w.Energy, 1e-9, c.source)
			assert.InEpsilon(t, c.vpp, 2*w.Taylor[2], 1e-9, c.source)
		})
	}
}

// TestHulburtHirschfelderIsMorse: with b = c = 0 the form is Morse
// (Hulburt & Hirschfelder 1941); compared with the built-in Morse to 1e-13
// relative plus 1e-13 eV/Åᵏ absolute at orders 0–6.
func TestHulburtHirschfelderIsMorse(t *testing.T) {
	hh := build(t, "hulburt-hirschfelder", 4.6, 1.87, 1.27, 0, 0)
	morse, err := models.Morse{}.New([]float64{4.6, 1.87, 1.27})
	require.NoError(t, err)
	r := []float64{0.8, 1.0, 1.27, 1.5, 2.2, 4}
	const n = 6
	a := make([]float64, len(r)*(n+1))
	b := make([]float64, len(r)*(n+1))
	require.NoError(t, hh.Taylor(n, r, a))
	require.NoError(t, morse.Taylor(n, r, b))
	for i := range a {
		assert.InDelta(t, b[i], a[i], 1e-13*(1+math.Abs(b[i])), "index %d", i)
	}
}

// TestBornMayer: V′/V = −1/ρ at every r (M. Born & J. E. Mayer 1932: the
// repulsion b·exp(−r/ρ)), and the well analysis refuses a form without a
// minimum.
func TestBornMayer(t *testing.T) {
	p := build(t, "born-mayer", 1500, 0.3)
	r := []float64{0.5, 1, 2, 3}
	c := make([]float64, len(r)*3)
	require.NoError(t, p.Taylor(2, r, c))
	for i, x := range r {
		assert.InEpsilon(t, 1500*math.Exp(-x/0.3), c[3*i], 1e-14)
		assert.InEpsilon(t, -1/0.3, c[3*i+1]/c[3*i], 1e-14)
		assert.InEpsilon(t, 1/(2*0.3*0.3), c[3*i+2]/c[3*i], 1e-14)
	}
	_, err := core.AnalyzeWell(p, core.WellSettings{})
	require.Error(t, err)
}

// TestTangToennies compares V and V′ with the damping functions written as
// regularized lower incomplete gamma functions, f_n(x) = P(n+1, x)
// (K. T. Tang & J. P. Toennies 1984; the identity is DLMF 8.4.10), computed
// by gonum's mathext.GammaIncReg, and df_n/dx = e^{−x}xⁿ/n!. Tolerance
// 1e-10 relative at b·r ≥ 5 (the well region).
func TestTangToennies(t *testing.T) {
	A, b := 20362.0, 3.838
	C := map[int]float64{6: 38.43, 8: 271.6, 10: 2299}
	p := build(t, "tang-toennies", A, b, C[6], C[8], C[10])
	r := []float64{1.5, 2.5, 3.0, 3.5, 3.8, 4.5, 6, 9}
	c := make([]float64, len(r)*2)
	require.NoError(t, p.Taylor(1, r, c))
	for i, x := range r {
		v := A * math.Exp(-b*x)
		dv := -b * A * math.Exp(-b*x)
		for _, n := range []int{6, 8, 10} {
			f := mathext.GammaIncReg(float64(n+1), b*x)
			df := b * math.Exp(-b*x) * math.Pow(b*x, float64(n)) / math.Gamma(float64(n+1))
			rn := math.Pow(x, float64(n))
			v -= f * C[n] / rn
			dv -= df*C[n]/rn - float64(n)*f*C[n]/(rn*x)
		}
		assert.InDelta(t, v, c[2*i], 1e-10*math.Abs(v)+1e-15, "V at r = %g", x)
		assert.InDelta(t, dv, c[2*i+1], 1e-10*math.Abs(dv)+1e-15, "V′ at r = %g", x)
	}
	// An argon-like well: depth ≈ 12 meV near 3.76 Å (from memory, the
	// Ar₂ well of the literature; loose check, 2% and 3%).
	w, err := core.AnalyzeWell(p, core.WellSettings{})
	require.NoError(t, err)
	assert.InEpsilon(t, 3.76, w.Re, 0.02)
	assert.InEpsilon(t, 0.0123, w.Depth, 0.03)
}

// TestKratzerTail: the Kratzer form approaches 0 as −2De·re/r (A. Kratzer
// 1920: V = De(re²/r² − 2re/r)), declared as a tail of power 1; V‴(re) =
// −12De/re³ (differentiate the form three times). Tolerances 1e-12
// relative.
func TestKratzerTail(t *testing.T) {
	const De, re = 4.6, 1.27
	p := build(t, "kratzer", De, re)
	assert.Equal(t, 1.0, p.Domain().TailPower)
	assert.Equal(t, 0.0, p.Domain().Limit)
	for _, r := range []float64{1e4, 1e6, 1e8} {
		v, err := core.Value(p, r)
		require.NoError(t, err)
		assert.InEpsilon(t, De*(re*re/(r*r)-2*re/r), v, 1e-13, "V at %g Å", r)
		// The next term, De·re²/r², is re/(2r) of the leading one.
		assert.InEpsilon(t, -2*De*re/r, v, re/r, "tail at %g Å", r)
	}
	v3, err := core.Derivative(p, 3, re)
	require.NoError(t, err)
	assert.InEpsilon(t, -12*De/(re*re*re), v3, 1e-12)
	// The declared tail is checked on its amplitude (conformance); without
	// the declaration the check fails (conformance/tail_test.go).
	rep, err := conformance.Run(forms(t)["kratzer"], [][]float64{{De, re}}, conformance.Settings{})
	require.NoError(t, err)
	asymptote := 0
	for _, res := range rep.Results {
		if res.Check == conformance.CheckAsymptote {
			asymptote++
			assert.True(t, res.Passed, res.Message)
			assert.Less(t, res.Error, 1e-6)
			assert.Greater(t, res.Error, 1e-7, "the amplitude drifts by re/(2R₁)·0.9 = 4.5e-7")
		}
	}
	assert.Positive(t, asymptote, "the conformance run has an asymptote check (else the loop above checks nothing)")
}

// TestIdentitiesDeclared: every form with a closed-form well or value
// declares its published identities to the conformance suite (checked by
// TestConformance); the wrapper keeps the formula's parameter derivatives,
// which agree with a central difference of V in the parameter (step 1e-6
// relative, tolerance 1e-6 relative).
func TestIdentitiesDeclared(t *testing.T) {
	for key, f := range forms(t) {
		p, err := f.New(f.Example())
		require.NoError(t, err)
		id, ok := p.(conformance.Identifier)
		if key == "tang-toennies" {
			assert.False(t, ok, key)
			continue
		}
		require.True(t, ok, key)
		assert.NotEmpty(t, id.Identities(), key)
		for _, x := range id.Identities() {
			assert.NotEmpty(t, x.Source, key)
		}
	}
	f := forms(t)["kratzer"]
	p, err := f.New([]float64{4.6, 1.27})
	require.NoError(t, err)
	r := []float64{1.1, 2.5}
	g := make([]float64, 2*len(r))
	require.NoError(t, core.ParamDerivatives(p, r, g))
	for j := range 2 {
		up, down := []float64{4.6, 1.27}, []float64{4.6, 1.27}
		h := 1e-6 * up[j]
		up[j] += h
		down[j] -= h
		pu, err := f.New(up)
		require.NoError(t, err)
		pd, err := f.New(down)
		require.NoError(t, err)
		for i, x := range r {
			vu, err := core.Value(pu, x)
			require.NoError(t, err)
			vd, err := core.Value(pd, x)
			require.NoError(t, err)
			assert.InEpsilon(t, (vu-vd)/(2*h), g[i*2+j], 1e-6, "∂V/∂p%d at %g Å", j, x)
		}
	}
}
