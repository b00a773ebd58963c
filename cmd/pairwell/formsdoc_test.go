package main

import (
	"fmt"
	"strings"
)

// The forms-file fixtures of the tests (forms, thermal, fit): the built-in
// forms typed as formulas, with the built-ins' parameter names.

// formParam is a parameter of a form of a forms file: name, unit and
// constraint ("" for none).
type formParam struct{ name, unit, constraint string }

// formTOML returns one [[form]] table of a forms file: its key and formula,
// the extra lines of the table (e.g. `limit = 0`, one a line), then the
// parameters.
func formTOML(key, formula, extra string, params ...formParam) string {
	var b strings.Builder
	fmt.Fprintf(&b, "[[form]]\nkey = %q\nformula = %q\n", key, formula)
	if extra != "" {
		b.WriteString(strings.TrimSpace(extra) + "\n")
	}
	for _, p := range params {
		fmt.Fprintf(&b, "[[form.param]]\nname = %q\nunit = %q\n", p.name, p.unit)
		if p.constraint != "" {
			fmt.Fprintf(&b, "constraint = %q\n", p.constraint)
		}
	}
	return b.String()
}

// The formulas and parameters of Morse (1929) and Lennard-Jones (1924).
const (
	morseFormula = "De*(1 - exp(-a*(r - re)))^2 - De"
	ljFormula    = "4*epsilon*((sigma/r)^12 - (sigma/r)^6)"
)

var (
	morseParams = []formParam{{"De", "eV", "> 0"}, {"a", "1/A", "> 0"}, {"re", "A", "> 0"}}
	ljParams    = []formParam{{"epsilon", "eV", "> 0"}, {"sigma", "A", "> 0"}}
)
