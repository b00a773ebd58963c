package main

import (
	"fmt"
	"strings"

	"github.com/spf13/cobra"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/formula"
	"github.com/pairwell/pairwell/core/report"
	"github.com/pairwell/pairwell/models/library"
)

// modelParam is the JSON form of a parameter description.
type modelParam struct {
	Name       string `json:"name"`
	Dimension  string `json:"dimension"`
	Unit       string `json:"unit"`
	Constraint string `json:"constraint"`
	Meaning    string `json:"meaning"`
}

// modelEntry is the JSON form of a model description.
type modelEntry struct {
	Key       string       `json:"key"`
	Aliases   []string     `json:"aliases"`
	Name      string       `json:"title"`
	Formula   string       `json:"formula"`
	Params    []modelParam `json:"parameters"`
	Domain    string       `json:"domain"`
	Reference string       `json:"reference"`
	Notes     report.Text  `json:"notes"`
	MaxOrder  int          `json:"max_derivative_order"`
	Origin    string       `json:"origin"`
	Kind      string       `json:"kind"`
	Version   report.Text  `json:"version"`
}

// modelKind says where a form comes from: "built-in", "library" (the
// forms library built into the binary), "plugin" or "formula" (a forms
// file).
func modelKind(m core.Model) string {
	switch m.(type) {
	case *library.Form:
		return "library"
	case *formula.Form:
		return "formula"
	}
	if m.Info().Origin == "built-in" {
		return "built-in"
	}
	return "plugin"
}

func newModelEntry(m core.Model) modelEntry {
	info := m.Info()
	e := modelEntry{
		Key: info.Key, Aliases: append([]string{}, info.Aliases...), Name: info.Name,
		Formula: info.Formula, Domain: info.Domain, Reference: info.Reference,
		Notes: report.Text(info.Notes), MaxOrder: info.MaxOrder, Origin: info.Origin, Kind: modelKind(m), Version: report.Text(info.Version),
	}
	for _, p := range info.Params {
		e.Params = append(e.Params, modelParam{
			Name: p.Name, Dimension: p.Dimension.String(), Unit: p.SpecUnit(),
			Constraint: p.Constraint.String(), Meaning: p.Meaning,
		})
	}
	return e
}

func newModelsCmd(e *env) *cobra.Command {
	return &cobra.Command{
		Use:   "models",
		Short: "List the functional forms with their formulas and parameters",
		Long: `models lists every form pairwell knows — the built-in ones, the forms library's,
those of forms files and those served by plugins — with its formula, parameters
(default unit and constraint), domain and literature reference. The KEY (or an
alias) starts a spec: KEY:NAME=VALUE,...

Where they come from, in order of precedence: the built-in forms, then your
forms (--forms, PAIRWELL_FORMS_PATH, [[form]] tables of a model set, plugins),
then the forms library built into pairwell (published forms typed as formulas).
A form of yours with the key of a library form replaces it (with a warning when
its parameters differ); any other clash of keys is an error.`,
		Example: `  pairwell models
  pairwell models --format json
  pairwell --plugin ./pairwell-plugin-rydberg models     # with a plugin's forms (its rydberg replaces the library's)`,
		Args: exactArgs(0, "no arguments"),
		RunE: func(cmd *cobra.Command, args []string) error {
			var entries []modelEntry
			t := &table{cols: []column{{Title: "key"}, {Title: "formula"}, {Title: "parameters"}, {Title: "origin"}}}
			for _, m := range e.registry.Models() {
				info := m.Info()
				entries = append(entries, newModelEntry(m))
				var ps []string
				for _, p := range info.Params {
					ps = append(ps, p.String())
				}
				key := info.Key
				if len(info.Aliases) > 0 {
					key += " (" + strings.Join(info.Aliases, ", ") + ")"
				}
				origin := info.Origin
				switch modelKind(m) {
				case "library":
					origin = "forms library " + origin
				case "formula":
					origin = "forms file " + origin
				case "plugin":
					origin = "plugin " + origin
					if info.Version != "" {
						origin += " (version " + info.Version + ")"
					}
				}
				t.add(key, shortFormula(info.Formula), strings.Join(ps, "; "), origin)
			}
			if e.format == "table" {
				if err := writeTable(e.stdout, t); err != nil {
					return failErr(err)
				}
				fmt.Fprintln(e.stdout)
				for _, m := range e.registry.Models() {
					info := m.Info()
					fmt.Fprintf(e.stdout, "%s — %s. %s", info.Key, info.Name, info.Reference)
					if shortFormula(info.Formula) != info.Formula {
						fmt.Fprintf(e.stdout, " Formula: %s.", info.Formula)
					}
					if info.Notes != "" {
						fmt.Fprintf(e.stdout, " Note: %s", info.Notes)
					}
					fmt.Fprintln(e.stdout)
				}
				return nil
			}
			return e.emit(entries, t)
		},
	}
}

// formulaWidth is the widest formula the models table shows in its
// column; a longer one is cut there with "…" and printed whole in the notes
// below the table (JSON and CSV always carry it whole).
const formulaWidth = 72

// shortFormula returns f, or its first formulaWidth−1 runes and "…".
func shortFormula(f string) string {
	r := []rune(f)
	if len(r) <= formulaWidth {
		return f
	}
	return string(r[:formulaWidth-1]) + "…"
}
