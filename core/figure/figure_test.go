package figure

import (
	"bytes"
	"encoding/xml"
	"errors"
	"fmt"
	"image/png"
	"io"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/motion"
	"github.com/pairwell/pairwell/models"
)

// The test bond: Morse with De = 4 eV, a = 1.936 Å⁻¹, re = 1.2 Å (k =
// 2De·a² ≈ 30 eV/Å²), μ = 7 u. Invented round numbers.
const (
	tDe = 4.0
	tA  = 1.936
	tRe = 1.2
	tMu = 7.0
)

// timeUnit is √(u·Å²/eV) in fs, from CODATA 2018: u = 1.66053906660e-27
// kg, e = 1.602176634e-19 C; √(1.66053906660e-27·1e-20/1.602176634e-19)
// s = 10.1805056…e-15 s.
var timeUnit = math.Sqrt(1.66053906660e-27*1e-20/1.602176634e-19) * 1e15

// opaque hides every method of a potential but those of core.Potential,
// and the equilibrium guess of its domain, as a form without a closed-form
// minimum: the analysis has to scan for it.
type opaque struct{ core.Potential }

func (p opaque) Domain() core.Domain {
	d := p.Potential.Domain()
	d.EquilibriumGuess = 0
	return d
}

func morse(t *testing.T) core.Potential {
	t.Helper()
	p, err := models.NewMorse(tDe, tA, tRe)
	if err != nil {
		t.Fatal(err)
	}
	return p
}

// morseV is the closed form V(r) = De[(1 − e^{−a(r−re)})² − 1] (Morse,
// Phys. Rev. 34, 57 (1929), zero at dissociation).
func morseV(r float64) float64 {
	e := 1 - math.Exp(-tA*(r-tRe))
	return tDe * (e*e - 1)
}

// matched returns the built-in forms matched to the test bond (re, De,
// k = 2De·a²), in registry order.
func matched(t *testing.T) []Curve {
	t.Helper()
	var out []Curve
	for _, m := range models.NewRegistry().Models() {
		ps, _, err := m.(core.Matcher).Match(core.Target{Re: tRe, Depth: tDe, K: 2 * tDe * tA * tA})
		if err != nil {
			t.Fatalf("%s: %v", m.Info().Key, err)
		}
		p, err := m.New(ps)
		if err != nil {
			t.Fatal(err)
		}
		out = append(out, Curve{Name: m.Info().Key, Potential: p})
	}
	return out
}

func curve(t *testing.T, cs []Curve, name string) core.Potential {
	t.Helper()
	for _, c := range cs {
		if c.Name == name {
			return c.Potential
		}
	}
	t.Fatalf("no %s", name)
	return nil
}

func near(t *testing.T, what string, got, want, tol float64) {
	t.Helper()
	if !(math.Abs(got-want) <= tol) {
		t.Errorf("%s = %.15g, want %.15g (±%g)", what, got, want, tol)
	}
}

// checkData checks that every series is as long as its x values, that x
// lies within the figure's range and that the limits are ordered.
func checkData(t *testing.T, f *Figure) {
	t.Helper()
	if err := f.check(); err != nil {
		t.Fatal(err)
	}
	for _, s := range f.Series {
		for _, x := range s.X {
			if x < f.XMin-1e-12*math.Abs(f.XMin) || x > f.XMax+1e-12*math.Abs(f.XMax) {
				t.Errorf("%s: series %q: x = %g outside [%g, %g]", f.Kind, s.Name, x, f.XMin, f.XMax)
				break
			}
		}
	}
}

func names(f *Figure) []string {
	var out []string
	for _, s := range f.Series {
		out = append(out, s.Name)
	}
	return out
}

func TestTaylorMorse(t *testing.T) {
	for _, p := range []core.Potential{morse(t), opaque{morse(t)}} {
		f, err := Taylor(p, TaylorOptions{Name: "morse"})
		if err != nil {
			t.Fatal(err)
		}
		checkData(t, f)
		want := []string{"exact V(r)", "order 0, 1 (c₁ = 0)", "order 2 (harmonic)", "order 3", "order 4"}
		if got := names(f); strings.Join(got, "|") != strings.Join(want, "|") {
			t.Fatalf("series %q, want %q", got, want)
		}
		// Default range: V − V(re) = 2De on the compression side, where
		// 1 − e^{−ax} = −√2, x = −ln(1 + √2)/a; 0.95De on the stretch
		// side, 1 − e^{−ax} = √0.95, x = −ln(1 − √0.95)/a.
		near(t, "XMin", f.XMin, tRe-math.Log(1+math.Sqrt2)/tA, 1e-9)
		near(t, "XMax", f.XMax, tRe-math.Log(1-math.Sqrt(0.95))/tA, 1e-9)
		if f.YMin < -tDe-0.2*tDe-1e-9 || f.YMax > -tDe+2.5*tDe+1e-9 || !(f.YMin < -tDe) || !(f.YMax > tDe) {
			t.Errorf("y range [%g, %g], want within [%g, %g] around the curve", f.YMin, f.YMax, -1.2*tDe, 1.5*tDe)
		}
		// Taylor coefficients of Morse about re: c0 = −De, c2 = De·a²,
		// c3 = −De·a³, c4 = 7De·a⁴/12 (expand e^{−ax} in
		// De[(1 − e^{−ax})² − 1]).
		c := []float64{-tDe, 0, tDe * tA * tA, -tDe * math.Pow(tA, 3), 7 * tDe * math.Pow(tA, 4) / 12}
		for i, r := range f.Series[0].X {
			x := r - tRe
			near(t, "exact", f.Series[0].Y[i], morseV(r), 1e-12*tDe)
			sum := 0.0
			for n := 0; n <= 4; n++ {
				sum += c[n] * math.Pow(x, float64(n))
				if n == 1 {
					continue
				}
				s := f.Series[max(n, 1)].Y[i]
				near(t, f.Series[max(n, 1)].Name, s, sum, 1e-9*(tDe+math.Abs(sum)))
			}
		}
		// The harmonic band is the potential criterion at 1 %: about
		// τ/a on each side, since V − V₂ ≈ c₃x³ against c₂x²
		// (|c₃/c₂| = a), within 5 % for the next order.
		var band *Mark
		for i := range f.Marks {
			if f.Marks[i].Kind == Band {
				band = &f.Marks[i]
			}
		}
		if band == nil {
			t.Fatal("no validity band")
		}
		near(t, "band compression", tRe-band.X0, 0.01/tA, 0.05*0.01/tA)
		near(t, "band stretch", band.X1-tRe, 0.01/tA, 0.05*0.01/tA)
		if len(f.Notes) != 2 {
			t.Errorf("notes %q, want the two criteria", f.Notes)
		}
	}
}

func TestTaylorEveryForm(t *testing.T) {
	for _, c := range matched(t) {
		f, err := Taylor(opaque{c.Potential}, TaylorOptions{Name: c.Name, Order: 3})
		if err != nil {
			t.Fatalf("%s: %v", c.Name, err)
		}
		checkData(t, f)
		if len(f.Series) != 4 {
			t.Errorf("%s: %d series, want 4 (exact, orders 0/1, 2, 3)", c.Name, len(f.Series))
		}
		var buf bytes.Buffer
		if err := f.Render(&buf, SVG); err != nil {
			t.Fatalf("%s: %v", c.Name, err)
		}
	}
}

func TestTaylorBuckinghamBarrier(t *testing.T) {
	p := curve(t, matched(t), "buckingham")
	d := p.Domain()
	f, err := Taylor(p, TaylorOptions{Name: "buckingham"})
	if err != nil {
		t.Fatal(err)
	}
	checkData(t, f)
	if !(f.XMin < d.Min) {
		t.Fatalf("range starts at %g Å, above the barrier at %g Å", f.XMin, d.Min)
	}
	hatched := false
	for _, m := range f.Marks {
		if m.Kind == Hatch && m.X0 == f.XMin && m.X1 == d.Min {
			hatched = true
		}
	}
	if !hatched {
		t.Errorf("no hatched region from %g to %g Å in %+v", f.XMin, d.Min, f.Marks)
	}
	ex := f.Series[0]
	for i, r := range ex.X {
		if got := math.IsNaN(ex.Y[i]); got != (r <= d.Min) {
			t.Fatalf("exact at r = %g Å (barrier %g Å): NaN = %v", r, d.Min, got)
		}
	}
	// The truncations stay defined beyond the barrier.
	for _, s := range f.Series[1:] {
		if math.IsNaN(s.Y[0]) {
			t.Errorf("%s undefined at %g Å", s.Name, s.X[0])
		}
	}
}

func TestTaylorRange(t *testing.T) {
	f, err := Taylor(morse(t), TaylorOptions{Order: 2, RMin: 1.0, RMax: 1.5})
	if err != nil {
		t.Fatal(err)
	}
	checkData(t, f)
	if f.XMin != 1.0 || f.XMax != 1.5 || len(f.Series) != 3 {
		t.Errorf("range [%g, %g] with %d series, want [1, 1.5] with 3", f.XMin, f.XMax, len(f.Series))
	}
	// The energy axis follows the exact curve over the range, within
	// 8 % margins: from V(re) to V(1.0).
	span := morseV(1.0) + tDe
	near(t, "YMin", f.YMin, -tDe-0.08*span, 1e-9)
	near(t, "YMax", f.YMax, morseV(1.0)+0.08*span, 1e-9)
}

// lowOrder is a potential with derivatives up to order 3 only.
type lowOrder struct{ core.Potential }

func (lowOrder) MaxOrder() int { return 3 }

func TestTaylorErrors(t *testing.T) {
	p := morse(t)
	bk := curve(t, matched(t), "buckingham")
	for _, tc := range []struct {
		name string
		p    core.Potential
		o    TaylorOptions
		want error
	}{
		{"order 1", p, TaylorOptions{Order: 1}, core.ErrParam},
		{"order 9", p, TaylorOptions{Order: 9}, core.ErrParam},
		{"order beyond the form", lowOrder{p}, TaylorOptions{Order: 4}, core.ErrOrder},
		{"empty range", p, TaylorOptions{RMin: 2, RMax: 2}, core.ErrParam},
		{"reversed range", p, TaylorOptions{RMin: 2, RMax: 1}, core.ErrParam},
		{"negative start", p, TaylorOptions{RMin: -1, RMax: 1}, core.ErrParam},
		{"NaN", p, TaylorOptions{RMin: math.NaN(), RMax: 1}, core.ErrParam},
		{"below the barrier", bk, TaylorOptions{RMin: 0.1, RMax: 0.5}, core.ErrDomain},
		{"tolerance", p, TaylorOptions{Tolerance: 2}, core.ErrParam},
	} {
		_, err := Taylor(tc.p, tc.o)
		if !errors.Is(err, tc.want) {
			t.Errorf("%s: error %v, want %v", tc.name, err, tc.want)
		}
	}
	// Order 3 of a form with derivatives up to 3 is fine.
	if _, err := Taylor(lowOrder{p}, TaylorOptions{}); err != nil {
		t.Errorf("default order of a form with MaxOrder 3: %v", err)
	}
}

func TestPeriodMorse(t *testing.T) {
	// T0 = 2π√(μ/k), k = 2De·a², in units of √(u·Å²/eV).
	t0 := 2 * math.Pi * math.Sqrt(tMu/(2*tDe*tA*tA)) * timeUnit
	for _, energyAxis := range []bool{false, true} {
		f, err := Period(opaque{morse(t)}, PeriodOptions{Name: "morse", Mu: tMu, EnergyAxis: energyAxis, Measure: true, Method: motion.RK4, Periods: 3})
		if err != nil {
			t.Fatal(err)
		}
		checkData(t, f)
		if len(f.Series) != 4 {
			t.Fatalf("series %q, want exact, harmonic, perturbative, measured", names(f))
		}
		// Default amplitudes: up to the stretch where E = 0.9De,
		// 1 − e^{−ax} = √0.9.
		xmax := -math.Log(1-math.Sqrt(0.9)) / tA
		if energyAxis {
			xmax = 0.9 * tDe
		}
		near(t, "XMax", f.XMax, xmax, 1e-9*xmax)
		if f.XMin != 0 {
			t.Errorf("XMin = %g, want 0", f.XMin)
		}
		ex, harm, pert, meas := f.Series[0], f.Series[1], f.Series[2], f.Series[3]
		for i, x := range ex.X {
			E := x
			if !energyAxis {
				E = morseV(tRe+x) + tDe
			}
			// Classical Morse oscillator: ω(E) = ω0√(1 − E/De), so
			// T(E) = T0/√(1 − E/De) (standard result).
			near(t, "exact T", ex.Y[i], t0/math.Sqrt(1-E/tDe), 1e-9*ex.Y[i])
			near(t, "harmonic T", harm.Y[i], t0, 1e-12*t0)
			// Second order: δ = −E/(2De) for Morse, T = T0/(1 + δ).
			near(t, "perturbative T", pert.Y[i], t0/(1-E/(2*tDe)), 1e-9*t0)
		}
		if len(meas.X) != DefaultAmplitudes {
			t.Fatalf("%d measured points, want %d", len(meas.X), DefaultAmplitudes)
		}
		for i, x := range meas.X {
			E := x
			if !energyAxis {
				E = morseV(tRe+x) + tDe
			}
			// RK4 at 200 steps per period: within 1e-6 (package motion).
			near(t, "measured T", meas.Y[i], t0/math.Sqrt(1-E/tDe), 1e-6*meas.Y[i])
		}
		if f.YMin != 0 || !(f.YMax > ex.Y[len(ex.Y)-1]) {
			t.Errorf("y range [%g, %g], want from 0 above %g", f.YMin, f.YMax, ex.Y[len(ex.Y)-1])
		}
	}
}

func TestPeriodAmplitudes(t *testing.T) {
	f, err := Period(morse(t), PeriodOptions{Mu: tMu, Amplitudes: []float64{-0.3, 0.2, 0.5}})
	if err != nil {
		t.Fatal(err)
	}
	checkData(t, f)
	if len(f.Series) != 3 || f.XMin != -0.3 || f.XMax != 0.5 {
		t.Errorf("%d series over [%g, %g], want 3 over [−0.3, 0.5]", len(f.Series), f.XMin, f.XMax)
	}
	// A harmonic well: a flat period, shown from 0.
	h, err := models.NewHarmonic(30, tRe)
	if err != nil {
		t.Fatal(err)
	}
	f, err = Period(h, PeriodOptions{Mu: tMu})
	if err != nil {
		t.Fatal(err)
	}
	checkData(t, f)
	if f.YMin != 0 || !(f.YMax > f.Series[0].Y[0]) || f.XMax != tRe/2 {
		t.Errorf("harmonic: x [%g, %g], y [%g, %g]", f.XMin, f.XMax, f.YMin, f.YMax)
	}
}

func TestPeriodErrors(t *testing.T) {
	p := morse(t)
	for _, tc := range []struct {
		name string
		o    PeriodOptions
		want error
	}{
		{"no mass", PeriodOptions{}, core.ErrParam},
		{"negative mass", PeriodOptions{Mu: -1}, core.ErrParam},
		{"zero amplitude", PeriodOptions{Mu: 1, Amplitudes: []float64{0}}, core.ErrParam},
		{"dissociates", PeriodOptions{Mu: 1, Amplitudes: []float64{0.1, 50}}, core.ErrDomain},
		{"r ≤ 0", PeriodOptions{Mu: 1, Amplitudes: []float64{-2}}, core.ErrDomain},
		{"negative periods", PeriodOptions{Mu: 1, Periods: -1}, core.ErrParam},
	} {
		_, err := Period(p, tc.o)
		if !errors.Is(err, tc.want) {
			t.Errorf("%s: error %v, want %v", tc.name, err, tc.want)
		}
	}
}

func TestCompare(t *testing.T) {
	cs := matched(t)
	for i := range cs {
		cs[i].Potential = opaque{cs[i].Potential}
	}
	f, err := Compare(cs, CompareOptions{})
	if err != nil {
		t.Fatal(err)
	}
	checkData(t, f)
	if len(f.Series) != 4 {
		t.Fatalf("series %q, want 4", names(f))
	}
	for _, s := range f.Series {
		if s.Role != Peer {
			t.Errorf("%s: role %v", s.Name, s.Role)
		}
	}
	for i, r := range f.Series[0].X {
		near(t, "morse", f.Series[0].Y[i], morseV(r), 1e-12*tDe)
	}

	// Reduced units: (V − V(∞))/De against r/re; the harmonic form has no
	// depth and is left out.
	f, err = Compare(cs, CompareOptions{Reduced: true})
	if err != nil {
		t.Fatal(err)
	}
	checkData(t, f)
	if got := strings.Join(names(f), ","); got != "morse,lennard-jones,buckingham" {
		t.Fatalf("reduced series %s", got)
	}
	if len(f.Notes) == 0 || !strings.Contains(f.Notes[0], "harmonic") {
		t.Errorf("notes %q: want the harmonic form's omission", f.Notes)
	}
	for i, x := range f.Series[0].X {
		// Morse: (1 − e^{−a·re(x − 1)})² − 1.
		e := 1 - math.Exp(-tA*tRe*(x-1))
		near(t, "reduced morse", f.Series[0].Y[i], e*e-1, 1e-12)
		// Lennard-Jones in units of r_min: x⁻¹² − 2x⁻⁶.
		near(t, "reduced lj", f.Series[1].Y[i], math.Pow(x, -12)-2*math.Pow(x, -6), 1e-12*math.Max(1, math.Pow(x, -12)))
	}
	if f.YMin < -1.2-1e-12 || f.YMax > 1.5+1e-12 {
		t.Errorf("reduced y range [%g, %g], want within [−1.2, 1.5]", f.YMin, f.YMax)
	}
	// From the minimum: 0 at r = re, reduced or not.
	f, err = Compare(cs[:1], CompareOptions{Reduced: true, FromMinimum: true})
	if err != nil {
		t.Fatal(err)
	}
	for i, x := range f.Series[0].X {
		e := 1 - math.Exp(-tA*tRe*(x-1))
		near(t, "(V − V(re))/De", f.Series[0].Y[i], e*e, 1e-12)
	}

	if _, err := Compare(nil, CompareOptions{}); !errors.Is(err, core.ErrParam) {
		t.Errorf("no forms: %v", err)
	}
	if _, err := Compare(cs[3:], CompareOptions{Reduced: true}); !errors.Is(err, core.ErrParam) {
		t.Errorf("reduced harmonic only: %v", err)
	}
}

func TestMotion(t *testing.T) {
	h, err := models.NewHarmonic(30, tRe)
	if err != nil {
		t.Fatal(err)
	}
	for _, p := range []core.Potential{morse(t), h} {
		f, err := Motion(opaque{p}, MotionOptions{Name: "x", Mu: tMu, Amplitude: 0.3})
		if err != nil {
			t.Fatal(err)
		}
		checkData(t, f)
		if len(f.Series) != 2 {
			t.Fatalf("series %q", names(f))
		}
		w, err := core.AnalyzeWell(p, core.WellSettings{})
		if err != nil {
			t.Fatal(err)
		}
		// ω0 = √(k/μ) in rad per √(u·Å²/eV).
		omega := math.Sqrt(w.K/tMu) / timeUnit
		hs := f.Series[1]
		for i, tt := range hs.X {
			near(t, "harmonic x", hs.Y[i], 0.3*math.Cos(omega*tt), 1e-12)
		}
		// Three periods from the stretched start.
		if n := f.XMax / (2 * math.Pi / omega); n < 2.5 {
			t.Errorf("the run lasted %g harmonic periods", n)
		}
		if p == core.Potential(h) {
			// The harmonic motion is exactly x0·cos(ω0 t).
			in := f.Series[0]
			for i, tt := range in.X {
				near(t, "integrated x, harmonic well", in.Y[i], 0.3*math.Cos(omega*tt), 1e-7)
			}
		}
	}
	if _, err := Motion(morse(t), MotionOptions{Mu: tMu, Amplitude: 10}); !errors.Is(err, core.ErrDomain) {
		t.Errorf("amplitude beyond the depth: %v", err)
	}
	if _, err := Motion(morse(t), MotionOptions{Mu: 0, Amplitude: 0.1}); !errors.Is(err, core.ErrParam) {
		t.Errorf("no mass: %v", err)
	}
}

func testFigure() *Figure {
	return &Figure{
		Kind: "test", Title: "test\nsecond line", XLabel: "x [Å]", YLabel: "y [eV]",
		XMin: 0, XMax: 1, YMin: -1, YMax: 1,
		Series: []Series{
			{Name: "reference", Role: Reference, X: []float64{0, 0.5, 1}, Y: []float64{0, 2, 0}},
			{Name: "model", Role: Approximation, X: []float64{0, 0.5, 1}, Y: []float64{-0.5, math.NaN(), 0.5}},
			{Name: "points", Role: Measured, X: []float64{0.2, 0.8}, Y: []float64{0.1, 5}},
		},
		Marks: []Mark{{Kind: Band, X0: 0.4, X1: 0.6, Label: "band"}, {Kind: Hatch, X0: 0, X1: 0.1, Label: "hatch"}, {Kind: VLine, X0: 0.7, Label: "line"}},
	}
}

func TestRender(t *testing.T) {
	f := testFigure()
	var buf bytes.Buffer
	if err := f.Render(&buf, PNG); err != nil {
		t.Fatal(err)
	}
	img, err := png.Decode(&buf)
	if err != nil {
		t.Fatal(err)
	}
	if b := img.Bounds(); b.Dx() != 1500 || b.Dy() != 750 {
		t.Errorf("PNG %d×%d, want 1500×750 (10×5 in at 150 dpi)", b.Dx(), b.Dy())
	}
	buf.Reset()
	if err := f.Render(&buf, SVG); err != nil {
		t.Fatal(err)
	}
	checkSVG(t, buf.Bytes())
	buf.Reset()
	if err := f.Render(&buf, PDF); err != nil {
		t.Fatal(err)
	}
	if !bytes.HasPrefix(buf.Bytes(), []byte("%PDF-")) {
		t.Errorf("PDF starts with %q", buf.Bytes()[:8])
	}
	if err := f.Render(&buf, "gif"); !errors.Is(err, ErrFormat) {
		t.Errorf("gif: %v", err)
	}
	bad := *f
	bad.XMax = bad.XMin
	if err := bad.Render(&buf, PNG); !errors.Is(err, ErrFigure) {
		t.Errorf("empty x range: %v", err)
	}
}

// checkSVG parses an SVG document and checks its root element and that it
// holds drawn paths.
func checkSVG(t *testing.T, data []byte) {
	t.Helper()
	dec := xml.NewDecoder(bytes.NewReader(data))
	root, paths := "", 0
	for {
		tok, err := dec.Token()
		if err == io.EOF {
			break
		}
		if err != nil {
			t.Fatalf("SVG does not parse: %v", err)
		}
		if se, ok := tok.(xml.StartElement); ok {
			if root == "" {
				root = se.Name.Local
			}
			if se.Name.Local == "path" {
				paths++
			}
		}
	}
	if root != "svg" || paths < 10 {
		t.Errorf("SVG root %q with %d paths", root, paths)
	}
}

func TestWriteFile(t *testing.T) {
	dir := t.TempDir()
	f := testFigure()
	for _, name := range []string{"a.png", "b.SVG", "c.pdf"} {
		path := filepath.Join(dir, name)
		if err := f.WriteFile(path); err != nil {
			t.Fatal(err)
		}
		st, err := os.Stat(path)
		if err != nil || st.Size() < 1000 {
			t.Errorf("%s: %v, %d bytes", name, err, st.Size())
		}
	}
	// Unknown extension, missing directory, invalid figure: an error,
	// nothing written, an existing file left as it was.
	old := filepath.Join(dir, "old.png")
	if err := os.WriteFile(old, []byte("keep"), 0o644); err != nil {
		t.Fatal(err)
	}
	bad := *f
	bad.Series = nil
	for _, tc := range []struct {
		f    *Figure
		path string
		want error
	}{
		{f, filepath.Join(dir, "d.gif"), ErrFormat},
		{f, filepath.Join(dir, "noext"), ErrFormat},
		{f, filepath.Join(dir, "missing", "e.png"), os.ErrNotExist},
		{&bad, old, ErrFigure},
	} {
		if err := tc.f.WriteFile(tc.path); !errors.Is(err, tc.want) {
			t.Errorf("%s: error %v, want %v", tc.path, err, tc.want)
		}
	}
	if b, _ := os.ReadFile(old); string(b) != "keep" {
		t.Errorf("old.png overwritten: %q", b)
	}
	entries, _ := os.ReadDir(dir)
	var got []string
	for _, e := range entries {
		got = append(got, e.Name())
	}
	if strings.Join(got, ",") != "a.png,b.SVG,c.pdf,old.png" {
		t.Errorf("directory holds %q", got)
	}
}

func TestClip(t *testing.T) {
	f := &Figure{XMin: 0, XMax: 10, YMin: 0, YMax: 1}
	s := Series{X: []float64{0, 1, 2, 3, 4, 5}, Y: []float64{0.5, 0.5, 3, 0.5, math.NaN(), 0.5}}
	got := f.clip(s)
	// (0,.5)–(1,.5)–up to y = 1 at x = 1 + 0.5/2.5; back in at
	// x = 3 − 0.5/2.5; then the NaN breaks the line and the last point
	// is alone.
	if len(got) != 2 {
		t.Fatalf("%d pieces: %v", len(got), got)
	}
	near(t, "exit x", got[0][len(got[0])-1].X, 1.2, 1e-12)
	near(t, "exit y", got[0][len(got[0])-1].Y, 1, 1e-12)
	near(t, "entry x", got[1][0].X, 2.8, 1e-12)
	if len(got[1]) != 2 {
		t.Errorf("second piece %v", got[1])
	}
}

func TestTicks(t *testing.T) {
	var labels []string
	for _, tk := range (niceTicks{}).Ticks(-1, 1) {
		if tk.Label != "" {
			labels = append(labels, tk.Label)
		}
	}
	if got := strings.Join(labels, " "); got != "−1.0 −0.5 0.0 0.5 1.0" {
		t.Errorf("ticks %s", got)
	}
	labels = nil
	for _, tk := range (niceTicks{}).Ticks(0, 130) {
		if tk.Label != "" {
			labels = append(labels, tk.Label)
		}
	}
	if got := strings.Join(labels, " "); got != "0 25 50 75 100 125" {
		t.Errorf("ticks %s", got)
	}
}

func TestStyles(t *testing.T) {
	got := styles([]Series{{Role: Reference}, {Role: Approximation}, {Role: Measured}, {Role: Peer}, {Role: Peer}})
	if want := []int{0, 1, 2, 1, 2}; fmt.Sprint(got) != fmt.Sprint(want) {
		t.Errorf("styles %v, want %v", got, want)
	}
	// Every style but the reference differs from every other in colour
	// and dash pattern (markers repeat after seven).
	for i := 1; i < numStyles; i++ {
		for j := 1; j < i; j++ {
			a, b := styleAt(i), styleAt(j)
			if a.color == b.color || fmt.Sprint(a.dashes) == fmt.Sprint(b.dashes) {
				t.Errorf("styles %d and %d share a cue", i, j)
			}
		}
	}
	// Black solid is the reference's alone, however many series there are
	// (issue 17: the order-8 truncation was drawn like the exact V).
	ss := make([]Series, 40)
	for i := range ss {
		ss[i].Role = []Role{Approximation, Peer, Measured}[i%3]
	}
	for i, k := range styles(ss) {
		st := styleAt(k)
		if st.color == black || st.dashes == nil {
			t.Errorf("series %d (%v) gets style %d: black %v, solid %v", i, ss[i].Role, k, st.color == black, st.dashes == nil)
		}
	}
}
