package fit

import (
	"errors"
	"fmt"
	"math"
	"slices"
	"sync"
	"sync/atomic"

	"gonum.org/v1/gonum/floats"
	"gonum.org/v1/gonum/mat"

	"github.com/pairwell/pairwell/core"
)

// ErrInfeasible is returned by a Problem's Residuals for a parameter vector
// at which the model cannot be evaluated (outside its constraints, a point
// beyond its domain, no minimum where the form requires one). The engine
// rejects such a trial step like one that increases the cost.
var debug = false

var ErrInfeasible = errors.New("infeasible parameters")

// Problem is a nonlinear least-squares problem: minimise the residual sum
// of squares S(θ) = Σᵢ rᵢ(θ)², i = 1…N, over the parameters θ ∈ ℝᴾ. Weights
// are part of the residuals (rᵢ = √wᵢ·(model − data)).
type Problem struct {
	// N is the number of residuals and P the number of parameters.
	N, P int
	// Residuals stores r(θ) in dst (length N). It is called once per
	// trial point, for all residuals at once. An error wrapping
	// ErrInfeasible rejects the trial point; any other error stops the
	// minimisation.
	Residuals func(theta, dst []float64) error
	// Jacobian stores ∂rᵢ/∂θⱼ in dst[i·P+j] (row-major N×P). It is called
	// once per accepted point. When nil, the engine uses central
	// differences, see LMSettings.Step.
	Jacobian func(theta, dst []float64) error
	// Concurrent says that Residuals may be called from several
	// goroutines at once; the 2P evaluations of a central-difference
	// Jacobian then run concurrently.
	Concurrent bool
	// Batch, when not nil, evaluates the residuals at many points in one
	// call: those of thetas[i] in dsts[i], and in errs[i] the error
	// Residuals would return there; the returned error stops the
	// minimisation. The engine then evaluates each trial point together
	// with the 2P sides of its central differences in one call, so that
	// the Jacobian of an accepted trial comes with it (for a potential in
	// another process, one round trip per trial point and none for the
	// Jacobian).
	Batch func(thetas, dsts [][]float64, errs []error) error
}

// Reason says why a minimisation stopped.
type Reason string

// The reasons a minimisation stops. All but IterationLimit, Boundary and
// NoProgress mean convergence.
const (
	// SmallGradient: the largest cosine between the residual vector and a
	// Jacobian column is ≤ LMSettings.GradTol (MINPACK's gtol test).
	SmallGradient Reason = "gradient"
	// SmallStep: the scaled Gauss–Newton step, or the damped step after
	// rejected trials, is ≤ LMSettings.StepTol relative to the scaled
	// parameters.
	SmallStep Reason = "step"
	// SmallReduction: the actual and the predicted relative reductions of
	// S are both ≤ LMSettings.CostTol.
	SmallReduction Reason = "cost"
	// ZeroResidual: S is zero to rounding, ≤ (N·ε·scale)², where scale is
	// the largest |rᵢ| at the start.
	ZeroResidual Reason = "zero residual"
	// IterationLimit: LMSettings.MaxIter iterations without convergence.
	IterationLimit Reason = "iteration limit"
	// Boundary: the trial steps left the feasible set (ErrInfeasible)
	// until they shrank to nothing: the best point lies on its edge (a
	// form's domain reaching the data, say) and is not a stationary
	// point of S.
	Boundary Reason = "feasibility boundary"
	// NoProgress: the damping grew beyond 10³⁰·max σ² without an accepted
	// step, the cost not yet meeting a convergence test.
	NoProgress Reason = "no progress"
)

// Converged reports whether r is a convergence reason.
func (r Reason) Converged() bool {
	return r != IterationLimit && r != NoProgress && r != Boundary && r != ""
}

// Defaults of LMSettings.
const (
	DefaultMaxIter  = 200
	DefaultGradTol  = 1e-12
	DefaultStepTol  = 1e-13
	DefaultCostTol  = 1e-20
	DefaultStepSize = 6.0554544523933395e-06 // ε^{1/3}, ε = 2⁻⁵²
)

// LMSettings controls Minimize. The zero value is ready to use: every zero
// field takes its default.
type LMSettings struct {
	// MaxIter bounds the iterations (accepted steps). Zero means
	// DefaultMaxIter (200).
	MaxIter int
	// GradTol, StepTol and CostTol are the convergence tolerances of the
	// reasons SmallGradient, SmallStep and SmallReduction. Zero means
	// 1e-12, 1e-13 and 1e-20.
	GradTol, StepTol, CostTol float64
	// Step is the relative step of the central differences used when
	// Problem.Jacobian is nil: θⱼ ± hⱼ with hⱼ = Step·|θⱼ| (Step when θⱼ = 0), which
	// costs 2P calls of Residuals per Jacobian, each for all residuals.
	// Zero means ε^{1/3} ≈ 6.06e-6, which balances the O(h²) truncation
	// error against the rounding error ε/h.
	Step float64
}

func (s LMSettings) withDefaults() LMSettings {
	if s.MaxIter <= 0 {
		s.MaxIter = DefaultMaxIter
	}
	if s.GradTol <= 0 {
		s.GradTol = DefaultGradTol
	}
	if s.StepTol <= 0 {
		s.StepTol = DefaultStepTol
	}
	if s.CostTol <= 0 {
		s.CostTol = DefaultCostTol
	}
	if s.Step <= 0 {
		s.Step = DefaultStepSize
	}
	return s
}

// LMResult is the outcome of Minimize.
type LMResult struct {
	// Theta is the best parameter vector found.
	Theta []float64
	// RSS is S(Theta) = Σ rᵢ².
	RSS float64
	// Jacobian is ∂rᵢ/∂θⱼ at Theta, N×P.
	Jacobian *mat.Dense
	// Iterations counts accepted steps; Evaluations counts calls of
	// Residuals (central differences included) and Jacobians the
	// Jacobians computed.
	Iterations, Evaluations, Jacobians int
	// Reason says why the minimisation stopped.
	Reason Reason
	// GradNorm is the Euclidean norm of the gradient Jᵀr of ½S at Theta
	// (in the units of r² per unit of θ).
	GradNorm float64
}

// Converged reports whether the minimisation met a convergence test.
func (r LMResult) Converged() bool { return r.Reason.Converged() }

// Minimize minimises the residual sum of squares of p from start by the
// Levenberg–Marquardt method (K. Levenberg, Q. Appl. Math. 2, 164 (1944);
// D. W. Marquardt, J. SIAM 11, 431 (1963)). It is written here because
// gonum has no Levenberg–Marquardt (gonum/optimize minimises scalar
// functions and does not exploit the least-squares structure); the linear
// algebra is gonum's.
//
// Each iteration scales the parameters by the column norms of the current
// Jacobian (Marquardt's scaling; MINPACK keeps their running maximum
// instead, which makes a parameter whose influence fades — a fit running
// into a constraint — crawl through hundreds of iterations), takes
// the singular value decomposition J·D⁻¹ = UΣVᵀ once and solves the damped
// step δ = −D⁻¹V·diag(σ/(σ² + λ))·Uᵀr for each trial λ from it, which is
// the least-squares solution of [JD⁻¹; √λ·I]·Dδ = −[r; 0] without forming
// JᵀJ. The damping follows H. B. Nielsen (IMM-REP-1999-05): after a step
// with gain ratio ρ > 0, λ ← λ·max(⅓, 1 − (2ρ − 1)³); after a rejected
// step λ ← λ·ν, ν ← 2ν. Trial points whose residuals fail with
// ErrInfeasible count as rejected steps.
//
// An error is returned when start is infeasible, when Residuals or
// Jacobian fail otherwise, or when the problem is malformed (N < P, a
// non-finite residual); an unconverged but valid minimisation returns its
// best point with Reason IterationLimit or NoProgress and no error.
func Minimize(p Problem, start []float64, s LMSettings) (LMResult, error) {
	s = s.withDefaults()
	n, np := p.N, p.P
	if np < 1 || n < np || len(start) != np {
		return LMResult{}, fmt.Errorf("least squares: %w: %d residuals, %d parameters, %d start values (need residuals ≥ parameters ≥ 1)", core.ErrParam, n, np, len(start))
	}
	res := LMResult{Theta: append([]float64(nil), start...)}
	r := make([]float64, n)
	rt := make([]float64, n)
	tt := make([]float64, np)
	var evals atomic.Int64
	eval := func(theta, dst []float64) error {
		evals.Add(1)
		if err := p.Residuals(theta, dst); err != nil {
			return err
		}
		return finiteResiduals(dst)
	}
	var batch func(thetas, dsts [][]float64, errs []error) error
	if p.Batch != nil {
		batch = func(thetas, dsts [][]float64, errs []error) error {
			evals.Add(int64(len(thetas)))
			if err := p.Batch(thetas, dsts, errs); err != nil {
				return err
			}
			for i, d := range dsts {
				if errs[i] == nil {
					errs[i] = finiteResiduals(d)
				}
			}
			return nil
		}
	}
	// With a batched problem and no analytic Jacobian, each trial point is
	// evaluated together with the 2P sides of its central differences, in
	// one call: the Jacobian of an accepted trial is then ready (pending),
	// and an iteration costs one call instead of two.
	var pending *mat.Dense
	var pendingTheta []float64
	trial := func(theta, dst []float64) error {
		if batch == nil || p.Jacobian != nil {
			return eval(theta, dst)
		}
		sides, hs := centralSides(theta, s.Step)
		thetas := append([][]float64{theta}, sides...)
		dsts := make([][]float64, len(thetas))
		for i := range dsts {
			dsts[i] = make([]float64, n)
		}
		errs := make([]error, len(thetas))
		if err := batch(thetas, dsts, errs); err != nil {
			return err
		}
		if errs[0] != nil {
			return errs[0]
		}
		copy(dst, dsts[0])
		pendingTheta = nil
		pj := mat.NewDense(n, np, nil)
		if err := centralCombine(pj, theta, dsts[0], dsts[1:], errs[1:], hs); err != nil {
			if !errors.Is(err, ErrInfeasible) {
				return err
			}
			return nil // the Jacobian, if asked for, fails the same way
		}
		pending, pendingTheta = pj, append([]float64(nil), theta...)
		return nil
	}
	if err := trial(res.Theta, r); err != nil {
		return LMResult{}, fmt.Errorf("at the start: %w", err)
	}
	cost := floats.Dot(r, r)
	scale := 0.0
	for _, v := range r {
		scale = math.Max(scale, math.Abs(v))
	}
	zero := float64(n) * 0x1p-52 * scale
	zero *= zero

	jac := mat.NewDense(n, np, nil)
	js := mat.NewDense(n, np, nil)
	jacobian := func(theta []float64) error {
		res.Jacobians++
		if p.Jacobian != nil {
			return p.Jacobian(theta, jac.RawMatrix().Data)
		}
		if pendingTheta != nil && slices.Equal(pendingTheta, theta) {
			jac.Copy(pending)
			return nil
		}
		if batch != nil {
			return centralJacobian(batch, theta, r, s.Step, jac)
		}
		return centralJacobian(eachPoint(eval, p.Concurrent), theta, r, s.Step, jac)
	}
	d := make([]float64, np) // scaling: the column norms of J
	var svd mat.SVD
	var u, v mat.Dense
	sig := make([]float64, np)
	utr := make([]float64, np)
	step := make([]float64, np)
	lambda, nu := 0.0, 2.0
	polishing, lastGN := false, math.Inf(1)
	lastInfeasible := false
	prevTheta, prevR, prevCost := make([]float64, np), make([]float64, n), 0.0

	finish := func(reason Reason) (LMResult, error) {
		res.Reason = reason
		res.RSS = cost
		if err := jacobian(res.Theta); err != nil {
			return LMResult{}, err
		}
		res.Jacobian = jac
		res.Evaluations = int(evals.Load())
		g := mat.NewVecDense(np, nil)
		g.MulVec(jac.T(), mat.NewVecDense(n, r))
		res.GradNorm = mat.Norm(g, 2)
		return res, nil
	}
	if cost <= zero {
		return finish(ZeroResidual)
	}
	for {
		if err := jacobian(res.Theta); err != nil {
			return LMResult{}, err
		}
		for j := 0; j < np; j++ {
			cn := mat.Norm(jac.ColView(j), 2)
			d[j] = cn
			if d[j] == 0 {
				d[j] = 1
			}
		}
		js.Copy(jac)
		for j := 0; j < np; j++ {
			for i := 0; i < n; i++ {
				js.Set(i, j, js.At(i, j)/d[j])
			}
		}
		// Gradient test (cosines between r and the columns of J).
		rn := math.Sqrt(cost)
		gmax := 0.0
		for j := 0; j < np; j++ {
			col := mat.Col(nil, j, jac)
			if cn := floats.Norm(col, 2); cn > 0 {
				gmax = math.Max(gmax, math.Abs(floats.Dot(col, r))/(cn*rn))
			}
		}
		if gmax <= s.GradTol {
			return finish(SmallGradient)
		}
		if res.Iterations >= s.MaxIter {
			return finish(IterationLimit)
		}
		if !svd.Factorize(js, mat.SVDThin) {
			return LMResult{}, fmt.Errorf("least squares: %w: singular value decomposition of the Jacobian failed", core.ErrNoConvergence)
		}
		svd.Values(sig)
		svd.UTo(&u)
		svd.VTo(&v)
		for k := 0; k < np; k++ {
			utr[k] = floats.Dot(mat.Col(nil, k, &u), r)
		}
		smax := sig[0] * sig[0]
		if lambda == 0 {
			lambda = 1e-3 * smax
		}
		xs := 0.0 // ‖D·θ‖
		for j := range res.Theta {
			xs += (d[j] * res.Theta[j]) * (d[j] * res.Theta[j])
		}
		xs = math.Sqrt(xs)
		// Step test on the undamped (Gauss–Newton) step: a damped step
		// is short wherever λ ≫ σₖ², which says nothing about convergence.
		gn := 0.0
		for k := 0; k < np; k++ {
			if sig[k] > 0 {
				gn += (utr[k] / sig[k]) * (utr[k] / sig[k])
			}
		}
		gn = math.Sqrt(gn)
		if gn <= s.StepTol*(xs+s.StepTol) {
			return finish(SmallStep)
		}
		if polishing {
			// Undamped Gauss–Newton steps while they contract; the cost
			// can no longer tell better from worse here.
			if !(gn < lastGN) {
				copy(res.Theta, prevTheta)
				copy(r, prevR)
				cost = prevCost
				if math.IsInf(gn, 0) || math.IsNaN(gn) {
					return finish(NoProgress) // singular: no Gauss–Newton step
				}
				return finish(SmallStep)
			}
			copy(prevTheta, res.Theta)
			copy(prevR, r)
			prevCost, lastGN = cost, gn
			for j := range tt {
				sum := 0.0
				for k := 0; k < np; k++ {
					if sig[k] > 0 {
						sum -= v.At(j, k) * utr[k] / sig[k]
					}
				}
				tt[j] = res.Theta[j] + sum/d[j]
			}
			if err := trial(tt, rt); err != nil {
				if errors.Is(err, ErrInfeasible) {
					return finish(Boundary)
				}
				return LMResult{}, err
			}
			copy(res.Theta, tt)
			copy(r, rt)
			cost = floats.Dot(r, r)
			res.Iterations++
			continue
		}
		for accepted, rejected := false, 0; !accepted; rejected++ {
			// Scaled step z = −V·diag(σ/(σ²+λ))·Uᵀr, predicted reduction
			// S − ‖r + Jδ‖² = Σ (uₖᵀr)²·(1 − (λ/(σ²+λ))²).
			pred := 0.0
			for j := range step {
				step[j] = 0
			}
			zn := 0.0
			for k := 0; k < np; k++ {
				if sig[k] == 0 {
					continue
				}
				c := -utr[k] * sig[k] / (sig[k]*sig[k] + lambda)
				f := lambda / (sig[k]*sig[k] + lambda)
				pred += utr[k] * utr[k] * (1 - f*f)
				zn += c * c
				for j := 0; j < np; j++ {
					step[j] += v.At(j, k) * c
				}
			}
			zn = math.Sqrt(zn)
			for j := range tt {
				tt[j] = res.Theta[j] + step[j]/d[j]
			}
			if rejected > 0 && zn <= s.StepTol*(xs+s.StepTol) {
				// Damped by rejections to nothing: no representable
				// improvement is left (MINPACK's xtol test on Δ) — unless
				// the trials failed for infeasibility, where the
				// minimisation is pressed against the edge of the
				// feasible set rather than at a stationary point.
				if lastInfeasible {
					return finish(Boundary)
				}
				return finish(SmallStep)
			}
			err := trial(tt, rt)
			if err != nil && !errors.Is(err, ErrInfeasible) {
				return LMResult{}, err
			}
			lastInfeasible = err != nil
			rho, reduction := -1.0, 0.0
			newCost := math.Inf(1)
			if err == nil {
				newCost = floats.Dot(rt, rt)
				reduction = reduced(r, rt)
				if pred > 0 {
					rho = reduction / pred
				}
			}
			if debug {
				fmt.Printf("it %d rej %d lambda/s2 %g %g zn/xs %g pred/cost %g red/cost %g gn %g\n", res.Iterations, rejected, lambda/(sig[0]*sig[0]), lambda/(sig[np-1]*sig[np-1]), zn/xs, pred/cost, reduction/cost, math.Sqrt(gn)/xs)
			}
			if rho > 0 && reduction > 0 {
				accepted = true
				res.Iterations++
				actual := reduction / cost
				predRel := pred / cost
				copy(res.Theta, tt)
				copy(r, rt)
				cost = newCost
				lambda *= math.Max(1.0/3, 1-math.Pow(2*rho-1, 3))
				nu = 2
				if cost <= zero {
					return finish(ZeroResidual)
				}
				if actual <= s.CostTol && predRel <= s.CostTol {
					return finish(SmallReduction)
				}
				continue
			}
			if !lastInfeasible && pred <= polishBelow*cost {
				// Rejected although the predicted reduction is at the
				// level where rounding in the residuals decides the
				// comparison: polish by Gauss–Newton steps instead.
				polishing, lastGN = true, math.Inf(1)
				copy(prevTheta, res.Theta)
				copy(prevR, r)
				prevCost = cost
				break
			}
			lambda *= nu
			nu *= 2
			if lambda > 1e30*smax {
				if lastInfeasible {
					return finish(Boundary)
				}
				return finish(NoProgress)
			}
		}
	}
}

// polishBelow is the predicted relative reduction of S below which a
// rejected step is blamed on rounding in the residuals (their ε-level
// errors make the actual reduction uncertain by about N·ε·S; the margin is
// common practice): the engine then continues with undamped Gauss–Newton
// steps for as long as their length decreases, which resolves
// ill-conditioned directions to the rounding level of the step rather than
// of S (√ε relative) — NIST StRD MGH09 needs this for 8 digits.
const polishBelow = 1e-10

// reduced returns ‖r‖² − ‖rt‖² summed term by term as
// Σ (rᵢ − rtᵢ)(rᵢ + rtᵢ): near the optimum the two sums agree in most of
// their digits, while each difference rᵢ − rtᵢ is computed without
// cancellation, so steps far below √ε·‖θ‖ are still judged correctly.
func reduced(r, rt []float64) float64 {
	s := 0.0
	for i, v := range r {
		s += (v - rt[i]) * (v + rt[i])
	}
	return s
}

// finiteResiduals returns an error wrapping ErrInfeasible when a residual
// is not finite.
func finiteResiduals(r []float64) error {
	for i, v := range r {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return fmt.Errorf("least squares: %w: residual %d is %g", ErrInfeasible, i, v)
		}
	}
	return nil
}

// eachPoint makes a batch evaluation of one call of eval per point, the
// calls concurrently (each in its own goroutine: for a potential in
// another process their round trips then overlap) when concurrent.
func eachPoint(eval func(theta, dst []float64) error, concurrent bool) func(thetas, dsts [][]float64, errs []error) error {
	return func(thetas, dsts [][]float64, errs []error) error {
		if !concurrent {
			for k := range thetas {
				errs[k] = eval(thetas[k], dsts[k])
			}
			return nil
		}
		var wg sync.WaitGroup
		for k := range thetas {
			wg.Add(1)
			go func() {
				defer wg.Done()
				errs[k] = eval(thetas[k], dsts[k])
			}()
		}
		wg.Wait()
		return nil
	}
}

// centralJacobian fills jac with central differences of the residuals at theta:
// column j is (r(θ + hⱼeⱼ) − r(θ − hⱼeⱼ))/(2hⱼ), hⱼ = step·|θⱼ| (step at 0),
// the difference taken with the step actually represented in floating
// point. Where one side is infeasible (a step across the edge of a form's
// domain) the one-sided difference with r0 = r(θ) is taken instead. The 2P
// evaluations are one call of batch.
func centralJacobian(batch func(thetas, dsts [][]float64, errs []error) error, theta, r0 []float64, step float64, jac *mat.Dense) error {
	n, _ := jac.Dims()
	thetas, hs := centralSides(theta, step)
	dsts := make([][]float64, len(thetas))
	for k := range dsts {
		dsts[k] = make([]float64, n)
	}
	errs := make([]error, len(thetas))
	if err := batch(thetas, dsts, errs); err != nil {
		return err
	}
	return centralCombine(jac, theta, r0, dsts, errs, hs)
}

// centralSides returns the 2P points θ ± hⱼeⱼ of the central differences
// at theta (θ + h₀e₀, θ − h₀e₀, θ + h₁e₁, …) and the steps represented,
// signed.
func centralSides(theta []float64, step float64) ([][]float64, []float64) {
	np := len(theta)
	thetas := make([][]float64, 2*np)
	hs := make([]float64, 2*np)
	for k := range thetas {
		j, sign := k/2, 1.0
		if k%2 == 1 {
			sign = -1
		}
		h := step * math.Abs(theta[j])
		if h == 0 {
			h = step
		}
		t := append([]float64(nil), theta...)
		t[j] = theta[j] + sign*h
		thetas[k], hs[k] = t, t[j]-theta[j]
	}
	return thetas, hs
}

// centralCombine fills jac from the residuals dsts at the sides of
// centralSides (errs their errors, r0 the residuals at theta).
func centralCombine(jac *mat.Dense, theta, r0 []float64, dsts [][]float64, errs []error, hs []float64) error {
	n, np := jac.Dims()
	for j := 0; j < np; j++ {
		var ok [2]bool
		for side := range ok {
			err := errs[2*j+side]
			if err != nil && !errors.Is(err, ErrInfeasible) {
				return fmt.Errorf("central difference in parameter %d: %w", j, err)
			}
			ok[side] = err == nil
		}
		p, m := dsts[2*j], dsts[2*j+1]
		hp, hm := hs[2*j], hs[2*j+1]
		switch {
		case ok[0] && ok[1]:
			for i := 0; i < n; i++ {
				jac.Set(i, j, (p[i]-m[i])/(hp-hm))
			}
		case ok[0]:
			for i := 0; i < n; i++ {
				jac.Set(i, j, (p[i]-r0[i])/hp)
			}
		case ok[1]:
			for i := 0; i < n; i++ {
				jac.Set(i, j, (m[i]-r0[i])/hm)
			}
		default:
			return fmt.Errorf("central difference in parameter %d: %w: both sides of θ = %g ± %g", j, ErrInfeasible, theta[j], hp)
		}
	}
	return nil
}

// Covariance returns the covariance matrix s²·(JᵀJ)⁻¹ of least-squares
// parameters from the Jacobian jac (N×P) of the residuals at the optimum
// and the residual sum of squares rss, with the residual variance
// s² = rss/(N − P). It works from the singular value decomposition of J
// (JᵀJ)⁻¹ = V·Σ⁻²·Vᵀ, so JᵀJ is never formed. It returns nil when N ≤ P
// (no residual variance) or when J is rank deficient (a singular value
// below N·ε·σ_max: some parameter combination is not determined by the
// data).
func Covariance(jac *mat.Dense, rss float64) *mat.SymDense {
	n, np := jac.Dims()
	if n <= np {
		return nil
	}
	var svd mat.SVD
	if !svd.Factorize(jac, mat.SVDThin) {
		return nil
	}
	sig := svd.Values(nil)
	if sig[0] == 0 || sig[np-1] <= float64(n)*0x1p-52*sig[0] {
		return nil
	}
	var v mat.Dense
	svd.VTo(&v)
	s2 := rss / float64(n-np)
	cov := mat.NewSymDense(np, nil)
	for a := 0; a < np; a++ {
		for b := a; b < np; b++ {
			sum := 0.0
			for k := 0; k < np; k++ {
				sum += v.At(a, k) * v.At(b, k) / (sig[k] * sig[k])
			}
			cov.SetSym(a, b, s2*sum)
		}
	}
	return cov
}
