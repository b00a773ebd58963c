package plugins

import (
	"context"
	"errors"
	"fmt"
	"os"
	"runtime"
	"time"

	"google.golang.org/grpc/codes"
	"google.golang.org/grpc/status"

	"github.com/pairwell/pairwell/conformance"
	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/plugins/internal/wire"
	pb "github.com/pairwell/pairwell/plugins/proto"
)

// maxValues is the largest number of coefficients one Evaluate call
// returns (2 MiB of float64, within gRPC's default message size); longer
// batches are split into calls of maxValues/(n+1) points.
const maxValues = 1 << 18

// model is a form served by a plugin. It always implements core.Matcher:
// for a model the plugin does not match, Match reports core.ErrUnsupported
// without a round trip.
type model struct {
	p       *Plugin
	info    core.ModelInfo
	matcher bool // the plugin answers Match for this model
}

// Info returns the metadata the plugin described, with Origin the plugin's
// path and Version its version.
func (m *model) Info() core.ModelInfo {
	info := m.info
	info.Aliases = append([]string(nil), info.Aliases...)
	info.Params = append([]core.Param(nil), info.Params...)
	return info
}

// New checks the count and constraints of params locally, then has the
// plugin validate the set once and keep its potential under a handle.
func (m *model) New(params []float64) (core.Potential, error) {
	if err := core.CheckParams(m.info, params); err != nil {
		return nil, err
	}
	p, key := m.p, m.info.Key
	what := "Open " + key
	var resp *pb.OpenResponse
	if err := p.call(what, func(ctx context.Context) (err error) {
		resp, err = p.forms.Open(ctx, &pb.OpenRequest{Model: key, Params: params})
		return err
	}); err != nil {
		return nil, err
	}
	if f := resp.GetFailure(); f != nil {
		return nil, remote(p, f)
	}
	if resp.GetHandle() == 0 {
		return nil, fmt.Errorf("plugin %s: %s: %w: no handle", p.path, what, ErrBadOutput)
	}
	bad := func(format string, args ...any) error {
		go p.release(resp.GetHandle())
		return fmt.Errorf("plugin %s: %s: %w: %s", p.path, what, ErrBadOutput, fmt.Sprintf(format, args...))
	}
	d, err := wire.DomainFromProto(resp.GetDomain())
	if err != nil {
		return nil, bad("%v", err)
	}
	pot := &potential{p: p, m: m, params: append([]float64(nil), params...), key: key, handle: resp.GetHandle(), domain: d, maxOrder: m.info.MaxOrder}
	for _, x := range resp.GetIdentities() {
		id, err := wire.IdentityFromProto(x)
		if err != nil {
			return nil, bad("%v", err)
		}
		pot.ids = append(pot.ids, id)
	}
	// Release the handle in the plugin when the potential is garbage.
	runtime.AddCleanup(pot, func(h uint64) { go p.release(h) }, pot.handle)
	return pot, nil
}

// Match has the plugin derive a parameter set from a target well; for a
// model the plugin does not match it returns an error wrapping
// core.ErrUnsupported.
func (m *model) Match(t core.Target) ([]float64, []string, error) {
	p, key := m.p, m.info.Key
	if !m.matcher {
		return nil, nil, fmt.Errorf("%s: matching a target well: %w (plugin %s)", key, core.ErrUnsupported, p.path)
	}
	what := "Match " + key
	var resp *pb.MatchResponse
	if err := p.call(what, func(ctx context.Context) (err error) {
		resp, err = p.forms.Match(ctx, &pb.MatchRequest{Model: key, Re: t.Re, Depth: t.Depth, K: t.K})
		return err
	}); err != nil {
		return nil, nil, err
	}
	if f := resp.GetFailure(); f != nil {
		return nil, nil, remote(p, f)
	}
	params := resp.GetParams()
	if len(params) != len(m.info.Params) {
		return nil, nil, fmt.Errorf("plugin %s: %s: %w: %d parameters, want %d", p.path, what, ErrBadOutput, len(params), len(m.info.Params))
	}
	return params, resp.GetNotes(), nil
}

// remote converts a failure the plugin reported. Failures of a known kind
// (domain, parameter, …) keep the plugin's message; others are prefixed
// with the plugin's path.
func remote(p *Plugin, f *pb.Failure) error {
	err := wire.ErrorFromFailure(f)
	if f.GetKind() == pb.ErrorKind_ERROR_KIND_OTHER {
		return fmt.Errorf("plugin %s: %w", p.path, err)
	}
	return err
}

// release closes handle h in the plugin, if it still runs.
func (p *Plugin) release(h uint64) {
	if p.deadErr() != nil {
		return
	}
	ctx, cancel := context.WithTimeout(p.ctx, time.Second)
	defer cancel()
	_, _ = p.forms.Close(ctx, &pb.CloseRequest{Handle: h})
}

// potential evaluates through a plugin handle. Everything the contract
// carries travels with it: the domain holds the barrier and the
// equilibrium guess, and the identities the plugin declared are served as
// a conformance.Identifier.
type potential struct {
	p        *Plugin
	m        *model
	params   []float64 // the parameter set, for ParamGradient
	key      string
	handle   uint64
	domain   core.Domain
	maxOrder int
	ids      []conformance.Identity
}

// Domain returns the domain the plugin reported for the parameter set.
func (pt *potential) Domain() core.Domain { return pt.domain }

// MaxOrder returns the model's highest analytic Taylor order.
func (pt *potential) MaxOrder() int { return pt.maxOrder }

// Identities returns the reference identities the plugin declared.
func (pt *potential) Identities() []conformance.Identity {
	return append([]conformance.Identity(nil), pt.ids...)
}

// eval runs one evaluation of order n at r, storing the (n+1)·len(r)
// coefficients in dst. It returns a failure the plugin reported, or an
// error naming the plugin and the call. what describes the call; it is
// formatted only for errors.
func (pt *potential) eval(what func() string, n int, r, dst []float64) (*pb.PointFailure, *pb.Failure, error) {
	defer runtime.KeepAlive(pt) // the handle must outlive the call
	p := pt.p
	if fc := p.fast; fc != nil {
		if err := p.deadErr(); err != nil {
			return nil, nil, fmt.Errorf("%s: %w", what(), err)
		}
		pf, f, err := fc.Evaluate(p.timeout, pt.handle, n, r, dst)
		switch {
		case errors.Is(err, wire.ErrBadCount):
			return nil, nil, fmt.Errorf("plugin %s: %s: %w: %v", p.path, what(), ErrBadOutput, err)
		case err != nil:
			return nil, nil, p.failed(what(), err, errors.Is(err, os.ErrDeadlineExceeded))
		}
		return pf, f, nil
	}
	var resp *pb.EvaluateResponse
	w := what()
	err := p.call(w, func(ctx context.Context) (err error) {
		resp, err = p.forms.Evaluate(ctx, &pb.EvaluateRequest{Handle: pt.handle, Order: int32(n), R: r})
		return err
	})
	if err != nil {
		return nil, nil, err
	}
	if resp.GetFailure() != nil || resp.GetPointFailure() != nil {
		return resp.GetPointFailure(), resp.GetFailure(), nil
	}
	if got := len(resp.GetValues()); got != len(dst) {
		return nil, nil, fmt.Errorf("plugin %s: %s: %w: %d values, want %d", p.path, w, ErrBadOutput, got, len(dst))
	}
	copy(dst, resp.GetValues())
	return nil, nil, nil
}

// Taylor stores c_k(r[i]) = V⁽ᵏ⁾(r[i])/k! at dst[i·(n+1)+k], in one round
// trip per maxValues/(n+1) points. A value that is not finite is an error
// wrapping ErrBadOutput at its point.
func (pt *potential) Taylor(n int, r, dst []float64) error {
	if err := core.CheckTaylor(n, pt.maxOrder, len(r), len(dst)); err != nil {
		return fmt.Errorf("%s: %w", pt.key, err)
	}
	w := n + 1
	step := max(1, maxValues/w)
	for off := 0; off < len(r); off += step {
		chunk := r[off:min(off+step, len(r))]
		out := dst[off*w : (off+len(chunk))*w]
		what := func() string {
			if len(chunk) == 1 {
				return fmt.Sprintf("Evaluate %s c₀…c_%d at r = %g Å", pt.key, n, chunk[0])
			}
			return fmt.Sprintf("Evaluate %s c₀…c_%d at %d points", pt.key, n, len(chunk))
		}
		pf, f, err := pt.eval(what, n, chunk, out)
		switch {
		case err != nil:
			return err
		case f != nil:
			return remote(pt.p, f)
		case pf != nil:
			i := pf.GetIndex()
			if i < 0 || i >= int64(len(chunk)) {
				return fmt.Errorf("plugin %s: %s: %w: failure at point %d of %d", pt.p.path, what(), ErrBadOutput, i, len(chunk))
			}
			return &core.PointError{Index: off + int(i), R: chunk[i], Err: remote(pt.p, pf.GetFailure())}
		}
		bad := 0.0
		for _, v := range out {
			bad += v - v
		}
		if bad != 0 { // NaN unless every value is finite
			for j, v := range out {
				if v-v != 0 {
					i, k := j/w, j%w
					return &core.PointError{Index: off + i, R: chunk[i], Err: fmt.Errorf("plugin %s: %s: %w: c_%d = V⁽%d⁾/%d! is %g",
						pt.p.path, what(), ErrBadOutput, k, k, k, v)}
				}
			}
		}
	}
	return nil
}

// EvaluateSets evaluates many parameter sets of the model at the same
// separations (core.SetEvaluator) in one round trip per at most maxValues
// coefficients: over the direct channel when the plugin offers it there,
// else over gRPC EvaluateSets. A plugin built before that call (it answers
// UNIMPLEMENTED) is remembered, and its sets are opened and evaluated one
// by one, concurrently (core.EvaluateEach). A value that is not finite is
// its set's error wrapping ErrBadOutput at its point.
func (m *model) EvaluateSets(n int, params, r, dst []float64, errs []error) error {
	if err := core.CheckSets(m.info, n, params, r, dst, errs); err != nil {
		return err
	}
	np, block := len(m.info.Params), len(r)*(n+1)
	step := maxValues / max(1, block)
	if step < 1 || m.p.noSets.Load() {
		return core.EvaluateEach(m, n, params, r, dst, errs)
	}
	for s0 := 0; s0 < len(errs); s0 += step {
		s1 := min(s0+step, len(errs))
		done, err := m.evaluateSets(n, false, params[s0*np:s1*np], r, dst[s0*block:s1*block], errs[s0:s1])
		if err != nil {
			return err
		}
		if !done {
			return core.EvaluateEach(m, n, params[s0*np:], r, dst[s0*block:], errs[s0:])
		}
	}
	return nil
}

// evaluateSets is one EvaluateSets round trip, of the coefficients c₀…c_n
// or, with grad, of the parameter derivatives; done is false when the
// plugin does not implement the call.
func (m *model) evaluateSets(n int, grad bool, params, r, dst []float64, errs []error) (done bool, err error) {
	p, key := m.p, m.info.Key
	what := fmt.Sprintf("EvaluateSets %s c₀…c_%d, %d sets at %d points", key, n, len(errs), len(r))
	w := n + 1 // values per point
	if grad {
		what = fmt.Sprintf("EvaluateSets %s ∂V/∂p, %d sets at %d points", key, len(errs), len(r))
		w = len(m.info.Params)
	}
	req := &pb.EvaluateSetsRequest{Model: key, Order: int32(n), Params: params, Sets: int32(len(errs)), R: r, ParamGradient: grad}
	var resp *pb.EvaluateSetsResponse
	if fc := p.fast; fc != nil && p.fastSets {
		if err := p.deadErr(); err != nil {
			return false, fmt.Errorf("%s: %w", what, err)
		}
		if resp, err = fc.EvaluateSets(p.timeout, req); err != nil {
			if errors.Is(err, wire.ErrFastProtocol) {
				return false, fmt.Errorf("plugin %s: %s: %w: %v", p.path, what, ErrBadOutput, err)
			}
			return false, p.failed(what, err, errors.Is(err, os.ErrDeadlineExceeded))
		}
	} else {
		unimplemented := false
		if err := p.call(what, func(ctx context.Context) (err error) {
			resp, err = p.forms.EvaluateSets(ctx, req)
			if status.Code(err) == codes.Unimplemented {
				unimplemented = true
				return nil
			}
			return err
		}); err != nil {
			return false, err
		}
		if unimplemented {
			p.noSets.Store(true)
			return false, nil
		}
	}
	if f := resp.GetFailure(); f != nil {
		return true, remote(p, f)
	}
	if got := len(resp.GetValues()); got != len(dst) {
		return true, fmt.Errorf("plugin %s: %s: %w: %d values, want %d", p.path, what, ErrBadOutput, got, len(dst))
	}
	copy(dst, resp.GetValues())
	clear(errs)
	for _, sf := range resp.GetSetFailures() {
		s := sf.GetSet()
		if s < 0 || s >= int64(len(errs)) {
			return true, fmt.Errorf("plugin %s: %s: %w: failure of set %d of %d", p.path, what, ErrBadOutput, s, len(errs))
		}
		switch pf := sf.GetPointFailure(); {
		case pf != nil:
			i := pf.GetIndex()
			if i < 0 || i >= int64(len(r)) {
				return true, fmt.Errorf("plugin %s: %s: %w: failure at point %d of %d", p.path, what, ErrBadOutput, i, len(r))
			}
			errs[s] = &core.PointError{Index: int(i), R: r[i], Err: remote(p, pf.GetFailure())}
		default:
			errs[s] = remote(p, sf.GetFailure())
		}
	}
	block := len(r) * w
	for s := range errs {
		if errs[s] != nil {
			continue
		}
		for j, v := range dst[s*block : (s+1)*block] {
			if v-v != 0 { // NaN or ±Inf
				i, k := j/w, j%w
				errs[s] = &core.PointError{Index: i, R: r[i], Err: fmt.Errorf("plugin %s: %s: %w: value %d at the point of set %d is %g",
					p.path, what, ErrBadOutput, k, s, v)}
				break
			}
		}
	}
	return true, nil
}

// ParamGradient stores ∂V(r[i])/∂pⱼ in dst[i·P+j] (core.ParamGradient),
// evaluated by the plugin in EvaluateSets round trips (at most maxValues
// numbers each). For a plugin built before that call, and for a potential
// without analytic parameter derivatives in the plugin, it returns an
// error wrapping core.ErrUnsupported.
func (pt *potential) ParamGradient(r, dst []float64) error {
	np := len(pt.params)
	if err := core.CheckParamGradient(pt.key, np, r, dst); err != nil {
		return err
	}
	if pt.p.noSets.Load() {
		return fmt.Errorf("%s: parameter derivatives: %w (plugin %s)", pt.key, core.ErrUnsupported, pt.p.path)
	}
	step := max(1, maxValues/max(1, np))
	var errs [1]error
	for off := 0; off < len(r); off += step {
		chunk := r[off:min(off+step, len(r))]
		done, err := pt.m.evaluateSets(0, true, pt.params, chunk, dst[off*np:(off+len(chunk))*np], errs[:])
		switch {
		case err != nil:
			return err
		case !done:
			return fmt.Errorf("%s: parameter derivatives: %w (plugin %s)", pt.key, core.ErrUnsupported, pt.p.path)
		case errs[0] != nil:
			var pe *core.PointError
			if errors.As(errs[0], &pe) {
				pe.Index += off
			}
			return errs[0]
		}
	}
	return nil
}
