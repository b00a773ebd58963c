package main

import (
	"fmt"
	"strings"

	"github.com/spf13/cobra"

	"github.com/pairwell/pairwell/core"
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
	Name      string       `json:"name"`
	Formula   string       `json:"formula"`
	Params    []modelParam `json:"params"`
	Domain    string       `json:"domain"`
	Reference string       `json:"reference"`
	Notes     string       `json:"notes,omitempty"`
	MaxOrder  int          `json:"max_derivative_order"`
	Origin    string       `json:"origin"`
	Version   string       `json:"version,omitempty"`
}

func newModelEntry(info core.ModelInfo) modelEntry {
	m := modelEntry{
		Key: info.Key, Aliases: append([]string{}, info.Aliases...), Name: info.Name,
		Formula: info.Formula, Domain: info.Domain, Reference: info.Reference,
		Notes: info.Notes, MaxOrder: info.MaxOrder, Origin: info.Origin, Version: info.Version,
	}
	for _, p := range info.Params {
		m.Params = append(m.Params, modelParam{
			Name: p.Name, Dimension: p.Dimension.String(), Unit: p.Dimension.DefaultUnit(),
			Constraint: p.Constraint.String(), Meaning: p.Meaning,
		})
	}
	return m
}

func newModelsCmd(e *env) *cobra.Command {
	return &cobra.Command{
		Use:   "models",
		Short: "List the functional forms with their formulas and parameters",
		Long: `models lists every form pairwell knows — the built-in ones and those served by
plugins — with its formula, parameters (default unit and constraint), domain and
literature reference. The KEY (or an alias) starts a spec: KEY:NAME=VALUE,...`,
		Example: `  pairwell models
  pairwell models --format json
  pairwell --plugin ./pairwell-plugin-rydberg models     # with a plugin's forms`,
		Args: exactArgs(0, "no arguments"),
		RunE: func(cmd *cobra.Command, args []string) error {
			var entries []modelEntry
			t := &table{cols: []column{{Title: "key"}, {Title: "formula"}, {Title: "parameters"}, {Title: "origin"}}}
			for _, m := range e.registry.Models() {
				info := m.Info()
				entries = append(entries, newModelEntry(info))
				var ps []string
				for _, p := range info.Params {
					ps = append(ps, p.String())
				}
				key := info.Key
				if len(info.Aliases) > 0 {
					key += " (" + strings.Join(info.Aliases, ", ") + ")"
				}
				origin := info.Origin
				if origin != "built-in" {
					origin = "plugin " + origin
					if info.Version != "" {
						origin += " (version " + info.Version + ")"
					}
				}
				t.add(key, info.Formula, strings.Join(ps, "; "), origin)
			}
			if e.format == "table" {
				if err := writeTable(e.stdout, t); err != nil {
					return failErr(err)
				}
				fmt.Fprintln(e.stdout)
				for _, m := range e.registry.Models() {
					info := m.Info()
					fmt.Fprintf(e.stdout, "%s — %s. %s", info.Key, info.Name, info.Reference)
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
