// Command testplugin is the pairwell plugin of the tests. It serves an
// independent implementation of the Morse form, "plugin-morse", and models
// that misbehave on purpose, one fault each:
//
//	crashing-morse   the process exits with status 3 in an evaluation
//	hanging-morse    an evaluation never returns
//	nan-morse        c_n = V⁽ⁿ⁾/n! is NaN for n ≥ 2
//	badlen-morse     evaluations return one value too few
//	panicking-morse  an evaluation panics
//	morse-bad3       V‴ is 10 % too large (its identities are Morse's)
//	morse-badforce   V′ has the wrong sign (its identities are Morse's)
//	crashlater-morse works for the first $PAIRWELL_TEST_CRASH_AFTER
//	                 evaluation calls (default 1000), then the process
//	                 exits with status 3: a crash in the middle of a run
//
// and the built-in Buckingham form as "plugin-buckingham", whose inner
// barrier (core.Domain.BarrierEnergy) travels through the protocol.
//
// Started under a name containing "oldproto" (a symbolic link), it answers
// the handshake with protocol version 1, the one before Taylor
// evaluation, which pairwell refuses; under a name containing "grpconly"
// it serves no direct evaluation channel. Under a name containing
// "holdpipes" it first starts a child that inherits its standard output
// and error and sleeps; under "setsid" that child also leaves the process
// group and session (setsid). One executable keeps the tests' build short.
package main

import (
	"fmt"
	"os"
	"os/exec"
	"os/signal"
	"path/filepath"
	"strconv"
	"strings"
	"sync/atomic"
	"syscall"
	"time"

	plugin "github.com/hashicorp/go-plugin"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/models"
	"github.com/pairwell/pairwell/plugins/internal/wire"
	"github.com/pairwell/pairwell/plugins/testdata/morse"
)

// renamed serves a model under another key. Like every wrapper of a
// model, it forwards Match (core.Match reports core.ErrUnsupported when
// the inner model has none).
type renamed struct {
	core.Model
	key string
}

func (m renamed) Info() core.ModelInfo {
	info := m.Model.Info()
	info.Key, info.Aliases = m.key, nil
	return info
}

func (m renamed) Match(t core.Target) ([]float64, []string, error) {
	return core.Match(m.Model, t)
}

// crashLater is a model whose potentials the evaluation filter counts.
type crashLater struct{ core.Model }

type crashLaterPotential struct{ core.Potential }

// ParamGradient forwards the inner potential's parameter derivatives, as
// every wrapper of a potential does.
func (p crashLaterPotential) ParamGradient(r, dst []float64) error {
	return core.ParamDerivatives(p.Potential, r, dst)
}

func (m crashLater) New(params []float64) (core.Potential, error) {
	p, err := m.Model.New(params)
	if err != nil {
		return nil, err
	}
	return crashLaterPotential{p}, nil
}

func main() {
	if os.Getenv("TESTPLUGIN_CHILD") != "" {
		signal.Ignore(syscall.SIGINT, syscall.SIGTERM, syscall.SIGHUP)
		for {
			time.Sleep(time.Hour)
		}
	}
	name := filepath.Base(os.Args[0])
	if strings.Contains(name, "holdpipes") || strings.Contains(name, "setsid") {
		c := exec.Command(os.Args[0])
		c.Env = append(os.Environ(), "TESTPLUGIN_CHILD=1")
		c.Stdout, c.Stderr = os.Stdout, os.Stderr
		c.SysProcAttr = &syscall.SysProcAttr{Setsid: strings.Contains(name, "setsid")}
		if err := c.Start(); err != nil {
			fmt.Fprintln(os.Stderr, err)
			os.Exit(1)
		}
	}
	srv, err := wire.NewServer("0.1.0-test", []core.Model{
		morse.Model{Key: "plugin-morse"},
		morse.Model{Key: "crashing-morse", Fault: morse.Crash},
		morse.Model{Key: "hanging-morse", Fault: morse.Hang},
		morse.Model{Key: "nan-morse", Fault: morse.NaN},
		morse.Model{Key: "badlen-morse", Fault: morse.BadLength},
		morse.Model{Key: "panicking-morse", Fault: morse.Panic},
		morse.Model{Key: "morse-bad3", Fault: morse.Third},
		morse.Model{Key: "morse-badforce", Fault: morse.ForceSign},
		renamed{models.Buckingham{}, "plugin-buckingham"},
		crashLater{morse.Model{Key: "crashlater-morse"}},
	})
	if err != nil {
		fmt.Fprintln(os.Stderr, err)
		os.Exit(1)
	}
	// Under a name containing "nosets" it answers as a plugin built before
	// EvaluateSets (UNIMPLEMENTED), so that the tests cover the fallback.
	srv.OldProtocol = strings.Contains(filepath.Base(os.Args[0]), "nosets")
	// badlen-morse: one value too few, on either transport.
	crashAfter := int64(1000)
	if n, err := strconv.ParseInt(os.Getenv("PAIRWELL_TEST_CRASH_AFTER"), 10, 64); err == nil {
		crashAfter = n
	}
	var calls atomic.Int64
	srv.Filter = func(handle uint64, values []float64) []float64 {
		if p, ok := srv.Potential(handle); ok {
			if _, later := p.(crashLaterPotential); later && calls.Add(1) > crashAfter {
				fmt.Fprintln(os.Stderr, "crash test plugin: exiting after", crashAfter, "calls")
				os.Exit(3)
			}
		}
		if p, ok := srv.Potential(handle); ok && len(values) > 0 {
			if mp, ok := p.(*morse.Potential); ok && mp.Fault() == morse.BadLength {
				return values[:len(values)-1]
			}
		}
		return values
	}
	if os.Getenv(wire.MagicCookieKey) != wire.MagicCookieValue {
		fmt.Fprint(os.Stderr, "testplugin: a pairwell test plugin; pairwell starts it\n")
		os.Exit(1)
	}
	go wire.ExitWithParent()
	// Under a name containing "grpconly" it serves no direct evaluation
	// channel, so that the tests cover both transports.
	if !strings.Contains(filepath.Base(os.Args[0]), "grpconly") {
		if err := srv.ListenFast(); err != nil {
			fmt.Fprintln(os.Stderr, err)
			os.Exit(1)
		}
	}
	version := uint(wire.ProtocolVersion)
	if strings.Contains(filepath.Base(os.Args[0]), "oldproto") {
		version = 1
	}
	plugin.Serve(wire.ServeConfig(version, srv, os.Stderr))
}
