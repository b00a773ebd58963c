package units

import (
	"errors"
	"fmt"
	"math"
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// Reference values, written as literals with their sources. Values derived
// from exact SI (2019) constants are written as expressions of those literals.
const (
	refElectronVolt = 1.602176634e-19   // SI 2019, e in C (exact)
	refAvogadro     = 6.02214076e23     // SI 2019, N_A in 1/mol (exact)
	refSpeedOfLight = 299792458.0       // SI, c in m/s (exact)
	refHartreeEV    = 27.211386245988   // CODATA 2018, E_h in eV
	refRydbergEV    = 13.605693122994   // CODATA 2018, R∞hc in eV
	refBohrA        = 0.529177210903    // CODATA 2018, a₀ in Å
	refBoltzmannEV  = 8.617333262e-5    // CODATA 2018, k_B in eV/K (exact value, truncated)
	refFaradayKJ    = 96.48533212       // CODATA 2018, F = N_A·e in kC/mol (exact value, truncated): 1 eV = 96.48533212 kJ/mol
	refWavenumberEV = 1.239841984e-4    // CODATA 2018, h·c = 1.239841984e-6 eV·m, times 100 /m
	refKgU          = 6.0221407621e26   // CODATA 2018, kg–u relationship
	refElectronU    = 5.48579909065e-4  // CODATA 2018, m_e in u
	refHbarEVfs     = 0.6582119569      // CODATA 2018, ħ = 6.582119569e-16 eV·s
	refDaltonKg     = 1.66053906660e-27 // CODATA 2018, m_u in kg

	// 1 kcal/mol per particle: 4184 J (thermochemical calorie) / N_A, in eV.
	refKcalMolEV = 4184 / refAvogadro / refElectronVolt
	// 1 N/m in eV/Å²: 1 J/m² = (1/e) eV / (1e20 Å²).
	refNPerMEV = 1 / refElectronVolt / 1e20
	// 1 mdyn/Å = 1e-8 N / 1e-10 m = 100 N/m.
	refMdynAEV = 100 * refNPerMEV
)

func TestConstants(t *testing.T) {
	tests := []struct {
		name      string
		got, want float64
		rel       float64
	}{
		{"HartreeEV", HartreeEV, refHartreeEV, 1e-15},
		{"RydbergEV", RydbergEV, refRydbergEV, 1e-13},
		{"BohrAngstrom", BohrAngstrom, refBohrA, 1e-15},
		{"BoltzmannEV", BoltzmannEV, refBoltzmannEV, 1e-10},
		{"KcalPerMolEV", KcalPerMolEV, refKcalMolEV, 1e-15},
		{"KcalPerMolEV", KcalPerMolEV, 0.0433641043, 2e-9},                // from memory, rounded
		{"NewtonPerMeterEV", NewtonPerMeterEV, 0.0624150907, 2e-9},        // 1 J = 6.241509074e18 eV (CODATA 2018 exact), from memory, truncated
		{"100 N/m (1 mdyn/Å)", 100 * NewtonPerMeterEV, 6.241509074, 1e-9}, // as above
		{"KJPerMolEV", KJPerMolEV, 1 / refFaradayKJ, 1e-10},
		{"WavenumberEV", WavenumberEV, refWavenumberEV, 1e-9},
		{"NewtonPerMeterEV", NewtonPerMeterEV, refNPerMEV, 1e-15},
		{"HbarEVfs", HbarEVfs, refHbarEVfs, 1e-10},
		{"ElectronMass/Dalton", ElectronMass / Dalton, refElectronU, 1e-10},
		{"1/Dalton", 1 / Dalton, refKgU, 1e-10},
	}
	for _, tt := range tests {
		assert.InEpsilon(t, tt.want, tt.got, tt.rel, tt.name)
	}
}

func TestDimensionStrings(t *testing.T) {
	tests := []struct {
		d          Dimension
		name, unit string
	}{
		{Dimensionless, "dimensionless", ""},
		{Energy, "energy", "eV"},
		{Length, "length", "Å"},
		{InverseLength, "inverse length", "1/Å"},
		{ForceConstant, "force constant", "eV/Å²"},
		{Dispersion, "dispersion coefficient", "eV·Å⁶"},
		{Mass, "mass", "u"},
		{Time, "time", "fs"},
		{Temperature, "temperature", "K"},
		{Dimension(dimLimit), fmt.Sprintf("Dimension(%d)", dimLimit), ""},
		{Dimension(-dimLimit), fmt.Sprintf("Dimension(%d)", -dimLimit), ""},
		// Products without a name.
		{Energy + 8*Length, "energy·length^8", "eV·Å⁸"},
		{-2 * Length, "length^-2", "1/Å²"},
		{Energy - 4*Length, "energy·length^-4", "eV/Å⁴"},
		{Energy + 10*Length, "energy·length^10", "eV·Å¹⁰"},
		{2 * Energy, "energy^2", "eV²"},
		{-Energy + Length, "energy^-1·length", "Å/eV"},
		{Mass - 2*Time, "mass·time^-2", "u/fs²"},
	}
	for _, tt := range tests {
		assert.Equal(t, tt.name, tt.d.String())
		assert.Equal(t, tt.unit, tt.d.DefaultUnit(), tt.name)
		if tt.d.valid() {
			// The default unit must parse back to a factor of exactly 1.
			v, err := Parse("2.5 "+tt.d.DefaultUnit(), tt.d)
			require.NoError(t, err, tt.name)
			assert.Equal(t, 2.5, v, tt.name)
		}
	}
}

// unitCase is the value of one unit in the default unit of dim.
type unitCase struct {
	unit string
	dim  Dimension
	want float64
}

// unitCases lists the value of 1 unit in default units. Every spelling
// returned by Units must appear here (checked by TestUnitsListed).
var unitCases = []unitCase{
	// Energy.
	{"eV", Energy, 1},                      // definition
	{"meV", Energy, 1e-3},                  // SI prefix
	{"keV", Energy, 1e3},                   // SI prefix
	{"MeV", Energy, 1e6},                   // SI prefix
	{"hartree", Energy, refHartreeEV},      // CODATA 2018
	{"Hartree", Energy, refHartreeEV},      // CODATA 2018
	{"Eh", Energy, refHartreeEV},           // CODATA 2018
	{"E_h", Energy, refHartreeEV},          // CODATA 2018
	{"Ha", Energy, refHartreeEV},           // CODATA 2018
	{"Ry", Energy, refRydbergEV},           // CODATA 2018
	{"kcal/mol", Energy, refKcalMolEV},     // 4184 J/N_A (exact SI 2019 constants)
	{"kcal mol^-1", Energy, refKcalMolEV},  // 4184 J/N_A (exact SI 2019 constants)
	{"Kcal/mol", Energy, refKcalMolEV},     // 4184 J/N_A (exact SI 2019 constants)
	{"kJ/mol", Energy, 1 / refFaradayKJ},   // CODATA 2018 (F)
	{"J/mol", Energy, 1e-3 / refFaradayKJ}, // CODATA 2018 (F)
	{"cm-1", Energy, refWavenumberEV},      // CODATA 2018 hc
	{"cm^-1", Energy, refWavenumberEV},     // CODATA 2018 hc
	{"cm⁻¹", Energy, refWavenumberEV},      // CODATA 2018 hc
	{"1/cm", Energy, refWavenumberEV},      // CODATA 2018 hc
	{"K", Energy, refBoltzmannEV},          // CODATA 2018 k_B
	// Length.
	{"Å", Length, 1},           // definition (U+00C5)
	{"\u212b", Length, 1},      // definition (U+212B ANGSTROM SIGN)
	{"A\u030a", Length, 1},     // definition (A + combining ring)
	{"A", Length, 1},           // definition
	{"angstrom", Length, 1},    // definition
	{"nm", Length, 10},         // SI prefix
	{"pm", Length, 1e-2},       // SI prefix
	{"bohr", Length, refBohrA}, // CODATA 2018
	{"a0", Length, refBohrA},   // CODATA 2018
	{"a₀", Length, refBohrA},   // CODATA 2018
	// Inverse length.
	{"1/Å", InverseLength, 1},               // definition
	{"1/A", InverseLength, 1},               // definition
	{"1/angstrom", InverseLength, 1},        // definition
	{"Å-1", InverseLength, 1},               // definition
	{"Å^-1", InverseLength, 1},              // definition
	{"Å⁻¹", InverseLength, 1},               // definition
	{"A-1", InverseLength, 1},               // definition
	{"A^-1", InverseLength, 1},              // definition
	{"1/nm", InverseLength, 0.1},            // SI prefix
	{"nm-1", InverseLength, 0.1},            // SI prefix
	{"1/pm", InverseLength, 100},            // SI prefix
	{"1/bohr", InverseLength, 1 / refBohrA}, // CODATA 2018
	{"bohr-1", InverseLength, 1 / refBohrA}, // CODATA 2018
	{"1/cm", InverseLength, 1e-8},           // SI prefix
	{"cm-1", InverseLength, 1e-8},           // SI prefix
	// Force constant.
	{"eV/Å²", ForceConstant, 1},                                           // definition
	{"eV/Å^2", ForceConstant, 1},                                          // definition
	{"eV/A^2", ForceConstant, 1},                                          // definition
	{"eV/A2", ForceConstant, 1},                                           // definition
	{"N/m", ForceConstant, refNPerMEV},                                    // CODATA 2018
	{"kcal/mol/Å²", ForceConstant, refKcalMolEV},                          // 4184 J/N_A (exact SI 2019 constants)
	{"kcal/mol/A^2", ForceConstant, refKcalMolEV},                         // 4184 J/N_A (exact SI 2019 constants)
	{"kJ/mol/Å²", ForceConstant, 1 / refFaradayKJ},                        // CODATA 2018
	{"kJ/mol/A^2", ForceConstant, 1 / refFaradayKJ},                       // CODATA 2018
	{"mdyn/Å", ForceConstant, refMdynAEV},                                 // CODATA 2018
	{"mdyn/A", ForceConstant, refMdynAEV},                                 // CODATA 2018
	{"hartree/bohr²", ForceConstant, refHartreeEV / refBohrA / refBohrA},  // CODATA 2018
	{"hartree/bohr^2", ForceConstant, refHartreeEV / refBohrA / refBohrA}, // CODATA 2018
	{"Eh/a0^2", ForceConstant, refHartreeEV / refBohrA / refBohrA},        // CODATA 2018
	// Dispersion coefficient.
	{"eV·Å⁶", Dispersion, 1},                                             // definition
	{"eV·Å^6", Dispersion, 1},                                            // definition
	{"eV*A^6", Dispersion, 1},                                            // definition
	{"eV.A^6", Dispersion, 1},                                            // definition
	{"eVA6", Dispersion, 1},                                              // definition
	{"eV Å^6", Dispersion, 1},                                            // definition
	{"kcal/mol·Å⁶", Dispersion, refKcalMolEV},                            // 4184 J/N_A (exact SI 2019 constants)
	{"kcal/mol*A^6", Dispersion, refKcalMolEV},                           // 4184 J/N_A (exact SI 2019 constants)
	{"kJ/mol·Å⁶", Dispersion, 1 / refFaradayKJ},                          // CODATA 2018
	{"kJ/mol*A^6", Dispersion, 1 / refFaradayKJ},                         // CODATA 2018
	{"hartree·bohr⁶", Dispersion, refHartreeEV * math.Pow(refBohrA, 6)},  // CODATA 2018
	{"hartree*bohr^6", Dispersion, refHartreeEV * math.Pow(refBohrA, 6)}, // CODATA 2018
	{"Eh*a0^6", Dispersion, refHartreeEV * math.Pow(refBohrA, 6)},        // CODATA 2018
	// Mass.
	{"u", Mass, 1},             // definition
	{"Da", Mass, 1},            // definition
	{"amu", Mass, 1},           // definition
	{"g/mol", Mass, 1},         // by convention: molar mass in g/mol equals mass in u
	{"kg", Mass, refKgU},       // CODATA 2018
	{"me", Mass, refElectronU}, // CODATA 2018
	// Time.
	{"fs", Time, 1},        // definition
	{"as", Time, 1e-3},     // SI prefix
	{"ps", Time, 1e3},      // SI prefix
	{"ns", Time, 1e6},      // SI prefix
	{"us", Time, 1e9},      // SI prefix
	{"\u00b5s", Time, 1e9}, // SI prefix
	{"\u03bcs", Time, 1e9}, // SI prefix
	{"ms", Time, 1e12},     // SI prefix
	{"s", Time, 1e15},      // SI prefix
	// Temperature.
	{"K", Temperature, 1}, // definition
}

// TestParseIgnoringCase: a word that is a unit name ignoring case, and means
// one unit, is read as that unit (issue 17); factors as in unitCases.
func TestParseIgnoringCase(t *testing.T) {
	tests := []struct {
		in   string
		d    Dimension
		want float64
	}{
		{"1 ev", Energy, 1},
		{"1EV", Energy, 1},
		{"1 kj/mol", Energy, 1e3 / ElectronVolt / Avogadro},
		{"1 KJ/MOL", Energy, 1e3 / ElectronVolt / Avogadro},
		{"1 KCAL/MOL", Energy, 4184 / ElectronVolt / Avogadro},
		{"1 HARTREE", Energy, HartreeEV},
		{"120k", Energy, 120 * BoltzmannEV},
		{"1ANGSTROM", Length, 1},
		{"1 a", Length, 1},
		{"1 NM", Length, 10},
		{"1 BOHR", Length, BohrAngstrom},
		{"1 a0", Length, BohrAngstrom},
		{"500 n/M", ForceConstant, 500 / ElectronVolt / 1e10 * 1e-10},
		{"1 DA", Mass, 1},
		{"1 PS", Time, 1e3},
		// Exact spellings keep their meaning: eVA6 is eV·Å⁶, Nm stays N·m.
		{"1 eVA6", Dispersion, 1},
	}
	for _, tt := range tests {
		got, err := Parse(tt.in, tt.d)
		require.NoError(t, err, tt.in)
		assert.InEpsilon(t, tt.want, got, 1e-12, tt.in)
	}
}

func TestParseUnits(t *testing.T) {
	for _, tt := range unitCases {
		forms := []string{"2 " + tt.unit, "  2\t" + tt.unit + " "}
		if !strings.HasPrefix(tt.unit, "1") {
			forms = append(forms, "2"+tt.unit)
		}
		for _, form := range forms {
			got, err := Parse(form, tt.dim)
			require.NoError(t, err, "%q as %v", form, tt.dim)
			assert.InEpsilon(t, 2*tt.want, got, 1e-9, "%q as %v", form, tt.dim)
		}
		f, err := Factor(tt.unit, tt.dim)
		require.NoError(t, err, "Factor(%q, %v)", tt.unit, tt.dim)
		assert.InEpsilon(t, tt.want, f, 1e-9, "Factor(%q, %v)", tt.unit, tt.dim)
	}
}

func TestUnitsListed(t *testing.T) {
	for _, d := range namedDimensions {
		for _, u := range Units(d) {
			found := false
			for _, c := range unitCases {
				if c.unit == u && c.dim == d {
					found = true
					break
				}
			}
			assert.True(t, found, "unit %q of %v has no test case", u, d)
		}
	}
	// Units returns a copy.
	u := Units(Energy)
	u[0] = "changed"
	assert.Equal(t, "eV", Units(Energy)[0])
	assert.Empty(t, Units(Dimensionless))
	assert.Nil(t, Units(Dimension(dimLimit)))
	assert.Equal(t, []string{"eV·Å⁸"}, Units(Energy+8*Length))
}

func TestParseNumbers(t *testing.T) {
	tests := []struct {
		in   string
		d    Dimension
		want float64
	}{
		{"4.4", Energy, 4.4},
		{"4.4eV", Energy, 4.4},
		{"-4.4 eV", Energy, -4.4},
		{"+4.4 eV", Energy, 4.4},
		{"−4.4 eV", Energy, -4.4}, // U+2212 MINUS SIGN
		{".5", Length, 0.5},
		{"5.", Length, 5},
		{"3.4 A", Length, 3.4},
		{"0.34nm", Length, 3.4},
		{"1.2e-3 hartree", Energy, 1.2e-3 * refHartreeEV},
		{"1.2E+3meV", Energy, 1.2},
		{"2e2eV", Energy, 200},
		{"2eV", Energy, 2},
		{"3Eh", Energy, 3 * refHartreeEV},
		{"120K", Temperature, 120},
		{"120K", Energy, 120 * refBoltzmannEV},
		{"500N/m", ForceConstant, 500 * refNPerMEV},
		{"2 1/Å", InverseLength, 2},
		{"1.9/Å", InverseLength, 1.9},            // "VALUE/UNIT" reads as VALUE per UNIT
		{"3 /bohr", InverseLength, 3 / refBohrA}, // CODATA 2018
		{"1e-400", Energy, 0},                    // underflows to zero
		{"7", Dimensionless, 7},
		{"2 kcal / mol / Å^2", ForceConstant, 2 * refKcalMolEV},
	}
	for _, tt := range tests {
		got, err := Parse(tt.in, tt.d)
		require.NoError(t, err, tt.in)
		assert.InEpsilon(t, tt.want+1, got+1, 1e-10, tt.in)
	}
}

func TestParseErrors(t *testing.T) {
	tests := []struct {
		in      string
		d       Dimension
		want    error
		contain []string // substrings of the message
	}{
		{"", Energy, ErrMalformedNumber, []string{`""`}},
		{"   ", Energy, ErrMalformedNumber, nil},
		{"eV", Energy, ErrMalformedNumber, []string{`"eV"`, "decimal number"}},
		{"abc", Length, ErrMalformedNumber, nil},
		{"-", Length, ErrMalformedNumber, nil},
		{".", Length, ErrMalformedNumber, nil},
		{"1.2.3", Length, ErrMalformedNumber, nil},
		{"1,5 eV", Energy, ErrMalformedNumber, nil},
		{"1 2 eV", Energy, ErrMalformedNumber, nil},
		{"0x10", Energy, ErrUnknownUnit, nil},
		{"NaN", Energy, ErrNotFinite, []string{"NaN"}},
		{"nan eV", Energy, ErrNotFinite, nil},
		{"Inf", Energy, ErrNotFinite, nil},
		{"-inf", Energy, ErrNotFinite, nil},
		{"+Infinity K", Temperature, ErrNotFinite, nil},
		{"1e400", Energy, ErrNotFinite, []string{"overflows"}},
		{"1e308 hartree", Energy, ErrNotFinite, []string{"out of range"}},
		{"3 foo", Energy, ErrUnknownUnit, []string{`"foo"`, "energy units: eV, meV"}},
		{"3 furlong", Length, ErrUnknownUnit, []string{"length units: Å, A"}},
		{"3 MEV", Energy, ErrUnknownUnit, []string{"ambiguous ignoring case: MeV or meV"}},
		{"3 mEv", Energy, ErrUnknownUnit, []string{"ambiguous"}},
		// A one-word product is said to be one, after the near miss
		// (it used to read as if Angstroms were a length·time unit).
		{"3.4Angstroms", Length, ErrWrongDimension, []string{`unit "Angstroms" (did you mean angstrom?) is not a length: as one word it reads only as a product of unit names`}},
		{"3 eV", Length, ErrWrongDimension, []string{`unit "eV" has dimension energy, want length`}},
		{"3.4 angstrms", Length, ErrUnknownUnit, []string{"did you mean angstrom?"}},
		{"1 kcall/mol", Energy, ErrUnknownUnit, []string{"did you mean kcal?"}},
		{"1eVv", Energy, ErrUnknownUnit, []string{`no unit named "eVv" (did you mean eV?)`}},
		{"1 KCAL", Energy, ErrUnknownUnit, []string{"did you mean KCAL/mol?"}},
		{"3 eV/", ForceConstant, ErrUnknownUnit, []string{"operator"}},
		{"3 eV//Å", ForceConstant, ErrUnknownUnit, nil},
		{"3 //Å", InverseLength, ErrUnknownUnit, []string{"unexpected"}},
		{"3 Å^", Length, ErrUnknownUnit, []string{"exponent"}},
		{"3 Å^123", Length, ErrUnknownUnit, []string{"at most two digits"}},
		{"3 Å^12", Length, ErrWrongDimension, []string{"length^12"}},
		{"3 Å^0", Length, ErrUnknownUnit, []string{"zero"}},
		{"3 eV", Length, ErrWrongDimension, []string{`"eV"`, "dimension energy, want length"}},
		{"3 Å", Energy, ErrWrongDimension, []string{"dimension length, want energy"}},
		{"3 K", Length, ErrWrongDimension, []string{"temperature"}},
		{"3 eV", Temperature, ErrWrongDimension, nil},
		{"3 cm-1", ForceConstant, ErrWrongDimension, []string{"inverse length"}},
		{"3 N", ForceConstant, ErrWrongDimension, []string{"energy·length^-1"}},
		{"3 eV/Å", ForceConstant, ErrWrongDimension, nil},
		{"3 mol", Energy, ErrWrongDimension, []string{"dimensionless"}},
		{"3 eV", Dimensionless, ErrWrongDimension, nil},
		// Laboratory-scale units only per mole: no guessing.
		{"0.238kcal", Energy, ErrUnknownUnit, []string{"did you mean kcal/mol?"}},
		{"0.238cal", Energy, ErrUnknownUnit, []string{"did you mean cal/mol?"}},
		{"1kJ", Energy, ErrUnknownUnit, []string{"did you mean kJ/mol?"}},
		{"1 J", Energy, ErrUnknownUnit, []string{"did you mean J/mol?"}},
		{"1 Kcal", Energy, ErrUnknownUnit, []string{"did you mean Kcal/mol?"}},
		{"1eV/mol", Energy, ErrUnknownUnit, []string{"only per mole"}},
		{"1 hartree/mol", Energy, ErrUnknownUnit, []string{"only per mole"}},
		{"1 kcal mol", Energy, ErrUnknownUnit, []string{"once per mole"}},
		{"1 kcal/mol^2", Energy, ErrUnknownUnit, []string{"once per mole"}},
		{"1 kcal/Å^2", ForceConstant, ErrUnknownUnit, []string{"did you mean kcal/mol/Å^2?"}},
		{"1 kJ·Å⁶", Dispersion, ErrUnknownUnit, []string{"did you mean kJ/mol·Å⁶?"}},
		{"12 g", Mass, ErrUnknownUnit, []string{"did you mean g/mol?"}},
		{"3 Å/Å", Dimensionless, ErrUnknownUnit, []string{"no unit"}},
		{"3", Dimension(dimLimit), ErrInvalidDimension, nil},
		{"3 eV/Å^2", Energy + 8*Length, ErrWrongDimension, []string{"energy·length^8 units: products of energy, length, … units such as eV·Å⁸"}},
	}
	for _, tt := range tests {
		_, err := Parse(tt.in, tt.d)
		require.Error(t, err, tt.in)
		assert.ErrorIs(t, err, tt.want, "%q: %v", tt.in, err)
		var pe *ParseError
		require.ErrorAs(t, err, &pe, tt.in)
		assert.Equal(t, tt.in, pe.Input)
		msg := err.Error()
		assert.NotContains(t, msg, "\n", tt.in)
		assert.Contains(t, msg, tt.d.String(), tt.in)
		for _, c := range tt.contain {
			assert.Contains(t, msg, c, tt.in)
		}
	}
}

func TestFactorErrors(t *testing.T) {
	f, err := Factor("", Mass)
	require.NoError(t, err)
	assert.Equal(t, 1.0, f)
	_, err = Factor("eV", Mass)
	assert.ErrorIs(t, err, ErrWrongDimension)
	_, err = Factor("eV", Dimension(-dimLimit))
	assert.ErrorIs(t, err, ErrInvalidDimension)
}

func TestFormat(t *testing.T) {
	assert.Equal(t, "4.4 eV", Format(4.4, Energy))
	assert.Equal(t, "0.5 eV/Å²", Format(0.5, ForceConstant))
	assert.Equal(t, "3", Format(3, Dimensionless))
	for _, d := range append(namedDimensions[:], Energy+8*Length, -2*Length, 2*Energy-3*Length) {
		v, err := Parse(Format(-1.25e-7, d), d)
		require.NoError(t, err, d.String())
		assert.Equal(t, -1.25e-7, v, d.String())
	}
}

func TestHarmonic(t *testing.T) {
	// By hand in SI: k = 1 eV/Å² = e/(1e-20 m²) N/m, μ = 1 u = m_u kg,
	// ω = √(k/μ) rad/s, ν̃ = ω/(2π c) /m → /100 for cm⁻¹.
	kSI := refElectronVolt / 1e-20 // N/m
	omegaSI := math.Sqrt(kSI / refDaltonKg)
	wantOmega := omegaSI * 1e-15                              // rad/fs
	wantNu := omegaSI / (2 * math.Pi * refSpeedOfLight) / 100 // cm⁻¹
	tests := []struct {
		k, mu     float64
		wantOmega float64
		wantNu    float64
	}{
		{1, 1, wantOmega, wantNu},
		{4, 1, 2 * wantOmega, 2 * wantNu},
		{1, 0.25, 2 * wantOmega, 2 * wantNu},
		// k = 516 N/m, μ = 0.9796 u; expected values by hand from the SI formula.
		{516 * refNPerMEV, 0.9796, math.Sqrt(516/(0.9796*refDaltonKg)) * 1e-15,
			math.Sqrt(516/(0.9796*refDaltonKg)) / (2 * math.Pi * refSpeedOfLight) / 100},
	}
	for _, tt := range tests {
		omega := AngularFrequency(tt.k, tt.mu)
		assert.InEpsilon(t, tt.wantOmega, omega, 1e-9)
		assert.InEpsilon(t, tt.wantNu, Wavenumber(omega), 1e-9)
		assert.InEpsilon(t, omega, AngularFromWavenumber(Wavenumber(omega)), 1e-14)
	}
	assert.InDelta(t, 0.0982269475, wantOmega, 1e-10) // computed from the CODATA 2018 literals above
	assert.InDelta(t, 521.47090, wantNu, 1e-4)        // computed from the CODATA 2018 literals above
	assert.True(t, math.IsNaN(AngularFrequency(-1, 1)))
}

func TestErrorsAreDistinct(t *testing.T) {
	all := []error{ErrMalformedNumber, ErrNotFinite, ErrUnknownUnit, ErrWrongDimension, ErrInvalidDimension}
	for i, a := range all {
		for j, b := range all {
			assert.Equal(t, i == j, errors.Is(a, b))
		}
		assert.False(t, strings.Contains(a.Error(), "\n"))
	}
}

// TestPerMoleSpacing: a laboratory unit and "mol" written apart are still
// one per-mole unit. g/N_A is 0.99999999965 u (2019 SI: the molar mass
// constant M_u = 0.99999999965(30) g/mol, CODATA 2018), while "g/mol" is
// read by convention as exactly 1 u.
func TestPerMoleSpacing(t *testing.T) {
	got, err := Parse("12 g / mol", Mass)
	require.NoError(t, err)
	assert.InEpsilon(t, 12, got, 1e-9)
	got, err = Parse("0.238 kcal mol^-1", Energy)
	require.NoError(t, err)
	assert.InEpsilon(t, 0.238*refKcalMolEV, got, 1e-12)
}

func TestDimensionEncoding(t *testing.T) {
	for _, e := range []int{-32, -3, 0, 1, 31} {
		for _, l := range []int{-32, -12, -1, 0, 8, 31} {
			for _, m := range []int{-1, 0, 2} {
				d, ok := NewDimension(e, l, m, -m, 30-m)
				require.True(t, ok)
				ge, gl, gm, gt, gk := d.Exponents()
				assert.Equal(t, [5]int{e, l, m, -m, 30 - m}, [5]int{ge, gl, gm, gt, gk})
			}
		}
	}
	_, ok := NewDimension(32, 0, 0, 0, 0)
	assert.False(t, ok)
	_, ok = NewDimension(0, -33, 0, 0, 0)
	assert.False(t, ok)
	d, ok := NewDimension(1, 6, 0, 0, 0)
	require.True(t, ok)
	assert.Equal(t, Dispersion, d)
	d, _ = NewDimension(1, -2, 0, 0, 0)
	assert.Equal(t, ForceConstant, d)
	d, _ = NewDimension(0, 0, 0, 0, 1)
	assert.Equal(t, Temperature, d)
}

// ParseUnit and ParseIn, for the units a forms file declares. Factors from
// the constants tested above (CODATA 2018, SI 2019).
func TestParseUnit(t *testing.T) {
	c8, _ := NewDimension(1, 8, 0, 0, 0)
	tests := []struct {
		unit string
		dim  Dimension
		f    float64
	}{
		{"eV", Energy, 1},
		{"1", Dimensionless, 1},
		{"kcal/mol*A^6", Dispersion, refKcalMolEV},
		{"eV*A^8", c8, 1},
		{"hartree*bohr^8", c8, refHartreeEV * math.Pow(refBohrA, 8)},
		{"1/A^2", -2 * Length, 1},
		{"1/nm^2", -2 * Length, 1e-2},
		{"eV·Å¹⁰", Energy + 10*Length, 1},
		{"K", Temperature, 1},
		{"cm-1", InverseLength, 1e-8},
	}
	for _, tt := range tests {
		d, f, err := ParseUnit(tt.unit)
		require.NoError(t, err, tt.unit)
		assert.Equal(t, tt.dim, d, tt.unit)
		assert.InEpsilon(t, tt.f, f, 1e-12, tt.unit)
	}
	for _, bad := range []string{"", "furlong", "kcal", "A^123", "eV/", "1/"} {
		_, _, err := ParseUnit(bad)
		assert.ErrorIs(t, err, ErrUnit, bad)
	}
	// Bare numbers in the declared unit, suffixed ones in their own.
	v, err := ParseIn("500", Dispersion, "kcal/mol*A^6")
	require.NoError(t, err)
	assert.InEpsilon(t, 500*refKcalMolEV, v, 1e-12)
	v, err = ParseIn("2 eV*A^6", Dispersion, "kcal/mol*A^6")
	require.NoError(t, err)
	assert.Equal(t, 2.0, v)
	v, err = ParseIn("0.5/nm^2", -2*Length, "1/A^2")
	require.NoError(t, err)
	assert.InEpsilon(t, 0.5e-2, v, 1e-14)
	v, err = ParseIn("3", Dimensionless, "1")
	require.NoError(t, err)
	assert.Equal(t, 3.0, v)
	_, err = ParseIn("3 eV", -2*Length, "1/A^2")
	assert.ErrorIs(t, err, ErrWrongDimension)
}
