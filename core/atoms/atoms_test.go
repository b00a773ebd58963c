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
		{"1H", ame1H},      // AME2020, from memory
		{"2H", ame2H},      // AME2020, from memory
		{"D", ame2H},       // AME2020, from memory
		{"3H", ame3H},      // AME2020, from memory
		{"T", ame3H},       // AME2020, from memory
		{"12C", ame12C},    // definition of u
		{"13C", ame13C},    // AME2020, from memory
		{"14N", ame14N},    // AME2020, from memory
		{"15N", ame15N},    // AME2020, from memory
		{"16O", ame16O},    // AME2020, from memory
		{"17O", ame17O},    // AME2020, from memory
		{"18O", ame18O},    // AME2020, from memory
		{"19F", ame19F},    // AME2020, from memory
		{"35Cl", ame35Cl},  // AME2020, from memory
		{"³⁵Cl", ame35Cl},  // AME2020, from memory
		{"35cl", ame35Cl},  // AME2020, from memory
		{"37Cl", ame37Cl},  // AME2020, from memory
		{"79Br", ame79Br},  // AME2020, from memory
		{"81Br", ame81Br},  // AME2020, from memory
		{"127I", ame127I},  // AME2020, from memory
		{"40Ar", ame40Ar},  // AME2020, from memory
		{"84Kr", ame84Kr},  // AME2020, from memory
		{"132Xe", ame132X}, // AME2020, from memory
		{" 13C ", ame13C},  // AME2020, from memory
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
	}
	for _, tt := range tests {
		got, err := Mass(tt.symbol)
		require.NoError(t, err, tt.symbol)
		assert.InDelta(t, tt.want, got, 1e-12, tt.symbol)
	}
}

func TestTables(t *testing.T) {
	syms := Symbols()
	require.Len(t, syms, 54) // H (Z = 1) to Xe (Z = 54)
	assert.Equal(t, "H", syms[0])
	assert.Equal(t, "Xe", syms[53])
	prev := 0.0
	for i, e := range elements {
		assert.Equal(t, i+1, e.z, e.symbol)
		if e.symbol == "Tc" {
			continue
		}
		// Weights grow with Z in this range except for the known
		// inversions Ar/K, Co/Ni and Te/I.
		switch e.symbol {
		case "K", "Ni", "I":
		default:
			assert.Greater(t, e.weight, prev, e.symbol)
		}
		prev = e.weight
	}
	// Sanity check of the isotope table: |m − A| < 0.1 u for these nuclides,
	// and each belongs to a known element.
	for _, iso := range isotopes {
		assert.InDelta(t, float64(iso.a), iso.mass, 0.1, "%d%s", iso.a, iso.symbol)
		_, ok := bySymbol[iso.symbol]
		assert.True(t, ok, iso.symbol)
	}
	// Symbols returns a copy.
	syms[0] = "changed"
	assert.Equal(t, "H", Symbols()[0])
	assert.Contains(t, Isotopes(), "35Cl")
}

func TestMassErrors(t *testing.T) {
	tests := []struct {
		symbol  string
		want    error
		contain []string
	}{
		{"Xx", ErrUnknownSymbol, []string{`"Xx"`, "known elements: H–Xe", "isotopes: 1H, 2H"}},
		{"", ErrUnknownSymbol, nil},
		{"CL", ErrUnknownSymbol, nil},
		{"Cs", ErrUnknownSymbol, nil}, // beyond Xe
		{"14C", ErrUnknownSymbol, []string{"known isotopes of C: 12C, 13C"}},
		{"035Cl", ErrUnknownSymbol, nil},
		{"99999999999999999999999H", ErrUnknownSymbol, nil},
		{"35", ErrUnknownSymbol, nil},
		{"d", ErrUnknownSymbol, nil},
		{"Tc", ErrNoStandardWeight, []string{"Tc"}},
		{"99Tc", ErrUnknownSymbol, []string{"none"}},
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
		{"H-Cl", "H", "Cl", 1.008, 35.45},             // IUPAC 2021 conventional, from memory
		{"1H-35Cl", "1H", "35Cl", ame1H, ame35Cl},     // AME2020, from memory
		{" 1H - 35Cl ", "1H", "35Cl", ame1H, ame35Cl}, // AME2020, from memory
		{"1H–37Cl", "1H", "37Cl", ame1H, ame37Cl},     // AME2020, from memory (en dash)
		{"D-D", "D", "D", ame2H, ame2H},               // AME2020, from memory
		{"C-O", "C", "O", 12.011, 15.999},             // IUPAC 2021 conventional, from memory
		{"12C-16O", "12C", "16O", ame12C, ame16O},     // AME2020, from memory
		{"h-cl", "H", "Cl", 1.008, 35.45},             // IUPAC 2021 conventional, from memory
		{"Ar-Ar", "Ar", "Ar", 39.95, 39.95},           // IUPAC 2021 conventional, from memory
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
		{"HCl", ErrMalformedPair, []string{`"HCl"`, "expected form A-B, e.g. H-Cl or 1H-35Cl"}},
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
