package models_test

import (
	"fmt"
	"math"

	"github.com/pairwell/pairwell/conformance"
	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/units"
	"github.com/pairwell/pairwell/models"
)

// Building a form from a spec: values without a unit are in the parameter's
// default unit, suffixed values are converted (here ε = 120 K·k_B, CODATA
// 2018). The parameter values are illustrative.
func ExampleNewRegistry() {
	reg := models.NewRegistry()
	inst, err := reg.Build("lj:epsilon=120K,sigma=0.34nm")
	if err != nil {
		fmt.Println(err)
		return
	}
	info := inst.Model.Info()
	for i, p := range info.Params {
		fmt.Printf("%s = %.6g %s\n", p.Name, inst.Params[i], p.Dimension.DefaultUnit())
	}
	_, err = reg.Build("mrose:De=4.6,a=1.87,re=1.27")
	fmt.Println(err)
	// Output:
	// epsilon = 0.0103408 eV
	// sigma = 3.4 Å
	// invalid spec: unknown model "mrose" (did you mean morse?); known: buckingham, harmonic, lennard-jones, morse
}

// morseK is a custom form: the Morse potential parametrised by its depth
// De, force constant k = V″(re) and equilibrium distance re instead of the
// range a = √(k/(2De)). Its potential is the built-in Morse one; only the
// parametrisation is new.
type morseK struct{}

func (morseK) Info() core.ModelInfo {
	return core.ModelInfo{
		Key:     "morse-k",
		Name:    "Morse (depth, force constant)",
		Formula: "V = De(1 − e^{−a(r − re)})² − De, a = √(k/(2De))",
		Params: []core.Param{
			{Name: "De", Dimension: units.Energy, Constraint: core.Positive, Meaning: "well depth"},
			{Name: "k", Dimension: units.ForceConstant, Constraint: core.Positive, Meaning: "force constant V″(re)"},
			{Name: "re", Dimension: units.Length, Constraint: core.Positive, Meaning: "equilibrium distance"},
		},
		Domain:    "every r > 0",
		Reference: "P. M. Morse, Phys. Rev. 34, 57 (1929)",
		MaxOrder:  models.MaxOrder,
		Origin:    "example",
	}
}

func (m morseK) New(params []float64) (core.Potential, error) {
	if err := core.CheckParams(m.Info(), params); err != nil {
		return nil, err
	}
	de, k, re := params[0], params[1], params[2]
	return models.NewMorse(de, math.Sqrt(k/(2*de)), re)
}

// Running the conformance suite on a custom form: every check (derivatives
// against finite differences, batch consistency, the equilibrium, invalid
// input, the asymptote) at one parameter set, invented but HCl-sized.
func Example_conformance() {
	rep, err := conformance.Run(morseK{}, [][]float64{{4.6, 32.17148, 1.27}}, conformance.Settings{})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println("passed:", rep.Passed())
	fmt.Println("failures:", len(rep.Failures()))
	// Output:
	// passed: true
	// failures: 0
}
