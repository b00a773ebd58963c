package core_test

import (
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/models"
)

// renamed is a built-in model under another key and origin.
type renamed struct {
	core.Model
	key, origin string
	aliases     []string
}

func (m renamed) Info() core.ModelInfo {
	i := m.Model.Info()
	i.Key, i.Aliases, i.Origin = m.key, m.aliases, m.origin
	return i
}

// TestRegistryReplaceable: a replaceable model gives way, with all its
// names, to a later Add that claims one of them; ordinary models never do.
func TestRegistryReplaceable(t *testing.T) {
	reg := models.NewRegistry()
	lib := renamed{models.Morse{}, "rydberg", "library", []string{"ryd"}}
	require.NoError(t, reg.AddReplaceable(lib))
	require.NoError(t, reg.AddReplaceable(renamed{models.Morse{}, "varshni", "library", nil}))
	// Two replaceable models may not share a name.
	assert.Error(t, reg.AddReplaceable(renamed{models.Morse{}, "ryd", "library", nil}))
	// A replaceable model may not take a built-in's name.
	assert.Error(t, reg.AddReplaceable(renamed{models.Morse{}, "lj", "library", nil}))

	user := renamed{models.Morse{}, "ryd", "user.toml:1", nil} // claims the alias only
	replaced, err := reg.AddReplacing(user)
	require.NoError(t, err)
	require.Len(t, replaced, 1)
	assert.Equal(t, "rydberg", replaced[0].Info().Key)
	_, err = reg.Lookup("rydberg") // the replaced model's other names are gone too
	assert.ErrorIs(t, err, core.ErrUnknownModel)
	m, err := reg.Lookup("RYD")
	require.NoError(t, err)
	assert.Equal(t, "user.toml:1", m.Info().Origin)
	assert.Equal(t, []string{"morse", "lennard-jones", "buckingham", "harmonic", "varshni", "ryd"}, keys(reg))

	// The user's model is not replaceable, and neither are built-ins.
	_, err = reg.AddReplacing(renamed{models.Morse{}, "ryd", "other.toml:1", nil})
	assert.Error(t, err)
	assert.Error(t, reg.Add(renamed{models.Morse{}, "morse", "user.toml:2", nil}))
	// Add replaces as AddReplacing does.
	require.NoError(t, reg.Add(renamed{models.Morse{}, "varshni", "user.toml:3", nil}))
	assert.Equal(t, []string{"morse", "lennard-jones", "buckingham", "harmonic", "ryd", "varshni"}, keys(reg))
}

func keys(r *core.Registry) []string {
	var out []string
	for _, m := range r.Models() {
		out = append(out, m.Info().Key)
	}
	return out
}
