package plugins

import (
	"context"
	"errors"
	"fmt"
	"os"
	"runtime"
	"time"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/plugins/internal/wire"
	pb "github.com/pairwell/pairwell/plugins/proto"
)

// maxBatch is the largest number of values one Evaluate call carries
// (512 KiB of float64 each way); longer batches are split.
const maxBatch = 1 << 16

// model is a form served by a plugin.
type model struct {
	p    *Plugin
	info core.ModelInfo
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
	pot := &potential{p: p, key: key, handle: resp.GetHandle(), domain: d, maxOrder: m.info.MaxOrder}
	for _, x := range resp.GetIdentities() {
		id, err := wire.IdentityFromProto(x)
		if err != nil {
			return nil, bad("%v", err)
		}
		pot.ids = append(pot.ids, id)
	}
	g, hasGuess := resp.GetEquilibriumGuess(), resp.EquilibriumGuess != nil
	b := resp.GetBarrier()
	if d.Barrier && b == nil {
		return nil, bad("the domain has an inner barrier but its position was not given")
	}
	// Release the handle in the plugin when the potential is garbage.
	runtime.AddCleanup(pot, func(h uint64) { go p.release(h) }, pot.handle)

	switch {
	case hasGuess && d.Barrier:
		return guessTurnoverPotential{pot, g, b.GetR(), b.GetV()}, nil
	case hasGuess:
		return guessPotential{pot, g}, nil
	case d.Barrier:
		return turnoverPotential{pot, b.GetR(), b.GetV()}, nil
	}
	return pot, nil
}

// matchingModel is a model whose plugin answers Match.
type matchingModel struct{ *model }

// Match has the plugin derive a parameter set from a target well.
func (m matchingModel) Match(t core.Target) ([]float64, []string, error) {
	p, key := m.p, m.info.Key
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

// potential evaluates through a plugin handle. Optional interfaces are
// added by the wrapper types below, so that a potential implements
// core.Guesser or core.Turnover only when the plugin's does.
type potential struct {
	p        *Plugin
	key      string
	handle   uint64
	domain   core.Domain
	maxOrder int
	ids      []core.Identity
}

// Domain returns the domain the plugin reported for the parameter set.
func (pt *potential) Domain() core.Domain { return pt.domain }

// MaxOrder returns the model's highest analytic derivative order.
func (pt *potential) MaxOrder() int { return pt.maxOrder }

// Identities returns the reference identities the plugin declared.
func (pt *potential) Identities() []core.Identity {
	return append([]core.Identity(nil), pt.ids...)
}

// eval runs one evaluation of r, at order n or (allOrders) at every order
// up to n, storing the values in dst, whose length is the number due. It
// returns a failure the plugin reported, or an error naming the plugin and
// the call. what describes the call; it is formatted only for errors.
func (pt *potential) eval(what func() string, n int, allOrders bool, r, dst []float64) (*pb.PointFailure, *pb.Failure, error) {
	defer runtime.KeepAlive(pt) // the handle must outlive the call
	p := pt.p
	if fc := p.fast; fc != nil {
		if err := p.deadErr(); err != nil {
			return nil, nil, fmt.Errorf("%s: %w", what(), err)
		}
		pf, f, err := fc.Evaluate(p.timeout, pt.handle, n, allOrders, r, dst)
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
		resp, err = p.forms.Evaluate(ctx, &pb.EvaluateRequest{Handle: pt.handle, Order: int32(n), R: r, AllOrders: allOrders})
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

// Derivatives stores V⁽ᵏ⁾(r) in dst[k] for k = 0, …, len(dst)−1, in one
// round trip.
func (pt *potential) Derivatives(r float64, dst []float64) error {
	if len(dst) == 0 {
		return nil
	}
	n := len(dst) - 1
	if err := core.CheckOrder(n, pt.maxOrder); err != nil {
		return fmt.Errorf("%s: %w", pt.key, err)
	}
	what := func() string { return fmt.Sprintf("Evaluate %s V⁽⁰…%d⁾ at r = %g Å", pt.key, n, r) }
	rr := [1]float64{r}
	pf, f, err := pt.eval(what, n, true, rr[:], dst)
	switch {
	case err != nil:
		return err
	case f != nil:
		return remote(pt.p, f)
	case pf != nil:
		return remote(pt.p, pf.GetFailure())
	}
	for k, v := range dst {
		if v-v != 0 {
			return fmt.Errorf("plugin %s: %s: %w: V⁽%d⁾ is %g", pt.p.path, what(), ErrBadOutput, k, v)
		}
	}
	return nil
}

// Batch stores V⁽ⁿ⁾(r[i]) in dst[i], in one round trip per 65536 points.
func (pt *potential) Batch(n int, r, dst []float64) error {
	if len(r) != len(dst) {
		return fmt.Errorf("%s: %w: len(r) = %d, len(dst) = %d", pt.key, core.ErrLength, len(r), len(dst))
	}
	if err := core.CheckOrder(n, pt.maxOrder); err != nil {
		return fmt.Errorf("%s: %w", pt.key, err)
	}
	for off := 0; off < len(r); off += maxBatch {
		chunk := r[off:min(off+maxBatch, len(r))]
		out := dst[off : off+len(chunk)]
		what := func() string { return fmt.Sprintf("Evaluate %s V⁽%d⁾ at %d points", pt.key, n, len(chunk)) }
		pf, f, err := pt.eval(what, n, false, chunk, out)
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
			for i, v := range out {
				if v-v != 0 {
					return &core.PointError{Index: off + i, R: chunk[i], Err: fmt.Errorf("plugin %s: %s: %w: V⁽%d⁾ is %g", pt.p.path, what(), ErrBadOutput, n, v)}
				}
			}
		}
	}
	return nil
}

type guessPotential struct {
	*potential
	guess float64
}

// EquilibriumGuess returns the plugin's estimate of the minimum, Å.
func (g guessPotential) EquilibriumGuess() float64 { return g.guess }

type turnoverPotential struct {
	*potential
	r, v float64
}

// Barrier returns the inner maximum the plugin reported.
func (t turnoverPotential) Barrier() (r, v float64) { return t.r, t.v }

type guessTurnoverPotential struct {
	*potential
	guess, r, v float64
}

// EquilibriumGuess returns the plugin's estimate of the minimum, Å.
func (g guessTurnoverPotential) EquilibriumGuess() float64 { return g.guess }

// Barrier returns the inner maximum the plugin reported.
func (g guessTurnoverPotential) Barrier() (r, v float64) { return g.r, g.v }
