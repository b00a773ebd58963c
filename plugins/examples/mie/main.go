// Command mie is a pairwell plugin serving the Mie n-m form (Mie 1903),
// V = C·ε[(σ/r)ⁿ − (σ/r)ᵐ] with C = n/(n − m)·(n/m)^{m/(n−m)}, of which
// Lennard-Jones 12-6 is the case n = 12, m = 6.
//
// Build and use it:
//
//	go build -o ~/.pairwell/plugins/pairwell-plugin-mie ./plugins/examples/mie
//	PAIRWELL_PLUGIN_PATH=~/.pairwell/plugins pairwell inspect mie:epsilon=0.0104,sigma=3.4,n=13,m=6
package main

import "github.com/pairwell/pairwell/plugins/sdk"

// version is the plugin's own version, shown by "pairwell models".
const version = "1.0.0"

func main() {
	sdk.Serve(version, Mie())
}
