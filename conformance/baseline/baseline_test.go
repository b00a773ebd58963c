package baseline_test

import (
	"bytes"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"github.com/pairwell/pairwell/conformance/baseline"
	"github.com/pairwell/pairwell/core/modelset"
	"github.com/pairwell/pairwell/models"
)

// set is an invented model set (illustrative numbers, not fitted).
const set = `
title = "baseline test set (invented)"
[defaults]
pair = "1H-35Cl"

[[entry]]
name  = "morse"
model = "morse"
[entry.params]
De = "4.6 eV"
a  = 1.87
re = "127 pm"

[[entry]]
name = "lj"
spec = "lj:epsilon=0.0104,sigma=3.4"
pair = "Ar-Ar"

[[entry]]
name = "buckingham"
spec = "buckingham:A=1500,rho=0.3,C=25"
mu = 20

[[entry]]
name = "harmonic"
spec = "harmonic:k=30,r0=1.2"
`

func parse(t *testing.T, doc string) *modelset.Set {
	t.Helper()
	s, err := modelset.Parse([]byte(doc), "test.toml")
	require.NoError(t, err)
	return s
}

func record(t *testing.T, doc string) *baseline.Baseline {
	t.Helper()
	b, err := baseline.Record(parse(t, doc), models.NewRegistry(), baseline.Settings{Tool: "pairwell test"})
	require.NoError(t, err)
	return b
}

func quantity(t *testing.T, e baseline.Entry, name string) float64 {
	t.Helper()
	for _, q := range e.Quantities {
		if q.Name == name {
			return float64(q.Value)
		}
	}
	t.Fatalf("entry %s has no quantity %s", e.Name, name)
	return 0
}

func TestRecordValues(t *testing.T) {
	b := record(t, set)
	assert.Equal(t, baseline.Format, b.Format)
	assert.Equal(t, baseline.Version, b.Version)
	assert.Equal(t, "pairwell test", b.Tool)
	assert.Equal(t, 0.01, b.ValidityTolerance)
	require.Len(t, b.Entries, 4)

	// Morse (P. M. Morse, Phys. Rev. 34, 57 (1929)): re, depth De,
	// k = 2De·a², c₃ = V‴/3! = −De·a³, c₄ = V⁗/4! = 14De·a⁴/24.
	m := b.Entries[0]
	assert.Equal(t, "morse:De=4.6 eV,a=1.87,re=127 pm", m.Spec)
	assert.Equal(t, "1H-35Cl", m.Pair)
	const De, a, re = 4.6, 1.87, 1.27
	assert.InEpsilon(t, re, quantity(t, m, "re"), 1e-14)
	assert.InEpsilon(t, De, quantity(t, m, "depth"), 1e-14)
	assert.InEpsilon(t, 2*De*a*a, quantity(t, m, "k"), 1e-13)
	assert.InEpsilon(t, -De*a*a*a, quantity(t, m, "c3"), 1e-13)
	assert.InEpsilon(t, 14*De*a*a*a*a/24, quantity(t, m, "c4"), 1e-13)
	we, _ := models.MorseSpectroscopic(De, a, float64(m.Mu))
	assert.InEpsilon(t, we, quantity(t, m, "wavenumber"), 1e-12)
	for _, q := range []string{"validity.compression", "validity.stretch", "validity.period_energy"} {
		v := quantity(t, m, q)
		assert.True(t, v > 0 && !math.IsInf(v, 0), "%s = %g", q, v)
	}
	assert.Equal(t, []baseline.Quantity{{Name: "De", Unit: "eV", Value: 4.6}, {Name: "a", Unit: "1/Å", Value: 1.87}, {Name: "re", Unit: "Å", Value: 1.27}}, m.Params)

	// Lennard-Jones 12-6: re = 2^{1/6}σ, k = 72ε/re².
	lj := b.Entries[1]
	rmin := math.Pow(2, 1.0/6) * 3.4
	assert.InEpsilon(t, rmin, quantity(t, lj, "re"), 1e-14)
	assert.InEpsilon(t, 72*0.0104/(rmin*rmin), quantity(t, lj, "k"), 1e-13)

	// Harmonic: unbounded depth and validity ranges (the harmonic
	// truncation of a harmonic well is exact), c₃ = 0.
	h := b.Entries[3]
	assert.True(t, math.IsInf(quantity(t, h, "depth"), 1))
	assert.Equal(t, 0.0, quantity(t, h, "c3"))
	assert.True(t, math.IsInf(quantity(t, h, "validity.stretch"), 1))
}

// TestHandbookRoundTrip records a Morse well built from the HCl constants
// of K. P. Huber and G. Herzberg, Constants of Diatomic Molecules (1979)
// (ωe = 2990.946 cm⁻¹, ωexe = 52.8186 cm⁻¹, re = 1.27455 Å; from memory):
// the recorded harmonic wavenumber is ωe again.
func TestHandbookRoundTrip(t *testing.T) {
	m1, m2 := 1.00782503223, 34.968852682 // AME2020 (from memory)
	mu := m1 * m2 / (m1 + m2)
	ps, err := models.MorseFromSpectroscopic(2990.946, 52.8186, 1.27455, mu)
	require.NoError(t, err)
	doc := "[[entry]]\nname = \"hcl\"\nmodel = \"morse\"\npair = \"1H-35Cl\"\n[entry.params]\n" +
		"De = " + fmtFloat(ps[0]) + "\na = " + fmtFloat(ps[1]) + "\nre = " + fmtFloat(ps[2]) + "\n"
	b := record(t, doc)
	assert.InEpsilon(t, 2990.946, quantity(t, b.Entries[0], "wavenumber"), 1e-10)
	assert.InEpsilon(t, 1.27455, quantity(t, b.Entries[0], "re"), 1e-14)
}

func fmtFloat(v float64) string { return strconv.FormatFloat(v, 'g', -1, 64) }

func TestRoundTripAndVerify(t *testing.T) {
	path := filepath.Join(t.TempDir(), "baseline.json")
	b := record(t, set)
	require.NoError(t, b.WriteFile(path))
	back, err := baseline.ReadFile(path)
	require.NoError(t, err)
	assert.Equal(t, b, back, "JSON round trip is exact, infinities included")
	data, _ := os.ReadFile(path)
	assert.Contains(t, string(data), `"+Inf"`)

	d, err := baseline.Verify(back, parse(t, set), models.NewRegistry(), 1e-9, baseline.Settings{})
	require.NoError(t, err)
	assert.Empty(t, d.Changes)
	assert.Equal(t, 4, d.Entries)
	assert.Greater(t, d.Compared, 40)
}

func TestDrift(t *testing.T) {
	old := record(t, set)
	changed := strings.Replace(set, `De = "4.6 eV"`, `De = "4.61 eV"`, 1)
	changed = strings.Replace(changed, "name = \"harmonic\"", "name = \"harmonic2\"", 1)
	d, err := baseline.Verify(old, parse(t, changed), models.NewRegistry(), 1e-9, baseline.Settings{})
	require.NoError(t, err)
	moved := map[string]baseline.Change{}
	var kinds []string
	for _, c := range d.Changes {
		kinds = append(kinds, c.Kind+" "+c.Entry+" "+c.Quantity)
		if c.Kind == baseline.Moved {
			assert.Equal(t, "morse", c.Entry)
			moved[c.Quantity] = c
		}
	}
	require.Contains(t, moved, "param De")
	assert.Equal(t, 4.6, moved["param De"].Old)
	assert.Equal(t, 4.61, moved["param De"].New)
	assert.InEpsilon(t, 0.01/4.61, moved["param De"].Rel, 1e-12)
	assert.Contains(t, moved, "depth")
	assert.Contains(t, moved, "k")
	assert.NotContains(t, moved, "re", "re does not depend on De")
	assert.Contains(t, kinds, "removed harmonic ")
	assert.Contains(t, kinds, "added harmonic2 ")
	// A loose tolerance hides the 0.2% change.
	d, err = baseline.Verify(old, parse(t, strings.Replace(set, `De = "4.6 eV"`, `De = "4.61 eV"`, 1)), models.NewRegistry(), 0.1, baseline.Settings{})
	require.NoError(t, err)
	assert.Empty(t, d.Changes)
	_, err = baseline.Verify(old, parse(t, set), models.NewRegistry(), -1, baseline.Settings{})
	assert.Error(t, err)
}

func TestReadErrors(t *testing.T) {
	var good bytes.Buffer
	require.NoError(t, record(t, set).Write(&good))
	for name, doc := range map[string]string{
		"empty":       "",
		"truncated":   good.String()[:good.Len()/2],
		"not json":    "format = 'pairwell-baseline'",
		"foreign":     `{"name": "left-pad", "version": "1.3.0"}`,
		"array":       `[1, 2]`,
		"version":     strings.Replace(good.String(), `"version": 1`, `"version": 2`, 1),
		"unknown key": strings.Replace(good.String(), `"tool"`, `"toool"`, 1),
		"bad value":   strings.Replace(good.String(), `"+Inf"`, `"Infinity"`, 1),
		"duplicate":   strings.Replace(good.String(), `"name": "lj"`, `"name": "morse"`, 1),
		"trailing":    good.String() + "{}",
	} {
		_, err := baseline.Read([]byte(doc), name)
		assert.ErrorIs(t, err, baseline.ErrFormat, name)
	}
	_, err := baseline.ReadFile(filepath.Join(t.TempDir(), "missing.json"))
	assert.ErrorIs(t, err, os.ErrNotExist)
}

func TestRelativeChange(t *testing.T) {
	inf, nan := math.Inf(1), math.NaN()
	for _, c := range []struct{ old, new, want float64 }{
		{1, 1, 0}, {0, 0, 0}, {inf, inf, 0}, {nan, nan, 0},
		{1, 1.5, 1.0 / 3}, {1.5, 1, 1.0 / 3}, {0, 1e-300, 1}, {-1, 1, 2},
		{1, inf, inf}, {inf, -inf, inf}, {1, nan, inf},
	} {
		assert.InDelta(t, c.want, baseline.RelativeChange(c.old, c.new), 1e-15, "%g → %g", c.old, c.new)
	}
}

func TestRecordError(t *testing.T) {
	_, err := baseline.Record(parse(t, "[[entry]]\nname = \"x\"\nspec = \"quartic:k=1\"\n"), models.NewRegistry(), baseline.Settings{})
	assert.Error(t, err)
}
