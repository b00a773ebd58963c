package plugins

import (
	"bytes"
	"context"
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"sync"
	"sync/atomic"
	"syscall"
	"time"

	hclog "github.com/hashicorp/go-hclog"
	plugin "github.com/hashicorp/go-plugin"
	"github.com/hashicorp/go-plugin/runner"
	"google.golang.org/grpc"
	"google.golang.org/grpc/codes"
	"google.golang.org/grpc/status"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/plugins/internal/wire"
	pb "github.com/pairwell/pairwell/plugins/proto"
)

// The handshake a plugin must answer; see the package documentation.
const (
	MagicCookieKey   = wire.MagicCookieKey
	MagicCookieValue = wire.MagicCookieValue
	ProtocolVersion  = wire.ProtocolVersion
)

// DefaultTimeout is the per-call deadline when Options.Timeout is zero.
const DefaultTimeout = 10 * time.Second

// Errors of plugins. Errors returned by this package wrap one of these, or
// a core error (core.ErrDomain, core.ErrParam, …) that the plugin reported,
// or an fs error for a missing or unreadable file.
var (
	// ErrChecksum means the executable does not have the pinned SHA-256;
	// it was not run.
	ErrChecksum = errors.New("checksum mismatch")
	// ErrNotExecutable means the path is not an executable regular file.
	ErrNotExecutable = errors.New("not an executable file")
	// ErrHandshake means the executable did not start as a pairwell
	// plugin: it is something else, it exited, or it speaks another
	// protocol version.
	ErrHandshake = errors.New("plugin handshake failed")
	// ErrBadOutput means the plugin answered against the protocol: wrong
	// number of values, NaN or ±Inf where a number is due, invalid
	// metadata.
	ErrBadOutput = errors.New("invalid plugin output")
	// ErrCrashed means the plugin process ended during a call.
	ErrCrashed = errors.New("plugin crashed")
	// ErrTimeout means a call exceeded its deadline; the plugin was
	// stopped.
	ErrTimeout = errors.New("plugin call timed out")
	// ErrClosed means the plugin was closed or stopped earlier.
	ErrClosed = errors.New("plugin not running")
)

// Options configure Load. The zero value is ready to use.
type Options struct {
	// Timeout bounds the start of the plugin and each call to it. A call
	// that exceeds it stops the plugin. Zero means DefaultTimeout.
	Timeout time.Duration

	// SHA256, when not nil, pins the executable: Load refuses, before
	// running it, a file whose SHA-256 digest differs. It must be 32
	// bytes. On Linux the file is copied while it is hashed into a
	// sealed anonymous file, and that copy runs, so that no swap of the
	// file after the check can run other bytes.
	SHA256 []byte

	// Stderr, when not nil, receives the plugin's standard error as it
	// comes. Either way its last lines are quoted in error messages.
	Stderr io.Writer

	// MaxReply bounds the size in bytes of one gRPC reply of the plugin
	// (the direct channel has its own bound); a larger reply fails the
	// call with ErrBadOutput. Zero means DefaultMaxReply.
	MaxReply int
}

// DefaultMaxReply is the default of Options.MaxReply: 64 MiB, 8 Mi values,
// a hundred times the largest batch pairwell asks for.
const DefaultMaxReply = 64 << 20

// Plugin is a running plugin. Its models are ready to register; they and
// the potentials they build are safe for concurrent use and work until the
// plugin is closed or stopped.
type Plugin struct {
	path    string
	version string
	models  []core.Model
	timeout time.Duration

	client *plugin.Client
	forms  pb.FormsClient
	fast   *wire.FastClient // nil: evaluations go over gRPC; set by Load
	// fastSets: the direct channel takes EvaluateSets (Describe said
	// fast_sets); noSets: the plugin answered EvaluateSets UNIMPLEMENTED,
	// so sets are opened and evaluated one by one.
	fastSets bool
	noSets   atomic.Bool
	stderr   *tail

	ctx    context.Context // canceled when the plugin stops
	cancel context.CancelFunc

	mu   sync.Mutex
	dead error    // why the plugin is no longer usable; nil while it runs
	proc *process // the process, once go-plugin asked for it
	dir  string   // the private directory of the plugin's sockets

	killMu sync.Mutex // serialises kill
}

// Load starts the plugin executable at path, checks its handshake and asks
// it for its models. ctx bounds the start only: once Load has returned,
// the plugin runs until Close, a call that exceeds the deadline, or a
// crash. The caller must Close the plugin.
func Load(ctx context.Context, path string, opts Options) (*Plugin, error) {
	abs, err := filepath.Abs(path)
	if err != nil {
		return nil, fmt.Errorf("plugin %s: %w", path, err)
	}
	exe, err := checkFile(abs, opts.SHA256)
	if err != nil {
		return nil, err
	}
	timeout := opts.Timeout
	if timeout <= 0 {
		timeout = DefaultTimeout
	}
	maxReply := opts.MaxReply
	if maxReply <= 0 {
		maxReply = DefaultMaxReply
	}
	sweepSocketDirs()
	dir, err := os.MkdirTemp("", socketDirPrefix())
	if err != nil {
		if exe != nil {
			exe.Close()
		}
		return nil, fmt.Errorf("plugin %s: %w", abs, err)
	}
	p := &Plugin{path: abs, timeout: timeout, stderr: &tail{fwd: opts.Stderr}, dir: dir}
	p.ctx, p.cancel = context.WithCancel(context.Background())
	p.client = plugin.NewClient(&plugin.ClientConfig{
		UnixSocketConfig: &plugin.UnixSocketConfig{TempDir: dir},
		GRPCDialOptions:  []grpc.DialOption{grpc.WithDefaultCallOptions(grpc.MaxCallRecvMsgSize(maxReply))},
		HandshakeConfig:  wire.Handshake(wire.ProtocolVersion),
		Plugins:          plugin.PluginSet{wire.PluginName: &wire.GRPCPlugin{}},
		AllowedProtocols: []plugin.Protocol{plugin.ProtocolGRPC},
		RunnerFunc: func(_ hclog.Logger, cmd *exec.Cmd, _ string) (runner.Runner, error) {
			p.mu.Lock()
			defer p.mu.Unlock()
			if p.dead != nil {
				return nil, p.dead
			}
			proc, err := newProcess(abs, exe, cmd)
			exe = nil // the process owns it now
			if err != nil {
				return nil, err
			}
			p.proc = proc
			return proc, nil
		},
		StartTimeout: timeout,
		Stderr:       p.stderr,
		SyncStderr:   p.stderr,
		Logger:       hclog.New(&hclog.LoggerOptions{Level: hclog.Off, Output: io.Discard}),
	})

	// Stop a start that ctx abandons.
	started := make(chan struct{})
	defer close(started)
	go func() {
		select {
		case <-ctx.Done():
			p.kill(fmt.Errorf("plugin %s: start: %w", abs, ctx.Err()))
		case <-started:
		}
	}()

	if err := p.start(ctx); err != nil {
		p.kill(err)
		if exe != nil {
			exe.Close()
		}
		return nil, err
	}
	return p, nil
}

// checkFile checks that path is an executable regular file with the pinned
// digest, if any. A pinned file is opened once, copied while it is hashed
// into a sealed anonymous file, and that copy is what runs (returned, on
// Linux): a swap or an overwrite of path after the check cannot run
// unpinned bytes. Elsewhere the file is hashed through the same open
// descriptor and then run by path (nil).
func checkFile(path string, pin []byte) (*os.File, error) {
	if pin != nil && len(pin) != sha256.Size {
		return nil, fmt.Errorf("plugin %s: %w: the pin has %d bytes, a SHA-256 digest has %d", path, ErrChecksum, len(pin), sha256.Size)
	}
	f, err := os.Open(path)
	if err != nil {
		return nil, fmt.Errorf("plugin %s: %w", path, err)
	}
	defer f.Close()
	st, err := f.Stat()
	if err != nil {
		return nil, fmt.Errorf("plugin %s: %w", path, err)
	}
	if !st.Mode().IsRegular() || st.Mode().Perm()&0o111 == 0 {
		return nil, fmt.Errorf("plugin %s: %w (mode %v)", path, ErrNotExecutable, st.Mode())
	}
	if pin == nil {
		return nil, nil
	}
	h := sha256.New()
	var dst io.Writer = h
	cp, err := sealedCopy(filepath.Base(path))
	if err == nil {
		dst = io.MultiWriter(h, cp)
	}
	if _, err := io.Copy(dst, f); err != nil {
		if cp != nil {
			cp.Close()
		}
		return nil, fmt.Errorf("plugin %s: %w", path, err)
	}
	sum := h.Sum(nil)
	if !bytes.Equal(sum, pin) {
		if cp != nil {
			cp.Close()
		}
		return nil, fmt.Errorf("plugin %s: %w: its SHA-256 is %s, pinned %s; refusing to run it",
			path, ErrChecksum, hex.EncodeToString(sum), hex.EncodeToString(pin))
	}
	if cp == nil {
		return nil, nil
	}
	if err := seal(cp); err != nil {
		cp.Close()
		return nil, fmt.Errorf("plugin %s: sealing the copy to run: %w", path, err)
	}
	return cp, nil
}

// FileSHA256 returns the SHA-256 digest of the file at path.
func FileSHA256(path string) ([]byte, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	h := sha256.New()
	if _, err := io.Copy(h, f); err != nil {
		return nil, err
	}
	return h.Sum(nil), nil
}

// start connects and describes.
func (p *Plugin) start(ctx context.Context) error {
	rpc, err := p.client.Client()
	if err != nil {
		if ctx.Err() != nil {
			return fmt.Errorf("plugin %s: start: %w", p.path, ctx.Err())
		}
		if errors.Is(err, fs.ErrPermission) || errors.Is(err, fs.ErrNotExist) {
			return fmt.Errorf("plugin %s: %w", p.path, err)
		}
		if m := otherVersion.FindStringSubmatch(err.Error()); m != nil {
			return fmt.Errorf("plugin %s: %w: built for protocol %s, this pairwell speaks %d: rebuild it against this version",
				p.path, ErrHandshake, m[1], wire.ProtocolVersion)
		}
		return fmt.Errorf("plugin %s: %w: %s%s", p.path, ErrHandshake, oneLine(err.Error()), p.stderr.quote())
	}
	raw, err := rpc.Dispense(wire.PluginName)
	if err != nil {
		return fmt.Errorf("plugin %s: %w: %v", p.path, ErrHandshake, err)
	}
	p.forms = raw.(pb.FormsClient)

	var resp *pb.DescribeResponse
	if err := p.call("Describe", func(ctx context.Context) (err error) {
		resp, err = p.forms.Describe(ctx, &pb.DescribeRequest{})
		return err
	}); err != nil {
		return err
	}
	p.version = resp.GetPluginVersion()
	if addr := resp.GetFastPath(); addr != "" {
		// Without the direct channel evaluations still work, over gRPC.
		if fc, err := wire.DialFast(addr, p.timeout); err == nil {
			p.mu.Lock()
			if p.dead == nil {
				p.fast, fc = fc, nil
				p.fastSets = resp.GetFastSets()
			}
			p.mu.Unlock()
			if fc != nil { // stopped meanwhile
				fc.Close()
			}
		}
	}
	if len(resp.GetModels()) == 0 {
		return fmt.Errorf("plugin %s: Describe: %w: no models", p.path, ErrBadOutput)
	}
	keys := make(map[string]bool)
	for _, pm := range resp.GetModels() {
		info, err := wire.InfoFromProto(pm)
		if err != nil {
			return fmt.Errorf("plugin %s: Describe: %w: %v", p.path, ErrBadOutput, err)
		}
		if keys[info.Key] {
			return fmt.Errorf("plugin %s: Describe: %w: model %q described twice", p.path, ErrBadOutput, info.Key)
		}
		keys[info.Key] = true
		info.Origin, info.Version = p.path, p.version
		p.models = append(p.models, &model{p: p, info: info, matcher: pm.GetMatcher()})
	}
	return nil
}

// otherVersion matches go-plugin's error for a plugin that answered the
// handshake with another application protocol version.
var otherVersion = regexp.MustCompile(`incompatible API version with plugin\. Plugin version: (\d+)`)

// oneLine joins the lines of a multi-line message with "; " (go-plugin's
// start errors are several sentences on separate lines), dropping empty
// lines and a line's trailing colon, and collapses runs of white space.
func oneLine(msg string) string {
	var parts []string
	for _, l := range strings.Split(msg, "\n") {
		l = strings.TrimSuffix(strings.Join(strings.Fields(l), " "), ":")
		if l != "" {
			parts = append(parts, l)
		}
	}
	return strings.Join(parts, "; ")
}

// Path returns the absolute path of the executable.
func (p *Plugin) Path() string { return p.path }

// Version returns the version the plugin reported.
func (p *Plugin) Version() string { return p.version }

// Models returns the models the plugin serves, in the order it described
// them. Their Info().Origin is Path and Info().Version is Version.
func (p *Plugin) Models() []core.Model { return append([]core.Model(nil), p.models...) }

// Direct reports whether evaluations use the plugin's direct evaluation
// channel rather than gRPC's Evaluate.
func (p *Plugin) Direct() bool { return p.fast != nil }

// Pid returns the process id of the plugin, 0 if it did not start.
func (p *Plugin) Pid() int {
	if proc := p.process(); proc != nil {
		return proc.getPid()
	}
	return 0
}

// process returns the process, nil before go-plugin started it.
func (p *Plugin) process() *process {
	p.mu.Lock()
	defer p.mu.Unlock()
	return p.proc
}

// Close stops the plugin and waits until its process is gone. Calls in
// flight fail with ErrClosed. Close may be called more than once and
// concurrently; it always returns nil.
func (p *Plugin) Close() error {
	p.kill(fmt.Errorf("plugin %s: %w: closed", p.path, ErrClosed))
	return nil
}

// kill stops the plugin for the given reason: the process is killed at
// once (a plugin is a stateless evaluator, there is nothing to flush) and
// go-plugin's client is cleaned up. Later calls fail with reason.
func (p *Plugin) kill(reason error) {
	p.mu.Lock()
	if p.dead == nil {
		p.dead = reason
	}
	proc, fast := p.proc, p.fast
	p.mu.Unlock()
	p.killMu.Lock()
	defer p.killMu.Unlock()
	p.cancel()
	if fast != nil {
		fast.Close()
	}
	if proc != nil {
		_ = proc.Kill(context.Background())
	}
	// go-plugin's cleanup waits for the process and its pipes, which the
	// process bounds (pipeGrace); the deadline bounds the rest.
	done := make(chan struct{})
	go func() {
		defer close(done)
		p.client.Kill()
	}()
	t := time.NewTimer(closeDeadline)
	defer t.Stop()
	select {
	case <-done:
	case <-t.C:
	}
	_ = os.RemoveAll(p.dir)
}

// closeDeadline bounds the cleanup after a plugin's process is killed.
const closeDeadline = 2 * time.Second

// socketDirPrefix names the private socket directories of this process's
// plugins: "pairwell-sockets-PID-".
func socketDirPrefix() string { return fmt.Sprintf("pairwell-sockets-%d-", os.Getpid()) }

// sweepSocketDirs removes the socket directories left in the temporary
// directory by pairwell processes that no longer run (killed with
// SIGKILL, which nothing can clean up after).
func sweepSocketDirs() {
	tmp := os.TempDir()
	matches, _ := filepath.Glob(filepath.Join(tmp, "pairwell-sockets-*-*"))
	for _, m := range matches {
		rest := strings.TrimPrefix(filepath.Base(m), "pairwell-sockets-")
		pidText, _, ok := strings.Cut(rest, "-")
		pid, err := strconv.Atoi(pidText)
		if !ok || err != nil || pid <= 0 || pid == os.Getpid() {
			continue
		}
		if st, err := os.Lstat(m); err != nil || !st.IsDir() || !ownedByMe(st) {
			continue
		}
		if err := syscall.Kill(pid, 0); errors.Is(err, syscall.ESRCH) {
			_ = os.RemoveAll(m)
		}
	}
}

// ownedByMe reports whether the file belongs to this process's user.
func ownedByMe(st os.FileInfo) bool {
	s, ok := st.Sys().(*syscall.Stat_t)
	return ok && int(s.Uid) == os.Geteuid()
}

// deadErr returns why the plugin stopped, nil while it runs.
func (p *Plugin) deadErr() error {
	p.mu.Lock()
	defer p.mu.Unlock()
	return p.dead
}

// call runs one RPC under the per-call deadline and turns transport
// failures into errors naming the plugin and the call: a deadline stops
// the plugin (ErrTimeout), a process that ended is reported with how it
// ended and its last output (ErrCrashed).
func (p *Plugin) call(what string, rpc func(ctx context.Context) error) error {
	if err := p.deadErr(); err != nil {
		return fmt.Errorf("%s: %w", what, err)
	}
	ctx, cancel := context.WithTimeout(p.ctx, p.timeout)
	defer cancel()
	err := rpc(ctx)
	if err == nil {
		return nil
	}
	timedOut := errors.Is(ctx.Err(), context.DeadlineExceeded) || status.Code(err) == codes.DeadlineExceeded
	return p.failed(what, err, timedOut)
}

// failed turns the transport error of a call into an error naming the
// plugin and the call: a deadline stops the plugin (ErrTimeout), a process
// that ended is reported with how it ended and its last output
// (ErrCrashed).
func (p *Plugin) failed(what string, err error, timedOut bool) error {
	if dead := p.deadErr(); dead != nil {
		return fmt.Errorf("%s: %w", what, dead)
	}
	if timedOut {
		e := fmt.Errorf("plugin %s: %s: %w: no answer within %v; the plugin was stopped", p.path, what, ErrTimeout, p.timeout)
		p.kill(e)
		return e
	}
	if proc := p.process(); proc != nil {
		if state, ok := proc.waitExit(250 * time.Millisecond); ok {
			e := fmt.Errorf("plugin %s: %w during %s (%s)%s", p.path, ErrCrashed, what, state, p.stderr.quote())
			p.kill(e)
			return e
		}
	}
	if status.Code(err) == codes.ResourceExhausted {
		return fmt.Errorf("plugin %s: %s: %w: %v", p.path, what, ErrBadOutput, status.Convert(err).Message())
	}
	if errors.Is(err, wire.ErrFastProtocol) {
		return fmt.Errorf("plugin %s: %s: %w: %v", p.path, what, ErrBadOutput, err)
	}
	return fmt.Errorf("plugin %s: %s: %w", p.path, what, err)
}
