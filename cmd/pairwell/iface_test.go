package main

import (
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// Tests of issue 17: one consistent interface across commands.

func TestPairsAllElements(t *testing.T) {
	for _, pair := range []string{"Au-Au", "Pt-O", "Cs-Cl", "63Cu-63Cu", "H-CL", "h-cl"} {
		code, out, errOut := runCLI(t, "inspect", "morse:De=2.3,a=1.5,re=2.5", "--pair", pair)
		assert.Equal(t, 0, code, "%s: %s", pair, errOut)
		assert.Contains(t, out, "reduced mass", pair)
	}
	code, _, errOut := runCLI(t, "inspect", "morse:De=4.6,a=1.87,re=1.27", "--pair", "HCl")
	assert.Equal(t, 2, code)
	assert.Contains(t, errOut, "did you mean H-Cl?")
}

func TestBrokenPathPluginIsAWarning(t *testing.T) {
	requirePlugins(t)
	dir := t.TempDir()
	require.NoError(t, os.Symlink(pluginBin.rydberg, filepath.Join(dir, "pairwell-plugin-rydberg")))
	broken := filepath.Join(dir, "pairwell-plugin-broken")
	require.NoError(t, os.WriteFile(broken, []byte("#!/bin/sh\necho 'no such library' >&2\nexit 3\n"), 0o755))
	t.Setenv(envPluginPath, dir)

	// A built-in form and the working plugin's form still work; the
	// broken plugin is named in a warning.
	for _, spec := range []string{"morse:De=4.6,a=1.87,re=1.27", rydbergSpec} {
		code, out, errOut := runPlugins(t, "inspect", spec)
		assert.Equal(t, 0, code, "%s: %s", spec, errOut)
		assert.Contains(t, out, "equilibrium")
		assert.Contains(t, errOut, "warning: plugin "+broken+" (found through PAIRWELL_PLUGIN_PATH) failed to start")
		assert.Equal(t, 1, strings.Count(errOut, "\n"), errOut)
	}
	// A form nobody serves: the broken plugin may serve it, so the error
	// names it and is a plugin failure (exit 1).
	code, _, errOut := runPlugins(t, "inspect", "buckingam:A=1,rho=0.3,C=1")
	assert.Equal(t, exitFailure, code)
	assert.Contains(t, errOut, `unknown model "buckingam" (did you mean buckingham?)`)
	assert.Contains(t, errOut, "it may be served by a plugin that failed to start: plugin "+broken)

	// Named explicitly, the same plugin stops the invocation.
	t.Setenv(envPluginPath, "")
	code, _, errOut = runPlugins(t, "--plugin", broken, "inspect", "morse:De=4.6,a=1.87,re=1.27")
	assert.Equal(t, exitFailure, code)
	assert.Contains(t, errOut, broken)
	assert.NotContains(t, errOut, "warning")
}
