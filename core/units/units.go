// Package units parses physical quantities with unit suffixes and converts them
// to pairwell's default units, and provides CODATA 2018 physical constants.
//
// The default units are: energy eV, length Å, inverse length 1/Å, force
// constant eV/Å², dispersion coefficient (C6) eV·Å⁶, mass u (dalton), time fs
// and temperature K. Wavenumbers are in cm⁻¹.
//
// A unit is a product or quotient of unit names, for example "eV/Å^2",
// "kcal/mol/A2", "hartree·bohr⁶", "eVA6", "cm-1" or "1/nm". Factors are combined
// left to right, and "/" divides by the single factor that follows it, so
// "kcal/mol/Å²" is kcal·mol⁻¹·Å⁻² and "kcal/mol·Å⁶" is kcal·mol⁻¹·Å⁶.
// Multiplication is written "·", "⋅", "*", "." or by juxtaposition (with or
// without a space). Exponents have one or two digits, optionally signed, written
// "^2", "^-1", "2", "-1" or as superscripts "²", "⁻¹". Unit names are case
// sensitive ("meV" is not "MeV"). "mol" stands for N_A particles, so molar
// energies such as kcal/mol are converted to energies per particle. The
// laboratory-scale units J, kJ, cal, kcal and g are accepted only per mole
// ("0.238kcal" is refused with "did you mean kcal/mol?"), and "mol" only
// after one of them ("1eV/mol" is refused): a unit is read exactly as
// written or not at all.
//
// Two spectroscopic equivalences are applied when an energy is requested:
// a temperature T is read as the energy k_B·T, and a wavenumber ν̃ (any
// inverse length, e.g. cm⁻¹) as the photon energy h·c·ν̃.
package units

import (
	"errors"
	"fmt"
	"math"
	"sort"
	"strconv"
	"strings"
	"unicode/utf8"

	"github.com/pairwell/pairwell/core/suggest"
)

// Dimension is the physical dimension of a quantity: a product of integer
// powers of the base dimensions energy, length, mass, time and temperature,
// E^e·L^l·M^m·T^t·Θ^θ. Each exponent lies in −32…31. The named constants
// below are the dimensions of pairwell's fixed parameters; NewDimension and
// ParseUnit give any other product, such as energy·length⁸ (a C₈
// coefficient) or length⁻² (the β of a Varshni form).
//
// A Dimension is an integer so that dimensions compare with == and can be
// constants: the exponents are the digits of its balanced base-64
// representation, energy lowest, so Dimensionless is 0, Energy is 1 and
// Length is 64. Use Exponents to read them; do not rely on the encoding.
type Dimension int

// Dimensions with a name. The comment gives the default unit.
const (
	Dimensionless Dimension = 0                     // no unit
	Energy        Dimension = 1                     // eV
	Length        Dimension = dimBase               // Å
	InverseLength Dimension = -Length               // 1/Å
	ForceConstant Dimension = Energy - 2*Length     // eV/Å²
	Dispersion    Dimension = Energy + 6*Length     // eV·Å⁶ (C6-type coefficient)
	Mass          Dimension = dimBase * dimBase     // u
	Time          Dimension = Mass * dimBase        // fs
	Temperature   Dimension = Time * dimBase        // K
	dimBase                 = 64                    // radix of the encoding
	dimDigitMin             = -dimBase / 2          // smallest exponent
	dimDigitMax             = dimBase/2 - 1         // largest exponent
	dimLimit                = Temperature * dimBase // |d| < dimLimit/2 for valid d
)

// namedDimensions lists the dimensions with a name, in the order of the
// constants. Read only.
var namedDimensions = [...]Dimension{Dimensionless, Energy, Length, InverseLength, ForceConstant, Dispersion, Mass, Time, Temperature}

// dimensionName returns the name of a named dimension, "" for others.
func dimensionName(d Dimension) string {
	switch d {
	case Dimensionless:
		return "dimensionless"
	case Energy:
		return "energy"
	case Length:
		return "length"
	case InverseLength:
		return "inverse length"
	case ForceConstant:
		return "force constant"
	case Dispersion:
		return "dispersion coefficient"
	case Mass:
		return "mass"
	case Time:
		return "time"
	case Temperature:
		return "temperature"
	}
	return ""
}

// namedDefaultUnit returns the default unit of a named dimension and
// whether d is one.
func namedDefaultUnit(d Dimension) (string, bool) {
	switch d {
	case Dimensionless:
		return "", true
	case Energy:
		return "eV", true
	case Length:
		return "Å", true
	case InverseLength:
		return "1/Å", true
	case ForceConstant:
		return "eV/Å²", true
	case Dispersion:
		return "eV·Å⁶", true
	case Mass:
		return "u", true
	case Time:
		return "fs", true
	case Temperature:
		return "K", true
	}
	return "", false
}

// NewDimension returns energy^e·length^l·mass^m·time^t·temperature^θ. ok is
// false when an exponent lies outside −32…31.
func NewDimension(e, l, m, t, θ int) (d Dimension, ok bool) {
	var v dims
	v[baseEnergy], v[baseLength], v[baseMass], v[baseTime], v[baseTemperature] = e, l, m, t, θ
	return fromDims(v)
}

// Exponents returns the exponents of energy, length, mass, time and
// temperature in d. For an invalid d all are 0.
func (d Dimension) Exponents() (e, l, m, t, θ int) {
	v, ok := d.dims()
	if !ok {
		return 0, 0, 0, 0, 0
	}
	return v[baseEnergy], v[baseLength], v[baseMass], v[baseTime], v[baseTemperature]
}

// valid reports whether d is a dimension: its encoding has no digit beyond
// the five base dimensions.
func (d Dimension) valid() bool { _, ok := d.dims(); return ok }

// dims decodes d.
func (d Dimension) dims() (v dims, ok bool) {
	x := int64(d)
	for i := range v {
		digit := ((x%dimBase)+dimBase-dimDigitMin)%dimBase + dimDigitMin
		v[i] = int(digit)
		x = (x - digit) / dimBase
	}
	return v, x == 0
}

// fromDims encodes v; ok is false when an exponent is out of range.
func fromDims(v dims) (Dimension, bool) {
	var x int64
	for i := len(v) - 1; i >= 0; i-- {
		if v[i] < dimDigitMin || v[i] > dimDigitMax {
			return 0, false
		}
		x = x*dimBase + int64(v[i])
	}
	return Dimension(x), true
}

// String returns the lower-case name of d, e.g. "energy" or "inverse
// length", or for dimensions without a name the product of the base
// dimensions, e.g. "energy·length^8" or "length^-2".
func (d Dimension) String() string {
	if n := dimensionName(d); n != "" {
		return n
	}
	v, ok := d.dims()
	if !ok {
		return "Dimension(" + strconv.Itoa(int(d)) + ")"
	}
	var parts []string
	for i, n := range v {
		switch n {
		case 0:
		case 1:
			parts = append(parts, baseNames[i])
		default:
			parts = append(parts, baseNames[i]+"^"+strconv.Itoa(n))
		}
	}
	return strings.Join(parts, "·")
}

// DefaultUnit returns the unit in which Parse returns values of dimension d:
// "eV", "Å", "1/Å", "eV/Å²", "eV·Å⁶", "u", "fs", "K" for the named
// dimensions, the product of eV, Å, u, fs and K otherwise (e.g. "eV·Å⁸",
// "1/Å²", "eV/Å⁴"), and "" for Dimensionless and for an invalid
// dimension. Parse and ParseUnit accept the result.
func (d Dimension) DefaultUnit() string {
	if u, ok := namedDefaultUnit(d); ok {
		return u
	}
	v, ok := d.dims()
	if !ok {
		return ""
	}
	var num, den []string
	for i, n := range v {
		switch {
		case n == 1:
			num = append(num, baseUnits[i])
		case n > 1:
			num = append(num, baseUnits[i]+Superscript(n))
		case n == -1:
			den = append(den, baseUnits[i])
		case n < -1:
			den = append(den, baseUnits[i]+Superscript(-n))
		}
	}
	s := strings.Join(num, "·")
	if s == "" {
		s = "1"
	}
	for _, u := range den {
		s += "/" + u
	}
	return s
}

// baseUnits are the default units of the base dimensions.
var baseUnits = [numBase]string{"eV", "Å", "u", "fs", "K"}

// Sentinel errors returned (wrapped) by Parse and Factor. Use errors.Is to
// test for them.
var (
	// ErrMalformedNumber reports an empty or syntactically invalid number.
	ErrMalformedNumber = errors.New("malformed number")
	// ErrNotFinite reports a NaN or infinite value, including values that
	// overflow float64 when read or when converted.
	ErrNotFinite = errors.New("value is not finite")
	// ErrUnknownUnit reports a unit that cannot be read.
	ErrUnknownUnit = errors.New("unknown unit")
	// ErrWrongDimension reports a valid unit of a different dimension than the
	// one requested.
	ErrWrongDimension = errors.New("wrong dimension")
	// ErrInvalidDimension reports a Dimension value outside the defined constants.
	ErrInvalidDimension = errors.New("invalid dimension")
)

// ParseError records a failed Parse or Factor call. Err wraps one of the
// sentinel errors of this package.
type ParseError struct {
	Input string    // the string that was parsed
	Dim   Dimension // the requested dimension
	Err   error     // the reason; wraps a sentinel error
}

func (e *ParseError) Error() string {
	return fmt.Sprintf("units: cannot read %q as %s: %v", e.Input, e.Dim, e.Err)
}

func (e *ParseError) Unwrap() error { return e.Err }

// Parse reads a number with an optional unit suffix, such as "4.4", "4.4eV",
// "120K", "3.4 A", "0.34nm", "1.2e-3 hartree" or "500N/m", and returns its value
// in the default unit of d (see Dimension.DefaultUnit). A bare number is taken
// to be in the default unit. Leading and trailing white space is ignored, as is
// white space between the number and the unit.
//
// The number is a decimal floating-point literal with an optional sign and
// exponent ("1.5", "-2", ".5", "3e-4"). Values of dimension Dimensionless
// take no unit. For Energy, a temperature unit (K) gives k_B·T and an inverse
// length (e.g. cm⁻¹) gives h·c·ν̃.
//
// The returned error is a *ParseError wrapping ErrMalformedNumber,
// ErrNotFinite, ErrUnknownUnit, ErrWrongDimension or ErrInvalidDimension.
func Parse(s string, d Dimension) (float64, error) {
	return parse(s, d, "")
}

// ParseIn is Parse with bare numbers read in the unit bare, a unit of
// dimension d (e.g. "kcal/mol·Å⁶" for a Dispersion value): ParseIn("500",
// Dispersion, "kcal/mol*A^6") is 500 kcal/mol·Å⁶ in eV·Å⁶. Numbers with a
// unit suffix are read as by Parse. An empty bare is the default unit.
func ParseIn(s string, d Dimension, bare string) (float64, error) {
	return parse(s, d, bare)
}

func parse(s string, d Dimension, bare string) (float64, error) {
	fail := func(err error) (float64, error) {
		return 0, &ParseError{Input: s, Dim: d, Err: err}
	}
	if !d.valid() {
		return fail(ErrInvalidDimension)
	}
	num, unit, err := splitNumber(strings.TrimSpace(s))
	if err != nil {
		return fail(err)
	}
	v, err := strconv.ParseFloat(num, 64)
	if err != nil {
		// splitNumber guarantees the syntax, so this is a range error.
		if math.IsInf(v, 0) {
			return fail(fmt.Errorf("%w: %q overflows float64", ErrNotFinite, num))
		}
		return fail(fmt.Errorf("%w: %q: %v", ErrMalformedNumber, num, err))
	}
	if unit == "" {
		unit = strings.TrimSpace(bare)
		if unit == "" || unit == "1" && d == Dimensionless {
			return v, nil
		}
	}
	if strings.HasPrefix(unit, "/") {
		// "1.9/Å" reads as 1.9 per Å.
		unit = "1" + unit
	}
	f, err := factor(unit, d)
	if err != nil {
		return fail(err)
	}
	r := v * f
	if math.IsNaN(r) || math.IsInf(r, 0) {
		return fail(fmt.Errorf("%w: %s %s is out of range in %s", ErrNotFinite, num, unit, d.DefaultUnit()))
	}
	return r, nil
}

// ErrUnit is wrapped by the errors of ParseUnit.
var ErrUnit = errors.New("invalid unit")

// ParseUnit reads a unit expression, such as "eV", "kcal/mol*A^6", "1/A^2",
// "eV*A^8" or "1" (dimensionless), and returns its dimension and its value in
// the default unit of that dimension (for "kcal/mol*A^6", the value of
// 1 kcal/mol·Å⁶ in eV·Å⁶). Unlike Parse it applies no equivalence: "K" is a
// temperature and "cm-1" an inverse length. Errors wrap ErrUnit and
// ErrUnknownUnit or ErrNotFinite.
func ParseUnit(u string) (Dimension, float64, error) {
	t := strings.TrimSpace(u)
	if t == "1" {
		return Dimensionless, 1, nil
	}
	if t == "" {
		return 0, 0, fmt.Errorf("%w: empty unit (write 1 for a dimensionless value)", ErrUnit)
	}
	f, v, m, err := parseUnit(t)
	if err == nil {
		err = m.check(t)
	}
	if err != nil {
		return 0, 0, fmt.Errorf("%w %q: %w: %v", ErrUnit, u, ErrUnknownUnit, err)
	}
	d, ok := fromDims(v)
	if !ok {
		return 0, 0, fmt.Errorf("%w %q: %w: exponent out of range", ErrUnit, u, ErrUnknownUnit)
	}
	if f == 0 || math.IsNaN(f) || math.IsInf(f, 0) {
		return 0, 0, fmt.Errorf("%w %q: %w", ErrUnit, u, ErrNotFinite)
	}
	return d, f, nil
}

// Factor returns the value of one unit, given by its spelling such as "kcal/mol"
// or "N/m", in the default unit of d. An empty unit has factor 1.
// Errors are as for Parse.
func Factor(unit string, d Dimension) (float64, error) {
	if !d.valid() {
		return 0, &ParseError{Input: unit, Dim: d, Err: ErrInvalidDimension}
	}
	u := strings.TrimSpace(unit)
	if u == "" {
		return 1, nil
	}
	f, err := factor(u, d)
	if err != nil {
		return 0, &ParseError{Input: unit, Dim: d, Err: err}
	}
	return f, nil
}

// Units returns the canonical unit spellings accepted for d, for help text and
// error messages. Products, quotients and the other spellings described in the
// package documentation are accepted as well. The returned slice is a fresh copy.
func Units(d Dimension) []string {
	if !d.valid() {
		return nil
	}
	if l, ok := unitLists[d]; ok {
		return append([]string(nil), l...)
	}
	if d == Dimensionless {
		return []string{}
	}
	return []string{d.DefaultUnit()}
}

// Format formats v, a value in the default unit of d, as the shortest decimal
// representation followed by the unit, e.g. "4.4 eV". The result is accepted by
// Parse.
func Format(v float64, d Dimension) string {
	s := strconv.FormatFloat(v, 'g', -1, 64)
	if u := d.DefaultUnit(); u != "" {
		return s + " " + u
	}
	return s
}

// unitLists holds the spellings returned by Units for the named
// dimensions. Read only.
var unitLists = map[Dimension][]string{
	Dimensionless: {},
	Energy: {"eV", "meV", "keV", "MeV", "hartree", "Eh", "Ha", "Ry",
		"kcal/mol", "kJ/mol", "J/mol", "cm-1", "cm^-1", "cm⁻¹", "1/cm", "K"},
	Length: {"Å", "A", "angstrom", "nm", "pm", "bohr", "a0"},
	InverseLength: {"1/Å", "1/A", "1/angstrom", "Å-1", "Å^-1", "Å⁻¹", "A-1", "A^-1",
		"1/nm", "nm-1", "1/pm", "1/bohr", "bohr-1", "1/cm", "cm-1"},
	ForceConstant: {"eV/Å²", "eV/Å^2", "eV/A^2", "eV/A2", "N/m", "kcal/mol/Å²",
		"kcal/mol/A^2", "kJ/mol/Å²", "kJ/mol/A^2", "mdyn/Å", "mdyn/A",
		"hartree/bohr²", "hartree/bohr^2", "Eh/a0^2"},
	Dispersion: {"eV·Å⁶", "eV·Å^6", "eV*A^6", "eV.A^6", "eVA6", "kcal/mol·Å⁶",
		"kcal/mol*A^6", "kJ/mol·Å⁶", "kJ/mol*A^6", "hartree·bohr⁶",
		"hartree*bohr^6", "Eh*a0^6"},
	Mass:        {"u", "Da", "amu", "g/mol", "kg", "me"},
	Time:        {"fs", "as", "ps", "ns", "s"},
	Temperature: {"K"},
}

// splitNumber splits s into a leading decimal number and the unit that follows,
// with surrounding white space removed from the unit.
func splitNumber(s string) (num, unit string, err error) {
	if s == "" {
		return "", "", fmt.Errorf("%w: empty input", ErrMalformedNumber)
	}
	// Accept a typographic minus sign.
	if rest, ok := strings.CutPrefix(s, "−"); ok {
		s = "-" + rest
	}
	i := 0
	if s[i] == '+' || s[i] == '-' {
		i++
	}
	digits := 0
	for i < len(s) && isDigit(s[i]) {
		i++
		digits++
	}
	if i < len(s) && s[i] == '.' {
		i++
		for i < len(s) && isDigit(s[i]) {
			i++
			digits++
		}
	}
	if digits == 0 {
		lower := strings.ToLower(strings.TrimLeft(s, "+-"))
		if strings.HasPrefix(lower, "nan") || strings.HasPrefix(lower, "inf") {
			return "", "", fmt.Errorf("%w: NaN and Inf are not allowed", ErrNotFinite)
		}
		return "", "", fmt.Errorf("%w: want a decimal number such as 1.5, -2 or 3e-4, optionally followed by a unit", ErrMalformedNumber)
	}
	if i < len(s) && (s[i] == 'e' || s[i] == 'E') {
		j := i + 1
		if j < len(s) && (s[j] == '+' || s[j] == '-') {
			j++
		}
		k := j
		for k < len(s) && isDigit(s[k]) {
			k++
		}
		if k > j {
			i = k
		}
	}
	num = s[:i]
	unit = strings.TrimSpace(s[i:])
	if unit != "" {
		c := unit[0]
		badStart := c == '.' || c == ',' || c == '+' || c == '-' || (isDigit(c) && !strings.HasPrefix(unit, "1/"))
		if badStart {
			return "", "", fmt.Errorf("%w: unexpected %q after %q", ErrMalformedNumber, unit, num)
		}
	}
	return num, unit, nil
}

func isDigit(c byte) bool { return '0' <= c && c <= '9' }

// dims is a vector of exponents of the base dimensions.
type dims [numBase]int

const (
	baseEnergy = iota
	baseLength
	baseMass
	baseTime
	baseTemperature
	numBase
)

var baseNames = [numBase]string{"energy", "length", "mass", "time", "temperature"}

// describe names the dimension of v.
func (v dims) describe() string {
	d, ok := fromDims(v)
	if !ok {
		return "out-of-range dimension"
	}
	return d.String()
}

// atom is a named unit: its value in default units and its dimension.
type atom struct {
	factor float64
	dim    dims
}

// molarAtoms are the laboratory-scale units, accepted only per mole, as in
// kcal/mol or g/mol: a pair potential's parameter in kcal is almost always
// a kcal/mol with the "/mol" forgotten, and reading it literally would be
// wrong by a factor N_A. Read only.
var molarAtoms = map[string]bool{"J": true, "kJ": true, "cal": true, "kcal": true, "Kcal": true, "g": true}

var (
	energy1      = dims{baseEnergy: 1}
	length1      = dims{baseLength: 1}
	mass1        = dims{baseMass: 1}
	time1        = dims{baseTime: 1}
	temperature1 = dims{baseTemperature: 1}
	force1       = dims{baseEnergy: 1, baseLength: -1}
)

// atoms maps each unit name to its definition. Read only.
var atoms = map[string]atom{
	// Energy, in eV.
	"eV":       {1, energy1},
	"meV":      {1e-3, energy1},
	"keV":      {1e3, energy1},
	"MeV":      {1e6, energy1},
	"hartree":  {HartreeEV, energy1},
	"Hartree":  {HartreeEV, energy1},
	"Eh":       {HartreeEV, energy1},
	"E_h":      {HartreeEV, energy1},
	"Ha":       {HartreeEV, energy1},
	"Ry":       {RydbergEV, energy1},
	"J":        {1 / ElectronVolt, energy1},
	"kJ":       {1e3 / ElectronVolt, energy1},
	"cal":      {4.184 / ElectronVolt, energy1},
	"kcal":     {4184 / ElectronVolt, energy1},
	"Kcal":     {4184 / ElectronVolt, energy1}, // common spelling of kcal
	"mol":      {Avogadro, dims{}},             // a count of N_A particles; only after a molar atom
	"K":        {1, temperature1},
	"\u00c5":   {1, length1}, // Å, LATIN CAPITAL LETTER A WITH RING ABOVE
	"\u212b":   {1, length1}, // Å, ANGSTROM SIGN
	"A\u030a":  {1, length1}, // A + COMBINING RING ABOVE
	"A":        {1, length1},
	"angstrom": {1, length1},
	"Angstrom": {1, length1},
	"nm":       {10, length1},
	"pm":       {1e-2, length1},
	"cm":       {1e8, length1},
	"m":        {1e10, length1},
	"bohr":     {BohrAngstrom, length1},
	"Bohr":     {BohrAngstrom, length1},
	"a0":       {BohrAngstrom, length1},
	"a₀":       {BohrAngstrom, length1},
	"N":        {1 / ElectronVolt / 1e10, force1}, // 1 J/m in eV/Å
	"dyn":      {1e-5 / ElectronVolt / 1e10, force1},
	"mdyn":     {1e-8 / ElectronVolt / 1e10, force1},
	"u":        {1, mass1},
	"Da":       {1, mass1},
	"amu":      {1, mass1},
	"g/mol":    {1, mass1}, // molar mass, numerically equal to the mass in u
	"kg":       {1 / Dalton, mass1},
	"g":        {1e-3 / Dalton, mass1},
	"me":       {ElectronMassU, mass1},
	"fs":       {1, time1},
	"as":       {1e-3, time1},
	"ps":       {1e3, time1},
	"ns":       {1e6, time1},
	"us":       {1e9, time1},
	"\u00b5s":  {1e9, time1}, // µs, MICRO SIGN
	"\u03bcs":  {1e9, time1}, // μs, GREEK SMALL LETTER MU
	"ms":       {1e12, time1},
	"s":        {1e15, time1},
}

// atomNames lists the keys of atoms, longest first, for longest-match scanning.
var atomNames = func() []string {
	names := make([]string, 0, len(atoms))
	for n := range atoms {
		names = append(names, n)
	}
	sort.Slice(names, func(i, j int) bool {
		if len(names[i]) != len(names[j]) {
			return len(names[i]) > len(names[j])
		}
		return names[i] < names[j]
	})
	return names
}()

// factor returns the value of one unit u (non-empty, trimmed) in the default
// unit of d, which must be valid.
func factor(u string, d Dimension) (float64, error) {
	f, v, m, err := parseUnit(u)
	if err != nil {
		return 0, fmt.Errorf("%w %q: %v; %s", ErrUnknownUnit, u, err, allowed(d))
	}
	want, _ := d.dims()
	switch {
	case d == Dimensionless && v == want:
		return 0, fmt.Errorf("%w %q: dimensionless values take no unit", ErrUnknownUnit, u)
	case v == want:
		// Exact match.
	case d == Energy && v == temperature1:
		f *= BoltzmannEV // E = k_B·T
	case d == Energy && v == (dims{baseLength: -1}):
		f *= hcEVAngstrom // E = h·c·ν̃
	default:
		if _, name := atoms[u]; !name && leadingWord(u, 0) == u {
			// One word read as a product of names ("Angstroms" as
			// Angstrom·s): most likely a misspelt name, so the near
			// miss comes first and the product reading is said as such.
			return 0, fmt.Errorf("%w: unit %q%s is not a %s: as one word it reads only as a product of unit names, of dimension %s; %s",
				ErrWrongDimension, u, suggest.Hint(u, suggestNames), d, v.describe(), allowed(d))
		}
		return 0, fmt.Errorf("%w: unit %q has dimension %s, want %s; %s", ErrWrongDimension, u, v.describe(), d, allowed(d))
	}
	if err := m.check(u); err != nil {
		return 0, fmt.Errorf("%w %q: %v", ErrUnknownUnit, u, err)
	}
	if f == 0 || math.IsNaN(f) || math.IsInf(f, 0) {
		return 0, fmt.Errorf("%w: unit %q is out of range", ErrNotFinite, u)
	}
	return f, nil
}

// molarUse records the molar atoms and "mol" factors of a unit expression.
type molarUse struct {
	molar int    // sum of the exponents of molar atoms
	mol   int    // exponent of mol
	name  string // the first molar atom, "" if none
	end   int    // the byte offset just after it and its exponent
}

// check refuses a unit that uses a molar atom other than once per mole,
// or "mol" without one: "kcal" (did you mean kcal/mol?), "eV/mol",
// "kcal/mol²".
func (m molarUse) check(u string) error {
	switch {
	case m.molar == 0 && m.mol == 0:
		return nil
	case m.molar == 0:
		return errors.New(`"mol" is accepted only per mole of a laboratory unit (J, kJ, cal, kcal, g), as in kcal/mol or g/mol`)
	case m.mol == 0 && m.molar == 1:
		return fmt.Errorf("%s is a laboratory-scale unit, accepted only per mole: did you mean %s/mol%s?", m.name, u[:m.end], u[m.end:])
	case m.mol != -m.molar:
		return fmt.Errorf("%s is accepted only once per mole (as in %s/mol)", m.name, m.name)
	}
	return nil
}

// allowed describes the units accepted for d.
func allowed(d Dimension) string {
	if d == Dimensionless {
		return "dimensionless values take no unit"
	}
	if l, ok := unitLists[d]; ok {
		return d.String() + " units: " + strings.Join(l, ", ")
	}
	return d.String() + " units: products of energy, length, … units such as " + d.DefaultUnit()
}

// parseUnit evaluates a unit expression: a sequence of unit names, each with an
// optional exponent, joined by "/", a multiplication sign or juxtaposition.
// A leading "1" is allowed before "/".
func parseUnit(u string) (f float64, v dims, m molarUse, err error) {
	f = 1
	pos := 0
	div := false       // the next factor divides
	expectAtom := true // an operator was just read, or at start
	first := true      // nothing read yet
	for {
		for pos < len(u) && (u[pos] == ' ' || u[pos] == '\t') {
			pos++
		}
		if pos == len(u) {
			if expectAtom {
				return 0, dims{}, m, errors.New("expression ends with an operator")
			}
			return f, v, m, nil
		}
		rest := u[pos:]
		if !expectAtom {
			if op, n := operator(rest); n > 0 {
				pos += n
				div = op == '/'
				expectAtom = true
				continue
			}
			// Juxtaposition multiplies.
			expectAtom = true
		}
		if first && strings.HasPrefix(rest, "1") {
			after := strings.TrimLeft(rest[1:], " \t")
			if strings.HasPrefix(after, "/") {
				pos++
				first, expectAtom = false, false
				continue
			}
		}
		name, n, err := atomAt(rest)
		if err != nil {
			return 0, dims{}, m, err
		}
		if name == "" {
			r, _ := utf8.DecodeRuneInString(rest)
			if op, n := operator(rest); n > 0 {
				return 0, dims{}, m, fmt.Errorf("unexpected %q", string(op))
			}
			w := leadingWord(rest, r)
			return 0, dims{}, m, fmt.Errorf("no unit named %q%s", w, suggest.Hint(w, suggestNames))
		}
		pos += n
		exp, n, err := exponent(u[pos:])
		if err != nil {
			return 0, dims{}, m, fmt.Errorf("after %q: %v", name, err)
		}
		pos += n
		if div {
			exp = -exp
		}
		a := atoms[name]
		switch {
		case molarAtoms[name]:
			if m.name == "" {
				m.name, m.end = name, pos
			}
			m.molar += exp
		case name == "mol":
			m.mol += exp
		}
		f *= math.Pow(a.factor, float64(exp))
		for i := range v {
			v[i] += exp * a.dim[i]
		}
		div, first, expectAtom = false, false, false
	}
}

// leadingWord returns the run of letters at the start of s (at least its first
// rune r) for error messages.
func leadingWord(s string, r rune) string {
	end := 0
	for i, c := range s {
		if !(c >= 'a' && c <= 'z' || c >= 'A' && c <= 'Z' || c == '_') {
			if i == 0 {
				return string(r)
			}
			break
		}
		end = i + utf8.RuneLen(c)
	}
	if end == 0 {
		return string(r)
	}
	return s[:end]
}

// operator reports whether s starts with "/" or a multiplication sign, and
// returns it ('/' or '*') with its length in bytes.
func operator(s string) (op rune, n int) {
	switch {
	case strings.HasPrefix(s, "/"):
		return '/', 1
	case strings.HasPrefix(s, "*"), strings.HasPrefix(s, "."):
		return '*', 1
	case strings.HasPrefix(s, "·"), strings.HasPrefix(s, "⋅"), strings.HasPrefix(s, "×"):
		_, n := utf8.DecodeRuneInString(s)
		return '*', n
	}
	return 0, 0
}

var superscripts = map[rune]int{
	'⁰': 0, '¹': 1, '²': 2, '³': 3, '⁴': 4, '⁵': 5, '⁶': 6, '⁷': 7, '⁸': 8, '⁹': 9,
}

// exponent reads an optional exponent at the start of s: "^n", "^-n", "n",
// "-n", or superscripts such as "²" and "⁻¹". n has one or two digits and is
// not zero.
// It returns the exponent (1 if absent) and the number of bytes read.
func exponent(s string) (exp, n int, err error) {
	pos := 0
	caret := strings.HasPrefix(s, "^")
	if caret {
		pos++
	}
	sign := 1
	signed := false
	if r, size := utf8.DecodeRuneInString(s[pos:]); size > 0 {
		switch r {
		case '-', '−', '⁻':
			sign, signed = -1, true
			pos += size
		case '+', '⁺':
			signed = true
			pos += size
		}
	}
	digits := 0
	val := 0
	for pos < len(s) {
		r, size := utf8.DecodeRuneInString(s[pos:])
		d, ok := superscripts[r]
		if r >= '0' && r <= '9' {
			d, ok = int(r-'0'), true
		}
		if !ok {
			break
		}
		val = 10*val + d
		digits++
		pos += size
	}
	switch {
	case digits == 0 && (caret || signed):
		return 0, 0, errors.New("exponent without digits")
	case digits == 0:
		return 1, 0, nil
	case digits > 2:
		return 0, 0, errors.New("exponent must have at most two digits")
	case val == 0:
		return 0, 0, errors.New("exponent must not be zero")
	}
	return sign * val, pos, nil
}

// atomAt finds the unit name at the start of s and returns the canonical
// name and the bytes it takes. A word (a run of ASCII letters) that is a
// name is read as it is. Otherwise a word equal to a name ignoring case is
// read as that name ("kj" and "KJ" are kJ, "EV" is eV, "ANGSTROM" is
// angstrom) when all names equal to it ignoring case mean the same unit, and
// is an error when they do not ("MEV": meV or MeV?); failing that, a word
// that splits into names written exactly is read as their product ("eVA6"
// is eV·Å⁶). A non-word name (Å, µs, a₀, g/mol …) must be written exactly.
// name is "" when nothing matches.
func atomAt(s string) (name string, n int, err error) {
	exact := ""
	for _, a := range atomNames {
		if strings.HasPrefix(s, a) {
			exact = a
			break
		}
	}
	word := asciiWord(s)
	if len(exact) >= len(word) {
		// The word is a name, or a name such as "a0" or "g/mol"
		// extends past it, or there is no word.
		return exact, len(exact), nil
	}
	var found []string
	for _, a := range atomNames {
		if strings.EqualFold(a, word) {
			found = append(found, a)
		}
	}
	if len(found) > 0 {
		for _, f := range found[1:] {
			if atoms[f] != atoms[found[0]] {
				sort.Strings(found)
				return "", 0, fmt.Errorf("unit %q is ambiguous ignoring case: %s; write it exactly", word, strings.Join(found, " or "))
			}
		}
		return found[0], len(word), nil
	}
	if splitsIntoAtoms(word) {
		return exact, len(exact), nil
	}
	return "", 0, fmt.Errorf("no unit named %q%s", word, suggest.Hint(word, suggestNames))
}

// asciiWord returns the run of ASCII letters at the start of s.
func asciiWord(s string) string {
	i := 0
	for i < len(s) && (s[i] >= 'a' && s[i] <= 'z' || s[i] >= 'A' && s[i] <= 'Z') {
		i++
	}
	return s[:i]
}

// splitsIntoAtoms reports whether word is a juxtaposition of unit names
// written exactly, by longest match.
func splitsIntoAtoms(word string) bool {
	for word != "" {
		found := false
		for _, a := range atomNames {
			if strings.HasPrefix(word, a) {
				word, found = word[len(a):], true
				break
			}
		}
		if !found {
			return false
		}
	}
	return true
}

// suggestNames are the unit names offered as near misses: the names of
// atoms, one per spelling ignoring case (the lower-case one where it
// exists). Read only.
var suggestNames = func() []string {
	byFold := map[string]string{}
	for n := range atoms {
		k := strings.ToLower(n)
		if prev, ok := byFold[k]; !ok || n == k || (prev != k && n < prev) {
			byFold[k] = n
		}
	}
	names := make([]string, 0, len(byFold))
	for _, n := range byFold {
		names = append(names, n)
	}
	sort.Strings(names)
	return names
}()
