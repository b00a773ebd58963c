// Package library holds pairwell's forms library: published pair-potential
// forms typed as formulas (Mie n–m, exp-6 in (ε, r_m, α), Born–Mayer,
// Rydberg, Varshni, Kratzer, Pöschl–Teller, Hulburt–Hirschfelder,
// Tang–Toennies) in the forms file forms.toml, embedded in the binary and
// compiled by package core/formula like any forms file.
//
// Each form carries its formula, reference and parameter units, and a
// representative parameter set (conformance.Exampler; invented numbers of
// realistic magnitude, not fitted to data) so that `pairwell check` covers
// it. Units are pairwell's: energy eV, length Å.
package library

import (
	_ "embed"
	"fmt"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/formsfile"
	"github.com/pairwell/pairwell/core/formula"
)

//go:embed forms.toml
var formsTOML []byte

// Source names the embedded file in origins: a library form's origin is
// "library/forms.toml:LINE".
const Source = "library/forms.toml"

// Form is a form of the library: a formula form with a representative
// parameter set.
type Form struct {
	*formula.Form
	example []float64
}

// Example returns the representative parameter set in the default units of
// Info().Params, in that order (conformance.Exampler).
func (f *Form) Example() []float64 { return append([]float64(nil), f.example...) }

// examples holds the representative parameter sets, by key, in the order of
// the declared parameters. Invented values of realistic magnitude.
var examples = map[string][]float64{
	"mie":                  {0.0104, 3.4, 14, 6},               // epsilon eV, sigma Å, n, m: argon-like
	"exp6":                 {0.0104, 3.8, 13},                  // epsilon eV, rm Å, alpha: argon-like
	"born-mayer":           {1500, 0.3},                        // A eV, rho Å
	"rydberg":              {4.6, 2.6, 1.27},                   // De eV, a 1/Å, re Å: HCl-like
	"varshni":              {4.6, 1.27, 0.5},                   // De eV, re Å, beta 1/Å²
	"kratzer":              {4.6, 1.27},                        // De eV, re Å
	"poschl-teller":        {4.6, 1.9, 1.27},                   // De eV, a 1/Å, re Å
	"hulburt-hirschfelder": {4.6, 1.87, 1.27, 0.1, 0.05},       // De eV, a 1/Å, re Å, b, c
	"tang-toennies":        {20362, 3.838, 38.43, 271.6, 2299}, // A eV, b 1/Å, C6 eV·Å⁶, C8 eV·Å⁸, C10 eV·Å¹⁰: argon-like
}

// Forms parses and compiles the library, in file order. The embedded file
// is tested; an error here means the binary is broken.
func Forms() ([]*Form, error) {
	decls, err := formsfile.Parse(formsTOML, Source)
	if err != nil {
		return nil, fmt.Errorf("forms library: %w", err)
	}
	built, _, err := formsfile.Build(decls)
	if err != nil {
		return nil, fmt.Errorf("forms library: %w", err)
	}
	out := make([]*Form, len(built))
	for i, f := range built {
		ex, ok := examples[f.Info().Key]
		if !ok {
			return nil, fmt.Errorf("forms library: %s has no representative parameter set", f.Info().Key)
		}
		out[i] = &Form{Form: f, example: ex}
	}
	return out, nil
}

// Register adds the library's forms to reg as replaceable models
// (core.Registry.AddReplaceable): the precedence is built-in Go forms, then
// a user's forms (forms files, model sets, plugins), then the library. A
// library key that clashes with a built-in form is an error; a user's form
// with a library key replaces the library form of that key.
func Register(reg *core.Registry) error {
	fs, err := Forms()
	if err != nil {
		return err
	}
	for _, f := range fs {
		if err := reg.AddReplaceable(f); err != nil {
			return fmt.Errorf("forms library: %w", err)
		}
	}
	return nil
}
