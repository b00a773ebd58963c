// Package suggest finds the near misses of a mistyped name among the names a
// program knows, for "did you mean …?" hints in error messages.
package suggest

import (
	"slices"
	"strings"
)

// Near returns the known names closest to name, best first, at most three.
//
// Names are compared ignoring case. A known name is near when its
// Damerau–Levenshtein distance (optimal string alignment: insertions,
// deletions, substitutions and transpositions of adjacent runes each count 1)
// from name is at most max(1, len/3) runes and less than the length of name
// (a single rune is never replaced by another), or when one is a prefix of the
// other and the shorter has at least 2 runes. An exact match (ignoring case)
// is returned alone. The result is nil when nothing is near.
func Near(name string, known []string) []string {
	in := []rune(strings.ToLower(strings.TrimSpace(name)))
	if len(in) == 0 {
		return nil
	}
	type cand struct {
		name string
		d    int
	}
	var cs []cand
	for _, k := range known {
		kr := []rune(strings.ToLower(k))
		d := distance(in, kr)
		if d == 0 {
			return []string{k}
		}
		limit := max(1, min(len(in), len(kr))/3)
		short, long := in, kr
		if len(short) > len(long) {
			short, long = long, short
		}
		prefix := len(short) >= 2 && slices.Equal(long[:len(short)], short)
		if (d <= limit && d < len(in)) || prefix {
			if prefix {
				d = min(d, 1)
			}
			cs = append(cs, cand{k, d})
		}
	}
	slices.SortStableFunc(cs, func(a, b cand) int { return a.d - b.d })
	var out []string
	for _, c := range cs {
		if !slices.Contains(out, c.name) {
			out = append(out, c.name)
		}
		if len(out) == 3 {
			break
		}
	}
	return out
}

// Hint returns " (did you mean X?)", " (did you mean X or Y?)" … for the
// near misses of name among known, or "" when there are none.
func Hint(name string, known []string) string {
	return Phrase(Near(name, known))
}

// Phrase returns " (did you mean X?)", " (did you mean X, Y or Z?)" for the
// given candidates, or "" for none.
func Phrase(cands []string) string {
	switch len(cands) {
	case 0:
		return ""
	case 1:
		return " (did you mean " + cands[0] + "?)"
	}
	return " (did you mean " + strings.Join(cands[:len(cands)-1], ", ") + " or " + cands[len(cands)-1] + "?)"
}

// distance is the optimal-string-alignment distance between a and b.
func distance(a, b []rune) int {
	// Three rows of the dynamic-programming table suffice.
	prev2 := make([]int, len(b)+1)
	prev := make([]int, len(b)+1)
	cur := make([]int, len(b)+1)
	for j := range prev {
		prev[j] = j
	}
	for i := 1; i <= len(a); i++ {
		cur[0] = i
		for j := 1; j <= len(b); j++ {
			cost := 1
			if a[i-1] == b[j-1] {
				cost = 0
			}
			cur[j] = min(prev[j]+1, cur[j-1]+1, prev[j-1]+cost)
			if i > 1 && j > 1 && a[i-1] == b[j-2] && a[i-2] == b[j-1] {
				cur[j] = min(cur[j], prev2[j-2]+1)
			}
		}
		prev2, prev, cur = prev, cur, prev2
	}
	return prev[len(b)]
}
