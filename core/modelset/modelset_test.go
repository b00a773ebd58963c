package modelset_test

import (
	"fmt"
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
	f.Add("x = {a = {b = [[1], '[{'], c = \"\"\"{[\"\"\"}} # [[\n" + "[[entry]]\nname=\"a\"\nspec=\"lj:epsilon=1,sigma=1\"")
	f.Add("x = " + strings.Repeat("[", 9) + strings.Repeat("]", 9))
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

// TestLimits: a hostile model set is refused before the TOML decoder sees
// it, and messages stay short.
func TestLimits(t *testing.T) {
	entry := "[[entry]]\nname = \"a\"\nspec = \"morse:De=4.6,a=1.87,re=1.27\"\n"
	nested := func(n int) string {
		return "x = " + strings.Repeat("{a = ", n) + "1" + strings.Repeat("}", n) + "\n"
	}
	// 40 KB of nested inline tables took the decoder 33 s and 4.6 GB.
	_, err := modelset.Parse([]byte(nested(8000)+entry), "deep.toml")
	require.ErrorIs(t, err, modelset.ErrFormat)
	assert.ErrorContains(t, err, "line 1: tables and arrays nested deeper than 8")
	_, err = modelset.Parse([]byte("x = "+strings.Repeat("[", 9)+strings.Repeat("]", 9)+"\n"+entry), "deep.toml")
	assert.ErrorContains(t, err, "nested deeper")
	// Depth 8 is allowed (and then rejected as an unknown key, by the decoder).
	_, err = modelset.Parse([]byte(nested(7)+entry), "ok.toml")
	assert.ErrorContains(t, err, "unknown key x")
	// Brackets in strings and comments do not count.
	brackets := strings.Repeat("[{", 20)
	doc := "title = \"" + brackets + "\" # " + brackets + "\n" +
		"[defaults]\npair = '" + brackets + "'\n" + `
[[entry]]
name = "a"
spec = """morse:De=4.6,a=1.87,re=1.27"""
`
	_, err = modelset.Parse([]byte(doc), "strings.toml")
	assert.NotContains(t, fmt.Sprint(err), "nested")
	// Size.
	big := entry + "# " + strings.Repeat("x", modelset.MaxSize) + "\n"
	_, err = modelset.Parse([]byte(big), "big.toml")
	assert.ErrorContains(t, err, "the limit is 1048576")
	// A long decoder message is cut.
	_, err = modelset.Parse([]byte("title = \""+strings.Repeat("é", 5000)), "long.toml")
	require.Error(t, err)
	assert.Less(t, len([]rune(err.Error())), 400)
	// A denormal mass is invalid.
	s, err := modelset.Parse([]byte(entry+"mu = 5e-324\n"), "mu.toml")
	require.NoError(t, err)
	_, err = s.Build(models.NewRegistry())
	assert.ErrorIs(t, err, core.ErrParam)
	assert.ErrorContains(t, err, "from 0.0001 u")
}
