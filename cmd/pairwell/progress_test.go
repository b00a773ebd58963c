package main

import (
	"bytes"
	"os"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

func TestProgressSilentUnlessTerminal(t *testing.T) {
	noCI := func(string) string { return "" }
	ci := func(k string) string {
		if k == "CI" {
			return "true"
		}
		return ""
	}
	var buf bytes.Buffer
	step, done := newProgress(&buf, noCI, 10, "test")
	for range 10 {
		step()
	}
	done()
	assert.Empty(t, buf.String(), "a buffer is not a terminal")

	f, err := os.CreateTemp(t.TempDir(), "stderr")
	require.NoError(t, err)
	defer f.Close()
	assert.False(t, showProgress(f, noCI), "a regular file is not a terminal")
	assert.False(t, showProgress(os.Stderr, ci), "never in CI logs")
	step, done = newProgress(f, noCI, 3, "test")
	step()
	done()
	done() // idempotent
	st, err := f.Stat()
	require.NoError(t, err)
	assert.Zero(t, st.Size())
}
