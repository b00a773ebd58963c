// Package morse is a Morse form written independently of the built-in one,
// with optional deliberate faults, for the plugin tests. Never use it
// outside tests.
package morse

import (
	"fmt"
	"math"
	"os"
	"time"

	"github.com/pairwell/pairwell/conformance"
	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/units"
)

// Fault is a deliberate defect.
type Fault int

// Faults.
const (
	None      Fault = iota
	Crash           // the process exits with status 3 in an evaluation
	Hang            // an evaluation never returns
	NaN             // c_n is NaN for n ≥ 2
	BadLength       // (served by testdata/faulty) one value too few
	Third           // V‴ is 1.1 times the true value
	ForceSign       // V′ has the wrong sign
	Panic           // an evaluation panics
)

const (
	reference = "P. M. Morse, Phys. Rev. 34, 57 (1929)"
	maxOrder  = 60
)

// Model is the Morse form V = De[(1 − e^{−a(r−re)})² − 1] under Key, with
// Fault.
type Model struct {
	Key   string
	Fault Fault
}

// Info returns the metadata.
func (m Model) Info() core.ModelInfo {
	return core.ModelInfo{
		Key:     m.Key,
		Name:    "Morse (test plugin)",
		Formula: "V = De[(1 − exp(−a(r − re)))² − 1]",
		Params: []core.Param{
			{Name: "De", Dimension: units.Energy, Constraint: core.Positive, Meaning: "well depth"},
			{Name: "a", Dimension: units.InverseLength, Constraint: core.Positive, Meaning: "range parameter"},
			{Name: "re", Dimension: units.Length, Constraint: core.Positive, Meaning: "equilibrium distance"},
		},
		Domain:    "every r > 0",
		Reference: reference,
		MaxOrder:  maxOrder,
	}
}

// New builds the potential.
func (m Model) New(params []float64) (core.Potential, error) {
	if err := core.CheckParams(m.Info(), params); err != nil {
		return nil, err
	}
	return &Potential{key: m.Key, fault: m.Fault, de: params[0], a: params[1], re: params[2]}, nil
}

// Match gives (Depth, √(K/(2Depth)), Re).
func (m Model) Match(t core.Target) ([]float64, []string, error) {
	if !(t.Re > 0 && t.Depth > 0 && t.K > 0) {
		return nil, nil, fmt.Errorf("%s: %w: needs re, Depth, K > 0", m.Key, core.ErrParam)
	}
	return []float64{t.Depth, math.Sqrt(t.K / (2 * t.Depth)), t.Re}, nil, nil
}

// Potential is the Morse potential with its fault.
type Potential struct {
	key       string
	fault     Fault
	de, a, re float64
}

// Fault returns the potential's fault.
func (p *Potential) Fault() Fault { return p.fault }

// Domain is (0, ∞), limit 0, minimum at re.
func (p *Potential) Domain() core.Domain {
	return core.Domain{Max: math.Inf(1), EquilibriumGuess: p.re}
}

// MaxOrder returns 60.
func (p *Potential) MaxOrder() int { return maxOrder }

// Identities are the true Morse ones, whatever the fault.
func (p *Potential) Identities() []conformance.Identity {
	de, a := p.de, p.a
	return []conformance.Identity{
		{Name: "r_min = re", Quantity: conformance.EquilibriumR, Value: p.re, Source: reference},
		{Name: "V(re) = −De", Quantity: conformance.MinimumEnergy, Value: -de, Source: reference},
		{Name: "V″(re) = 2De·a²", Quantity: conformance.DerivativeAtMinimum, Order: 2, Value: 2 * de * a * a, Source: reference},
		{Name: "V‴(re) = −6De·a³", Quantity: conformance.DerivativeAtMinimum, Order: 3, Value: -6 * de * a * a * a, Source: reference},
	}
}

// Taylor stores c_k(r[i]) = De·y·[2ᵏ·q_k·y − 2q_k] at dst[i·(n+1)+k], with
// y = e^{−a(r−re)} and q_k = (−a)ᵏ/k! (so that (−2a)ᵏ/k! = 2ᵏq_k), the
// fault applied to its order. It uses math.Exp and its own arrangement of
// the terms, independently of the built-in.
func (p *Potential) Taylor(n int, r, dst []float64) error {
	if err := core.CheckTaylor(n, maxOrder, len(r), len(dst)); err != nil {
		return fmt.Errorf("%s: %w", p.key, err)
	}
	// q[k] = (−a)ᵏ/k! and q2[k] = 2ᵏq[k] = (−2a)ᵏ/k!, once per call.
	var q, q2 [maxOrder + 1]float64
	q[0], q2[0] = 1, 1
	for k := 1; k <= n; k++ {
		q[k] = q[k-1] * -p.a / float64(k)
		q2[k] = math.Ldexp(q[k], k)
	}
	for i, x := range r {
		if !(x > 0 && x <= math.MaxFloat64) {
			return &core.PointError{Index: i, R: x, Err: fmt.Errorf("%s: %w", p.key, core.CheckR(p.Domain(), x))}
		}
		switch p.fault {
		case Crash:
			f := os.NewFile(2, "stderr") // the real standard error, not go-plugin's redirect
			fmt.Fprintln(f, "crash test plugin: exiting in the middle of a call")
			os.Exit(3)
		case Hang:
			time.Sleep(time.Hour)
		case Panic:
			panic("panic test plugin")
		}
		y := math.Exp(-p.a * (x - p.re))
		dy := p.de * y
		row := dst[i*(n+1) : (i+1)*(n+1)]
		for k := range row {
			v := dy * (q2[k]*y - 2*q[k])
			switch {
			case p.fault == NaN && k >= 2:
				v = math.NaN()
			case p.fault == Third && k == 3:
				v *= 1.1
			case p.fault == ForceSign && k == 1:
				v = -v
			}
			if v-v != 0 && !math.IsNaN(v) {
				return &core.PointError{Index: i, R: x, Err: fmt.Errorf("%s: %w", p.key, core.OverflowError(x, k))}
			}
			row[k] = v
		}
	}
	return nil
}
