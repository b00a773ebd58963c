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
type process struct {
	cmd    *exec.Cmd
	path   string
	stdout io.ReadCloser
	stderr io.ReadCloser

	mu     sync.Mutex
	pid    int  // set by Start
	killed bool // Kill was called: Start must not start

	exited chan struct{} // closed when Wait has returned
	state  string        // how the process ended, set before exited closes
}

var _ runner.Runner = (*process)(nil)

// newProcess prepares path with the environment go-plugin built in cmd
// (the handshake cookie and protocol versions). The plugin's standard
// input is /dev/null: it has no business with pairwell's.
func newProcess(path string, cmd *exec.Cmd) (*process, error) {
	c := exec.Command(path)
	c.Env = cmd.Env
	stdout, err := c.StdoutPipe()
	if err != nil {
		return nil, err
	}
	stderr, err := c.StderrPipe()
	if err != nil {
		return nil, err
	}
	return &process{cmd: c, path: path, stdout: stdout, stderr: stderr, exited: make(chan struct{})}, nil
}

func (p *process) Start(context.Context) error {
	p.mu.Lock()
	defer p.mu.Unlock()
	if p.killed {
		return errors.New("stopped before it started")
	}
	if err := p.cmd.Start(); err != nil {
		return err
	}
	p.pid = p.cmd.Process.Pid
	return nil
}

// Wait waits for the process to end and records how it did. go-plugin
// calls it once, from its own goroutine.
func (p *process) Wait(context.Context) error {
	err := p.cmd.Wait()
	st := "exited"
	if ps := p.cmd.ProcessState; ps != nil {
		st = ps.String()
	} else if err != nil {
		st = err.Error()
	}
	p.state = st
	close(p.exited)
	return err
}

// Kill sends SIGKILL (on Windows, TerminateProcess). It may be called any
// number of times, also after the process ended.
func (p *process) Kill(context.Context) error {
	p.mu.Lock()
	defer p.mu.Unlock()
	p.killed = true
	if p.pid == 0 {
		return nil
	}
	if err := p.cmd.Process.Kill(); err != nil && !errors.Is(err, os.ErrProcessDone) {
		return err
	}
	return nil
}

// waitExit reports how the process ended if it does so within d.
func (p *process) waitExit(d time.Duration) (string, bool) {
	t := time.NewTimer(d)
	defer t.Stop()
	select {
	case <-p.exited:
		return p.state, true
	case <-t.C:
		return "", false
	}
}

func (p *process) Diagnose(context.Context) string {
	return fmt.Sprintf("%s is not a working pairwell plugin: it must be built for this system and serve the pairwell protocol (plugins/sdk does)", p.path)
}

func (p *process) Stdout() io.ReadCloser { return p.stdout }
func (p *process) Stderr() io.ReadCloser { return p.stderr }
func (p *process) Name() string          { return p.path }

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
