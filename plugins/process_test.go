package plugins_test

import (
	"context"
	"crypto/sha256"
	"os"
	"path/filepath"
	"runtime"
	"strconv"
	"strings"
	"testing"
	"time"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/plugins"
	"github.com/pairwell/pairwell/plugins/plugintest"
)

// requireNoProcs fails unless every process started from the test
// binaries' directory is gone within two seconds.
func requireNoProcs(t *testing.T) {
	t.Helper()
	deadline := time.Now().Add(2 * time.Second)
	for len(plugintest.Procs(bin.dir)) > 0 && time.Now().Before(deadline) {
		time.Sleep(10 * time.Millisecond)
	}
	require.Empty(t, plugintest.Procs(bin.dir), "processes left behind")
}

func needProc(t *testing.T) {
	if runtime.GOOS != "linux" {
		t.Skip("reads /proc")
	}
}

// TestChildHoldingPipes: a plugin whose child inherits its standard output
// and error (and one whose child also leaves its process group and
// session) neither hangs Close nor survives it. It used to hang pairwell
// after its result forever.
func TestChildHoldingPipes(t *testing.T) {
	needProc(t)
	for _, path := range []string{bin.holdpipes, bin.setsid} {
		t.Run(filepath.Base(path), func(t *testing.T) {
			p, err := plugins.Load(context.Background(), path, plugins.Options{Timeout: 5 * time.Second})
			require.NoError(t, err)
			pot, err := model(t, p, "plugin-morse").New([]float64{4.6, 1.87, 1.27})
			require.NoError(t, err)
			v, err := core.Value(pot, 1.27)
			require.NoError(t, err)
			assert.InDelta(t, -4.6, v, 1e-12) // V(re) = −De
			require.GreaterOrEqual(t, len(plugintest.Procs(bin.dir)), 2, "the plugin and its child")
			start := time.Now()
			p.Close()
			assert.Less(t, time.Since(start), 3*time.Second, "Close is bounded")
			requireNoProcs(t)
		})
	}
}

// TestNotSDKPluginStopped: an executable that never answers the handshake
// and ignores SIGTERM (not built with the SDK) is stopped, with its child,
// when the start times out and when the start is abandoned.
func TestNotSDKPluginStopped(t *testing.T) {
	needProc(t)
	start := time.Now()
	_, err := plugins.Load(context.Background(), bin.nosdk, plugins.Options{Timeout: 300 * time.Millisecond})
	require.ErrorIs(t, err, plugins.ErrHandshake)
	assert.Less(t, time.Since(start), 3*time.Second)
	requireNoProcs(t)

	ctx, cancel := context.WithCancel(context.Background())
	go func() {
		for len(plugintest.Procs(bin.dir)) < 2 {
			time.Sleep(5 * time.Millisecond)
		}
		cancel()
	}()
	_, err = plugins.Load(ctx, bin.nosdk, plugins.Options{Timeout: time.Minute})
	require.Error(t, err)
	requireNoProcs(t)
}

// TestSocketDirs: a plugin's sockets live in a private directory that
// Close removes; directories of pairwell processes that no longer exist
// (killed with SIGKILL) are removed by the next Load.
func TestSocketDirs(t *testing.T) {
	needProc(t)
	// A short directory: Unix socket paths are limited to 108 bytes.
	tmp, err := os.MkdirTemp("/tmp", "pw")
	require.NoError(t, err)
	defer os.RemoveAll(tmp)
	t.Setenv("TMPDIR", tmp)
	// A pid that cannot exist (above the kernel's pid_max).
	stale := filepath.Join(tmp, "pairwell-sockets-99999999-123")
	require.NoError(t, os.MkdirAll(filepath.Join(stale, "plugin-dir1"), 0o700))
	live := filepath.Join(tmp, "pairwell-sockets-1-123") // pid 1 exists
	require.NoError(t, os.Mkdir(live, 0o700))

	p, err := plugins.Load(context.Background(), bin.test, plugins.Options{})
	require.NoError(t, err)
	assert.True(t, p.Direct(), "the direct channel's socket is in the private directory too")
	mine, _ := filepath.Glob(filepath.Join(tmp, "pairwell-sockets-"+strconv.Itoa(os.Getpid())+"-*"))
	require.Len(t, mine, 1, "the plugin's private directory")
	p.Close()
	_, err = os.Stat(mine[0])
	assert.ErrorIs(t, err, os.ErrNotExist, "removed by Close")
	_, err = os.Stat(stale)
	assert.ErrorIs(t, err, os.ErrNotExist, "a dead run's directory is swept")
	_, err = os.Stat(live)
	assert.NoError(t, err, "a live process's directory is kept")
}

// TestPinnedRunsTheHashedBytes: a pinned plugin runs from a sealed copy
// made while hashing, so replacing the file after the check changes
// nothing (a swap between hash and exec ran an unpinned binary in 26 of
// 150 attempts).
func TestPinnedRunsTheHashedBytes(t *testing.T) {
	needProc(t)
	dir := t.TempDir()
	path := filepath.Join(dir, "pairwell-plugin-test")
	data, err := os.ReadFile(bin.test)
	require.NoError(t, err)
	require.NoError(t, os.WriteFile(path, data, 0o755))
	sum := sha256.Sum256(data)

	p, err := plugins.Load(context.Background(), path, plugins.Options{SHA256: sum[:]})
	require.NoError(t, err)
	defer p.Close()
	exe, err := os.Readlink("/proc/" + strconv.Itoa(p.Pid()) + "/exe")
	require.NoError(t, err)
	assert.True(t, strings.HasPrefix(exe, "/memfd:"), "runs from the sealed copy, not %s", exe)
	cl, err := os.ReadFile("/proc/" + strconv.Itoa(p.Pid()) + "/cmdline")
	require.NoError(t, err)
	assert.True(t, strings.HasPrefix(string(cl), path+"\x00"), "argv[0] is still the path")

	// Overwriting the file (as a swap would) after the check: what runs is
	// still the hashed copy, and the next Load refuses the new bytes.
	require.NoError(t, os.WriteFile(path, []byte("#!/bin/sh\necho swapped\n"), 0o755))
	pot, err := model(t, p, "plugin-morse").New([]float64{4.6, 1.87, 1.27})
	require.NoError(t, err)
	_, err = core.Value(pot, 1.3)
	require.NoError(t, err)
	_, err = plugins.Load(context.Background(), path, plugins.Options{SHA256: sum[:]})
	assert.ErrorIs(t, err, plugins.ErrChecksum)
}

// TestReplySizeCapped: a gRPC reply larger than Options.MaxReply fails with
// ErrBadOutput instead of being accepted (a 1 GiB reply was).
func TestReplySizeCapped(t *testing.T) {
	_, err := plugins.Load(context.Background(), bin.test, plugins.Options{MaxReply: 512})
	require.ErrorIs(t, err, plugins.ErrBadOutput) // its Describe is larger
	assert.Contains(t, err.Error(), "larger than max")
	requireNoProcs(t)
}
