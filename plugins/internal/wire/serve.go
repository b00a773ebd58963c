package wire

import (
	"io"
	"os"
	"time"

	hclog "github.com/hashicorp/go-hclog"
	plugin "github.com/hashicorp/go-plugin"

	pb "github.com/pairwell/pairwell/plugins/proto"
)

// ServeConfig returns the go-plugin configuration that serves srv with the
// given application protocol version (ProtocolVersion for a well-behaved
// plugin). go-plugin's own log lines at levels below error are dropped:
// they would only clutter pairwell's error messages, which quote the
// plugin's standard error.
func ServeConfig(version uint, srv pb.FormsServer, stderr io.Writer) *plugin.ServeConfig {
	return &plugin.ServeConfig{
		HandshakeConfig: Handshake(version),
		Plugins:         plugin.PluginSet{PluginName: &GRPCPlugin{Forms: srv}},
		GRPCServer:      plugin.DefaultGRPCServer,
		Logger: hclog.New(&hclog.LoggerOptions{
			Name:   "pairwell-plugin",
			Level:  hclog.Error,
			Output: stderr,
		}),
	}
}

// ExitWithParent ends the plugin process when the process that started it
// is gone without stopping it (killed by SIGKILL, say): the plugin is then
// re-parented and its parent pid changes. Run it in its own goroutine.
func ExitWithParent() {
	ppid := os.Getppid()
	for range time.Tick(500 * time.Millisecond) {
		if os.Getppid() != ppid {
			os.Exit(1)
		}
	}
}
