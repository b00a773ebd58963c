package cutoff_test

import (
	"math"
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"github.com/pairwell/pairwell/conformance"
	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/cutoff"
	"github.com/pairwell/pairwell/core/jet"
	"github.com/pairwell/pairwell/models"
)

// Invented, realistic parameter sets: an argon-like Lennard-Jones pair
// (ε = 120 K·k_B, σ = 3.4 Å; k_B = 8.617333262e-5 eV/K, CODATA 2018) and an
// HCl-like Morse bond.
var (
	ljParams    = []float64{120 * 8.617333262e-5, 3.4}
	morseParams = []float64{4.6, 1.87, 1.27}
)

func ljBare(t testing.TB) core.Potential {
	p, err := models.LennardJones{}.New(ljParams)
	require.NoError(t, err)
	return p
}

func cut(t testing.TB, p core.Potential, s cutoff.Settings) *cutoff.Potential {
	c, err := cutoff.New(p, s)
	require.NoError(t, err, "%+v", s)
	return c
}

// allSchemes are the settings of every scheme for the LJ pair at rc = 8.5 Å.
func allSchemes(rc, on float64) []cutoff.Settings {
	var out []cutoff.Settings
	for _, sc := range cutoff.Schemes() {
		s := cutoff.Settings{Scheme: sc, Cutoff: rc}
		if sc.Switching() {
			s.SwitchOn = on
		}
		out = append(out, s)
	}
	return out
}

// TestSwitchAgainstJets: the switched coefficients equal the Cauchy
// product of the jets of S and V formed independently with core/jet's tape
// (S built from x = (r − on)/(rc − on) by tape arithmetic), orders 0…10,
// inside and outside the switching region; zero beyond rc.
func TestSwitchAgainstJets(t *testing.T) {
	bare := ljBare(t)
	const n = 10
	for _, s := range allSchemes(8.5, 7)[3:] {
		c := cut(t, bare, s)
		for _, r := range []float64{3.2, 6.99, 7, 7.0001, 7.5, 8.2, 8.4999, 8.5, 9, 100} {
			got := make([]float64, n+1)
			require.NoError(t, c.Taylor(n, []float64{r}, got))
			want := make([]float64, n+1)
			switch {
			case r >= s.Cutoff:
				// zero
			case r <= s.SwitchOn:
				require.NoError(t, bare.Taylor(n, []float64{r}, want))
			default:
				tp := jet.NewTape(n, 1)
				x := tp.Affine(tp.Var([]float64{r}), 1/(s.Cutoff-s.SwitchOn), -s.SwitchOn/(s.Cutoff-s.SwitchOn))
				x2 := tp.Mul(x, x)
				var step jet.Jet
				if s.Scheme == cutoff.Switch1 {
					step = tp.Mul(x2, tp.AddConst(tp.Scale(x, -2), 3)) // 3x² − 2x³
				} else {
					inner := tp.AddConst(tp.Mul(x, tp.AddConst(tp.Scale(x, 6), -15)), 10) // 10 − 15x + 6x²
					step = tp.Mul(tp.Mul(x2, x), inner)
				}
				sw := tp.AddConst(tp.Neg(step), 1)
				v := make([]float64, n+1)
				require.NoError(t, bare.Taylor(n, []float64{r}, v))
				prod := tp.Mul(sw, tp.FromCoeffs(v))
				for k := range want {
					want[k] = prod.Coeff(k, 0)
				}
			}
			for k := range want {
				scale := 0.0
				for _, w := range want {
					scale = math.Max(scale, math.Abs(w))
				}
				assert.InDelta(t, want[k], got[k], 1e-13*scale+1e-300, "%s r=%g k=%d", s.Scheme, r, k)
			}
		}
	}
}

// TestForceShiftCheckValues: issue 16's check values for the force shift —
// the shifted force is continuous and zero at r_c, and the energy error at
// re is (re − r_c)V′(r_c) + V(r_c) exactly (to rounding).
func TestForceShiftCheckValues(t *testing.T) {
	bare := ljBare(t)
	rc := 8.5
	c := cut(t, bare, cutoff.Settings{Scheme: cutoff.ForceShift, Cutoff: rc})
	var left [3]float64
	require.NoError(t, c.Piece(2, rc, left[:]))
	assert.Zero(t, left[0], "V_fs(rc⁻)")
	assert.Zero(t, left[1], "V′_fs(rc⁻) = −F(rc⁻)")
	var right [3]float64
	require.NoError(t, c.Taylor(2, []float64{rc}, right[:]))
	assert.Equal(t, [3]float64{}, right, "rc and beyond")

	// re of the bare LJ: 2^(1/6)σ (Lennard-Jones 1924).
	re := math.Pow(2, 1.0/6) * ljParams[1]
	v, err := core.Value(bare, re)
	require.NoError(t, err)
	vfs, err := core.Value(c, re)
	require.NoError(t, err)
	vc, dvc := c.AtCutoff()
	// V(rc), V′(rc) of LJ in closed form: 4ε[(σ/rc)¹² − (σ/rc)⁶],
	// (24ε/rc)[(σ/rc)⁶ − 2(σ/rc)¹²].
	sr6 := math.Pow(ljParams[1]/rc, 6)
	assert.InEpsilon(t, 4*ljParams[0]*(sr6*sr6-sr6), vc, 1e-14)
	assert.InEpsilon(t, 24*ljParams[0]/rc*(sr6-2*sr6*sr6), dvc, 1e-14)
	want := (re-rc)*dvc + vc
	assert.InDelta(t, want, v-vfs, 4*math.Abs(v)*0x1p-52, "energy error at re")
}

// TestSwitchContinuity: S, S′, S″ at r_on and r_c from the stated
// polynomials (derivatives by hand): the cubic S = 1 − (3x² − 2x³) has
// S = 1, S′ = 0 at r_on and S = 0, S′ = 0 at r_c but S″ = −6h² and +6h²
// there (C¹); the quintic also has S″ = 0 at both ends (C²), with S‴ =
// −60h³ at both. h = 1/(r_c − r_on). S is read as the cut form of the
// constant V = 1.
func TestSwitchContinuity(t *testing.T) {
	on, rc := 7.0, 8.5
	h := 1 / (rc - on)
	tests := []struct {
		scheme       cutoff.Scheme
		atOn, atCut  [4]float64 // S, S′, S″/2, S‴/6 from inside the region
		continuousTo int        // highest order continuous at both ends
	}{
		{cutoff.Switch1, [4]float64{1, 0, -3 * h * h, 2 * h * h * h}, [4]float64{0, 0, 3 * h * h, 2 * h * h * h}, 1},
		{cutoff.Switch2, [4]float64{1, 0, 0, -10 * h * h * h}, [4]float64{0, 0, 0, -10 * h * h * h}, 2},
	}
	for _, tt := range tests {
		c := cut(t, constant{}, cutoff.Settings{Scheme: tt.scheme, Cutoff: rc, SwitchOn: on})
		var in, out [4]float64
		require.NoError(t, c.Piece(3, on, in[:]))
		require.NoError(t, c.Taylor(3, []float64{on}, out[:])) // r ≤ on: S = 1
		for k := range 4 {
			assert.InDelta(t, tt.atOn[k], in[k], 1e-13, "%s at r_on, c_%d", tt.scheme, k)
		}
		require.NoError(t, c.Piece(3, rc, in[:]))
		for k := range 4 {
			assert.InDelta(t, tt.atCut[k], in[k], 1e-13, "%s at r_c, c_%d", tt.scheme, k)
		}
		// Continuity across r_on: the coefficients just inside agree with
		// those outside (1, 0, 0, …) up to the continuous order.
		var below, above [4]float64
		require.NoError(t, c.Taylor(3, []float64{on - 1e-9}, below[:]))
		require.NoError(t, c.Taylor(3, []float64{on + 1e-9}, above[:]))
		for k := 0; k <= tt.continuousTo; k++ {
			assert.InDelta(t, below[k], above[k], 1e-7, "%s across r_on, order %d", tt.scheme, k)
		}
		assert.Equal(t, [4]float64{1}, out)
	}
}

// constant is V = 1, for reading S off a switched form.
type constant struct{}

func (constant) Taylor(n int, r, dst []float64) error {
	if err := core.CheckTaylor(n, 8, len(r), len(dst)); err != nil {
		return err
	}
	for i, x := range r {
		if err := core.CheckR(constant{}.Domain(), x); err != nil {
			return &core.PointError{Index: i, R: x, Err: err}
		}
		clear(dst[i*(n+1) : (i+1)*(n+1)])
		dst[i*(n+1)] = 1
	}
	return nil
}
func (constant) Domain() core.Domain { return core.Domain{Max: math.Inf(1), Limit: 1} }
func (constant) MaxOrder() int       { return 8 }

// TestSettingsErrors: invalid cutoffs are refused with one line naming the
// problem, wrapping core.ErrParam and cutoff.ErrSettings.
func TestSettingsErrors(t *testing.T) {
	bare := ljBare(t) // re = 3.816 Å
	buck, err := models.Buckingham{}.New([]float64{1500, 0.3, 25})
	require.NoError(t, err)
	tests := []struct {
		p       core.Potential
		s       cutoff.Settings
		mention string
	}{
		{bare, cutoff.Settings{Cutoff: 0}, "r_c = 0"},
		{bare, cutoff.Settings{Cutoff: -8}, "r_c = -8"},
		{bare, cutoff.Settings{Cutoff: math.Inf(1)}, "finite"},
		{bare, cutoff.Settings{Cutoff: math.NaN()}, "r_c = NaN"},
		{bare, cutoff.Settings{Scheme: cutoff.Switch2, Cutoff: 8, SwitchOn: 8}, "r_on = 8 Å ≥ r_c = 8 Å"},
		{bare, cutoff.Settings{Scheme: cutoff.Switch1, Cutoff: 8, SwitchOn: 9}, "≥ r_c"},
		{bare, cutoff.Settings{Scheme: cutoff.Switch1, Cutoff: 8, SwitchOn: -1}, "r_on = -1"},
		{bare, cutoff.Settings{Scheme: cutoff.Shift, Cutoff: 8, SwitchOn: 7}, "only the switches"},
		{bare, cutoff.Settings{Scheme: cutoff.ForceShift, Cutoff: 3.5}, "inside the repulsive wall"},
		{bare, cutoff.Settings{Scheme: cutoff.Scheme(9), Cutoff: 8}, "unknown scheme"},
		{buck, cutoff.Settings{Cutoff: 0.1}, "outside the domain"},
	}
	for _, tt := range tests {
		_, err := cutoff.New(tt.p, tt.s)
		require.Error(t, err, "%+v", tt.s)
		assert.ErrorIs(t, err, core.ErrParam)
		assert.ErrorIs(t, err, cutoff.ErrSettings)
		assert.Contains(t, err.Error(), tt.mention)
		assert.NotContains(t, err.Error(), "\n")
	}
}

// TestBeyondCutoff: points at and beyond r_c are zero, mixed calls give
// the same bits as separate ones, and a bad point among them is reported
// at its own index. (The bare form is still called for them: Taylor makes
// one bare call for all points and zeroes those rows.)
func TestBeyondCutoff(t *testing.T) {
	for _, s := range allSchemes(8.5, 7) {
		c := cut(t, ljBare(t), s)
		rs := []float64{9, 3.5, 8.5, 7.5, 1e6, 8.49}
		got := make([]float64, 3*len(rs))
		require.NoError(t, c.Taylor(2, rs, got))
		for i, r := range rs {
			one := make([]float64, 3)
			require.NoError(t, c.Taylor(2, []float64{r}, one))
			assert.Equal(t, one, got[3*i:3*i+3], "%s r=%g", s.Scheme, r)
			if r >= 8.5 {
				assert.Equal(t, []float64{0, 0, 0}, one)
			}
		}
		for _, bad := range []float64{math.NaN(), math.Inf(1), -1, 0} {
			err := c.Taylor(0, []float64{9, 4, bad, 10}, make([]float64, 4))
			var pe *core.PointError
			require.ErrorAs(t, err, &pe, "%s %g", s.Scheme, bad)
			assert.Equal(t, 2, pe.Index)
			assert.ErrorIs(t, err, core.ErrDomain)
		}
	}
}

// TestConformance: every cut form of every built-in passes the conformance
// suite, its derivative check sampling both sides of r_on and r_c.
func TestConformance(t *testing.T) {
	sets := map[string]struct {
		params  []float64
		rc, on  float64
		visible bool // r_on and r_c inside the suite's 0.8·re … 3·re
	}{
		"lennard-jones": {ljParams, 8.5, 7, true},
		"morse":         {morseParams, 3.4, 2.5, true},
		"buckingham":    {[]float64{1500, 0.3, 25}, 7, 5.5, false},
		"harmonic":      {[]float64{30, 1.2}, 3, 2.5, true},
	}
	for _, m := range models.Builtin() {
		set := sets[m.Info().Key]
		for _, s := range allSchemes(set.rc, set.on) {
			w, err := cutoff.Wrap(m, s)
			require.NoError(t, err)
			if m.Info().Key == "harmonic" && s.Scheme == cutoff.ForceShift {
				// V′_fs = k(r − r_c) < 0 below r_c: no minimum left.
				_, err := w.New(set.params)
				assert.ErrorIs(t, err, core.ErrNoMinimum)
				continue
			}
			conformance.Test(t, w, set.params)
		}
	}
}

// TestKinksMatter: without the kinks declared in Domain the suite's
// finite differences straddle r_on and fail — the declaration is what
// makes the derivative check pass, not a loose tolerance.
func TestKinksMatter(t *testing.T) {
	// The suite samples 64 points from 0.8·re to 3·re; put r_on just
	// right of one of them, so that its stencils straddle the kink.
	re := math.Pow(2, 1.0/6) * ljParams[1]
	on := 0.8*re + (2.2*re)*30/63 + 1e-4
	c := cut(t, ljBare(t), cutoff.Settings{Scheme: cutoff.Switch1, Cutoff: 9, SwitchOn: on})
	run := func(p core.Potential) []string {
		rep, err := conformance.RunCases([]conformance.Case{{Instance: core.Instance{Model: models.LennardJones{}, Params: ljParams, Potential: p}}}, conformance.Settings{})
		require.NoError(t, err)
		var failed []string
		for _, r := range rep.Failures() {
			failed = append(failed, r.Name)
		}
		return failed
	}
	assert.Empty(t, run(c))
	assert.Contains(t, strings.Join(run(hidden{c}), ";"), "V″ vs dV′/dr", "the C¹ switch has a jump of V″ at r_on")
}

// hidden forwards a potential without its kinks.
type hidden struct{ core.Potential }

func (h hidden) Domain() core.Domain {
	d := h.Potential.Domain()
	d.Kinks = nil
	return d
}

// TestParamGradient: the forwarded ∂V/∂p of the cut forms agrees with
// central differences of the cut form built from perturbed parameters; the
// force shift carries none (its gradient needs ∂V′(r_c)/∂p).
func TestParamGradient(t *testing.T) {
	rs := []float64{3.3, 3.9, 5, 7.2, 8, 8.6}
	for _, s := range allSchemes(8.5, 7) {
		w, err := cutoff.Wrap(models.LennardJones{}, s)
		require.NoError(t, err)
		p, err := w.New(ljParams)
		require.NoError(t, err)
		got := make([]float64, 2*len(rs))
		err = core.ParamDerivatives(p, rs, got)
		if s.Scheme == cutoff.ForceShift {
			assert.ErrorIs(t, err, core.ErrUnsupported, "force shift must not claim a gradient")
			continue
		}
		require.NoError(t, err, s.Scheme)
		for j := range ljParams {
			h := 1e-6 * ljParams[j]
			vals := [2][]float64{make([]float64, len(rs)), make([]float64, len(rs))}
			for side, sign := range []float64{1, -1} {
				ps := append([]float64(nil), ljParams...)
				ps[j] += sign * h
				q, err := w.New(ps)
				require.NoError(t, err)
				require.NoError(t, q.Taylor(0, rs, vals[side]))
			}
			for i := range rs {
				fd := (vals[0][i] - vals[1][i]) / (2 * h)
				assert.InDelta(t, fd, got[i*2+j], 1e-6*math.Abs(fd)+1e-9, "%s ∂V/∂p%d at %g", s.Scheme, j, rs[i])
			}
		}
	}
}

// TestParamGradientUnsupported: a bare form without a gradient gives a cut
// form without one.
func TestParamGradientUnsupported(t *testing.T) {
	c := cut(t, constant{}, cutoff.Settings{Scheme: cutoff.Shift, Cutoff: 3})
	err := core.ParamDerivatives(c, []float64{1, 2}, make([]float64, 2))
	assert.ErrorIs(t, err, core.ErrUnsupported)
}

// TestModel: the cut model's metadata, Example and no Match.
func TestModel(t *testing.T) {
	w, err := cutoff.Wrap(models.Morse{}, cutoff.Settings{Scheme: cutoff.Switch2, Cutoff: 8})
	require.NoError(t, err)
	info := w.Info()
	assert.Equal(t, "morse@cut=switch-c2,on=7.2,rc=8", info.Key)
	assert.Len(t, info.Params, 3)
	assert.Equal(t, morseParams, w.Example())
	_, ok := any(w).(core.Matcher)
	assert.False(t, ok, "an analytic match of the bare form is not a match of the cut form")
	_, _, err = core.Match(w, core.Target{Re: 1.3})
	assert.ErrorIs(t, err, core.ErrUnsupported)
	_, err = w.New([]float64{4.6, 1.87, -1})
	assert.ErrorIs(t, err, core.ErrParam)
	_, err = w.New([]float64{4.6, 1.87, 9}) // re beyond rc
	assert.ErrorIs(t, err, cutoff.ErrSettings)
}
