package main

import (
	"encoding/json"
	"fmt"
	"io"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"github.com/spf13/cobra"
	"github.com/spf13/pflag"
	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"github.com/pairwell/pairwell/core/levels"
	"github.com/pairwell/pairwell/core/motion"
)

// everyFlag calls fn for every local flag of every command.
func everyFlag(fn func(c *cobra.Command, f *pflag.Flag)) {
	var walk func(c *cobra.Command)
	walk = func(c *cobra.Command) {
		c.LocalFlags().VisitAll(func(f *pflag.Flag) { fn(c, f) })
		for _, s := range c.Commands() {
			walk(s)
		}
	}
	walk(newRootCmd(newEnv(io.Discard, io.Discard)))
}

// TestOneMeaningPerFlagName: a flag name has one type (one parser) and one
// default in every command that has it. The exceptions, each for a reason:
// --method has the default integrator where a run needs one (motion, plot
// motion) and none where it is optional (period, plot period: no measured
// period unless asked); --truncation is the order of V_N judged (validity,
// compare: 2) or the highest order drawn (plot taylor: 4); --rtol is the
// relative tolerance of what the command does, the integrator's (motion: 0
// for motion.DefaultRTol) or the comparison's (baseline verify: 1e-9).
// Every visible
// --tolerance is relative (TOL: 0.01 or 1%); the absolute accuracy of the
// levels is --accuracy, its old name --tolerance there hidden and marked
// deprecated.
func TestOneMeaningPerFlagName(t *testing.T) {
	type use struct{ cmd, typ, def string }
	byName := map[string][]use{}
	everyFlag(func(c *cobra.Command, f *pflag.Flag) {
		if f.Hidden {
			assert.NotEmpty(t, f.Annotations["deprecated"], "%s --%s: hidden flags are deprecated aliases", c.CommandPath(), f.Name)
			return
		}
		byName[f.Name] = append(byName[f.Name], use{c.CommandPath(), f.Value.Type(), f.DefValue})
	})
	differentDefaults := map[string]bool{"method": true, "truncation": true, "rtol": true}
	for name, uses := range byName {
		for _, u := range uses[1:] {
			assert.Equal(t, uses[0].typ, u.typ, "--%s: %s and %s parse it differently", name, uses[0].cmd, u.cmd)
			if !differentDefaults[name] {
				assert.Equal(t, uses[0].def, u.def, "--%s: %s and %s default differently", name, uses[0].cmd, u.cmd)
			}
		}
	}
	for _, u := range byName["tolerance"] {
		assert.Equal(t, "TOL", u.typ, "%s --tolerance is relative", u.cmd)
	}
	// An absolute accuracy of an energy: of the levels (levels, plot
	// levels; bare numbers in cm⁻¹) and of a table's interpolated V
	// (table; bare numbers in eV, the default energy unit).
	require.Len(t, byName[accuracyFlag], 3, "levels, plot levels and table")
	for _, u := range byName["method"] {
		assert.Contains(t, []string{"", motion.DormandPrince.String()}, u.def, u.cmd)
	}
}

// TestLevelsAccuracy: levels takes its absolute accuracy as --accuracy (cm⁻¹
// unless a unit is given); the old --tolerance gives the same result with a
// warning on stderr; a relative value is refused in one line.
func TestLevelsAccuracy(t *testing.T) {
	morse := "morse:De=4.6,a=1.87,re=1.27" // invented, HCl-sized
	base := []string{"levels", morse, "--mu", "1", "--v-max", "2", "--j-max", "0", "--format", "json"}
	code, out, errOut := runCLI(t, append(base, "--accuracy", "1e-4")...)
	require.Equal(t, 0, code, errOut)
	assert.Empty(t, errOut)
	var got struct {
		Tolerance float64 `json:"tolerance_per_cm"`
	}
	require.NoError(t, json.Unmarshal([]byte(out), &got))
	assert.Equal(t, 1e-4, got.Tolerance)
	code, old, errOut := runCLI(t, append(base, "--tolerance", "1e-4")...)
	require.Equal(t, 0, code, errOut)
	assert.Equal(t, out, old)
	assert.Contains(t, errOut, "warning: --tolerance is deprecated: use --accuracy (an absolute accuracy in cm⁻¹; --tolerance elsewhere is relative)")
	// 1.239841984e-4 eV = 1 cm⁻¹ (h·c·100/e, CODATA 2018).
	code, out, errOut = runCLI(t, append(base, "--accuracy", "1.239841984e-4eV")...)
	require.Equal(t, 0, code, errOut)
	require.NoError(t, json.Unmarshal([]byte(out), &got))
	assert.InEpsilon(t, 1, got.Tolerance, 1e-9)
	for _, bad := range []string{"1%", "0", "-1", "abc"} {
		code, _, errOut := runCLI(t, append(base, "--accuracy", bad)...)
		assert.Equal(t, 2, code, bad)
		assert.Contains(t, errOut, "--accuracy", bad)
		assert.Equal(t, 1, strings.Count(strings.TrimSpace(errOut), "\n")+1, "one line: %q", errOut)
	}
	code, _, errOut = runCLI(t, "plot", "levels", morse, "--mu", "1", "--v-max", "2", "--accuracy", "1%", "-o", filepath.Join(t.TempDir(), "l.png"))
	assert.Equal(t, 2, code)
	assert.Contains(t, errOut, "--accuracy")
	// The default is levels.DefaultTolerance, said in the help of both.
	for _, args := range [][]string{{"levels", "--help"}, {"plot", "levels", "--help"}} {
		code, help, _ := runCLI(t, args...)
		require.Equal(t, 0, code)
		assert.Contains(t, help, fmt.Sprintf("(default %g)", levels.DefaultTolerance), args)
		assert.NotContains(t, help, "--tolerance string", args)
	}
}

// TestDefaultsSaidOnce: the help texts state the defaults the flags have
// (plot motion said "default 3" periods while it integrated 10).
func TestDefaultsSaidOnce(t *testing.T) {
	code, help, _ := runCLI(t, "plot", "motion", "--help")
	require.Equal(t, 0, code)
	assert.Contains(t, help, "--periods periods (default "+strconv.Itoa(motion.DefaultPeriods)+")")
	assert.Contains(t, help, "default "+motion.DormandPrince.String()+";")
	code, help, _ = runCLI(t, "motion", "--help")
	require.Equal(t, 0, code)
	for _, n := range []int{motion.DefaultHeunSteps, motion.DefaultVerletSteps, motion.DefaultRK4Steps} {
		assert.Contains(t, help, "default "+strconv.Itoa(n)+" steps per harmonic period")
	}
	assert.Contains(t, help, fmt.Sprintf("0: heun %d, verlet %d, rk4 %d", motion.DefaultHeunSteps, motion.DefaultVerletSteps, motion.DefaultRK4Steps))
}

// TestHelpDefaultsMatchFlags: wherever a command's help text says
// "--flag … default X", X is the flag's default (a percentage read as a
// fraction; "every" stands for -1, "every bound level").
func TestHelpDefaultsMatchFlags(t *testing.T) {
	re := regexp.MustCompile(`--([a-z][a-z-]*)[^.\n]{0,30}?default:? ([0-9][0-9.e+-]*)( ?%)?`)
	checked := 0
	var walk func(c *cobra.Command)
	walk = func(c *cobra.Command) {
		for _, m := range re.FindAllStringSubmatch(c.Long, -1) {
			f := c.Flags().Lookup(m[1])
			if f == nil || f.DefValue == "" {
				continue // a zero value that means a computed default
			}
			text, err := strconv.ParseFloat(strings.TrimRight(m[2], "."), 64)
			require.NoError(t, err, "%s: %q", c.CommandPath(), m[0])
			if m[3] != "" {
				text /= 100
			}
			def, err := strconv.ParseFloat(f.DefValue, 64)
			require.NoError(t, err, "%s --%s", c.CommandPath(), m[1])
			assert.InEpsilon(t, def, text, 1e-12, "%s: help says %q, the flag's default is %s", c.CommandPath(), m[0], f.DefValue)
			checked++
		}
		for _, s := range c.Commands() {
			walk(s)
		}
	}
	walk(newRootCmd(newEnv(io.Discard, io.Discard)))
	assert.GreaterOrEqual(t, checked, 5)
}
