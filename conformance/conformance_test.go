package conformance_test

import (
	"bytes"
	"encoding/json"
	"encoding/xml"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"github.com/pairwell/pairwell/conformance"
	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/models"
)

// sets are parameter sets of the built-in forms (invented, of realistic
// magnitude, plus stiff, soft and near-limit ones).
var sets = map[string][][]float64{
	"morse":         {{4.6, 1.87, 1.27}, {0.01, 0.5, 4}, {10, 5, 1}, {0.3, 3, 2.5}},
	"lennard-jones": {{0.0104, 3.4}, {0.5, 1.1}, {1e-4, 10}},
	// The third Buckingham set is close to the end of existence of the
	// well, (A/ρ)(7ρ)⁷e⁻⁷ ≈ 1.4·6C: barrier and minimum are close.
	"buckingham": {{1500, 0.3, 25}, {1000, 0.2, 1}, {1, 0.5, 0.15}},
	"harmonic":   {{30, 1.2}, {0.1, 3}},
}

func run(t *testing.T, m core.Model, ps [][]float64, s conformance.Settings) conformance.Report {
	t.Helper()
	rep, err := conformance.Run(m, ps, s)
	require.NoError(t, err)
	return rep
}

func find(rep conformance.Report, check string, order int) []conformance.Result {
	var out []conformance.Result
	for _, r := range rep.Results {
		if r.Check == check && (order < 0 || r.Order == order) {
			out = append(out, r)
		}
	}
	return out
}

func TestBuiltinsPassWithMargin(t *testing.T) {
	for _, m := range models.Builtin() {
		key := m.Info().Key
		rep := run(t, m, sets[key], conformance.Settings{})
		for _, r := range rep.Results {
			assert.True(t, r.Passed, "%s", r)
			assert.False(t, r.Skipped, "%s", r)
		}
		// Margin: finite-difference errors far below the tolerance.
		for _, r := range find(rep, conformance.CheckDerivative, -1) {
			assert.Less(t, r.Error, conformance.DefaultDerivativeTolerance/1e4, "%s", r)
		}
		for _, r := range find(rep, conformance.CheckIdentity, -1) {
			assert.Less(t, r.Error, 1e-13, "%s", r)
		}
		n := len(sets[key])
		assert.Len(t, find(rep, conformance.CheckDerivative, -1), 8*n, key)
		assert.Len(t, find(rep, conformance.CheckEquilibrium, -1), n, key)
	}
}

func TestTestHelper(t *testing.T) {
	for _, m := range models.Builtin() {
		conformance.Test(t, m) // representative set
		conformance.Test(t, m, sets[m.Info().Key]...)
	}
	conformance.TestSettings(t, conformance.Settings{Points: 50, MaxOrder: 4}, models.Morse{}, []float64{1, 1, 1})
}

// TestPublishedIdentities checks the built-ins' declared identities
// against the published closed forms, computed here independently:
// Lennard-Jones 12-6, r_min = 2^{1/6}σ and V″(r_min) = 36·2^{2/3}ε/σ²
// (= 72ε/r_min²); Morse (P. M. Morse, Phys. Rev. 34, 57 (1929)),
// V″(re) = 2De·a², V‴(re) = −6De·a³.
func TestPublishedIdentities(t *testing.T) {
	const eps, sigma = 0.0104, 3.4
	rep := run(t, models.LennardJones{}, [][]float64{{eps, sigma}}, conformance.Settings{})
	eq := find(rep, conformance.CheckEquilibrium, -1)[0]
	require.True(t, eq.Passed, eq.Message)
	rmin := math.Pow(2, 1.0/6) * sigma
	assert.InEpsilon(t, rmin, eq.WorstR, 1e-14)
	assert.InEpsilon(t, 72*eps/(rmin*rmin), 36*math.Pow(2, 2.0/3)*eps/(sigma*sigma), 1e-14)
	var sawK bool
	for _, r := range find(rep, conformance.CheckIdentity, 2) {
		sawK = true
		assert.Contains(t, r.Message, "0.0514120202298") // 36·2^(2/3)·0.0104/3.4²
		assert.NotEmpty(t, r.Source)
	}
	assert.True(t, sawK)

	const De, a, re = 4.6, 1.87, 1.27
	rep = run(t, models.Morse{}, [][]float64{{De, a, re}}, conformance.Settings{})
	ids := find(rep, conformance.CheckIdentity, 3)
	require.Len(t, ids, 1)
	assert.Contains(t, ids[0].Message, "-180.4820028") // −6·4.6·1.87³ = −6·4.6·6.539203
	assert.Contains(t, ids[0].Source, "Morse")
	assert.InDelta(t, -6*De*a*a*a, -180.4820028, 1e-9)
}

func TestWrongThirdDerivative(t *testing.T) {
	m := faultyModel{models.Morse{}, 3, func(r, v float64) float64 { return 1.5 * v }, false}
	rep := run(t, m, [][]float64{{4.6, 1.87, 1.27}}, conformance.Settings{})
	require.False(t, rep.Passed())
	fails := find(rep, conformance.CheckDerivative, -1)
	var failedOrders []int
	for _, r := range fails {
		if !r.Passed {
			failedOrders = append(failedOrders, r.Order)
		}
	}
	// V‴ wrong: order 3 (V‴ vs dV″/dr) and order 4 (V⁗ vs dV‴/dr) fail.
	assert.Equal(t, []int{3, 4}, failedOrders)
	o3 := find(rep, conformance.CheckDerivative, 3)[0]
	assert.Contains(t, o3.Message, "order 3: at r = ")
	assert.Contains(t, o3.Message, "V‴ itself is wrong")
	assert.Contains(t, o3.Message, "1.5 times")
	assert.Greater(t, o3.WorstR, 1.0)
	assert.InDelta(t, 1.0/3, o3.Error, 0.01) // ≈ |1.5A − A|/1.5A
	o4 := find(rep, conformance.CheckDerivative, 4)[0]
	assert.Contains(t, o4.Message, "the fault is in V‴ (order 3), not in V⁗")
	// Everything else is fine.
	for _, r := range rep.Failures() {
		assert.Equal(t, conformance.CheckDerivative, r.Check, "%s", r)
	}
}

func TestSmallDerivativeErrorIsCaught(t *testing.T) {
	m := faultyModel{models.LennardJones{}, 3, func(r, v float64) float64 { return v * (1 + 1e-6) }, false}
	rep := run(t, m, [][]float64{{0.0104, 3.4}}, conformance.Settings{})
	assert.False(t, find(rep, conformance.CheckDerivative, 3)[0].Passed)
}

func TestSignErrorInForce(t *testing.T) {
	flip := func(r, v float64) float64 { return -v }
	morseIDs := func(ps []float64) []conformance.Identity {
		return []conformance.Identity{{Name: "r_min = re", Quantity: conformance.EquilibriumR, Value: ps[2], Source: "Morse 1929"}}
	}
	for name, m := range map[string]core.Model{
		"no declarations": faultyModel{models.Morse{}, 1, flip, true},
		"declared re":     declaring{faultyModel{models.Morse{}, 1, flip, true}, morseIDs},
	} {
		t.Run(name, func(t *testing.T) {
			rep := run(t, m, [][]float64{{4.6, 1.87, 1.27}}, conformance.Settings{})
			o1 := find(rep, conformance.CheckDerivative, 1)[0]
			require.False(t, o1.Passed)
			assert.Contains(t, o1.Message, "order 1: at r = ")
			assert.Contains(t, o1.Message, "sign error")
			assert.True(t, o1.Error > 1 && o1.Error <= 2, "%g", o1.Error) // ≈ |−A − A|/|A|
			o2 := find(rep, conformance.CheckDerivative, 2)[0]
			require.False(t, o2.Passed)
			assert.Contains(t, o2.Message, "the fault is in V′ (order 1), not in V″")
			for _, n := range []int{3, 4, 5} {
				assert.True(t, find(rep, conformance.CheckDerivative, n)[0].Passed)
			}
			// With the sign of V′ flipped the well has no minimum; a form
			// that declares one fails the equilibrium check too.
			eq := find(rep, conformance.CheckEquilibrium, -1)[0]
			if name == "declared re" {
				assert.False(t, eq.Passed, eq.Message)
				assert.Contains(t, eq.Message, "declares a minimum")
			} else {
				assert.True(t, eq.Skipped, eq.Message)
			}
		})
	}
}

func TestSinglePointDiffersFromBatch(t *testing.T) {
	rep := run(t, bornMayer{maxOrder: 10, singleULP: true}, [][]float64{{100, 0.3}}, conformance.Settings{})
	r := find(rep, conformance.CheckBatch, -1)[0]
	require.False(t, r.Passed)
	assert.Contains(t, r.Message, "first at order 2")
	assert.Contains(t, r.Message, "differ in their bits")
}

func TestNonDeterministic(t *testing.T) {
	rep := run(t, bornMayer{maxOrder: 10, noisy: true}, [][]float64{{100, 0.3}}, conformance.Settings{})
	assert.False(t, find(rep, conformance.CheckDeterminism, -1)[0].Passed)
	assert.False(t, find(rep, conformance.CheckConcurrency, -1)[0].Passed)
}

func TestNoMinimumForm(t *testing.T) {
	rep := run(t, bornMayer{maxOrder: 10}, [][]float64{{100, 0.3}}, conformance.Settings{})
	for _, r := range rep.Results {
		assert.True(t, r.Passed, "%s", r)
	}
	eq := find(rep, conformance.CheckEquilibrium, -1)[0]
	assert.True(t, eq.Skipped)
	assert.Contains(t, find(rep, conformance.CheckDerivative, 1)[0].Message, "fallback range")
	assert.True(t, find(rep, conformance.CheckIdentity, -1)[0].Skipped)
	// An explicit range.
	rep = run(t, bornMayer{maxOrder: 10}, [][]float64{{100, 0.3}}, conformance.Settings{RMin: 1, RMax: 2})
	assert.True(t, rep.Passed())
	assert.Contains(t, find(rep, conformance.CheckDerivative, 1)[0].Message, "from 1 to 2 Å")
}

func TestTooFewOrders(t *testing.T) {
	rep := run(t, bornMayer{maxOrder: 2}, [][]float64{{100, 0.3}}, conformance.Settings{})
	mo := find(rep, conformance.CheckMaxOrder, -1)[0]
	assert.False(t, mo.Passed)
	assert.Contains(t, mo.Message, "MaxOrder is 2")
	assert.Len(t, find(rep, conformance.CheckDerivative, -1), 2)
}

func TestInvalidInputAccepted(t *testing.T) {
	rep := run(t, bornMayer{maxOrder: 10, acceptNaN: true, acceptZeroR: true}, [][]float64{{100, 0.3}}, conformance.Settings{})
	ip := find(rep, conformance.CheckInvalidParams, -1)[0]
	assert.False(t, ip.Passed)
	assert.Contains(t, ip.Message, "A = NaN (must be > 0): accepted")
	assert.Equal(t, 2.0, ip.Error)
	ir := find(rep, conformance.CheckInvalidR, -1)[0]
	assert.False(t, ir.Passed)
	assert.Contains(t, ir.Message, "Taylor(2, [0]) returned V = 100 without an error")
}

func TestWrongIdentityAndLimit(t *testing.T) {
	m := declaring{models.Morse{}, func(ps []float64) []conformance.Identity {
		return []conformance.Identity{{Name: "V″(re) = De·a² (missing 2)", Quantity: conformance.DerivativeAtMinimum, Order: 2,
			Value: ps[0] * ps[1] * ps[1], Source: "a typo"}}
	}}
	rep := run(t, m, [][]float64{{4.6, 1.87, 1.27}}, conformance.Settings{})
	id := find(rep, conformance.CheckIdentity, 2)[0]
	assert.False(t, id.Passed)
	assert.Equal(t, "a typo", id.Source)
	assert.Contains(t, id.Message, "fails")

	rep = run(t, bornMayer{maxOrder: 10, limit: 1}, [][]float64{{100, 0.3}}, conformance.Settings{})
	as := find(rep, conformance.CheckAsymptote, -1)[0]
	assert.False(t, as.Passed)
	assert.Contains(t, as.Message, "does not approach")
}

func TestUnboundedAsymptote(t *testing.T) {
	rep := run(t, models.Harmonic{}, [][]float64{{30, 1.2}}, conformance.Settings{})
	as := find(rep, conformance.CheckAsymptote, -1)[0]
	assert.True(t, as.Passed, as.Message)
	assert.Contains(t, as.Message, "Limit +Inf")
}

func TestBuildFailure(t *testing.T) {
	rep := run(t, models.Buckingham{}, [][]float64{{1, 0.1, 100}}, conformance.Settings{})
	require.Len(t, rep.Results, 1)
	assert.Equal(t, conformance.CheckBuild, rep.Results[0].Check)
	assert.False(t, rep.Passed())
}

func TestSettingsErrors(t *testing.T) {
	for _, s := range []conformance.Settings{
		{Points: 3}, {MaxOrder: -1}, {RangeLo: 3, RangeHi: 1}, {RMin: 1}, {DerivativeTolerance: -1},
		{AsymptoteFactor: 0.5}, {Goroutines: -2}, {IdentityTolerance: math.NaN()},
	} {
		_, err := conformance.Run(models.Morse{}, [][]float64{{1, 1, 1}}, s)
		assert.ErrorIs(t, err, core.ErrParam, "%+v", s)
	}
	_, err := conformance.RunCases([]conformance.Case{{Name: "x"}}, conformance.Settings{})
	assert.ErrorIs(t, err, core.ErrParam)
}

func TestRunInstancesLabels(t *testing.T) {
	inst, err := models.NewRegistry().Build("morse:De=4.6,a=1.87,re=127pm")
	require.NoError(t, err)
	rep, err := conformance.RunInstances([]core.Instance{inst}, conformance.Settings{})
	require.NoError(t, err)
	assert.Equal(t, []string{"morse:De=4.6,a=1.87,re=1.27"}, rep.Subjects())
	rep, err = conformance.RunCases([]conformance.Case{{Name: "hcl", Instance: inst}}, conformance.Settings{})
	require.NoError(t, err)
	assert.Equal(t, []string{"hcl"}, rep.Subjects())
	assert.True(t, rep.Passed())
}

func TestRepresentative(t *testing.T) {
	for _, m := range models.Builtin() {
		ps, ok := conformance.Representative(m)
		require.True(t, ok, m.Info().Key)
		_, err := m.New(ps)
		require.NoError(t, err)
		ps[0] = -1 // a copy
		ps2, _ := conformance.Representative(m)
		assert.Positive(t, ps2[0])
	}
	_, ok := conformance.Representative(bornMayer{})
	assert.False(t, ok)
}

func TestJSON(t *testing.T) {
	rep := run(t, models.Morse{}, [][]float64{{4.6, 1.87, 1.27}}, conformance.Settings{})
	data, err := json.Marshal(rep)
	require.NoError(t, err)
	var rows []map[string]any
	require.NoError(t, json.Unmarshal(data, &rows))
	require.Len(t, rows, len(rep.Results))
	for _, k := range []string{"name", "model", "check", "title", "derivative_order", "status", "passed", "skipped",
		"deviation", "tolerance", "worst_r_angstrom", "message", "source", "seconds"} {
		assert.Contains(t, rows[0], k)
	}
	assert.Nil(t, rows[0]["worst_r_angstrom"], "max-order is not tied to a separation: null")
	data, err = json.Marshal(conformance.Report{})
	require.NoError(t, err)
	assert.Equal(t, "[]", string(data))
}

// junit mirrors the JUnit XML schema for parsing the output back.
type junit struct {
	XMLName  xml.Name `xml:"testsuites"`
	Tests    int      `xml:"tests,attr"`
	Failures int      `xml:"failures,attr"`
	Suites   []struct {
		Name     string `xml:"name,attr"`
		Tests    int    `xml:"tests,attr"`
		Failures int    `xml:"failures,attr"`
		Cases    []struct {
			Name      string `xml:"name,attr"`
			ClassName string `xml:"classname,attr"`
			Failure   *struct {
				Message string `xml:"message,attr"`
				Text    string `xml:",chardata"`
			} `xml:"failure"`
			Skipped *struct {
				Message string `xml:"message,attr"`
			} `xml:"skipped"`
			SystemOut string `xml:"system-out"`
		} `xml:"testcase"`
	} `xml:"testsuite"`
}

func TestJUnit(t *testing.T) {
	good := run(t, models.Morse{}, [][]float64{{4.6, 1.87, 1.27}}, conformance.Settings{})
	bad := run(t, faultyModel{models.Morse{}, 3, func(r, v float64) float64 { return 1.5 * v }, false},
		[][]float64{{4.6, 1.87, 1.27}}, conformance.Settings{})
	for i := range bad.Results {
		bad.Results[i].Subject = "faulty <morse> & \"co\"\x01" // escaping, invalid XML characters
	}
	rep := conformance.Report{Results: append(append([]conformance.Result(nil), good.Results...), bad.Results...)}

	var buf bytes.Buffer
	require.NoError(t, rep.WriteJUnit(&buf, "pairwell check"))
	assert.True(t, strings.HasPrefix(buf.String(), "<?xml"))
	var doc junit
	require.NoError(t, xml.Unmarshal(buf.Bytes(), &doc), buf.String())
	assert.Equal(t, len(rep.Results), doc.Tests)
	assert.Equal(t, 2, doc.Failures)
	require.Len(t, doc.Suites, 2)
	assert.Equal(t, "morse:De=4.6,a=1.87,re=1.27", doc.Suites[0].Name)
	assert.Zero(t, doc.Suites[0].Failures)
	assert.Equal(t, 2, doc.Suites[1].Failures)
	var msgs []string
	for _, c := range doc.Suites[1].Cases {
		if c.Failure != nil {
			msgs = append(msgs, c.Failure.Message)
			assert.Equal(t, "pairwell.conformance.morse", c.ClassName)
		}
	}
	require.Len(t, msgs, 2)
	assert.Contains(t, msgs[0], "order 3: at r = ")
	assert.Contains(t, doc.Suites[0].Cases[1].SystemOut, "measured error")

	// The file is written atomically and parses back.
	path := filepath.Join(t.TempDir(), "junit.xml")
	require.NoError(t, conformance.WriteJUnitFile(path, rep, "pairwell check"))
	data, err := os.ReadFile(path)
	require.NoError(t, err)
	require.NoError(t, xml.Unmarshal(data, &doc))
	assert.Equal(t, buf.String(), string(data))
}
