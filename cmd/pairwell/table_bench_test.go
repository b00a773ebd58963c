package main

import (
	"io"
	"strings"
	"testing"
)

// BenchmarkTable: pairwell table of 10⁵ points in process (issue 16
// target: ≤ 100 ms for the whole process), for a built-in and a formula
// form of the library, CSV to a discarded stdout, with and without
// --accuracy.
func BenchmarkTable(b *testing.B) {
	for _, bb := range []struct {
		name string
		args []string
	}{
		{"morse points 1e5 csv", []string{"table", "morse:De=4.6,a=1.87,re=1.27", "--from", "0.9", "--to", "6", "--points", "100000", "--format", "csv"}},
		{"morse points 1e5 json", []string{"table", "morse:De=4.6,a=1.87,re=1.27", "--from", "0.9", "--to", "6", "--points", "100000", "--format", "json"}},
		{"rydberg points 1e5 csv", []string{"table", "rydberg:De=4.6,a=2.6,re=1.27", "--from", "0.9", "--to", "6", "--points", "100000", "--format", "csv"}},
		{"lj accuracy 1e-9", []string{"table", "lj:epsilon=120K,sigma=3.4", "--from", "3", "--to", "12", "--accuracy", "1e-9", "--format", "csv"}},
	} {
		b.Run(bb.name, func(b *testing.B) {
			for b.Loop() {
				var errOut strings.Builder
				if code := run(bb.args, strings.NewReader(""), io.Discard, &errOut); code != 0 {
					b.Fatal(errOut.String())
				}
			}
		})
	}
}
