package atoms

import (
	"math"
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// AME2020 atomic masses in u (Wang et al. 2021, Chin. Phys. C 45, 030003), from memory.
const (
	ame1H   = 1.00782503223
	ame2H   = 2.01410177812
	ame3H   = 3.01604928132
	ame12C  = 12 // exact, definition of u
	ame13C  = 13.00335483507
	ame14N  = 14.00307400443
	ame15N  = 15.00010889888
	ame16O  = 15.99491461957
	ame17O  = 16.99913175650
	ame18O  = 17.99915961286
	ame19F  = 18.99840316273
	ame35Cl = 34.968852682
	ame37Cl = 36.965902602
	ame79Br = 78.9183376
	ame81Br = 80.9162897
	ame127I = 126.9044719
	ame40Ar = 39.9623831237
	ame84Kr = 83.9114977282
	ame132X = 131.9041550856
)

func TestMassIsotopes(t *testing.T) {
	tests := []struct {
		symbol string
		want   float64
	}{
		{"1H", ame1H},            // AME2020, from memory
		{"2H", ame2H},            // AME2020, from memory
		{"D", ame2H},             // AME2020, from memory
		{"3H", ame3H},            // AME2020, from memory
		{"T", ame3H},             // AME2020, from memory
		{"12C", ame12C},          // definition of u
		{"13C", ame13C},          // AME2020, from memory
		{"14N", ame14N},          // AME2020, from memory
		{"15N", ame15N},          // AME2020, from memory
		{"16O", ame16O},          // AME2020, from memory
		{"17O", ame17O},          // AME2020, from memory
		{"18O", ame18O},          // AME2020, from memory
		{"19F", ame19F},          // AME2020, from memory
		{"35Cl", ame35Cl},        // AME2020, from memory
		{"³⁵Cl", ame35Cl},        // AME2020, from memory
		{"35cl", ame35Cl},        // AME2020, from memory
		{"37Cl", ame37Cl},        // AME2020, from memory
		{"79Br", ame79Br},        // AME2020, from memory
		{"81Br", ame81Br},        // AME2020, from memory
		{"127I", ame127I},        // AME2020, from memory
		{"40Ar", ame40Ar},        // AME2020, from memory
		{"84Kr", ame84Kr},        // AME2020, from memory
		{"132Xe", ame132X},       // AME2020, from memory
		{" 13C ", ame13C},        // AME2020, from memory
		{"14C", 14.0032419884},   // AME2020, from memory
		{"63Cu", 62.92959772},    // AME2020, from memory
		{"63CU", 62.92959772},    // AME2020, from memory
		{"197Au", 196.96656879},  // AME2020, from memory
		{"208Pb", 207.9766525},   // AME2020, from memory
		{"133Cs", 132.905451961}, // AME2020, from memory
		{"238U", 238.0507884},    // AME2020, from memory
		{"99Tc", 98.9062508},     // AME2020, from memory
		{"d", ame2H},             // AME2020, from memory
	}
	for _, tt := range tests {
		got, err := Mass(tt.symbol)
		require.NoError(t, err, tt.symbol)
		assert.InEpsilon(t, tt.want, got, 1e-13, tt.symbol)
	}
}

func TestMassElements(t *testing.T) {
	// IUPAC 2021 standard atomic weights (conventional/abridged), from memory.
	tests := []struct {
		symbol string
		want   float64
	}{
		{"H", 1.008},
		{"h", 1.008},
		{"He", 4.0026},
		{"C", 12.011},
		{"N", 14.007},
		{"O", 15.999},
		{"F", 18.998},
		{"Ne", 20.180},
		{"Cl", 35.45},
		{"cl", 35.45},
		{"Ar", 39.95},
		{"Br", 79.904},
		{"Kr", 83.798},
		{"I", 126.90},
		{"Xe", 131.29},
		{"xe", 131.29},
		{"XE", 131.29},
		{"CL", 35.45},
		{"Cs", 132.91}, // IUPAC 2021 abridged, from memory
		{"Au", 196.97}, // IUPAC 2021 abridged, from memory
		{"Pt", 195.08}, // IUPAC 2021 abridged, from memory
		{"Pb", 207.2},  // IUPAC 2021 conventional (interval [206.14, 207.94]), from memory
		{"Tl", 204.38}, // IUPAC 2021 conventional (interval [204.38, 204.39]), from memory
		{"Hg", 200.59}, // IUPAC 2021 abridged, from memory
		{"U", 238.03},  // IUPAC 2021 abridged, from memory
		{"Th", 232.04}, // IUPAC 2021 abridged, from memory
		{"Pa", 231.04}, // IUPAC 2021 abridged, from memory
		{"Bi", 208.98}, // IUPAC 2021 abridged, from memory
		{"Yb", 173.05}, // IUPAC 2021 abridged, from memory
		{"Zn", 65.38},  // IUPAC 2021 abridged, from memory
	}
	for _, tt := range tests {
		got, err := Mass(tt.symbol)
		require.NoError(t, err, tt.symbol)
		assert.InDelta(t, tt.want, got, 1e-12, tt.symbol)
	}
}

func TestTables(t *testing.T) {
	syms := Symbols()
	require.Len(t, syms, 118) // H (Z = 1) to Og (Z = 118)
	assert.Equal(t, "H", syms[0])
	assert.Equal(t, "Xe", syms[53])
	assert.Equal(t, "Og", syms[117])
	lower := map[string]bool{}
	for i, e := range elements {
		assert.Equal(t, i+1, e.z, e.symbol)
		// Symbols are distinct ignoring case: case-insensitive lookup is unambiguous.
		assert.False(t, lower[strings.ToLower(e.symbol)], e.symbol)
		lower[strings.ToLower(e.symbol)] = true
		// Standard weights exist exactly for the elements with a stable
		// isotope, plus Bi, Th, Pa and U (IUPAC 2021, from memory).
		hasStable := false
		for _, iso := range isotopes {
			if iso.symbol == e.symbol && iso.a > 0 && math.Abs(iso.mass-e.weight) < 5 {
				hasStable = true
			}
		}
		if e.weight > 0 {
			assert.True(t, hasStable, "%s: weight %v far from every isotope", e.symbol, e.weight)
		}
	}
	noWeight := 0
	for _, e := range elements {
		if e.weight == 0 {
			noWeight++
		}
	}
	// Tc, Pm, Po, At, Rn, Fr, Ra, Ac and Np–Og (26) have none.
	assert.Equal(t, 8+26, noWeight)
	// Sanity check of the isotope table: |m − A| < 0.1 u for these nuclides,
	// order by Z then A, and each belongs to a known element.
	z := func(sym string) int { return byLowerSymbol[strings.ToLower(sym)].z }
	for i, iso := range isotopes {
		assert.InDelta(t, float64(iso.a), iso.mass, 0.1, "%d%s", iso.a, iso.symbol)
		_, ok := byLowerSymbol[strings.ToLower(iso.symbol)]
		assert.True(t, ok, iso.symbol)
		if i > 0 {
			p := isotopes[i-1]
			assert.True(t, z(p.symbol) < z(iso.symbol) || (p.symbol == iso.symbol && p.a < iso.a), "%d%s", iso.a, iso.symbol)
		}
	}
	// Symbols returns a copy.
	syms[0] = "changed"
	assert.Equal(t, "H", Symbols()[0])
	assert.Contains(t, Isotopes(), "35Cl")
}

// TestStandardWeightsFromIsotopes checks the weights of a few mononuclidic
// elements against their single isotope: the abridged value is the AME2020
// mass rounded (IUPAC 2021 and AME2020, from memory).
func TestStandardWeightsFromIsotopes(t *testing.T) {
	for _, tt := range []struct {
		el  string
		iso string
		tol float64
	}{{"F", "19F", 1e-3}, {"Na", "23Na", 1e-3}, {"Au", "197Au", 1e-2}, {"Bi", "209Bi", 1e-2}, {"Cs", "133Cs", 1e-2}, {"I", "127I", 1e-2}} {
		w, err := Mass(tt.el)
		require.NoError(t, err)
		m, err := Mass(tt.iso)
		require.NoError(t, err)
		assert.InDelta(t, m, w, tt.tol, tt.el)
	}
}

func TestMassErrors(t *testing.T) {
	tests := []struct {
		symbol  string
		want    error
		contain []string
	}{
		{"Xx", ErrUnknownSymbol, []string{`"Xx"`, "known elements: H–Og (Z = 1–118)", "did you mean"}},
		{"", ErrUnknownSymbol, nil},
		{"Clx", ErrUnknownSymbol, []string{"did you mean Cl"}},
		{"Aux", ErrUnknownSymbol, []string{"did you mean Au"}},
		{"15C", ErrUnknownSymbol, []string{"known isotopes of C: 12C, 13C, 14C"}},
		{"035Cl", ErrUnknownSymbol, nil},
		{"99999999999999999999999H", ErrUnknownSymbol, nil},
		{"35", ErrUnknownSymbol, nil},
		{"Tc", ErrNoStandardWeight, []string{"Tc", "97Tc, 98Tc, 99Tc"}},
		{"Og", ErrNoStandardWeight, []string{"Og", "give the mass explicitly"}},
		{"300Og", ErrUnknownSymbol, []string{"none (give the mass explicitly)"}},
		{"13Tc", ErrUnknownSymbol, []string{"97Tc"}},
	}
	for _, tt := range tests {
		_, err := Mass(tt.symbol)
		require.Error(t, err, tt.symbol)
		assert.ErrorIs(t, err, tt.want, tt.symbol)
		assert.NotContains(t, err.Error(), "\n")
		for _, c := range tt.contain {
			assert.Contains(t, err.Error(), c, tt.symbol)
		}
	}
}

func TestReducedMass(t *testing.T) {
	tests := []struct {
		m1, m2, want float64
	}{
		{ame1H, ame35Cl, ame1H * ame35Cl / (ame1H + ame35Cl)}, // AME2020 literals above
		{1.008, 35.45, 1.008 * 35.45 / (1.008 + 35.45)},       // IUPAC 2021 conventional, from memory
		{2, 2, 1},
		{1e300, 1e300, 5e299}, // no overflow of m1·m2
		{1e-300, 1e300, 1e-300},
	}
	for _, tt := range tests {
		got, err := ReducedMass(tt.m1, tt.m2)
		require.NoError(t, err)
		assert.InEpsilon(t, tt.want, got, 1e-14)
	}
	for _, bad := range [][2]float64{{0, 1}, {1, -1}, {math.NaN(), 1}, {1, math.Inf(1)}, {math.Inf(-1), 1}} {
		_, err := ReducedMass(bad[0], bad[1])
		assert.ErrorIs(t, err, ErrInvalidMass, "%v", bad)
	}
}

func TestParsePair(t *testing.T) {
	tests := []struct {
		in           string
		a, b         string
		massA, massB float64
	}{
		{"H-Cl", "H", "Cl", 1.008, 35.45},                       // IUPAC 2021 conventional, from memory
		{"1H-35Cl", "1H", "35Cl", ame1H, ame35Cl},               // AME2020, from memory
		{" 1H - 35Cl ", "1H", "35Cl", ame1H, ame35Cl},           // AME2020, from memory
		{"1H–37Cl", "1H", "37Cl", ame1H, ame37Cl},               // AME2020, from memory (en dash)
		{"D-D", "D", "D", ame2H, ame2H},                         // AME2020, from memory
		{"C-O", "C", "O", 12.011, 15.999},                       // IUPAC 2021 conventional, from memory
		{"12C-16O", "12C", "16O", ame12C, ame16O},               // AME2020, from memory
		{"h-cl", "H", "Cl", 1.008, 35.45},                       // IUPAC 2021 conventional, from memory
		{"Ar-Ar", "Ar", "Ar", 39.95, 39.95},                     // IUPAC 2021 conventional, from memory
		{"H-CL", "H", "Cl", 1.008, 35.45},                       // IUPAC 2021 conventional, from memory
		{"Au-Au", "Au", "Au", 196.97, 196.97},                   // IUPAC 2021 abridged, from memory
		{"Pt-O", "Pt", "O", 195.08, 15.999},                     // IUPAC 2021 abridged, from memory
		{"Cs-Cl", "Cs", "Cl", 132.91, 35.45},                    // IUPAC 2021 abridged, from memory
		{"63Cu-63Cu", "63Cu", "63Cu", 62.92959772, 62.92959772}, // AME2020, from memory
	}
	for _, tt := range tests {
		p, err := ParsePair(tt.in)
		require.NoError(t, err, tt.in)
		assert.Equal(t, tt.a, p.A, tt.in)
		assert.Equal(t, tt.b, p.B, tt.in)
		assert.InEpsilon(t, tt.massA, p.MassA, 1e-13, tt.in)
		assert.InEpsilon(t, tt.massB, p.MassB, 1e-13, tt.in)
		assert.InEpsilon(t, tt.massA*tt.massB/(tt.massA+tt.massB), p.Mu, 1e-13, tt.in)
		assert.Equal(t, tt.a+"-"+tt.b, p.String())
	}
	// ¹H³⁵Cl: μ ≈ 0.9796 u, from the AME2020 literals.
	p, err := ParsePair("1H-35Cl")
	require.NoError(t, err)
	assert.InDelta(t, 0.979593, p.Mu, 1e-6) // computed by hand from the AME2020 literals above
}

func TestParsePairErrors(t *testing.T) {
	tests := []struct {
		in      string
		want    error
		contain []string
	}{
		{"HCl", ErrMalformedPair, []string{`"HCl"`, "expected form A-B, e.g. H-Cl or 1H-35Cl", "(did you mean H-Cl?)"}},
		{"HCL", ErrMalformedPair, []string{"(did you mean H-Cl?)"}},
		{"1H35Cl", ErrMalformedPair, []string{"(did you mean 1H-35Cl?)"}},
		{"CO", ErrMalformedPair, []string{"(did you mean C-O?)"}},
		{"NaCl", ErrMalformedPair, []string{"(did you mean Na-Cl?)"}},
		{"", ErrMalformedPair, nil},
		{"-", ErrMalformedPair, nil},
		{"H-", ErrMalformedPair, nil},
		{"-Cl", ErrMalformedPair, nil},
		{"H-Cl-Br", ErrMalformedPair, nil},
		{"H-Xx", ErrUnknownSymbol, []string{`"H-Xx"`, `"Xx"`, "known elements"}},
		{"Tc-H", ErrNoStandardWeight, nil},
	}
	for _, tt := range tests {
		_, err := ParsePair(tt.in)
		require.Error(t, err, tt.in)
		assert.ErrorIs(t, err, tt.want, tt.in)
		assert.NotContains(t, err.Error(), "\n")
		assert.True(t, strings.HasPrefix(err.Error(), "atoms: "), err.Error())
		for _, c := range tt.contain {
			assert.Contains(t, err.Error(), c, tt.in)
		}
	}
}
