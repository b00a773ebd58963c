package report

import (
	"fmt"
	"math"
	"sort"
	"strconv"
	"strings"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/fit"
	"github.com/pairwell/pairwell/core/levels"
	"github.com/pairwell/pairwell/core/units"
)

// FitMetric names the error by which fits are ranked.
type FitMetric string

// The ranking metrics: errors over all points, or the RMSE within the
// windows at 10 % and 50 % of the data's depth.
const (
	RankRMSE   FitMetric = "rmse"
	RankMAE    FitMetric = "mae"
	RankMax    FitMetric = "max"
	RankRMSE10 FitMetric = "rmse10"
	RankRMSE50 FitMetric = "rmse50"
)

// FitMetrics lists the ranking metrics; the first is the default.
var FitMetrics = []FitMetric{RankRMSE, RankMAE, RankMax, RankRMSE10, RankRMSE50}

// FitWindow is the error within one energy window.
type FitWindow struct {
	Fraction float64 `json:"depth_fraction"`
	Bound    float64 `json:"bound_ev"`
	N        int     `json:"points"`
	RMSE     Number  `json:"rmse_ev"`
	MAE      Number  `json:"mae_ev"`
	Max      Number  `json:"max_abs_error_ev"`
}

// FitWell is the well of a fitted form.
type FitWell struct {
	Re         float64  `json:"equilibrium_r_angstrom"`
	Depth      Number   `json:"well_depth_ev"`
	K          float64  `json:"force_constant_ev_per_angstrom2"`
	Pair       Text     `json:"pair"`
	Mu         *float64 `json:"reduced_mass_u"`
	Wavenumber *float64 `json:"harmonic_wavenumber_per_cm"`
	// ZPE is E(v=0) − V(re) and Fundamental E(v=1) − E(v=0) of the
	// fitted well, J = 0, from core/levels, in cm⁻¹ (with a mass only).
	ZPE         *float64 `json:"zero_point_energy_per_cm"`
	Fundamental *float64 `json:"fundamental_per_cm"`
}

// Fit is the fit of one form to reference data, as pairwell fit reports
// it. Values are in eV, Å, u and cm⁻¹; parameters in their default units.
type Fit struct {
	Rank           int         `json:"rank"`
	Model          string      `json:"model"`
	Name           string      `json:"name"`
	Origin         Text        `json:"origin"`
	Params         Params      `json:"params"`
	StandardErrors Params      `json:"standard_errors"`
	Correlation    [][]Number  `json:"correlation"`
	Spec           Text        `json:"spec"`
	Zero           Number      `json:"energy_zero_ev"`
	ZeroFitted     bool        `json:"energy_zero_fitted"`
	ZeroSource     string      `json:"energy_zero_source"`
	ZeroErr        Number      `json:"energy_zero_standard_error_ev"`
	RMSE           Number      `json:"rmse_ev"`
	MAE            Number      `json:"mae_ev"`
	Max            Number      `json:"max_abs_error_ev"`
	Windows        []FitWindow `json:"windows"`
	NPoints        int         `json:"points"`
	NFitted        int         `json:"fitted_points"`
	RSS            Number      `json:"weighted_rss_ev2"`
	Iterations     int         `json:"iterations"`
	Evaluations    int         `json:"evaluations"`
	Converged      bool        `json:"converged"`
	Reason         string      `json:"reason"`
	GradNorm       Number      `json:"gradient_norm"`
	Jacobian       string      `json:"jacobian"`
	Well           *FitWell    `json:"well"`
	Notes          []string    `json:"notes"`
	Error          Text        `json:"error"`

	metric float64 // ranking value
}

// FitInput is one form's fit, or why it failed.
type FitInput struct {
	Name   string
	Model  core.Model
	Result fit.Result
	Err    error
}

// NewFits reports the fits and ranks them by metric (ascending; failed fits
// and fits without the metric last, in input order). m, when it has a mass,
// adds the harmonic wavenumber of each fitted well.
func NewFits(in []FitInput, metric FitMetric, m Mass) ([]Fit, error) {
	known := false
	for _, k := range FitMetrics {
		known = known || k == metric
	}
	if !known {
		return nil, fmt.Errorf("%w: ranking metric %q; allowed: %s", core.ErrParam, metric, joinMetrics())
	}
	out := make([]Fit, len(in))
	for i, x := range in {
		out[i] = newFit(x, metric, m)
	}
	sort.SliceStable(out, func(a, b int) bool { return out[a].metric < out[b].metric })
	for i := range out {
		out[i].Rank = i + 1
	}
	return out, nil
}

func joinMetrics() string {
	s := make([]string, len(FitMetrics))
	for i, k := range FitMetrics {
		s[i] = string(k)
	}
	return strings.Join(s, ", ")
}

func newFit(x FitInput, metric FitMetric, m Mass) Fit {
	info := x.Model.Info()
	f := Fit{Model: info.Key, Name: x.Name, Origin: Text(info.Origin), Notes: []string{}, metric: math.Inf(1)}
	f.Params = Params{Values: make([]float64, len(info.Params))}
	f.StandardErrors = Params{Values: make([]float64, len(info.Params))}
	for i, q := range info.Params {
		f.Params.Names = append(f.Params.Names, q.Name)
		f.Params.Units = append(f.Params.Units, q.Dimension.DefaultUnit())
		f.StandardErrors.Names = append(f.StandardErrors.Names, q.Name)
		f.StandardErrors.Units = append(f.StandardErrors.Units, q.Dimension.DefaultUnit())
		f.Params.Values[i], f.StandardErrors.Values[i] = math.NaN(), math.NaN()
	}
	nan := Number(math.NaN())
	f.Zero, f.ZeroErr, f.RMSE, f.MAE, f.Max, f.RSS, f.GradNorm = nan, nan, nan, nan, nan, nan, nan
	f.Windows = []FitWindow{}
	if x.Err != nil {
		f.Error = Text(x.Err.Error())
		return f
	}
	r := x.Result
	copy(f.Params.Values, r.Instance.Params)
	copy(f.StandardErrors.Values, r.StdErr)
	if r.Correlation != nil {
		for _, row := range r.Correlation {
			nr := make([]Number, len(row))
			for j, v := range row {
				nr[j] = Number(v)
			}
			f.Correlation = append(f.Correlation, nr)
		}
	}
	f.Spec = Text(FitSpec(info.Key, info.Params, r.Instance.Params))
	f.Zero, f.ZeroFitted, f.ZeroErr, f.ZeroSource = Number(r.Zero), r.ZeroFitted, Number(r.ZeroErr), r.ZeroSource
	f.RMSE, f.MAE, f.Max = Number(r.All.RMSE), Number(r.All.MAE), Number(r.All.Max)
	for _, w := range r.Windows {
		f.Windows = append(f.Windows, FitWindow{Fraction: w.Fraction, Bound: w.Bound, N: w.N,
			RMSE: Number(w.RMSE), MAE: Number(w.MAE), Max: Number(w.Max)})
	}
	f.NPoints, f.NFitted = r.All.N, r.Fitted
	f.RSS = Number(r.RSS)
	f.Iterations, f.Evaluations = r.Iterations, r.Evaluations
	f.Converged, f.Reason, f.GradNorm = r.Converged(), string(r.Reason), Number(r.GradNorm)
	f.Jacobian = "central differences"
	if r.Analytic {
		f.Jacobian = "analytic"
	}
	f.Notes = append(f.Notes, r.Notes...)
	switch {
	case r.Reason == fit.Boundary:
		f.Notes = append(f.Notes, "not converged: the fit stopped at the edge of the parameters the form allows with these data (a point would leave its domain); the parameters are the best such point and their errors describe no minimum")
	case !r.Converged():
		f.Notes = append(f.Notes, fmt.Sprintf("not converged (%s): the parameters are the best point reached", r.Reason))
	}
	if w, err := core.AnalyzeWell(r.Instance.Potential, core.WellSettings{Order: 2}); err != nil {
		f.Notes = append(f.Notes, fmt.Sprintf("well of the fitted form: %v", err))
	} else {
		fw := &FitWell{Re: w.Re, Depth: Number(w.Depth), K: w.K}
		if m.Mu != 0 {
			if h, err := core.NewHarmonic(w.K, m.Mu); err == nil {
				fw.Pair, fw.Mu, fw.Wavenumber = Text(m.Pair), &h.Mu, &h.Wavenumber
			}
			if lv, err := levels.Solve(r.Instance.Potential, m.Mu, levels.Settings{Count: 2}); err != nil {
				f.Notes = append(f.Notes, fmt.Sprintf("zero-point energy and fundamental not given: %v", err))
			} else if len(lv.Levels) >= 2 {
				zpe := (lv.Levels[0].Energy - lv.Minimum) / units.WavenumberEV
				fund := (lv.Levels[1].Energy - lv.Levels[0].Energy) / units.WavenumberEV
				fw.ZPE, fw.Fundamental = &zpe, &fund
			}
		}
		f.Well = fw
	}
	var v float64
	switch metric {
	case RankRMSE:
		v = r.All.RMSE
	case RankMAE:
		v = r.All.MAE
	case RankMax:
		v = r.All.Max
	case RankRMSE10, RankRMSE50:
		v = math.NaN()
		want := fit.WindowFractions[0]
		if metric == RankRMSE50 {
			want = fit.WindowFractions[1]
		}
		for _, w := range r.Windows {
			if w.Fraction == want {
				v = w.RMSE
			}
		}
	}
	if !math.IsNaN(v) {
		f.metric = v
	}
	return f
}

// FitSpec formats a fitted parameter set as a spec string that every
// command accepts: each value with the shortest decimal that reads back to
// the same float64, in the default unit — bare where a bare number means
// that unit, else followed by it (a parameter whose Unit differs).
func FitSpec(key string, params []core.Param, values []float64) string {
	parts := make([]string, len(params))
	for i, q := range params {
		parts[i] = q.Name + "=" + ParamText(q, values[i])
	}
	return key + ":" + strings.Join(parts, ",")
}

// ParamText formats v, a value of q in its default unit, as spec text that
// reads back to the same float64 (see FitSpec).
func ParamText(q core.Param, v float64) string {
	t := strconv.FormatFloat(v, 'g', -1, 64)
	if u := q.Dimension.DefaultUnit(); q.Unit != "" && q.Unit != u && u != "" {
		t += " " + u
	}
	return t
}
