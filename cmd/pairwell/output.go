package main

import (
	"bufio"
	"bytes"
	"encoding/csv"
	"encoding/json"
	"fmt"
	"io"
	"math"
	"strings"
	"text/tabwriter"

	"github.com/pairwell/pairwell/core/report"
)

// column is a column of a table: a title and the unit of its values.
type column struct {
	Title, Unit string
}

func (c column) header() string {
	if c.Unit == "" {
		return c.Title
	}
	return c.Title + " [" + c.Unit + "]"
}

// table is tabular output: the same data renders as an aligned table or
// as CSV.
type table struct {
	cols []column
	rows [][]string
}

func (t *table) add(cells ...string) { t.rows = append(t.rows, cells) }

// writeTable writes t aligned, with units in the headers.
func writeTable(w io.Writer, t *table) error {
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	heads := make([]string, len(t.cols))
	for i, c := range t.cols {
		heads[i] = c.header()
	}
	fmt.Fprintln(tw, strings.Join(heads, "\t"))
	for _, r := range t.rows {
		fmt.Fprintln(tw, strings.Join(r, "\t"))
	}
	return tw.Flush()
}

// writeCSV writes t as CSV with units in the header cells; ∞ becomes Inf
// and a missing value (—) an empty cell.
func writeCSV(w io.Writer, t *table) error {
	cw := csv.NewWriter(w)
	heads := make([]string, len(t.cols))
	for i, c := range t.cols {
		heads[i] = c.header()
	}
	if err := cw.Write(heads); err != nil {
		return err
	}
	for _, r := range t.rows {
		cells := make([]string, len(r))
		for i, c := range r {
			switch c {
			case "∞":
				c = "Inf"
			case "-∞":
				c = "-Inf"
			case "—":
				c = ""
			}
			cells[i] = c
		}
		if err := cw.Write(cells); err != nil {
			return err
		}
	}
	cw.Flush()
	return cw.Error()
}

// writeJSON writes v indented, with a trailing newline. Text such as
// "> 0" is written as is, not HTML-escaped to "\u003e 0".
func writeJSON(w io.Writer, v any) error {
	enc := json.NewEncoder(w)
	enc.SetEscapeHTML(false)
	enc.SetIndent("", "  ")
	return enc.Encode(v)
}

// emit writes v in the chosen format: JSON marshals v itself; table and CSV
// render t.
func (e *env) emit(v any, t *table) error {
	var err error
	switch e.format {
	case "json":
		err = writeJSON(e.stdout, v)
	case "csv":
		err = writeCSV(e.stdout, t)
	default:
		err = writeTable(e.stdout, t)
	}
	if err != nil {
		return failErr(fmt.Errorf("writing output: %w", err))
	}
	return nil
}

// emitRows writes rows in the chosen format like emit, but JSON is
// streamed row by row (the same bytes as writeJSON of the slice, without
// holding the whole document in memory) and the table is built only when
// it is printed.
func emitRows[T any](e *env, rows []T, t func() *table) error {
	if e.format != "json" {
		return e.emit(nil, t())
	}
	if err := writeJSONRows(e.stdout, rows); err != nil {
		return failErr(fmt.Errorf("writing output: %w", err))
	}
	return nil
}

// writeJSONRows writes rows as an indented JSON array, one element at a
// time, exactly as writeJSON(w, rows) would.
func writeJSONRows[T any](w io.Writer, rows []T) error {
	if len(rows) == 0 {
		_, err := io.WriteString(w, "[]\n")
		return err
	}
	bw := bufio.NewWriter(w)
	bw.WriteString("[\n")
	var buf bytes.Buffer
	enc := json.NewEncoder(&buf)
	enc.SetEscapeHTML(false)
	enc.SetIndent("  ", "  ")
	for i, r := range rows {
		buf.Reset()
		if err := enc.Encode(r); err != nil {
			return err
		}
		bw.WriteString("  ")
		bw.Write(bytes.TrimSuffix(buf.Bytes(), []byte("\n")))
		if i < len(rows)-1 {
			bw.WriteString(",")
		}
		bw.WriteString("\n")
	}
	bw.WriteString("]\n")
	return bw.Flush()
}

// num formats a value for tables: 10 significant digits, "—" for NaN,
// "∞" for +Inf.
func num(v float64) string {
	switch {
	case math.IsNaN(v):
		return "—"
	case math.IsInf(v, 1):
		return "∞"
	case math.IsInf(v, -1):
		return "-∞"
	}
	return fmt.Sprintf("%.10g", v)
}

// quantityTable starts a table of quantity, value, unit rows with the model
// and its parameters, as inspect and motion print them.
func quantityTable(model string, p report.Params) *table {
	t := &table{cols: []column{{Title: "quantity"}, {Title: "value"}, {Title: "unit"}}}
	t.add("model", model, "")
	for i, n := range p.Names {
		t.add("  "+n, num(p.Values[i]), p.Units[i])
	}
	return t
}

// checkTruncationOrder checks --order of the truncated Taylor potential.
func checkTruncationOrder(order int) error {
	if order < 2 || order > 4 {
		return usageErr(fmt.Errorf("--truncation %d: must be 2, 3 or 4", order))
	}
	return nil
}
