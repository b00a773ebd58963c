package report

import (
	"encoding/json"
	"errors"
	"fmt"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/models"
)

// morseInputs returns n Morse forms of increasing steepness, every third
// one replaced by an input carrying an error.
func morseInputs(t testing.TB, n int) []CompareInput {
	reg := models.NewRegistry()
	var in []CompareInput
	for i := range n {
		name := fmt.Sprintf("m%d", i)
		if i%3 == 2 {
			in = append(in, CompareInput{Name: name, Model: "morse", Err: fmt.Errorf("cannot match: %w", core.ErrParam)})
			continue
		}
		inst, err := reg.Build(fmt.Sprintf("morse:De=4,a=%g,re=1.2", 1+0.1*float64(i)))
		require.NoError(t, err)
		in = append(in, CompareInput{Name: name, Instance: inst, Mass: Mass{Mu: 7}})
	}
	return in
}

func TestCompareOrderAndWorkers(t *testing.T) {
	in := morseInputs(t, 12)
	serial, err := Compare(in, CompareSettings{Workers: 1, Validity: true})
	require.NoError(t, err)
	parallel, err := Compare(in, CompareSettings{Workers: 8, Validity: true})
	require.NoError(t, err)
	a, err := json.Marshal(serial)
	require.NoError(t, err)
	b, err := json.Marshal(parallel)
	require.NoError(t, err)
	assert.Equal(t, string(a), string(b), "results do not depend on the scheduling")
	for i, r := range parallel {
		assert.Equal(t, in[i].Name, r.Name)
		if i%3 == 2 {
			assert.True(t, errors.Is(r.Err, core.ErrParam))
			assert.Nil(t, r.Inspect)
			continue
		}
		require.NoError(t, r.Err)
		// Morse: V_2's period limit E/De = 1 − (1 − τ)² (closed form from
		// T = T0/√(1 − E/De), standard result; from memory).
		assert.InEpsilon(t, 1-0.99*0.99, r.Validity.Period.DepthFraction, 1e-9)
	}
	var calls int
	_, err = Compare(in, CompareSettings{Workers: 1, Progress: func() { calls++ }})
	require.NoError(t, err)
	assert.Equal(t, len(in), calls)
}

func TestCompareRowJSON(t *testing.T) {
	rows, err := Compare(morseInputs(t, 3), CompareSettings{Validity: true})
	require.NoError(t, err)
	var ok, bad map[string]any
	b, err := json.Marshal(rows[0])
	require.NoError(t, err)
	require.NoError(t, json.Unmarshal(b, &ok))
	assert.Equal(t, "m0", ok["name"])
	assert.Equal(t, "morse", ok["model"])
	for _, k := range []string{"params", "equilibrium_r_angstrom", "well_depth_ev", "harmonic_period_fs", "validity"} {
		assert.Contains(t, ok, k)
	}
	assert.Nil(t, ok["error"])
	assert.Contains(t, ok, "error")
	b, err = json.Marshal(rows[2])
	require.NoError(t, err)
	require.NoError(t, json.Unmarshal(b, &bad))
	assert.Equal(t, map[string]any{"name": "m2", "model": "morse", "notes": []any{}, "error": "cannot match: invalid parameter"}, bad)

	all, first := Failed(rows)
	assert.False(t, all)
	assert.NoError(t, first)
	all, first = Failed(rows[2:])
	assert.True(t, all)
	assert.ErrorIs(t, first, core.ErrParam)
}

func TestCompareSettings(t *testing.T) {
	in := morseInputs(t, 1)
	for _, s := range []CompareSettings{{Order: 1}, {Order: 5}, {Tolerance: -0.1}, {Tolerance: 1}} {
		_, err := Compare(in, s)
		assert.ErrorIs(t, err, core.ErrParam, "%+v", s)
	}
	rows, err := Compare(in, CompareSettings{Order: 4, Tolerance: 0.001, Validity: true})
	require.NoError(t, err)
	assert.Equal(t, 4, rows[0].Validity.Order)
	assert.Equal(t, 0.001, rows[0].Validity.Tolerance)
	rows, err = Compare(nil, CompareSettings{})
	require.NoError(t, err)
	assert.Empty(t, rows)
	// Without Validity the ranges are not computed, and the key is null.
	rows, err = Compare(in, CompareSettings{})
	require.NoError(t, err)
	assert.Nil(t, rows[0].Validity)
	b, err := json.Marshal(rows[0])
	require.NoError(t, err)
	assert.Contains(t, string(b), `"validity":null`)
}

// BenchmarkCompare is the analysis of four Morse forms with validity (six
// inputs, two of which carry errors); BenchmarkCompareNoValidity the same
// without it, what compare does unless asked.
func BenchmarkCompare(b *testing.B) {
	in := morseInputs(b, 6)
	for b.Loop() {
		if _, err := Compare(in, CompareSettings{Validity: true}); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkCompareNoValidity(b *testing.B) {
	in := morseInputs(b, 6)
	for b.Loop() {
		if _, err := Compare(in, CompareSettings{}); err != nil {
			b.Fatal(err)
		}
	}
}

func TestInspectAllInOrder(t *testing.T) {
	var in []InspectInput
	for _, c := range morseInputs(t, 2*InspectChunk+7) {
		if c.Err == nil {
			in = append(in, InspectInput{Name: c.Name, Instance: c.Instance, Mass: c.Mass})
		}
	}
	var names []string
	err := InspectAll(in, 4, 3, func(i int, r Inspect, err error) error {
		require.NoError(t, err)
		assert.Equal(t, in[i].Name, r.Name)
		want, err := NewInspect(in[i].Name, in[i].Instance, 4, in[i].Mass)
		require.NoError(t, err)
		assert.Equal(t, want, r)
		names = append(names, r.Name)
		return nil
	})
	require.NoError(t, err)
	assert.Len(t, names, len(in))
	stop := errors.New("stop")
	calls := 0
	err = InspectAll(in, 4, 2, func(int, Inspect, error) error { calls++; return stop })
	assert.ErrorIs(t, err, stop)
	assert.Equal(t, 1, calls)
}
