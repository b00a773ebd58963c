package main

import (
	"encoding/csv"
	"encoding/json"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"

	"github.com/pairwell/pairwell/core/report"
)

// inspectCSVKeys is the header of inspect's CSV: the JSON keys of an
// inspect record, nested keys joined with a dot (barrier.r_angstrom).
// params is one cell, "NAME=VALUE NAME=VALUE" in default units, and
// taylor_coefficients one cell of space-separated c₀ … c_N.
var inspectCSVKeys = []string{
	"name", "model", "origin", "params",
	"equilibrium_r_angstrom", "equilibrium_energy_ev", "well_depth_ev",
	"force_constant_ev_per_angstrom2", "taylor_coefficients",
	"inflection_r_angstrom", "max_restoring_force_ev_per_angstrom",
	"barrier.r_angstrom", "barrier.energy_ev",
	"pair", "reduced_mass_u", "harmonic_wavenumber_per_cm", "harmonic_frequency_thz",
	"harmonic_period_fs", "harmonic_angular_frequency_rad_per_fs", "error",
}

// csvNum formats a number for CSV: full precision, Inf for an unbounded
// value, an empty cell for one that does not apply (NaN).
func csvNum(v float64) string {
	switch {
	case math.IsNaN(v):
		return ""
	case math.IsInf(v, 1):
		return "Inf"
	case math.IsInf(v, -1):
		return "-Inf"
	}
	return strconv.FormatFloat(v, 'g', -1, 64)
}

func csvPtr(v *float64) string {
	if v == nil {
		return ""
	}
	return csvNum(*v)
}

// inspectCSVRow is one record of inspect's CSV.
func inspectCSVRow(name, model string, r *report.Inspect, err error) []string {
	row := make([]string, len(inspectCSVKeys))
	row[0], row[1] = name, model
	if r != nil {
		var params, taylor []string
		for i, n := range r.Params.Names {
			params = append(params, n+"="+csvNum(r.Params.Values[i]))
		}
		for _, c := range r.Taylor {
			taylor = append(taylor, csvNum(c))
		}
		copy(row[1:], []string{
			r.Model, r.Origin, strings.Join(params, " "),
			csvNum(r.Re), csvNum(r.Energy), csvNum(float64(r.Depth)), csvNum(r.K), strings.Join(taylor, " "),
			csvNum(float64(r.Inflection)), csvNum(float64(r.MaxForce)),
		})
		if r.Barrier != nil {
			row[11], row[12] = csvNum(r.Barrier.R), csvNum(r.Barrier.Energy)
		}
		row[13] = r.Pair
		row[14], row[15], row[16] = csvPtr(r.Mu), csvPtr(r.Wavenumber), csvPtr(r.FrequencyTHz)
		row[17], row[18] = csvPtr(r.HarmonicPeriodFs), csvPtr(r.AngularFrequency)
	}
	if err != nil {
		row[19] = oneLine(err.Error())
	}
	return row
}

// inspectRecord is one element of inspect's JSON array: the inspect object
// with its name, or name, model and error for a form that failed.
type inspectRecord struct {
	*report.Inspect
	Name  string `json:"name"`
	Model string `json:"model"`
	Error string `json:"error,omitempty"`
}

// recordWriter streams the records of a batch in one format.
type recordWriter interface {
	write(name, model string, r *report.Inspect, err error) error
	close() error
}

// jsonArray streams a JSON array, one element per record, written as soon
// as it is known.
type jsonArray struct {
	w io.Writer
	n int
}

func (j *jsonArray) write(name, model string, r *report.Inspect, err error) error {
	rec := inspectRecord{Inspect: r, Name: name, Model: model}
	if r != nil {
		rec.Model = r.Model
	}
	if err != nil {
		rec.Error = oneLine(err.Error())
	}
	b, mErr := json.MarshalIndent(rec, "  ", "  ")
	if mErr != nil {
		return mErr
	}
	sep := ",\n  "
	if j.n == 0 {
		sep = "[\n  "
	}
	j.n++
	if _, err := io.WriteString(j.w, sep); err != nil {
		return err
	}
	_, err = j.w.Write(b)
	return err
}

func (j *jsonArray) close() error {
	end := "\n]\n"
	if j.n == 0 {
		end = "[]\n"
	}
	_, err := io.WriteString(j.w, end)
	return err
}

// csvRecords streams CSV, the header first.
type csvRecords struct{ cw *csv.Writer }

func newCSVRecords(w io.Writer) (*csvRecords, error) {
	c := &csvRecords{cw: csv.NewWriter(w)}
	return c, c.cw.Write(inspectCSVKeys)
}

func (c *csvRecords) write(name, model string, r *report.Inspect, err error) error {
	return c.cw.Write(inspectCSVRow(name, model, r, err))
}

func (c *csvRecords) close() error {
	c.cw.Flush()
	return c.cw.Error()
}

// tableRecords collects the rows of the batch table (aligned, so written
// at the end).
type tableRecords struct {
	w     io.Writer
	t     *table
	notes []string
}

func newTableRecords(w io.Writer) *tableRecords {
	return &tableRecords{w: w, t: &table{cols: []column{
		{Title: "name"}, {Title: "re", Unit: "Å"}, {Title: "V(re)", Unit: "eV"}, {Title: "depth", Unit: "eV"},
		{Title: "k", Unit: "eV/Å²"}, {Title: "c3", Unit: "eV/Å³"}, {Title: "c4", Unit: "eV/Å⁴"},
		{Title: "wavenumber", Unit: "cm⁻¹"}, {Title: "notes"},
	}}}
}

func (t *tableRecords) write(name, model string, r *report.Inspect, err error) error {
	if r == nil {
		t.notes = append(t.notes, name+": "+oneLine(err.Error()))
		t.t.add(name, "—", "—", "—", "—", "—", "—", "—", fmt.Sprintf("[%d]", len(t.notes)))
		return nil
	}
	wn := "—"
	if r.Wavenumber != nil {
		wn = short(*r.Wavenumber)
	}
	t.t.add(name, short(r.Re), short(r.Energy), short(float64(r.Depth)), short(r.K),
		short(taylor(r.Taylor, 3)), short(taylor(r.Taylor, 4)), wn, "")
	return nil
}

func (t *tableRecords) close() error {
	if err := writeTable(t.w, t.t); err != nil {
		return err
	}
	return writeFootnotes(t.w, t.notes)
}
