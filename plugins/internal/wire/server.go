package wire

import (
	"context"
	"errors"
	"fmt"
	"os"
	"runtime/debug"
	"strings"
	"sync"

	"github.com/pairwell/pairwell/conformance"
	"github.com/pairwell/pairwell/core"
	pb "github.com/pairwell/pairwell/plugins/proto"
)

// Server is the plugin side of the protocol: it serves a fixed set of
// core.Models, keeping the potentials it opened under handles. It is safe
// for concurrent use, as gRPC requires.
//
// A panic in a model's code is recovered and reported as a failure of the
// call, so one bad parameter set does not take the plugin down.
type Server struct {
	pb.UnimplementedFormsServer

	version string
	infos   []*pb.ModelInfo
	byKey   map[string]core.Model

	mu   sync.RWMutex
	next uint64
	pots map[uint64]core.Potential

	// Filter, when set, may alter the values of every evaluation before
	// they are sent. It exists to build faulty plugins for tests.
	Filter func(handle uint64, values []float64) []float64

	// OldProtocol, when set, makes the server answer as a plugin built
	// before EvaluateSets: UNIMPLEMENTED, and no fast_sets. It exists to
	// test the host's fallback.
	OldProtocol bool

	// fastAddr is the address of the direct evaluation channel, "" if
	// none is served.
	fastAddr string
}

// NewServer returns a server for models, after checking that their
// metadata fits the protocol and that keys and aliases are distinct.
func NewServer(version string, models []core.Model) (*Server, error) {
	if len(models) == 0 {
		return nil, errors.New("no models to serve")
	}
	s := &Server{version: version, byKey: make(map[string]core.Model), pots: make(map[uint64]core.Potential)}
	names := make(map[string]string)
	for _, m := range models {
		if m == nil {
			return nil, errors.New("nil model")
		}
		info := m.Info()
		_, matcher := m.(core.Matcher)
		pi, err := InfoToProto(info, matcher)
		if err != nil {
			return nil, err
		}
		for _, n := range append([]string{info.Key}, info.Aliases...) {
			k := strings.ToLower(n)
			if k == "" {
				return nil, fmt.Errorf("model %q: empty alias", info.Key)
			}
			if prev, ok := names[k]; ok {
				return nil, fmt.Errorf("model %q: name %q already used by model %q", info.Key, n, prev)
			}
			names[k] = info.Key
		}
		s.infos = append(s.infos, pi)
		s.byKey[info.Key] = m
	}
	return s, nil
}

// recovered turns a panic in model code into a failure. The stack goes to
// the plugin's standard error, which the host keeps for its messages.
func recovered(call string, p any) *pb.Failure {
	fmt.Fprintf(os.Stderr, "panic in %s: %v\n%s", call, p, debug.Stack())
	return &pb.Failure{Kind: pb.ErrorKind_ERROR_KIND_OTHER, Message: fmt.Sprintf("plugin panicked in %s: %v", call, p)}
}

// Describe returns the metadata of every model.
func (s *Server) Describe(context.Context, *pb.DescribeRequest) (*pb.DescribeResponse, error) {
	return &pb.DescribeResponse{PluginVersion: s.version, Models: s.infos, FastPath: s.fastAddr, FastSets: s.fastAddr != "" && !s.OldProtocol}, nil
}

func (s *Server) model(key string) (core.Model, *pb.Failure) {
	m, ok := s.byKey[key]
	if !ok {
		return nil, &pb.Failure{Kind: pb.ErrorKind_ERROR_KIND_OTHER, Message: fmt.Sprintf("plugin serves no model %q", key)}
	}
	return m, nil
}

// Open builds the potential of a parameter set and keeps it under a handle.
func (s *Server) Open(_ context.Context, req *pb.OpenRequest) (resp *pb.OpenResponse, err error) {
	defer func() {
		if p := recover(); p != nil {
			resp = &pb.OpenResponse{Failure: recovered("Open", p)}
		}
	}()
	m, f := s.model(req.GetModel())
	if f != nil {
		return &pb.OpenResponse{Failure: f}, nil
	}
	pot, err := m.New(req.GetParams())
	if err != nil {
		return &pb.OpenResponse{Failure: FailureFromError(err)}, nil
	}
	if pot == nil {
		return &pb.OpenResponse{Failure: &pb.Failure{Message: fmt.Sprintf("%s: New returned no potential and no error", req.GetModel())}}, nil
	}
	resp = &pb.OpenResponse{Domain: DomainToProto(pot.Domain())}
	if id, ok := pot.(conformance.Identifier); ok {
		for _, x := range id.Identities() {
			px, err := IdentityToProto(x)
			if err != nil {
				return &pb.OpenResponse{Failure: FailureFromError(fmt.Errorf("%s: %w", req.GetModel(), err))}, nil
			}
			resp.Identities = append(resp.Identities, px)
		}
	}
	s.mu.Lock()
	s.next++
	resp.Handle = s.next
	s.pots[resp.Handle] = pot
	s.mu.Unlock()
	return resp, nil
}

// Potential returns the potential under handle h.
func (s *Server) Potential(h uint64) (core.Potential, bool) {
	s.mu.RLock()
	p, ok := s.pots[h]
	s.mu.RUnlock()
	return p, ok
}

// Evaluate evaluates the potential under a handle.
func (s *Server) Evaluate(_ context.Context, req *pb.EvaluateRequest) (*pb.EvaluateResponse, error) {
	values, pf, f := s.evaluate(req.GetHandle(), int(req.GetOrder()), req.GetR(), nil)
	return &pb.EvaluateResponse{Values: values, PointFailure: pf, Failure: f}, nil
}

// evaluate is Evaluate for both transports: one Taylor call of order n at
// every r. It returns the (n+1)·len(r) coefficients or one of the
// failures. values reuses buf when it is large enough.
func (s *Server) evaluate(handle uint64, n int, r, buf []float64) (values []float64, pf *pb.PointFailure, f *pb.Failure) {
	defer func() {
		if p := recover(); p != nil {
			values, pf, f = nil, nil, recovered("Evaluate", p)
		}
	}()
	pot, ok := s.Potential(handle)
	if !ok {
		return nil, nil, &pb.Failure{Message: fmt.Sprintf("unknown handle %d", handle)}
	}
	if err := core.CheckOrder(n, pot.MaxOrder()); err != nil {
		return nil, nil, FailureFromError(err)
	}
	values = grow(buf, len(r)*(n+1))
	if err := pot.Taylor(n, r, values); err != nil {
		return nil, pointFailure(err), nonPointFailure(err)
	}
	return s.filter(handle, values), nil, nil
}

func (s *Server) filter(handle uint64, values []float64) []float64 {
	if s.Filter == nil {
		return values
	}
	return s.Filter(handle, values)
}

// grow returns buf resliced to n, or a new slice if buf is too short.
func grow(buf []float64, n int) []float64 {
	if cap(buf) >= n {
		return buf[:n]
	}
	return make([]float64, n)
}

// pointFailure returns the point failure of a Taylor error, nil if err is
// not a *core.PointError.
func pointFailure(err error) *pb.PointFailure {
	var pe *core.PointError
	if !errors.As(err, &pe) {
		return nil
	}
	inner := pe.Err
	if inner == nil {
		inner = err
	}
	return &pb.PointFailure{Index: int64(pe.Index), Failure: FailureFromError(inner)}
}

// nonPointFailure returns the failure of a Taylor error that is not a
// *core.PointError, nil otherwise.
func nonPointFailure(err error) *pb.Failure {
	var pe *core.PointError
	if errors.As(err, &pe) {
		return nil
	}
	return FailureFromError(err)
}

// EvaluateSets evaluates many parameter sets of one model at the same
// separations (core.EvaluateSets: the model's own SetEvaluator, or New and
// Taylor for each set).
func (s *Server) EvaluateSets(ctx context.Context, req *pb.EvaluateSetsRequest) (*pb.EvaluateSetsResponse, error) {
	if s.OldProtocol {
		return s.UnimplementedFormsServer.EvaluateSets(ctx, req)
	}
	return s.evaluateSets(req), nil
}

// evaluateSets is EvaluateSets for both transports.
func (s *Server) evaluateSets(req *pb.EvaluateSetsRequest) (resp *pb.EvaluateSetsResponse) {
	defer func() {
		if p := recover(); p != nil {
			resp = &pb.EvaluateSetsResponse{Failure: recovered("EvaluateSets", p)}
		}
	}()
	m, f := s.model(req.GetModel())
	if f != nil {
		return &pb.EvaluateSetsResponse{Failure: f}
	}
	n, sets, r := int(req.GetOrder()), int(req.GetSets()), req.GetR()
	if sets < 1 || sets > maxFastValues || len(r) > maxFastValues || n < 0 || n > maxFastValues {
		return &pb.EvaluateSetsResponse{Failure: FailureFromError(fmt.Errorf("%w: %d sets, order %d, %d separations", core.ErrLength, sets, n, len(r)))}
	}
	block := len(r) * (n + 1)
	if req.GetParamGradient() {
		block = len(r) * len(m.Info().Params)
	}
	if sets*block > maxFastValues {
		return &pb.EvaluateSetsResponse{Failure: FailureFromError(fmt.Errorf("%w: %d values in one call, the limit is %d", core.ErrLength, sets*block, maxFastValues))}
	}
	values := make([]float64, sets*block)
	errs := make([]error, sets)
	if req.GetParamGradient() {
		if err := paramGradients(m, n, req.GetParams(), r, values, errs); err != nil {
			return &pb.EvaluateSetsResponse{Failure: FailureFromError(err)}
		}
	} else if err := core.EvaluateSets(m, n, req.GetParams(), r, values, errs); err != nil {
		return &pb.EvaluateSetsResponse{Failure: FailureFromError(err)}
	}
	resp = &pb.EvaluateSetsResponse{Values: values}
	for i, err := range errs {
		if err != nil {
			clear(values[i*block : (i+1)*block])
			resp.SetFailures = append(resp.SetFailures, &pb.SetFailure{Set: int64(i), Failure: nonPointFailure(err), PointFailure: pointFailure(err)})
		}
	}
	return resp
}

// paramGradients stores ∂V(r[i])/∂pⱼ of each parameter set (New, then
// core.ParamDerivatives) in dst, set after set, and each set's error in
// errs; the order n must be 0.
func paramGradients(m core.Model, n int, params, r, dst []float64, errs []error) error {
	info := m.Info()
	np := len(info.Params)
	if n != 0 || len(params) != len(errs)*np || len(dst) != len(errs)*len(r)*np {
		return fmt.Errorf("%s: %w: parameter derivatives take order 0, %d sets of %d parameters, %d values", info.Key, core.ErrLength, len(errs), np, len(errs)*len(r)*np)
	}
	block := len(r) * np
	for s := range errs {
		pot, err := m.New(params[s*np : (s+1)*np])
		if err == nil {
			err = core.ParamDerivatives(pot, r, dst[s*block:(s+1)*block])
		}
		errs[s] = err
	}
	return nil
}

// Close forgets a handle.
func (s *Server) Close(_ context.Context, req *pb.CloseRequest) (*pb.CloseResponse, error) {
	s.mu.Lock()
	delete(s.pots, req.GetHandle())
	s.mu.Unlock()
	return &pb.CloseResponse{}, nil
}

// Match derives a parameter set from a target well.
func (s *Server) Match(_ context.Context, req *pb.MatchRequest) (resp *pb.MatchResponse, err error) {
	defer func() {
		if p := recover(); p != nil {
			resp = &pb.MatchResponse{Failure: recovered("Match", p)}
		}
	}()
	m, f := s.model(req.GetModel())
	if f != nil {
		return &pb.MatchResponse{Failure: f}, nil
	}
	params, notes, err := core.Match(m, core.Target{Re: req.GetRe(), Depth: req.GetDepth(), K: req.GetK()})
	if err != nil {
		return &pb.MatchResponse{Failure: FailureFromError(err)}, nil
	}
	return &pb.MatchResponse{Params: params, Notes: notes}, nil
}

// Keys returns the keys of the served models, in the order given.
func (s *Server) Keys() []string {
	keys := make([]string, len(s.infos))
	for i, m := range s.infos {
		keys[i] = m.GetKey()
	}
	return keys
}
