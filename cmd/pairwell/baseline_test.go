package main

import (
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// baselineSet is an invented model set (illustrative numbers).
const baselineSet = `
title = "CI baseline (invented)"
[defaults]
pair = "1H-35Cl"

[[entry]]
name  = "hcl-morse"
model = "morse"
[entry.params]
De = "4.6 eV"
a  = 1.87
re = "127 pm"

[[entry]]
name = "ar-lj"
spec = "lj:epsilon=120K,sigma=3.4"
pair = "Ar-Ar"

[[entry]]
name = "bk"
spec = "buckingham:A=1500,rho=0.3,C=25"
mu = 20

[[entry]]
name = "hcl-harmonic"
spec = "harmonic:k=32.17,r0=1.27"
`

func writeSet(t *testing.T, dir, doc string) string {
	t.Helper()
	path := filepath.Join(dir, "forms.toml")
	require.NoError(t, os.WriteFile(path, []byte(doc), 0o644))
	return path
}

func TestBaselineRecordVerify(t *testing.T) {
	dir := t.TempDir()
	set := writeSet(t, dir, baselineSet)
	out := filepath.Join(dir, "baseline.json")

	code, stdout, stderr := runCLI(t, "baseline", "record", "--set", set, "-o", out)
	require.Equal(t, 0, code, stderr)
	assert.Contains(t, stdout, out)
	data, err := os.ReadFile(out)
	require.NoError(t, err)
	var doc map[string]any
	require.NoError(t, json.Unmarshal(data, &doc))
	assert.Equal(t, "pairwell-baseline", doc["format"])
	assert.Equal(t, 1.0, doc["version"])
	assert.True(t, strings.HasPrefix(doc["tool"].(string), "pairwell"))
	entries := doc["entries"].([]any)
	require.Len(t, entries, 4)
	first := entries[0].(map[string]any)
	assert.Equal(t, "morse:De=4.6 eV,a=1.87,re=127 pm", first["spec"])
	var names []string
	for _, q := range first["quantities"].([]any) {
		names = append(names, q.(map[string]any)["name"].(string))
	}
	assert.Equal(t, []string{"re", "V(re)", "depth", "k", "c3", "c4", "wavenumber",
		"validity.compression", "validity.stretch", "validity.period_energy"}, names)

	// Unchanged: exit 0.
	code, stdout, stderr = runCLI(t, "baseline", "verify", "--set", set, out)
	require.Equal(t, 0, code, stderr)
	assert.Contains(t, stdout, "0 changes")

	// A changed parameter is drift: exit 1, reported with old, new and
	// relative change.
	drift := writeSet(t, dir, strings.Replace(baselineSet, "a  = 1.87", "a  = 1.9", 1))
	code, stdout, stderr = runCLI(t, "baseline", "verify", "--set", drift, out)
	require.Equal(t, 1, code, stderr)
	assert.Contains(t, stdout, "param a")
	assert.Contains(t, stdout, "wavenumber")
	assert.Contains(t, stderr, "changes")
	code, stdout, _ = runCLI(t, "baseline", "verify", "--set", drift, out, "--format", "json")
	require.Equal(t, 1, code)
	var v struct {
		RTol    float64 `json:"rtol"`
		Changes []struct {
			Kind, Entry, Quantity string
			Old, New              *float64
			Rel                   *float64 `json:"relative_change"`
		} `json:"changes"`
	}
	require.NoError(t, json.Unmarshal([]byte(stdout), &v))
	assert.Equal(t, 1e-9, v.RTol)
	require.NotEmpty(t, v.Changes)
	c := v.Changes[0]
	assert.Equal(t, "moved", c.Kind)
	assert.Equal(t, "hcl-morse", c.Entry)
	assert.Equal(t, "param a", c.Quantity)
	assert.Equal(t, 1.87, *c.Old)
	assert.Equal(t, 1.9, *c.New)
	assert.InEpsilon(t, 0.03/1.9, *c.Rel, 1e-12)
	// A loose --rtol accepts it.
	code, _, stderr = runCLI(t, "baseline", "verify", "--set", drift, out, "--rtol", "0.1")
	assert.Equal(t, 0, code, stderr)

	// A removed and an added entry are reported too.
	renamed := writeSet(t, dir, strings.Replace(baselineSet, `name = "bk"`, `name = "bk2"`, 1))
	code, stdout, _ = runCLI(t, "baseline", "verify", "--set", renamed, out)
	assert.Equal(t, 1, code)
	assert.Contains(t, stdout, "removed")
	assert.Contains(t, stdout, "added")
}

func TestBaselineBadInput(t *testing.T) {
	dir := t.TempDir()
	set := writeSet(t, dir, baselineSet)
	out := filepath.Join(dir, "baseline.json")
	require.Equal(t, 0, func() int { c, _, _ := runCLI(t, "baseline", "record", "--set", set, "-o", out); return c }())
	good, err := os.ReadFile(out)
	require.NoError(t, err)

	write := func(name, content string) string {
		p := filepath.Join(dir, name)
		require.NoError(t, os.WriteFile(p, []byte(content), 0o644))
		return p
	}
	corrupt := write("corrupt.json", string(good[:len(good)/3]))
	foreign := write("foreign.json", `{"name": "left-pad", "version": "1.3.0"}`)
	future := write("future.json", strings.Replace(string(good), `"version": 1`, `"version": 7`, 1))
	for _, args := range [][]string{
		{"baseline", "verify", "--set", set, corrupt},
		{"baseline", "verify", "--set", set, foreign},
		{"baseline", "verify", "--set", set, future},
		{"baseline", "verify", "--set", set, filepath.Join(dir, "missing.json")},
		{"baseline", "verify", out},
		{"baseline", "verify", "--set", set},
		{"baseline", "verify", "--set", set, out, "--rtol", "-1"},
		{"baseline", "record", "--set", set},
		{"baseline", "record", "-o", out},
		{"baseline", "record", "--set", filepath.Join(dir, "nope.toml"), "-o", out},
		{"baseline", "record", "--set", set, "-o", out, "--tolerance", "2"},
		{"baseline"},
	} {
		code, _, stderr := runCLI(t, args...)
		assert.Equal(t, 2, code, "%v: %s", args, stderr)
		assert.NotEmpty(t, stderr, "%v", args)
	}
	code, _, stderr := runCLI(t, "baseline", "verify", "--set", set, corrupt)
	require.Equal(t, 2, code)
	assert.Contains(t, stderr, "not a valid pairwell baseline")
	code, _, stderr = runCLI(t, "baseline", "verify", "--set", set, foreign)
	require.Equal(t, 2, code)
	assert.Contains(t, stderr, `format "", want "pairwell-baseline"`)

	// A record that fails leaves the existing baseline untouched and no
	// temporary file behind.
	bad := writeSet(t, t.TempDir(), strings.Replace(baselineSet, "C=25", "C=1e6", 1)) // no well
	code, _, stderr = runCLI(t, "baseline", "record", "--set", bad, "-o", out)
	assert.Equal(t, 2, code, stderr)
	after, err := os.ReadFile(out)
	require.NoError(t, err)
	assert.Equal(t, good, after)
	entries, err := os.ReadDir(dir)
	require.NoError(t, err)
	for _, e := range entries {
		assert.False(t, strings.Contains(e.Name(), ".tmp-"), e.Name())
	}
	// An unwritable target is a failure (exit 1).
	code, _, _ = runCLI(t, "baseline", "record", "--set", set, "-o", filepath.Join(dir, "no", "such", "b.json"))
	assert.Equal(t, 1, code)
}
