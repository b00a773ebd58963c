// Command rydberg is a pairwell plugin serving the Rydberg (1931) form,
// V = −De(1 + a(r − re))e^{−a(r − re)}, which is not built into pairwell.
//
// Build and use it:
//
//	go build -o ~/.pairwell/plugins/pairwell-plugin-rydberg ./plugins/examples/rydberg
//	PAIRWELL_PLUGIN_PATH=~/.pairwell/plugins pairwell inspect rydberg:De=4.6,a=2.5,re=1.27
package main

import "github.com/pairwell/pairwell/plugins/sdk"

// version is the plugin's own version, shown by "pairwell models".
const version = "1.0.0"

func main() {
	sdk.Serve(version, Rydberg{})
}
