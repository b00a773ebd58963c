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

// inspectCSVKeys is the header of inspect's CSV, fixed so that rows can be
// streamed: the JSON keys of an inspect record flattened as every CSV is
// (see writeCSVRecords), barrier.r_angstrom for the nested barrier.
var inspectCSVKeys = []string{
	"name", "model", "origin", "params",
	"equilibrium_r_angstrom", "equilibrium_energy_ev", "well_depth_ev",
	"force_constant_ev_per_angstrom2", "taylor_coefficients",
	"inflection_r_angstrom", "max_restoring_force_ev_per_angstrom",
	"barrier.r_angstrom", "barrier.energy_ev",
	"pair", "reduced_mass_u", "harmonic_wavenumber_per_cm", "harmonic_frequency_thz",
	"harmonic_period_fs", "harmonic_angular_frequency_rad_per_fs", "error",
}

// csvNum formats a number as the CSV derived from the JSON has it: full
// precision, Infinity for an unbounded value, an empty cell for one that
// does not apply (NaN).
func csvNum(v float64) string {
	switch {
	case math.IsNaN(v):
		return ""
	case math.IsInf(v, 1):
		return report.Unbounded
	case math.IsInf(v, -1):
		return "-" + report.Unbounded
	}
	return strconv.FormatFloat(v, 'g', -1, 64)
}

func csvPtr(v *float64) string {
	if v == nil {
		return ""
	}
	return csvNum(*v)
}

// inspectCSVRow is one record of inspect's CSV, the cells of
// inspectCSVKeys. It is written directly rather than flattened from the
// JSON (writeCSVRecords) because batches of 10 000 forms are its use;
// TestInspectCSVRowIsFlatJSON checks that both agree.
func inspectCSVRow(rec inspectRecord) []string {
	row := make([]string, len(inspectCSVKeys))
	row[0], row[1] = rec.Name, rec.Model
	if r := rec.Inspect; r != nil {
		var params, taylor []string
		for i, n := range r.Params.Names {
			params = append(params, n+"="+csvNum(r.Params.Values[i]))
		}
		for _, c := range r.Taylor {
			taylor = append(taylor, csvNum(c))
		}
		copy(row[2:], []string{
			r.Origin, strings.Join(params, " "),
			csvNum(r.Re), csvNum(r.Energy), csvNum(float64(r.Depth)), csvNum(r.K), strings.Join(taylor, " "),
			csvNum(float64(r.Inflection)), csvNum(float64(r.MaxForce)),
		})
		if r.Barrier != nil {
			row[11], row[12] = csvNum(r.Barrier.R), csvNum(r.Barrier.Energy)
		}
		row[13] = string(r.Pair)
		row[14], row[15], row[16] = csvPtr(r.Mu), csvPtr(r.Wavenumber), csvPtr(r.FrequencyTHz)
		row[17], row[18] = csvPtr(r.HarmonicPeriodFs), csvPtr(r.AngularFrequency)
	}
	row[19] = string(rec.Error)
	return row
}

// inspectRecord is one element of inspect's JSON array: the inspect object
// with its name, or name, model and error for a form that failed.
type inspectRecord struct {
	*report.Inspect
	Name  string      `json:"name"`
	Model string      `json:"model"`
	Error report.Text `json:"error"`
}

// newInspectRecord is the record of the form name: its report r, or nil
// and the error err.
func newInspectRecord(name, model string, r *report.Inspect, err error) inspectRecord {
	rec := inspectRecord{Inspect: r, Name: name, Model: model}
	if r != nil {
		rec.Model = r.Model
	}
	if err != nil {
		rec.Error = report.Text(oneLine(err.Error()))
	}
	return rec
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
	b, mErr := json.MarshalIndent(newInspectRecord(name, model, r, err), "  ", "  ")
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
	return c.cw.Write(inspectCSVRow(newInspectRecord(name, model, r, err)))
}

func (c *csvRecords) close() error {
	c.cw.Flush()
	return c.cw.Error()
}

// tableRecords collects the rows of the batch table (aligned, so written
// at the end).
type tableRecords struct {
	e     *env
	t     *table
	notes []string
}

func newTableRecords(e *env) *tableRecords {
	return &tableRecords{e: e, t: &table{cols: []column{
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
	if err := t.e.writeTable(t.t); err != nil {
		return err
	}
	return writeFootnotes(t.e.stdout, t.notes)
}
