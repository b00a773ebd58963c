// Package atoms provides atomic masses of elements and isotopes, and parses
// atom pairs such as "H-Cl" or "1H-35Cl" into masses and reduced masses.
//
// Masses are in u (dalton, m(¹²C)/12). Element symbols give the conventional
// standard atomic weight (IUPAC/CIAAW 2021, abridged), appropriate for
// natural isotopic composition; isotope symbols such as "2H" or "35Cl", and the
// aliases "D" (²H) and "T" (³H), give AME2020 atomic masses (neutral atoms).
// Every element, H (Z = 1) to Og (Z = 118), is known; symbols are read
// ignoring case ("CL", "cl" and "Cl" are chlorine), since element symbols are
// distinct ignoring case.
package atoms

import (
	"errors"
	"fmt"
	"math"
	"strconv"
	"strings"

	"github.com/pairwell/pairwell/core/suggest"
)

// Sentinel errors, wrapped by the errors of this package; use errors.Is.
var (
	// ErrUnknownSymbol reports an unknown element or isotope symbol.
	ErrUnknownSymbol = errors.New("unknown element or isotope")
	// ErrNoStandardWeight reports an element without a standard atomic
	// weight (Tc, Pm, Po to Ac, Np to Og: no stable isotope and no
	// characteristic terrestrial isotopic composition).
	ErrNoStandardWeight = errors.New("no standard atomic weight")
	// ErrMalformedPair reports a pair not of the form A-B.
	ErrMalformedPair = errors.New("malformed pair")
	// ErrInvalidMass reports a mass that is not finite and positive.
	ErrInvalidMass = errors.New("invalid mass")
)

// Pair is a pair of atoms with their masses.
type Pair struct {
	A, B         string  // canonical symbols, e.g. "H", "35Cl", "D"
	MassA, MassB float64 // masses in u
	Mu           float64 // reduced mass MassA·MassB/(MassA+MassB) in u
}

// String returns the pair as "A-B".
func (p Pair) String() string { return p.A + "-" + p.B }

// Mass returns the mass in u of an element or isotope symbol.
//
// An element symbol such as "H", "Cl" or "Xe" gives the conventional standard
// atomic weight (IUPAC 2021 abridged), e.g. 1.008 for H and 35.45 for Cl.
// An isotope symbol is a mass number followed by an element symbol, e.g.
// "1H", "13C" or "35Cl" (superscript digits as in "³⁵Cl" are accepted), and
// gives the AME2020 atomic mass; "D" and "T" stand for "2H" and "3H".
// Symbols are read ignoring case ("CL" is "Cl", "35cl" is "35Cl", "d" is
// "D"). Surrounding white space is ignored. An unknown symbol's error names
// the near misses ("did you mean …?").
func Mass(symbol string) (float64, error) {
	_, m, err := lookup(symbol)
	if err != nil {
		return 0, fmt.Errorf("atoms: %w", err)
	}
	return m, nil
}

// ParsePair parses a pair of atoms written "A-B", such as "H-Cl", "1H-35Cl",
// "D-D", "C-O" or "12C-16O", where A and B are symbols accepted by Mass.
// White space around A and B is ignored; an en dash "–" may replace the hyphen;
// symbols are read ignoring case. A pair written without the hyphen, such as
// "HCl", is refused with the readings that would be valid ("did you mean
// H-Cl?").
func ParsePair(s string) (Pair, error) {
	in := strings.ReplaceAll(s, "–", "-")
	a, b, ok := strings.Cut(in, "-")
	a, b = strings.TrimSpace(a), strings.TrimSpace(b)
	if !ok || a == "" || b == "" || strings.Contains(b, "-") {
		return Pair{}, fmt.Errorf("atoms: %w %q: expected form A-B, e.g. H-Cl or 1H-35Cl%s",
			ErrMalformedPair, s, suggest.Phrase(splits(strings.TrimSpace(in))))
	}
	ca, ma, err := lookup(a)
	if err != nil {
		return Pair{}, fmt.Errorf("atoms: pair %q: %w", s, err)
	}
	cb, mb, err := lookup(b)
	if err != nil {
		return Pair{}, fmt.Errorf("atoms: pair %q: %w", s, err)
	}
	mu, err := reducedMass(ma, mb)
	if err != nil {
		return Pair{}, fmt.Errorf("atoms: pair %q: %w", s, err)
	}
	return Pair{A: ca, B: cb, MassA: ma, MassB: mb, Mu: mu}, nil
}

// ReducedMass returns the reduced mass μ = m1·m2/(m1+m2) of two masses, in the
// unit of the masses. It returns an error wrapping ErrInvalidMass if either
// mass is not finite and positive.
func ReducedMass(m1, m2 float64) (float64, error) {
	mu, err := reducedMass(m1, m2)
	if err != nil {
		return 0, fmt.Errorf("atoms: reduced mass: %w", err)
	}
	return mu, nil
}

func reducedMass(m1, m2 float64) (float64, error) {
	for _, m := range []float64{m1, m2} {
		if !(m > 0) || math.IsInf(m, 0) {
			return 0, fmt.Errorf("%w %v: want a finite mass > 0", ErrInvalidMass, m)
		}
	}
	// μ = b/(1 + b/a) with b ≤ a avoids overflow of m1·m2.
	a, b := max(m1, m2), min(m1, m2)
	mu := b / (1 + b/a)
	if mu == 0 {
		return 0, fmt.Errorf("%w: reduced mass of %v and %v underflows", ErrInvalidMass, m1, m2)
	}
	return mu, nil
}

// splits returns the readings "A-B" of a pair written without a hyphen, such
// as "HCl" or "1H35Cl", in which both A and B are known symbols.
func splits(s string) []string {
	if strings.Contains(s, "-") || len(s) > 16 {
		return nil
	}
	var out []string
	for i := 1; i < len(s); i++ {
		ca, _, errA := lookup(s[:i])
		cb, _, errB := lookup(s[i:])
		if errA == nil && errB == nil {
			out = append(out, ca+"-"+cb)
		}
	}
	return out
}

// Symbols returns the known element symbols, H to Og, in order of atomic
// number. The returned slice is a fresh copy.
func Symbols() []string {
	s := make([]string, len(elements))
	for i, e := range elements {
		s[i] = e.symbol
	}
	return s
}

// Isotopes returns the known isotope symbols, such as "1H" and "35Cl", in
// order of atomic number and mass number. The returned slice is a fresh copy.
func Isotopes() []string {
	s := make([]string, len(isotopes))
	for i, iso := range isotopes {
		s[i] = strconv.Itoa(iso.a) + iso.symbol
	}
	return s
}

// byLowerSymbol indexes elements by lower-case symbol. Element symbols are
// distinct ignoring case, so this is unambiguous (TestTables checks it).
// Read only.
var byLowerSymbol = func() map[string]element {
	m := make(map[string]element, len(elements))
	for _, e := range elements {
		m[strings.ToLower(e.symbol)] = e
	}
	return m
}()

// isotopeKey identifies a nuclide.
type isotopeKey struct {
	symbol string
	a      int
}

// byIsotope indexes isotopes. Read only.
var byIsotope = func() map[isotopeKey]float64 {
	m := make(map[isotopeKey]float64, len(isotopes))
	for _, iso := range isotopes {
		m[isotopeKey{iso.symbol, iso.a}] = iso.mass
	}
	return m
}()

var superscriptDigits = strings.NewReplacer(
	"⁰", "0", "¹", "1", "²", "2", "³", "3", "⁴", "4",
	"⁵", "5", "⁶", "6", "⁷", "7", "⁸", "8", "⁹", "9",
)

// lookup returns the canonical spelling and mass of symbol. Its errors carry
// no package prefix. A symbol with no standard atomic weight is an error
// wrapping ErrNoStandardWeight, returned with the canonical spelling.
func lookup(symbol string) (canonical string, mass float64, err error) {
	s := strings.TrimSpace(symbol)
	if a, ok := isotopeAliases[strings.ToUpper(s)]; ok {
		return strings.ToUpper(s), byIsotope[isotopeKey{"H", a}], nil
	}
	s = superscriptDigits.Replace(s)
	i := 0
	for i < len(s) && '0' <= s[i] && s[i] <= '9' {
		i++
	}
	digits, name := s[:i], s[i:]
	e, ok := byLowerSymbol[strings.ToLower(name)]
	if !ok {
		return "", 0, unknownError(symbol, name)
	}
	if digits == "" {
		if e.weight == 0 {
			return e.symbol, 0, fmt.Errorf("%w for %s (no stable isotope); give an isotope such as %s, or the mass explicitly",
				ErrNoStandardWeight, e.symbol, isotopeList(e.symbol, "none known: give the mass explicitly"))
		}
		return e.symbol, e.weight, nil
	}
	a, err := strconv.Atoi(digits)
	m, known := byIsotope[isotopeKey{e.symbol, a}]
	if err != nil || digits[0] == '0' || !known {
		return "", 0, fmt.Errorf("%w %q: known isotopes of %s: %s", ErrUnknownSymbol, symbol, e.symbol,
			isotopeList(e.symbol, "none (give the mass explicitly)"))
	}
	return digits + e.symbol, m, nil
}

// isotopeList lists the known isotopes of an element, or returns none.
func isotopeList(symbol, none string) string {
	var list []string
	for _, iso := range isotopes {
		if iso.symbol == symbol {
			list = append(list, strconv.Itoa(iso.a)+iso.symbol)
		}
	}
	if len(list) == 0 {
		return none
	}
	return strings.Join(list, ", ")
}

// unknownError describes an unknown symbol with its near misses.
func unknownError(symbol, name string) error {
	known := append(Symbols(), "D", "T")
	return fmt.Errorf("%w %q%s; known elements: %s–%s (Z = 1–%d), isotopes such as 35Cl, D, T",
		ErrUnknownSymbol, symbol, suggest.Hint(name, known), elements[0].symbol, elements[len(elements)-1].symbol,
		elements[len(elements)-1].z)
}

// The accepted range of a reduced mass given directly, in u: from below
// that of an electron and a proton (5.4·10⁻⁴ u) to far above that of any
// pair of atoms (< 150 u). Outside it a value is a typo, a denormal or an
// underflow, and what is derived from it (periods, frequencies) would
// overflow or mean nothing.
const (
	MinReducedMass = 1e-4
	MaxReducedMass = 1e6
)

// CheckReducedMass returns an error wrapping ErrInvalidMass unless mu (in u)
// lies in [MinReducedMass, MaxReducedMass].
func CheckReducedMass(mu float64) error {
	if !(mu >= MinReducedMass && mu <= MaxReducedMass) {
		return fmt.Errorf("%w %v: a reduced mass must be from %g u to %g u", ErrInvalidMass, mu, MinReducedMass, MaxReducedMass)
	}
	return nil
}
