package wire

import (
	"context"
	"errors"
	"math"
	"net"
	"path/filepath"
	"sync/atomic"
	"testing"
	"time"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/units"
	"github.com/pairwell/pairwell/models"
	pb "github.com/pairwell/pairwell/plugins/proto"
)

func TestInfoRoundTrip(t *testing.T) {
	for _, m := range models.Builtin() {
		info := m.Info()
		p, err := InfoToProto(info, true)
		require.NoError(t, err)
		back, err := InfoFromProto(p)
		require.NoError(t, err)
		info.Origin = ""
		if info.Aliases == nil {
			info.Aliases = []string{}
		}
		if back.Aliases == nil {
			back.Aliases = []string{}
		}
		assert.Equal(t, info, back)
	}
	// Every named dimension travels; products without a name do not.
	for _, d := range []units.Dimension{units.Dimensionless, units.Energy, units.Length, units.InverseLength,
		units.ForceConstant, units.Dispersion, units.Mass, units.Time, units.Temperature} {
		p, ok := DimensionToProto(d)
		require.True(t, ok, "%v", d)
		back, ok := DimensionFromProto(p)
		require.True(t, ok)
		assert.Equal(t, d, back)
	}
	_, ok := DimensionToProto(units.Energy + 8*units.Length)
	assert.False(t, ok)
}

func TestCheckInfo(t *testing.T) {
	good := func() *pb.ModelInfo {
		return &pb.ModelInfo{Key: "x", Params: []*pb.Param{{Name: "a", Dimension: pb.Dimension_DIMENSION_LENGTH}}}
	}
	require.NoError(t, CheckInfo(good()))
	for name, mutate := range map[string]func(*pb.ModelInfo){
		"empty key":     func(m *pb.ModelInfo) { m.Key = " " },
		"colon in key":  func(m *pb.ModelInfo) { m.Key = "a:b" },
		"negative max":  func(m *pb.ModelInfo) { m.MaxOrder = -1 },
		"no dimension":  func(m *pb.ModelInfo) { m.Params[0].Dimension = pb.Dimension_DIMENSION_UNSPECIFIED },
		"unknown dim":   func(m *pb.ModelInfo) { m.Params[0].Dimension = 99 },
		"unnamed param": func(m *pb.ModelInfo) { m.Params[0].Name = "" },
		"twice":         func(m *pb.ModelInfo) { m.Params = append(m.Params, m.Params[0]) },
	} {
		m := good()
		mutate(m)
		assert.Error(t, CheckInfo(m), name)
	}
}

func TestErrorKinds(t *testing.T) {
	for _, sentinel := range []error{core.ErrDomain, core.ErrOrder, core.ErrParam, core.ErrNoMinimum, core.ErrLength, core.ErrNoConvergence} {
		err := ErrorFromFailure(FailureFromError(&core.PointError{Err: sentinel}))
		assert.ErrorIs(t, err, sentinel)
	}
	other := ErrorFromFailure(FailureFromError(errors.New("boom")))
	assert.Equal(t, "boom", other.Error())
	assert.NoError(t, errors.Unwrap(other))
}

func TestNewServerRejects(t *testing.T) {
	_, err := NewServer("1", nil)
	assert.Error(t, err)
	_, err = NewServer("1", []core.Model{models.Morse{}, models.Morse{}})
	assert.ErrorContains(t, err, "already used")
}

// fastPair serves the built-in Morse, with filter, on a direct channel in
// a temporary directory and returns a client and an open handle.
func fastPair(t *testing.T, filter func(uint64, []float64) []float64) (*Server, *FastClient, uint64) {
	t.Helper()
	srv, err := NewServer("1", []core.Model{models.Morse{}})
	require.NoError(t, err)
	srv.Filter = filter
	l, err := net.Listen("unix", filepath.Join(t.TempDir(), "s"))
	require.NoError(t, err)
	t.Cleanup(func() { l.Close() })
	go srv.serveFast(l)
	fc, err := DialFast(l.Addr().String(), time.Second)
	require.NoError(t, err)
	t.Cleanup(fc.Close)
	resp, err := srv.Open(context.Background(), &pb.OpenRequest{Model: "morse", Params: []float64{4.6, 1.87, 1.27}})
	require.NoError(t, err)
	require.Nil(t, resp.GetFailure())
	return srv, fc, resp.GetHandle()
}

func TestFastChannel(t *testing.T) {
	var extra atomic.Bool // makes the server send one value too many
	_, fc, h := fastPair(t, func(_ uint64, v []float64) []float64 {
		if extra.Load() {
			return append(v, math.Pi)
		}
		return v
	})
	want, err := models.NewMorse(4.6, 1.87, 1.27)
	require.NoError(t, err)

	rs := []float64{0.9, 1.27, 2, 5}
	got := make([]float64, 4*len(rs))
	pf, f, err := fc.Evaluate(time.Second, h, 3, rs, got)
	require.NoError(t, err)
	require.Nil(t, pf)
	require.Nil(t, f)
	exp := make([]float64, 4*len(rs))
	require.NoError(t, want.Taylor(3, rs, exp))
	assert.Equal(t, exp, got, "bit-exact transport")

	pf, _, err = fc.Evaluate(time.Second, h, 1, []float64{1, -1}, make([]float64, 4))
	require.NoError(t, err)
	require.NotNil(t, pf)
	assert.Equal(t, int64(1), pf.GetIndex())
	assert.ErrorIs(t, ErrorFromFailure(pf.GetFailure()), core.ErrDomain)

	_, f, err = fc.Evaluate(time.Second, h+7, 0, []float64{1}, make([]float64, 1))
	require.NoError(t, err)
	assert.Contains(t, f.GetMessage(), "unknown handle")

	// A wrong count is reported, and the connection stays usable.
	extra.Store(true)
	_, _, err = fc.Evaluate(time.Second, h, 0, []float64{1}, make([]float64, 1))
	assert.ErrorIs(t, err, ErrBadCount)
	extra.Store(false)
	_, _, err = fc.Evaluate(time.Second, h, 0, []float64{1}, make([]float64, 1))
	assert.NoError(t, err)

	fc.Close()
	_, _, err = fc.Evaluate(time.Second, h, 0, []float64{1}, make([]float64, 1))
	assert.ErrorIs(t, err, net.ErrClosed)
}

func TestFastChannelIgnoresGarbage(t *testing.T) {
	srv, err := NewServer("1", []core.Model{models.Morse{}})
	require.NoError(t, err)
	a, b := net.Pipe()
	done := make(chan struct{})
	go func() { srv.serveFastConn(b); close(done) }()
	_, err = a.Write(make([]byte, fastRequestHdr)) // wrong magic
	require.NoError(t, err)
	select {
	case <-done:
	case <-time.After(time.Second):
		t.Fatal("the server kept a connection that sent garbage")
	}
	a.Close()
}
