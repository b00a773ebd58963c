// Package formsfile reads forms files: TOML documents declaring forms typed
// as formulas (package core/formula compiles them). A model-set file may
// carry the same [[form]] tables.
//
// The format:
//
//	[[form]]
//	key = "varshni"                      # used in specs; letters, digits, -
//	name = "Varshni"                     # optional, the usual name
//	formula = "De*(1 - (re/r)*exp(-beta*(r^2 - re^2)))^2 - De"
//	reference = "Y. P. Varshni, Rev. Mod. Phys. 29, 664 (1957)"   # optional
//	notes = "energy zero at dissociation"                          # optional
//	r_min = "0"        # optional: lower end of the domain (formula of the parameters, Å)
//	limit = "0"        # optional: V(∞) (formula of the parameters, eV), or "none"
//	tail = 1           # optional: the power p of a slow tail V − V(∞) ∝ r^−p (Coulomb-like: 1)
//	[[form.param]]
//	name = "De"
//	unit = "eV"          # default unit and so dimension: eV*A^8, 1/A^2, kcal/mol*A^6, 1, …
//	constraint = "> 0"   # "> 0", ">= 0" or "finite" (the default)
//	meaning = "well depth"
//
// Unknown keys are errors. The origin of each form, FILE:LINE of its
// [[form]] header, is recorded for `pairwell models`.
package formsfile

import (
	"errors"
	"fmt"
	"os"
	"strings"

	"github.com/BurntSushi/toml"

	"github.com/pairwell/pairwell/core/formula"
)

// ErrFormat means a forms file is malformed.
var ErrFormat = errors.New("invalid forms file")

// MaxSize is the largest forms file, in bytes.
const MaxSize = 1 << 20

// Form is one [[form]] table as written.
type Form struct {
	Key       string  `toml:"key"`
	Name      string  `toml:"name"`
	Formula   string  `toml:"formula"`
	Reference string  `toml:"reference"`
	Notes     string  `toml:"notes"`
	RMin      any     `toml:"r_min"`
	Limit     any     `toml:"limit"`
	Tail      float64 `toml:"tail"`
	Param     []Param `toml:"param"`
}

// Param is one [[form.param]] table as written.
type Param struct {
	Name       string `toml:"name"`
	Unit       string `toml:"unit"`
	Constraint string `toml:"constraint"`
	Meaning    string `toml:"meaning"`
}

// Keys lists the keys of a [[form]] table, for messages.
const Keys = "form.key, form.name, form.formula, form.reference, form.notes, form.r_min, form.limit, form.tail, form.param.name, form.param.unit, form.param.constraint, form.param.meaning"

type file struct {
	Form []Form `toml:"form"`
}

// Load reads the forms file at path.
func Load(path string) ([]formula.Decl, error) {
	data, err := os.ReadFile(path)
	if err != nil {
		return nil, fmt.Errorf("forms file: %w", err)
	}
	return Parse(data, path)
}

// Parse parses a forms document; source names it in errors and origins.
func Parse(data []byte, source string) ([]formula.Decl, error) {
	if len(data) > MaxSize {
		return nil, fmt.Errorf("%w %s: %d bytes, the limit is %d", ErrFormat, source, len(data), MaxSize)
	}
	var f file
	md, err := toml.Decode(string(data), &f)
	if err != nil {
		return nil, fmt.Errorf("%w %s: %s", ErrFormat, source, oneLine(err.Error()))
	}
	if und := md.Undecoded(); len(und) > 0 {
		keys := make([]string, len(und))
		for i, k := range und {
			keys[i] = k.String()
		}
		return nil, fmt.Errorf("%w %s: unknown key %s (allowed: %s)", ErrFormat, source, strings.Join(keys, ", "), Keys)
	}
	if len(f.Form) == 0 {
		return nil, fmt.Errorf("%w %s: no [[form]] tables", ErrFormat, source)
	}
	return Decls(f.Form, data, source)
}

// Decls converts [[form]] tables decoded from data (a forms file or a
// model-set file) into declarations, with origins FILE:LINE.
func Decls(forms []Form, data []byte, source string) ([]formula.Decl, error) {
	lines := headerLines(data)
	out := make([]formula.Decl, len(forms))
	seen := map[string]string{}
	for i, f := range forms {
		origin := fmt.Sprintf("%s: form %d", source, i+1)
		if i < len(lines) {
			origin = fmt.Sprintf("%s:%d", source, lines[i])
		}
		where := origin
		if f.Key != "" {
			where = fmt.Sprintf("%s (form %q)", origin, f.Key)
		}
		if f.Key == "" {
			return nil, fmt.Errorf("%w %s: form without key", ErrFormat, where)
		}
		k := strings.ToLower(f.Key)
		if prev, ok := seen[k]; ok {
			return nil, fmt.Errorf("%w %s: key %q already declared at %s", ErrFormat, where, f.Key, prev)
		}
		seen[k] = origin
		if strings.TrimSpace(f.Formula) == "" {
			return nil, fmt.Errorf("%w %s: no formula", ErrFormat, where)
		}
		rmin, err := text(f.RMin)
		if err != nil {
			return nil, fmt.Errorf("%w %s: r_min: %v", ErrFormat, where, err)
		}
		limit, err := text(f.Limit)
		if err != nil {
			return nil, fmt.Errorf("%w %s: limit: %v", ErrFormat, where, err)
		}
		d := formula.Decl{Key: f.Key, Name: f.Name, Formula: f.Formula, Reference: f.Reference,
			Notes: f.Notes, RMin: rmin, Limit: limit, Tail: f.Tail, Origin: origin}
		for j, p := range f.Param {
			if p.Name == "" {
				return nil, fmt.Errorf("%w %s: parameter %d has no name", ErrFormat, where, j+1)
			}
			d.Params = append(d.Params, formula.ParamDecl{Name: p.Name, Unit: p.Unit, Constraint: p.Constraint, Meaning: p.Meaning})
		}
		out[i] = d
	}
	return out, nil
}

// text turns an optional TOML number or string into formula text.
func text(v any) (string, error) {
	switch x := v.(type) {
	case nil:
		return "", nil
	case string:
		if strings.TrimSpace(x) == "" {
			return "", errors.New("empty; leave the key out for the default")
		}
		return x, nil
	case int64:
		return fmt.Sprint(x), nil
	case float64:
		return fmt.Sprint(x), nil
	}
	return "", fmt.Errorf("%v: want a number or a formula in a string", v)
}

// headerLines returns the 1-based line numbers of the [[form]] headers in
// data, in order.
func headerLines(data []byte) []int {
	var out []int
	for i, line := range strings.Split(string(data), "\n") {
		l := line
		if j := strings.IndexByte(l, '#'); j >= 0 {
			l = l[:j]
		}
		l = strings.Join(strings.Fields(l), "")
		if l == "[[form]]" {
			out = append(out, i+1)
		}
	}
	return out
}

func oneLine(s string) string { return strings.Join(strings.Fields(s), " ") }

// Build compiles declarations into forms (formula.NewForm) and returns
// them with their warnings. Errors name the origin.
func Build(decls []formula.Decl) ([]*formula.Form, []string, error) {
	var forms []*formula.Form
	var warnings []string
	for _, d := range decls {
		f, err := formula.NewForm(d)
		if err != nil {
			return nil, nil, fmt.Errorf("%s: %w", d.Origin, err)
		}
		forms = append(forms, f)
		for _, w := range f.Warnings() {
			warnings = append(warnings, d.Origin+": "+w)
		}
	}
	return forms, warnings, nil
}
