package conformance_test

import (
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"github.com/pairwell/pairwell/conformance"
	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/formula"
	"github.com/pairwell/pairwell/models"
)

// redomained overrides a potential's domain (a form that declares the
// wrong thing).
type redomained struct {
	core.Potential
	edit func(*core.Domain)
}

func (p redomained) Domain() core.Domain {
	d := p.Potential.Domain()
	p.edit(&d)
	return d
}

type redomainedModel struct {
	core.Model
	edit func(*core.Domain)
}

func (m redomainedModel) New(ps []float64) (core.Potential, error) {
	p, err := m.Model.New(ps)
	if err != nil {
		return nil, err
	}
	return redomained{p, m.edit}, nil
}

// TestDeclaredTail: a Coulomb-like tail (the Kratzer form, A. Kratzer,
// Z. Phys. 3, 289 (1920): V = De(re²/r² − 2re/r), tail −2De·re/r) fails
// the fixed-point asymptote check (|V(10⁶re)|/De = 2e-6 > 1e-6) unless it
// is declared; a declared tail with a wrong limit, or a declared power that
// is not the form's, fails.
func TestDeclaredTail(t *testing.T) {
	kratzer := func(tail float64) core.Model {
		f, err := formula.NewForm(formula.Decl{Key: "kratzer", Formula: "De*((re/r)^2 - 2*re/r)", Limit: "0", Tail: tail,
			Params: []formula.ParamDecl{{Name: "De", Unit: "eV", Constraint: "> 0"}, {Name: "re", Unit: "A", Constraint: "> 0"}}})
		require.NoError(t, err)
		return f
	}
	tests := []struct {
		name    string
		model   core.Model
		params  []float64
		pass    bool
		message string
	}{
		{"kratzer declared", kratzer(1), []float64{4.6, 1.27}, true, "tail amplitude"},
		{"kratzer undeclared", kratzer(0), []float64{4.6, 1.27}, false, "does not approach"},
		{"kratzer wrong limit", redomainedModel{kratzer(1), func(d *core.Domain) { d.Limit = 1e-3 }}, []float64{4.6, 1.27}, false, "declared power"},
		{"lennard-jones declared 1/r", redomainedModel{models.LennardJones{}, func(d *core.Domain) { d.TailPower = 1 }}, []float64{0.0104, 3.4}, false, "declared power"},
		{"lennard-jones declared 1/r^6", redomainedModel{models.LennardJones{}, func(d *core.Domain) { d.TailPower = 6 }}, []float64{0.0104, 3.4}, true, "tail amplitude"},
	}
	for _, tt := range tests {
		rep := run(t, tt.model, [][]float64{tt.params}, conformance.Settings{})
		as := find(rep, conformance.CheckAsymptote, -1)[0]
		assert.Equal(t, tt.pass, as.Passed, "%s: %s", tt.name, as.Message)
		assert.Contains(t, as.Message, tt.message, tt.name)
	}
}

// TestTailDeclaration: the formula form refuses tails that make no sense.
func TestTailDeclaration(t *testing.T) {
	for _, tt := range []struct {
		limit string
		tail  float64
	}{{"0", -1}, {"0", 7}, {"none", 1}} {
		_, err := formula.NewForm(formula.Decl{Key: "k", Formula: "De*((re/r)^2 - 2*re/r)", Limit: tt.limit, Tail: tt.tail,
			Params: []formula.ParamDecl{{Name: "De", Unit: "eV"}, {Name: "re", Unit: "A"}}})
		assert.ErrorIs(t, err, formula.ErrDecl, "%+v", tt)
	}
}
