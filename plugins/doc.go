// Package plugins runs functional forms that are not built into pairwell:
// each is served by a plugin, a separate executable that pairwell starts
// and talks to with HashiCorp go-plugin over gRPC.
//
// # Using plugins
//
// Load starts a plugin and returns its models, ready for a core.Registry;
// they work everywhere a built-in form does. ModelInfo.Origin is the
// plugin's absolute path and ModelInfo.Version the version it reports.
// Close stops the plugin; a process that is still running when its host
// exits is ended too (a plugin built with package sdk notices that its
// parent is gone and exits).
//
//	p, err := plugins.Load(ctx, "/opt/ff/pairwell-plugin-rydberg", plugins.Options{})
//	if err != nil { … }
//	defer p.Close()
//	for _, m := range p.Models() { registry.Add(m) }
//
// pairwell names plugins with --plugin PATH[@sha256:HEX] (ParseRef) and
// finds them in the directories of PAIRWELL_PLUGIN_PATH (Discover: every
// executable named pairwell-plugin-*), optionally pinned by a lock file in
// sha256sum's format (ReadLock).
//
// # Evaluation
//
// Each parameter set is validated once, by the plugin (Model.New → Open),
// which keeps the potential under a handle; evaluations then carry only
// the handle and the data. Potential.Taylor sends one round trip for all
// orders 0…n at up to 2¹⁸/(n+1) points (longer batches are split).
// Plugins built with package sdk also serve a direct evaluation channel (a
// Unix socket with a fixed binary framing, see DescribeResponse.fast_path
// in proto/pairwell.proto), which pairwell then uses for evaluations
// instead of gRPC: a round trip costs about a sixth.
//
// # Faults
//
// Every error names the plugin's path and the call. Errors a plugin
// reports keep their class (errors.Is with core.ErrDomain, core.ErrParam,
// …), so that bad input is told from a broken plugin. Besides:
//
//   - ErrChecksum: the executable is not the pinned one; it is not run.
//   - ErrHandshake: not a pairwell plugin, or another protocol version.
//   - ErrCrashed: the process ended during a call; the message says how
//     and quotes its last output.
//   - ErrTimeout: a call exceeded Options.Timeout; the plugin was killed.
//   - ErrBadOutput: wrong number of values, NaN or ±Inf, bad metadata.
//   - ErrClosed: the plugin was closed, or stopped after one of the above.
//
// A panic in a plugin's model code is reported as a failure of the call.
//
// # Writing plugins
//
// In Go, implement core.Model and core.Potential as for a built-in form
// and call sdk.Serve from main; see package sdk and the examples in
// plugins/examples. In another language, implement the Forms service of
// proto/pairwell.proto (package pairwell.plugin.v1) and the parts of
// go-plugin's protocol the host uses; plugins/examples/python is a complete
// plugin in Python that does:
//
//   - pairwell starts the executable with no arguments, standard input
//     from /dev/null, and, in its environment, PAIRWELL_PLUGIN set to the
//     value of MagicCookieValue (exit with a message if it is missing: a
//     user ran the plugin directly), PLUGIN_PROTOCOL_VERSIONS=2 and
//     PLUGIN_UNIX_SOCKET_DIR, a private directory for sockets;
//   - the plugin listens on a Unix socket in that directory and serves
//     there over gRPC (plaintext HTTP/2): Forms; grpc.health.v1.Health,
//     answering SERVING for the service "plugin"; and, so that a graceful
//     close ends it at once, go-plugin's plugin.GRPCController/Shutdown
//     (an empty message each way). go-plugin's stdio and broker services
//     may be left out: the host gets UNIMPLEMENTED and does without them;
//   - once it listens, it prints one line to standard output:
//     "1|2|unix|SOCKET_PATH|grpc|" (go-plugin's core protocol 1,
//     pairwell's ProtocolVersion 2, network, address, protocol, no
//     certificate), and writes nothing else there;
//   - DescribeResponse.fast_path may stay empty: the direct evaluation
//     channel is an optimisation of the Go SDK, and pairwell evaluates a
//     plugin without one over Evaluate;
//   - it serves until pairwell kills it (SIGKILL), and should exit by
//     itself on Shutdown, SIGTERM and when its parent process is gone.
//     Whatever it writes to standard error is quoted in pairwell's
//     messages when it fails.
//
// # Regenerating the protocol code
//
// The Go code in proto/ is generated and committed. After editing
// proto/pairwell.proto, install Debian's protobuf-compiler and the two
// generators, then run go generate:
//
//	apt-get install protobuf-compiler
//	go install google.golang.org/protobuf/cmd/protoc-gen-go@v1.36.12
//	go install google.golang.org/grpc/cmd/protoc-gen-go-grpc@v1.6.2
//	PATH="$(go env GOPATH)/bin:$PATH" go generate ./plugins/proto
package plugins
