package modelset

import (
	"bytes"
	"fmt"
	"strings"

	"github.com/BurntSushi/toml"
)

type outEntry struct {
	Name   string            `toml:"name"`
	Model  string            `toml:"model"`
	Params map[string]string `toml:"params"`
	Pair   string            `toml:"pair,omitempty"`
	Mu     string            `toml:"mu,omitempty"`
}

type outFile struct {
	Title string     `toml:"title,omitempty"`
	Entry []outEntry `toml:"entry"`
}

// Marshal formats s as a model-set document (version 1) that Parse reads
// back to the same entries: each entry as name, model, its params as
// strings (the spec text, units included) and its pair or mu. comment, when
// not empty, is written first as '#' lines, one per line of comment.
// Entry names must be valid and unique, as Parse requires.
func Marshal(s *Set, comment string) ([]byte, error) {
	if len(s.Entries) == 0 {
		return nil, fmt.Errorf("%w: no entries to write", ErrFormat)
	}
	f := outFile{Title: s.Title}
	seen := map[string]bool{}
	for _, e := range s.Entries {
		if !validName.MatchString(e.Name) || seen[e.Name] {
			return nil, fmt.Errorf("%w: entry name %q must be unique letters, digits, '.', '_' or '-'", ErrFormat, e.Name)
		}
		seen[e.Name] = true
		if e.Pair != "" && e.Mu != "" {
			return nil, fmt.Errorf("%w: entry %q: give pair or mu, not both", ErrFormat, e.Name)
		}
		oe := outEntry{Name: e.Name, Model: e.Spec.Model, Params: map[string]string{}, Pair: e.Pair, Mu: e.Mu}
		for _, a := range e.Spec.Params {
			if strings.ContainsAny(a.Value, ",=") {
				return nil, fmt.Errorf("%w: entry %q: %s = %q: a value may not contain ',' or '='", ErrFormat, e.Name, a.Name, a.Value)
			}
			oe.Params[a.Name] = a.Value
		}
		f.Entry = append(f.Entry, oe)
	}
	var b bytes.Buffer
	if comment != "" {
		for _, line := range strings.Split(strings.TrimRight(comment, "\n"), "\n") {
			b.WriteString(strings.TrimRight("# "+line, " ") + "\n")
		}
		b.WriteString("\n")
	}
	if err := toml.NewEncoder(&b).Encode(f); err != nil {
		return nil, fmt.Errorf("%w: %v", ErrFormat, err)
	}
	return b.Bytes(), nil
}
