// Package sdk turns functional forms written in Go into a pairwell plugin.
//
// The short way is Form: write V(r) once, as a Go function of the jet of r
// (package core/jet), give the metadata, and Form is a complete model —
// parameter and domain checks, batching, the normalized Taylor coefficients
// c_k = V⁽ᵏ⁾/k! of every order by Taylor-mode automatic differentiation:
//
//	var morse = sdk.Form{
//		Meta: core.ModelInfo{Key: "my-morse", Params: …},
//		V: func(t *jet.Tape, r jet.Jet, p []float64) jet.Jet {
//			y := t.Exp(t.Affine(r, -p[1], p[1]*p[2]))  // e^{−a(r − re)}
//			return t.Mul(y, t.Affine(y, p[0], -2*p[0])) // De·y(y − 2)
//		},
//	}
//
//	func main() { sdk.Serve("1.0.0", morse) }
//
// (plugins/examples/mie is a complete example.) Alternatively, an author
// implements the same contract as a built-in form by hand — a core.Model
// (optionally a core.Matcher) whose New returns a core.Potential, whose one
// evaluation method Taylor returns the normalized Taylor coefficients at
// many separations, with its Domain (barrier energy and equilibrium guess
// included) and, for "pairwell check", its published identities
// (conformance.Identifier); plugins/examples/rydberg is written that way —
// and calls Serve from main:
//
//	func main() {
//		sdk.Serve("1.0.0", Rydberg{})
//	}
//
// Build it with go build, name the executable pairwell-plugin-NAME to let
// pairwell find it in PAIRWELL_PLUGIN_PATH, or pass it with --plugin PATH.
// pairwell starts the plugin, asks for the models' metadata once, validates
// each parameter set once (Model.New) and then sends whole batches of
// separations, with the highest order n wanted, to Potential.Taylor.
//
// Conventions the host relies on, as for built-in forms: units are eV, Å,
// u, fs (c_k in eV/Åᵏ); parameters arrive in the default unit of
// their dimension, in the order of ModelInfo.Params; errors wrap
// core.ErrDomain, core.ErrOrder, core.ErrParam, core.ErrNoMinimum so that
// pairwell can tell bad input from a broken plugin; a failure at one point
// of a batch is a *core.PointError; every value returned is finite (report
// an overflow as a domain error, never as ±Inf or NaN). ModelInfo.Origin and
// ModelInfo.Version are set by the host from the plugin's path and the
// version given to Serve. The helpers core.CheckParams, core.CheckR and
// core.CheckTaylor do the usual checks.
//
// A panic in model code is recovered and reported as a failure of that call.
// The plugin exits when pairwell stops it or exits itself.
package sdk

import (
	"fmt"
	"os"
	"path/filepath"
	"strings"

	plugin "github.com/hashicorp/go-plugin"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/plugins/internal/wire"
)

// Serve serves models as a pairwell plugin of the given version (the
// plugin's own version, shown by "pairwell models"). It returns when
// pairwell closes the plugin.
//
// Run directly rather than by pairwell, Serve prints a line saying that the
// executable is a pairwell plugin and how to use it, and exits with status
// 1. Metadata that does not fit the protocol (no models, an empty or
// duplicate key, a parameter without a dimension) is reported the same way.
func Serve(version string, models ...core.Model) {
	name := filepath.Base(os.Args[0])
	srv, err := wire.NewServer(version, models)
	if err != nil {
		fmt.Fprintf(os.Stderr, "%s: not a valid pairwell plugin: %v\n", name, err)
		os.Exit(1)
	}
	if os.Getenv(wire.MagicCookieKey) != wire.MagicCookieValue {
		fmt.Fprint(os.Stderr, DirectRunMessage(os.Args[0], version, srv.Keys()))
		os.Exit(1)
	}
	go wire.ExitWithParent()
	if err := srv.ListenFast(); err != nil {
		// Evaluations still work over gRPC.
		fmt.Fprintf(os.Stderr, "%s: %v\n", name, err)
	}
	plugin.Serve(wire.ServeConfig(wire.ProtocolVersion, srv, os.Stderr))
}

// DirectRunMessage is what a plugin prints when a user runs it directly:
// path is the executable, keys the forms it serves.
func DirectRunMessage(path, version string, keys []string) string {
	if abs, err := filepath.Abs(path); err == nil {
		path = abs
	}
	v := ""
	if version != "" {
		v = " " + version
	}
	return fmt.Sprintf("%s is a pairwell plugin%s (forms: %s); pairwell starts it, it is not run by itself.\n"+
		"Use it with:  pairwell --plugin %s models\n"+
		"or put it, named pairwell-plugin-*, in a directory listed in PAIRWELL_PLUGIN_PATH.\n",
		filepath.Base(path), v, strings.Join(keys, ", "), path)
}
