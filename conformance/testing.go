package conformance

import (
	"fmt"
	"strings"
	"testing"

	"github.com/pairwell/pairwell/core"
)

// Test runs the suite with default settings on model m at each parameter
// set, as subtests of t: one per parameter set (named by its spec), and
// within it one per check. A failing check reports its message with
// t.Errorf; a skipped one calls t.Skip; passing ones log their measured
// error (visible with go test -v). With no parameter set, m's
// representative set is used (see Representative); if it has none, the
// test fails. A plugin author calls it from a _test.go file:
//
//	func TestConformance(t *testing.T) {
//		conformance.Test(t, Rydberg{}, []float64{4.6, 1.9, 1.27})
//	}
func Test(t *testing.T, m core.Model, params ...[]float64) {
	t.Helper()
	TestSettings(t, Settings{}, m, params...)
}

// TestSettings is Test with explicit settings.
func TestSettings(t *testing.T, s Settings, m core.Model, params ...[]float64) {
	t.Helper()
	if m == nil {
		t.Fatal("conformance: nil model")
	}
	if len(params) == 0 {
		ps, ok := Representative(m)
		if !ok {
			t.Fatalf("conformance: %s has no representative parameter set: pass one to conformance.Test", m.Info().Key)
		}
		params = [][]float64{ps}
	}
	rep, err := Run(m, params, s)
	if err != nil {
		t.Fatalf("conformance: %v", err)
	}
	for _, subj := range rep.Subjects() {
		var results []Result
		for _, r := range rep.Results {
			if r.Subject == subj {
				results = append(results, r)
			}
		}
		t.Run(testName(subj), func(t *testing.T) {
			for _, r := range results {
				t.Run(testName(caseName(r)), func(t *testing.T) {
					switch {
					case r.Skipped:
						t.Skip(r.Message)
					case !r.Passed:
						t.Errorf("%s", r.String())
					default:
						t.Logf("%s", r.String())
					}
				})
			}
		})
	}
}

// caseName is a short, stable name of a result within its subject.
func caseName(r Result) string {
	switch r.Check {
	case CheckDerivative:
		return fmt.Sprintf("derivative order %d", r.Order)
	case CheckIdentity:
		return r.Name
	}
	return r.Check
}

// testName makes s usable as a subtest name: '/' separates levels in
// go test -run patterns, so it becomes the division slash '∕'.
func testName(s string) string {
	return strings.ReplaceAll(s, "/", "∕")
}
