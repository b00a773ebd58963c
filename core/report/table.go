package report

import (
	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/tabulate"
)

// TableCaution is the caution printed with a table.
const TableCaution = "Caution: a table of a classical model potential, not a validated force field; do not base production or safety decisions on it alone."

// Table describes a tabulated potential (pairwell table): everything but
// the rows, which the command streams. JSON keys are a contract
// (README, "Tabulation: pairwell table").
type Table struct {
	Spec          string `json:"spec"`
	Model         string `json:"model"`
	Params        Params `json:"params"`
	Interpolation string `json:"interpolation"`
	// Interpolant says in words what the errors refer to.
	Interpolant string         `json:"interpolant"`
	From        float64        `json:"from_angstrom"`
	To          float64        `json:"to_angstrom"`
	Step        float64        `json:"step_angstrom"`
	Points      int            `json:"points"`
	Columns     []string       `json:"columns"`
	Accuracy    *TableAccuracy `json:"accuracy"` // null without a requested accuracy
	Check       TableCheck     `json:"check"`
	Caution     string         `json:"caution"`
}

// TableAccuracy is how the spacing was chosen for a requested accuracy.
// The sampled maxima of |V⁽ᵏ⁾| used in the bounds (before the safety
// factor) are those of the interpolation: k = 4 for cubic, 2 and 3 for
// linear; the others are null.
type TableAccuracy struct {
	Energy      float64  `json:"energy_tolerance_ev"`             // requested
	Force       float64  `json:"force_tolerance_ev_per_angstrom"` // requested
	BoundEnergy float64  `json:"bound_energy_ev"`                 // a-priori bound at the spacing
	BoundForce  float64  `json:"bound_force_ev_per_angstrom"`
	EnergyRule  string   `json:"energy_bound"` // the bound as a formula
	ForceRule   string   `json:"force_bound"`
	D2V         *float64 `json:"max_abs_d2v_ev_per_angstrom2"`
	D2VR        *float64 `json:"max_abs_d2v_r_angstrom"`
	D3V         *float64 `json:"max_abs_d3v_ev_per_angstrom3"`
	D3VR        *float64 `json:"max_abs_d3v_r_angstrom"`
	D4V         *float64 `json:"max_abs_d4v_ev_per_angstrom4"`
	D4VR        *float64 `json:"max_abs_d4v_r_angstrom"`
	Safety      float64  `json:"safety_factor"`
	Refinements int      `json:"refinements"`
}

// derivative returns the fields of max |V⁽ᵏ⁾| and where.
func (a *TableAccuracy) derivative(k int) (v, r **float64) {
	switch k {
	case 2:
		return &a.D2V, &a.D2VR
	case 3:
		return &a.D3V, &a.D3VR
	}
	return &a.D4V, &a.D4VR
}

// Derivatives lists the orders k whose max |V⁽ᵏ⁾| is set, with the value
// (eV/Åᵏ) and where (Å).
func (a *TableAccuracy) Derivatives() (orders []int, max, at []float64) {
	for k := 2; k <= 4; k++ {
		v, r := a.derivative(k)
		if *v != nil {
			orders, max, at = append(orders, k), append(max, **v), append(at, **r)
		}
	}
	return orders, max, at
}

// TableCheck is the measured error of the interpolant.
type TableCheck struct {
	Energy  float64 `json:"energy_error_ev"`
	EnergyR float64 `json:"energy_error_r_angstrom"`
	Force   float64 `json:"force_error_ev_per_angstrom"`
	ForceR  float64 `json:"force_error_r_angstrom"`
	Points  int     `json:"points"`
	Where   string  `json:"where"`
}

// Table column keys (CSV header, JSON row keys).
const (
	ColR      = "r_angstrom"
	ColEnergy = "energy_ev"
	ColForce  = "force_ev_per_angstrom"
	ColD2V    = "d2v_ev_per_angstrom2"
)

// NewTable describes a tabulation result of an instance.
func NewTable(spec string, inst core.Instance, res *tabulate.Result) Table {
	g := res.Table.Grid
	t := Table{
		Spec: spec, Model: inst.Model.Info().Key, Params: NewParams(inst),
		Interpolation: res.Interpolation.String(), Interpolant: Interpolant(res.Interpolation),
		From: g.From, To: g.To, Step: g.Step(), Points: g.Points,
		Columns: []string{ColR, ColEnergy, ColForce},
		Check: TableCheck{Energy: res.Check.Energy, EnergyR: res.Check.EnergyR, Force: res.Check.Force, ForceR: res.Check.ForceR,
			Points: res.Check.Points, Where: "the midpoint and h/2 ± h/(2√3) of every interval, against the exact form"},
		Caution: TableCaution,
	}
	if res.Table.D2V != nil {
		t.Columns = append(t.Columns, ColD2V)
	}
	if p := res.Plan; p != nil {
		a := &TableAccuracy{Energy: p.Tolerance.Energy, Force: p.Tolerance.Force,
			BoundEnergy: p.Bound.Energy, BoundForce: p.Bound.Force, Safety: p.Safety, Refinements: p.Refinements}
		a.EnergyRule, a.ForceRule = BoundRules(res.Interpolation)
		for _, d := range [][3]float64{{float64(p.EnergyOrder), p.EnergyMax, p.EnergyMaxR}, {float64(p.ForceOrder), p.ForceMax, p.ForceMaxR}} {
			v, r := a.derivative(int(d[0]))
			m, at := d[1], d[2]
			*v, *r = &m, &at
		}
		t.Accuracy = a
	}
	return t
}

// Interpolant says in words which interpolant a table's errors refer to.
func Interpolant(how tabulate.Interpolation) string {
	if how == tabulate.Linear {
		return "V and F each interpolated linearly from their own column"
	}
	return "the complete cubic spline s through V with end slopes V′ = −F at both ends; F = −s′"
}

// BoundRules returns the error bounds of V and F as formulas, with their
// sources (see package core/tabulate).
func BoundRules(how tabulate.Interpolation) (energy, force string) {
	if how == tabulate.Linear {
		return "h²·max|V″|/8 (linear interpolation)", "h²·max|V‴|/8 (linear interpolation of F)"
	}
	return "(5/384)·h⁴·max|V⁽⁴⁾| (C. A. Hall & W. W. Meyer, J. Approx. Theory 16, 105 (1976))",
		"(1/24)·h³·max|V⁽⁴⁾| (Hall & Meyer 1976)"
}
