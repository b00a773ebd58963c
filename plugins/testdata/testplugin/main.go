// Command testplugin is the pairwell plugin of the tests. It serves an
// independent implementation of the Morse form, "plugin-morse", and models
// that misbehave on purpose, one fault each:
//
//	crashing-morse   the process exits with status 3 in an evaluation
//	hanging-morse    an evaluation never returns
//	nan-morse        V⁽ⁿ⁾ is NaN for n ≥ 2
//	badlen-morse     evaluations return one value too few
//	panicking-morse  an evaluation panics
//	morse-bad3       V‴ is 10 % too large (its identities are Morse's)
//	morse-badforce   V′ has the wrong sign (its identities are Morse's)
//
// Started under a name containing "badproto" (a symbolic link), it speaks
// protocol version 2 instead, which pairwell refuses. One executable keeps
// the tests' build short.
package main

import (
	"context"
	"fmt"
	"os"
	"path/filepath"
	"strings"

	plugin "github.com/hashicorp/go-plugin"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/plugins/internal/wire"
	pb "github.com/pairwell/pairwell/plugins/proto"
	"github.com/pairwell/pairwell/plugins/testdata/internal/morse"
)

// badLength serves the models but drops the last value of evaluations of
// a BadLength potential.
type badLength struct {
	*wire.Server
}

func (s badLength) Evaluate(ctx context.Context, req *pb.EvaluateRequest) (*pb.EvaluateResponse, error) {
	resp, err := s.Server.Evaluate(ctx, req)
	if p, ok := s.Potential(req.GetHandle()); ok && err == nil && len(resp.Values) > 0 {
		if mp, ok := p.(*morse.Potential); ok && mp.Fault() == morse.BadLength {
			resp.Values = resp.Values[:len(resp.Values)-1]
		}
	}
	return resp, err
}

func main() {
	srv, err := wire.NewServer("0.1.0-test", []core.Model{
		morse.Model{Key: "plugin-morse"},
		morse.Model{Key: "crashing-morse", Fault: morse.Crash},
		morse.Model{Key: "hanging-morse", Fault: morse.Hang},
		morse.Model{Key: "nan-morse", Fault: morse.NaN},
		morse.Model{Key: "badlen-morse", Fault: morse.BadLength},
		morse.Model{Key: "panicking-morse", Fault: morse.Panic},
		morse.Model{Key: "morse-bad3", Fault: morse.Third},
		morse.Model{Key: "morse-badforce", Fault: morse.ForceSign},
	})
	if err != nil {
		fmt.Fprintln(os.Stderr, err)
		os.Exit(1)
	}
	if os.Getenv(wire.MagicCookieKey) != wire.MagicCookieValue {
		fmt.Fprint(os.Stderr, "testplugin: a pairwell test plugin; pairwell starts it\n")
		os.Exit(1)
	}
	go wire.ExitWithParent()
	version := uint(wire.ProtocolVersion)
	if strings.Contains(filepath.Base(os.Args[0]), "badproto") {
		version++
	}
	plugin.Serve(wire.ServeConfig(version, badLength{srv}, os.Stderr))
}
