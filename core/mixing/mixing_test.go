package mixing

import (
	"errors"
	"math"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/units"
	"github.com/pairwell/pairwell/models"
)

// like returns a like-pair parameter set of form for property tests.
func like(form string, x float64) []float64 {
	switch form {
	case LennardJones:
		return []float64{0.0103 * x, 3.4 * x}
	case Buckingham:
		return []float64{1500 * x, 0.3 * x, 25 * x}
	default:
		return []float64{4.4 * x, 1.9 * x, 1.27 * x}
	}
}

// Property: every rule mixing a form with itself gives the like pair back
// (relative 1e-14; Kong goes through logarithms and exponentials, a few ulp).
func TestSelfMixing(t *testing.T) {
	for _, r := range Rules() {
		for _, x := range []float64{1e-3, 0.37, 1, 2.5, 1e3} {
			p := like(r.Form, x)
			got, err := r.Mix(p, p)
			require.NoError(t, err, r.Name)
			for i := range p {
				assert.InEpsilon(t, p[i], got[i], 1e-14, "%s x=%g param %d", r.Name, x, i)
			}
		}
	}
}

// Property: every rule is symmetric in the two like pairs (relative 1e-14).
func TestSymmetry(t *testing.T) {
	for _, r := range Rules() {
		a, b := like(r.Form, 1), like(r.Form, 1)
		b[0] *= 3.1
		b[1] *= 1.2
		ab, err := r.Mix(a, b)
		require.NoError(t, err)
		ba, err := r.Mix(b, a)
		require.NoError(t, err)
		assert.InDeltaSlice(t, ab, ba, 1e-14*math.Abs(ab[0])+1e-14*math.Abs(ab[1])+1e-14, r.Name)
	}
}

func rule(t *testing.T, name, form string) Rule {
	r, err := Lookup(name, form)
	require.NoError(t, err)
	return r
}

// Check values: the formulas of issue 16 and their sources, evaluated
// independently here for an invented pair (ε₁, σ₁) = (0.0103 eV, 3.40 Å),
// (ε₂, σ₂) = (0.0140 eV, 3.60 Å). Relative tolerance 1e-14.
func TestLennardJonesRules(t *testing.T) {
	e1, s1, e2, s2 := 0.0103, 3.40, 0.0140, 3.60
	a, b := []float64{e1, s1}, []float64{e2, s2}
	s6 := math.Pow(s1, 6) + math.Pow(s2, 6)
	cases := []struct {
		rule       string
		eps, sigma float64
	}{
		// Lorentz (1881): σ₁₂ = (σ₁+σ₂)/2; Berthelot (1898): ε₁₂ = √(ε₁ε₂).
		{"lorentz-berthelot", math.Sqrt(e1 * e2), (s1 + s2) / 2},
		// geometric mean of both (common practice).
		{"geometric", math.Sqrt(e1 * e2), math.Sqrt(s1 * s2)},
		// Waldman & Hagler, J. Comput. Chem. 14, 1077 (1993):
		// σ₁₂⁶ = (σ₁⁶+σ₂⁶)/2, ε₁₂ = 2√(ε₁ε₂)σ₁³σ₂³/(σ₁⁶+σ₂⁶).
		{"waldman-hagler", 2 * math.Sqrt(e1*e2) * math.Pow(s1*s2, 3) / s6, math.Pow(s6/2, 1.0/6)},
		// Fender & Halsey, J. Chem. Phys. 36, 1881 (1962): ε₁₂ = 2ε₁ε₂/(ε₁+ε₂), σ arithmetic.
		{"fender-halsey", 2 * e1 * e2 / (e1 + e2), (s1 + s2) / 2},
	}
	for _, c := range cases {
		got, err := rule(t, c.rule, LennardJones).Mix(a, b)
		require.NoError(t, err)
		assert.InEpsilon(t, c.eps, got[0], 1e-14, c.rule)
		assert.InEpsilon(t, c.sigma, got[1], 1e-14, c.rule)
	}
}

// Kong, J. Chem. Phys. 59, 2464 (1973), formula from memory (see kongLJ):
// the result must satisfy both defining equations, evaluated directly in
// powers here (relative 1e-13).
func TestKong(t *testing.T) {
	e1, s1, e2, s2 := 0.0103, 3.40, 0.0140, 3.60
	got, err := rule(t, "kong", LennardJones).Mix([]float64{e1, s1}, []float64{e2, s2})
	require.NoError(t, err)
	e, s := got[0], got[1]
	p1, p2 := e1*math.Pow(s1, 12), e2*math.Pow(s2, 12)
	wantP := p1 / math.Pow(2, 13) * math.Pow(1+math.Pow(p2/p1, 1.0/13), 13)
	assert.InEpsilon(t, wantP, e*math.Pow(s, 12), 1e-13)
	assert.InEpsilon(t, math.Sqrt(e1*math.Pow(s1, 6)*e2*math.Pow(s2, 6)), e*math.Pow(s, 6), 1e-13)
	// Kong's ε₁₂ lies below the geometric mean for unequal pairs (its
	// repulsion is stronger than the geometric one by the power-mean
	// inequality): a consequence of the formula.
	assert.Less(t, e, math.Sqrt(e1*e2))
}

// Buckingham and Morse rules (common practice, see Rules).
func TestBuckinghamMorseRules(t *testing.T) {
	a, b := []float64{1500, 0.30, 25}, []float64{2400, 0.25, 36}
	got, err := rule(t, "exp-arithmetic", Buckingham).Mix(a, b)
	require.NoError(t, err)
	assert.InDeltaSlice(t, []float64{math.Sqrt(1500 * 2400), 0.275, 30}, got, 1e-12)
	got, err = rule(t, "exp-harmonic", Buckingham).Mix(a, b)
	require.NoError(t, err)
	assert.InDeltaSlice(t, []float64{math.Sqrt(1500 * 2400), 2 * 0.30 * 0.25 / 0.55, 30}, got, 1e-12)
	got, err = rule(t, "morse-mean", Morse).Mix([]float64{4.4, 1.9, 1.27}, []float64{1.1, 2.1, 1.41})
	require.NoError(t, err)
	assert.InDeltaSlice(t, []float64{2.2, 2.0, 1.34}, got, 1e-14)
	// C = 0 (no dispersion) is allowed and mixes to 0.
	got, err = rule(t, "exp-arithmetic", Buckingham).Mix([]float64{1500, 0.3, 0}, b)
	require.NoError(t, err)
	assert.Zero(t, got[2])
}

// Extreme but valid parameters do not overflow (Waldman–Hagler scales σ).
func TestNoOverflow(t *testing.T) {
	got, err := rule(t, "waldman-hagler", LennardJones).Mix([]float64{1e300, 1e60}, []float64{1e300, 1e60})
	require.NoError(t, err)
	assert.InEpsilon(t, 1e300, got[0], 1e-14)
	assert.InEpsilon(t, 1e60, got[1], 1e-14)
}

func TestErrors(t *testing.T) {
	_, err := Lookup("kong", Morse)
	assert.ErrorIs(t, err, ErrRule)
	assert.Contains(t, err.Error(), "morse-mean")
	_, err = Lookup("nope", LennardJones)
	assert.ErrorIs(t, err, ErrRule)
	_, err = Lookup("geometric", "harmonic")
	assert.ErrorIs(t, err, ErrRule)
	r := rule(t, "lorentz-berthelot", LennardJones)
	for _, bad := range [][]float64{{0, 3}, {-1, 3}, {math.NaN(), 3}, {math.Inf(1), 3}, {1}} {
		_, err := r.Mix(bad, []float64{1, 3})
		assert.True(t, errors.Is(err, core.ErrParam), "%v", bad)
	}
}

// TestParamsOfTheModels: the parameters Mix checks are those of the
// built-in models, by name, order and constraint.
func TestParamsOfTheModels(t *testing.T) {
	reg := models.NewRegistry()
	for form, ps := range params {
		m, err := reg.Lookup(form)
		require.NoError(t, err, form)
		info := m.Info()
		require.Len(t, ps, len(info.Params), form)
		for i, p := range info.Params {
			assert.Equal(t, p.Name, ps[i].Name, form)
			assert.Equal(t, p.Constraint, ps[i].Constraint, "%s %s", form, p.Name)
			assert.Equal(t, p.Dimension, ps[i].Dimension, "%s %s", form, p.Name)
		}
	}
	// Buckingham's C may be 0 (no dispersion), not negative; the error
	// names the parameter.
	r := rule(t, "exp-arithmetic", Buckingham)
	_, err := r.Mix([]float64{1500, 0.3, 0}, []float64{1500, 0.3, 25})
	assert.NoError(t, err)
	_, err = r.Mix([]float64{1500, 0.3, -1}, []float64{1500, 0.3, 25})
	assert.ErrorIs(t, err, core.ErrParam)
	assert.ErrorContains(t, err, "C = -1")
}

// TestByParameterNames: a rule that mixes each parameter on its own applies
// to any form with its parameters by name and dimension (here those of the
// Mie n–m form of the library and of a plugin Morse), the others must agree;
// the check values are the rules' own formulas (Lorentz 1881, Berthelot
// 1898: σ₁₂ = (σ₁+σ₂)/2, ε₁₂ = √(ε₁ε₂)).
func TestByParameterNames(t *testing.T) {
	mie := []core.Param{
		{Name: "epsilon", Dimension: units.Energy}, {Name: "sigma", Dimension: units.Length},
		{Name: "n", Dimension: units.Dimensionless}, {Name: "m", Dimension: units.Dimensionless},
	}
	var names []string
	for _, r := range ForModel("mie", mie) {
		names = append(names, r.Name)
	}
	assert.Equal(t, []string{"lorentz-berthelot", "geometric", "fender-halsey"}, names,
		"Waldman–Hagler and Kong rest on the 12-6 form")
	r, err := LookupFor("lorentz-berthelot", "mie", mie)
	require.NoError(t, err)
	got, err := r.MixModel("mie", mie, []float64{0.0103, 3.40, 14, 6}, []float64{0.0140, 3.60, 14, 6})
	require.NoError(t, err)
	assert.InDeltaSlice(t, []float64{math.Sqrt(0.0103 * 0.0140), 3.5, 14, 6}, got, 1e-15)

	_, err = r.MixModel("mie", mie, []float64{0.0103, 3.40, 14, 6}, []float64{0.0140, 3.60, 12, 6})
	assert.ErrorIs(t, err, ErrRule)
	assert.ErrorContains(t, err, "n = 14 and 12 differ")

	_, err = LookupFor("kong", "mie", mie)
	assert.ErrorIs(t, err, ErrRule)

	// Same names, other dimensions: not the rule's parameters.
	odd := []core.Param{{Name: "epsilon", Dimension: units.Energy}, {Name: "sigma", Dimension: units.InverseLength}}
	assert.Empty(t, ForModel("odd", odd))

	morse := []core.Param{
		{Name: "De", Dimension: units.Energy}, {Name: "a", Dimension: units.InverseLength}, {Name: "re", Dimension: units.Length},
	}
	r, err = LookupFor("morse-mean", "plugin-morse", morse)
	require.NoError(t, err)
	got, err = r.MixModel("plugin-morse", morse, []float64{4.4, 1.9, 1.27}, []float64{4.6, 1.8, 1.41})
	require.NoError(t, err)
	want, err := rule(t, "morse-mean", Morse).Mix([]float64{4.4, 1.9, 1.27}, []float64{4.6, 1.8, 1.41})
	require.NoError(t, err)
	assert.Equal(t, want, got, "the same rule as for the built-in Morse")
}

// TestExist: the message of a form without rules names the three forms of
// the rules and the parameters by which the mean rules apply to others
// (the package documentation's list), and LookupFor says it.
func TestExist(t *testing.T) {
	const want = "combining rules exist for lennard-jones, buckingham, morse and, by parameter names, " +
		"for forms with (epsilon, sigma), (A, rho, C), (De, a, re)"
	assert.Equal(t, want, Exist())
	_, err := LookupFor("lorentz-berthelot", "harmonic", []core.Param{{Name: "k", Dimension: units.ForceConstant}, {Name: "r0", Dimension: units.Length}})
	assert.ErrorIs(t, err, ErrRule)
	assert.ErrorContains(t, err, "none: "+want)
}
