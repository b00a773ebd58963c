// Package plugintest builds plugins for tests, the way package httptest
// serves HTTP for them: a test's TestMain builds the plugins it needs once,
// with the toolchain running the tests.
package plugintest

import (
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"runtime"
	"strconv"
	"strings"
	"testing"
)

// Module is the import path prefix of pairwell's packages.
const Module = "github.com/pairwell/pairwell/"

// Examples and TestPlugin are the package paths of the example plugins and
// of the test plugin (an independent Morse and deliberately faulty forms).
var (
	Examples   = []string{Module + "plugins/examples/rydberg", Module + "plugins/examples/mie"}
	TestPlugin = Module + "plugins/testdata/testplugin"
	// NoSDK is a test executable not built with the SDK that never
	// answers the handshake, ignores SIGINT/SIGTERM/SIGHUP and starts a
	// child holding its pipes.
	NoSDK = Module + "plugins/testdata/nosdk"
)

// Procs returns the processes started from an executable in dir: whose
// executable, or whose argv[0] (a pinned plugin runs from a sealed
// copy but keeps its path as argv[0]), lies in dir. Zombies (ended, not
// yet reaped) are returned negated. On systems without /proc it returns
// nil.
func Procs(dir string) []int {
	entries, err := os.ReadDir("/proc")
	if err != nil {
		return nil
	}
	prefix := dir + string(filepath.Separator)
	var pids []int
	for _, e := range entries {
		pid, err := strconv.Atoi(e.Name())
		if err != nil || pid == os.Getpid() {
			continue
		}
		exe, _ := os.Readlink(filepath.Join("/proc", e.Name(), "exe"))
		arg0 := ""
		if cl, err := os.ReadFile(filepath.Join("/proc", e.Name(), "cmdline")); err == nil {
			arg0, _, _ = strings.Cut(string(cl), "\x00")
		}
		if !strings.HasPrefix(exe, prefix) && !strings.HasPrefix(arg0, prefix) {
			continue
		}
		if st, err := os.ReadFile(filepath.Join("/proc", e.Name(), "stat")); err == nil && strings.Contains(string(st), ") Z ") {
			pids = append(pids, -pid)
			continue
		}
		pids = append(pids, pid)
	}
	return pids
}

// Build builds the main packages pkgs into dir, in one go build (one
// compilation of what they share), stripped of debug information. Each
// executable is named after the last element of its package path.
func Build(dir string, pkgs ...string) error {
	gobin := filepath.Join(runtime.GOROOT(), "bin", "go")
	if _, err := os.Stat(gobin); err != nil {
		if gobin, err = exec.LookPath("go"); err != nil {
			return fmt.Errorf("no go command to build the test plugins: %w", err)
		}
	}
	args := append([]string{"build", "-ldflags=-s -w", "-o", dir + string(filepath.Separator)}, pkgs...)
	if out, err := exec.Command(gobin, args...).CombinedOutput(); err != nil {
		return fmt.Errorf("building %v: %v\n%s", pkgs, err, out)
	}
	return nil
}

// PythonLauncher returns the absolute path of the launcher of the example
// plugin written in Python (plugins/examples/python), found from this
// source file's location.
func PythonLauncher() string {
	_, file, _, _ := runtime.Caller(0)
	return filepath.Join(filepath.Dir(file), "..", "examples", "python", "pairwell-plugin-linnett")
}

// pythonCandidates are the interpreters the launcher tries, in its order.
func pythonCandidates() []string {
	var c []string
	if py := os.Getenv("PAIRWELL_PYTHON"); py != "" {
		return []string{py}
	}
	if py, err := exec.LookPath("python3"); err == nil {
		c = append(c, py)
	}
	return append(c, "/usr/bin/python3", "/usr/local/bin/python3")
}

// FindPython returns the interpreter the Python example plugin's launcher
// will pick: the first of $PAIRWELL_PYTHON (alone, if set), python3 on
// PATH, /usr/bin/python3 and /usr/local/bin/python3 that imports grpc and
// google.protobuf. The error says what each candidate lacked and how to
// install the modules.
func FindPython() (string, error) {
	var tried []string
	for _, py := range pythonCandidates() {
		out, err := exec.Command(py, "-c", "import grpc, google.protobuf").CombinedOutput()
		if err == nil {
			return py, nil
		}
		msg := strings.TrimSpace(string(out))
		if i := strings.LastIndexByte(msg, '\n'); i >= 0 {
			msg = msg[i+1:]
		}
		if msg == "" {
			msg = err.Error()
		}
		tried = append(tried, py+": "+msg)
	}
	return "", fmt.Errorf("no python3 with the grpc and google.protobuf modules (%s); install them, "+
		"on Debian with apt-get install -y python3-grpcio python3-protobuf (as .ci/run does), "+
		"elsewhere pip install grpcio protobuf, or point PAIRWELL_PYTHON at a python3 that has them",
		strings.Join(tried, "; "))
}

// RequirePython returns the Python example plugin's launcher and the
// interpreter it will run. Without a suitable python3 it skips the test,
// saying what is missing and how to install it — except under CI=true,
// where it fails: CI installs the modules, so their absence is a defect.
func RequirePython(tb testing.TB) (launcher, python string) {
	tb.Helper()
	py, err := FindPython()
	if err != nil {
		if os.Getenv("CI") == "true" {
			tb.Fatalf("CI=true: %v", err)
		}
		tb.Skipf("skipping the Python example plugin: %v", err)
	}
	return PythonLauncher(), py
}

// ProcsWithArg returns the running descendants of this process one of
// whose arguments (argv[0] included) is arg, such as the script an
// interpreter runs. Only descendants count, so that test binaries of other
// packages running the same plugin at the same time (go test runs packages
// in parallel) are not mistaken for leftovers of this one; a plugin this
// process leaked is still its child, or its child's. Zombies are left out.
// On systems without /proc it returns nil.
func ProcsWithArg(arg string) []int {
	entries, err := os.ReadDir("/proc")
	if err != nil {
		return nil
	}
	self := os.Getpid()
	var pids []int
	for _, e := range entries {
		pid, err := strconv.Atoi(e.Name())
		if err != nil || pid == self {
			continue
		}
		cl, err := os.ReadFile(filepath.Join("/proc", e.Name(), "cmdline"))
		if err != nil {
			continue
		}
		for _, a := range strings.Split(string(cl), "\x00") {
			if a == arg {
				if state, _ := procStat(pid); state != "Z" && descendsFrom(pid, self) {
					pids = append(pids, pid)
				}
				break
			}
		}
	}
	return pids
}

// procStat returns the state letter and the parent of process pid from
// /proc/PID/stat ("pid (comm) S ppid …"; comm may hold spaces and
// parentheses, so the fields are read after the last ')').
func procStat(pid int) (state string, ppid int) {
	st, err := os.ReadFile(filepath.Join("/proc", strconv.Itoa(pid), "stat"))
	if err != nil {
		return "", 0
	}
	s := string(st)
	i := strings.LastIndexByte(s, ')')
	if i < 0 {
		return "", 0
	}
	f := strings.Fields(s[i+1:])
	if len(f) < 2 {
		return "", 0
	}
	ppid, _ = strconv.Atoi(f[1])
	return f[0], ppid
}

// descendsFrom reports whether ancestor is pid's parent, grandparent, ….
func descendsFrom(pid, ancestor int) bool {
	for i := 0; i < 64 && pid > 1; i++ {
		_, pid = procStat(pid)
		if pid == ancestor {
			return true
		}
	}
	return false
}
