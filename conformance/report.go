package conformance

import (
	"encoding/json"
	"fmt"
	"math"
	"strings"
	"time"
)

// Kinds of check, the values of Result.Check.
const (
	// CheckBuild: Model.New accepts the parameter set under test.
	CheckBuild = "build"
	// CheckMaxOrder: the form declares analytic derivatives up to at
	// least RequiredOrder (4).
	CheckMaxOrder = "max-order"
	// CheckDerivative: V⁽ⁿ⁾ agrees with the finite-difference derivative
	// of V⁽ⁿ⁻¹⁾ (one result per order n, in Result.Order).
	CheckDerivative = "derivative"
	// CheckBatch: a single-point Taylor call and a lower-order one give
	// the bits of the batched, higher-order one.
	CheckBatch = "batch"
	// CheckDeterminism: repeated evaluations give the same bits.
	CheckDeterminism = "determinism"
	// CheckConcurrency: evaluations from many goroutines at once give
	// the same bits.
	CheckConcurrency = "concurrency"
	// CheckEquilibrium: V′(re) = 0 and V″(re) > 0 at the minimum.
	CheckEquilibrium = "equilibrium"
	// CheckIdentity: a declared Identity holds (one result each).
	CheckIdentity = "identity"
	// CheckInvalidParams: invalid parameter sets are rejected.
	CheckInvalidParams = "invalid-params"
	// CheckInvalidR: r ≤ 0, NaN, ±Inf and r outside the domain give
	// errors, from single-point and from batched Taylor calls.
	CheckInvalidR = "invalid-r"
	// CheckInvalidOrder: orders beyond MaxOrder, negative orders and a
	// dst that does not hold (n+1)·len(r) values give errors.
	CheckInvalidOrder = "invalid-order"
	// CheckAsymptote: V approaches the declared Domain.Limit.
	CheckAsymptote = "asymptote"
)

// Result is the outcome of one check on one parameter set.
type Result struct {
	// Subject names the parameter set, as a spec such as
	// "morse:De=4.6,a=1.87,re=1.27" or a model-set entry name.
	Subject string
	// Model is the model's key.
	Model string
	// Check is the kind of check, one of the Check constants.
	Check string
	// Name describes the check in words, e.g. "V‴ vs dV″/dr".
	Name string
	// Order is the derivative order for CheckDerivative and for
	// identities of derivatives at the minimum; 0 otherwise.
	Order int
	// Passed reports whether the check passed; a skipped check passes.
	Passed bool
	// Skipped reports that the check does not apply (Message says why).
	Skipped bool
	// Error is the measured error in the units of Tolerance; NaN when
	// the check measures nothing (counts of rejected inputs use 0 or the
	// number of failures).
	Error float64
	// Tolerance is the largest Error that passes.
	Tolerance float64
	// WorstR is the separation in Å where Error was measured (the worst
	// point); NaN when the check is not tied to a separation.
	WorstR float64
	// Message explains the outcome: on failure, what differs, where and
	// by how much.
	Message string
	// Source is the literature reference of an identity.
	Source string
	// Duration is the wall time the check took.
	Duration time.Duration
}

// Status returns "pass", "FAIL" or "skip".
func (r Result) Status() string {
	switch {
	case r.Skipped:
		return "skip"
	case r.Passed:
		return "pass"
	}
	return "FAIL"
}

// String formats r on one line.
func (r Result) String() string {
	var b strings.Builder
	fmt.Fprintf(&b, "%s %s: %s", r.Status(), r.Subject, r.Name)
	if !math.IsNaN(r.Error) {
		fmt.Fprintf(&b, ": error %.3g (tolerance %.3g)", r.Error, r.Tolerance)
	}
	if r.Message != "" {
		b.WriteString(": " + r.Message)
	}
	return b.String()
}

// jsonNumber encodes as pairwell's JSON numbers do: NaN (no value) as
// null, ±Inf as the strings "Infinity" and "-Infinity".
type jsonNumber float64

func (n jsonNumber) MarshalJSON() ([]byte, error) {
	f := float64(n)
	switch {
	case math.IsNaN(f):
		return []byte("null"), nil
	case math.IsInf(f, 1):
		return []byte(`"Infinity"`), nil
	case math.IsInf(f, -1):
		return []byte(`"-Infinity"`), nil
	}
	return json.Marshal(f)
}

// MarshalJSON encodes r as an object with the keys name (the subject:
// the spec or set entry checked), model, check (the kind), title,
// derivative_order (Result.Order: 0 for V itself or a check of no
// derivative), status ("pass",
// "FAIL", "skip"), passed, skipped, deviation (the measured error, null
// when the check measures none), tolerance, worst_r_angstrom (null when
// not tied to a separation), message, source (null when none) and
// seconds.
func (r Result) MarshalJSON() ([]byte, error) {
	var source *string
	if r.Source != "" {
		source = &r.Source
	}
	return json.Marshal(struct {
		Subject   string     `json:"name"`
		Model     string     `json:"model"`
		Check     string     `json:"check"`
		Name      string     `json:"title"`
		Order     int        `json:"derivative_order"`
		Status    string     `json:"status"`
		Passed    bool       `json:"passed"`
		Skipped   bool       `json:"skipped"`
		Error     jsonNumber `json:"deviation"`
		Tolerance jsonNumber `json:"tolerance"`
		WorstR    jsonNumber `json:"worst_r_angstrom"`
		Message   string     `json:"message"`
		Source    *string    `json:"source"`
		Seconds   float64    `json:"seconds"`
	}{
		r.Subject, r.Model, r.Check, r.Name, r.Order, r.Status(), r.Passed, r.Skipped,
		jsonNumber(r.Error), jsonNumber(r.Tolerance), jsonNumber(r.WorstR),
		r.Message, source, r.Duration.Seconds(),
	})
}

// Report is the outcome of a conformance run: one Result per check and
// parameter set, in the order they ran.
type Report struct {
	Results []Result
}

// Passed reports whether every check passed (or was skipped).
func (r Report) Passed() bool {
	for _, x := range r.Results {
		if !x.Passed {
			return false
		}
	}
	return true
}

// Failures returns the results that did not pass.
func (r Report) Failures() []Result {
	var out []Result
	for _, x := range r.Results {
		if !x.Passed {
			out = append(out, x)
		}
	}
	return out
}

// Subjects returns the distinct subjects in the order they first appear.
func (r Report) Subjects() []string {
	var out []string
	seen := map[string]bool{}
	for _, x := range r.Results {
		if !seen[x.Subject] {
			seen[x.Subject] = true
			out = append(out, x.Subject)
		}
	}
	return out
}

// MarshalJSON encodes the report as the JSON array of its results.
func (r Report) MarshalJSON() ([]byte, error) {
	if r.Results == nil {
		return []byte("[]"), nil
	}
	return json.Marshal(r.Results)
}
