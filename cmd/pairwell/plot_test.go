package main

import (
	"bytes"
	"encoding/json"
	"encoding/xml"
	"image/png"
	stdpng "image/png"
	"io"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// The specs the plot tests draw: every built-in form.
var plotSpecs = []string{
	"morse:De=4.6,a=1.87,re=1.27",
	"lj:epsilon=120K,sigma=3.4",
	"buckingham:A=1500,rho=0.3,C=25",
	"harmonic:k=30,r0=1.2",
}

// plotJSON runs a plot command with --format json and decodes its report.
func plotJSON(t *testing.T, args ...string) plotReport {
	t.Helper()
	code, out, errOut := runCLI(t, append(args, "--format", "json")...)
	require.Equal(t, 0, code, "%v: %s", args, errOut)
	var r plotReport
	require.NoError(t, json.Unmarshal([]byte(out), &r), out)
	return r
}

// requirePNG decodes the PNG file at path and checks its size.
func requirePNG(t *testing.T, path string) {
	t.Helper()
	f, err := os.Open(path)
	require.NoError(t, err)
	defer f.Close()
	img, err := png.Decode(f)
	require.NoError(t, err, path)
	assert.Equal(t, 1500, img.Bounds().Dx(), path)
	h := 750
	if filepath.Base(path) == "fit.png" {
		h = 1050 // two panels: the fits and their residuals
	}
	assert.Equal(t, h, img.Bounds().Dy(), path)
}

// requireSVG parses the SVG file at path and returns its text content.
func requireSVG(t *testing.T, path string) string {
	t.Helper()
	data, err := os.ReadFile(path)
	require.NoError(t, err)
	dec := xml.NewDecoder(bytes.NewReader(data))
	var root string
	var text strings.Builder
	for {
		tok, err := dec.Token()
		if err == io.EOF {
			break
		}
		require.NoError(t, err, "%s does not parse as XML", path)
		switch tk := tok.(type) {
		case xml.StartElement:
			if root == "" {
				root = tk.Name.Local
			}
		case xml.CharData:
			text.Write(tk)
			text.WriteByte(' ')
		}
	}
	require.Equal(t, "svg", root, path)
	return text.String()
}

func TestPlotEveryKindEveryForm(t *testing.T) {
	dir := t.TempDir()
	for i, spec := range plotSpecs {
		key := strings.Split(spec, ":")[0]
		png := filepath.Join(dir, key+"-taylor.png")
		r := plotJSON(t, "plot", "taylor", spec, "-o", png)
		assert.Equal(t, plotReport{File: png, Kind: "taylor", Format: "png",
			Series: []string{"exact V(r)", "order 0, 1 (c₁ = 0)", "order 2 (harmonic)", "order 3", "order 4"}, Notes: r.Notes}, r)
		assert.Len(t, r.Notes, 2, spec)
		requirePNG(t, png)

		svg := filepath.Join(dir, key+"-period.svg")
		r = plotJSON(t, "plot", "period", spec, "--mu", "20", "-o", svg)
		assert.Equal(t, []string{"exact (quadrature)", "harmonic 2π/ω0", "perturbative (2nd order)"}, r.Series, spec)
		text := requireSVG(t, svg)
		assert.Contains(t, text, "period T [fs]")
		assert.Contains(t, text, "amplitude x0")

		svg = filepath.Join(dir, key+"-motion.svg")
		r = plotJSON(t, "plot", "motion", spec, "--mu", "20", "--amplitude", "0.02", "--method", []string{"dopri", "rk4", "verlet", "heun"}[i], "-o", svg)
		assert.Len(t, r.Series, 2, spec)
		assert.Contains(t, requireSVG(t, svg), "displacement x = r − re [Å]")
	}
	out := filepath.Join(dir, "compare.png")
	r := plotJSON(t, append(append([]string{"plot", "compare"}, plotSpecs...), "-o", out)...)
	// Legends carry the parameters (issue 17).
	assert.Equal(t, []string{"morse De=4.6 a=1.87 re=1.27", "lennard-jones epsilon=0.01034 sigma=3.4", "buckingham A=1500 rho=0.3 C=25", "harmonic k=30 r0=1.2"}, r.Series)
	requirePNG(t, out)
}

func TestPlotPeriodMeasured(t *testing.T) {
	dir := t.TempDir()
	out := filepath.Join(dir, "p.svg")
	r := plotJSON(t, "plot", "period", "morse:De=4.6,a=1.87,re=1.27", "--pair", "H-Cl", "--amplitudes=-0.2:0.6:5",
		"--method", "rk4", "--periods", "2", "--energy-axis", "-o", out)
	assert.Equal(t, "measured (rk4)", r.Series[len(r.Series)-1])
	require.Len(t, r.Notes, 1)
	assert.Contains(t, r.Notes[0], "measured by rk4 over 2 periods at 4 amplitudes") // 0 has no motion
	assert.Contains(t, requireSVG(t, out), "oscillation energy E")
}

func TestPlotCompareSetReduced(t *testing.T) {
	dir := t.TempDir()
	set := filepath.Join(dir, "set.toml")
	require.NoError(t, os.WriteFile(set, []byte(`
[[entry]]
name = "bond-a"
spec = "morse:De=4.6,a=1.87,re=1.27"
[[entry]]
name = "bond-b"
spec = "lj:epsilon=4.6,sigma=1.13"
[[entry]]
name = "spring"
spec = "harmonic:k=30,r0=1.2"
`), 0o644))
	out := filepath.Join(dir, "c.png")
	r := plotJSON(t, "plot", "compare", "--set", set, "morse:De=1,a=1,re=2", "--reduced", "-o", out)
	assert.Equal(t, []string{"bond-a: morse De=4.6 a=1.87 re=1.27", "bond-b: lennard-jones epsilon=4.6 sigma=1.13", "morse De=1 a=1 re=2"}, r.Series)
	require.Len(t, r.Notes, 1)
	assert.Contains(t, r.Notes[0], "spring: harmonic k=30 r0=1.2 is left out")
	requirePNG(t, out)

	// Table output names the file and the notes.
	code, text, errOut := runCLI(t, "plot", "compare", "--set", set, "--from-minimum", "-o", out)
	require.Equal(t, 0, code, errOut)
	assert.True(t, strings.HasPrefix(text, "wrote "+out+" (compare, png): bond-a: morse De=4.6 a=1.87 re=1.27; bond-b: lennard-jones epsilon=4.6 sigma=1.13; spring: harmonic k=30 r0=1.2\n"), text)
}

// TestPlotPictureOptions: notes about dropped forms are on the picture,
// --width/--height set its size, --energy-unit its energy axis (issue 17).
func TestPlotPictureOptions(t *testing.T) {
	dir := t.TempDir()
	morse := "morse:De=4.6,a=1.87,re=1.27" // invented, HCl-sized
	svg := filepath.Join(dir, "c.svg")
	r := plotJSON(t, "plot", "compare", morse, "harmonic:k=30,r0=1.2", "--reduced", "-o", svg)
	require.Len(t, r.Notes, 1)
	text := requireSVG(t, svg)
	assert.Contains(t, text, "Note: harmonic k=30 r0=1.2 is left out")

	png := filepath.Join(dir, "t.png")
	plotJSON(t, "plot", "taylor", morse, "--width", "6", "--height", "4", "-o", png)
	f, err := os.Open(png)
	require.NoError(t, err)
	defer f.Close()
	cfg, err := stdpng.DecodeConfig(f)
	require.NoError(t, err)
	assert.Equal(t, 6*150, cfg.Width)
	assert.Equal(t, 4*150, cfg.Height)

	for unit, label := range map[string]string{"K": "potential energy V [K]", "kcal/MOL": "potential energy V [kcal/mol]", "cm-1": "potential energy V [cm^-1]"} { // cm⁻¹ as drawn: the font lacks ⁻
		svg := filepath.Join(dir, "e.svg")
		plotJSON(t, "plot", "taylor", morse, "--energy-unit", unit, "-o", svg)
		assert.Contains(t, requireSVG(t, svg), label, unit)
	}
	svg = filepath.Join(dir, "p.svg")
	plotJSON(t, "plot", "period", morse, "--pair", "H-Cl", "--energy-axis", "--energy-unit", "meV", "-o", svg)
	assert.Contains(t, requireSVG(t, svg), "oscillation energy E = V(r0) − V(re) [meV]")

	for _, args := range [][]string{
		{"plot", "taylor", morse, "--width", "1", "-o", png},
		{"plot", "taylor", morse, "--energy-unit", "furlong", "-o", png},
		{"plot", "motion", morse, "--pair", "H-Cl", "--amplitude", "0.1", "--energy-unit", "K", "-o", png},
	} {
		code, _, errOut := runCLI(t, args...)
		assert.Equal(t, 2, code, "%v: %s", args, errOut)
	}
}

func TestPlotBadInput(t *testing.T) {
	dir := t.TempDir()
	morse := "morse:De=4.6,a=1.87,re=1.27"
	png := filepath.Join(dir, "x.png")
	for _, tc := range []struct {
		name string
		code int
		args []string
		msg  string
	}{
		{"no output", 2, []string{"taylor", morse}, "-o FILE"},
		{"unknown extension", 2, []string{"taylor", morse, "-o", filepath.Join(dir, "x.gif")}, ".gif"},
		{"no extension", 2, []string{"taylor", morse, "-o", filepath.Join(dir, "x")}, "no extension"},
		{"missing directory", 1, []string{"taylor", morse, "-o", filepath.Join(dir, "no", "x.png")}, "cannot write"},
		{"csv", 2, []string{"taylor", morse, "-o", png, "--format", "csv"}, "table or json"},
		{"empty range", 2, []string{"taylor", morse, "-o", png, "--range", "2:1"}, "empty range"},
		{"equal range", 2, []string{"taylor", morse, "-o", png, "--range", "150pm:1.5"}, "empty range"},
		{"range syntax", 2, []string{"taylor", morse, "-o", png, "--range", "1"}, "RMIN:RMAX"},
		{"range at 0", 2, []string{"taylor", morse, "-o", png, "--range", "0:1"}, "> 0"},
		{"range below the barrier", 2, []string{"taylor", "buckingham:A=1500,rho=0.3,C=25", "-o", png, "--range", "0.1:0.2"}, "outside the domain"},
		{"order", 2, []string{"taylor", morse, "-o", png, "--truncation", "1"}, "--truncation"},
		{"tolerance", 2, []string{"taylor", morse, "-o", png, "--tolerance", "1.5"}, "--tolerance"},
		{"bad spec", 2, []string{"taylor", "morse:De=-1,a=1,re=1", "-o", png}, "De"},
		{"no mass", 2, []string{"period", morse, "-o", png}, "reduced mass"},
		{"amplitude beyond the well", 2, []string{"period", morse, "--mu", "1", "--amplitudes", "0.1,30", "-o", png}, "dissociates"},
		{"amplitudes syntax", 2, []string{"period", morse, "--mu", "1", "--amplitudes", "0.1:x:3", "-o", png}, "--amplitudes"},
		{"periods without method", 2, []string{"period", morse, "--mu", "1", "--periods", "3", "-o", png}, "--method"},
		{"bad method", 2, []string{"period", morse, "--mu", "1", "--method", "euler", "-o", png}, "euler"},
		{"compare nothing", 2, []string{"compare", "-o", png}, "SPEC"},
		{"compare reduced harmonic", 2, []string{"compare", "harmonic:k=1,r0=1", "--reduced", "-o", png}, "depth"},
		{"compare missing set", 2, []string{"compare", "--set", filepath.Join(dir, "none.toml"), "-o", png}, "--set"},
		{"motion no amplitude", 2, []string{"motion", morse, "--mu", "1", "-o", png}, "--amplitude"},
		{"motion amplitude beyond the well", 2, []string{"motion", morse, "--mu", "1", "--amplitude", "-5", "-o", png}, "amplitude"},
		{"motion zero periods", 2, []string{"motion", morse, "--mu", "1", "--amplitude", "0.1", "--periods", "0", "-o", png}, "--periods"},
		{"unknown kind", 2, []string{"pictures", morse}, `unknown command "pictures" for "pairwell plot"`},
	} {
		code, _, errOut := runCLI(t, append([]string{"plot"}, tc.args...)...)
		assert.Equal(t, tc.code, code, "%s: %s", tc.name, errOut)
		assert.Contains(t, errOut, tc.msg, tc.name)
	}
	code, _, errOut := runCLI(t, "plot")
	assert.Equal(t, 2, code)
	assert.Contains(t, errOut, "needs a kind")
	entries, err := os.ReadDir(dir)
	require.NoError(t, err)
	assert.Empty(t, entries, "bad input must leave no file")
}

// TestPlotKeepsOldFile: a failed plot leaves an existing file as it was.
func TestPlotKeepsOldFile(t *testing.T) {
	dir := t.TempDir()
	old := filepath.Join(dir, "old.png")
	require.NoError(t, os.WriteFile(old, []byte("keep"), 0o644))
	code, _, _ := runCLI(t, "plot", "motion", "morse:De=4.6,a=1.87,re=1.27", "--mu", "1", "--amplitude", "9", "-o", old)
	assert.Equal(t, 2, code)
	b, err := os.ReadFile(old)
	require.NoError(t, err)
	assert.Equal(t, "keep", string(b))
	entries, _ := os.ReadDir(dir)
	assert.Len(t, entries, 1)
}

// TestPlotPluginForms draws forms served by plugins, which reach the
// pictures through the same registry.
func TestPlotPluginForms(t *testing.T) {
	requirePlugins(t)
	dir := t.TempDir()
	plug := "--plugin=" + pluginBin.rydberg
	spec := "rydberg:De=4.6,a=2.1,re=1.27"
	for _, args := range [][]string{
		{"taylor", spec},
		{"period", spec, "--mu", "1", "--method", "rk4"},
		{"compare", spec, "morse:De=4.6,a=1.87,re=1.27", "--reduced"},
		{"motion", spec, "--mu", "1", "--amplitude", "0.3"},
	} {
		out := filepath.Join(dir, args[0]+".png")
		r := plotJSON(t, append(append([]string{plug, "plot"}, args...), "-o", out)...)
		assert.NotEmpty(t, r.Series, args[0])
		requirePNG(t, out)
	}
}
