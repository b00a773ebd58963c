package main

import (
	"bufio"
	"bytes"
	"encoding/csv"
	"encoding/json"
	"fmt"
	"io"
	"math"
	"strconv"
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

// writeJSON writes v indented, with a trailing newline. Text such as
// "> 0" is written as is, not HTML-escaped to "\u003e 0".
func writeJSON(w io.Writer, v any) error {
	enc := json.NewEncoder(w)
	enc.SetEscapeHTML(false)
	enc.SetIndent("", "  ")
	return enc.Encode(v)
}

// emit writes v in the chosen format: JSON marshals v itself, CSV is
// derived from that JSON (see writeCSVRecords: one row per element of an
// array, or one row for an object), the table renders t with the energies
// in --energy-unit.
func (e *env) emit(v any, t *table) error { return e.emitRecords(v, "", t) }

// emitRecords is emit for a JSON object that holds its records in the
// array under the key records ("rows", "levels", …; a dotted path reaches
// into nested objects, and several comma-separated paths are concatenated,
// "rows,data.rows"): CSV has one row per record, prefixed by the object's
// model block (see modelBlockKeys).
func (e *env) emitRecords(v any, records string, t *table) error {
	var err error
	switch e.format {
	case "json":
		err = writeJSON(e.stdout, v)
	case "csv":
		err = writeCSVRecords(e.stdout, v, records)
	default:
		err = e.writeTable(t)
	}
	if err != nil {
		return failErr(fmt.Errorf("writing output: %w", err))
	}
	return nil
}

// writeTable writes t aligned to stdout, its energies converted to
// --energy-unit.
func (e *env) writeTable(t *table) error { return e.tables().table(t) }

// tableWriter is text output whose tables show the energies in the unit
// of --energy-unit (for commands that print several tables and text).
type tableWriter struct {
	io.Writer
	energy energyChoice
}

// tables is stdout as a tableWriter.
func (e *env) tables() tableWriter { return tableWriter{e.stdout, e.energy} }

// table writes t aligned, its energies converted.
func (w tableWriter) table(t *table) error {
	if w.energy.name != "" && w.energy.name != "eV" {
		convertEnergies(t, w.energy.name, w.energy.perUnit)
	}
	return writeTable(w.Writer, t)
}

// emitRows writes rows in the chosen format like emitRecords, as the array
// under the key "rows" of the object head: JSON is streamed row by row (the
// same bytes as writeJSON of the whole object, without holding the
// document in memory) and the table is built only when it is printed.
func emitRows[T any](e *env, head any, rows []T, t func() *table) error {
	var err error
	switch e.format {
	case "json":
		err = writeJSONRows(e.stdout, head, rows)
	case "csv":
		var h, r any
		if h, err = orderedJSON(head); err == nil {
			if r, err = orderedJSON(rows); err == nil {
				obj, _ := h.(jsonObject)
				err = writeCSVDoc(e.stdout, append(obj, jsonField{"rows", r}), "rows")
			}
		}
	default:
		err = e.writeTable(t())
	}
	if err != nil {
		return failErr(fmt.Errorf("writing output: %w", err))
	}
	return nil
}

// writeJSONRows writes the JSON object head with the key "rows" added
// after its keys, its value the array rows, one element at a time, exactly
// as writeJSON would write the whole object.
func writeJSONRows[T any](w io.Writer, head any, rows []T) error {
	var hb bytes.Buffer
	if err := writeJSON(&hb, head); err != nil {
		return err
	}
	h := bytes.TrimSuffix(bytes.TrimSpace(hb.Bytes()), []byte("}"))
	h = bytes.TrimRight(h, " \n")
	bw := bufio.NewWriter(w)
	bw.Write(h)
	if len(h) > 1 {
		bw.WriteString(",")
	}
	bw.WriteString("\n  \"rows\": ")
	if len(rows) == 0 {
		bw.WriteString("[]\n}\n")
		return bw.Flush()
	}
	bw.WriteString("[\n")
	var buf bytes.Buffer
	enc := json.NewEncoder(&buf)
	enc.SetEscapeHTML(false)
	enc.SetIndent("    ", "  ")
	for i, r := range rows {
		buf.Reset()
		if err := enc.Encode(r); err != nil {
			return err
		}
		bw.WriteString("    ")
		bw.Write(bytes.TrimSuffix(buf.Bytes(), []byte("\n")))
		if i < len(rows)-1 {
			bw.WriteString(",")
		}
		bw.WriteString("\n")
	}
	bw.WriteString("  ]\n}\n")
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

// CSV is derived from the JSON of the same output, so that its header is
// the JSON keys by construction:
//
//   - a record is an element of the JSON array, the JSON object itself, or
//     an element of the object's array under the records key (then
//     prefixed by the object's model block, modelBlockKeys; for an array
//     of such objects, each one's records);
//   - a nested object's keys are joined with a dot (barrier.r_angstrom),
//     an array of objects adds the index (windows.0.rmse_ev);
//   - an object of parameter values (paramKeys) is one cell
//     "NAME=VALUE NAME=VALUE", as its names differ from form to form;
//   - an array of numbers is one cell of space-separated values, an array
//     of strings one cell joined by "; ", an array of arrays one cell of
//     rows joined by "; ";
//   - null is an empty cell, numbers keep the JSON text (full precision),
//     and an unbounded value stays "Infinity".
//
// The header is the union of the records' keys in the order they first
// appear; a record without a key has an empty cell.

// modelBlockKeys are the keys of the object around nested records that
// each CSV row repeats: what the records are of.
var modelBlockKeys = map[string]bool{"name": true, "model": true, "origin": true, "params": true, "pair": true, "reduced_mass_u": true}

// paramKeys are the objects of parameter values, written as one CSV cell.
var paramKeys = map[string]bool{"params": true, "params_a": true, "params_b": true, "standard_errors": true}

// jsonField is one key of a JSON object.
type jsonField struct {
	key string
	val any
}

// jsonObject is a JSON object with its keys in document order; a decoded
// value is a jsonObject, []any, string, json.Number, bool or nil.
type jsonObject []jsonField

// orderedJSON returns v as its JSON encoding decodes, keeping the order of
// the keys.
func orderedJSON(v any) (any, error) {
	var buf bytes.Buffer
	enc := json.NewEncoder(&buf)
	enc.SetEscapeHTML(false)
	if err := enc.Encode(v); err != nil {
		return nil, err
	}
	dec := json.NewDecoder(&buf)
	dec.UseNumber()
	return decodeOrdered(dec)
}

func decodeOrdered(dec *json.Decoder) (any, error) {
	tok, err := dec.Token()
	if err != nil {
		return nil, err
	}
	d, ok := tok.(json.Delim)
	if !ok {
		return tok, nil
	}
	switch d {
	case '{':
		obj := jsonObject{}
		for dec.More() {
			k, err := dec.Token()
			if err != nil {
				return nil, err
			}
			v, err := decodeOrdered(dec)
			if err != nil {
				return nil, err
			}
			obj = append(obj, jsonField{k.(string), v})
		}
		_, err = dec.Token()
		return obj, err
	default: // '['
		arr := []any{}
		for dec.More() {
			v, err := decodeOrdered(dec)
			if err != nil {
				return nil, err
			}
			arr = append(arr, v)
		}
		_, err = dec.Token()
		return arr, err
	}
}

// writeCSVRecords writes v as CSV, records as described above.
func writeCSVRecords(w io.Writer, v any, records string) error {
	doc, err := orderedJSON(v)
	if err != nil {
		return err
	}
	return writeCSVDoc(w, doc, records)
}

// flatRecord is one CSV row: cells by key, keys in first-seen order.
type flatRecord struct {
	keys  []string
	cells map[string]string
}

func (f *flatRecord) set(k, v string) {
	if _, ok := f.cells[k]; !ok {
		f.keys = append(f.keys, k)
	}
	f.cells[k] = v
}

// csvRecordsOf returns the flattened records of doc: the elements of an
// array (each one's nested records when records is set and it has them),
// or the records of an object (see nestedRecords).
func csvRecordsOf(doc any, records string) []*flatRecord {
	switch d := doc.(type) {
	case []any:
		var out []*flatRecord
		for _, el := range d {
			if obj, ok := el.(jsonObject); ok {
				out = append(out, nestedRecords(obj, records)...)
				continue
			}
			r := newFlatRecord()
			flattenInto(r, "", el)
			out = append(out, r)
		}
		return out
	case jsonObject:
		return nestedRecords(d, records)
	}
	return nil
}

func newFlatRecord() *flatRecord { return &flatRecord{cells: map[string]string{}} }

// nestedRecords are the elements of the arrays of d at the comma-separated
// key paths records, each prefixed by d's model block; d itself is the
// one record when it has none of those arrays (an object without nested
// records, or the record of a form that failed).
func nestedRecords(d jsonObject, records string) []*flatRecord {
	var recs []any
	found := false
	for _, path := range strings.Split(records, ",") {
		if v, ok := lookup(d, path); ok {
			a, _ := v.([]any)
			recs = append(recs, a...)
			found = true
		}
	}
	if !found {
		r := newFlatRecord()
		flattenInto(r, "", d)
		return []*flatRecord{r}
	}
	out := make([]*flatRecord, 0, len(recs))
	for _, el := range recs {
		r := newFlatRecord()
		for _, f := range d {
			if modelBlockKeys[f.key] {
				flattenInto(r, f.key, f.val)
			}
		}
		flattenInto(r, "", el)
		out = append(out, r)
	}
	return out
}

// lookup returns the value at the dotted key path in obj.
func lookup(obj jsonObject, path string) (any, bool) {
	if path == "" {
		return nil, false
	}
	key, rest, nested := strings.Cut(path, ".")
	for _, f := range obj {
		if f.key != key {
			continue
		}
		if !nested {
			return f.val, true
		}
		o, ok := f.val.(jsonObject)
		if !ok {
			return nil, false
		}
		return lookup(o, rest)
	}
	return nil, false
}

// csvHeader is the union of the keys of recs in first-seen order, without
// a key that is null in some records and an object in others (barrier):
// its dotted keys stand for it.
func csvHeader(recs []*flatRecord) []string {
	var keys []string
	seen := map[string]bool{}
	for _, r := range recs {
		for _, k := range r.keys {
			if !seen[k] {
				seen[k] = true
				keys = append(keys, k)
			}
		}
	}
	out := keys[:0:0]
	for _, k := range keys {
		nested := false
		for _, o := range keys {
			if strings.HasPrefix(o, k+".") {
				nested = true
				break
			}
		}
		if !nested {
			out = append(out, k)
		}
	}
	return out
}

// writeCSVDoc writes the records of the decoded document doc.
func writeCSVDoc(w io.Writer, doc any, records string) error {
	recs := csvRecordsOf(doc, records)
	if len(recs) == 0 {
		return nil // no records, no keys: empty output
	}
	head := csvHeader(recs)
	bw := bufio.NewWriterSize(w, 64<<10)
	cw := csv.NewWriter(bw)
	if err := cw.Write(head); err != nil {
		return err
	}
	row := make([]string, len(head))
	for _, r := range recs {
		for i, k := range head {
			row[i] = r.cells[k]
		}
		if err := cw.Write(row); err != nil {
			return err
		}
	}
	cw.Flush()
	if err := cw.Error(); err != nil {
		return err
	}
	return bw.Flush()
}

// flattenInto adds the cells of v, at the key path key, to r.
func flattenInto(r *flatRecord, key string, v any) {
	join := func(k string) string {
		if key == "" {
			return k
		}
		return key + "." + k
	}
	switch x := v.(type) {
	case jsonObject:
		if paramKeys[lastKey(key)] {
			r.set(key, paramsCell(x))
			return
		}
		for _, f := range x {
			flattenInto(r, join(f.key), f.val)
		}
	case []any:
		objects := len(x) > 0
		for _, el := range x {
			if _, ok := el.(jsonObject); !ok {
				objects = false
			}
		}
		if objects {
			for i, el := range x {
				flattenInto(r, join(strconv.Itoa(i)), el)
			}
			return
		}
		r.set(key, arrayCell(x))
	default:
		r.set(key, scalarCell(x))
	}
}

// lastKey is the last dotted part of a key path.
func lastKey(key string) string {
	return key[strings.LastIndexByte(key, '.')+1:]
}

// scalarCell is the CSV cell of a JSON scalar: null is empty.
func scalarCell(v any) string {
	switch x := v.(type) {
	case nil:
		return ""
	case bool:
		return strconv.FormatBool(x)
	case json.Number:
		return x.String()
	case string:
		return x
	}
	return arrayCell([]any{v})
}

// arrayCell is the CSV cell of an array of scalars or arrays.
func arrayCell(x []any) string {
	sep := " "
	parts := make([]string, len(x))
	for i, el := range x {
		switch y := el.(type) {
		case []any:
			parts[i], sep = arrayCell(y), "; "
		case string:
			parts[i], sep = y, "; "
		case jsonObject:
			parts[i], sep = paramsCell(y), "; "
		default:
			parts[i] = scalarCell(el)
		}
	}
	return strings.Join(parts, sep)
}

// paramsCell is the CSV cell of an object of scalars: "NAME=VALUE
// NAME=VALUE" in the object's order.
func paramsCell(x jsonObject) string {
	parts := make([]string, len(x))
	for i, f := range x {
		parts[i] = f.key + "=" + scalarCell(f.val)
	}
	return strings.Join(parts, " ")
}
