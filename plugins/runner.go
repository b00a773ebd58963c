package plugins

import (
	"context"
	"errors"
	"fmt"
	"io"
	"os"
	"os/exec"
	"strconv"
	"strings"
	"sync"
	"time"

	"github.com/hashicorp/go-plugin/runner"
)

// process runs a plugin executable for go-plugin and lets the host kill it
// at once and learn how it ended. It implements runner.Runner.
//
// The plugin runs in its own process group and, on Linux, dies with
// pairwell (PR_SET_PDEATHSIG). Killing it kills its whole process tree,
// also children that left the group (setsid), and pairwell never waits on
// its pipes longer than pipeGrace after it ended: a child that inherited
// the pipes and keeps them open cannot hold pairwell.
type process struct {
	cmd    *exec.Cmd
	path   string
	stdout *os.File // read ends of the plugin's standard output and error
	stderr *os.File
	outW   *os.File // their write ends, closed once the process started
	errW   *os.File
	exe    *os.File // the sealed copy executed, if pinned (see pinnedCopy)

	mu     sync.Mutex
	pid    int  // set by Start
	killed bool // Kill was called: Start must not start

	exited chan struct{} // closed when the process has ended
	// stderrDone is closed when its standard error has been read to the
	// end (or closed).
	stderrDone chan struct{}
	stderrOnce sync.Once
	state      string // how the process ended, set before exited closes
	waitErr    error
}

var _ runner.Runner = (*process)(nil)

// pipeGrace is how long the plugin's pipes are read after its process
// ended (for its last words on stderr) before they are closed, whoever
// else holds them.
const pipeGrace = 200 * time.Millisecond

// newProcess prepares path with the environment go-plugin built in cmd
// (the handshake cookie and protocol versions). The plugin's standard
// input is /dev/null: it has no business with pairwell's. If exe is not
// nil it is the file executed (a sealed copy of path, see pinnedCopy);
// the plugin still sees path as its argv[0].
func newProcess(path string, exe *os.File, cmd *exec.Cmd) (*process, error) {
	c := exec.Command(path)
	c.Env = cmd.Env
	c.SysProcAttr = sysProcAttr()
	if exe != nil {
		c.Path = execPath(exe, c)
	}
	p := &process{cmd: c, path: path, exe: exe, exited: make(chan struct{}), stderrDone: make(chan struct{})}
	var err error
	if p.stdout, p.outW, err = os.Pipe(); err != nil {
		return nil, err
	}
	if p.stderr, p.errW, err = os.Pipe(); err != nil {
		p.stdout.Close()
		p.outW.Close()
		return nil, err
	}
	c.Stdout, c.Stderr = p.outW, p.errW
	return p, nil
}

func (p *process) Start(context.Context) error {
	p.mu.Lock()
	defer p.mu.Unlock()
	if p.killed {
		p.closePipes()
		return errors.New("stopped before it started")
	}
	err := p.cmd.Start()
	p.outW.Close()
	p.errW.Close()
	if err != nil {
		p.closePipes()
		return err
	}
	p.pid = p.cmd.Process.Pid
	go p.reap()
	return nil
}

// reap waits for the process to end, records how, and closes the pipes
// pipeGrace later.
func (p *process) reap() {
	err := p.cmd.Wait()
	st := "exited"
	if ps := p.cmd.ProcessState; ps != nil {
		st = ps.String()
	} else if err != nil {
		st = err.Error()
	}
	p.state, p.waitErr = st, err
	close(p.exited)
	time.Sleep(pipeGrace)
	p.closePipes()
}

func (p *process) closePipes() {
	p.stdout.Close()
	p.stderr.Close()
	if p.exe != nil {
		p.exe.Close()
	}
}

// Wait waits for the process to end and returns how it did. go-plugin
// calls it once, from its own goroutine, after the pipes are closed.
func (p *process) Wait(context.Context) error {
	<-p.exited
	return p.waitErr
}

// Kill kills the plugin's process tree with SIGKILL (on Windows,
// TerminateProcess on the process). It may be called any number of times,
// also after the process ended.
func (p *process) Kill(context.Context) error {
	p.mu.Lock()
	defer p.mu.Unlock()
	p.killed = true
	if p.pid == 0 {
		return nil
	}
	select {
	case <-p.exited:
		// Its process group may live on.
		killGroup(p.pid)
		return nil
	default:
	}
	killTree(p.pid)
	if err := p.cmd.Process.Kill(); err != nil && !errors.Is(err, os.ErrProcessDone) {
		return err
	}
	return nil
}

// waitExit reports how the process ended if it does so within d; its
// standard error has then been read to the end, or for pipeGrace.
func (p *process) waitExit(d time.Duration) (string, bool) {
	t := time.NewTimer(d)
	defer t.Stop()
	select {
	case <-p.exited:
	case <-t.C:
		return "", false
	}
	g := time.NewTimer(pipeGrace + 50*time.Millisecond)
	defer g.Stop()
	select {
	case <-p.stderrDone:
	case <-g.C:
	}
	return p.state, true
}

func (p *process) Diagnose(context.Context) string {
	return fmt.Sprintf("%s is not a working pairwell plugin: it must be built for this system and serve the pairwell protocol (plugins/sdk does)", p.path)
}

func (p *process) Stdout() io.ReadCloser { return p.stdout }
func (p *process) Stderr() io.ReadCloser { return &eofReader{p.stderr, p.stderrDone, &p.stderrOnce} }

// eofReader closes done when reading ends (EOF, or the pipe was closed):
// the plugin's last words on stderr have been read.
type eofReader struct {
	*os.File
	done chan struct{}
	once *sync.Once
}

func (r *eofReader) Read(b []byte) (int, error) {
	n, err := r.File.Read(b)
	if err != nil {
		r.once.Do(func() { close(r.done) })
	}
	return n, err
}
func (p *process) Name() string { return p.path }

func (p *process) ID() string {
	pid := p.getPid()
	if pid == 0 {
		return ""
	}
	return strconv.Itoa(pid)
}

// getPid returns the process id, 0 before Start.
func (p *process) getPid() int {
	p.mu.Lock()
	defer p.mu.Unlock()
	return p.pid
}

func (p *process) PluginToHost(network, addr string) (string, string, error) {
	return network, addr, nil
}

func (p *process) HostToPlugin(network, addr string) (string, string, error) {
	return network, addr, nil
}

// tail keeps the last bytes written to it: the end of a plugin's standard
// error, quoted in error messages. It is safe for concurrent use.
type tail struct {
	mu  sync.Mutex
	buf []byte
	fwd io.Writer // also receives everything, if not nil
}

const tailSize = 4096

func (t *tail) Write(b []byte) (int, error) {
	t.mu.Lock()
	defer t.mu.Unlock()
	t.buf = append(t.buf, b...)
	if len(t.buf) > tailSize {
		t.buf = append(t.buf[:0], t.buf[len(t.buf)-tailSize:]...)
	}
	if t.fwd != nil {
		_, _ = t.fwd.Write(b)
	}
	return len(b), nil
}

// quote returns the last few hundred characters written, on one line,
// prefixed for an error message, or "" if nothing was written.
func (t *tail) quote() string {
	t.mu.Lock()
	s := strings.Join(strings.Fields(string(t.buf)), " ")
	t.mu.Unlock()
	if s == "" {
		return ""
	}
	const max = 400
	if r := []rune(s); len(r) > max {
		s = "…" + string(r[len(r)-max:])
	}
	return fmt.Sprintf("; its last output: %q", s)
}
