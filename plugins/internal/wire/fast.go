package wire

import (
	"bufio"
	"encoding/binary"
	"errors"
	"fmt"
	"io"
	"math"
	"net"
	"os"
	"path/filepath"
	"sync"
	"time"

	plugin "github.com/hashicorp/go-plugin"
	"google.golang.org/protobuf/proto"

	pb "github.com/pairwell/pairwell/plugins/proto"
)

// The direct evaluation channel carries Evaluate requests in a fixed
// binary framing over a Unix socket, one request at a time per
// connection, so that an evaluation costs one write and one read each way
// instead of gRPC's goroutine hand-offs. All numbers are little-endian.
// The request has the shape of EvaluateRequest (handle, highest order n,
// separations) and the answer that of EvaluateResponse: the (n+1)·count
// Taylor coefficients, row-major, c_k(r[i]) at i·(n+1)+k.
//
// Request: a 24-byte header, then count float64 separations.
//
//	u32 magic 0x32455750 ("PWE2", protocol 2)   u32 reserved, 0
//	u64 handle                                   i32 order n   u32 count
//
// Response: a 16-byte header, then the values or the failure.
//
//	u32 status (0 ok, 1 failure, 2 point failure)   u32 error kind
//	u64 n: ok, the number of float64 values that follow;
//	       point failure, the index of the point; failure, 0
//	on failure: u32 length and the message in UTF-8
//
// EvaluateSets requests (offered when Describe says fast_sets) share the
// 24-byte request header, with another magic and the length of an
// EvaluateSetsRequest in protobuf encoding, which follows; the answer is a
// 16-byte header, status 0, kind 0 and the length of the
// EvaluateSetsResponse in protobuf encoding, which follows:
//
//	u32 magic 0x32535750 ("PWS2")   u32 reserved, 0
//	u64 length of the request       u64 reserved, 0
const (
	fastSetsMagic = 0x32535750

	fastMagic       = 0x32455750
	fastRequestHdr  = 24
	fastResponseHdr = 16

	statusOK           = 0
	statusFailure      = 1
	statusPointFailure = 2

	// maxFastValues bounds the values of one request or response, against
	// a corrupt header: 64 Mi float64 (512 MiB).
	maxFastValues = 1 << 26
)

// ListenFast starts serving the direct evaluation channel on a Unix socket
// in the directory go-plugin gives the plugin (PLUGIN_UNIX_SOCKET_DIR, made
// and removed by the host), and makes Describe advertise it. Without that
// directory it does nothing: the host then evaluates over gRPC.
func (s *Server) ListenFast() error {
	dir := os.Getenv(plugin.EnvUnixSocketDir)
	if dir == "" {
		return nil
	}
	path := filepath.Join(dir, fmt.Sprintf("pairwell-eval-%d.sock", os.Getpid()))
	l, err := net.Listen("unix", path)
	if err != nil {
		return fmt.Errorf("direct evaluation channel: %w", err)
	}
	s.fastAddr = path
	go s.serveFast(l)
	return nil
}

func (s *Server) serveFast(l net.Listener) {
	for {
		c, err := l.Accept()
		if err != nil {
			return
		}
		go s.serveFastConn(c)
	}
}

// serveFastConn answers the requests of one connection until it closes or
// sends something that is not a request.
func (s *Server) serveFastConn(c net.Conn) {
	defer c.Close()
	br := bufio.NewReaderSize(c, 64<<10)
	var (
		hdr  [fastRequestHdr]byte
		raw  []byte // scratch on big-endian platforms
		r    []float64
		vals []float64
		out  []byte
		err  error
	)
	for {
		if _, err := io.ReadFull(br, hdr[:]); err != nil {
			return
		}
		le := binary.LittleEndian
		if le.Uint32(hdr[4:]) != 0 {
			return
		}
		if le.Uint32(hdr[0:]) == fastSetsMagic {
			if out, err = s.serveFastSets(br, hdr, out[:0]); err != nil {
				return
			}
			if _, err := c.Write(out); err != nil {
				return
			}
			continue
		}
		if le.Uint32(hdr[0:]) != fastMagic {
			return
		}
		handle := le.Uint64(hdr[8:])
		order := int(int32(le.Uint32(hdr[16:])))
		count := int(le.Uint32(hdr[20:]))
		if count > maxFastValues {
			return
		}
		r = grow(r, count)
		if raw, err = readFloats(br, r, raw); err != nil {
			return
		}
		values, pf, f := s.evaluate(handle, order, r, vals)
		if cap(values) > cap(vals) {
			vals = values
		}
		out = appendResponse(out[:0], values, pf, f)
		if err := writeFloats(c, out, values, pf == nil && f == nil); err != nil {
			return
		}
	}
}

// serveFastSets answers the EvaluateSets request whose header is hdr,
// appending the answer to out.
func (s *Server) serveFastSets(br io.Reader, hdr [fastRequestHdr]byte, out []byte) ([]byte, error) {
	le := binary.LittleEndian
	n := le.Uint64(hdr[8:])
	if n > 8*maxFastValues || le.Uint64(hdr[16:]) != 0 {
		return out, ErrFastProtocol
	}
	msg := make([]byte, n)
	if _, err := io.ReadFull(br, msg); err != nil {
		return out, err
	}
	req := &pb.EvaluateSetsRequest{}
	var resp *pb.EvaluateSetsResponse
	if err := proto.Unmarshal(msg, req); err != nil {
		resp = &pb.EvaluateSetsResponse{Failure: &pb.Failure{Message: fmt.Sprintf("EvaluateSets on the direct channel: %v", err)}}
	} else {
		resp = s.evaluateSets(req)
	}
	body, err := proto.Marshal(resp)
	if err != nil {
		return out, err
	}
	out = le.AppendUint32(out, statusOK)
	out = le.AppendUint32(out, 0)
	out = le.AppendUint64(out, uint64(len(body)))
	return append(out, body...), nil
}

func appendResponse(b []byte, values []float64, pf *pb.PointFailure, f *pb.Failure) []byte {
	le := binary.LittleEndian
	switch {
	case f != nil:
		b = le.AppendUint32(b, statusFailure)
		b = le.AppendUint32(b, uint32(f.GetKind()))
		b = le.AppendUint64(b, 0)
		return appendMessage(b, f.GetMessage())
	case pf != nil:
		b = le.AppendUint32(b, statusPointFailure)
		b = le.AppendUint32(b, uint32(pf.GetFailure().GetKind()))
		b = le.AppendUint64(b, uint64(pf.GetIndex()))
		return appendMessage(b, pf.GetFailure().GetMessage())
	}
	b = le.AppendUint32(b, statusOK)
	b = le.AppendUint32(b, 0)
	return le.AppendUint64(b, uint64(len(values)))
}

// writeFloats writes hdr and, if withValues, the values after it, in one
// system call where the platform allows (writev).
func writeFloats(c net.Conn, hdr []byte, values []float64, withValues bool) error {
	if !withValues || len(values) == 0 {
		_, err := c.Write(hdr)
		return err
	}
	if raw, ok := floatBytes(values); ok {
		bufs := net.Buffers{hdr, raw}
		_, err := bufs.WriteTo(c)
		return err
	}
	_, err := c.Write(appendFloats(hdr, values))
	return err
}

// readFloats fills dst with len(dst) little-endian float64 read from r,
// directly into dst's memory where the platform allows; scratch is a
// buffer for the other platforms, returned for reuse.
func readFloats(r io.Reader, dst []float64, scratch []byte) ([]byte, error) {
	if raw, ok := floatBytes(dst); ok {
		_, err := io.ReadFull(r, raw)
		return scratch, err
	}
	scratch = growBytes(scratch[:0], 8*len(dst))
	if _, err := io.ReadFull(r, scratch); err != nil {
		return scratch, err
	}
	decodeFloats(dst, scratch)
	return scratch, nil
}

func appendMessage(b []byte, msg string) []byte {
	b = binary.LittleEndian.AppendUint32(b, uint32(len(msg)))
	return append(b, msg...)
}

func appendFloats(b []byte, v []float64) []byte {
	n := len(b)
	b = growBytes(b, n+8*len(v))
	for i, x := range v {
		binary.LittleEndian.PutUint64(b[n+8*i:], math.Float64bits(x))
	}
	return b
}

func decodeFloats(dst []float64, raw []byte) {
	for i := range dst {
		dst[i] = math.Float64frombits(binary.LittleEndian.Uint64(raw[8*i:]))
	}
}

// growBytes returns b resliced to n, reallocated if too short; the first
// len(b) bytes are kept.
func growBytes(b []byte, n int) []byte {
	if cap(b) >= n {
		return b[:n]
	}
	nb := make([]byte, n, n+n/4)
	copy(nb, b)
	return nb
}

// ErrFastProtocol means the direct evaluation channel received something
// that is not a response.
var ErrFastProtocol = errors.New("malformed response on the direct evaluation channel")

// FastClient is the host end of the direct evaluation channel: a pool of
// connections, one per concurrent call. It is safe for concurrent use.
type FastClient struct {
	addr string

	mu     sync.Mutex
	free   []*fastConn
	all    map[*fastConn]bool
	closed bool
}

type fastConn struct {
	c   net.Conn
	br  *bufio.Reader
	buf []byte
}

// DialFast connects to the channel at addr, within timeout.
func DialFast(addr string, timeout time.Duration) (*FastClient, error) {
	fc := &FastClient{addr: addr, all: make(map[*fastConn]bool)}
	c, err := fc.dial(timeout)
	if err != nil {
		return nil, err
	}
	fc.put(c)
	return fc, nil
}

func (fc *FastClient) dial(timeout time.Duration) (*fastConn, error) {
	c, err := net.DialTimeout("unix", fc.addr, timeout)
	if err != nil {
		return nil, err
	}
	conn := &fastConn{c: c, br: bufio.NewReaderSize(c, 64<<10)}
	fc.mu.Lock()
	defer fc.mu.Unlock()
	if fc.closed {
		c.Close()
		return nil, net.ErrClosed
	}
	fc.all[conn] = true
	return conn, nil
}

func (fc *FastClient) get(timeout time.Duration) (*fastConn, error) {
	fc.mu.Lock()
	if fc.closed {
		fc.mu.Unlock()
		return nil, net.ErrClosed
	}
	if n := len(fc.free); n > 0 {
		c := fc.free[n-1]
		fc.free = fc.free[:n-1]
		fc.mu.Unlock()
		return c, nil
	}
	fc.mu.Unlock()
	return fc.dial(timeout)
}

func (fc *FastClient) put(c *fastConn) {
	fc.mu.Lock()
	defer fc.mu.Unlock()
	if fc.closed {
		c.c.Close()
		return
	}
	fc.free = append(fc.free, c)
}

// discard closes a connection whose state is unknown after an error.
func (fc *FastClient) discard(c *fastConn) {
	c.c.Close()
	fc.mu.Lock()
	delete(fc.all, c)
	fc.mu.Unlock()
}

// Close closes every connection, also those in use: their calls fail.
func (fc *FastClient) Close() {
	fc.mu.Lock()
	defer fc.mu.Unlock()
	fc.closed = true
	for c := range fc.all {
		c.c.Close()
	}
	fc.all, fc.free = nil, nil
}

// Evaluate sends one request and decodes the answer. On success the
// values are stored in dst, and a response with another number of values
// is an error wrapping ErrBadCount. A failure the plugin reported comes
// back in pf or f. err is a transport error (a deadline: os.ErrDeadlineExceeded).
func (fc *FastClient) Evaluate(timeout time.Duration, handle uint64, order int, r, dst []float64) (pf *pb.PointFailure, f *pb.Failure, err error) {
	c, err := fc.get(timeout)
	if err != nil {
		return nil, nil, err
	}
	pf, f, err = c.evaluate(timeout, handle, order, r, dst)
	if err != nil && !errors.Is(err, ErrBadCount) {
		fc.discard(c)
		return nil, nil, err
	}
	fc.put(c)
	return pf, f, err
}

// ErrBadCount means a response carried another number of values than due.
var ErrBadCount = errors.New("wrong number of values")

func (c *fastConn) evaluate(timeout time.Duration, handle uint64, order int, r, dst []float64) (*pb.PointFailure, *pb.Failure, error) {
	if err := c.c.SetDeadline(time.Now().Add(timeout)); err != nil {
		return nil, nil, err
	}
	le := binary.LittleEndian
	b := c.buf[:0]
	b = le.AppendUint32(b, fastMagic)
	b = le.AppendUint32(b, 0)
	b = le.AppendUint64(b, handle)
	b = le.AppendUint32(b, uint32(int32(order)))
	b = le.AppendUint32(b, uint32(len(r)))
	c.buf = b
	if err := writeFloats(c.c, b, r, true); err != nil {
		return nil, nil, err
	}
	var hdr [fastResponseHdr]byte
	if _, err := io.ReadFull(c.br, hdr[:]); err != nil {
		return nil, nil, err
	}
	status, kind, n := le.Uint32(hdr[0:]), pb.ErrorKind(le.Uint32(hdr[4:])), le.Uint64(hdr[8:])
	switch status {
	case statusOK:
		if n > maxFastValues {
			return nil, nil, fmt.Errorf("%w: %d values", ErrFastProtocol, n)
		}
		if int(n) != len(dst) {
			// Read them all to keep the connection in step.
			if _, err := io.CopyN(io.Discard, c.br, int64(8*n)); err != nil {
				return nil, nil, err
			}
			return nil, nil, fmt.Errorf("%w: %d values, want %d", ErrBadCount, n, len(dst))
		}
		var err error
		c.buf, err = readFloats(c.br, dst, c.buf)
		return nil, nil, err
	case statusFailure, statusPointFailure:
		msg, err := c.message()
		if err != nil {
			return nil, nil, err
		}
		fail := &pb.Failure{Kind: kind, Message: msg}
		if status == statusFailure {
			return nil, fail, nil
		}
		return &pb.PointFailure{Index: int64(n), Failure: fail}, nil, nil
	}
	return nil, nil, fmt.Errorf("%w: status %d", ErrFastProtocol, status)
}

// EvaluateSets sends one EvaluateSets request over the channel and
// decodes the answer; err is a transport error (a deadline:
// os.ErrDeadlineExceeded) or ErrFastProtocol.
func (fc *FastClient) EvaluateSets(timeout time.Duration, req *pb.EvaluateSetsRequest) (*pb.EvaluateSetsResponse, error) {
	c, err := fc.get(timeout)
	if err != nil {
		return nil, err
	}
	resp, err := c.evaluateSets(timeout, req)
	if err != nil {
		fc.discard(c)
		return nil, err
	}
	fc.put(c)
	return resp, nil
}

func (c *fastConn) evaluateSets(timeout time.Duration, req *pb.EvaluateSetsRequest) (*pb.EvaluateSetsResponse, error) {
	if err := c.c.SetDeadline(time.Now().Add(timeout)); err != nil {
		return nil, err
	}
	body, err := proto.Marshal(req)
	if err != nil {
		return nil, err
	}
	le := binary.LittleEndian
	b := c.buf[:0]
	b = le.AppendUint32(b, fastSetsMagic)
	b = le.AppendUint32(b, 0)
	b = le.AppendUint64(b, uint64(len(body)))
	b = le.AppendUint64(b, 0)
	b = append(b, body...)
	c.buf = b
	if _, err := c.c.Write(b); err != nil {
		return nil, err
	}
	var hdr [fastResponseHdr]byte
	if _, err := io.ReadFull(c.br, hdr[:]); err != nil {
		return nil, err
	}
	n := le.Uint64(hdr[8:])
	if le.Uint32(hdr[0:]) != statusOK || n > 8*maxFastValues {
		return nil, fmt.Errorf("%w: EvaluateSets answer with status %d, %d bytes", ErrFastProtocol, le.Uint32(hdr[0:]), n)
	}
	c.buf = growBytes(c.buf[:0], int(n))
	if _, err := io.ReadFull(c.br, c.buf); err != nil {
		return nil, err
	}
	resp := &pb.EvaluateSetsResponse{}
	if err := proto.Unmarshal(c.buf, resp); err != nil {
		return nil, fmt.Errorf("%w: %v", ErrFastProtocol, err)
	}
	return resp, nil
}

func (c *fastConn) message() (string, error) {
	var l [4]byte
	if _, err := io.ReadFull(c.br, l[:]); err != nil {
		return "", err
	}
	n := binary.LittleEndian.Uint32(l[:])
	if n > 1<<20 {
		return "", fmt.Errorf("%w: message of %d bytes", ErrFastProtocol, n)
	}
	msg := make([]byte, n)
	if _, err := io.ReadFull(c.br, msg); err != nil {
		return "", err
	}
	return string(msg), nil
}
