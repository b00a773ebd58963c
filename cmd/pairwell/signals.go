package main

import (
	"os"
	"os/signal"
	"sync"
	"syscall"
	"time"
)

// shutdownDeadline bounds the cleanup after SIGINT, SIGTERM or SIGHUP
// (stopping the plugins, removing temporary files): past it, or at a
// second signal, pairwell dies at once.
const shutdownDeadline = 3 * time.Second

// signals are the signals after which pairwell cleans up and dies.
var signals = []os.Signal{os.Interrupt, syscall.SIGTERM, syscall.SIGHUP}

// interrupts are the clean-up steps of a run that a signal must not skip.
type interrupts struct {
	mu    sync.Mutex
	hooks []func()
}

// onSignal adds f to what runs when a signal ends the run.
func (e *env) onSignal(f func()) {
	e.interrupts.mu.Lock()
	defer e.interrupts.mu.Unlock()
	e.interrupts.hooks = append(e.interrupts.hooks, f)
}

// handleSignals makes SIGINT, SIGTERM and SIGHUP end the run cleanly: the
// hooks run (in reverse order, e.g. stopping the plugins), named temporary
// files are removed, and pairwell dies of the signal as it would without
// them. A second signal, or shutdownDeadline, cuts the hooks short. The
// returned function stops the handling; call it when the run ends.
func (e *env) handleSignals() (stop func()) {
	sigs := make(chan os.Signal, 2)
	signal.Notify(sigs, signals...)
	stopWatch := e.watchSignals(sigs, shutdownDeadline, die)
	return func() {
		signal.Stop(sigs)
		stopWatch()
	}
}

// watchSignals does the work of handleSignals for the signals arriving on
// sigs, ending with end(first signal).
func (e *env) watchSignals(sigs <-chan os.Signal, deadline time.Duration, end func(os.Signal)) (stop func()) {
	done := make(chan struct{})
	finished := make(chan struct{})
	go func() {
		defer close(finished)
		var s os.Signal
		select {
		case s = <-sigs:
		case <-done:
			return
		}
		cleaned := make(chan struct{})
		go func() {
			defer close(cleaned)
			e.interrupts.mu.Lock()
			hooks := append([]func(){}, e.interrupts.hooks...)
			e.interrupts.mu.Unlock()
			for i := len(hooks) - 1; i >= 0; i-- {
				hooks[i]()
			}
		}()
		t := time.NewTimer(deadline)
		defer t.Stop()
		select {
		case <-cleaned:
		case <-sigs: // a second signal: no more waiting
		case <-t.C:
		}
		e.files.RemoveTemps()
		end(s)
	}()
	return func() {
		close(done)
		<-finished
	}
}

// die ends the process by signal s, with the default disposition, and
// failing that with exit status 128 + the signal number.
func die(s os.Signal) {
	signal.Reset(signals...)
	if sig, ok := s.(syscall.Signal); ok {
		_ = syscall.Kill(os.Getpid(), sig)
		time.Sleep(100 * time.Millisecond)
		os.Exit(128 + int(sig))
	}
	os.Exit(exitFailure)
}
