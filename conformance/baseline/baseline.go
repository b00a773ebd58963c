// Package baseline records the physics of a model set — per entry the well
// (re, depth, force constant, c₃, c₄), the harmonic wavenumber and the
// validity limits of the harmonic truncation — and verifies later that a
// change to a form or to pairwell did not move it.
//
// A baseline is a JSON document:
//
//	{
//	  "format": "pairwell-baseline",
//	  "version": 1,
//	  "tool": "pairwell v1.2.0",
//	  "title": "…",                       // the model set's title
//	  "validity_tolerance": 0.01,         // τ of the validity criteria
//	  "entries": [{
//	    "name": "hcl-morse",
//	    "spec": "morse:De=4.6 eV,a=1.87,re=127 pm",   // as written in the set
//	    "model": "morse", "origin": "built-in",
//	    "pair": "1H-35Cl", "mu": 0.9796,              // when the entry has a mass
//	    "params":     [{"name": "De", "unit": "eV", "value": 4.6}, …],
//	    "quantities": [{"name": "re", "unit": "Å", "value": 1.27}, …]
//	  }]
//	}
//
// Numbers are written in the shortest form that reads back to the same
// float64; +Inf, -Inf and NaN are the strings "+Inf", "-Inf", "NaN" (the
// depth of a harmonic well, an unbounded validity range). The quantities,
// in eV, Å, cm⁻¹:
//
//	re, V(re), depth (Domain.Limit − V(re)), k = V″(re), c3 = V‴(re)/3!,
//	c4 = V⁗(re)/4!, wavenumber (harmonic ω/2πc, with a mass only),
//	validity.compression and validity.stretch (potential criterion of the
//	harmonic truncation, Å), validity.period_energy (period criterion, eV)
//
// (validity limits at the default tolerance τ = 1% unless recorded
// otherwise; see package core/validity).
package baseline

import (
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"math"
	"strconv"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/fileio"
	"github.com/pairwell/pairwell/core/modelset"
	"github.com/pairwell/pairwell/core/validity"
)

// Format and Version identify baseline documents. Version changes when the
// meaning or the set of quantities changes.
const (
	Format  = "pairwell-baseline"
	Version = 1
)

// ErrFormat means a document is not a baseline this package can read:
// not JSON, a foreign document, another version, or inconsistent content.
var ErrFormat = errors.New("not a valid pairwell baseline")

// Value is a float64 that encodes ±Inf and NaN as the JSON strings "+Inf",
// "-Inf" and "NaN", and finite values in the shortest exact form.
type Value float64

// MarshalJSON implements json.Marshaler.
func (v Value) MarshalJSON() ([]byte, error) {
	f := float64(v)
	switch {
	case math.IsNaN(f):
		return []byte(`"NaN"`), nil
	case math.IsInf(f, 1):
		return []byte(`"+Inf"`), nil
	case math.IsInf(f, -1):
		return []byte(`"-Inf"`), nil
	}
	return strconv.AppendFloat(nil, f, 'g', -1, 64), nil
}

// UnmarshalJSON implements json.Unmarshaler.
func (v *Value) UnmarshalJSON(b []byte) error {
	switch string(b) {
	case `"NaN"`:
		*v = Value(math.NaN())
		return nil
	case `"+Inf"`:
		*v = Value(math.Inf(1))
		return nil
	case `"-Inf"`:
		*v = Value(math.Inf(-1))
		return nil
	}
	var f float64
	if err := json.Unmarshal(b, &f); err != nil {
		return fmt.Errorf("value %s: want a number, \"+Inf\", \"-Inf\" or \"NaN\"", b)
	}
	*v = Value(f)
	return nil
}

// Quantity is a named value with its unit.
type Quantity struct {
	Name  string `json:"name"`
	Unit  string `json:"unit"`
	Value Value  `json:"value"`
}

// Entry is the record of one model-set entry.
type Entry struct {
	Name       string     `json:"name"`
	Spec       string     `json:"spec"`
	Model      string     `json:"model"`
	Origin     string     `json:"origin"`
	Pair       string     `json:"pair,omitempty"`
	Mu         Value      `json:"mu,omitempty"`
	Params     []Quantity `json:"params"`
	Quantities []Quantity `json:"quantities"`
}

// Baseline is a recorded model set.
type Baseline struct {
	Format            string  `json:"format"`
	Version           int     `json:"version"`
	Tool              string  `json:"tool"`
	Title             string  `json:"title,omitempty"`
	ValidityTolerance float64 `json:"validity_tolerance"`
	Entries           []Entry `json:"entries"`
}

// Settings controls Record. The zero value records with the defaults.
type Settings struct {
	// Tool names the program and version that records, e.g.
	// "pairwell v1.2.0"; empty is recorded as "unknown".
	Tool string
	// Validity controls the validity criteria; its zero value gives the
	// default tolerance 1% (validity.DefaultTolerance).
	Validity validity.Settings
}

// Record builds every entry of set with the models of reg and records its
// quantities. Errors name the entry; they wrap core.ErrSpec, ErrParam or
// ErrNoMinimum when the set is at fault.
func Record(set *modelset.Set, reg *core.Registry, s Settings) (*Baseline, error) {
	built, err := set.Build(reg)
	if err != nil {
		return nil, err
	}
	tol := s.Validity.Tolerance
	if tol == 0 {
		tol = validity.DefaultTolerance
	}
	s.Validity.Tolerance = tol
	b := &Baseline{Format: Format, Version: Version, Tool: s.Tool, Title: set.Title, ValidityTolerance: tol}
	if b.Tool == "" {
		b.Tool = "unknown"
	}
	for i, bt := range built {
		e, err := record(set.Entries[i], bt, s.Validity)
		if err != nil {
			return nil, fmt.Errorf("entry %q: %w", bt.Name, err)
		}
		b.Entries = append(b.Entries, e)
	}
	return b, nil
}

func record(se modelset.Entry, bt modelset.Built, vs validity.Settings) (Entry, error) {
	inst := bt.Instance
	info := inst.Model.Info()
	e := Entry{Name: bt.Name, Spec: se.Spec.String(), Model: info.Key, Origin: info.Origin, Pair: bt.Pair, Mu: Value(bt.Mu)}
	for i, p := range info.Params {
		e.Params = append(e.Params, Quantity{Name: p.Name, Unit: p.Dimension.DefaultUnit(), Value: Value(inst.Params[i])})
	}
	w, err := core.AnalyzeWell(inst.Potential, core.WellSettings{Order: 4})
	if err != nil {
		return Entry{}, fmt.Errorf("well: %w", err)
	}
	add := func(name, unit string, v float64) {
		e.Quantities = append(e.Quantities, Quantity{Name: name, Unit: unit, Value: Value(v)})
	}
	add("re", "Å", w.Re)
	add("V(re)", "eV", w.Energy)
	add("depth", "eV", w.Depth)
	add("k", "eV/Å²", w.K)
	add("c3", "eV/Å³", w.Taylor[3])
	add("c4", "eV/Å⁴", w.Taylor[4])
	if bt.Mu > 0 {
		h, err := core.NewHarmonic(w.K, bt.Mu)
		if err != nil {
			return Entry{}, err
		}
		add("wavenumber", "cm⁻¹", h.Wavenumber)
	}
	v, err := validity.Analyze(inst.Potential, w, 2, vs)
	if err != nil {
		return Entry{}, fmt.Errorf("validity limits: %w", err)
	}
	add("validity.compression", "Å", v.Potential.Compression)
	add("validity.stretch", "Å", v.Potential.Stretch)
	add("validity.period_energy", "eV", v.Period.Energy)
	return e, nil
}

// Write writes b to w as indented JSON.
func (b *Baseline) Write(w io.Writer) error {
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	enc.SetEscapeHTML(false)
	return enc.Encode(b)
}

// WriteFile writes b to path under pairwell's output-file policy
// (core/fileio): atomically, through a temporary file in the same
// directory, synced and renamed over path, so that path never holds a
// half-written baseline; a symbolic link, device, FIFO or directory is
// refused, and a replaced file keeps its mode.
func (b *Baseline) WriteFile(path string) error {
	return fileio.WriteFile(path, b.Write)
}

// Read parses a baseline; source names it in errors. Anything but a
// well-formed baseline of this Format and Version is an error wrapping
// ErrFormat.
func Read(data []byte, source string) (*Baseline, error) {
	var head map[string]json.RawMessage
	if err := json.Unmarshal(data, &head); err != nil {
		return nil, fmt.Errorf("%s: %w: not a JSON object (%v)", source, ErrFormat, err)
	}
	var format string
	var version float64
	_ = json.Unmarshal(head["format"], &format)
	_ = json.Unmarshal(head["version"], &version)
	if format != Format {
		return nil, fmt.Errorf("%s: %w: format %q, want %q (is this a baseline written by pairwell baseline record?)", source, ErrFormat, format, Format)
	}
	if version != Version {
		return nil, fmt.Errorf("%s: %w: version %s, this pairwell reads version %d: record the baseline again", source, ErrFormat, head["version"], Version)
	}
	var b Baseline
	dec := json.NewDecoder(bytes.NewReader(data))
	dec.DisallowUnknownFields()
	if err := dec.Decode(&b); err != nil {
		return nil, fmt.Errorf("%s: %w: %v", source, ErrFormat, err)
	}
	if dec.More() {
		return nil, fmt.Errorf("%s: %w: data after the document", source, ErrFormat)
	}
	seen := map[string]bool{}
	for i, e := range b.Entries {
		switch {
		case e.Name == "":
			return nil, fmt.Errorf("%s: %w: entry %d has no name", source, ErrFormat, i+1)
		case seen[e.Name]:
			return nil, fmt.Errorf("%s: %w: entry %q twice", source, ErrFormat, e.Name)
		}
		seen[e.Name] = true
		for _, list := range [][]Quantity{e.Params, e.Quantities} {
			names := map[string]bool{}
			for _, q := range list {
				if q.Name == "" || names[q.Name] {
					return nil, fmt.Errorf("%s: %w: entry %q: name %q empty or twice", source, ErrFormat, e.Name, q.Name)
				}
				names[q.Name] = true
			}
		}
	}
	if !(b.ValidityTolerance > 0 && b.ValidityTolerance < 1) {
		return nil, fmt.Errorf("%s: %w: validity_tolerance %g, must be in (0, 1)", source, ErrFormat, b.ValidityTolerance)
	}
	return &b, nil
}

// MaxSize is the largest baseline file ReadFile reads, in bytes (a
// baseline of a thousand entries is about 2 MB).
const MaxSize = 64 << 20

// ReadFile reads the baseline at path; see Read.
func ReadFile(path string) (*Baseline, error) {
	data, err := fileio.ReadFile(path, MaxSize)
	if err != nil {
		return nil, fmt.Errorf("baseline: %w", err)
	}
	return Read(data, path)
}

// Kinds of Change.
const (
	Moved   = "moved"   // a quantity changed beyond the tolerance
	Removed = "removed" // an entry or quantity of the baseline is gone
	Added   = "added"   // an entry or quantity is not in the baseline
	Model   = "model"   // an entry now uses another model
)

// Change is a difference between a baseline and the current state.
type Change struct {
	Kind     string  // Moved, Removed, Added or Model
	Entry    string  // entry name
	Quantity string  // quantity or "param NAME"; empty for a whole entry
	Unit     string  // unit of the quantity
	Old, New float64 // values (NaN when absent)
	Rel      float64 // relative change, see Compare; NaN when absent
	Text     string  // for Model: "old → new"; for entries: their spec
}

// Diff is the outcome of Compare.
type Diff struct {
	RTol     float64  // the tolerance used
	Entries  int      // entries compared (in both)
	Compared int      // quantities compared
	Changes  []Change // every difference, in baseline order
}

// RelativeChange returns |new − old|/max(|old|, |new|): 0 when both are
// equal (including equal infinities and both NaN), +Inf when only one is
// finite or NaN, and at most 2 otherwise. It is symmetric, and a value
// that moves from 0 counts as a full change (1).
func RelativeChange(old, new float64) float64 {
	switch {
	case old == new, math.IsNaN(old) && math.IsNaN(new):
		return 0
	case math.IsNaN(old) || math.IsNaN(new) || math.IsInf(old, 0) || math.IsInf(new, 0):
		return math.Inf(1)
	}
	return math.Abs(new-old) / math.Max(math.Abs(old), math.Abs(new))
}

// Compare compares the current record cur with the baseline old: every
// parameter and quantity of every entry in both whose RelativeChange
// exceeds rtol is Moved; entries and quantities in only one are Removed or
// Added; an entry whose model key changed is a Model change (its
// quantities are still compared).
func Compare(old, cur *Baseline, rtol float64) Diff {
	d := Diff{RTol: rtol}
	curByName := map[string]Entry{}
	for _, e := range cur.Entries {
		curByName[e.Name] = e
	}
	oldNames := map[string]bool{}
	for _, oe := range old.Entries {
		oldNames[oe.Name] = true
		ce, ok := curByName[oe.Name]
		if !ok {
			d.Changes = append(d.Changes, Change{Kind: Removed, Entry: oe.Name, Old: math.NaN(), New: math.NaN(), Rel: math.NaN(), Text: oe.Spec})
			continue
		}
		d.Entries++
		if oe.Model != ce.Model {
			d.Changes = append(d.Changes, Change{Kind: Model, Entry: oe.Name, Old: math.NaN(), New: math.NaN(), Rel: math.NaN(),
				Text: oe.Model + " → " + ce.Model})
		}
		d.compareQuantities(oe.Name, prefixed(oe.Params), prefixed(ce.Params), rtol)
		d.compareQuantities(oe.Name, oe.Quantities, ce.Quantities, rtol)
	}
	for _, ce := range cur.Entries {
		if !oldNames[ce.Name] {
			d.Changes = append(d.Changes, Change{Kind: Added, Entry: ce.Name, Old: math.NaN(), New: math.NaN(), Rel: math.NaN(), Text: ce.Spec})
		}
	}
	return d
}

// prefixed names parameters "param NAME".
func prefixed(ps []Quantity) []Quantity {
	out := make([]Quantity, len(ps))
	for i, p := range ps {
		out[i] = p
		out[i].Name = "param " + p.Name
	}
	return out
}

func (d *Diff) compareQuantities(entry string, old, cur []Quantity, rtol float64) {
	byName := map[string]Quantity{}
	for _, q := range cur {
		byName[q.Name] = q
	}
	seen := map[string]bool{}
	for _, oq := range old {
		seen[oq.Name] = true
		cq, ok := byName[oq.Name]
		if !ok {
			d.Changes = append(d.Changes, Change{Kind: Removed, Entry: entry, Quantity: oq.Name, Unit: oq.Unit,
				Old: float64(oq.Value), New: math.NaN(), Rel: math.NaN()})
			continue
		}
		d.Compared++
		rel := RelativeChange(float64(oq.Value), float64(cq.Value))
		if rel > rtol || oq.Unit != cq.Unit {
			d.Changes = append(d.Changes, Change{Kind: Moved, Entry: entry, Quantity: oq.Name, Unit: cq.Unit,
				Old: float64(oq.Value), New: float64(cq.Value), Rel: rel})
		}
	}
	for _, cq := range cur {
		if !seen[cq.Name] {
			d.Changes = append(d.Changes, Change{Kind: Added, Entry: entry, Quantity: cq.Name, Unit: cq.Unit,
				Old: math.NaN(), New: float64(cq.Value), Rel: math.NaN()})
		}
	}
}

// Verify records set again with the baseline's validity tolerance and
// compares the result with old; see Compare.
func Verify(old *Baseline, set *modelset.Set, reg *core.Registry, rtol float64, s Settings) (Diff, error) {
	if !(rtol >= 0) || math.IsInf(rtol, 1) {
		return Diff{}, fmt.Errorf("baseline: %w: rtol %g, must be ≥ 0", core.ErrParam, rtol)
	}
	s.Validity.Tolerance = old.ValidityTolerance
	cur, err := Record(set, reg, s)
	if err != nil {
		return Diff{}, err
	}
	return Compare(old, cur, rtol), nil
}
