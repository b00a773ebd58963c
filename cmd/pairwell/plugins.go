package main

import (
	"bytes"
	"context"
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
	"sync"
	"time"

	"github.com/spf13/cobra"
	"github.com/spf13/pflag"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/plugins"
)

// Environment variables naming plugins.
const (
	// envPluginPath lists directories, separated like PATH, whose
	// executables named pairwell-plugin-* are loaded.
	envPluginPath = "PAIRWELL_PLUGIN_PATH"
	// envPluginLock names a lock file ("HEX  PATH" lines, as sha256sum
	// prints) pinning plugins to their SHA-256. When it is set, every
	// plugin found through envPluginPath must be listed in it.
	envPluginLock = "PAIRWELL_PLUGIN_LOCK"
)

// pluginFlags are the persistent flags that name plugins.
type pluginFlags struct {
	refs    []string
	timeout time.Duration
}

func (f *pluginFlags) register(fs *pflag.FlagSet) {
	fs.StringArrayVar(&f.refs, "plugin", nil,
		"load the plugin executable at `PATH[@sha256:HEX]` (repeatable); @sha256:HEX refuses any binary with another SHA-256")
	fs.DurationVar(&f.timeout, "plugin-timeout", plugins.DefaultTimeout,
		"deadline of a plugin's start and of each call to it; a plugin past it is stopped")
}

// pluginSet is the plugins of one invocation: it closes each exactly
// once, also those whose start completes after it was closed.
type pluginSet struct {
	mu     sync.Mutex
	closed bool
	loaded []*plugins.Plugin
	once   sync.Once
}

func (s *pluginSet) add(p *plugins.Plugin) {
	s.mu.Lock()
	closed := s.closed
	if !closed {
		s.loaded = append(s.loaded, p)
	}
	s.mu.Unlock()
	if closed {
		p.Close()
	}
}

// close stops every plugin and waits until their processes are gone; a
// concurrent call waits as long.
func (s *pluginSet) close() { s.once.Do(s.closeAll) }

func (s *pluginSet) closeAll() {
	s.mu.Lock()
	s.closed = true
	loaded := s.loaded
	s.loaded = nil
	s.mu.Unlock()
	var wg sync.WaitGroup
	for _, p := range loaded {
		wg.Add(1)
		go func() {
			defer wg.Done()
			p.Close()
		}()
	}
	wg.Wait()
}

// load starts the plugins named by --plugin and PAIRWELL_PLUGIN_PATH, in
// parallel, and registers their models: those of --plugin first, in flag
// order, then those found in the path, directory by directory and by name.
// Every plugin is stopped when the invocation ends (env.close), and on
// SIGINT, SIGTERM or SIGHUP (see signals.go), after which pairwell dies of
// that signal as it would without plugins.
func (f *pluginFlags) load(e *env) error {
	if f.timeout <= 0 {
		return usageErr(fmt.Errorf("--plugin-timeout %v: must be positive", f.timeout))
	}
	refs, fromPath, err := f.resolve(e)
	if err != nil {
		return err
	}
	if len(refs) == 0 {
		return nil
	}

	set := &pluginSet{}
	var loading sync.WaitGroup // the Loads in flight
	ctx, cancel := context.WithCancel(context.Background())
	// Stop every plugin when the run ends, and on a signal (signals.go,
	// which bounds the wait): abandon the starts in flight and wait for
	// them (each kills its process before it returns), then stop the
	// running plugins.
	stop := func() {
		cancel()
		loading.Wait()
		set.close()
	}
	e.onSignal(stop)
	e.closers = append(e.closers, stop)

	loaded := make([]*plugins.Plugin, len(refs))
	errs := make([]error, len(refs))
	for i, r := range refs {
		e.files.Input(r.Path)
		loading.Add(1)
		go func() {
			defer loading.Done()
			p, err := plugins.Load(ctx, r.Path, plugins.Options{Timeout: f.timeout, SHA256: r.SHA256})
			if err != nil {
				errs[i] = err
				return
			}
			loaded[i] = p
			set.add(p)
		}()
	}
	loading.Wait()
	for i, err := range errs {
		// A plugin named by --plugin, or one that is not the pinned
		// binary, stops the invocation.
		if err != nil && (!fromPath[i] || errors.Is(err, plugins.ErrChecksum)) {
			return pluginErr(err)
		}
	}
	for i, err := range errs {
		if err != nil {
			// A plugin found through the path variable that fails is a
			// warning: its forms are missing, the rest works.
			fail := fmt.Errorf("plugin %s (found through %s) failed to start: %w", refs[i].Path, envPluginPath, err)
			e.failedPlugins = append(e.failedPlugins, fail)
			fmt.Fprintf(e.stderr, "pairwell: warning: %s; its forms are not available\n", oneLine(fail.Error()))
		}
	}
	for _, p := range loaded {
		if p == nil {
			continue
		}
		for _, m := range p.Models() {
			if err := e.addModel(m, "plugin "+p.Path()); err != nil {
				return usageErr(err)
			}
		}
	}
	return nil
}

// resolve lists the plugins to load, each once (by absolute path), with
// their pins (from --plugin or the lock file; two different pins for one
// path are an error). fromPath[i]
// tells that refs[i] was found only through envPluginPath.
func (f *pluginFlags) resolve(e *env) (refs []plugins.Ref, fromPath []bool, err error) {
	var lock plugins.Lock
	if name := os.Getenv(envPluginLock); name != "" {
		data, err := e.readInput(envPluginLock, name, plugins.MaxLockSize)
		if err != nil {
			return nil, nil, err
		}
		abs, err := filepath.Abs(name)
		if err != nil {
			return nil, nil, usageErr(fmt.Errorf("%s: %w", envPluginLock, err))
		}
		l, err := plugins.ParseLock(bytes.NewReader(data), filepath.Dir(abs))
		if err != nil {
			return nil, nil, usageErr(fmt.Errorf("%s: plugin lock file %s: %w", envPluginLock, name, err))
		}
		lock = l
	}
	seen := make(map[string]int)
	add := func(r plugins.Ref, isPath bool) error {
		abs, err := filepath.Abs(r.Path)
		if err != nil {
			return usageErr(fmt.Errorf("plugin %s: %w", r.Path, err))
		}
		r.Path = abs
		if lock != nil {
			if sum, ok := lock.Lookup(abs); ok && r.SHA256 == nil {
				r.SHA256 = sum
			} else if ok && !bytes.Equal(sum, r.SHA256) {
				return usageErr(fmt.Errorf("plugin %s: %w: pinned to sha256:%x, the lock file %s pins sha256:%x; give one pin",
					abs, plugins.ErrRef, r.SHA256, os.Getenv(envPluginLock), sum))
			} else if !ok && r.SHA256 == nil && isPath {
				return usageErr(fmt.Errorf("plugin %s (found through %s) is not listed in the lock file %s; add its \"sha256sum\" line to load it",
					abs, envPluginPath, os.Getenv(envPluginLock)))
			}
		}
		if i, ok := seen[abs]; ok {
			switch {
			case refs[i].SHA256 == nil:
				refs[i].SHA256 = r.SHA256
			case r.SHA256 != nil && !bytes.Equal(refs[i].SHA256, r.SHA256):
				return usageErr(fmt.Errorf("plugin %s: %w: pinned twice, to sha256:%x and sha256:%x; give one pin",
					abs, plugins.ErrRef, refs[i].SHA256, r.SHA256))
			}
			return nil
		}
		seen[abs] = len(refs)
		refs = append(refs, r)
		fromPath = append(fromPath, isPath)
		return nil
	}
	for _, s := range f.refs {
		r, err := plugins.ParseRef(s)
		if err != nil {
			return nil, nil, usageErr(fmt.Errorf("--plugin: %w", err))
		}
		if err := add(r, false); err != nil {
			return nil, nil, err
		}
		// A plugin named explicitly is the user's choice; say so if others
		// could have replaced it.
		if err := plugins.Untrusted(r.Path); err != nil {
			fmt.Fprintf(e.stderr, "pairwell: warning: %s\n", oneLine(err.Error()))
		}
	}
	found, err := plugins.Discover(os.Getenv(envPluginPath))
	if err != nil {
		return nil, nil, usageErr(fmt.Errorf("%s: %w", envPluginPath, err))
	}
	for _, path := range found {
		if err := add(plugins.Ref{Path: path}, true); err != nil {
			return nil, nil, err
		}
	}
	return refs, fromPath, nil
}

// withPluginFailures adds to an unknown-form error the plugins found
// through the path variable that failed to start (any of them may serve the
// form): the error is then a plugin failure (exit 1), not bad input.
func withPluginFailures(err error, failed []error) error {
	if len(failed) == 0 || !errors.Is(err, core.ErrUnknownModel) {
		return err
	}
	return failErr(fmt.Errorf("%w; it may be served by a plugin that failed to start: %w", err, errors.Join(failed...)))
}

// pluginErr classifies an error of starting a plugin: a file that is not
// there, not executable or not the pinned one is bad input (exit 2), a
// plugin that fails is a failure (exit 1).
func pluginErr(err error) error {
	for _, target := range []error{plugins.ErrChecksum, plugins.ErrNotExecutable, plugins.ErrRef, plugins.ErrUntrusted, fs.ErrNotExist, fs.ErrPermission} {
		if errors.Is(err, target) {
			return usageErr(err)
		}
	}
	return failErr(err)
}

// pluginsHelp is appended to the root command's help.
const pluginsHelp = `
Plugins: forms that are not built in are served by plugin executables, named
with --plugin PATH (repeatable; PATH@sha256:HEX pins the binary) or found in
the directories of PAIRWELL_PLUGIN_PATH (colon-separated; every executable
named pairwell-plugin-*; PAIRWELL_PLUGIN_LOCK names a sha256sum-style lock
file they must be listed in). "pairwell models" shows their path and version.`

// registerPlugins adds the plugin flags to root and returns the hook that
// loads the plugins, to be called from root's PersistentPreRunE.
func registerPlugins(root *cobra.Command, e *env) func() error {
	f := &pluginFlags{}
	f.register(root.PersistentFlags())
	root.Long += "\n" + pluginsHelp
	return func() error { return f.load(e) }
}
