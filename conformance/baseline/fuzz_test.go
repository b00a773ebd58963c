package baseline_test

import (
	"errors"
	"testing"

	"github.com/pairwell/pairwell/conformance/baseline"
)

// FuzzRead: any input is either a baseline or an error wrapping ErrFormat,
// never a panic.
func FuzzRead(f *testing.F) {
	f.Add([]byte(`{"format":"pairwell-baseline","version":1,"entries":[]}`))
	f.Add([]byte(`{}`))
	f.Add([]byte(`[1,2]`))
	f.Fuzz(func(t *testing.T, data []byte) {
		b, err := baseline.Read(data, "fuzz.json")
		if err != nil {
			if !errors.Is(err, baseline.ErrFormat) {
				t.Fatalf("error not wrapping ErrFormat: %v", err)
			}
			return
		}
		if b == nil {
			t.Fatal("nil baseline without error")
		}
	})
}
