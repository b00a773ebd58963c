package units

import "strconv"

// Superscript writes the integer n with Unicode superscript digits, e.g.
// Superscript(12) = "¹²" and Superscript(-1) = "⁻¹".
func Superscript(n int) string { return mapDigits(n, []rune("⁰¹²³⁴⁵⁶⁷⁸⁹")) }

// Subscript writes the integer n with Unicode subscript digits, e.g.
// Subscript(4) = "₄" and Subscript(-1) = "₋₁".
func Subscript(n int) string { return mapDigits(n, []rune("₀₁₂₃₄₅₆₇₈₉")) }

func mapDigits(n int, digits []rune) string {
	s := strconv.Itoa(n)
	out := make([]rune, 0, len(s))
	for _, c := range s {
		if c == '-' {
			if digits[0] == '⁰' {
				out = append(out, '⁻')
			} else {
				out = append(out, '₋')
			}
			continue
		}
		out = append(out, digits[c-'0'])
	}
	return string(out)
}

// DerivativeUnit returns the unit of the n-th derivative of an energy in eV
// with respect to a length in Å: "eV", "eV/Å", "eV/Å²", … (n ≥ 0).
func DerivativeUnit(n int) string {
	switch n {
	case 0:
		return "eV"
	case 1:
		return "eV/Å"
	}
	return "eV/Å" + Superscript(n)
}
