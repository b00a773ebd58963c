package main

import (
	"encoding/csv"
	"encoding/json"
	"io"
	"os"
	"path/filepath"
	"regexp"
	"sort"
	"strconv"
	"strings"
	"testing"

	"github.com/spf13/cobra"
	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"github.com/pairwell/pairwell/core/report"
	"github.com/pairwell/pairwell/models"
)

// contractCase is how the output-contract test runs one command: its
// arguments (without --format), the JSON path of its records (see
// emitRecords; "" for the object or array itself) and whether it has CSV.
type contractCase struct {
	args    func(t *testing.T, dir string) []string
	records string
	noCSV   bool // refused with exit 2: several tables, or a picture
	code    int  // the exit status (1: baseline verify reporting a change)
}

// Invented inputs of the demo's magnitudes (the demo bond, HCl-sized
// Morse, an argon-like Lennard-Jones), as in the other tests.
const (
	contractMorse = "morse:De=4.6,a=1.87,re=1.27"
	contractLJ    = "lj:epsilon=120K,sigma=3.4"
	contractBuck  = "buckingham:A=1500,rho=0.3,C=25"
	contractHarm  = "harmonic:k=30,r0=1.2"
)

// fixed is a contractCase argument list that needs no files.
func fixed(args ...string) func(*testing.T, string) []string {
	return func(*testing.T, string) []string { return args }
}

// contractSet writes a model set of two entries (one bounded, one not) to
// dir; the Morse entry has the spec morse.
func contractSet(t *testing.T, dir, morse string) string {
	t.Helper()
	p := filepath.Join(dir, "set.toml")
	require.NoError(t, os.WriteFile(p, []byte(`
[[entry]]
name = "m"
spec = "`+morse+`"
pair = "H-Cl"

[[entry]]
name = "h"
spec = "`+contractHarm+`"
mu = "1"
`), 0o644))
	return p
}

// contractCases has one entry per command with a --format flag, keyed by
// its path below pairwell. TestOutputContract fails for a command that has
// none: a new command must register its demo inputs here (and document its
// keys in README "Output contract").
var contractCases = map[string]contractCase{
	"inspect": {args: fixed("inspect", contractMorse, contractHarm, contractBuck, "nope:x=1", "--pair", "H-Cl")},
	"motion":  {args: fixed("motion", contractMorse, "--pair", "H-Cl", "--amplitude", "0.2", "--periods", "2")},
	"period": {args: fixed("period", contractMorse, "--pair", "H-Cl", "--amplitudes", "0.1,0.5", "--energies", "5eV", "--method", "rk4"),
		records: "rows"},
	"validity": {args: fixed("validity", contractHarm)},
	"compare": {args: fixed("compare", contractMorse, contractLJ, contractBuck, contractHarm, "--pair", "H-Cl", "--validity",
		"--match", "re=1.2,De=4")},
	"levels": {args: fixed("levels", contractMorse, contractLJ, "nope:x=1", "--pair", "1H-35Cl", "--v-max", "1", "--j-max", "1"),
		records: "levels"},
	"fit": {args: fixed("fit", filepath.Join("demodata", "invented-scan.csv"), "--form", "morse", "--form", "harmonic", "--pair", "H-Cl"),
		records: ""},
	"virial": {args: func(t *testing.T, dir string) []string {
		return []string{"virial", contractLJ, "--pair", "Ar-Ar", "--temperatures", "100,300", "--data", filepath.Join("testdata", "b2-invented.csv")}
	}, records: "rows,data.rows"},
	"expansion": {args: fixed("expansion", contractMorse, "--pair", "H-Cl", "--temperatures", "100,300"), records: "rows"},
	"mix": {args: fixed("mix", "lj:epsilon=119.8K,sigma=3.405", "lj:epsilon=164K,sigma=3.636", "--all-rules", "--pair", "Ar-Kr"),
		records: "rules"},
	"table": {args: fixed("table", contractMorse, "--from", "0.9", "--to", "3", "--accuracy", "1e-4", "--second-derivative"),
		records: "rows"},
	"check":   {args: fixed("check", contractMorse)},
	"cutoff":  {args: fixed("cutoff", contractLJ, "--cutoff", "8.5", "--pair", "Ar-Ar", "--density", "1.40g/cm3"), records: "schemes"},
	"models":  {args: fixed("models")},
	"demo":    {args: fixed("demo", "--no-pictures"), noCSV: true},
	"version": {args: fixed("version")},
	"baseline record": {args: func(t *testing.T, dir string) []string {
		return []string{"baseline", "record", "--set", contractSet(t, dir, contractMorse), "-o", filepath.Join(dir, "b.json")}
	}},
	"baseline verify": {args: func(t *testing.T, dir string) []string {
		b := filepath.Join(dir, "old.json")
		code, _, errOut := runCLI(t, "baseline", "record", "--set", contractSet(t, dir, contractMorse), "-o", b)
		require.Equal(t, 0, code, errOut)
		// The depth moved: a change to report.
		return []string{"baseline", "verify", "--set", contractSet(t, dir, "morse:De=4.7,a=1.87,re=1.27"), b}
	}, records: "changes", code: 1},
	"plot taylor":    {args: plotArgs("taylor", contractMorse), noCSV: true},
	"plot period":    {args: plotArgs("period", contractMorse, "--pair", "H-Cl"), noCSV: true},
	"plot compare":   {args: plotArgs("compare", contractMorse, contractLJ, "--reduced"), noCSV: true},
	"plot motion":    {args: plotArgs("motion", contractMorse, "--pair", "H-Cl", "--amplitude", "0.2", "--periods", "2"), noCSV: true},
	"plot virial":    {args: plotArgs("virial", contractLJ), noCSV: true},
	"plot expansion": {args: plotArgs("expansion", contractMorse, "--pair", "H-Cl"), noCSV: true},
	"plot fit":       {args: plotArgs("fit", filepath.Join("demodata", "invented-scan.csv"), "--form", "morse"), noCSV: true},
	"plot levels":    {args: plotArgs("levels", contractMorse, "--pair", "H-Cl"), noCSV: true},
}

// plotArgs are the arguments of a plot command writing into dir.
func plotArgs(kind string, args ...string) func(*testing.T, string) []string {
	return func(_ *testing.T, dir string) []string {
		return append(append([]string{"plot", kind}, args...), "-o", filepath.Join(dir, kind+".svg"))
	}
}

// formatCommands are the paths (below pairwell) of the runnable commands
// that take --format.
func formatCommands() []string {
	root := newRootCmd(newEnv(io.Discard, io.Discard))
	var out []string
	var walk func(c *cobra.Command)
	walk = func(c *cobra.Command) {
		for _, s := range c.Commands() {
			if s.Hidden || s.Name() == "help" || s.Name() == "completion" {
				continue
			}
			walk(s)
		}
		if c.Runnable() && !c.HasSubCommands() && c != root && (c.Flags().Lookup("format") != nil || c.InheritedFlags().Lookup("format") != nil) {
			out = append(out, strings.TrimPrefix(c.CommandPath(), "pairwell "))
		}
	}
	walk(root)
	sort.Strings(out)
	return out
}

// energyUnitCommand reports whether the command at path has --energy-unit.
func energyUnitCommand(path string) bool {
	root := newRootCmd(newEnv(io.Discard, io.Discard))
	c, _, err := root.Find(strings.Fields(path))
	return err == nil && c.Flags().Lookup("energy-unit") != nil
}

// contractSection is the text of README's "Output contract" section.
func contractSection(t *testing.T) string {
	t.Helper()
	b, err := os.ReadFile(filepath.Join("..", "..", "README.md"))
	require.NoError(t, err)
	s := string(b)
	i := strings.Index(s, "\n## Output contract\n")
	require.GreaterOrEqual(t, i, 0, "README has a section \"## Output contract\"")
	s = s[i+1:]
	if j := strings.Index(s[3:], "\n## "); j >= 0 {
		s = s[:j+3]
	}
	return s
}

// codeSpans are the `…` spans of markdown text, split at spaces, commas,
// braces and brackets, so that `{a, b}` documents a and b.
func codeSpans(text string) map[string]bool {
	out := map[string]bool{}
	for _, m := range regexp.MustCompile("`([^`]+)`").FindAllStringSubmatch(text, -1) {
		for _, f := range strings.FieldsFunc(m[1], func(r rune) bool { return strings.ContainsRune(" ,{}[]():=\"", r) }) {
			out[f] = true
		}
	}
	return out
}

// jsonKeys adds every object key of v to keys, recursively; the keys of
// parameter objects (paramKeys) are parameter names, not contract keys.
func jsonKeys(v any, keys map[string]bool) {
	switch x := v.(type) {
	case map[string]any:
		for k, el := range x {
			keys[k] = true
			if !paramKeys[k] {
				jsonKeys(el, keys)
			}
		}
	case []any:
		for _, el := range x {
			jsonKeys(el, keys)
		}
	}
}

// csvKeyPattern is a CSV header cell: JSON keys (snake_case, units in the
// name) joined with dots, with array indices; no display labels, spaces,
// brackets or Unicode.
var csvKeyPattern = regexp.MustCompile(`^[a-z][a-z0-9_]*(\.[a-z0-9_]+)*$`)

// TestOutputContract: for every command with --format, run in-process on
// demo inputs, every JSON key is documented in README "Output contract",
// and its CSV header is made of the JSON keys (each record's keys appear in
// it, and nothing else) — or CSV is refused, for the commands without.
func TestOutputContract(t *testing.T) {
	doc := codeSpans(contractSection(t))
	for _, name := range formatCommands() {
		t.Run(strings.ReplaceAll(name, " ", "_"), func(t *testing.T) {
			tc, ok := contractCases[name]
			require.True(t, ok, "command %q has --format but no entry in contractCases: register demo inputs for it", name)
			dir := t.TempDir()
			args := tc.args(t, dir)
			code, out, errOut := runCLI(t, append(args, "--format", "json")...)
			require.Equal(t, tc.code, code, "%v: %s", args, errOut)
			var v any
			require.NoError(t, json.Unmarshal([]byte(out), &v), out)
			keys := map[string]bool{}
			jsonKeys(v, keys)
			require.NotEmpty(t, keys)
			var undocumented []string
			for k := range keys {
				if !doc[k] {
					undocumented = append(undocumented, k)
				}
			}
			sort.Strings(undocumented)
			assert.Empty(t, undocumented, "%s: JSON keys missing from README \"Output contract\"", name)

			// --energy-unit, where a command has it, is not a no-op on its
			// table (a plot's converts the picture's axis instead).
			if energyUnitCommand(name) && !strings.HasPrefix(name, "plot ") {
				code, out, errOut = runCLI(t, append(tc.args(t, t.TempDir()), "--energy-unit", "meV")...)
				require.Equal(t, tc.code, code, "%s: %s", name, errOut)
				assert.Contains(t, out, "meV", "%s: the table's energies in meV", name)
			}

			code, out, errOut = runCLI(t, append(tc.args(t, t.TempDir()), "--format", "csv")...)
			if tc.noCSV {
				assert.Equal(t, exitUsage, code, "%s: CSV is refused", name)
				assert.Contains(t, errOut, "--format table or json")
				return
			}
			require.Equal(t, tc.code, code, "%s: %s", name, errOut)
			rows, err := csv.NewReader(strings.NewReader(out)).ReadAll()
			require.NoError(t, err, out)
			require.NotEmpty(t, rows)
			header := rows[0]
			inHeader := map[string]bool{}
			for _, h := range header {
				assert.Regexp(t, csvKeyPattern, h, "%s: CSV header cell", name)
				for _, part := range strings.Split(h, ".") {
					if strings.Trim(part, "0123456789") == "" {
						continue // an array index
					}
					assert.True(t, keys[part], "%s: CSV column %q is not a JSON key", name, h)
					inHeader[part] = true
				}
			}
			recs := contractRecords(t, v, tc.records)
			assert.Len(t, rows, 1+len(recs), "%s: one CSV row per record", name)
			for _, r := range recs {
				for k := range r {
					assert.True(t, inHeader[k], "%s: record key %q has no CSV column", name, k)
				}
			}
		})
	}
}

// contractRecords are the records of the JSON document v (see
// emitRecords): the elements of an array, or of an object, those of its
// arrays at the paths records, else the object itself.
func contractRecords(t *testing.T, v any, records string) []map[string]any {
	t.Helper()
	if a, ok := v.([]any); ok {
		var out []map[string]any
		for _, el := range a {
			out = append(out, contractRecords(t, el, records)...)
		}
		return out
	}
	x := v.(map[string]any)
	var out []map[string]any
	found := false
	for _, path := range strings.Split(records, ",") {
		var cur any = x
		for _, k := range strings.Split(path, ".") {
			m, _ := cur.(map[string]any)
			cur = m[k]
		}
		if a, ok := cur.([]any); ok {
			found = true
			for _, el := range a {
				out = append(out, el.(map[string]any))
			}
		}
	}
	if !found {
		return []map[string]any{x}
	}
	return out
}

// TestOutputContractCases: every registered case is a real command, so
// that the table does not keep entries of commands that are gone.
func TestOutputContractCases(t *testing.T) {
	have := map[string]bool{}
	for _, n := range formatCommands() {
		have[n] = true
	}
	for n := range contractCases {
		assert.True(t, have[n], "contractCases has %q, which is not a command with --format", n)
	}
}

// TestInspectCSVRowIsFlatJSON: inspect's CSV rows, written directly for
// speed, are the cells of its JSON records flattened as every other CSV
// is, for a bounded form with a mass, an unbounded one, one with a barrier
// and one that failed.
func TestInspectCSVRowIsFlatJSON(t *testing.T) {
	m := report.Mass{Pair: "H-Cl", Mu: 0.98}
	for _, tt := range []struct {
		spec string
		mass report.Mass
	}{{contractMorse, m}, {contractHarm, report.Mass{}}, {contractBuck, m}, {"nope:x=1", m}} {
		var rec inspectRecord
		inst, err := models.NewRegistry().Build(tt.spec)
		if err == nil {
			r, rErr := report.NewInspect(tt.spec, inst, 6, tt.mass)
			require.NoError(t, rErr)
			rec = newInspectRecord(tt.spec, r.Model, &r, nil)
		} else {
			rec = newInspectRecord(tt.spec, "nope", nil, err)
		}
		doc, err := orderedJSON(rec)
		require.NoError(t, err)
		flat := csvRecordsOf(doc, "")
		require.Len(t, flat, 1)
		row := inspectCSVRow(rec)
		for i, k := range inspectCSVKeys {
			want := flat[0].cells[k]
			if got, err := strconv.ParseFloat(row[i], 64); err == nil && want != "" {
				w, err := strconv.ParseFloat(want, 64)
				require.NoError(t, err, "%s: %s", tt.spec, k)
				assert.Equal(t, w, got, "%s: %s", tt.spec, k) // the same number, perhaps another spelling (1e-06, 0.000001)
				continue
			}
			if k == "taylor_coefficients" { // space-separated numbers
				w, g := strings.Fields(want), strings.Fields(row[i])
				require.Len(t, g, len(w), "%s: %s", tt.spec, k)
				for j := range w {
					a, errA := strconv.ParseFloat(w[j], 64)
					b, errB := strconv.ParseFloat(g[j], 64)
					require.NoError(t, errA)
					require.NoError(t, errB)
					assert.Equal(t, a, b, "%s: %s[%d]", tt.spec, k, j)
				}
				continue
			}
			assert.Equal(t, want, row[i], "%s: %s", tt.spec, k)
		}
		for _, k := range flat[0].keys {
			if k != "barrier" {
				assert.Contains(t, inspectCSVKeys, k, "%s: key %s has a column", tt.spec, k)
			}
		}
	}
}
