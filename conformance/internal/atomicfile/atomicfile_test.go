package atomicfile

import (
	"errors"
	"io"
	"os"
	"path/filepath"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

func TestWrite(t *testing.T) {
	dir := t.TempDir()
	path := filepath.Join(dir, "out.json")
	require.NoError(t, Write(path, 0o644, func(w io.Writer) error {
		_, err := io.WriteString(w, "first")
		return err
	}))
	got, err := os.ReadFile(path)
	require.NoError(t, err)
	assert.Equal(t, "first", string(got))

	// A failing writer leaves the old content and no temporary file.
	boom := errors.New("boom")
	err = Write(path, 0o644, func(w io.Writer) error {
		io.WriteString(w, "half")
		return boom
	})
	require.ErrorIs(t, err, boom)
	got, err = os.ReadFile(path)
	require.NoError(t, err)
	assert.Equal(t, "first", string(got))
	entries, err := os.ReadDir(dir)
	require.NoError(t, err)
	assert.Len(t, entries, 1, "temporary file left behind")

	// A missing directory is an error.
	require.Error(t, Write(filepath.Join(dir, "no", "such", "x"), 0o644, func(io.Writer) error { return nil }))
}
