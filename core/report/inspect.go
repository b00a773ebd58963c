// Package report assembles pairwell's results into the structures the
// command line prints. Field names and JSON keys are a contract for scripts:
// values are always in eV, Å, u, fs and cm⁻¹, whatever the input units.
package report

import (
	"bytes"
	"encoding/json"
	"fmt"
	"math"

	"github.com/pairwell/pairwell/core"
)

// Number is a float64 whose JSON encoding keeps "unbounded" and "does not
// apply" apart: +Inf (an unbounded value, such as the depth of a harmonic
// well) encodes as the string "Infinity", −Inf as "-Infinity", and NaN (no
// value: not applicable, not computed, or the row failed) as null.
// "Infinity" is what float() in Python, strconv.ParseFloat in Go, Number()
// in JavaScript and as.numeric in R read as infinity.
type Number float64

// Unbounded is the JSON (and CSV) spelling of +Inf.
const Unbounded = "Infinity"

// MarshalJSON implements json.Marshaler.
func (n Number) MarshalJSON() ([]byte, error) {
	f := float64(n)
	switch {
	case math.IsNaN(f):
		return []byte("null"), nil
	case math.IsInf(f, 1):
		return []byte(`"` + Unbounded + `"`), nil
	case math.IsInf(f, -1):
		return []byte(`"-` + Unbounded + `"`), nil
	}
	return json.Marshal(f)
}

// Text is a string that encodes as JSON null when it is empty: a key such
// as "pair" is present in every record, null where it does not apply.
type Text string

// MarshalJSON implements json.Marshaler.
func (t Text) MarshalJSON() ([]byte, error) {
	if t == "" {
		return []byte("null"), nil
	}
	return json.Marshal(string(t))
}

// Params is a parameter set in the model's order and default units; it
// encodes as a JSON object keeping that order.
type Params struct {
	Names  []string
	Units  []string
	Values []float64
}

// NewParams returns the parameters of an instance.
func NewParams(inst core.Instance) Params {
	info := inst.Model.Info()
	p := Params{Values: append([]float64(nil), inst.Params...)}
	for _, q := range info.Params {
		p.Names = append(p.Names, q.Name)
		p.Units = append(p.Units, q.Dimension.DefaultUnit())
	}
	return p
}

// MarshalJSON implements json.Marshaler.
func (p Params) MarshalJSON() ([]byte, error) {
	var b bytes.Buffer
	b.WriteByte('{')
	for i, n := range p.Names {
		if i > 0 {
			b.WriteByte(',')
		}
		k, _ := json.Marshal(n)
		v, err := json.Marshal(Number(p.Values[i]))
		if err != nil {
			return nil, err
		}
		b.Write(k)
		b.WriteByte(':')
		b.Write(v)
	}
	b.WriteByte('}')
	return b.Bytes(), nil
}

// String formats the parameters as NAME=VALUE UNIT, ...
func (p Params) String() string {
	var b bytes.Buffer
	for i, n := range p.Names {
		if i > 0 {
			b.WriteString(", ")
		}
		fmt.Fprintf(&b, "%s=%.10g", n, p.Values[i])
		if p.Units[i] != "" {
			b.WriteString(" " + p.Units[i])
		}
	}
	return b.String()
}

// Barrier is an inner maximum bounding the usable domain.
type Barrier struct {
	R      float64 `json:"r_angstrom"`
	Energy float64 `json:"energy_ev"`
}

// Inspect is the description of one parametrised form: its well, Taylor
// coefficients and, given a reduced mass, its harmonic vibration.
type Inspect struct {
	Name       string    `json:"name,omitempty"`
	Model      string    `json:"model"`
	Origin     string    `json:"origin"`
	Params     Params    `json:"params"`
	Re         float64   `json:"equilibrium_r_angstrom"`
	Energy     float64   `json:"equilibrium_energy_ev"`
	Depth      Number    `json:"well_depth_ev"`
	K          float64   `json:"force_constant_ev_per_angstrom2"`
	Taylor     []float64 `json:"taylor_coefficients"`
	Inflection Number    `json:"inflection_r_angstrom"`
	MaxForce   Number    `json:"max_restoring_force_ev_per_angstrom"`
	// Barrier is nil (null) for a form without an inner barrier.
	Barrier *Barrier `json:"barrier"`
	// Pair and the harmonic vibration are null without a reduced mass;
	// Pair is also null for a mass given directly.
	Pair             Text     `json:"pair"`
	Mu               *float64 `json:"reduced_mass_u"`
	Wavenumber       *float64 `json:"harmonic_wavenumber_per_cm"`
	FrequencyTHz     *float64 `json:"harmonic_frequency_thz"`
	HarmonicPeriodFs *float64 `json:"harmonic_period_fs"`
	AngularFrequency *float64 `json:"harmonic_angular_frequency_rad_per_fs"`
}

// Mass is an optional reduced mass and the pair it came from.
type Mass struct {
	Pair string  // e.g. "1H-35Cl"; empty when given directly
	Mu   float64 // u; 0 means no mass
}

// NewInspect analyses inst. order is the highest Taylor coefficient (0
// means 4); a zero m.Mu leaves out the harmonic vibration.
func NewInspect(name string, inst core.Instance, order int, m Mass) (Inspect, error) {
	r, _, err := newInspect(name, inst, order, m)
	return r, err
}

// newInspect is NewInspect that also returns the well it analysed.
func newInspect(name string, inst core.Instance, order int, m Mass) (Inspect, core.Well, error) {
	info := inst.Model.Info()
	w, err := core.AnalyzeWell(inst.Potential, core.WellSettings{Order: order})
	if err != nil {
		return Inspect{}, core.Well{}, fmt.Errorf("%s: %w", info.Key, err)
	}
	r := Inspect{
		Name:       name,
		Model:      info.Key,
		Origin:     info.Origin,
		Params:     NewParams(inst),
		Re:         w.Re,
		Energy:     w.Energy,
		Depth:      Number(w.Depth),
		K:          w.K,
		Taylor:     w.Taylor,
		Inflection: Number(w.Inflection),
		MaxForce:   Number(w.MaxForce),
	}
	if d := inst.Potential.Domain(); d.Barrier {
		r.Barrier = &Barrier{R: d.Min, Energy: d.BarrierEnergy}
	}
	if m.Mu != 0 {
		h, err := core.NewHarmonic(w.K, m.Mu)
		if err != nil {
			return Inspect{}, core.Well{}, fmt.Errorf("%s: %w", info.Key, err)
		}
		r.Pair = Text(m.Pair)
		r.Mu = &h.Mu
		r.Wavenumber = &h.Wavenumber
		r.FrequencyTHz = &h.FrequencyTHz
		r.HarmonicPeriodFs = &h.PeriodFs
		r.AngularFrequency = &h.Omega
	}
	return r, w, nil
}
