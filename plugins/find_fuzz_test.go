package plugins_test

import (
	"strings"
	"testing"

	"github.com/pairwell/pairwell/plugins"
)

// FuzzParseRef: PATH[@sha256:HEX] never panics; a pinned reference has a
// 32-byte digest and formats back to an equivalent reference.
func FuzzParseRef(f *testing.F) {
	f.Add("./pairwell-plugin-rydberg")
	f.Add("/p@sha256:" + strings.Repeat("ab", 32))
	f.Add("@sha256:00")
	f.Fuzz(func(t *testing.T, s string) {
		r, err := plugins.ParseRef(s)
		if err != nil {
			return
		}
		if r.SHA256 != nil && len(r.SHA256) != 32 {
			t.Fatalf("%q: digest of %d bytes", s, len(r.SHA256))
		}
		again, err := plugins.ParseRef(r.String())
		if err != nil || again.Path != r.Path || string(again.SHA256) != string(r.SHA256) {
			t.Fatalf("%q: round trip via %q gave %+v, %v", s, r.String(), again, err)
		}
	})
}

// FuzzParseLock: a lock file never makes the parser panic.
func FuzzParseLock(f *testing.F) {
	f.Add(strings.Repeat("ab", 32) + "  pairwell-plugin-x\n# comment\n")
	f.Add("zz  x\n")
	f.Fuzz(func(t *testing.T, s string) {
		_, _ = plugins.ParseLock(strings.NewReader(s), "/tmp")
	})
}
