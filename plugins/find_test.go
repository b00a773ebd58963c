package plugins_test

import (
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"github.com/pairwell/pairwell/plugins"
)

func TestParseRef(t *testing.T) {
	sum := strings.Repeat("0a", 32)
	r, err := plugins.ParseRef("/opt/p/pairwell-plugin-x@sha256:" + strings.ToUpper(sum))
	require.NoError(t, err)
	assert.Equal(t, "/opt/p/pairwell-plugin-x", r.Path)
	assert.Len(t, r.SHA256, 32)
	assert.Equal(t, "/opt/p/pairwell-plugin-x@sha256:"+sum, r.String())

	r, err = plugins.ParseRef("dir@home/plugin")
	require.NoError(t, err)
	assert.Equal(t, "dir@home/plugin", r.Path, "an @ without sha256: is part of the path")
	assert.Nil(t, r.SHA256)

	for _, bad := range []string{"", "@sha256:" + sum, "p@sha256:", "p@sha256:xyz", "p@sha256:" + sum[:62]} {
		_, err := plugins.ParseRef(bad)
		assert.ErrorIs(t, err, plugins.ErrRef, "%q", bad)
	}
}

func TestDiscover(t *testing.T) {
	a, b := t.TempDir(), t.TempDir()
	write := func(dir, name string, mode os.FileMode) string {
		p := filepath.Join(dir, name)
		require.NoError(t, os.WriteFile(p, []byte("#!/bin/sh\n"), mode))
		return p
	}
	z := write(a, "pairwell-plugin-z", 0o755)
	y := write(a, "pairwell-plugin-y", 0o755)
	write(a, "pairwell-plugin-data", 0o644) // not executable
	write(a, "other", 0o755)                // not named like a plugin
	require.NoError(t, os.Mkdir(filepath.Join(a, "pairwell-plugin-dir"), 0o755))
	x := filepath.Join(b, "pairwell-plugin-x")
	require.NoError(t, os.Symlink(z, x))
	list := strings.Join([]string{a, "", filepath.Join(a, "missing"), b}, string(filepath.ListSeparator))
	found, err := plugins.Discover(list)
	require.NoError(t, err)
	assert.Equal(t, []string{y, z, x}, found)

	found, err = plugins.Discover("")
	require.NoError(t, err)
	assert.Empty(t, found)
}

func TestLock(t *testing.T) {
	dir := t.TempDir()
	s1, s2 := strings.Repeat("11", 32), strings.Repeat("22", 32)
	text := "# pairwell plugins\n\n" + s1 + "  rel/pairwell-plugin-a\n" + s2 + " */abs/pairwell-plugin-b\n"
	l, err := plugins.ParseLock(strings.NewReader(text), dir)
	require.NoError(t, err)
	sum, ok := l.Lookup(filepath.Join(dir, "rel", "pairwell-plugin-a"))
	assert.True(t, ok)
	assert.Equal(t, byte(0x11), sum[0])
	sum, ok = l.Lookup("/abs/pairwell-plugin-b")
	assert.True(t, ok)
	assert.Equal(t, byte(0x22), sum[31])
	_, ok = l.Lookup("/abs/other")
	assert.False(t, ok)

	for _, bad := range []string{"nothex  p\n", s1 + "\n", s1[:10] + "  p\n"} {
		_, err := plugins.ParseLock(strings.NewReader(bad), dir)
		assert.ErrorIs(t, err, plugins.ErrRef, "%q", bad)
	}

	// A symbolic link to a locked path is locked too.
	target := filepath.Join(dir, "real")
	require.NoError(t, os.WriteFile(target, nil, 0o755))
	link := filepath.Join(dir, "link")
	require.NoError(t, os.Symlink(target, link))
	lockFile := filepath.Join(dir, "plugins.lock")
	require.NoError(t, os.WriteFile(lockFile, []byte(s1+"  real\n"), 0o644))
	l, err = plugins.ReadLock(lockFile)
	require.NoError(t, err)
	_, ok = l.Lookup(link)
	assert.True(t, ok)
	_, err = plugins.ReadLock(filepath.Join(dir, "missing"))
	assert.Error(t, err)
}
