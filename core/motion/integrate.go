package motion

import (
	"fmt"
	"math"

	"github.com/pairwell/pairwell/core"
)

// state is a point of phase space with the force there: displacement
// x = r − re (Å), velocity v (Å/fs), acceleration a = −V′(r)/μ (Å/fs²) and
// potential energy u = V(r) − V(re) (eV). The state is integrated in x
// rather than r so that small amplitudes keep their significant digits.
type state struct {
	x, v, a, u float64
}

// integrator holds one run's mutable state.
type integrator struct {
	p     core.Potential
	re    float64    // Å
	vre   float64    // V(re), eV
	acc   float64    // −accelUnit/μ: a = acc·V′(r)
	kin   float64    // ½μ·kineticUnit: E_kin = kin·v² in eV
	buf   [2]float64 // c₀ = V and c₁ = V′ at rbuf[0]
	rbuf  [1]float64
	evals int

	s      Settings
	t0     float64 // harmonic period, fs
	maxE   float64 // energy above V(re) at which the motion is unbound, eV
	scaleX float64 // s_x of the DP error norm, Å
	scaleV float64 // s_v of the DP error norm, Å/fs

	// The potential energy of displacements in (xLo, xHi) comes from the
	// Taylor series at re, which is more accurate there than
	// V(r) − V(re) (see seriesRange).
	ex       core.Expansion
	xLo, xHi float64
	// The extreme displacements reached, for the rounding floor.
	xMin, xMax float64
}

// seriesRange returns the displacements (lo, hi) around 0 within which
// the series ex is more accurate than the direct difference
// (core.Expansion.UseSeries), scanned geometrically from 1e-12·re in
// ratio 1.1 on each side.
func seriesRange(ex core.Expansion, re float64) (lo, hi float64) {
	for k, dir := range []float64{-1, 1} {
		x := 1e-12 * re
		last := 0.0
		for ; x < re; x *= 1.1 {
			if ok, _, _ := ex.UseSeries(dir * x); !ok {
				break
			}
			last = x
		}
		if k == 0 {
			lo = -last
		} else {
			hi = last
		}
	}
	return lo, hi
}

// energyBound returns a bound on the rounding error of V(re + x) − V(re)
// as the run computes it: the series bound inside (xLo, xHi), else that
// of the direct difference.
func (in *integrator) energyBound(x, u float64) float64 {
	if x > in.xLo && x < in.xHi {
		_, b := in.ex.Sum(x, 2)
		return b
	}
	return in.ex.DirectBound(in.vre + u)
}

func newIntegrator(o *Oscillator, s Settings, amplitude float64) *integrator {
	ex := core.NewExpansion(o.well)
	lo, hi := seriesRange(ex, o.well.Re)
	return &integrator{
		ex: ex, xLo: lo, xHi: hi,
		p:      o.p,
		re:     o.well.Re,
		vre:    o.well.Energy,
		acc:    -accelUnit / o.mu,
		kin:    0.5 * o.mu * kineticUnit,
		s:      s,
		t0:     o.harmonic.PeriodFs,
		scaleX: amplitude,
		scaleV: o.harmonic.Omega * amplitude,
		maxE:   o.maxEnergy,
	}
}

// at evaluates the force at displacement x: one potential call, value and
// first derivative together.
func (in *integrator) at(x, v float64) (state, error) {
	r := in.re + x
	in.rbuf[0] = r
	if err := in.p.Taylor(1, in.rbuf[:], in.buf[:]); err != nil {
		return state{}, err
	}
	in.evals++
	a, u := in.acc*in.buf[1], in.buf[0]-in.vre
	if x > in.xLo && x < in.xHi {
		u = in.ex.Value(x)
	}
	in.xMin, in.xMax = math.Min(in.xMin, x), math.Max(in.xMax, x)
	if math.IsNaN(a) || math.IsInf(a, 0) || math.IsNaN(u) || math.IsInf(u, 0) {
		return state{}, fmt.Errorf("r = %g Å: %w: force or energy not finite", r, core.ErrDomain)
	}
	return state{x: x, v: v, a: a, u: u}, nil
}

// energy returns E_kin + V(r) − V(re) in eV.
func (in *integrator) energy(s state) float64 { return in.kin*s.v*s.v + s.u }

// step advances s by h with the run's method. For DormandPrince it also
// returns the scaled error norm of the step (≤ 1 to accept); the fixed-step
// methods return 0.
func (in *integrator) step(s state, h float64) (state, float64, error) {
	switch in.s.Method {
	case Heun:
		n, err := in.heun(s, h)
		return n, 0, err
	case RK4:
		n, err := in.rk4(s, h)
		return n, 0, err
	case Verlet:
		n, err := in.verlet(s, h)
		return n, 0, err
	}
	return in.dopri(s, h)
}

// heun is the explicit trapezoid rule: Euler predictor y* = y + h·f(y),
// corrector y₁ = y + h/2·(f(y) + f(y*)).
func (in *integrator) heun(s state, h float64) (state, error) {
	p, err := in.at(s.x+h*s.v, 0)
	if err != nil {
		return state{}, err
	}
	vp := s.v + h*s.a
	return in.at(s.x+0.5*h*(s.v+vp), s.v+0.5*h*(s.a+p.a))
}

// rk4 is the classical Runge–Kutta method on (ẋ, v̇) = (v, a(x)).
func (in *integrator) rk4(s state, h float64) (state, error) {
	hh := 0.5 * h
	v2 := s.v + hh*s.a
	k2, err := in.at(s.x+hh*s.v, 0)
	if err != nil {
		return state{}, err
	}
	v3 := s.v + hh*k2.a
	k3, err := in.at(s.x+hh*v2, 0)
	if err != nil {
		return state{}, err
	}
	v4 := s.v + h*k3.a
	k4, err := in.at(s.x+h*v3, 0)
	if err != nil {
		return state{}, err
	}
	h6 := h / 6
	return in.at(s.x+h6*(s.v+2*(v2+v3)+v4), s.v+h6*(s.a+2*(k2.a+k3.a)+k4.a))
}

// verlet is velocity Verlet: x₁ = x + h·v + h²/2·a, v₁ = v + h/2·(a + a₁).
func (in *integrator) verlet(s state, h float64) (state, error) {
	n, err := in.at(s.x+h*(s.v+0.5*h*s.a), 0)
	if err != nil {
		return state{}, err
	}
	n.v = s.v + 0.5*h*(s.a+n.a)
	return n, nil
}

// Dormand–Prince RK5(4)7M tableau, J. R. Dormand and P. J. Prince,
// J. Comput. Appl. Math. 6, 19 (1980), Table 2 (also Hairer, Nørsett &
// Wanner, Solving ODEs I, Table II.5.2). The 5th-order weights are the last
// row of A (FSAL); dpE holds b − b̂, the 5th minus the 4th-order weights.
var (
	dpA = [7][6]float64{
		{},
		{1.0 / 5},
		{3.0 / 40, 9.0 / 40},
		{44.0 / 45, -56.0 / 15, 32.0 / 9},
		{19372.0 / 6561, -25360.0 / 2187, 64448.0 / 6561, -212.0 / 729},
		{9017.0 / 3168, -355.0 / 33, 46732.0 / 5247, 49.0 / 176, -5103.0 / 18656},
		{35.0 / 384, 0, 500.0 / 1113, 125.0 / 192, -2187.0 / 6784, 11.0 / 84},
	}
	dpE = [7]float64{
		71.0 / 57600, 0, -71.0 / 16695, 71.0 / 1920, -17253.0 / 339200, 22.0 / 525, -1.0 / 40,
	}
)

// dopri takes one Dormand–Prince step and returns the 5th-order solution
// (with its force, the first stage of the next step) and the error norm
// √(½Σ(err_i/sc_i)²), sc_i = ATol·s_i + RTol·max(|y_i|, |y_i,new|).
func (in *integrator) dopri(s state, h float64) (state, float64, error) {
	var kx, kv [7]float64 // stage derivatives: kx = v, kv = a
	kx[0], kv[0] = s.v, s.a
	var n state
	for i := 1; i < 7; i++ {
		var dx, dv float64
		for j := 0; j < i; j++ {
			dx += dpA[i][j] * kx[j]
			dv += dpA[i][j] * kv[j]
		}
		st, err := in.at(s.x+h*dx, s.v+h*dv)
		if err != nil {
			return state{}, 0, err
		}
		kx[i], kv[i] = st.v, st.a
		n = st
	}
	var ex, ev float64
	for i, e := range dpE {
		ex += e * kx[i]
		ev += e * kv[i]
	}
	ex *= h
	ev *= h
	sx := in.s.ATol*in.scaleX + in.s.RTol*math.Max(math.Abs(s.x), math.Abs(n.x))
	sv := in.s.ATol*in.scaleV + in.s.RTol*math.Max(math.Abs(s.v), math.Abs(n.v))
	ex /= sx
	ev /= sv
	return n, math.Sqrt(0.5 * (ex*ex + ev*ev)), nil
}

// PI step-size control of DOPRI5 (Hairer, Nørsett & Wanner, Solving ODEs
// I, §II.4 and the code's defaults): h_new = h·fac with
// fac = safety·err^(−α)·err_prev^β, α = 1/5 − 0.75β, β = 0.04, limited to
// [dpFacMin, dpFacMax]; after a rejection the step may not grow.
const (
	dpSafety = 0.9
	dpBeta   = 0.04
	dpAlpha  = 0.2 - 0.75*dpBeta
	dpFacMin = 0.2
	dpFacMax = 10
)

// run integrates from st until the requested turning points are found.
func (in *integrator) run(st Start) (Result, error) {
	s := in.s
	res := Result{Method: s.Method, Start: st, HarmonicPeriod: in.t0}
	cur, err := in.at(st.X0, 0)
	if err != nil {
		return Result{}, fmt.Errorf("motion: start at r = %g Å: %w", in.re+st.X0, err)
	}
	e0 := in.energy(cur)
	if !(e0 > 0) {
		return Result{}, fmt.Errorf("motion: %w: start energy V(r0) − V(re) = %g eV is not > 0", core.ErrParam, e0)
	}
	record := func(t float64, st state) {
		res.Trajectory = append(res.Trajectory, Sample{T: t, R: in.re + st.x, X: st.x, V: st.v, E: in.energy(st)})
	}
	if s.Record > 0 {
		record(0, cur)
	}
	need := s.Periods + 1
	tps := make([]float64, 0, need)
	if st.X0 > 0 {
		tps = append(tps, 0) // at rest, stretched: an outer turning point
	}

	adaptive := s.Method == DormandPrince
	h := in.t0 / float64(s.StepsPerPeriod)
	res.MinStep, res.MaxStep = math.Inf(1), 0
	var (
		t, comp    float64 // time and its Kahan compensation (adaptive)
		facOld     = 1e-4
		lastReject bool
		hMin       = 1e-12 * in.t0
		maxDrift   float64
		last       state
	)
	for len(tps) < need {
		if t > s.MaxTime {
			return Result{}, fmt.Errorf("motion: %w: %d of %d outer turning points found within %.6g fs (%.6g harmonic periods); the period is too long for the time limit",
				core.ErrNoConvergence, len(tps), need, s.MaxTime, s.MaxTime/in.t0)
		}
		next, errNorm, err := in.step(cur, h)
		if err != nil {
			if adaptive && h > hMin {
				// A trial step left the domain: treat it as rejected.
				h *= dpFacMin
				res.Rejected++
				lastReject = true
				continue
			}
			return Result{}, fmt.Errorf("motion: %s step at t = %g fs (h = %g fs) left the domain: %w", s.Method, t, h, err)
		}
		hUsed := h
		if adaptive {
			if math.IsNaN(errNorm) {
				errNorm = math.Inf(1)
			}
			fac11 := math.Pow(errNorm, dpAlpha)
			if errNorm > 1 {
				res.Rejected++
				h /= math.Min(1/dpFacMin, fac11/dpSafety)
				lastReject = true
				if h < hMin {
					return Result{}, fmt.Errorf("motion: %w: step size %g fs underflows at t = %g fs", core.ErrNoConvergence, h, t)
				}
				continue
			}
			fac := fac11 / math.Pow(facOld, dpBeta) / dpSafety
			fac = math.Max(1/dpFacMax, math.Min(1/dpFacMin, fac))
			hNew := h / fac
			if lastReject {
				hNew = math.Min(hNew, h)
			}
			facOld = math.Max(errNorm, 1e-4)
			lastReject = false
			h = hNew
		}
		res.MinStep = math.Min(res.MinStep, hUsed)
		res.MaxStep = math.Max(res.MaxStep, hUsed)

		if cur.v > 0 && next.v <= 0 {
			tau, err := in.locate(cur, next, hUsed, t)
			if err != nil {
				return Result{}, fmt.Errorf("motion: turning point after t = %g fs: %w", t, err)
			}
			tps = append(tps, t+tau)
		}

		res.Steps++
		if s.MaxSteps > 0 && res.Steps > s.MaxSteps {
			return Result{}, fmt.Errorf("motion: %w: %d steps reached at t = %.6g fs with %d of %d turning points found",
				ErrTooManySteps, s.MaxSteps, t, len(tps), need)
		}
		if adaptive {
			// Kahan summation keeps t accurate over many small steps.
			y := hUsed - comp
			tn := t + y
			comp = (tn - t) - y
			t = tn
		} else {
			t = float64(res.Steps) * hUsed
		}
		cur = next
		last = next
		en := in.energy(next)
		if d := math.Abs(en - e0); d > maxDrift {
			maxDrift = d
		}
		if en >= in.maxE {
			return Result{}, fmt.Errorf("motion: %w: at t = %.6g fs the %s energy has drifted from %.6g eV to %.6g eV, beyond the bound-motion limit %.6g eV: the step (%.6g fs, %.4g per harmonic period) is too large",
				core.ErrNoConvergence, t, s.Method, e0, en, in.maxE, hUsed, in.t0/hUsed)
		}
		if s.Record > 0 && res.Steps%s.Record == 0 {
			record(t, next)
		}
	}

	n := len(tps) - 1
	res.TurningPoints = tps
	res.PeriodsMeasured = n
	res.Period = (tps[n] - tps[0]) / float64(n)
	if n > 1 {
		var ss float64
		for i := 1; i <= n; i++ {
			d := tps[i] - tps[i-1] - res.Period
			ss += d * d
		}
		res.PeriodSpread = math.Sqrt(ss / float64(n-1))
	}
	res.Duration = t
	if adaptive {
		res.TimeStep = t / float64(res.Steps)
		res.StepsPerPeriod = in.t0 / res.TimeStep
	} else {
		res.TimeStep = res.MinStep
		res.StepsPerPeriod = float64(s.StepsPerPeriod)
	}
	res.ForceEvals = in.evals
	res.EnergyDrift = maxDrift / e0
	res.FinalEnergyError = (in.energy(last) - e0) / e0
	// The rounding floor of E(t) − E0: the potential energy at the
	// extreme displacements (where it is largest) to its bound, twice
	// (E(t) and E0), and the kinetic energy to a few ulp.
	fl := math.Max(in.energyBound(in.xMin, e0), in.energyBound(in.xMax, e0))
	res.EnergyFloor = (2*fl + 8*eps*e0) / e0
	return res, nil
}

// maxRefine bounds the Newton refinements of a turning point; each costs
// one partial step. Two usually suffice.
const maxRefine = 8

// locate returns τ in [0, h] where the velocity of the step from s0 (to
// s1 after the full step h) vanishes, given v0 > 0 ≥ v1.
//
// First the cubic Hermite interpolant of v on the step, matching v and
// dv/dt = a at both ends, is solved for v = 0 with core.Root. Then Newton
// iterations τ ← τ − v(τ)/a(τ) refine it, where v(τ) and a(τ) come from a
// single step of size τ from s0 with the same integrator, until the
// correction is below the resolution of t + τ; they remove the
// interpolation error, which would otherwise dominate for the large steps
// of Dormand–Prince.
func (in *integrator) locate(s0, s1 state, h, t float64) (float64, error) {
	if s1.v == 0 {
		return h, nil
	}
	// Hermite basis in σ = τ/h ∈ [0, 1].
	v0, v1, d0, d1 := s0.v, s1.v, h*s0.a, h*s1.a
	herm := func(sg float64) (float64, float64, error) {
		s2 := sg * sg
		s3 := s2 * sg
		f := (2*s3-3*s2+1)*v0 + (s3-2*s2+sg)*d0 + (-2*s3+3*s2)*v1 + (s3-s2)*d1
		df := (6*s2-6*sg)*v0 + (3*s2-4*sg+1)*d0 + (-6*s2+6*sg)*v1 + (3*s2-2*sg)*d1
		return f, df, nil
	}
	sg, err := core.Root(herm, 0, 1)
	if err != nil {
		return 0, err
	}
	tau := sg * h
	tol := math.Max(4*ulp(h), ulp(t+h))
	lo, hi := 0.0, h // v(lo) > 0 ≥ v(hi)
	for i := 0; i < maxRefine; i++ {
		if tau <= lo || tau >= hi {
			tau = 0.5 * (lo + hi)
		}
		st, _, err := in.step(s0, tau)
		if err != nil {
			return 0, err
		}
		if st.v > 0 {
			lo = tau
		} else {
			hi = tau
		}
		if st.v == 0 || st.a == 0 {
			break
		}
		d := st.v / st.a
		tau -= d
		if math.Abs(d) <= tol {
			break
		}
	}
	return math.Max(0, math.Min(h, tau)), nil
}

func ulp(x float64) float64 {
	x = math.Abs(x)
	return math.Nextafter(x, math.Inf(1)) - x
}

// eps is the float64 machine epsilon 2⁻⁵².
const eps = 0x1p-52
