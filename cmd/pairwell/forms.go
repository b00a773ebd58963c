package main

import (
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
	"sort"
	"strings"

	"github.com/spf13/cobra"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/formsfile"
	"github.com/pairwell/pairwell/core/formula"
)

// envFormsPath lists forms files, or directories whose *.toml files are
// forms files, separated like PATH.
const envFormsPath = "PAIRWELL_FORMS_PATH"

const formsHelp = `Forms typed as formulas:
  --forms FILE              load the forms declared in a forms file (TOML, repeatable)
  PAIRWELL_FORMS_PATH=A:B   forms files, or directories of *.toml forms files, to load too`

// registerForms adds --forms to root and returns the function that loads
// the forms of --forms and PAIRWELL_FORMS_PATH into e's registry.
func registerForms(root *cobra.Command, e *env) func() error {
	var files []string
	root.PersistentFlags().StringArrayVar(&files, "forms", nil,
		"load the forms typed as formulas in the forms file `FILE` (TOML, repeatable; see README)")
	root.Long += "\n\n" + formsHelp
	return func() error {
		paths := append([]string(nil), files...)
		found, err := discoverForms(os.Getenv(envFormsPath))
		if err != nil {
			return usageErr(fmt.Errorf("%s: %w", envFormsPath, err))
		}
		paths = append(paths, found...)
		seen := map[string]bool{}
		for _, p := range paths {
			abs, err := filepath.Abs(p)
			if err == nil && seen[abs] {
				continue
			}
			seen[abs] = true
			data, err := e.readInput("--forms", p, formsfile.MaxSize)
			if err != nil {
				return err
			}
			decls, err := formsfile.Parse(data, p)
			if err != nil {
				return usageErr(fmt.Errorf("--forms: %w", err))
			}
			if err := e.addForms(decls); err != nil {
				return err
			}
		}
		return nil
	}
}

// discoverForms lists the forms files of a path variable: each entry is a
// file, or a directory whose *.toml files are taken in name order. Missing
// entries are skipped, like missing directories of PATH.
func discoverForms(list string) ([]string, error) {
	var out []string
	for _, dir := range filepath.SplitList(list) {
		if dir == "" {
			continue
		}
		st, err := os.Stat(dir)
		if errors.Is(err, fs.ErrNotExist) {
			continue
		}
		if err != nil {
			return nil, err
		}
		if !st.IsDir() {
			out = append(out, dir)
			continue
		}
		names, err := filepath.Glob(filepath.Join(dir, "*.toml"))
		if err != nil {
			return nil, err
		}
		sort.Strings(names)
		out = append(out, names...)
	}
	return out, nil
}

// addForms compiles declarations and registers them; warnings go to
// standard error. A bad declaration or a key clash is bad input.
func (e *env) addForms(decls []formula.Decl) error {
	forms, warnings, err := formsfile.Build(decls)
	if err != nil {
		return usageErr(err)
	}
	for _, w := range warnings {
		fmt.Fprintf(e.stderr, "pairwell: warning: %s\n", oneLine(w))
	}
	for _, f := range forms {
		if err := e.addModel(f, f.Info().Origin); err != nil {
			return usageErr(err)
		}
	}
	return nil
}

// addModel registers a user's form (forms file, model set or plugin; where
// names it in messages). A form with the key of a library form replaces
// it; when the two differ in their parameters (names, dimensions or
// default units, in order) — so that a spec written for the library form
// would mean something else or fail — a warning on standard error says so.
// Any other clash of keys is an error.
func (e *env) addModel(m core.Model, where string) error {
	replaced, err := e.registry.AddReplacing(m)
	if err != nil {
		return fmt.Errorf("%s: %w", where, err)
	}
	for _, old := range replaced {
		if sameParams(old.Info().Params, m.Info().Params) {
			continue
		}
		fmt.Fprintf(e.stderr, "pairwell: warning: %s: form %q replaces the library form %q (%s), whose parameters differ: %s\n",
			where, m.Info().Key, old.Info().Key, old.Info().Origin, core.ParamList(old.Info().Params))
	}
	return nil
}

// sameParams reports whether two forms take the same parameters: names,
// dimensions and default units, in order.
func sameParams(a, b []core.Param) bool {
	if len(a) != len(b) {
		return false
	}
	for i := range a {
		if a[i].Name != b[i].Name || a[i].Dimension != b[i].Dimension || a[i].SpecUnit() != b[i].SpecUnit() {
			return false
		}
	}
	return true
}

// caretOf returns the picture of the place a formula error points at, or ""
// when err is not about a place in a formula.
func caretOf(err error) string {
	var fe *formula.Error
	if errors.As(err, &fe) {
		return strings.TrimRight(fe.Caret(), " ")
	}
	return ""
}
