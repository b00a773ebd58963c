package fileio

import (
	"errors"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"runtime"
	"syscall"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

func writeString(s string) func(io.Writer) error {
	return func(w io.Writer) error { _, err := io.WriteString(w, s); return err }
}

// entries lists the names in dir.
func entries(t *testing.T, dir string) []string {
	t.Helper()
	es, err := os.ReadDir(dir)
	require.NoError(t, err)
	var names []string
	for _, e := range es {
		names = append(names, e.Name())
	}
	return names
}

func TestWriteNewAndReplace(t *testing.T) {
	for _, named := range []bool{false, true} {
		dir := t.TempDir()
		r := &Run{named: named}
		path := filepath.Join(dir, "out.csv")
		require.NoError(t, r.WriteFile(path, writeString("one")))
		got, err := os.ReadFile(path)
		require.NoError(t, err)
		assert.Equal(t, "one", string(got))

		// A new file gets 0666 less the umask, as any file created here.
		ref := filepath.Join(dir, "ref")
		f, err := os.OpenFile(ref, os.O_CREATE|os.O_WRONLY, 0o666)
		require.NoError(t, err)
		f.Close()
		stRef, _ := os.Stat(ref)
		st, _ := os.Stat(path)
		assert.Equal(t, stRef.Mode().Perm(), st.Mode().Perm())
		os.Remove(ref)

		// A private file stays private.
		require.NoError(t, os.Chmod(path, 0o600))
		require.NoError(t, r.WriteFile(path, writeString("two")))
		st, _ = os.Stat(path)
		assert.Equal(t, fs.FileMode(0o600), st.Mode().Perm())
		got, _ = os.ReadFile(path)
		assert.Equal(t, "two", string(got))
		assert.Equal(t, []string{"out.csv"}, entries(t, dir), "no temporary file left")
	}
}

func TestWriteErrorLeavesTarget(t *testing.T) {
	for _, named := range []bool{false, true} {
		dir := t.TempDir()
		r := &Run{named: named}
		path := filepath.Join(dir, "out.csv")
		require.NoError(t, os.WriteFile(path, []byte("old"), 0o644))
		boom := errors.New("boom")
		err := r.WriteFile(path, func(w io.Writer) error {
			io.WriteString(w, "half")
			return boom
		})
		assert.ErrorIs(t, err, boom)
		got, _ := os.ReadFile(path)
		assert.Equal(t, "old", string(got))
		assert.Equal(t, []string{"out.csv"}, entries(t, dir))
	}
}

// TestUnnamedWhileWriting: on Linux the content in progress has no name,
// so nothing can be left behind by a process killed mid-write.
func TestUnnamedWhileWriting(t *testing.T) {
	if runtime.GOOS != "linux" {
		t.Skip("O_TMPFILE is Linux only")
	}
	dir := t.TempDir()
	path := filepath.Join(dir, "out.csv")
	require.NoError(t, (&Run{}).WriteFile(path, func(w io.Writer) error {
		assert.Empty(t, entries(t, dir), "no name while writing")
		_, err := io.WriteString(w, "x")
		return err
	}))
}

// TestRemoveTemps: a signal arriving mid-write removes the named
// temporary file.
func TestRemoveTemps(t *testing.T) {
	dir := t.TempDir()
	r := &Run{named: true}
	path := filepath.Join(dir, "out.csv")
	err := r.WriteFile(path, func(w io.Writer) error {
		assert.Len(t, entries(t, dir), 1, "the named temporary file")
		r.RemoveTemps() // what the signal handler does
		assert.Empty(t, entries(t, dir))
		return errors.New("interrupted")
	})
	require.Error(t, err)
	assert.Empty(t, entries(t, dir))
}

func TestWriteRefusals(t *testing.T) {
	dir := t.TempDir()
	r := &Run{}
	input := filepath.Join(dir, "set.toml")
	require.NoError(t, os.WriteFile(input, []byte("input"), 0o644))
	_, err := r.ReadFile(input, 100)
	require.NoError(t, err)
	hard := filepath.Join(dir, "hard.toml")
	require.NoError(t, os.Link(input, hard))
	link := filepath.Join(dir, "link.csv")
	require.NoError(t, os.Symlink(filepath.Join(dir, "elsewhere"), link))
	fifo := filepath.Join(dir, "fifo")
	require.NoError(t, syscall.Mkfifo(fifo, 0o644))
	tests := []struct {
		path, want string
	}{
		{input, "input of this run"},
		{hard, "same file as the input"},
		{dir + "/./set.toml", "same file as the input"},
		{link, "symbolic link"},
		{fifo, "a FIFO"},
		{dir, "a directory"},
		{"/dev/null", "a device"},
		{"-", "standard output"},
		{"", "empty file name"},
	}
	for _, tt := range tests {
		err := r.WriteFile(tt.path, writeString("x"))
		assert.ErrorIs(t, err, ErrRefused, tt.path)
		assert.ErrorContains(t, err, tt.want, tt.path)
	}
	got, _ := os.ReadFile(input)
	assert.Equal(t, "input", string(got))
	_, err = os.Lstat(filepath.Join(dir, "elsewhere"))
	assert.ErrorIs(t, err, fs.ErrNotExist, "the link was not followed")
	st, _ := os.Lstat(fifo)
	assert.True(t, st.Mode()&fs.ModeNamedPipe != 0, "the FIFO is still a FIFO")
	st, _ = os.Lstat("/dev/null")
	assert.True(t, st.Mode()&fs.ModeDevice != 0)
}

func TestReadFileCaps(t *testing.T) {
	dir := t.TempDir()
	r := &Run{}
	path := filepath.Join(dir, "f")
	require.NoError(t, os.WriteFile(path, []byte("0123456789"), 0o644))
	data, err := r.ReadFile(path, 10)
	require.NoError(t, err)
	assert.Equal(t, "0123456789", string(data))
	_, err = r.ReadFile(path, 9)
	assert.ErrorIs(t, err, ErrTooLarge)
	assert.ErrorContains(t, err, "the limit is 9")

	fifo := filepath.Join(dir, "fifo")
	require.NoError(t, syscall.Mkfifo(fifo, 0o644))
	_, err = r.ReadFile(fifo, 10) // must not block waiting for a writer
	assert.ErrorIs(t, err, ErrRefused)
	_, err = r.ReadFile("/dev/zero", 10)
	assert.ErrorIs(t, err, ErrRefused)
	assert.ErrorContains(t, err, "a device")
	_, err = r.ReadFile(dir, 10)
	assert.ErrorIs(t, err, ErrRefused)
	_, err = r.ReadFile(filepath.Join(dir, "missing"), 10)
	assert.ErrorIs(t, err, fs.ErrNotExist)
}

func TestNilRun(t *testing.T) {
	dir := t.TempDir()
	path := filepath.Join(dir, "out")
	require.NoError(t, WriteFile(path, writeString("x")))
	var r *Run
	r.Input(path)
	r.RemoveTemps()
	_, err := r.Check(path)
	assert.NoError(t, err)
}
