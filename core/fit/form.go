package fit

import (
	"errors"
	"fmt"
	"math"
	"slices"
	"sync"
	"sync/atomic"

	"gonum.org/v1/gonum/mat"

	"github.com/pairwell/pairwell/core"
)

// DefaultRestarts is the number of deterministic restarts of FitForm
// beyond its main start.
const DefaultRestarts = 4

// sameMinimum is the relative difference of RSS within which two starts
// are taken to have reached the same minimum; FitForm stops its restarts
// there.
const sameMinimum = 1e-8

// DefaultForceWeight is the weight of a force residual (eV/Å)² relative to
// an energy residual (eV)², in Å²: 1 Å² (common practice when nothing
// better is known).
const DefaultForceWeight = 1.0

// WindowFractions are the energy windows of Result.Windows, as fractions
// of the data's depth above its minimum.
var WindowFractions = [2]float64{0.1, 0.5}

// Settings controls FitForm. The zero value is ready to use: energy zero
// at the largest r, the data's own weights or uniform ones, forces (when
// present) with weight DefaultForceWeight, DefaultRestarts restarts and the
// engine's defaults.
type Settings struct {
	Offset  Offset
	Weights Weights
	// ForceWeight is the weight w_F in Å² of the force residuals: the
	// fit minimises Σ wᵢ(V(rᵢ) − Eᵢ)² + w_F·Σ wᵢ(−V′(rᵢ) − Fᵢ)². Zero
	// means DefaultForceWeight; ignored when the data have no forces.
	ForceWeight float64
	// Restarts is the number of restarts beyond the main start; zero
	// means DefaultRestarts, a negative value none.
	Restarts int
	// Start, when not nil, replaces the automatic start: parameters in
	// the model's order and default units.
	Start []float64
	// Central makes the Jacobian central differences even for a
	// potential that implements core.ParamGradient (for comparisons).
	Central bool
	// LM controls the least-squares engine.
	LM LMSettings
}

// Errors summarises the energy errors V(rᵢ) + zero − Eᵢ of a set of points,
// unweighted, in eV.
type Errors struct {
	N    int     // number of points
	RMSE float64 // root mean square
	MAE  float64 // mean absolute
	Max  float64 // largest absolute
}

// WindowErrors are the errors of the points in an energy window.
type WindowErrors struct {
	// Fraction of the data's depth (WindowFractions).
	Fraction float64
	// Bound is the window's top above the data's minimum, eV: the points
	// with Eᵢ − E_min ≤ Bound.
	Bound float64
	Errors
}

// Result is the fit of one form.
type Result struct {
	// Instance is the fitted form: model, parameters (default units) and
	// potential.
	Instance core.Instance
	// StdErr holds the standard errors of the parameters, NaN where they
	// are not determined (as many points as parameters, or a
	// rank-deficient Jacobian). Correlation is their correlation matrix,
	// nil when not determined.
	StdErr      []float64
	Correlation [][]float64
	// Zero is the energy zero of the data in eV (fitted, given or the
	// energy at the largest r), ZeroFitted whether it was fitted and
	// ZeroErr its standard error (NaN when not fitted or not
	// determined).
	Zero       float64
	ZeroFitted bool
	ZeroErr    float64
	// ZeroSource says where the zero came from: "fitted", "largest r"
	// (the energy at the largest r) or "given".
	ZeroSource string
	// RSS is the weighted residual sum of squares at the optimum, eV².
	RSS float64
	// Iterations, Evaluations (potential builds with one batched call
	// each) and the engine's stopping reason; GradNorm is the norm of
	// the gradient of ½RSS with respect to the internal parameters (log p
	// for constrained ones, p otherwise, the zero last) in eV².
	Iterations, Evaluations int
	Reason                  Reason
	GradNorm                float64
	// Start is the starting parameter set that led to the result, and
	// StartIndex its number (0 the main start, 1… the restarts).
	Start      []float64
	StartIndex int
	// Fitted is the number of points with non-zero weight.
	Fitted int
	// All are the errors over every point of the data; Windows those in
	// the energy windows of WindowFractions (absent when the data have no
	// positive depth).
	All     Errors
	Windows []WindowErrors
	// Analytic reports that the Jacobian came from core.ParamGradient rather
	// than from central differences.
	Analytic bool
	// Notes say what the reader must know (a fitted zero for a form with
	// no dissociation limit, an undetermined error, a restart that won).
	Notes []string
}

// Converged reports whether the engine met a convergence test.
func (r Result) Converged() bool { return r.Reason.Converged() }

// FitForm fits the model m to the data by weighted least squares in the
// energies (and forces, when present):
//
//	RSS = Σᵢ wᵢ (V(rᵢ) + zero − Eᵢ)² [+ w_F Σᵢ wᵢ (−V′(rᵢ) − Fᵢ)²],
//
// with the energy zero as Settings.Offset says. Parameters constrained
// "> 0" or "≥ 0" are fitted as their logarithm, so every trial set keeps
// its constraints ("≥ 0" is then reached only as a limit, see Notes; a
// parameter driven below 1e-12 of its start ends the fit with Reason
// Boundary).
// Without Settings.Start, m must match target wells (core.Match): the main start is
// its match to EstimateWell(data); each restart matches a deterministic
// variation of that target (k ×2, ×½, ×4, depth ×½, …) and the result with
// the smallest RSS wins (a converged one before an unconverged one). The
// restarts stop as soon as two starts reach the same RSS (to 1e-8
// relative).
//
// Standard errors are √diag(C) of C = s²(JᵀJ)⁻¹, J the Jacobian of the
// weighted residuals with respect to the parameters at the optimum and
// s² = RSS/(n − P) with n the points of non-zero weight (residual rows)
// and P the fitted parameters (the zero included when fitted).
//
// Errors wrap core.ErrParam for invalid data or settings (fewer points than
// parameters included), core.ErrNoMinimum when no start can be made, and
// whatever a potential returns otherwise (a plugin failure).
func FitForm(m core.Model, d Data, s Settings) (Result, error) {
	info := m.Info()
	if err := d.Validate(); err != nil {
		return Result{}, err
	}
	w, err := s.Weights.weights(d)
	if err != nil {
		return Result{}, err
	}
	pr, err := newFormProblem(m, d, w, s)
	if err != nil {
		return Result{}, err
	}
	starts, err := pr.starts(s)
	if err != nil {
		return Result{}, err
	}
	var best Result
	var bestErr error
	found := false
	mainRSS := math.Inf(1)
	seen := map[string]bool{}
	for i := range starts {
		st := &starts[i]
		if st.params == nil && st.err == nil {
			// Matched only when reached: a numerical match (formula
			// forms) costs more than a fit step.
			st.params, _, st.err = core.Match(pr.m, st.target)
			if st.err == nil {
				key := fmt.Sprint(st.params)
				if seen[key] {
					continue // the form ignores what was varied
				}
				seen[key] = true
			}
		}
		if st.err != nil {
			if bestErr == nil {
				bestErr = st.err
			}
			continue
		}
		r, err := pr.run(st.params, s.LM)
		if err != nil {
			if !errors.Is(err, ErrInfeasible) {
				return Result{}, fmt.Errorf("%s: %w", info.Key, err)
			}
			if bestErr == nil {
				bestErr = err
			}
			continue
		}
		r.StartIndex = i
		if i == 0 {
			mainRSS = r.RSS
		}
		same := found && math.Abs(r.RSS-best.RSS) <= sameMinimum*math.Max(r.RSS, best.RSS)
		if !found || better(r, best) {
			best, found = r, true
		}
		if same {
			break // two starts agree: the restarts have done their job
		}
	}
	if !found {
		return Result{}, fmt.Errorf("%s: %w: no start led to a fit: %v", info.Key, ErrInfeasible, bestErr)
	}
	if best.StartIndex > 0 && !(mainRSS <= 1.01*best.RSS+1e-24) {
		best.Notes = append(best.Notes, fmt.Sprintf("restart %d (%s) gave the lowest RSS", best.StartIndex, starts[best.StartIndex].what))
	}
	if err := pr.finish(&best); err != nil {
		return Result{}, fmt.Errorf("%s: %w", info.Key, err)
	}
	return best, nil
}

// better reports whether a should replace b as the best fit.
func better(a, b Result) bool {
	if a.Converged() != b.Converged() {
		return a.Converged()
	}
	return a.RSS < b.RSS
}

// formProblem is the least-squares problem of one form and data set.
type formProblem struct {
	m         core.Model
	info      core.ModelInfo
	d         Data
	rows      []int     // indices of the points with non-zero weight
	r         []float64 // their separations
	e         []float64 // their energies
	f         []float64 // their forces, nil when none
	sw        []float64 // √wᵢ
	swf       []float64 // √(w_F wᵢ)
	np        int       // model parameters
	fitZero   bool
	zero      float64 // the zero when not fitted; the estimate when fitted
	log       []bool  // parameter j fitted as its logarithm
	g         []float64
	analytic  bool
	evals     atomic.Int64
	notes     []string
	dataDepth float64 // zero estimate − E_min, for the windows
	unbounded bool    // the form has no dissociation limit
	central   bool    // Settings.Central
	sets      bool    // the model is a core.SetEvaluator
	noMatch   bool    // the model has no Match (probe)

	lastMu     sync.Mutex // guards the potential the last residuals built
	lastParams []float64
	lastPot    core.Potential
	floor      []float64
	zeroSource string
}

// constraintFloor bounds a parameter fitted as a logarithm from below, at
// this fraction of its starting value: a fit that drives a "> 0" parameter
// towards 0 would otherwise crawl through hundreds of iterations in log p;
// it stops there with Reason Boundary instead.
const constraintFloor = 1e-12

func newFormProblem(m core.Model, d Data, w []float64, s Settings) (*formProblem, error) {
	info := m.Info()
	p := &formProblem{m: m, info: info, d: d, np: len(info.Params), central: s.Central}
	_, p.sets = m.(core.SetEvaluator)
	emin := math.Inf(1)
	for _, e := range d.E {
		emin = math.Min(emin, e)
	}
	top := d.E[len(d.E)-1]
	switch s.Offset.Mode {
	case OffsetAuto:
		p.zero, p.zeroSource = top, "largest r"
	case OffsetFit:
		p.zero, p.fitZero = top, true
	case OffsetValue:
		p.zeroSource = "given"
		if !finite(s.Offset.Value) {
			return nil, fmt.Errorf("%w: energy zero %g eV is not finite", core.ErrParam, s.Offset.Value)
		}
		p.zero = s.Offset.Value
	default:
		return nil, fmt.Errorf("%w: unknown offset mode %d", core.ErrParam, s.Offset.Mode)
	}
	p.dataDepth = p.zero - emin
	pot, err := probe(m, s.Start)
	p.noMatch = s.Start == nil && errors.Is(err, core.ErrUnsupported)
	p.unbounded = err == nil && !pot.Domain().Bounded()
	if p.unbounded && !p.fitZero {
		p.fitZero = true
		p.notes = append(p.notes, fmt.Sprintf("%s has no dissociation limit (its zero is at its minimum): its energy zero is fitted", info.Key))
	}
	if p.fitZero {
		p.zeroSource = "fitted"
	}
	fw := s.ForceWeight
	if fw == 0 {
		fw = DefaultForceWeight
	}
	if !(fw > 0) || math.IsInf(fw, 0) {
		return nil, fmt.Errorf("%w: force weight %g Å² must be > 0", core.ErrParam, fw)
	}
	for i := range d.R {
		if w[i] > 0 {
			p.rows = append(p.rows, i)
			p.r = append(p.r, d.R[i])
			p.e = append(p.e, d.E[i])
			p.sw = append(p.sw, math.Sqrt(w[i]))
			if d.F != nil {
				p.f = append(p.f, d.F[i])
				p.swf = append(p.swf, math.Sqrt(fw*w[i]))
			}
		}
	}
	if n, np := p.nres(), p.nparams(); n < np {
		what := ""
		if p.fitZero {
			what = " and the energy zero"
		}
		return nil, fmt.Errorf("%w: %s: %d data points with non-zero weight, fewer than the %d parameters (%d of the form%s)", core.ErrParam, info.Key, len(p.rows), np, p.np, what)
	}
	p.log = make([]bool, p.np)
	for j, q := range info.Params {
		p.log[j] = q.Constraint == core.Positive || q.Constraint == core.NonNegative
	}
	p.g = make([]float64, len(p.r)*p.np)
	return p, nil
}

// probe builds the model at the given start, or without one at a start
// its Match can make, to learn its domain. The error wraps
// core.ErrUnsupported when it needs Match and m has none (a wrapper of a
// model always has Match and reports it so when the inner model has
// none: core.Match).
func probe(m core.Model, start []float64) (core.Potential, error) {
	if start != nil {
		return m.New(start)
	}
	params, _, err := core.Match(m, core.Target{Re: 1, Depth: 1, K: 10})
	if err != nil {
		return nil, err
	}
	return m.New(params)
}

func (p *formProblem) nres() int {
	if p.f != nil {
		return 2 * len(p.r)
	}
	return len(p.r)
}

func (p *formProblem) nparams() int {
	if p.fitZero {
		return p.np + 1
	}
	return p.np
}

// params converts internal parameters θ to the model's (and the zero).
func (p *formProblem) params(theta []float64) ([]float64, float64) {
	out := make([]float64, p.np)
	for j := range out {
		out[j] = theta[j]
		if p.log[j] {
			out[j] = math.Exp(theta[j])
		}
	}
	zero := p.zero
	if p.fitZero {
		zero = theta[p.np]
	}
	return out, zero
}

// theta converts model parameters and a zero to internal ones.
func (p *formProblem) theta(params []float64, zero float64) ([]float64, error) {
	out := make([]float64, p.nparams())
	for j, v := range params {
		out[j] = v
		if p.log[j] {
			if !(v > 0) {
				return nil, fmt.Errorf("%w: start %s = %g: a start on the boundary of %s cannot be fitted as a logarithm", core.ErrParam, p.info.Params[j].Name, v, p.info.Params[j].Constraint)
			}
			out[j] = math.Log(v)
		}
	}
	if p.fitZero {
		out[p.np] = zero
	}
	return out, nil
}

// feasible converts θ to the model's parameters and the zero, with an
// error wrapping ErrInfeasible for a parameter below its floor.
func (p *formProblem) feasible(theta []float64) ([]float64, float64, error) {
	params, zero := p.params(theta)
	for j, v := range params {
		if p.log[j] && v < p.floor[j] {
			return nil, 0, fmt.Errorf("%w: %s = %g has fallen below %g·(its start): the fit runs into the constraint %s", ErrInfeasible, p.info.Params[j].Name, v, constraintFloor, p.info.Params[j].Constraint)
		}
	}
	return params, zero, nil
}

// residuals may run concurrently (the central differences of a
// Jacobian): it allocates its own scratch. For a model that evaluates
// parameter sets in one call (core.SetEvaluator: a plugin) it is one
// such call, without building a potential.
func (p *formProblem) residuals(theta, dst []float64) error {
	if p.sets {
		var errs [1]error
		if err := p.batch([][]float64{theta}, [][]float64{dst}, errs[:]); err != nil {
			return err
		}
		return errs[0]
	}
	params, zero, err := p.feasible(theta)
	if err != nil {
		return err
	}
	p.evals.Add(1)
	pot, err := build(p.m, params)
	if err != nil {
		return err
	}
	p.lastMu.Lock()
	p.lastParams, p.lastPot = params, pot
	p.lastMu.Unlock()
	vals := make([]float64, len(p.r))
	if err := energies(pot, p.r, vals); err != nil {
		return err
	}
	var fd []float64
	if p.f != nil {
		fd = make([]float64, len(p.r))
		if err := forces(pot, p.r, fd); err != nil {
			return err
		}
	}
	p.weigh(vals, fd, zero, dst)
	return nil
}

// weigh stores the weighted residuals of the energies v (and the forces
// f, when the data have them) with the energy zero in dst.
func (p *formProblem) weigh(v, f []float64, zero float64, dst []float64) {
	for i := range v {
		dst[i] = p.sw[i] * (v[i] + zero - p.e[i])
	}
	if p.f != nil {
		fd := dst[len(p.r):]
		for i := range fd {
			fd[i] = p.swf[i] * (f[i] - p.f[i])
		}
	}
}

// batch evaluates the residuals at many θ in one call of the model
// (core.EvaluateSets; Problem.Batch).
func (p *formProblem) batch(thetas, dsts [][]float64, errs []error) error {
	order := 0
	if p.f != nil {
		order = 1 // V and V′ together
	}
	var flat, zeros []float64
	var idx []int
	for k, t := range thetas {
		params, zero, err := p.feasible(t)
		if err != nil {
			errs[k] = err
			continue
		}
		errs[k] = nil
		flat = append(flat, params...)
		zeros = append(zeros, zero)
		idx = append(idx, k)
	}
	if len(idx) == 0 {
		return nil
	}
	p.evals.Add(int64(len(idx)))
	w := order + 1
	vals := make([]float64, len(idx)*len(p.r)*w)
	es := make([]error, len(idx))
	if err := evaluateSets(p.m, order, flat, p.r, vals, es); err != nil {
		return err
	}
	v := make([]float64, len(p.r))
	var f []float64
	if p.f != nil {
		f = make([]float64, len(p.r))
	}
	for s, k := range idx {
		if es[s] != nil {
			errs[k] = infeasible(es[s])
			continue
		}
		blk := vals[s*len(p.r)*w : (s+1)*len(p.r)*w]
		for i := range v {
			v[i] = blk[i*w]
			if f != nil {
				f[i] = -blk[i*w+1]
			}
		}
		p.weigh(v, f, zeros[s], dsts[k])
	}
	return nil
}

// jacobian is the analytic Jacobian of the residuals in θ, available when
// the potential implements core.ParamGradient and the data have no forces.
func (p *formProblem) jacobian(theta, dst []float64) error {
	params, _ := p.params(theta)
	pot, err := p.potential(params)
	if err != nil {
		return err
	}
	ok, err := paramGradient(pot, p.r, p.g)
	if err != nil {
		return err
	}
	if !ok {
		return fmt.Errorf("%s: analytic parameter gradient vanished", p.info.Key)
	}
	np, npt := p.np, p.nparams()
	for i := range p.r {
		for j := 0; j < np; j++ {
			dv := p.g[i*np+j]
			if p.log[j] {
				dv *= params[j] // ∂/∂ log p = p ∂/∂p
			}
			dst[i*npt+j] = p.sw[i] * dv
		}
		if p.fitZero {
			dst[i*npt+np] = p.sw[i]
		}
	}
	return nil
}

// potential returns the potential of params: the one the last residuals
// built when they were for the same parameters (the engine asks for the
// Jacobian at the point it has just accepted), else a new one.
func (p *formProblem) potential(params []float64) (core.Potential, error) {
	p.lastMu.Lock()
	pot, same := p.lastPot, slices.Equal(p.lastParams, params)
	p.lastMu.Unlock()
	if same {
		return pot, nil
	}
	return build(p.m, params)
}

// start is one starting point (given, or the match to target, made when
// the start is reached), or why it could not be made.
type start struct {
	params []float64
	target core.Target
	what   string
	err    error
}

// restartTargets are the variations of the estimated well tried after the
// main start, in order.
var restartTargets = []struct {
	what         string
	k, depth, re float64
}{
	{"k ×2", 2, 1, 1},
	{"k ×½", 0.5, 1, 1},
	{"k ×4", 4, 1, 1}, // moves an inner barrier (Buckingham) far inwards
	{"depth ×½", 1, 0.5, 1},
	{"depth ×2", 1, 2, 1},
	{"re ×0.95", 1, 1, 0.95},
	{"re ×1.05", 1, 1, 1.05},
}

func (p *formProblem) starts(s Settings) ([]start, error) {
	if s.Start != nil {
		if err := core.CheckParams(p.info, s.Start); err != nil {
			return nil, err
		}
		return []start{{params: append([]float64(nil), s.Start...), what: "given start"}}, nil
	}
	if p.noMatch {
		return nil, fmt.Errorf("%w: %s cannot be started automatically: it has no Match (give a start)", core.ErrParam, p.info.Key)
	}
	zero := p.zero
	if p.unbounded {
		zero = math.Inf(1) // its depth is not a property of the form
	}
	t, err := EstimateWell(Data{R: p.r, E: p.e}, zero)
	if err != nil {
		return nil, fmt.Errorf("%s: automatic start: %w", p.info.Key, err)
	}
	n := s.Restarts
	switch {
	case n == 0:
		n = DefaultRestarts
	case n < 0:
		n = 0
	}
	n = min(n, len(restartTargets))
	out := []start{{target: t, what: "main start"}}
	for _, v := range restartTargets[:n] {
		out = append(out, start{target: core.Target{Re: t.Re * v.re, Depth: t.Depth * v.depth, K: t.K * v.k}, what: v.what})
	}
	return out, nil
}

// run minimises from one start.
func (p *formProblem) run(params []float64, ls LMSettings) (Result, error) {
	p.analytic = false // per start: the gradient may exist at one start and fail at another
	theta, err := p.theta(params, p.zeroStart())
	if err != nil {
		return Result{}, fmt.Errorf("%w: %w", ErrInfeasible, err)
	}
	pr := Problem{N: p.nres(), P: p.nparams(), Residuals: p.residuals, Concurrent: true}
	if p.sets {
		pr.Batch = p.batch
	}
	// A model that evaluates parameter sets in one call (a plugin) takes
	// central differences batched with each trial point, which costs fewer
	// round trips than opening the point for an analytic gradient.
	if p.f == nil && !p.central && !p.sets {
		pot, err := build(p.m, params)
		if err != nil {
			return Result{}, err
		}
		if ok, err := paramGradient(pot, p.r, p.g); ok && err == nil {
			pr.Jacobian = p.jacobian
			p.analytic = true
		}
	}
	p.evals.Store(0)
	p.floor = make([]float64, p.np)
	for j, v := range params {
		p.floor[j] = constraintFloor * v
	}
	lm, err := Minimize(pr, theta, ls)
	if err != nil {
		return Result{}, err
	}
	fitted, zero := p.params(lm.Theta)
	r := Result{
		Instance:    core.Instance{Model: p.m, Params: fitted},
		Zero:        zero,
		ZeroFitted:  p.fitZero,
		ZeroSource:  p.zeroSource,
		RSS:         lm.RSS,
		Iterations:  lm.Iterations,
		Evaluations: int(p.evals.Load()),
		Reason:      lm.Reason,
		GradNorm:    lm.GradNorm,
		Start:       append([]float64(nil), params...),
		Fitted:      len(p.r),
		Analytic:    p.analytic,
	}
	// Standard errors from the Jacobian in the model's parameters:
	// ∂r/∂p = ∂r/∂θ · dθ/dp, dθ/dp = 1/p for a logarithm.
	jp := mat.DenseCopyOf(lm.Jacobian)
	nr, _ := jp.Dims()
	for j := 0; j < p.np; j++ {
		if p.log[j] {
			for i := 0; i < nr; i++ {
				jp.Set(i, j, jp.At(i, j)/fitted[j])
			}
		}
	}
	r.StdErr = make([]float64, p.np)
	r.ZeroErr = math.NaN()
	cov := Covariance(jp, lm.RSS)
	if cov == nil {
		for j := range r.StdErr {
			r.StdErr[j] = math.NaN()
		}
		why := "as many residuals as parameters"
		if nr > p.nparams() {
			why = "the Jacobian is rank deficient: some parameter combination is not determined by the data"
		}
		r.Notes = append(r.Notes, "standard errors not determined: "+why)
		return r, nil
	}
	for j := 0; j < p.np; j++ {
		r.StdErr[j] = math.Sqrt(cov.At(j, j))
	}
	if p.fitZero {
		r.ZeroErr = math.Sqrt(cov.At(p.np, p.np))
	}
	r.Correlation = make([][]float64, p.np)
	for a := 0; a < p.np; a++ {
		r.Correlation[a] = make([]float64, p.np)
		for b := 0; b < p.np; b++ {
			r.Correlation[a][b] = cov.At(a, b) / math.Sqrt(cov.At(a, a)*cov.At(b, b))
		}
	}
	return r, nil
}

// zeroStart is the starting value of a fitted zero: the energy at the
// largest r for a form with a dissociation limit; for one without, the
// lowest energy (its zero is at its minimum).
func (p *formProblem) zeroStart() float64 {
	if !p.fitZero {
		return p.zero
	}
	if p.unbounded {
		emin := math.Inf(1)
		for _, e := range p.e {
			emin = math.Min(emin, e)
		}
		return emin
	}
	return p.zero
}

// finish builds the fitted potential and measures its errors over all
// points and in the windows.
func (p *formProblem) finish(r *Result) error {
	pot, err := p.m.New(r.Instance.Params)
	if err != nil {
		return fmt.Errorf("fitted parameters: %w", err)
	}
	r.Instance.Potential = pot
	r.Notes = append(p.notes, r.Notes...)
	for j, q := range p.info.Params {
		if q.Constraint == core.NonNegative && r.Instance.Params[j] < 1e-12*math.Max(1, math.Abs(r.StdErr[j])) {
			r.Notes = append(r.Notes, fmt.Sprintf("%s tends to 0, the boundary of its constraint (≥ 0): fitted as a logarithm it can only approach it", q.Name))
		}
	}
	if re, err := equilibrium(pot); err == nil && (re < p.d.R[0] || re > p.d.R[len(p.d.R)-1]) {
		r.Notes = append(r.Notes, fmt.Sprintf("the fitted form's minimum, r = %.4g Å, lies outside the data (%.4g to %.4g Å): the form does not describe this well", re, p.d.R[0], p.d.R[len(p.d.R)-1]))
	}
	v := make([]float64, len(p.d.R))
	if err := energies(pot, p.d.R, v); err != nil {
		r.All = Errors{N: len(v), RMSE: math.NaN(), MAE: math.NaN(), Max: math.NaN()}
		r.Notes = append(r.Notes, fmt.Sprintf("the fitted form cannot be evaluated at every point of the data (%v): errors over all points not given", err))
		return nil
	}
	emin := math.Inf(1)
	for _, e := range p.d.E {
		emin = math.Min(emin, e)
	}
	errs := make([]float64, len(v))
	for i := range v {
		errs[i] = v[i] + r.Zero - p.d.E[i]
	}
	r.All = summarise(errs, func(int) bool { return true })
	if p.dataDepth > 0 {
		for _, f := range WindowFractions {
			bound := f * p.dataDepth
			r.Windows = append(r.Windows, WindowErrors{Fraction: f, Bound: bound,
				Errors: summarise(errs, func(i int) bool { return p.d.E[i]-emin <= bound })})
		}
	}
	return nil
}

// summarise returns the errors of the points i with in(i).
func summarise(errs []float64, in func(int) bool) Errors {
	var e Errors
	var ss float64
	for i, v := range errs {
		if !in(i) {
			continue
		}
		e.N++
		a := math.Abs(v)
		ss += v * v
		e.MAE += a
		e.Max = math.Max(e.Max, a)
	}
	if e.N == 0 {
		return Errors{RMSE: math.NaN(), MAE: math.NaN(), Max: math.NaN()}
	}
	e.RMSE = math.Sqrt(ss / float64(e.N))
	e.MAE /= float64(e.N)
	return e
}
