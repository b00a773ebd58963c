package suggest

import (
	"testing"

	"github.com/stretchr/testify/assert"
)

func TestDistance(t *testing.T) {
	// Optimal-string-alignment distances, worked by hand (common practice:
	// the classic examples of the edit-distance literature).
	tests := []struct {
		a, b string
		want int
	}{
		{"", "", 0},
		{"kitten", "sitting", 3},
		{"flaw", "lawn", 2},
		{"taylr", "taylor", 1},
		{"ca", "ac", 1},  // one transposition
		{"ca", "abc", 3}, // OSA, not unrestricted Damerau (which gives 2)
		{"abc", "", 3},
	}
	for _, tt := range tests {
		assert.Equal(t, tt.want, distance([]rune(tt.a), []rune(tt.b)), "%q %q", tt.a, tt.b)
		assert.Equal(t, tt.want, distance([]rune(tt.b), []rune(tt.a)), "%q %q", tt.b, tt.a)
	}
}

func TestNear(t *testing.T) {
	cmds := []string{"inspect", "compare", "period", "motion", "validity", "plot", "check", "demo"}
	tests := []struct {
		in   string
		want []string
	}{
		{"inspct", []string{"inspect"}},
		{"INSPECT", []string{"inspect"}},
		{"comapre", []string{"compare"}},
		{"insp", []string{"inspect"}},
		{"xyz", nil},
		{"", nil},
		{"p", nil},
	}
	for _, tt := range tests {
		assert.Equal(t, tt.want, Near(tt.in, cmds), tt.in)
	}
	assert.Equal(t, " (did you mean taylor?)", Hint("taylr", []string{"taylor", "motion", "well"}))
	assert.Equal(t, "", Hint("zzz", []string{"taylor"}))
	assert.Equal(t, " (did you mean a, b or c?)", Phrase([]string{"a", "b", "c"}))
	assert.Equal(t, " (did you mean a or b?)", Phrase([]string{"a", "b"}))
}

func FuzzNear(f *testing.F) {
	for _, s := range []string{"", "inspct", "ü", "\xff"} {
		f.Add(s)
	}
	known := []string{"inspect", "compare", "Cl", "Og"}
	f.Fuzz(func(t *testing.T, s string) {
		got := Near(s, known)
		assert.LessOrEqual(t, len(got), 3)
		for _, g := range got {
			assert.Contains(t, known, g)
		}
	})
}
