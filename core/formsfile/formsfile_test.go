package formsfile

import (
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

func TestLoad(t *testing.T) {
	decls, err := Load("testdata/forms.toml")
	_, errEx := Load("../../examples/forms.toml") // the README's example file stays valid
	require.NoError(t, errEx)
	require.NoError(t, err)
	require.Len(t, decls, 2)
	assert.Equal(t, "varshni", decls[0].Key)
	assert.Equal(t, "testdata/forms.toml:5", decls[0].Origin)
	assert.Equal(t, "testdata/forms.toml:27", decls[1].Origin)
	assert.Equal(t, "0", decls[1].Limit)
	require.Len(t, decls[1].Params, 3)
	assert.Equal(t, "kcal/mol", decls[1].Params[0].Unit)
	forms, warnings, err := Build(decls)
	require.NoError(t, err)
	assert.Empty(t, warnings)
	assert.Len(t, forms, 2)
	assert.Equal(t, "testdata/forms.toml:27", forms[1].Info().Origin)
}

func TestParseErrors(t *testing.T) {
	const head = "[[form]]\nkey = \"x\"\nformula = \"E*r/L\"\n[[form.param]]\nname = \"E\"\nunit = \"eV\"\n[[form.param]]\nname = \"L\"\nunit = \"A\"\n"
	tests := []struct {
		doc, contain string
	}{
		{"", "no [[form]] tables"},
		{"[[form]]\nformula = \"r\"\n", "form without key"},
		{"[[form]]\nkey = \"x\"\n", "no formula"},
		{head + "colour = \"red\"\n", "unknown key form.param.colour"},
		{head + "[[form]]\nkey = \"X\"\nformula = \"r\"\n", `key "X" already declared at f.toml:1`},
		{"[[form]]\nkey = \"x\"\nformula = \"r\"\nlimit = true\n", "limit: true: want a number or a formula"},
		{"[[form]]\nkey = \"x\"\nformula = \"r\"\nr_min = \"\"\n", "r_min: empty"},
		{"[[form]\n", "invalid forms file f.toml"},
		{"[[form]]\nkey = \"x\"\nformula = \"r\"\n[[form.param]]\nunit = \"A\"\n", "parameter 1 has no name"},
	}
	for _, tt := range tests {
		_, err := Parse([]byte(tt.doc), "f.toml")
		require.Error(t, err, tt.doc)
		assert.ErrorIs(t, err, ErrFormat)
		assert.Contains(t, err.Error(), tt.contain, tt.doc)
		assert.NotContains(t, err.Error(), "\n")
	}
	// Formula errors come from Build, with the origin.
	decls, err := Parse([]byte(strings.Replace(head, "E*r/L", "E*r/LL", 1)), "f.toml")
	require.NoError(t, err)
	_, _, err = Build(decls)
	assert.ErrorContains(t, err, "f.toml:1: form \"x\": unknown name 'LL' at column 5")
}

// FuzzParse: Parse never panics; errors are one line wrapping ErrFormat;
// a parsed document has a key and a formula in every form and an origin
// naming the source.
func FuzzParse(f *testing.F) {
	f.Add("[[form]]\nkey = \"x\"\nformula = \"E*r/L\"\n[[form.param]]\nname = \"E\"\nunit = \"eV\"\n")
	f.Add("[[form]]\nkey = \"x\"\nformula = \"r\"\nlimit = 0\nr_min = \"1\"\n")
	f.Add("[[form]]\n[[form]]\n")
	f.Fuzz(func(t *testing.T, doc string) {
		decls, err := Parse([]byte(doc), "f.toml")
		if err != nil {
			if strings.Contains(err.Error(), "\n") {
				t.Fatalf("multi-line error %q", err)
			}
			return
		}
		for _, d := range decls {
			if d.Key == "" || strings.TrimSpace(d.Formula) == "" || !strings.HasPrefix(d.Origin, "f.toml") {
				t.Fatalf("bad declaration %+v", d)
			}
		}
		_, _, _ = Build(decls)
	})
}

// TestTail: the optional tail key (a number, the power of a slow tail)
// reaches the declaration; a string is refused.
func TestTail(t *testing.T) {
	const doc = "[[form]]\nkey = \"k\"\nformula = \"De*((re/r)^2 - 2*re/r)\"\nlimit = 0\ntail = %s\n" +
		"[[form.param]]\nname = \"De\"\nunit = \"eV\"\n[[form.param]]\nname = \"re\"\nunit = \"A\"\n"
	for _, tt := range []struct {
		tail string
		want float64
	}{{"1", 1}, {"1.5", 1.5}} {
		decls, err := Parse([]byte(strings.Replace(doc, "%s", tt.tail, 1)), "t.toml")
		require.NoError(t, err)
		assert.Equal(t, tt.want, decls[0].Tail)
	}
	_, err := Parse([]byte(strings.Replace(doc, "%s", `"1/r"`, 1)), "t.toml")
	assert.ErrorIs(t, err, ErrFormat)
}
