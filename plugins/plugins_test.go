package plugins_test

import (
	"context"
	"crypto/sha256"
	"errors"
	"io/fs"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"sync"
	"syscall"
	"testing"
	"time"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"github.com/pairwell/pairwell/conformance"
	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/coretest"
	"github.com/pairwell/pairwell/core/units"
	"github.com/pairwell/pairwell/models"
	"github.com/pairwell/pairwell/plugins"
)

// load starts the plugin at path and closes it at the end of the test.
func load(t testing.TB, path string, opts plugins.Options) *plugins.Plugin {
	t.Helper()
	p, err := plugins.Load(context.Background(), path, opts)
	require.NoError(t, err)
	t.Cleanup(func() { p.Close() })
	return p
}

// model returns the plugin's model with the given key.
func model(t testing.TB, p *plugins.Plugin, key string) core.Model {
	t.Helper()
	for _, m := range p.Models() {
		if m.Info().Key == key {
			return m
		}
	}
	t.Fatalf("plugin %s has no model %q", p.Path(), key)
	return nil
}

// alive reports whether process pid exists (a zombie counts).
func alive(pid int) bool {
	return pid > 0 && syscall.Kill(pid, 0) == nil
}

// requireGone fails unless process pid has disappeared within a second.
func requireGone(t *testing.T, pid int) {
	t.Helper()
	require.Positive(t, pid)
	deadline := time.Now().Add(time.Second)
	for alive(pid) && time.Now().Before(deadline) {
		time.Sleep(10 * time.Millisecond)
	}
	require.False(t, alive(pid), "plugin process %d still exists", pid)
}

func TestLoadDescribesModels(t *testing.T) {
	p := load(t, bin.rydberg, plugins.Options{})
	assert.True(t, p.Direct(), "an SDK plugin serves the direct evaluation channel")
	assert.Equal(t, "1.0.0", p.Version())
	require.Len(t, p.Models(), 1)
	info := p.Models()[0].Info()
	assert.Equal(t, "rydberg", info.Key)
	assert.Equal(t, bin.rydberg, info.Origin)
	assert.Equal(t, "1.0.0", info.Version)
	assert.Equal(t, 100, info.MaxOrder)
	assert.Contains(t, info.Reference, "Z. Phys. 73, 376 (1931)")
	require.Len(t, info.Params, 3)
	assert.Equal(t, core.Param{Name: "De", Dimension: units.Energy, Constraint: core.Positive, Meaning: "well depth V(∞) − V(re)"}, info.Params[0])
	assert.Equal(t, units.InverseLength, info.Params[1].Dimension)
	assert.Equal(t, units.Length, info.Params[2].Dimension)
	_, _, err := core.Match(p.Models()[0], core.Target{Re: 1.2, Depth: 4, K: 30})
	assert.NoError(t, err)

	mie := load(t, bin.mie, plugins.Options{})
	m := mie.Models()[0]
	assert.Equal(t, units.Dimensionless, m.Info().Params[2].Dimension)
	// Every plugin model is a core.Matcher (one adapter type); mie does
	// not match target wells, which Match reports without a round trip.
	_, _, err = core.Match(m, core.Target{Re: 1.2, Depth: 4, K: 30})
	assert.ErrorIs(t, err, core.ErrUnsupported, "mie does not match target wells")

	pid := p.Pid()
	require.True(t, alive(pid))
	require.NoError(t, p.Close())
	requireGone(t, pid)
	require.NoError(t, p.Close(), "Close twice")
}

// rydbergDerivative is V⁽ⁿ⁾(r) = −De(−a)ⁿ(1 − n + a(r − re))e^{−a(r−re)}
// (Rydberg 1931), computed independently of the plugin.
func rydbergDerivative(De, a, re float64, n int, r float64) float64 {
	x := r - re
	return -De * math.Pow(-a, float64(n)) * (1 - float64(n) + a*x) * math.Exp(-a*x)
}

func TestRydbergEndToEnd(t *testing.T) {
	// Parameters of the size of a light covalent bond (invented values).
	const De, a, re = 4.6, 2.5, 1.27
	p := load(t, bin.rydberg, plugins.Options{})
	inst, err := core.BuildSpec(p.Models()[0], core.Spec{Model: "rydberg", Params: []core.Assignment{
		{Name: "De", Value: "4.6"}, {Name: "a", Value: "2.5"}, {Name: "re", Value: "1.27"}}})
	require.NoError(t, err)
	pot := inst.Potential
	assert.Equal(t, re, pot.Domain().EquilibriumGuess, "the plugin's potential gives a guess")
	assert.False(t, pot.Domain().Barrier)

	// The coefficients against the closed form, every order to 8.
	rs := []float64{0.5, 0.9, 1.2, 1.27, 1.4, 2, 3.5, 8}
	for n := 0; n <= 8; n++ {
		got := make([]float64, len(rs))
		require.NoError(t, coretest.Batch(pot, n, rs, got))
		for i, r := range rs {
			want := rydbergDerivative(De, a, re, n, r)
			assert.InDelta(t, want, got[i], 1e-13*math.Max(1, math.Abs(want)), "V⁽%d⁾(%g)", n, r)
		}
	}
	// A single-point call gives the same bits as the batch.
	for _, r := range rs {
		d := make([]float64, 9)
		require.NoError(t, coretest.Derivatives(pot, r, d))
		for n := range d {
			b, err := core.Derivative(pot, n, r)
			require.NoError(t, err)
			assert.Equal(t, math.Float64bits(b), math.Float64bits(d[n]), "V⁽%d⁾(%g)", n, r)
		}
	}

	// The well, through core: re, V(re) = −De, k = De·a² (Rydberg 1931).
	w, err := core.AnalyzeWell(pot, core.WellSettings{Order: 4})
	require.NoError(t, err)
	assert.InDelta(t, re, w.Re, 1e-12)
	assert.InDelta(t, -De, w.Energy, 1e-12)
	assert.InDelta(t, De, w.Depth, 1e-12)
	assert.InDelta(t, De*a*a, w.K, 1e-10)
	assert.InDelta(t, -2*De*a*a*a/6, w.Taylor[3], 1e-9)

	// The identities travel through the protocol.
	ids := pot.(conformance.Identifier).Identities()
	require.Len(t, ids, 5)
	assert.Equal(t, conformance.DerivativeAtMinimum, ids[2].Quantity)
	assert.Equal(t, 2, ids[2].Order)
	assert.InDelta(t, De*a*a, ids[2].Value, 1e-12)
	assert.Contains(t, ids[2].Source, "Rydberg")

	// Match: a = √(K/De).
	params, _, err := p.Models()[0].(core.Matcher).Match(core.Target{Re: 1.2, Depth: 4, K: 30})
	require.NoError(t, err)
	assert.InDeltaSlice(t, []float64{4, math.Sqrt(30.0 / 4), 1.2}, params, 1e-15)
	_, _, err = p.Models()[0].(core.Matcher).Match(core.Target{Re: 1.2})
	assert.ErrorIs(t, err, core.ErrParam)
}

// TestMorsePluginMatchesBuiltin checks that a plugin re-implementing Morse
// gives the built-in's numbers to 1e-14 relative: relative to the size of
// the two terms De(−2a)ⁿy² and 2De(−a)ⁿy whose difference V⁽ⁿ⁾ is, the
// scale of the rounding of either implementation.
func TestMorsePluginMatchesBuiltin(t *testing.T) {
	for _, tp := range transports() {
		t.Run(tp.name, func(t *testing.T) {
			const De, a, re = 4.6, 1.87, 1.27 // H-Cl-like Morse parameters
			p := load(t, tp.path, plugins.Options{})
			assert.Equal(t, tp.name == "direct", p.Direct())
			pot, err := model(t, p, "plugin-morse").New([]float64{De, a, re})
			require.NoError(t, err)
			builtin, err := models.Morse{}.New([]float64{De, a, re})
			require.NoError(t, err)

			rs := make([]float64, 200)
			for i := range rs {
				rs[i] = 0.6 + 0.03*float64(i)
			}
			for n := 0; n <= 10; n++ {
				got, want := make([]float64, len(rs)), make([]float64, len(rs))
				require.NoError(t, coretest.Batch(pot, n, rs, got))
				require.NoError(t, coretest.Batch(builtin, n, rs, want))
				for i, r := range rs {
					y := math.Exp(-a * (r - re))
					scale := De * (math.Pow(2*a, float64(n))*y*y + 2*math.Pow(a, float64(n))*y)
					assert.InDelta(t, want[i], got[i], 1e-14*scale, "V⁽%d⁾(%g)", n, r)
				}
			}
			wp, err := core.AnalyzeWell(pot, core.WellSettings{Order: 6})
			require.NoError(t, err)
			wb, err := core.AnalyzeWell(builtin, core.WellSettings{Order: 6})
			require.NoError(t, err)
			assert.InDelta(t, wb.Re, wp.Re, 1e-14*re)
			assert.InDelta(t, wb.K, wp.K, 1e-14*wb.K)
			assert.InDelta(t, wb.Inflection, wp.Inflection, 1e-14*wb.Inflection)
			for n := range wb.Taylor {
				assert.InDelta(t, wb.Taylor[n], wp.Taylor[n], 1e-14*De*math.Pow(2*a, float64(n)), "c_%d", n)
			}
		})
	}
}

// TestMieIsLennardJones checks the Mie plugin at n = 12, m = 6 against the
// built-in Lennard-Jones 12-6 (C = 4, Mie 1903), and its identities.
func TestMieIsLennardJones(t *testing.T) {
	const eps, sigma = 0.0104, 3.4 // argon-like (invented round values)
	p := load(t, bin.mie, plugins.Options{})
	pot, err := p.Models()[0].New([]float64{eps, sigma, 12, 6})
	require.NoError(t, err)
	lj, err := models.LennardJones{}.New([]float64{eps, sigma})
	require.NoError(t, err)
	rs := []float64{3, 3.4, 3.8, 4.5, 6, 10}
	for n := 0; n <= 6; n++ {
		got, want := make([]float64, len(rs)), make([]float64, len(rs))
		require.NoError(t, coretest.Batch(pot, n, rs, got))
		require.NoError(t, coretest.Batch(lj, n, rs, want))
		for i, r := range rs {
			scale := 4 * eps * (math.Pow(sigma/r, 12) + math.Pow(sigma/r, 6)) * math.Pow(18/r, float64(n))
			assert.InDelta(t, want[i], got[i], 1e-13*scale, "V⁽%d⁾(%g)", n, r)
		}
	}
	rmin := sigma * math.Pow(2, 1.0/6)
	for _, id := range pot.(conformance.Identifier).Identities() {
		switch id.Quantity {
		case conformance.EquilibriumR:
			assert.InDelta(t, rmin, id.Value, 1e-14*rmin)
		case conformance.DerivativeAtMinimum:
			assert.InDelta(t, 72*eps/(rmin*rmin), id.Value, 1e-15)
		case conformance.ValueAt:
			assert.Equal(t, sigma, id.R)
		}
	}
	_, err = p.Models()[0].New([]float64{eps, sigma, 6, 12})
	require.ErrorIs(t, err, core.ErrParam, "n < m is refused by the plugin")
	assert.Contains(t, err.Error(), "must exceed m")
}

func TestErrorsClassified(t *testing.T) {
	p := load(t, bin.rydberg, plugins.Options{})
	m := p.Models()[0]
	_, err := m.New([]float64{-1, 2, 1})
	assert.ErrorIs(t, err, core.ErrParam)
	_, err = m.New([]float64{1, 2})
	assert.ErrorIs(t, err, core.ErrParam)

	pot, err := m.New([]float64{4.6, 2.5, 1.27})
	require.NoError(t, err)
	var pe *core.PointError
	err = coretest.Batch(pot, 1, []float64{1, 2, -1}, make([]float64, 3))
	require.ErrorAs(t, err, &pe)
	assert.Equal(t, 2, pe.Index)
	assert.Equal(t, -1.0, pe.R)
	assert.ErrorIs(t, err, core.ErrDomain)
	err = coretest.Derivatives(pot, math.NaN(), make([]float64, 2))
	assert.ErrorIs(t, err, core.ErrDomain)
	assert.ErrorIs(t, pot.Taylor(101, []float64{1}, make([]float64, 102)), core.ErrOrder)
	assert.ErrorIs(t, pot.Taylor(-1, []float64{1}, nil), core.ErrOrder)
	assert.ErrorIs(t, pot.Taylor(0, []float64{1}, nil), core.ErrLength)
	assert.ErrorIs(t, pot.Taylor(2, []float64{1}, make([]float64, 2)), core.ErrLength)
	assert.NoError(t, pot.Taylor(0, nil, nil))
}

func TestLongBatchIsSplit(t *testing.T) {
	p := load(t, bin.rydberg, plugins.Options{})
	pot, err := p.Models()[0].New([]float64{4.6, 2.5, 1.27})
	require.NoError(t, err)
	const n = 150_000 // two calls of maxValues/3 = 87381 points at order 2
	rs := make([]float64, n)
	for i := range rs {
		rs[i] = 0.5 + 4*float64(i)/n
	}
	got := make([]float64, n)
	require.NoError(t, coretest.Batch(pot, 2, rs, got))
	for _, i := range []int{0, 65535, 65536, 131072, n - 1} {
		assert.InDelta(t, rydbergDerivative(4.6, 2.5, 1.27, 2, rs[i]), got[i], 1e-12, "point %d", i)
	}
	rs[140_000] = -1
	var pe *core.PointError
	require.ErrorAs(t, coretest.Batch(pot, 2, rs, got), &pe)
	assert.Equal(t, 140_000, pe.Index, "index into the whole batch")
}

func TestConcurrentUse(t *testing.T) {
	p := load(t, bin.rydberg, plugins.Options{})
	pot, err := p.Models()[0].New([]float64{4.6, 2.5, 1.27})
	require.NoError(t, err)
	var wg sync.WaitGroup
	errs := make(chan error, 8)
	for g := 0; g < 8; g++ {
		wg.Add(1)
		go func(g int) {
			defer wg.Done()
			r := 1 + 0.1*float64(g)
			for i := 0; i < 20; i++ {
				d := make([]float64, 3)
				if err := coretest.Derivatives(pot, r, d); err != nil {
					errs <- err
					return
				}
				if math.Abs(d[2]-rydbergDerivative(4.6, 2.5, 1.27, 2, r)) > 1e-12 {
					errs <- errors.New("wrong value")
					return
				}
			}
		}(g)
	}
	wg.Wait()
	close(errs)
	for err := range errs {
		t.Error(err)
	}
}

func TestCrashMidCall(t *testing.T) {
	for _, tp := range transports() {
		t.Run(tp.name, func(t *testing.T) {
			p := load(t, tp.path, plugins.Options{})
			pid := p.Pid()
			pot, err := model(t, p, "crashing-morse").New([]float64{1, 1, 1})
			require.NoError(t, err, "Open works; evaluations crash")
			err = coretest.Batch(pot, 0, []float64{1, 2}, make([]float64, 2))
			require.ErrorIs(t, err, plugins.ErrCrashed)
			msg := err.Error()
			assert.Contains(t, msg, tp.path, "names the plugin")
			assert.Contains(t, msg, "Evaluate crashing-morse", "names the call")
			assert.Contains(t, msg, "exit status 3")
			assert.Contains(t, msg, "exiting in the middle of a call", "quotes its last output")
			requireGone(t, pid)

			// Every later call fails the same way, quickly.
			_, err = model(t, p, "plugin-morse").New([]float64{1, 1, 1})
			assert.ErrorIs(t, err, plugins.ErrCrashed)
		})
	}
}

func TestHangTimesOut(t *testing.T) {
	for _, tp := range transports() {
		t.Run(tp.name, func(t *testing.T) {
			p := load(t, tp.path, plugins.Options{Timeout: 300 * time.Millisecond})
			pid := p.Pid()
			pot, err := model(t, p, "hanging-morse").New([]float64{1, 1, 1})
			require.NoError(t, err)
			start := time.Now()
			err = coretest.Derivatives(pot, 1, make([]float64, 3))
			require.ErrorIs(t, err, plugins.ErrTimeout)
			assert.Less(t, time.Since(start), 2*time.Second)
			assert.Contains(t, err.Error(), tp.path)
			assert.Contains(t, err.Error(), "Evaluate hanging-morse")
			assert.Contains(t, err.Error(), "300ms")
			requireGone(t, pid)
			assert.ErrorIs(t, coretest.Batch(pot, 0, []float64{1}, make([]float64, 1)), plugins.ErrTimeout)
		})
	}
}

func TestBadOutput(t *testing.T) {
	for _, tp := range transports() {
		t.Run(tp.name, func(t *testing.T) {
			p := load(t, tp.path, plugins.Options{})

			pot, err := model(t, p, "badlen-morse").New([]float64{1, 1, 1})
			require.NoError(t, err)
			err = coretest.Batch(pot, 2, []float64{1, 2, 3}, make([]float64, 3))
			require.ErrorIs(t, err, plugins.ErrBadOutput)
			assert.Contains(t, err.Error(), "8 values, want 9")
			assert.ErrorIs(t, coretest.Derivatives(pot, 1, make([]float64, 3)), plugins.ErrBadOutput)

			pot, err = model(t, p, "nan-morse").New([]float64{1, 1, 1})
			require.NoError(t, err)
			var pe *core.PointError
			err = coretest.Batch(pot, 2, []float64{1, 2}, make([]float64, 2))
			require.ErrorAs(t, err, &pe)
			assert.Equal(t, 0, pe.Index)
			assert.ErrorIs(t, err, plugins.ErrBadOutput)
			assert.NotErrorIs(t, err, core.ErrDomain, "a broken plugin is not bad input")
			assert.Contains(t, err.Error(), "NaN")
			err = coretest.Derivatives(pot, 1, make([]float64, 3))
			assert.ErrorIs(t, err, plugins.ErrBadOutput)
			assert.Contains(t, err.Error(), "c_2 = V⁽2⁾/2! is NaN")
			_, err = core.AnalyzeWell(pot, core.WellSettings{})
			assert.ErrorIs(t, err, plugins.ErrBadOutput)

			// A panic is reported as a failure of the call; the plugin lives on.
			pot, err = model(t, p, "panicking-morse").New([]float64{1, 1, 1})
			require.NoError(t, err)
			err = coretest.Batch(pot, 0, []float64{1}, make([]float64, 1))
			require.Error(t, err)
			assert.Contains(t, err.Error(), "plugin panicked in Evaluate: panic test plugin")
			pot, err = model(t, p, "plugin-morse").New([]float64{1, 1, 1})
			require.NoError(t, err)
			v, err := core.Value(pot, 1)
			require.NoError(t, err)
			assert.Equal(t, -1.0, v)
		})
	}
}

func TestHandshakeFailures(t *testing.T) {
	// A plugin built for protocol 1 is refused with one line saying so.
	_, err := plugins.Load(context.Background(), bin.oldproto, plugins.Options{})
	require.ErrorIs(t, err, plugins.ErrHandshake)
	assert.Equal(t, "plugin "+bin.oldproto+": plugin handshake failed: built for protocol 1, this pairwell speaks 2: rebuild it against this version", err.Error())

	dir := t.TempDir()
	notPlugin := filepath.Join(dir, "pairwell-plugin-echo")
	require.NoError(t, os.WriteFile(notPlugin, []byte("#!/bin/sh\necho hello\n"), 0o755))
	_, err = plugins.Load(context.Background(), notPlugin, plugins.Options{})
	require.ErrorIs(t, err, plugins.ErrHandshake)
	assert.Contains(t, err.Error(), "hello")

	// A program that closes its standard output without a word (and stays,
	// so that it is the closed output, not the exit, that go-plugin sees):
	// go-plugin's several lines become one message whose sentences stay
	// apart. Load kills it.
	silent := filepath.Join(dir, "pairwell-plugin-silent")
	require.NoError(t, os.WriteFile(silent, []byte("#!/bin/sh\nexec >&-\nexec sleep 60\n"), 0o755))
	_, err = plugins.Load(context.Background(), silent, plugins.Options{})
	require.ErrorIs(t, err, plugins.ErrHandshake)
	assert.NotContains(t, err.Error(), "\n")
	assert.Contains(t, err.Error(), "stdout; "+silent+" is not a working pairwell plugin")

	_, err = plugins.Load(context.Background(), filepath.Join(dir, "missing"), plugins.Options{})
	assert.ErrorIs(t, err, fs.ErrNotExist)
	plain := filepath.Join(dir, "plain")
	require.NoError(t, os.WriteFile(plain, []byte("x"), 0o644))
	_, err = plugins.Load(context.Background(), plain, plugins.Options{})
	assert.ErrorIs(t, err, plugins.ErrNotExecutable)
}

func TestChecksumPin(t *testing.T) {
	// A script that leaves a mark when it runs: a refused pin must not run it.
	dir := t.TempDir()
	mark := filepath.Join(dir, "ran")
	script := filepath.Join(dir, "pairwell-plugin-mark")
	require.NoError(t, os.WriteFile(script, []byte("#!/bin/sh\ntouch "+mark+"\n"), 0o755))
	wrong := sha256.Sum256([]byte("something else"))
	_, err := plugins.Load(context.Background(), script, plugins.Options{SHA256: wrong[:]})
	require.ErrorIs(t, err, plugins.ErrChecksum)
	assert.Contains(t, err.Error(), "refusing to run it")
	_, statErr := os.Stat(mark)
	assert.ErrorIs(t, statErr, fs.ErrNotExist, "the refused executable ran")

	sum, err := plugins.FileSHA256(bin.rydberg)
	require.NoError(t, err)
	p := load(t, bin.rydberg, plugins.Options{SHA256: sum})
	assert.Len(t, p.Models(), 1)
}

func TestRunDirectly(t *testing.T) {
	cmd := exec.Command(bin.rydberg)
	cmd.Env = []string{} // no cookie
	out, err := cmd.CombinedOutput()
	var exit *exec.ExitError
	require.ErrorAs(t, err, &exit)
	assert.Equal(t, 1, exit.ExitCode())
	assert.Contains(t, string(out), "rydberg is a pairwell plugin 1.0.0 (forms: rydberg)")
	assert.Contains(t, string(out), "pairwell --plugin "+bin.rydberg+" models")
	assert.Equal(t, 3, strings.Count(string(out), "\n"))
}

func TestLoadCanceled(t *testing.T) {
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	_, err := plugins.Load(ctx, bin.rydberg, plugins.Options{})
	assert.ErrorIs(t, err, context.Canceled)
}

func TestClosedPlugin(t *testing.T) {
	p := load(t, bin.rydberg, plugins.Options{})
	pot, err := p.Models()[0].New([]float64{4.6, 2.5, 1.27})
	require.NoError(t, err)
	require.NoError(t, p.Close())
	assert.ErrorIs(t, coretest.Batch(pot, 0, []float64{1}, make([]float64, 1)), plugins.ErrClosed)
	_, err = p.Models()[0].New([]float64{4.6, 2.5, 1.27})
	assert.ErrorIs(t, err, plugins.ErrClosed)
}

// TestBarrierTravels checks that a form with an inner barrier (Buckingham,
// served by the test plugin) keeps its domain — barrier position and
// energy, equilibrium guess — and its identities through the protocol,
// and that the model's Match is forwarded by the plugin's wrapper.
func TestBarrierTravels(t *testing.T) {
	params := []float64{1500, 0.3, 25} // A (eV), rho (Å), C (eV·Å⁶): invented
	p := load(t, bin.test, plugins.Options{})
	pot, err := model(t, p, "plugin-buckingham").New(params)
	require.NoError(t, err)
	want, err := models.Buckingham{}.New(params)
	require.NoError(t, err)
	assert.Equal(t, want.Domain(), pot.Domain())
	require.True(t, pot.Domain().Barrier)
	r := pot.Domain().Min
	assert.Equal(t, want.(conformance.Identifier).Identities(), pot.(conformance.Identifier).Identities())
	tg := core.Target{Re: 3, Depth: 0.5, K: 4}
	wantParams, _, err := core.Match(models.Buckingham{}, tg)
	require.NoError(t, err)
	gotParams, _, err := core.Match(model(t, p, "plugin-buckingham"), tg)
	require.NoError(t, err)
	assert.Equal(t, wantParams, gotParams)
	var pe *core.PointError
	require.ErrorAs(t, coretest.Batch(pot, 0, []float64{2, r / 2}, make([]float64, 2)), &pe)
	assert.Equal(t, 1, pe.Index)
	assert.ErrorIs(t, pe, core.ErrDomain, "below the barrier")
}
