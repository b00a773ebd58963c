package conformance

import "github.com/pairwell/pairwell/core"

// Exampler is implemented by models that offer a representative parameter
// set, used when a form is checked without one being given.
type Exampler interface {
	// Example returns a parameter set in the default units of
	// Info().Params, in that order.
	Example() []float64
}

// examples holds illustrative parameter sets of the built-in forms, by
// model key, in the default units of their parameters. They are invented
// numbers of realistic magnitude — a bond like HCl's for Morse and the
// harmonic form, a rare-gas pair like argon's for Lennard-Jones (ε of
// about 120 K), an ionic-crystal-like Buckingham pair — not fitted to
// data. It is read-only.
var examples = map[string][]float64{
	"morse":         {4.6, 1.87, 1.27}, // De eV, a 1/Å, re Å
	"lennard-jones": {0.0104, 3.4},     // epsilon eV, sigma Å
	"buckingham":    {1500, 0.3, 25},   // A eV, rho Å, C eV·Å⁶
	"harmonic":      {30, 1.2},         // k eV/Å², r0 Å
}

// Representative returns a representative parameter set of m:
// m.Example() when m is an Exampler, else, for a built-in form (Origin
// "built-in"), an illustrative set with invented numbers of realistic
// magnitude (not fitted to data):
//
//	morse          De = 4.6 eV, a = 1.87 1/Å, re = 1.27 Å   (HCl-like bond)
//	lennard-jones  epsilon = 0.0104 eV (≈ 120 K), sigma = 3.4 Å   (argon-like)
//	buckingham     A = 1500 eV, rho = 0.3 Å, C = 25 eV·Å⁶
//	harmonic       k = 30 eV/Å², r0 = 1.2 Å
//
// ok is false when there is none. The result is a fresh slice.
func Representative(m core.Model) (params []float64, ok bool) {
	if e, is := m.(Exampler); is {
		if ps := e.Example(); ps != nil {
			return append([]float64(nil), ps...), true
		}
	}
	info := m.Info()
	if info.Origin != "built-in" {
		return nil, false
	}
	ps, ok := examples[info.Key]
	if !ok {
		return nil, false
	}
	return append([]float64(nil), ps...), true
}
