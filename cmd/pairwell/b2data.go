package main

import (
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"

	"github.com/pairwell/pairwell/core/report"
	"github.com/pairwell/pairwell/core/units"
)

// maxB2DataRows caps the rows of a --data file.
const maxB2DataRows = 100_000

// b2VolumeUnits are the units accepted for B₂ in a --data file, in cm³/mol.
var b2VolumeUnits = map[string]float64{
	"cm3/mol": 1, "cm^3/mol": 1, "cm³/mol": 1, "mL/mol": 1, "ml/mol": 1,
	"dm3/mol": 1e3, "dm^3/mol": 1e3, "dm³/mol": 1e3, "L/mol": 1e3, "l/mol": 1e3,
	"m3/mol": 1e6, "m^3/mol": 1e6, "m³/mol": 1e6,
}

// headerUnit splits a header cell "NAME [UNIT]" (or "NAME (UNIT)").
func headerUnit(cell string) (name, unit string, ok bool) {
	c := strings.TrimSpace(cell)
	for _, p := range [][2]string{{"[", "]"}, {"(", ")"}} {
		if strings.HasSuffix(c, p[1]) {
			if i := strings.LastIndex(c, p[0]); i >= 0 {
				return strings.TrimSpace(c[:i]), strings.TrimSpace(c[i+1 : len(c)-1]), true
			}
		}
	}
	return c, "", false
}

// readB2Data reads a --data file: CSV with a header row naming the columns
// with their units in brackets — temperature (K or degC), B₂ (cm3/mol,
// dm3/mol = L/mol, m3/mol) and, optionally, its uncertainty (a volume unit
// as well) — then one row per measurement. Lines starting with '#' are
// comments (the place to name the source). Values are in the header's
// units; temperatures must be > 0 K, uncertainties ≥ 0, every value
// finite. Errors name the line.
func readB2Data(r io.Reader) ([]report.Measurement, error) {
	cr := csv.NewReader(r)
	cr.Comment = '#'
	cr.FieldsPerRecord = -1
	cr.TrimLeadingSpace = true
	head, err := cr.Read()
	if err == io.EOF {
		return nil, errors.New("empty file: want a header row such as \"T [K],B2 [cm3/mol],uncertainty [cm3/mol]\" and data rows")
	}
	if err != nil {
		return nil, fmt.Errorf("header: %w", err)
	}
	if len(head) < 2 || len(head) > 3 {
		return nil, fmt.Errorf("header has %d columns: want temperature, B2 and optionally its uncertainty, e.g. \"T [K],B2 [cm3/mol],uncertainty [cm3/mol]\"", len(head))
	}
	_, tunit, ok := headerUnit(head[0])
	if !ok {
		return nil, fmt.Errorf("header cell %q: give the temperature unit in brackets, e.g. \"T [K]\" or \"T [degC]\"", head[0])
	}
	if tunit != "K" && tunit != "degC" && tunit != "°C" {
		return nil, fmt.Errorf("header cell %q: temperature unit %q, want K or degC", head[0], tunit)
	}
	factors := make([]float64, len(head))
	for i := 1; i < len(head); i++ {
		_, u, ok := headerUnit(head[i])
		f, known := b2VolumeUnits[u]
		if !ok || !known {
			return nil, fmt.Errorf("header cell %q: give a molar volume unit in brackets: cm3/mol, dm3/mol (L/mol) or m3/mol", head[i])
		}
		factors[i] = f
	}
	var out []report.Measurement
	for {
		rec, err := cr.Read()
		if err == io.EOF {
			break
		}
		line, _ := cr.FieldPos(0)
		if err != nil {
			return nil, fmt.Errorf("line %d: %w", line, err)
		}
		if len(rec) != len(head) {
			return nil, fmt.Errorf("line %d: %d values, the header has %d columns", line, len(rec), len(head))
		}
		if len(out) >= maxB2DataRows {
			return nil, fmt.Errorf("more than %d data rows", maxB2DataRows)
		}
		vals := make([]float64, len(rec))
		for i, c := range rec {
			v, err := strconv.ParseFloat(strings.TrimSpace(c), 64)
			if err != nil || math.IsNaN(v) || math.IsInf(v, 0) {
				return nil, fmt.Errorf("line %d, column %d: %q is not a finite number", line, i+1, c)
			}
			vals[i] = v
		}
		T := vals[0]
		if tunit != "K" {
			T += units.CelsiusZero
		}
		if !(T > 0) {
			return nil, fmt.Errorf("line %d: temperature %s %s is not above absolute zero", line, rec[0], tunit)
		}
		m := report.Measurement{Temperature: T, B2: vals[1] * factors[1], Uncertainty: math.NaN()}
		if len(vals) == 3 {
			if vals[2] < 0 {
				return nil, fmt.Errorf("line %d: negative uncertainty %s", line, rec[2])
			}
			m.Uncertainty = vals[2] * factors[2]
		}
		if math.IsInf(m.B2, 0) || math.IsInf(m.Uncertainty, 0) {
			return nil, fmt.Errorf("line %d: value out of range", line)
		}
		out = append(out, m)
	}
	if len(out) == 0 {
		return nil, errors.New("no data rows after the header")
	}
	return out, nil
}
