package main

import (
	"io"
	"os"
	"sync"
	"time"

	"github.com/schollz/progressbar/v3"
	"golang.org/x/term"
)

// progress starts a progress bar of total steps on stderr, described by
// what (e.g. "periods"), and returns step, to be called once per finished
// step, and done, to be called once at the end (it clears the bar).
//
// The bar is drawn only when stderr is a terminal and the CI environment
// variable is empty; otherwise, and for total ≤ 0, step and done do
// nothing. It never writes to stdout, so JSON and CSV output stay clean.
// step is safe for concurrent use by worker goroutines. To drive it from a
// callback of the form func(done, total int), such as the progress argument
// of period.Sweep, wrap it: func(int, int) { step() }.
func (e *env) progress(total int, what string) (step func(), done func()) {
	return newProgress(e.term, os.Getenv, total, what)
}

// newProgress is env.progress with the writer and the environment lookup
// given, for tests.
func newProgress(w io.Writer, getenv func(string) string, total int, what string) (step func(), done func()) {
	if total <= 0 || !showProgress(w, getenv) {
		return func() {}, func() {}
	}
	bar := progressbar.NewOptions(total,
		progressbar.OptionSetWriter(w),
		progressbar.OptionSetDescription(what),
		progressbar.OptionShowCount(),
		progressbar.OptionSetWidth(30),
		progressbar.OptionThrottle(100*time.Millisecond),
		progressbar.OptionClearOnFinish(),
		progressbar.OptionSetPredictTime(true),
	)
	var once sync.Once
	return func() { _ = bar.Add(1) }, func() {
		once.Do(func() {
			_ = bar.Finish()
		})
	}
}

// showProgress reports whether a progress bar may be drawn on w: w must be
// a terminal and CI unset or empty (CI services set CI=true).
func showProgress(w io.Writer, getenv func(string) string) bool {
	if getenv("CI") != "" {
		return false
	}
	f, ok := w.(*os.File)
	if !ok {
		return false
	}
	return term.IsTerminal(int(f.Fd()))
}
