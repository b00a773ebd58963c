package main

import (
	"bytes"
	"encoding/json"
	"encoding/xml"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/models"
)

// runWithModel runs pairwell in-process with an extra model in the
// registry, as a plugin would add it.
func runWithModel(t *testing.T, m core.Model, args ...string) (int, string, string) {
	t.Helper()
	var stdout, stderr bytes.Buffer
	e := newEnv(&stdout, &stderr)
	defer e.close()
	require.NoError(t, e.registry.Add(m))
	root := newRootCmd(e)
	root.SetArgs(args)
	root.SetOut(&stdout)
	root.SetErr(&stderr)
	if err := root.Execute(); err != nil {
		stderr.WriteString("pairwell: " + err.Error() + "\n")
		return exitCode(err), stdout.String(), stderr.String()
	}
	return 0, stdout.String(), stderr.String()
}

// wrongThird is Morse with V‴ 1.5 times too large (c₃ in every Taylor
// call).
type wrongThird struct{ models.Morse }

func (wrongThird) Info() core.ModelInfo {
	i := models.Morse{}.Info()
	i.Key, i.Origin = "wrong-third", "test"
	return i
}

func (m wrongThird) New(ps []float64) (core.Potential, error) {
	p, err := m.Morse.New(ps)
	return thirdTimes{p}, err
}

type thirdTimes struct{ core.Potential }

func (p thirdTimes) Taylor(n int, r, dst []float64) error {
	err := p.Potential.Taylor(n, r, dst)
	if n >= 3 {
		for i := range r {
			dst[i*(n+1)+3] *= 1.5
		}
	}
	return err
}

func TestCheckBuiltins(t *testing.T) {
	code, out, errOut := runCLI(t, "check")
	require.Equal(t, 0, code, errOut)
	for _, key := range []string{"morse:", "lennard-jones:", "buckingham:", "harmonic:", "mie:", "kratzer:", "tang-toennies:"} {
		assert.Contains(t, out, key)
	}
	assert.Contains(t, out, "V‴ vs dV″/dr")
	// The four built-ins (83 checks, all pass) and the nine library forms at
	// their representative sets with their published identities; skipped:
	// the minimum of born-mayer (none) and the identities of tang-toennies
	// (none in closed form).
	assert.Contains(t, out, "259 checks on 13 forms: 257 passed, 0 failed, 2 skipped")
	assert.Contains(t, out, "identity V‴(re) = −12De/re³")
	assert.Contains(t, out, "V → Domain.Limit as r^-1 (declared tail)")
	assert.NotContains(t, out, "FAIL")
}

func TestCheckSpecsJSON(t *testing.T) {
	code, out, errOut := runCLI(t, "check", "morse:De=4.6,a=1.87,re=127pm", "lj:epsilon=120K,sigma=3.4", "--format", "json")
	require.Equal(t, 0, code, errOut)
	var rows []map[string]any
	require.NoError(t, json.Unmarshal([]byte(out), &rows))
	subjects := map[string]bool{}
	for _, r := range rows {
		subjects[r["name"].(string)] = true
		assert.Equal(t, "pass", r["status"])
		for _, k := range []string{"model", "check", "title", "deviation", "tolerance", "worst_r_angstrom", "message"} {
			assert.Contains(t, r, k)
		}
	}
	assert.Equal(t, map[string]bool{"morse:De=4.6,a=1.87,re=127pm": true, "lj:epsilon=120K,sigma=3.4": true}, subjects)
}

func TestCheckSetAndJUnit(t *testing.T) {
	dir := t.TempDir()
	set := filepath.Join(dir, "forms.toml")
	require.NoError(t, os.WriteFile(set, []byte(`
[[entry]]
name = "hcl-morse"
spec = "morse:De=4.6,a=1.87,re=1.27"
[[entry]]
name = "hcl-harmonic"
model = "harmonic"
[entry.params]
k = 32.17
r0 = "127 pm"
`), 0o644))
	junit := filepath.Join(dir, "junit.xml")
	code, out, errOut := runCLI(t, "check", "--set", set, "--junit", junit, "--format", "csv")
	require.Equal(t, 0, code, errOut)
	assert.Contains(t, out, "hcl-morse,")
	assert.Contains(t, out, "hcl-harmonic,")
	data, err := os.ReadFile(junit)
	require.NoError(t, err)
	var doc struct {
		Tests    int `xml:"tests,attr"`
		Failures int `xml:"failures,attr"`
		Suites   []struct {
			Name  string `xml:"name,attr"`
			Cases []struct {
				Name string `xml:"name,attr"`
			} `xml:"testcase"`
		} `xml:"testsuite"`
	}
	require.NoError(t, xml.Unmarshal(data, &doc))
	require.Len(t, doc.Suites, 2)
	assert.Equal(t, "hcl-morse", doc.Suites[0].Name)
	assert.Zero(t, doc.Failures)
	assert.Equal(t, len(doc.Suites[0].Cases)+len(doc.Suites[1].Cases), doc.Tests)
}

func TestCheckFailureExitsOne(t *testing.T) {
	dir := t.TempDir()
	junit := filepath.Join(dir, "junit.xml")
	code, out, errOut := runWithModel(t, wrongThird{}, "check", "wrong-third:De=4.6,a=1.87,re=1.27", "--junit", junit)
	require.Equal(t, 1, code, errOut)
	assert.Contains(t, out, "FAIL")
	assert.Contains(t, out, "order 3: at r = ")
	assert.Contains(t, errOut, "checks failed")
	assert.Contains(t, errOut, "V‴ vs dV″/dr")
	// The JUnit file is written on failure too, and names the order.
	data, err := os.ReadFile(junit)
	require.NoError(t, err)
	var doc struct {
		Failures int `xml:"failures,attr"`
	}
	require.NoError(t, xml.Unmarshal(data, &doc))
	assert.Equal(t, 2, doc.Failures) // orders 3 and 4
	assert.Contains(t, string(data), "order 3: at r = ")

	// With no SPEC, a form without a representative set is skipped.
	code, out, errOut = runWithModel(t, wrongThird{}, "check")
	require.Equal(t, 0, code, errOut)
	assert.Contains(t, out, "wrong-third (test) has no representative parameter set")
	assert.Contains(t, out, "3 skipped") // and the 2 of the library forms
}

func TestCheckBadInput(t *testing.T) {
	dir := t.TempDir()
	bad := filepath.Join(dir, "bad.toml")
	require.NoError(t, os.WriteFile(bad, []byte("[[entry]]\nname = 'x'\n"), 0o644))
	for _, args := range [][]string{
		{"check", "morse:De=4.6,a=1.87,re=1.27", "--set", bad},
		{"check", "morse:De=4.6,a=1.87"},
		{"check", "quartic:k=1"},
		{"check", "--set", filepath.Join(dir, "missing.toml")},
		{"check", "--set", bad},
		{"check", "--points", "3"},
		{"check", "--max-order", "-1"},
		{"check", "--format", "xml"},
	} {
		code, out, errOut := runCLI(t, args...)
		assert.Equal(t, 2, code, "%v: %s", args, errOut)
		assert.Empty(t, out, "%v", args)
		assert.NotEmpty(t, errOut, "%v", args)
	}
	// An unwritable JUnit path is a failure, after the results are shown.
	code, _, errOut := runCLI(t, "check", "harmonic:k=30,r0=1.2", "--junit", filepath.Join(dir, "no", "dir", "j.xml"))
	assert.Equal(t, 1, code)
	assert.Contains(t, errOut, "--junit")
}

// TestCheckPlugins runs check on forms served by plugins: the example
// plugins and the test plugin's Morse pass; its Morse with a wrong third
// derivative and its Morse with a sign error in the force fail, naming
// the order and the r.
func TestCheckPlugins(t *testing.T) {
	requirePlugins(t)
	bins := map[string]string{"rydberg": pluginBin.rydberg, "mie": pluginBin.mie, "testplugin": pluginBin.test}
	plug := func(name string) string { return "--plugin=" + bins[name] }

	t.Run("examples pass", func(t *testing.T) {
		code, out, errOut := runCLI(t, plug("rydberg"), plug("mie"), plug("testplugin"), "check",
			"rydberg:De=4.6,a=2.1,re=1.27", "mie:epsilon=0.0104,sigma=3.4,n=12,m=6", "plugin-morse:De=4.6,a=1.87,re=1.27")
		require.Equal(t, 0, code, "%s\n%s", out, errOut)
		assert.Contains(t, out, "0 failed")
		assert.Contains(t, out, "identity V⁗(re) = 3De·a⁴") // declared through the protocol
	})

	t.Run("wrong third derivative", func(t *testing.T) {
		code, out, errOut := runCLI(t, plug("testplugin"), "check", "morse-bad3:De=4.6,a=1.87,re=1.27", "--format", "json")
		require.Equal(t, 1, code, errOut)
		var rows []map[string]any
		require.NoError(t, json.Unmarshal([]byte(out), &rows))
		var failed []string
		for _, r := range rows {
			if r["status"] == "FAIL" {
				failed = append(failed, r["title"].(string))
				if r["check"] == "derivative" && r["derivative_order"] == 3.0 {
					msg := r["message"].(string)
					assert.True(t, strings.HasPrefix(msg, "order 3: at r = "), msg)
					assert.Contains(t, msg, "V‴ itself is wrong")
					assert.Contains(t, msg, "1.1 times")
					assert.NotNil(t, r["worst_r_angstrom"])
				}
			}
		}
		assert.Equal(t, []string{"V‴ vs dV″/dr", "V⁗ vs dV‴/dr", "identity V‴(re) = −6De·a³"}, failed)
	})

	t.Run("sign error in the force", func(t *testing.T) {
		code, out, errOut := runCLI(t, plug("testplugin"), "check", "morse-badforce:De=4.6,a=1.87,re=1.27")
		require.Equal(t, 1, code, errOut)
		var order1 string
		for _, line := range strings.Split(out, "\n") {
			if strings.Contains(line, "V′ vs dV/dr") {
				order1 = line
			}
		}
		assert.Contains(t, order1, "FAIL")
		assert.Contains(t, order1, "order 1: at r = ")
		assert.Contains(t, order1, "sign error")
		assert.Contains(t, out, "the fault is in V′ (order 1), not in V″")
		assert.Contains(t, errOut, "V′ vs dV/dr")
	})
}

// BenchmarkCheckBuiltins is "pairwell check" over the four built-in forms
// (target: ≤ 1 s).
func BenchmarkCheckBuiltins(b *testing.B) {
	var out, errOut bytes.Buffer
	for b.Loop() {
		out.Reset()
		if code := run([]string{"check"}, strings.NewReader(""), &out, &errOut); code != 0 {
			b.Fatalf("exit %d: %s", code, errOut.String())
		}
	}
}

// BenchmarkCheckPluginForm is "pairwell check" of one form served by a
// plugin, plugin start included (target: ≤ 3 s).
func BenchmarkCheckPluginForm(b *testing.B) {
	if pluginBin.buildErr != nil {
		b.Fatal(pluginBin.buildErr)
	}
	args := []string{"--plugin=" + pluginBin.test, "check", "plugin-morse:De=4.6,a=1.87,re=1.27"}
	var out, errOut bytes.Buffer
	for b.Loop() {
		out.Reset()
		if code := run(args, strings.NewReader(""), &out, &errOut); code != 0 {
			b.Fatalf("exit %d: %s", code, errOut.String())
		}
	}
}
