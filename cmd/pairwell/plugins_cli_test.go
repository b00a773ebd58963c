package main

import (
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"github.com/pairwell/pairwell/plugins/plugintest"
	"os"
	"os/exec"
	"path/filepath"
	"runtime"
	"strconv"
	"strings"
	"sync"
	"syscall"
	"testing"
	"time"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

const (
	rydbergSpec = "rydberg:De=4.6,a=2.5,re=1.27"          // invented, bond-sized
	mieSpec     = "mie:epsilon=0.0104,sigma=3.4,n=13,m=6" // invented, argon-sized
)

// pluginProcs returns the pids of running processes whose executable lies
// in the test binaries' directory, other than pairwell itself.
func pluginProcs(t *testing.T) []int {
	t.Helper()
	var pids []int
	for _, pid := range plugintest.Procs(pluginBin.dir) {
		if pid > 0 {
			if cl, err := os.ReadFile(filepath.Join("/proc", strconv.Itoa(pid), "cmdline")); err == nil {
				arg0, _, _ := strings.Cut(string(cl), "\x00")
				if filepath.Base(arg0) == "pairwell" {
					continue
				}
			}
		}
		pids = append(pids, pid)
	}
	return pids
}

// runPlugins runs pairwell in-process, then checks that it left no plugin
// process behind.
func runPlugins(t *testing.T, args ...string) (int, string, string) {
	t.Helper()
	requirePlugins(t)
	code, out, errOut := runCLI(t, args...)
	if runtime.GOOS == "linux" {
		assert.Empty(t, pluginProcs(t), "plugin processes left after pairwell %s", strings.Join(args, " "))
	}
	return code, out, errOut
}

func sha256Hex(t *testing.T, path string) string {
	t.Helper()
	b, err := os.ReadFile(path)
	require.NoError(t, err)
	sum := sha256.Sum256(b)
	return hex.EncodeToString(sum[:])
}

func TestPluginModelsListed(t *testing.T) {
	code, out, errOut := runPlugins(t, "--plugin", pluginBin.rydberg, "--plugin", pluginBin.mie, "models")
	require.Equal(t, 0, code, errOut)
	assert.Contains(t, out, "V = −De(1 + a(r − re))exp(−a(r − re))")
	assert.Contains(t, out, "plugin "+pluginBin.rydberg+" (version 1.0.0)")
	assert.Contains(t, out, "plugin "+pluginBin.mie+" (version 1.0.0)")
	assert.Contains(t, out, "R. Rydberg, Z. Phys. 73, 376 (1931)")

	code, out, errOut = runPlugins(t, "--plugin", pluginBin.rydberg, "models", "--format", "json")
	require.Equal(t, 0, code, errOut)
	var entries []struct {
		Key, Origin, Version string
	}
	require.NoError(t, json.Unmarshal([]byte(out), &entries))
	// The four built-ins, the forms library less its rydberg (the
	// plugin's, with the same parameters, replaces it without a warning),
	// then the plugin's form.
	require.Len(t, entries, 13)
	assert.Empty(t, errOut)
	assert.Equal(t, "built-in", entries[0].Origin)
	last := entries[len(entries)-1]
	assert.Equal(t, "rydberg", last.Key)
	assert.Equal(t, pluginBin.rydberg, last.Origin)
	assert.Equal(t, "1.0.0", last.Version)
	for _, e := range entries[:len(entries)-1] {
		assert.NotEqual(t, "rydberg", e.Key)
	}
}

func TestPluginPathVariable(t *testing.T) {
	requirePlugins(t)
	dir := t.TempDir()
	for _, name := range []string{"rydberg", "mie"} {
		require.NoError(t, os.Symlink(filepath.Join(pluginBin.dir, name), filepath.Join(dir, "pairwell-plugin-"+name)))
	}
	// Not plugins: wrong name, not executable.
	require.NoError(t, os.Symlink(pluginBin.test, filepath.Join(dir, "testplugin")))
	require.NoError(t, os.WriteFile(filepath.Join(dir, "pairwell-plugin-notes.txt"), []byte("x"), 0o644))
	t.Setenv(envPluginPath, filepath.Join(dir, "missing")+string(filepath.ListSeparator)+dir)

	code, out, errOut := runPlugins(t, "models")
	require.Equal(t, 0, code, errOut)
	assert.Contains(t, out, filepath.Join(dir, "pairwell-plugin-mie")+" (version 1.0.0)")
	assert.Contains(t, out, filepath.Join(dir, "pairwell-plugin-rydberg")+" (version 1.0.0)")
	assert.NotContains(t, out, "plugin-morse")

	code, out, errOut = runPlugins(t, "inspect", rydbergSpec, "--format", "json")
	require.Equal(t, 0, code, errOut)
	var r struct {
		Re float64 `json:"equilibrium_r_angstrom"`
		K  float64 `json:"force_constant_ev_per_angstrom2"`
	}
	require.NoError(t, json.Unmarshal([]byte(out), &r))
	assert.InDelta(t, 1.27, r.Re, 1e-12)
	assert.InDelta(t, 4.6*2.5*2.5, r.K, 1e-9, "k = De·a² (Rydberg 1931)")

	// The same plugin named twice, by --plugin and through the path: once.
	code, _, errOut = runPlugins(t, "--plugin", filepath.Join(dir, "pairwell-plugin-mie"), "models")
	assert.Equal(t, 0, code, errOut)
	// Under two names it serves the same key twice: refused.
	code, _, errOut = runPlugins(t, "--plugin", pluginBin.mie, "models")
	assert.Equal(t, exitUsage, code)
	assert.Contains(t, errOut, `name "mie" already used`)
}

// TestPluginFormsEverywhere runs both example forms through every command
// that takes a spec.
func TestPluginFormsEverywhere(t *testing.T) {
	p := []string{"--plugin", pluginBin.rydberg, "--plugin", pluginBin.mie}
	for _, args := range [][]string{
		{"inspect", rydbergSpec, "--pair", "H-Cl"},
		{"inspect", mieSpec, "--pair", "Ar-Ar", "--coefficients", "8"},
		{"compare", rydbergSpec, "morse:De=4.6,a=1.87,re=1.27", mieSpec, "lj:epsilon=120K,sigma=3.4", "--pair", "H-Cl"},
		{"motion", rydbergSpec, "--pair", "H-Cl", "--amplitude", "0.1", "--periods", "2"},
		{"period", mieSpec, "--pair", "Ar-Ar", "--amplitudes", "0.05,0.2"},
		{"validity", rydbergSpec, "--truncation", "4"},
		{"validity", mieSpec},
	} {
		code, out, errOut := runPlugins(t, append(p, args...)...)
		assert.Equal(t, 0, code, "%v: %s", args, errOut)
		assert.NotEmpty(t, out, "%v", args)
	}
}

func TestPluginChecksum(t *testing.T) {
	sum := sha256Hex(t, pluginBin.rydberg)
	code, _, errOut := runPlugins(t, "--plugin", pluginBin.rydberg+"@sha256:"+sum, "models")
	assert.Equal(t, 0, code, errOut)

	wrong := strings.Repeat("0", 64)
	code, out, errOut := runPlugins(t, "--plugin", pluginBin.rydberg+"@sha256:"+wrong, "models")
	assert.Equal(t, exitUsage, code)
	assert.Empty(t, out)
	assert.Contains(t, errOut, "checksum mismatch")
	assert.Contains(t, errOut, "its SHA-256 is "+sum)
	assert.Contains(t, errOut, "refusing to run it")

	code, _, errOut = runPlugins(t, "--plugin", pluginBin.rydberg+"@sha256:abc", "models")
	assert.Equal(t, exitUsage, code)
	assert.Contains(t, errOut, "not a SHA-256 digest")
}

func TestPluginLockFile(t *testing.T) {
	requirePlugins(t)
	dir := t.TempDir()
	link := filepath.Join(dir, "pairwell-plugin-rydberg")
	require.NoError(t, os.Symlink(pluginBin.rydberg, link))
	t.Setenv(envPluginPath, dir)
	lock := filepath.Join(dir, "plugins.lock")
	t.Setenv(envPluginLock, lock)

	// sha256sum format, path relative to the lock file.
	require.NoError(t, os.WriteFile(lock, []byte("# pins\n"+sha256Hex(t, pluginBin.rydberg)+"  pairwell-plugin-rydberg\n"), 0o644))
	code, out, errOut := runPlugins(t, "models")
	require.Equal(t, 0, code, errOut)
	assert.Contains(t, out, "rydberg")

	require.NoError(t, os.WriteFile(lock, []byte(strings.Repeat("ab", 32)+"  "+link+"\n"), 0o644))
	code, _, errOut = runPlugins(t, "models")
	assert.Equal(t, exitUsage, code)
	assert.Contains(t, errOut, "checksum mismatch")

	require.NoError(t, os.WriteFile(lock, []byte(""), 0o644))
	code, _, errOut = runPlugins(t, "models")
	assert.Equal(t, exitUsage, code)
	assert.Contains(t, errOut, "not listed in the lock file")

	t.Setenv(envPluginLock, filepath.Join(dir, "missing.lock"))
	code, _, _ = runPlugins(t, "models")
	assert.Equal(t, exitUsage, code)
}

func TestPluginFaults(t *testing.T) {
	tp := pluginBin.test
	for _, c := range []struct {
		name string
		args []string
		code int
		want []string
	}{
		{"crash", []string{"inspect", "crashing-morse:De=1,a=1,re=1"}, exitFailure,
			[]string{tp, "plugin crashed during Evaluate crashing-morse", "exit status 3"}},
		{"hang", []string{"--plugin-timeout", "300ms", "inspect", "hanging-morse:De=1,a=1,re=1"}, exitFailure,
			[]string{tp, "Evaluate hanging-morse", "no answer within 300ms; the plugin was stopped"}},
		{"nan", []string{"inspect", "nan-morse:De=1,a=1,re=1"}, exitFailure,
			[]string{tp, "invalid plugin output", "NaN"}},
		{"length", []string{"inspect", "badlen-morse:De=1,a=1,re=1"}, exitFailure,
			[]string{tp, "invalid plugin output"}},
		{"panic", []string{"inspect", "panicking-morse:De=1,a=1,re=1"}, exitFailure,
			[]string{tp, "plugin panicked in Evaluate"}},
		{"bad timeout", []string{"--plugin-timeout", "0s", "models"}, exitUsage,
			[]string{"--plugin-timeout"}},
	} {
		t.Run(c.name, func(t *testing.T) {
			start := time.Now()
			code, _, errOut := runPlugins(t, append([]string{"--plugin", tp}, c.args...)...)
			assert.Equal(t, c.code, code, errOut)
			for _, w := range c.want {
				assert.Contains(t, errOut, w)
			}
			assert.Less(t, time.Since(start), 5*time.Second)
		})
	}

	code, _, errOut := runPlugins(t, "--plugin", pluginBin.oldproto, "models")
	assert.Equal(t, exitFailure, code)
	assert.Contains(t, errOut, "plugin handshake failed: built for protocol 1, this pairwell speaks 2: rebuild it against this version")
	assert.Equal(t, 1, strings.Count(strings.TrimSpace(errOut), "\n")+1, "one line: %q", errOut)

	code, _, errOut = runPlugins(t, "--plugin", filepath.Join(pluginBin.dir, "missing"), "models")
	assert.Equal(t, exitUsage, code)
	assert.Contains(t, errOut, "no such file")
}

// TestPluginBadInput checks that input the plugin rejects is bad input
// (exit 2), as for a built-in form.
func TestPluginBadInput(t *testing.T) {
	p := []string{"--plugin", pluginBin.rydberg, "--plugin", pluginBin.mie}
	code, _, errOut := runPlugins(t, append(p, "inspect", "mie:epsilon=0.01,sigma=3.4,n=6,m=12")...)
	assert.Equal(t, exitUsage, code)
	assert.Contains(t, errOut, "must exceed m")
	code, _, errOut = runPlugins(t, append(p, "inspect", "rydberg:De=-1,a=2.5,re=1.27")...)
	assert.Equal(t, exitUsage, code)
	assert.Contains(t, errOut, "De")
	code, _, _ = runPlugins(t, append(p, "inspect", rydbergSpec, "--coefficients", "200")...)
	assert.Equal(t, exitUsage, code)
}

// TestPluginSIGINT interrupts pairwell while its plugins start, and while
// it is blocked in a call to a hanging plugin, and checks that no plugin
// process survives it.
func TestPluginSIGINT(t *testing.T) {
	if runtime.GOOS != "linux" {
		t.Skip("reads /proc")
	}
	requirePlugins(t)
	for _, c := range []struct {
		name  string
		procs int           // plugin processes to wait for
		pause time.Duration // then wait this long
	}{
		{"starting", 1, 0},
		{"in a call", 2, 200 * time.Millisecond},
	} {
		t.Run(c.name, func(t *testing.T) {
			cmd := exec.Command(pluginBin.pairwell, "--plugin", pluginBin.test, "--plugin", pluginBin.rydberg,
				"--plugin-timeout", "1m", "inspect", "hanging-morse:De=1,a=1,re=1")
			var stderr lockedBuffer
			cmd.Stderr = &stderr
			require.NoError(t, cmd.Start())
			done := make(chan error, 1)
			go func() { done <- cmd.Wait() }()

			deadline := time.Now().Add(10 * time.Second)
			for len(pluginProcs(t)) < c.procs && time.Now().Before(deadline) {
				time.Sleep(time.Millisecond)
			}
			require.GreaterOrEqual(t, len(pluginProcs(t)), c.procs, "plugins did not start; stderr: %s", stderr.String())
			time.Sleep(c.pause)

			require.NoError(t, cmd.Process.Signal(os.Interrupt))
			select {
			case err := <-done:
				var exit *exec.ExitError
				require.ErrorAs(t, err, &exit, "pairwell must not succeed")
				if ws, ok := exit.Sys().(syscall.WaitStatus); ok && ws.Signaled() {
					assert.Equal(t, syscall.SIGINT, ws.Signal())
				}
			case <-time.After(5 * time.Second):
				cmd.Process.Kill()
				t.Fatal("pairwell did not exit on SIGINT")
			}
			assert.Empty(t, pluginProcs(t), "plugin processes left after SIGINT")
		})
	}
}

// lockedBuffer is a strings.Builder safe to read while a process writes.
type lockedBuffer struct {
	mu sync.Mutex
	b  strings.Builder
}

func (l *lockedBuffer) Write(p []byte) (int, error) {
	l.mu.Lock()
	defer l.mu.Unlock()
	return l.b.Write(p)
}

func (l *lockedBuffer) String() string {
	l.mu.Lock()
	defer l.mu.Unlock()
	return l.b.String()
}
