package modelset

import (
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"github.com/pairwell/pairwell/core"
)

func TestMarshalRoundTrip(t *testing.T) {
	s := &Set{Title: `fits to "scan" (invented)`, Entries: []Entry{
		{Name: "morse-fit", Spec: core.Spec{Model: "morse", Params: []core.Assignment{{Name: "De", Value: "4.6 eV"}, {Name: "a", Value: "1.87"}, {Name: "re", Value: "1.2700000000000001 Å"}}}, Pair: "1H-35Cl"},
		{Name: "lj", Spec: core.Spec{Model: "lj", Params: []core.Assignment{{Name: "epsilon", Value: "0.5"}, {Name: "sigma", Value: "1.1"}}}, Mu: "0.98 u"},
	}}
	data, err := Marshal(s, "written by a test\nsecond line")
	require.NoError(t, err)
	assert.Contains(t, string(data), "# written by a test\n# second line\n")
	back, err := Parse(data, "round trip")
	require.NoError(t, err)
	assert.Equal(t, s.Title, back.Title)
	require.Len(t, back.Entries, 2)
	for i, e := range s.Entries {
		b := back.Entries[i]
		assert.Equal(t, e.Name, b.Name)
		assert.Equal(t, e.Pair, b.Pair)
		assert.Equal(t, e.Mu, b.Mu)
		assert.ElementsMatch(t, e.Spec.Params, b.Spec.Params)
	}
	_, err = Marshal(&Set{Entries: []Entry{{Name: "a b"}}}, "")
	assert.ErrorIs(t, err, ErrFormat)
	_, err = Marshal(&Set{}, "")
	assert.ErrorIs(t, err, ErrFormat)
}
