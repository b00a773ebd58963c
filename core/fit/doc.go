// Package fit fits parametrised forms to reference data by weighted
// nonlinear least squares and measures how well each form describes the
// data.
//
// The engine, Minimize, is a Levenberg–Marquardt method over a Problem of
// residuals; FitForm builds that problem for a core.Model and a Data set:
// constraints become transformations (a parameter "> 0" or "≥ 0" is fitted
// as its logarithm), the start comes from the model's core.Matcher applied
// to the data's own minimum, depth and curvature (a cubic spline through
// the points near the minimum), and a few deterministic restarts guard
// against a poor local minimum. Every evaluation of a potential is one call
// for all points (eval.go): a potential may live in another process.
//
// Units: r in Å, energies in eV, forces in eV/Å, temperatures in K.
package fit
