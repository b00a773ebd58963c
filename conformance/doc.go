// Package conformance checks that a pair-potential form honours pairwell's
// contract (core.Potential, core.Model) and its own declarations: that its
// Taylor coefficients are the derivatives of its energies, that every shape
// of a Taylor call gives the same bits, that it rejects invalid input, and
// that its declared minimum, identities and asymptote hold. The suite
// compares derivatives V⁽ⁿ⁾ = n!·c_n, as the literature states them.
//
// Published identities are test declarations and live here: a potential
// declares them by implementing Identifier (a list of Identity); the core
// contract does not carry them.
//
// It is a library (Run, RunCases, RunInstances return a Report with one
// Result per check: the measured error, the tolerance, the worst r and a
// message) and a go test helper (Test), so that authors of plugin forms run
// the same suite in their own tests. "pairwell check" runs it from the
// command line and writes JUnit XML for CI (Report.WriteJUnit).
//
// # Checks and tolerances
//
// Units are pairwell's: eV, Å, derivatives in eV/Åⁿ. Each check's tolerance
// is a field of Settings; the defaults:
//
//   - max-order: MaxOrder ≥ 4 (pairwell's well analysis needs c₃ and c₄)
//     and equal to ModelInfo.MaxOrder.
//   - derivative, one result per order n = 1 … min(8, MaxOrder): V⁽ⁿ⁾ is
//     compared with the finite-difference derivative of V⁽ⁿ⁻¹⁾ at 64
//     evenly spaced r from 0.8·re to 3·re (clipped into the domain), with
//     relative error |A − D|/(|A| + |V⁽ⁿ⁻¹⁾|/r + 10⁻¹⁶·max) ≤ 1e-7. The
//     second term of the scale keeps zero crossings of V⁽ⁿ⁾ from causing
//     false failures; the third only matters in underflowing tails. D is
//     gonum's fd.Central at 12 steps from 0.02·r down by factors of 1.4,
//     extrapolated by Ridders' Richardson tableau; its own error is near
//     1e-13 for smooth forms (the built-ins pass with errors below 1e-11
//     over wide parameter ranges, a margin of 10⁴), while a wrong
//     derivative is typically off by O(1). Comparing
//     each order with the derivative of the next-lower analytic one keeps
//     the error of the finite difference small at every order. A failure
//     names the order and the worst r, says how many points fail, and
//     cross-checks V⁽ⁿ⁾ against the second difference (fd.Central2nd) of
//     V⁽ⁿ⁻²⁾ to tell whether V⁽ⁿ⁾ or V⁽ⁿ⁻¹⁾ is at fault; a sign error or a
//     constant wrong factor is named as such. All points and stencil
//     points, every order, go to the potential in one Taylor call (on
//     failure the orders are retried one by one, so that the orders below
//     the first failing one are still checked).
//   - batch: a single-point Taylor call at every sample point (its order
//     cycling from 0 to the top) and one call of half the top order over
//     all points give exactly the bits of the reference call; tolerance 0.
//   - determinism: a repeated Taylor call (points reversed) gives the same
//     bits.
//   - concurrency: 8 goroutines making batched and single-point Taylor
//     calls at once give the same bits (run the tests with -race to catch
//     data races).
//   - equilibrium: at the minimum found by core.Equilibrium, V″(re) > 0
//     and |V′(re)|/(V″(re)·re) ≤ 1e-10 (the relative shift of re that the
//     residual V′ implies). Skipped for a form that has no minimum and
//     declares none.
//   - identity, one result per declared Identity: relative error
//     ≤ 1e-9, measured against |expected| + |V″(re)|·re^(2−n) for V⁽ⁿ⁾ at
//     the minimum (n = 0 for energies), against |expected| for re; the
//     result carries the identity's source.
//   - invalid-params: Model.New rejects one value too few or too many and,
//     per parameter, NaN, ±Inf and values breaking its constraint (0 and a
//     negative value for Positive, a negative one for NonNegative), with
//     an error wrapping core.ErrParam or core.ErrNoMinimum.
//   - invalid-r: r = 0, −1, NaN, ±Inf (and Domain.Min, Min/2, a finite
//     Domain.Max) give errors wrapping core.ErrDomain from a single-point
//     Taylor call and, between good points, a *core.PointError with the
//     index of the bad one (orders 0 and 1).
//   - invalid-order: orders MaxOrder+1 and −1 give core.ErrOrder; a dst
//     that does not hold (n+1)·len(r) values gives core.ErrLength.
//   - asymptote: for a finite Domain.Limit, |V(10⁶·re) − Limit| ≤ 1e-6 of
//     the well depth (the message also gives the deviation at 50·re); for
//     Limit = +Inf, V must grow from 50·re to 10³·re to 10⁶·re. A form
//     whose tail is slower than that allows (a Coulomb-like 1/r tail such
//     as Kratzer's, |V(10⁶·re)|/De = 2e-6) declares it, Domain.TailPower =
//     p; then the tail amplitude (V − Limit)·(r/re)^p must agree at 10⁶·re
//     and 10⁷·re to 1e-6 relative, so a wrong limit or a wrong power fails.
//
// # Sampled range
//
// The range is centred on the equilibrium distance the potential declares
// (an EquilibriumR identity, else Domain.EquilibriumGuess), which does not depend on
// the derivatives under test, else on the minimum core.Equilibrium finds
// (if V″ > 0 there). A form with neither is sampled over the fallback range
// 0.5 Å to 5 Å (Settings.RMin and RMax override the range). Near a
// Buckingham-type barrier the range starts at least 5% of the way from
// Domain.Min to re, and finite-difference steps never reach past half the
// distance to the domain's ends.
//
// # Cost
//
// With the default settings one parameter set costs about 30 batched
// Taylor calls (one of order 8 at 1600 points: the sample points and their
// stencils; the others with 64 or fewer points), about 210 single-point
// calls and 18 to 20 calls of Model.New. The whole suite over the four
// built-in forms takes about 5 ms; over a form served by a plugin, plugin
// start included, about 75 ms (BenchmarkBuiltins here, BenchmarkCheck* in
// cmd/pairwell).
package conformance
