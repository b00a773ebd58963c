package main

import (
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

var demoPictureFiles = []string{"compare.png", "expansion.png", "fit.png", "motion.png", "period.png", "taylor.png", "virial.png"}

func requireDemoPictures(t *testing.T, dir string) {
	t.Helper()
	entries, err := os.ReadDir(dir)
	require.NoError(t, err)
	var got []string
	for _, e := range entries {
		got = append(got, e.Name())
	}
	require.Equal(t, demoPictureFiles, got)
	for _, f := range got {
		requirePNG(t, filepath.Join(dir, f))
	}
}

func TestPlotDemoPictures(t *testing.T) {
	dir := filepath.Join(t.TempDir(), "pics")
	code, out, errOut := runCLI(t, "demo", "--out", dir)
	require.Equal(t, 0, code, errOut)
	assert.Empty(t, errOut)
	assert.Contains(t, out, "== Pictures, written to "+dir+string(filepath.Separator)+"\n")
	for _, f := range demoPictureFiles {
		assert.Contains(t, out, "  "+f)
	}
	requireDemoPictures(t, dir)

	// JSON on stdout stays JSON; the pictures are listed on stderr.
	dir = filepath.Join(t.TempDir(), "json")
	code, out, errOut = runCLI(t, "demo", "--format", "json", "--out", dir)
	require.Equal(t, 0, code, errOut)
	var r map[string]any
	require.NoError(t, json.Unmarshal([]byte(out), &r))
	assert.Contains(t, errOut, "written to "+dir)
	requireDemoPictures(t, dir)
}

func TestPlotDemoDefaultFolder(t *testing.T) {
	dir := t.TempDir()
	t.Chdir(dir)
	code, out, errOut := runCLI(t, "demo", "--no-pictures")
	require.Equal(t, 0, code, errOut)
	assert.NotContains(t, out, "Pictures")
	_, err := os.Stat(defaultDemoOut)
	assert.True(t, os.IsNotExist(err), "--no-pictures wrote a folder")

	code, out, errOut = runCLI(t, "demo")
	require.Equal(t, 0, code, errOut)
	assert.Contains(t, out, "== Pictures, written to pairwell-demo"+string(filepath.Separator))
	requireDemoPictures(t, filepath.Join(dir, defaultDemoOut))
}

func TestPlotDemoUnwritable(t *testing.T) {
	file := filepath.Join(t.TempDir(), "file")
	require.NoError(t, os.WriteFile(file, nil, 0o644))
	code, out, errOut := runCLI(t, "demo", "--out", filepath.Join(file, "pics"))
	assert.Equal(t, 1, code)
	assert.Contains(t, out, "What the numbers say", "the text comes first")
	assert.True(t, strings.HasPrefix(errOut, "pairwell: demo pictures: --out"), errOut)
}
