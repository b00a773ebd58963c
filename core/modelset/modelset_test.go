package modelset_test

import (
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/modelset"
	"github.com/pairwell/pairwell/models"
)

// example is an invented model set (illustrative numbers, not fitted).
const example = `
title = "invented example"
[defaults]
pair = "1H-35Cl"

[[entry]]
name  = "morse-fit"
model = "morse"
[entry.params]
De = "4.6 eV"
a  = 1.87
re = "127 pm"

[[entry]]
name = "lj-guess"
spec = "lj:epsilon=0.5,sigma=1.1"
mu   = 0.98
`

func TestParseAndBuild(t *testing.T) {
	s, err := modelset.Parse([]byte(example), "example.toml")
	require.NoError(t, err)
	assert.Equal(t, "invented example", s.Title)
	require.Len(t, s.Entries, 2)
	assert.Equal(t, "1H-35Cl", s.Entries[0].Pair)
	assert.Equal(t, "", s.Entries[1].Pair)
	assert.Equal(t, "0.98", s.Entries[1].Mu)

	built, err := s.Build(models.NewRegistry())
	require.NoError(t, err)
	require.Len(t, built, 2)
	assert.Equal(t, []float64{4.6, 1.87, 1.27}, built[0].Instance.Params)
	// μ(¹H³⁵Cl) from AME2020 masses 1.00782503223 u and 34.968852682 u
	// (from memory).
	m1, m2 := 1.00782503223, 34.968852682
	assert.InEpsilon(t, m1*m2/(m1+m2), built[0].Mu, 1e-12)
	assert.Equal(t, 0.98, built[1].Mu)
}

func TestParseErrors(t *testing.T) {
	tests := []struct {
		name, doc, mention string
	}{
		{"malformed", `[[entry]`, "invalid model set"},
		{"no entries", `title = "x"`, "no [[entry]]"},
		{"unknown key", "[[entry]]\nname=\"a\"\nmodle=\"morse\"", "modle"},
		{"no name", "[[entry]]\nmodel=\"morse\"", "name"},
		{"bad name", "[[entry]]\nname=\"a b\"\nmodel=\"morse\"", "name"},
		{"duplicate", "[[entry]]\nname=\"a\"\nspec=\"lj:epsilon=1,sigma=1\"\n[[entry]]\nname=\"a\"\nspec=\"lj:epsilon=1,sigma=1\"", "twice"},
		{"both", "[[entry]]\nname=\"a\"\nspec=\"lj:epsilon=1,sigma=1\"\nmodel=\"lj\"", "not both"},
		{"neither", "[[entry]]\nname=\"a\"", "needs model"},
		{"pair and mu", "[[entry]]\nname=\"a\"\nspec=\"lj:epsilon=1,sigma=1\"\npair=\"H-H\"\nmu=1", "not both"},
		{"bad value", "[[entry]]\nname=\"a\"\nmodel=\"lj\"\n[entry.params]\nepsilon=true", "number or a string"},
		{"comma", "[[entry]]\nname=\"a\"\nmodel=\"lj\"\n[entry.params]\nepsilon=\"1,sigma=2\"", "may not contain"},
	}
	for _, tt := range tests {
		_, err := modelset.Parse([]byte(tt.doc), "t.toml")
		require.Error(t, err, tt.name)
		assert.ErrorIs(t, err, modelset.ErrFormat, tt.name)
		assert.Contains(t, err.Error(), tt.mention, tt.name)
		assert.NotContains(t, err.Error(), "\n", tt.name)
	}
}

func TestBuildErrors(t *testing.T) {
	tests := []struct {
		name, doc, mention string
		is                 error
	}{
		{"unknown model", "[[entry]]\nname=\"a\"\nspec=\"quartic:k=1\"", "unknown model", core.ErrSpec},
		{"bad param", "[[entry]]\nname=\"a\"\nmodel=\"lj\"\n[entry.params]\nepsilon=1\nsigmaa=2", `entry "a"`, core.ErrSpec},
		{"constraint", "[[entry]]\nname=\"a\"\nmodel=\"lj\"\n[entry.params]\nepsilon=-1\nsigma=2", "> 0", core.ErrParam},
		{"bad mu", "[[entry]]\nname=\"a\"\nspec=\"lj:epsilon=1,sigma=1\"\nmu=\"-1 u\"", "mu", core.ErrParam},
	}
	for _, tt := range tests {
		s, err := modelset.Parse([]byte(tt.doc), "t.toml")
		require.NoError(t, err, tt.name)
		_, err = s.Build(models.NewRegistry())
		require.Error(t, err, tt.name)
		assert.ErrorIs(t, err, tt.is, tt.name)
		assert.Contains(t, err.Error(), tt.mention, tt.name)
	}
	s, err := modelset.Parse([]byte("[[entry]]\nname=\"a\"\nspec=\"lj:epsilon=1,sigma=1\"\npair=\"H-Qq\""), "t.toml")
	require.NoError(t, err)
	_, err = s.Build(models.NewRegistry())
	assert.ErrorContains(t, err, "Qq")
}

func FuzzParse(f *testing.F) {
	f.Add(example)
	f.Add("[[entry]]\nname=\"a\"\nspec=\"lj:epsilon=1,sigma=1\"")
	reg := models.NewRegistry()
	f.Fuzz(func(t *testing.T, doc string) {
		s, err := modelset.Parse([]byte(doc), "fuzz.toml")
		if err != nil {
			if strings.Contains(err.Error(), "\n") {
				t.Fatalf("multi-line error %q", err)
			}
			return
		}
		if len(s.Entries) == 0 {
			t.Fatal("parsed a set with no entries")
		}
		_, _ = s.Build(reg) // must not panic
	})
}
