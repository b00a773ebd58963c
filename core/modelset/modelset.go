// Package modelset reads model-set files: TOML documents naming several
// parametrised forms, each optionally with an atom pair, for comparisons,
// conformance checks and regression baselines.
//
// The format, version 1:
//
//	# Optional title, shown in reports.
//	title = "HCl candidates (invented example)"
//
//	# Optional defaults for every entry.
//	[defaults]
//	pair = "1H-35Cl"     # or: mu = "0.9796 u"
//
//	[[entry]]
//	name  = "morse-fit"  # unique; letters, digits, - _ . only
//	model = "morse"      # key or alias, built-in or plugin
//	[entry.params]       # NAME = VALUE: a number in the default unit,
//	De = "4.6 eV"        # or a string with a unit suffix
//	a  = 1.87
//	re = "127 pm"
//
//	[[entry]]
//	name = "lj-guess"
//	spec = "lj:epsilon=0.5,sigma=1.1"   # a spec string instead of model+params
//	mu   = 0.98                          # overrides the default mass
//
// A model-set file may also declare forms typed as formulas, in [[form]]
// tables of the forms-file format (package core/formsfile); its entries
// may use them.
//
// Unknown keys are errors, so that a typo cannot silently drop a value.
package modelset

import (
	"errors"
	"fmt"
	"regexp"
	"sort"
	"strconv"
	"strings"
	"unicode/utf8"

	"github.com/BurntSushi/toml"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/atoms"
	"github.com/pairwell/pairwell/core/fileio"
	"github.com/pairwell/pairwell/core/formsfile"
	"github.com/pairwell/pairwell/core/formula"
	"github.com/pairwell/pairwell/core/units"
)

// ErrFormat means a model-set file is malformed.
var ErrFormat = errors.New("invalid model set")

// Set is a parsed model-set file.
type Set struct {
	Title   string
	Entries []Entry
	// Forms are the forms the file declares ([[form]] tables), to be
	// registered before the entries are built.
	Forms []formula.Decl
}

// Entry is one named, parametrised form.
type Entry struct {
	Name string
	Spec core.Spec
	// Pair and Mu give the reduced mass as written (at most one is
	// non-empty after defaults are applied).
	Pair, Mu string
}

// Built is an entry whose potential has been built.
type Built struct {
	Name     string
	Instance core.Instance
	Pair     string  // normalised pair, e.g. "1H-35Cl"; empty when none
	Mu       float64 // reduced mass in u; 0 when the entry has none
}

type fileEntry struct {
	Name   string         `toml:"name"`
	Model  string         `toml:"model"`
	Spec   string         `toml:"spec"`
	Params map[string]any `toml:"params"`
	Pair   string         `toml:"pair"`
	Mu     any            `toml:"mu"`
}

type file struct {
	Title    string `toml:"title"`
	Defaults struct {
		Pair string `toml:"pair"`
		Mu   any    `toml:"mu"`
	} `toml:"defaults"`
	Entry []fileEntry      `toml:"entry"`
	Form  []formsfile.Form `toml:"form"`
}

var validName = regexp.MustCompile(`^[A-Za-z0-9][A-Za-z0-9._-]*$`)

// Limits of a model-set document, checked before it is decoded: a model
// set is a short hand-written file, and without them a small hostile one
// (tens of KB of nested inline tables) keeps the TOML decoder busy for
// minutes and gigabytes.
const (
	// MaxSize is the largest model-set file, in bytes.
	MaxSize = 1 << 20
	// MaxDepth is the deepest nesting of tables and arrays ("[", "{");
	// a model set needs 3 (entry, params, an inline table).
	MaxDepth = 8
	// maxMessage is the longest decoder message quoted in an error.
	maxMessage = 300
)

// Load reads and parses the model-set file at path.
func Load(path string) (*Set, error) {
	data, err := fileio.ReadFile(path, MaxSize)
	if err != nil {
		return nil, fmt.Errorf("model set: %w", err)
	}
	return Parse(data, path)
}

// Parse parses a model-set document; source names it in errors. A document
// larger than MaxSize or nested deeper than MaxDepth is refused before
// decoding.
func Parse(data []byte, source string) (*Set, error) {
	if len(data) > MaxSize {
		return nil, fmt.Errorf("%w %s: %d bytes, the limit is %d", ErrFormat, source, len(data), MaxSize)
	}
	if line, ok := checkDepth(data, MaxDepth); !ok {
		return nil, fmt.Errorf("%w %s: line %d: tables and arrays nested deeper than %d", ErrFormat, source, line, MaxDepth)
	}
	var f file
	md, err := toml.Decode(string(data), &f)
	if err != nil {
		return nil, fmt.Errorf("%w %s: %s", ErrFormat, source, truncate(oneLine(err.Error()), maxMessage))
	}
	if und := md.Undecoded(); len(und) > 0 {
		var keys []string
		for _, k := range und {
			if len(k) >= 3 && k[0] == "entry" && k[1] == "params" {
				continue // parameter names are checked against the model later
			}
			keys = append(keys, k.String())
		}
		if len(keys) > 0 {
			return nil, fmt.Errorf("%w %s: unknown key %s (allowed: title, defaults.pair, defaults.mu, entry.name, entry.model, entry.params, entry.spec, entry.pair, entry.mu, %s)", ErrFormat, source, strings.Join(keys, ", "), formsfile.Keys)
		}
	}
	if len(f.Entry) == 0 {
		return nil, fmt.Errorf("%w %s: no [[entry]] tables", ErrFormat, source)
	}
	defMu, err := massText(f.Defaults.Mu)
	if err != nil {
		return nil, fmt.Errorf("%w %s: defaults.mu: %v", ErrFormat, source, err)
	}
	if f.Defaults.Pair != "" && defMu != "" {
		return nil, fmt.Errorf("%w %s: defaults: give pair or mu, not both", ErrFormat, source)
	}
	s := &Set{Title: f.Title}
	if len(f.Form) > 0 {
		if s.Forms, err = formsfile.Decls(f.Form, data, source); err != nil {
			return nil, fmt.Errorf("%w %s", ErrFormat, strings.TrimPrefix(err.Error(), formsfile.ErrFormat.Error()+" "))
		}
	}
	seen := map[string]bool{}
	for i, fe := range f.Entry {
		where := fmt.Sprintf("%s: entry %d", source, i+1)
		if fe.Name != "" {
			where = fmt.Sprintf("%s: entry %q", source, fe.Name)
		}
		if !validName.MatchString(fe.Name) {
			return nil, fmt.Errorf("%w %s: name %q must be non-empty letters, digits, '.', '_' or '-'", ErrFormat, where, fe.Name)
		}
		if seen[fe.Name] {
			return nil, fmt.Errorf("%w %s: name used twice", ErrFormat, where)
		}
		seen[fe.Name] = true
		e := Entry{Name: fe.Name}
		switch {
		case fe.Spec != "" && (fe.Model != "" || fe.Params != nil):
			return nil, fmt.Errorf("%w %s: give spec, or model with params, not both", ErrFormat, where)
		case fe.Spec != "":
			if e.Spec, err = core.ParseSpec(fe.Spec); err != nil {
				return nil, fmt.Errorf("%w %s: %v", ErrFormat, where, err)
			}
		case fe.Model != "":
			e.Spec = core.Spec{Model: fe.Model}
			names := make([]string, 0, len(fe.Params))
			for n := range fe.Params {
				names = append(names, n)
			}
			sort.Strings(names)
			for _, n := range names {
				v, err := valueText(fe.Params[n])
				if err != nil {
					return nil, fmt.Errorf("%w %s: params.%s: %v", ErrFormat, where, n, err)
				}
				e.Spec.Params = append(e.Spec.Params, core.Assignment{Name: n, Value: v})
			}
		default:
			return nil, fmt.Errorf("%w %s: needs model (with params) or spec", ErrFormat, where)
		}
		mu, err := massText(fe.Mu)
		if err != nil {
			return nil, fmt.Errorf("%w %s: mu: %v", ErrFormat, where, err)
		}
		if fe.Pair != "" && mu != "" {
			return nil, fmt.Errorf("%w %s: give pair or mu, not both", ErrFormat, where)
		}
		e.Pair, e.Mu = fe.Pair, mu
		if e.Pair == "" && e.Mu == "" {
			e.Pair, e.Mu = f.Defaults.Pair, defMu
		}
		s.Entries = append(s.Entries, e)
	}
	return s, nil
}

// Build builds every entry's potential with the models of reg and resolves
// its reduced mass. Errors name the entry.
func (s *Set) Build(reg *core.Registry) ([]Built, error) {
	out := make([]Built, 0, len(s.Entries))
	for _, e := range s.Entries {
		inst, err := reg.BuildParsed(e.Spec)
		if err != nil {
			return nil, fmt.Errorf("entry %q: %w", e.Name, err)
		}
		b := Built{Name: e.Name, Instance: inst}
		switch {
		case e.Pair != "":
			p, err := atoms.ParsePair(e.Pair)
			if err != nil {
				return nil, fmt.Errorf("entry %q: pair: %w", e.Name, err)
			}
			b.Pair, b.Mu = p.String(), p.Mu
		case e.Mu != "":
			mu, err := units.Parse(e.Mu, units.Mass)
			if err != nil {
				return nil, fmt.Errorf("entry %q: mu: %w", e.Name, err)
			}
			if err := atoms.CheckReducedMass(mu); err != nil {
				return nil, fmt.Errorf("entry %q: mu: %w: %w", e.Name, core.ErrParam, err)
			}
			b.Mu = mu
		}
		out = append(out, b)
	}
	return out, nil
}

// valueText turns a TOML parameter value into spec text.
func valueText(v any) (string, error) {
	switch x := v.(type) {
	case int64:
		return strconv.FormatInt(x, 10), nil
	case float64:
		return strconv.FormatFloat(x, 'g', -1, 64), nil
	case string:
		if strings.ContainsAny(x, ",=") {
			return "", fmt.Errorf("%q: a value may not contain ',' or '='", x)
		}
		return x, nil
	}
	return "", fmt.Errorf("%v: want a number or a string such as \"4.6 eV\"", v)
}

// massText turns an optional TOML mass into text for units.Parse.
func massText(v any) (string, error) {
	if v == nil {
		return "", nil
	}
	return valueText(v)
}

func oneLine(s string) string { return strings.Join(strings.Fields(s), " ") }

// truncate cuts s to at most n runes, marking the cut with "…".
func truncate(s string, n int) string {
	if utf8.RuneCountInString(s) <= n {
		return s
	}
	r := []rune(s)
	return string(r[:n]) + "…"
}

// checkDepth scans a TOML document for the nesting of "[" and "{" outside
// strings and comments, and reports the line where it first exceeds max.
// It is a bound, not a parser: brackets of malformed documents are
// counted the same way, and the decoder reports what is malformed.
func checkDepth(data []byte, max int) (line int, ok bool) {
	depth := 0
	line = 1
	for i := 0; i < len(data); i++ {
		switch c := data[i]; c {
		case '\n':
			line++
		case '#':
			for i < len(data) && data[i] != '\n' {
				i++
			}
			i-- // the newline is counted by the loop
		case '"', '\'':
			// A string: basic ("…", escapes) or literal ('…'), single or
			// triple quoted (multi-line).
			q := string([]byte{c, c, c})
			multi := i+3 <= len(data) && string(data[i:i+3]) == q
			if multi {
				i += 3
			} else {
				i++
			}
			for ; i < len(data); i++ {
				d := data[i]
				if d == '\n' {
					line++
					if !multi {
						break // unterminated: let the decoder say so
					}
				}
				if d == '\\' && c == '"' {
					i++
					continue
				}
				if d == c && (!multi || (i+3 <= len(data) && string(data[i:i+3]) == q)) {
					if multi {
						i += 2
					}
					break
				}
			}
		case '[', '{':
			depth++
			if depth > max {
				return line, false
			}
		case ']', '}':
			if depth > 0 {
				depth--
			}
		}
	}
	return line, true
}
