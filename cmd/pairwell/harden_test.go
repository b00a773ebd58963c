package main

import (
	"encoding/json"
	"io"
	"os"
	"os/exec"
	"path/filepath"
	"runtime"
	"strconv"
	"strings"
	"syscall"
	"testing"
	"time"
	"unicode/utf8"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"github.com/pairwell/pairwell/core/modelset"
)

// The reproductions of hostile and careless input: each must give its
// clear line and exit code.

// TestUnitsNeverGuessed: a laboratory unit without "/mol", or "mol" after a
// per-particle unit, is refused (exit 2) with the spelling meant.
func TestUnitsNeverGuessed(t *testing.T) {
	tests := []struct {
		args []string
		want string
	}{
		{[]string{"inspect", "lj:epsilon=0.238kcal,sigma=3.4"}, "did you mean kcal/mol?"},
		{[]string{"inspect", "lj:epsilon=0.238cal,sigma=3.4"}, "did you mean cal/mol?"},
		{[]string{"inspect", "lj:epsilon=1kJ,sigma=3.4"}, "did you mean kJ/mol?"},
		{[]string{"inspect", "lj:epsilon=1eV/mol,sigma=3.4"}, "only per mole"},
		{[]string{"inspect", "morse:De=4.4,a=1.9,re=1.27", "--mu", "5e-324"}, "from 0.0001 u to 1e+06 u"},
		{[]string{"inspect", "morse:De=4.4,a=1.9,re=1.27", "--mu", "0"}, "from 0.0001 u"},
		{[]string{"inspect", "morse:De=4.4,a=1.9,re=1.27", "--mu", "1e-400"}, "from 0.0001 u"},
		{[]string{"inspect", "morse:De=4.4,a=1.9,re=1.27", "--mu", "12g"}, "did you mean g/mol?"},
		{[]string{"inspect", "morse:De=4.4,a=1.9,re=1.27", "--pair", ""}, `--pair "": give an atom pair`},
		{[]string{"inspect", "morse:De=4.4,a=1.9,re=1.27", "--pair", "", "--mu", "1"}, "both given"},
		{[]string{"motion", "morse:De=4.4,a=1.9,re=1.27", "--pair=", "--amplitude", "0.1"}, `--pair ""`},
	}
	for _, tt := range tests {
		code, _, errOut := runCLI(t, tt.args...)
		assert.Equal(t, 2, code, "%v: %s", tt.args, errOut)
		assert.Contains(t, errOut, tt.want, "%v", tt.args)
	}
	code, _, errOut := runCLI(t, "inspect", "lj:epsilon=0.238kcal/mol,sigma=3.4", "--mu", "0.5")
	assert.Equal(t, 0, code, errOut)
}

// TestOutputsNeverDestroyInput: every writer refuses, before any work, a
// target that is an input of the run (by device and inode), a link, a
// device, a FIFO or a directory (exit 2), and keeps the mode of a file it
// replaces.
func TestOutputsNeverDestroyInput(t *testing.T) {
	dir := t.TempDir()
	set := writeSet(t, dir, baselineSet)
	original, err := os.ReadFile(set)
	require.NoError(t, err)
	hard := filepath.Join(dir, "hard-link-of-set.json")
	require.NoError(t, os.Link(set, hard))
	link := filepath.Join(dir, "link.csv")
	require.NoError(t, os.Symlink(filepath.Join(dir, "elsewhere.csv"), link))
	fifo := filepath.Join(dir, "fifo.csv")
	require.NoError(t, syscall.Mkfifo(fifo, 0o644))
	morse := "morse:De=4.4,a=1.9,re=1.27"
	tests := []struct {
		args []string
		want string
	}{
		{[]string{"baseline", "record", "--set", set, "-o", set}, "input of this run"},
		{[]string{"baseline", "record", "--set", set, "-o", hard}, "same file as the input"},
		{[]string{"check", "--set", set, "--junit", set}, "input of this run"},
		{[]string{"check", "--set", set, "--junit", link}, "symbolic link"},
		{[]string{"motion", morse, "--mu", "1", "--amplitude", "0.1", "--trajectory", "/dev/null"}, "a device"},
		{[]string{"motion", morse, "--mu", "1", "--amplitude", "0.1", "--trajectory", fifo}, "a FIFO"},
		{[]string{"motion", morse, "--mu", "1", "--amplitude", "0.1", "--trajectory", dir}, "a directory"},
		{[]string{"motion", morse, "--mu", "1", "--amplitude", "0.1", "--trajectory", "-"}, "standard output"},
		{[]string{"plot", "taylor", morse, "-o", link + ".png"}, ""}, // a plain new file: allowed
		{[]string{"plot", "compare", "--set", set, "-o", filepath.Join(dir, "pic.png")}, ""},
	}
	require.NoError(t, os.Symlink(filepath.Join(dir, "elsewhere.png"), link+".png"))
	tests[8].want = "symbolic link"
	tests[9].args[len(tests[9].args)-1] = link + ".png"
	tests[9].want = "symbolic link"
	for _, tt := range tests {
		code, _, errOut := runCLI(t, tt.args...)
		assert.Equal(t, exitUsage, code, "%v: %s", tt.args, errOut)
		assert.Contains(t, errOut, tt.want, "%v", tt.args)
		assert.NotContains(t, errOut, "\n"+"pairwell", "one line")
	}
	got, err := os.ReadFile(set)
	require.NoError(t, err)
	assert.Equal(t, original, got, "the model set is intact")
	st, err := os.Lstat("/dev/null")
	require.NoError(t, err)
	assert.NotZero(t, st.Mode()&os.ModeDevice, "/dev/null is still a device")
	st, err = os.Lstat(fifo)
	require.NoError(t, err)
	assert.NotZero(t, st.Mode()&os.ModeNamedPipe)
	for _, name := range []string{"elsewhere.csv", "elsewhere.png"} {
		_, err = os.Lstat(filepath.Join(dir, name))
		assert.ErrorIs(t, err, os.ErrNotExist, "links are not followed")
	}

	// A private file stays private when replaced, and nothing is left
	// beside it.
	sub := t.TempDir()
	traj := filepath.Join(sub, "t.csv")
	require.NoError(t, os.WriteFile(traj, []byte("secret"), 0o600))
	code, _, errOut := runCLI(t, "motion", morse, "--mu", "1", "--amplitude", "0.1", "--periods", "1", "--trajectory", traj)
	require.Equal(t, 0, code, errOut)
	st, err = os.Stat(traj)
	require.NoError(t, err)
	assert.Equal(t, os.FileMode(0o600), st.Mode().Perm())
	entries, err := os.ReadDir(sub)
	require.NoError(t, err)
	assert.Len(t, entries, 1, "no temporary file left")
}

// TestInputsBounded: inputs that are not regular files, or too large, are
// refused before they are read (exit 2); --set /dev/zero used to read
// forever.
func TestInputsBounded(t *testing.T) {
	dir := t.TempDir()
	fifo := filepath.Join(dir, "set.toml")
	require.NoError(t, syscall.Mkfifo(fifo, 0o644))
	big := filepath.Join(dir, "big.toml")
	require.NoError(t, os.WriteFile(big, make([]byte, modelset.MaxSize+1), 0o644))
	deep := filepath.Join(dir, "deep.toml")
	require.NoError(t, os.WriteFile(deep, []byte("x = "+strings.Repeat("{a = ", 5000)+"1"+strings.Repeat("}", 5000)+"\n"), 0o644))
	tests := []struct {
		args []string
		want string
	}{
		{[]string{"compare", "--set", "/dev/zero", "--mu", "1"}, "a device"},
		{[]string{"check", "--set", fifo}, "a FIFO"},
		{[]string{"check", "--set", dir}, "a directory"},
		{[]string{"check", "--set", big}, "the limit is 1048576"},
		{[]string{"check", "--set", deep}, "nested deeper than 8"},
		{[]string{"baseline", "verify", "--set", deep, "/dev/zero"}, "a device"},
	}
	for _, tt := range tests {
		code, _, errOut := runCLI(t, tt.args...)
		assert.Equal(t, exitUsage, code, "%v: %s", tt.args, errOut)
		assert.Contains(t, errOut, tt.want, "%v", tt.args)
	}
}

// TestConflictingPins: two pins for one plugin path are an error (the
// first used to win silently).
func TestConflictingPins(t *testing.T) {
	requirePlugins(t)
	good := sha256Hex(t, pluginBin.rydberg)
	other := strings.Repeat("ab", 32)
	code, _, errOut := runCLI(t, "--plugin", pluginBin.rydberg+"@sha256:"+good, "--plugin", pluginBin.rydberg+"@sha256:"+other, "models")
	assert.Equal(t, exitUsage, code, errOut)
	assert.Contains(t, errOut, "pinned twice")
	// A --plugin pin that differs from the lock file's.
	lock := filepath.Join(t.TempDir(), "plugins.lock")
	require.NoError(t, os.WriteFile(lock, []byte(good+"  "+pluginBin.rydberg+"\n"), 0o644))
	t.Setenv(envPluginLock, lock)
	code, _, errOut = runCLI(t, "--plugin", pluginBin.rydberg+"@sha256:"+other, "models")
	assert.Equal(t, exitUsage, code, errOut)
	assert.Contains(t, errOut, "the lock file "+lock+" pins")
	code, _, errOut = runCLI(t, "--plugin", pluginBin.rydberg+"@sha256:"+good, "models")
	assert.Equal(t, 0, code, errOut)
	t.Setenv(envPluginLock, "")
	// The same pin twice is fine.
	code, _, errOut = runCLI(t, "--plugin", pluginBin.rydberg+"@sha256:"+good, "--plugin", pluginBin.rydberg+"@sha256:"+good, "models")
	assert.Equal(t, 0, code, errOut)
}

// TestPluginFailureRowsExitOne: a command that reports per-row errors
// prints every row and exits 1 when a plugin failed (period used to exit
// 0 with its rows "plugin crashed"); a row that is physically out of
// range stays a row error with exit 0.
func TestPluginFailureRowsExitOne(t *testing.T) {
	requirePlugins(t)
	p := []string{"--plugin", pluginBin.test}
	// crashlater-morse crashes after N evaluation calls: find an N at which
	// the well is found and the rows are not (the count depends on the
	// algorithms, so it is searched rather than hard-coded).
	found := false
	for n := 2; n <= 256 && !found; n += 2 {
		t.Setenv("PAIRWELL_TEST_CRASH_AFTER", strconv.Itoa(n))
		for _, format := range []string{"table", "json"} {
			code, out, errOut := runCLI(t, append(p, "period", "crashlater-morse:De=1,a=1,re=1", "--mu", "1",
				"--amplitudes", "0.1,0.2,0.3", "--format", format)...)
			if out == "" || !strings.Contains(out, "plugin crashed") {
				continue // crashed before the rows, or not at all
			}
			found = true
			assert.Equal(t, exitFailure, code, "N = %d: %s", n, errOut)
			assert.Contains(t, errOut, "rows failed because a plugin failed")
		}
	}
	assert.True(t, found, "no N gave rows with a crash")

	code, out, errOut := runCLI(t, append(p, "compare", "crashing-morse:De=1,a=1,re=1", "morse:De=4.4,a=1.9,re=1.27", "--mu", "1")...)
	assert.Equal(t, exitFailure, code, errOut)
	assert.Contains(t, out, "morse", "every row is printed")
	assert.Contains(t, errOut, "1 of 2 rows failed because a plugin failed")

	// Out of range is not a failure: the pair dissociates.
	code, out, errOut = runCLI(t, "period", "morse:De=1,a=1,re=1", "--mu", "1", "--amplitudes", "0.1,50")
	assert.Equal(t, 0, code, errOut)
	assert.Contains(t, out, "0.1")
	assert.Contains(t, errOut, "1 of 2 rows have no period")
}

// TestTerminalHygiene: control characters in anything pairwell prints —
// plugin model names, notes and errors, input echoed in messages — are
// escaped, so they cannot clear the screen or rewrite lines; inside JSON
// strings the escape is the same character.
func TestTerminalHygiene(t *testing.T) {
	var b strings.Builder
	w := &cleanWriter{w: &b}
	in := "ok\tcol\nESC\x1b[2J CR\r BEL\x07 DEL\x7f C1\u009b[1m RLO\u202e bad\xff é∞\n"
	// Written in two parts that split a multi-byte character.
	split := strings.Index(in, "é") + 1
	_, err := w.Write([]byte(in[:split]))
	require.NoError(t, err)
	_, err = w.Write([]byte(in[split:]))
	require.NoError(t, err)
	assert.Equal(t, `ok	col
ESC\u001b[2J CR\u000d BEL\u0007 DEL\u007f C1\u009b[1m RLO\u202e bad\xff é∞
`, b.String())
	var s string
	require.NoError(t, json.Unmarshal([]byte(`"`+`C1\u009b RLO\u202e`+`"`), &s))
	assert.Equal(t, "C1\u009b RLO\u202e", s, "the escape is valid JSON for the same character")

	// Through the command line: a spec quoting an escape sequence.
	code, _, errOut := runCLI(t, "inspect", "morse:De=\x1b[2J\x1b]0;owned\x07")
	assert.Equal(t, exitUsage, code)
	assert.NotContains(t, errOut, "\x1b")
	assert.NotContains(t, errOut, "\x07")

	// A huge message is cut.
	code, _, errOut = runCLI(t, "inspect", "morse:De="+strings.Repeat("x", 100000))
	assert.Equal(t, exitUsage, code)
	assert.Less(t, len(errOut), 3000)
	assert.Contains(t, errOut, "more characters)")
}

// TestSecondSignalEndsAtOnce: the clean-up after a signal is bounded by
// its deadline, and a second signal ends it at once.
func TestSecondSignalEndsAtOnce(t *testing.T) {
	e := newEnv(io.Discard, io.Discard)
	block := make(chan struct{})
	defer close(block)
	e.onSignal(func() { <-block }) // a clean-up that never ends
	sigs := make(chan os.Signal, 2)
	ended := make(chan os.Signal, 1)
	stop := e.watchSignals(sigs, time.Hour, func(s os.Signal) { ended <- s })
	sigs <- syscall.SIGINT
	select {
	case <-ended:
		t.Fatal("ended before the clean-up or a second signal")
	case <-time.After(50 * time.Millisecond):
	}
	sigs <- syscall.SIGINT
	select {
	case s := <-ended:
		assert.Equal(t, syscall.SIGINT, s, "dies of the first signal")
	case <-time.After(2 * time.Second):
		t.Fatal("a second signal did not end the clean-up")
	}
	stop()

	// The deadline alone ends it too.
	e = newEnv(io.Discard, io.Discard)
	e.onSignal(func() { <-block })
	sigs = make(chan os.Signal, 1)
	stop = e.watchSignals(sigs, 20*time.Millisecond, func(s os.Signal) { ended <- s })
	sigs <- syscall.SIGTERM
	select {
	case s := <-ended:
		assert.Equal(t, syscall.SIGTERM, s)
	case <-time.After(2 * time.Second):
		t.Fatal("the deadline did not end the clean-up")
	}
	stop()
}

// startPairwell starts the pairwell binary with args and returns it, with
// a channel that receives its exit.
func startPairwell(t *testing.T, env []string, args ...string) (*exec.Cmd, <-chan error, *lockedBuffer) {
	t.Helper()
	cmd := exec.Command(pluginBin.pairwell, args...)
	cmd.Env = append(os.Environ(), env...)
	var stderr lockedBuffer
	cmd.Stderr = &stderr
	require.NoError(t, cmd.Start())
	done := make(chan error, 1)
	go func() { done <- cmd.Wait() }()
	t.Cleanup(func() { cmd.Process.Kill() })
	return cmd, done, &stderr
}

// waitExit waits up to d for pairwell to end.
func waitExit(t *testing.T, done <-chan error, d time.Duration) error {
	t.Helper()
	select {
	case err := <-done:
		return err
	case <-time.After(d):
		t.Fatalf("pairwell did not exit within %v", d)
		return nil
	}
}

// waitProcs waits until at least n plugin processes run. The bounds of
// these helpers are generous because the test suite shares two cores with
// parallel package builds: they bound a hang, not the normal cost.
func waitProcs(t *testing.T, n int, stderr *lockedBuffer) {
	t.Helper()
	deadline := time.Now().Add(30 * time.Second)
	for len(pluginProcs(t)) < n && time.Now().Before(deadline) {
		time.Sleep(2 * time.Millisecond)
	}
	require.GreaterOrEqual(t, len(pluginProcs(t)), n, "plugins did not start; stderr: %s", stderr.String())
}

// requireNoPluginProcs fails unless every plugin process is gone within
// ten seconds (the stop itself takes at most two; the rest is headroom for
// a loaded machine).
func requireNoPluginProcs(t *testing.T) {
	t.Helper()
	deadline := time.Now().Add(10 * time.Second)
	for len(pluginProcs(t)) > 0 && time.Now().Before(deadline) {
		time.Sleep(10 * time.Millisecond)
	}
	require.Empty(t, pluginProcs(t), "plugin processes left behind")
}

// TestNothingSurvivesPairwell ends pairwell each way it can end, with
// plugins whose children hold their pipes (also from another session) and
// with one not built with the SDK, and checks that no plugin process
// survives and that pairwell does not hang.
func TestNothingSurvivesPairwell(t *testing.T) {
	if runtime.GOOS != "linux" {
		t.Skip("reads /proc")
	}
	requirePlugins(t)
	morse := "plugin-morse:De=4.6,a=1.87,re=1.27"
	for _, p := range []string{pluginBin.holdpipes, pluginBin.setsid} {
		t.Run("success "+filepath.Base(p), func(t *testing.T) {
			// Used to print its result and never exit.
			_, done, stderr := startPairwell(t, nil, "--plugin", p, "inspect", morse)
			require.NoError(t, waitExit(t, done, 20*time.Second), stderr.String())
			requireNoPluginProcs(t)
		})
	}
	t.Run("bad input", func(t *testing.T) {
		_, done, _ := startPairwell(t, nil, "--plugin", pluginBin.setsid, "inspect", "plugin-morse:De=-1,a=1,re=1")
		var exit *exec.ExitError
		require.ErrorAs(t, waitExit(t, done, 20*time.Second), &exit)
		assert.Equal(t, exitUsage, exit.ExitCode())
		requireNoPluginProcs(t)
	})
	t.Run("start timeout of a plugin not built with the SDK", func(t *testing.T) {
		_, done, _ := startPairwell(t, nil, "--plugin", pluginBin.nosdk, "--plugin-timeout", "300ms", "models")
		var exit *exec.ExitError
		require.ErrorAs(t, waitExit(t, done, 20*time.Second), &exit)
		assert.Equal(t, exitFailure, exit.ExitCode())
		requireNoPluginProcs(t)
	})
	for _, sig := range []syscall.Signal{syscall.SIGINT, syscall.SIGTERM, syscall.SIGHUP} {
		t.Run(sig.String()+" in a hanging call", func(t *testing.T) {
			cmd, done, stderr := startPairwell(t, nil, "--plugin", pluginBin.holdpipes, "--plugin-timeout", "1m", "inspect", "hanging-morse:De=1,a=1,re=1")
			waitProcs(t, 2, stderr)
			time.Sleep(100 * time.Millisecond) // into the call
			require.NoError(t, cmd.Process.Signal(sig))
			err := waitExit(t, done, 15*time.Second)
			var exit *exec.ExitError
			require.ErrorAs(t, err, &exit)
			ws := exit.Sys().(syscall.WaitStatus)
			assert.True(t, ws.Signaled() && ws.Signal() == sig, "dies of %v: %v", sig, err)
			requireNoPluginProcs(t)
		})
	}
	t.Run("SIGINT while a plugin not built with the SDK starts", func(t *testing.T) {
		cmd, done, stderr := startPairwell(t, nil, "--plugin", pluginBin.nosdk, "--plugin-timeout", "1m", "models")
		waitProcs(t, 2, stderr)
		require.NoError(t, cmd.Process.Signal(os.Interrupt))
		waitExit(t, done, 15*time.Second)
		requireNoPluginProcs(t)
	})
	t.Run("SIGKILL", func(t *testing.T) {
		// Nothing can clean up after SIGKILL. The plugin dies with
		// pairwell (PR_SET_PDEATHSIG), also one not built with the SDK,
		// and the next pairwell removes its socket directory.
		tmp, err := os.MkdirTemp("/tmp", "pw")
		require.NoError(t, err)
		defer os.RemoveAll(tmp)
		env := []string{"TMPDIR=" + tmp}
		cmd, done, stderr := startPairwell(t, env, "--plugin", pluginBin.nosdk, "--plugin", pluginBin.test, "--plugin-timeout", "1m", "models")
		waitProcs(t, 3, stderr) // nosdk, its child, testplugin
		t.Cleanup(func() {
			// nosdk's own child is beyond reach after SIGKILL (see README).
			for range 100 {
				procs := pluginProcs(t)
				if len(procs) == 0 {
					break
				}
				for _, pid := range procs {
					syscall.Kill(pid, syscall.SIGKILL)
				}
				time.Sleep(10 * time.Millisecond)
			}
		})
		var direct []int
		for _, pid := range pluginProcs(t) {
			if st, err := os.ReadFile(filepath.Join("/proc", strconv.Itoa(pid), "stat")); err == nil {
				f := strings.Fields(string(st[strings.LastIndexByte(string(st), ')')+1:]))
				if len(f) > 1 && f[1] == strconv.Itoa(cmd.Process.Pid) {
					direct = append(direct, pid)
				}
			}
		}
		require.Len(t, direct, 2, "the two plugins")
		require.NoError(t, cmd.Process.Kill())
		waitExit(t, done, 15*time.Second)
		deadline := time.Now().Add(10 * time.Second)
		for _, pid := range direct {
			for syscall.Kill(pid, 0) == nil && time.Now().Before(deadline) {
				time.Sleep(5 * time.Millisecond)
			}
			assert.Error(t, syscall.Kill(pid, 0), "plugin %d survived SIGKILL of pairwell", pid)
		}
		left, _ := filepath.Glob(filepath.Join(tmp, "pairwell-sockets-*"))
		require.NotEmpty(t, left, "the killed run's socket directories")
		code, _, errOut := runCLIEnv(t, env, "--plugin", pluginBin.test, "models")
		require.Equal(t, 0, code, errOut)
		left, _ = filepath.Glob(filepath.Join(tmp, "pairwell-sockets-*"))
		assert.Empty(t, left, "swept by the next run")
	})
}

// runCLIEnv runs pairwell in process with extra environment variables.
func runCLIEnv(t *testing.T, env []string, args ...string) (int, string, string) {
	t.Helper()
	for _, kv := range env {
		k, v, _ := strings.Cut(kv, "=")
		t.Setenv(k, v)
	}
	return runCLI(t, args...)
}

// TestPluginPathTrust: directories of PAIRWELL_PLUGIN_PATH that others can
// write to, and relative ones, are refused (exit 2); a plugin named with
// --plugin in such a place runs with a warning.
func TestPluginPathTrust(t *testing.T) {
	requirePlugins(t)
	open := t.TempDir()
	require.NoError(t, os.Chmod(open, 0o777))
	plugin := filepath.Join(open, "pairwell-plugin-rydberg")
	require.NoError(t, os.Symlink(pluginBin.rydberg, plugin))
	safe := t.TempDir()
	require.NoError(t, os.Symlink(open, filepath.Join(safe, "link")))
	tests := []struct {
		path, want string
	}{
		{".", "relative"},
		{"plugins", "relative"},
		{open, "writable by everyone"},
		{filepath.Join(safe, "link"), "writable by everyone"}, // a link to it
	}
	for _, tt := range tests {
		t.Setenv(envPluginPath, tt.path)
		code, _, errOut := runCLI(t, "models")
		assert.Equal(t, exitUsage, code, "%s: %s", tt.path, errOut)
		assert.Contains(t, errOut, tt.want, tt.path)
	}
	t.Setenv(envPluginPath, "")
	code, out, errOut := runCLI(t, "--plugin", plugin, "models")
	assert.Equal(t, 0, code, errOut)
	assert.Contains(t, errOut, "warning: plugin "+plugin)
	assert.Contains(t, out, "rydberg")
}

// TestWorkBounded: requests whose work or output would be out of all
// proportion are refused before the work starts (exit 2), with the limit.
func TestWorkBounded(t *testing.T) {
	morse := "morse:De=4.4,a=1.9,re=1.27"
	tests := []struct {
		args []string
		want string
	}{
		// Died with a Go out-of-memory stack trace.
		{[]string{"check", morse, "--points", "2000000000"}, "must be from 8 to 10000"},
		// Ran for hours while memory grew.
		{[]string{"motion", morse, "--mu", "1", "--amplitude", "0.1", "--method", "rk4", "--steps-per-period", "10000000",
			"--periods", "100000", "--trajectory", filepath.Join(t.TempDir(), "t.csv")}, "the limit with --trajectory is 1000000"},
		{[]string{"motion", morse, "--mu", "1", "--amplitude", "0.1", "--method", "rk4", "--steps-per-period", "10000000",
			"--periods", "100"}, "the limit is 100000000"},
		{[]string{"period", morse, "--mu", "1", "--amplitudes", "0.01:0.2:100001"}, "COUNT must be an integer from 1 to 100000"},
		{[]string{"period", morse, "--mu", "1", "--amplitudes", "0.01:0.2:60000", "--energies", "0.01:0.2:60000"}, "the limit is 100000 rows"},
	}
	for _, tt := range tests {
		code, _, errOut := runCLI(t, tt.args...)
		assert.Equal(t, exitUsage, code, "%v: %s", tt.args, errOut)
		assert.Contains(t, errOut, tt.want, "%v", tt.args)
	}
}

// TestJSONRowsStreamed: rows streamed one by one after a head are the same
// bytes as the whole object encoded at once.
func TestJSONRowsStreamed(t *testing.T) {
	type row struct {
		A float64  `json:"a"`
		B string   `json:"b"`
		C []int    `json:"c"`
		D *float64 `json:"d"`
	}
	for n := range 4 {
		rows := make([]row, n)
		for i := range rows {
			rows[i] = row{A: float64(i) / 3, B: "<x>", C: []int{i, i + 1}}
		}
		type head struct {
			M string `json:"model"`
			P []int  `json:"p"`
		}
		h := head{"m", []int{1, 2}}
		var whole, streamed strings.Builder
		require.NoError(t, writeJSON(&whole, struct {
			head
			Rows []row `json:"rows"`
		}{h, rows}))
		require.NoError(t, writeJSONRows(&streamed, h, rows))
		assert.Equal(t, whole.String(), streamed.String(), "n = %d", n)
		whole.Reset()
		streamed.Reset()
		require.NoError(t, writeJSON(&whole, struct {
			Rows []row `json:"rows"`
		}{rows}))
		require.NoError(t, writeJSONRows(&streamed, struct{}{}, rows))
		assert.Equal(t, whole.String(), streamed.String(), "n = %d, no head", n)
	}
	code, out, errOut := runCLI(t, "period", "morse:De=4.4,a=1.9,re=1.27", "--mu", "1", "--amplitudes", "0.1,0.2", "--format", "json")
	require.Equal(t, 0, code, errOut)
	var doc struct {
		Model string           `json:"model"`
		Rows  []map[string]any `json:"rows"`
	}
	require.NoError(t, json.Unmarshal([]byte(out), &doc))
	assert.Equal(t, "morse", doc.Model)
	assert.Len(t, doc.Rows, 2)
}

// FuzzCleanWriter: whatever is written, split anywhere, comes out without
// a character a terminal would act on, and clean text comes out unchanged.
func FuzzCleanWriter(f *testing.F) {
	f.Add("plain text\twith tab\n", 3)
	f.Add("esc\x1b[2J c1\u009b bidi\u202e bad\xff\xfe é", 7)
	f.Fuzz(func(t *testing.T, in string, cut int) {
		var b strings.Builder
		w := &cleanWriter{w: &b}
		if cut < 0 || cut > len(in) {
			cut = len(in) / 2
		}
		w.Write([]byte(in[:cut]))
		w.Write([]byte(in[cut:]))
		w.Write([]byte("\n")) // flushes a trailing incomplete sequence
		out := b.String()
		if !utf8.ValidString(out) {
			t.Fatalf("invalid UTF-8 out of %q: %q", in, out)
		}
		for _, r := range out {
			if dangerous(r) {
				t.Fatalf("%U left in %q (from %q)", r, out, in)
			}
		}
		clean := utf8.ValidString(in)
		for _, r := range in {
			clean = clean && !dangerous(r)
		}
		if clean && out != in+"\n" {
			t.Fatalf("clean %q became %q", in, out)
		}
	})
}

// TestSignalLeavesNoFile: SIGINT or SIGTERM in the middle of a long motion
// run with --trajectory leaves neither a temporary nor a partial file
// (hidden .NAME.*.tmp files of hundreds of MB used to accumulate).
func TestSignalLeavesNoFile(t *testing.T) {
	if runtime.GOOS != "linux" {
		t.Skip("signals")
	}
	requirePlugins(t)
	for i, sig := range []syscall.Signal{syscall.SIGINT, syscall.SIGTERM} {
		dir := t.TempDir()
		cmd, done, _ := startPairwell(t, nil, "motion", "morse:De=4.4,a=1.9,re=1.27", "--mu", "1", "--amplitude", "0.1",
			"--method", "rk4", "--steps-per-period", "1000", "--periods", "900", "--trajectory", filepath.Join(dir, "t.csv"))
		time.Sleep(time.Duration(100+300*i) * time.Millisecond) // computing, then writing
		require.NoError(t, cmd.Process.Signal(sig))
		err := waitExit(t, done, 20*time.Second)
		if err == nil {
			t.Logf("%v: the run finished before the signal", sig)
			continue
		}
		var exit *exec.ExitError
		require.ErrorAs(t, err, &exit)
		assert.True(t, exit.Sys().(syscall.WaitStatus).Signaled(), "%v: dies of the signal: %v", sig, err)
		entries, rerr := os.ReadDir(dir)
		require.NoError(t, rerr)
		assert.Empty(t, entries, "%v left files", sig)
	}
}
