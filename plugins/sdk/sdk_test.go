package sdk

import (
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
)

func TestDirectRunMessage(t *testing.T) {
	msg := DirectRunMessage("/opt/ff/pairwell-plugin-ff", "2.1", []string{"ff-a", "ff-b"})
	assert.Equal(t, "pairwell-plugin-ff is a pairwell plugin 2.1 (forms: ff-a, ff-b); pairwell starts it, it is not run by itself.\n"+
		"Use it with:  pairwell --plugin /opt/ff/pairwell-plugin-ff models\n"+
		"or put it, named pairwell-plugin-*, in a directory listed in PAIRWELL_PLUGIN_PATH.\n", msg)
	assert.True(t, strings.HasPrefix(DirectRunMessage("x", "", []string{"k"}), "x is a pairwell plugin (forms: k)"))
}
