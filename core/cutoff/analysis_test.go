package cutoff_test

import (
	"math"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/cutoff"
	"github.com/pairwell/pairwell/models"
)

func analyze(t *testing.T, spec string, s cutoff.AnalysisSettings) cutoff.Report {
	inst, err := models.NewRegistry().Build(spec)
	require.NoError(t, err)
	r, err := cutoff.Analyze(inst, s)
	require.NoError(t, err)
	return r
}

func scheme(t *testing.T, r cutoff.Report, name string) cutoff.SchemeReport {
	for _, s := range r.Schemes {
		if s.Scheme == name {
			return s
		}
	}
	t.Fatalf("no scheme %s", name)
	return cutoff.SchemeReport{}
}

// TestAnalyzeShifts: the shift of re, depth and k under the force shift and
// the shift against mpmath (testdata/reference.py, 40 digits: the root of
// V′(r) = V′(r_c), the depth −V_fs(re), V″ there; output in
// testdata/reference.txt).
func TestAnalyzeShifts(t *testing.T) {
	r := analyze(t, "lj:epsilon=120K,sigma=3.4", cutoff.AnalysisSettings{Cutoff: 8.5})
	fs := scheme(t, r, "force-shift")
	assert.InEpsilon(t, 3.818706238090221844701072139238588502034, fs.Well.Re, 1e-14)
	assert.InEpsilon(t, 0.002335273838353707827059770329378146843789, fs.ReShift, 1e-9)
	assert.InEpsilon(t, -0.0007241329913105969809876034562474905068196, *fs.DepthShift, 1e-10)
	assert.InEpsilon(t, -0.000653350922867808896227154234591406847218, fs.KShift, 1e-7)
	assert.InEpsilon(t, 0.05046601584643667403742136341418734198861, fs.Well.K, 1e-11)
	sh := scheme(t, r, "shift")
	assert.InEpsilon(t, 0.01017207020810894738838139865170446618809, float64(sh.Well.Depth), 1e-13)
	assert.Zero(t, sh.ReShift)
	assert.Zero(t, sh.KShift)
	// Check values of the jumps: truncation jumps by −V(r_c) in energy and
	// V′(r_c) in force; the force shift and both switches by nothing.
	tr := scheme(t, r, "truncate")
	assert.Equal(t, -r.VCut, tr.EnergyJump)
	assert.Equal(t, r.DVCut, tr.ForceJump)
	assert.Equal(t, 0.0, sh.EnergyJump)
	for _, name := range []string{"force-shift", "switch-c1", "switch-c2"} {
		s := scheme(t, r, name)
		assert.InDelta(t, 0, s.EnergyJump, 1e-20, name)
		assert.InDelta(t, 0, s.ForceJump, 1e-20, name)
	}
	assert.InDelta(t, 0, *scheme(t, r, "switch-c2").CurvatureJump, 1e-18, "C²")
	assert.Greater(t, math.Abs(*scheme(t, r, "switch-c1").CurvatureJump), 1e-4, "C¹ only")
}

// TestAnalyzeErrors: the largest errors. Shift: |V(r_c)| everywhere;
// force shift: |V(r_c) + (r − r_c)V′(r_c)|, largest at the start of the
// scan, and |V′(r_c)| in force; truncation: none; switches: against a brute
// scan of 200 000 points, never above the reported maximum and within 1e-9
// of it.
func TestAnalyzeErrors(t *testing.T) {
	spec := "lj:epsilon=120K,sigma=3.4"
	r := analyze(t, spec, cutoff.AnalysisSettings{Cutoff: 8.5, SwitchOn: 7})
	from := r.Scan.From
	tr := scheme(t, r, "truncate")
	assert.Zero(t, tr.MaxEnergyError)
	assert.Nil(t, tr.MaxEnergyErrorR)
	sh := scheme(t, r, "shift")
	assert.InEpsilon(t, math.Abs(r.VCut), sh.MaxEnergyError, 1e-12)
	fs := scheme(t, r, "force-shift")
	assert.InEpsilon(t, math.Abs(r.VCut+(from-8.5)*r.DVCut), fs.MaxEnergyError, 1e-12)
	assert.Equal(t, from, *fs.MaxEnergyErrorR)
	assert.InEpsilon(t, math.Abs(r.DVCut), fs.MaxForceError, 1e-9)

	inst, err := models.NewRegistry().Build(spec)
	require.NoError(t, err)
	for _, name := range []string{"switch-c1", "switch-c2"} {
		row := scheme(t, r, name)
		sc, err := cutoff.ParseScheme(name)
		require.NoError(t, err)
		c, err := cutoff.New(inst.Potential, cutoff.Settings{Scheme: sc, Cutoff: 8.5, SwitchOn: 7})
		require.NoError(t, err)
		const n = 200000
		rs := make([]float64, n)
		for i := range rs {
			rs[i] = 7 + 1.5*float64(i)/n
		}
		b, cc := make([]float64, 2*n), make([]float64, 2*n)
		require.NoError(t, inst.Potential.Taylor(1, rs, b))
		require.NoError(t, c.Taylor(1, rs, cc))
		var eMax, fMax float64
		for i := range rs {
			eMax = math.Max(eMax, math.Abs(cc[2*i]-b[2*i]))
			fMax = math.Max(fMax, math.Abs(cc[2*i+1]-b[2*i+1]))
		}
		assert.LessOrEqual(t, eMax, row.MaxEnergyError*(1+1e-15), name)
		assert.LessOrEqual(t, fMax, row.MaxForceError*(1+1e-15), name)
		assert.InEpsilon(t, eMax, row.MaxEnergyError, 1e-9, name)
		assert.InEpsilon(t, fMax, row.MaxForceError, 1e-9, name)
		assert.Greater(t, *row.MaxEnergyErrorR, 7.0)
	}
}

// TestLennardJonesTail: the closed form (Allen & Tildesley 2017, §2.8)
// against mpmath quadrature of the definitions u = 2πρ∫r²V, p =
// −(2/3)πρ²∫r³V′ (testdata/reference.py), and pairwell's own quadrature
// against the closed form to 1e-10 relative at several cutoffs, with an
// accuracy estimate that is not below the true error.
func TestLennardJonesTail(t *testing.T) {
	eps := 120 * 1.380649e-23 / 1.602176634e-19 // 120 K·k_B in eV (SI 2019)
	lj := cutoff.LennardJonesTail(eps, 3.4, 8.5, 0.02)
	assert.InEpsilon(t, -0.004352372913347012608507448747456370556452, lj.Energy, 1e-14)
	assert.InEpsilon(t, -0.0001738568939610201007540088497125401759437, lj.Pressure, 1e-14)
	assert.InEpsilon(t, lj.Pressure*1.602176634e6, lj.PressureBar, 1e-15) // 1 eV/Å³ = 1.602176634e6 bar
	p, err := models.LennardJones{}.New([]float64{eps, 3.4})
	require.NoError(t, err)
	for _, rc := range []float64{3.5, 5, 8.5, 12, 30} {
		want := cutoff.LennardJonesTail(eps, 3.4, rc, 0.02)
		got, err := cutoff.TailCorrections(p, rc, 0.02)
		require.NoError(t, err)
		for _, q := range [][2]float64{{want.Energy, got.Energy}, {want.Pressure, got.Pressure}} {
			rel := math.Abs(q[1]/q[0] - 1)
			assert.Less(t, rel, 1e-10, "rc = %g", rc)
			assert.GreaterOrEqual(t, got.Accuracy, rel, "rc = %g: estimate below the true error", rc)
		}
		assert.Less(t, got.Accuracy, 1e-10)
	}
}

// TestTailQuadrature: Morse by quadrature against mpmath
// (testdata/reference.py); the analysis uses the closed form for the
// built-in Lennard-Jones and quadrature otherwise; tails that do not decay
// fast enough are refused.
func TestTailQuadrature(t *testing.T) {
	m, err := models.Morse{}.New([]float64{4.6, 1.87, 1.27})
	require.NoError(t, err)
	got, err := cutoff.TailCorrections(m, 6, 0.05)
	require.NoError(t, err)
	assert.InEpsilon(t, -0.009573295691177343102604652139700247219776, got.Energy, 1e-12)
	assert.InEpsilon(t, -0.001977765425735688535552435630187253597628, got.Pressure, 1e-12)
	assert.Equal(t, "quadrature", got.Method)

	r := analyze(t, "lj:epsilon=120K,sigma=3.4", cutoff.AnalysisSettings{Cutoff: 8.5, Density: 0.02})
	assert.Equal(t, "analytic (Lennard-Jones)", r.Tail.Method)
	r = analyze(t, "morse:De=4.6,a=1.87,re=1.27", cutoff.AnalysisSettings{Cutoff: 6, Density: 0.05})
	assert.Equal(t, "quadrature", r.Tail.Method)
	assert.InEpsilon(t, got.Energy, r.Tail.Energy, 1e-15)

	h, err := models.Harmonic{}.New([]float64{30, 1.2})
	require.NoError(t, err)
	_, err = cutoff.TailCorrections(h, 3, 0.02)
	assert.ErrorIs(t, err, core.ErrDomain)
	for _, n := range []float64{3, 2.5, 1} {
		_, err = cutoff.TailCorrections(power{n}, 5, 0.02)
		assert.ErrorIs(t, err, core.ErrDomain, "r^-%g", n)
		assert.ErrorContains(t, err, "diverges")
	}
	got, err = cutoff.TailCorrections(power{4}, 5, 0.02)
	require.NoError(t, err)
	// 2πρ∫_5^∞ r²(−r⁻⁴) dr = −2πρ/5 (by hand).
	assert.InEpsilon(t, -2*math.Pi*0.02/5, got.Energy, 1e-12)
	_, err = cutoff.TailCorrections(m, 0, 0.05)
	assert.ErrorIs(t, err, core.ErrParam)
}

// power is V = −r⁻ⁿ (orders 0 and 1), for tails that decay slowly.
type power struct{ n float64 }

func (p power) Taylor(k int, r, dst []float64) error {
	if err := core.CheckTaylor(k, 1, len(r), len(dst)); err != nil {
		return err
	}
	for i, x := range r {
		dst[i*(k+1)] = -math.Pow(x, -p.n)
		if k == 1 {
			dst[i*2+1] = p.n * math.Pow(x, -p.n-1)
		}
	}
	return nil
}
func (power) Domain() core.Domain { return core.Domain{Max: math.Inf(1)} }
func (power) MaxOrder() int       { return 1 }
