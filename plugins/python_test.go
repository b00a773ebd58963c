package plugins_test

import (
	"bufio"
	"context"
	"encoding/base64"
	"errors"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"syscall"
	"testing"
	"time"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
	"google.golang.org/grpc"
	"google.golang.org/grpc/credentials/insecure"
	"google.golang.org/grpc/health/grpc_health_v1"
	"google.golang.org/protobuf/proto"
	"google.golang.org/protobuf/reflect/protodesc"
	"google.golang.org/protobuf/types/descriptorpb"
	"google.golang.org/protobuf/types/known/emptypb"

	"github.com/pairwell/pairwell/conformance"
	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/plugins"
	"github.com/pairwell/pairwell/plugins/plugintest"
	pb "github.com/pairwell/pairwell/plugins/proto"
)

// linnettParams are invented, bond-sized parameters of the Python
// example's Linnett form: De = 4.6 eV, re = 1.27 Å, m = 6, n = 2.5 1/Å.
var linnettParams = []float64{4.6, 1.27, 6, 2.5}

// linnettReference holds c_0 … c_8 of the Linnett form at linnettParams and
// the size of the two terms whose difference each is, computed by
// plugins/examples/python/testdata/reference.py (mpmath 1.3.0, 50 digits,
// numerical differentiation of Linnett's own a/r^m − b·exp(−n·r); output
// in reference.txt beside it).
var linnettReference = []struct {
	r, c, scale []float64
}{
	{[]float64{0.9}, []float64{16.179444037759348, -210.52308412471554, 981.24607883945583, -3071.3668203399634, 7798.7218835135646, -17399.556959892613, 35476.03168638023, -67586.323275187107, 122035.31637481126}, []float64{65.5, 334.0, 1.14e+3, 3.2e+3, 7.88e+3, 1.74e+4, 3.55e+4, 6.76e+4, 1.22e+5}},
	{[]float64{1.27}, []float64{-4.6, 0.0, 36.781408961048011, -115.89585789791049, 234.50101470659704, -386.38397114271431, 565.93680994111199, -767.20780417237178, 982.80766852901758}, []float64{14.9, 48.8, 97.8, 167.0, 266.0, 402.0, 573.0, 770.0, 984.0}},
	{[]float64{1.6}, []float64{-2.9885557561981814, 5.8551877175871632, -2.7734174419293871, -6.5274216971093907, 17.889955589939015, -27.588905784451129, 34.152928786294108, -37.62941998869356, 38.58194868390106}, []float64{5.57, 15.6, 24.0, 28.8, 31.8, 34.6, 37.1, 38.7, 38.9}},
	{[]float64{2.5}, []float64{-0.36241695510159735, 0.91492755041496181, -1.1116728524392159, 0.85673436843735396, -0.44788681708684124, 0.13796346650576119, 0.015120506676623029, -0.060645705617594795, 0.057863848201970529}, []float64{0.54, 1.34, 1.71, 1.49, 1.02, 0.597, 0.321, 0.17, 0.092}},
	{[]float64{4}, []float64{-0.0053168501757017187, 0.018588095081040183, -0.02621410177480479, 0.023003578171477987, -0.014666859696958908, 0.0073334298484794538, -0.0030012913939900539, 0.0010292220594030975, -0.00029763129872077986}, []float64{0.0159, 0.0345, 0.0401, 0.0323, 0.0199, 0.00994, 0.0042, 0.00154, 0.000506}},
}

// TestPythonPlugin runs the example plugin written in Python
// (plugins/examples/python) through the host: metadata, the gRPC fallback
// (it serves no direct channel), exact Taylor coefficients against mpmath,
// the domain and identities, classified errors, the conformance suite, and
// a clean end of its process.
func TestPythonPlugin(t *testing.T) {
	launcher, _ := plugintest.RequirePython(t)
	p := load(t, launcher, plugins.Options{})
	assert.False(t, p.Direct(), "a plugin without fast_path is evaluated over gRPC")
	assert.Equal(t, "1.0.0", p.Version())
	m := model(t, p, "linnett")
	info := m.Info()
	assert.Equal(t, p.Path(), info.Origin)
	assert.Equal(t, 64, info.MaxOrder)
	require.Len(t, info.Params, 4)
	for i, name := range []string{"De", "re", "m", "n"} {
		assert.Equal(t, name, info.Params[i].Name)
	}
	assert.Contains(t, info.Reference, "Linnett")

	pot, err := m.New(linnettParams)
	require.NoError(t, err)
	d := pot.Domain()
	assert.Equal(t, core.Domain{Min: 0, Max: math.Inf(1), Limit: 0, EquilibriumGuess: 1.27}, d)

	const n = 8
	for _, ref := range linnettReference {
		got := make([]float64, n+1)
		require.NoError(t, pot.Taylor(n, ref.r, got))
		for k := range got {
			// The coefficients are exact up to rounding in the difference
			// of the two terms: 1e-13 of their size (measured ≤ 8e-16).
			assert.InDelta(t, ref.c[k], got[k], 1e-13*ref.scale[k], "c_%d at r = %g Å", k, ref.r[0])
		}
	}

	// One call for many points and orders, as the host batches them.
	rs := []float64{0.9, 1.27, 1.6, 2.5, 4}
	all := make([]float64, len(rs)*(n+1))
	require.NoError(t, pot.Taylor(n, rs, all))
	for i, ref := range linnettReference {
		one := make([]float64, n+1)
		require.NoError(t, pot.Taylor(n, ref.r, one))
		assert.Equal(t, one, all[i*(n+1):(i+1)*(n+1)], "batch = single point, bit for bit")
	}

	id, ok := pot.(conformance.Identifier)
	require.True(t, ok)
	ids := id.Identities()
	require.Len(t, ids, 3)
	// V″(re) = 73.562817922096021183 eV/Å² (reference.py, mpmath).
	assert.InDelta(t, 73.562817922096021183, ids[2].Value, 1e-12)

	t.Run("errors", func(t *testing.T) {
		_, err := m.New([]float64{4.6, 1.27, 3, 2.5}) // n·re = 3.175 > m = 3
		require.ErrorIs(t, err, core.ErrParam)
		assert.Contains(t, err.Error(), "must be less than m")
		_, err = m.New([]float64{4.6, 1.27, 6})
		require.ErrorIs(t, err, core.ErrParam)

		dst := make([]float64, 3)
		err = pot.Taylor(2, []float64{1e-300}, dst) // (re/r)^m overflows
		require.ErrorIs(t, err, core.ErrDomain)
		var pe *core.PointError
		require.ErrorAs(t, err, &pe)
		assert.Equal(t, 1e-300, pe.R)
		for _, r := range []float64{0, -1, math.NaN(), math.Inf(1)} {
			require.ErrorIs(t, pot.Taylor(2, []float64{1.27, r}, make([]float64, 6)), core.ErrDomain, "r = %g", r)
		}
		require.ErrorIs(t, pot.Taylor(65, []float64{1.27}, make([]float64, 66)), core.ErrOrder)
		_, _, err = m.(core.Matcher).Match(core.Target{Re: 1.27, Depth: 4.6, K: 70})
		require.ErrorIs(t, err, core.ErrUnsupported)
	})

	t.Run("conformance", func(t *testing.T) {
		conformance.Test(t, m, linnettParams)
	})

	pid := p.Pid()
	require.Positive(t, pid)
	require.NoError(t, p.Close())
	requireGone(t, pid)
	script := pythonScript(t, launcher)
	assert.Empty(t, plugintest.ProcsWithArg(script), "no Python plugin process left")
}

// pythonScript returns the path of the script the launcher runs, as it
// names it (symbolic links resolved).
func pythonScript(t *testing.T, launcher string) string {
	t.Helper()
	dir, err := filepath.EvalSymlinks(filepath.Dir(launcher))
	require.NoError(t, err)
	return filepath.Join(dir, "linnett.py")
}

// startPython starts the launcher as pairwell's host would (cookie,
// protocol versions, socket directory), but as the child of a shell that
// the test can kill. It returns the shell, the plugin's pid and the
// handshake line.
func startPython(t *testing.T, launcher string) (*exec.Cmd, int, string) {
	t.Helper()
	sock := t.TempDir()
	sh := exec.Command("sh", "-c", `"$1" & echo "pid $!"; wait`, "sh", launcher)
	sh.Env = append(os.Environ(), plugins.MagicCookieKey+"="+plugins.MagicCookieValue,
		"PLUGIN_PROTOCOL_VERSIONS=2", "PLUGIN_UNIX_SOCKET_DIR="+sock)
	out, err := sh.StdoutPipe()
	require.NoError(t, err)
	require.NoError(t, sh.Start())
	lines := make(chan string, 2)
	go func() {
		sc := bufio.NewScanner(out)
		for sc.Scan() {
			lines <- sc.Text()
		}
		close(lines)
	}()
	var pid int
	var handshake string
	timeout := time.After(20 * time.Second)
	for pid == 0 || handshake == "" {
		select {
		case l, ok := <-lines:
			require.True(t, ok, "the plugin ended before its handshake")
			if rest, found := strings.CutPrefix(l, "pid "); found {
				pid, err = strconv.Atoi(rest)
				require.NoError(t, err)
			} else {
				handshake = l
			}
		case <-timeout:
			t.Fatal("no handshake within 20 s")
		}
	}
	t.Cleanup(func() {
		_ = syscall.Kill(pid, syscall.SIGKILL)
		_ = sh.Process.Kill()
		_ = sh.Wait()
	})
	return sh, pid, handshake
}

// waitGone fails unless process pid has ended (or is a zombie) within d.
func waitGone(t *testing.T, pid int, d time.Duration) {
	t.Helper()
	deadline := time.Now().Add(d)
	for time.Now().Before(deadline) {
		st, err := os.ReadFile(filepath.Join("/proc", strconv.Itoa(pid), "stat"))
		if err != nil || strings.Contains(string(st), ") Z ") {
			return
		}
		time.Sleep(20 * time.Millisecond)
	}
	t.Fatalf("process %d still runs after %v", pid, d)
}

// handshakeLine is go-plugin's: core protocol 1, pairwell protocol 2,
// network, address, protocol grpc, an empty certificate.
var handshakeLine = regexp.MustCompile(`^1\|2\|unix\|(/[^|]+)\|grpc\|$`)

// TestPythonPluginLifecycle checks the parts of go-plugin the Python
// plugin implements itself: the handshake line, the health service
// (grpc.health.v1, service "plugin", SERVING), the controller's Shutdown,
// and that it ends when its parent is gone or on SIGTERM — never hangs.
func TestPythonPluginLifecycle(t *testing.T) {
	launcher, _ := plugintest.RequirePython(t)
	if _, err := os.Stat("/proc/self/stat"); err != nil {
		t.Skip("needs /proc")
	}
	dial := func(t *testing.T, handshake string) *grpc.ClientConn {
		mt := handshakeLine.FindStringSubmatch(handshake)
		require.NotNil(t, mt, "handshake %q", handshake)
		conn, err := grpc.NewClient("unix:"+mt[1], grpc.WithTransportCredentials(insecure.NewCredentials()))
		require.NoError(t, err)
		t.Cleanup(func() { conn.Close() })
		return conn
	}

	t.Run("health and shutdown", func(t *testing.T) {
		_, pid, handshake := startPython(t, launcher)
		conn := dial(t, handshake)
		ctx, cancel := context.WithTimeout(context.Background(), 10*time.Second)
		defer cancel()
		h := grpc_health_v1.NewHealthClient(conn)
		for _, svc := range []string{"plugin", ""} {
			resp, err := h.Check(ctx, &grpc_health_v1.HealthCheckRequest{Service: svc})
			require.NoError(t, err)
			assert.Equal(t, grpc_health_v1.HealthCheckResponse_SERVING, resp.GetStatus(), "service %q", svc)
		}
		desc, err := pb.NewFormsClient(conn).Describe(ctx, &pb.DescribeRequest{})
		require.NoError(t, err)
		assert.Empty(t, desc.GetFastPath(), "no direct channel")
		// go-plugin's GRPCController.Shutdown takes and returns an empty
		// message, the same on the wire as emptypb.Empty.
		require.NoError(t, conn.Invoke(ctx, "/plugin.GRPCController/Shutdown", &emptypb.Empty{}, &emptypb.Empty{}))
		waitGone(t, pid, 5*time.Second)
	})

	t.Run("parent gone", func(t *testing.T) {
		sh, pid, _ := startPython(t, launcher)
		require.NoError(t, sh.Process.Signal(syscall.SIGKILL))
		_ = sh.Wait()
		// It looks for its parent every 0.5 s.
		waitGone(t, pid, 5*time.Second)
	})

	t.Run("SIGTERM", func(t *testing.T) {
		_, pid, _ := startPython(t, launcher)
		require.NoError(t, syscall.Kill(pid, syscall.SIGTERM))
		waitGone(t, pid, 5*time.Second)
	})
}

// TestPythonPluginDirectRun: run by hand, the plugin says what it is and
// exits with status 1.
func TestPythonPluginDirectRun(t *testing.T) {
	launcher, _ := plugintest.RequirePython(t)
	cmd := exec.Command(launcher)
	cmd.Env = append(os.Environ(), plugins.MagicCookieKey+"=")
	out, err := cmd.CombinedOutput()
	var ee *exec.ExitError
	require.True(t, errors.As(err, &ee), "%v", err)
	assert.Equal(t, 1, ee.ExitCode())
	assert.Contains(t, string(out), "pairwell-plugin-linnett is a pairwell plugin 1.0.0 (forms: linnett)")
}

// TestPythonCodeCurrent: the committed pairwell_pb2.py describes the same
// protocol as the Go code generated from plugins/proto/pairwell.proto, so a
// change of the .proto without regenerating the Python code fails here.
func TestPythonCodeCurrent(t *testing.T) {
	launcher, python := plugintest.RequirePython(t)
	cmd := exec.Command(python, "-B", "-c",
		"import base64, pairwell_pb2; print(base64.b64encode(pairwell_pb2.DESCRIPTOR.serialized_pb).decode())")
	cmd.Dir = filepath.Dir(launcher)
	out, err := cmd.Output()
	require.NoError(t, err)
	raw, err := base64.StdEncoding.DecodeString(strings.TrimSpace(string(out)))
	require.NoError(t, err)
	var py descriptorpb.FileDescriptorProto
	require.NoError(t, proto.Unmarshal(raw, &py))
	goDesc := protodesc.ToFileDescriptorProto(pb.File_pairwell_proto)
	// protoc's Python generator leaves out the JSON names protoc-gen-go
	// keeps; they follow from the field names.
	for _, fd := range []*descriptorpb.FileDescriptorProto{&py, goDesc} {
		fd.SourceCodeInfo = nil
		clearJSONNames(fd.MessageType)
	}
	assert.True(t, proto.Equal(goDesc, &py),
		"plugins/examples/python/pairwell_pb2*.py are out of date with plugins/proto/pairwell.proto: "+
			"regenerate them with apt-get install -y protobuf-compiler protobuf-compiler-grpc && "+
			"sh plugins/examples/python/generate.sh, and commit them")
}

func clearJSONNames(msgs []*descriptorpb.DescriptorProto) {
	for _, m := range msgs {
		for _, f := range m.Field {
			f.JsonName = nil
		}
		clearJSONNames(m.NestedType)
	}
}

// BenchmarkPython measures the Python example plugin: its start (Load,
// Describe, Close), one round trip (c₀…c₂ at one r) and a batch (c₀…c₂
// at 4096 r), all over gRPC.
func BenchmarkPython(b *testing.B) {
	launcher, _ := plugintest.RequirePython(b)
	b.Run("start", func(b *testing.B) {
		for b.Loop() {
			p, err := plugins.Load(context.Background(), launcher, plugins.Options{})
			if err != nil {
				b.Fatal(err)
			}
			p.Close()
		}
	})
	pot, err := model(b, load(b, launcher, plugins.Options{}), "linnett").New(linnettParams)
	require.NoError(b, err)
	for _, n := range []int{1, 4096} {
		r := make([]float64, n)
		for i := range r {
			r[i] = 0.9 + 4*float64(i)/float64(n)
		}
		dst := make([]float64, 3*n)
		b.Run(strconv.Itoa(n), func(b *testing.B) {
			for b.Loop() {
				if err := pot.Taylor(2, r, dst); err != nil {
					b.Fatal(err)
				}
			}
			b.ReportMetric(float64(b.N)*float64(n)/b.Elapsed().Seconds(), "points/s")
		})
	}
}
