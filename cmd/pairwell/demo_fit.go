package main

import (
	"bytes"
	_ "embed"
	"fmt"
	"strings"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/fit"
	"github.com/pairwell/pairwell/core/refdata"
	"github.com/pairwell/pairwell/core/report"
)

// demoScanCSV is the demo's INVENTED energy scan (see
// demodata/make_invented_scan.py): an extended-Rydberg curve with the demo
// bond's re, De and k on an invented absolute scale, in bohr and hartree.
//
//go:embed demodata/invented-scan.csv
var demoScanCSV []byte

// demoScanName names the scan in the demo's output.
const demoScanName = "invented-scan.csv"

// demoFit is the demo's fit section.
type demoFit struct {
	Invented    bool         `json:"invented"`
	Description string       `json:"description"`
	Data        string       `json:"data"`
	Points      int          `json:"points"`
	Fits        []report.Fit `json:"fits"`
}

// demoFitRun fits every built-in form to the invented scan: uniform
// weights, energy zero at the largest r, ranked by RMSE.
func demoFitRun(e *env) (*fitRun, error) {
	data, err := refdata.Read(bytes.NewReader(demoScanCSV), demoScanName)
	if err != nil {
		return nil, failErr(fmt.Errorf("demo: %w", err))
	}
	var ms []core.Model
	for _, m := range e.registry.Models() {
		if m.Info().Origin == "built-in" {
			ms = append(ms, m)
		}
	}
	return fitAll(ms, data, demoScanName, fit.Settings{}, nil, report.RankRMSE, report.Mass{Mu: demoBond.mu})
}

// demoFitSection is the fit section of the demo.
func demoFitSection(e *env) (*demoFit, error) {
	run, err := demoFitRun(e)
	if err != nil {
		return nil, err
	}
	return &demoFit{
		Invented: true,
		Description: "An INVENTED energy scan of the demo bond (an extended-Rydberg curve with re = 1.20 Å, De = 4.00 eV, " +
			"k = 30 eV/Å² on an invented absolute energy scale, in bohr and hartree), not computed by any electronic-structure " +
			"program; every built-in form is fitted to it (pairwell fit).",
		Data: demoScanName, Points: len(run.data.R), Fits: run.fits,
	}, nil
}

func writeDemoFit(w tableWriter, r demoReport) error {
	f := r.Fit
	if f == nil {
		return nil
	}
	fmt.Fprintf(w, "\n== Fitting the four forms to an INVENTED scan (%d points, pairwell fit %s --mu %g)\n", f.Points, f.Data, demoBond.mu)
	if err := w.table(fitTable(f.Fits)); err != nil {
		return err
	}
	var s []string
	if best := f.Fits[0]; best.Error == "" && best.Well != nil {
		s = append(s, fmt.Sprintf("Fitted to the same scan, %s ranks first with an RMSE of %.3g eV over all points; its fitted well "+
			"(re = %.4g Å, depth %.3f eV, k = %.4g eV/Å²) is close to the curve's own (re = %g Å, De = %g eV, k = %g eV/Å²), "+
			"but no form has the curve's exact shape, so the errors do not vanish.",
			best.Model, float64(best.RMSE), best.Well.Re, float64(best.Well.Depth), best.Well.K,
			demoBond.target.Re, demoBond.target.Depth, demoBond.target.K))
	}
	for _, x := range f.Fits[1:] {
		if x.Error != "" {
			s = append(s, fmt.Sprintf("%s could not be fitted: %s.", x.Model, x.Error))
		}
	}
	s = append(s, "Standard errors, correlations and the residual picture (fit.png) are in pairwell fit's output.")
	_, err := fmt.Fprintf(w, "%s\n", wrap(strings.Join(s, " "), 88))
	return err
}
