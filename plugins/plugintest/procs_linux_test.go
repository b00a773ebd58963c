package plugintest

import (
	"os/exec"
	"runtime"
	"syscall"
	"testing"
	"time"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// TestProcsWithArgFindsDescendants starts a child and a grandchild (a shell
// running sleep in the background) and checks both are found by their
// argument, and that nothing is found once they are gone.
func TestProcsWithArgFindsDescendants(t *testing.T) {
	if runtime.GOOS != "linux" {
		t.Skip("reads /proc")
	}
	const marker = "314159.271828"
	cmd := exec.Command("sh", "-c", "sleep "+marker+" & wait", "sh")
	require.NoError(t, cmd.Start())
	defer func() { _ = cmd.Process.Kill(); _ = cmd.Wait() }()
	assert.Eventually(t, func() bool { return len(ProcsWithArg(marker)) == 1 }, 5*time.Second, 10*time.Millisecond,
		"the grandchild sleep is a descendant")
	for _, pid := range ProcsWithArg(marker) {
		require.NoError(t, syscall.Kill(pid, syscall.SIGKILL))
	}
	assert.Eventually(t, func() bool { return len(ProcsWithArg(marker)) == 0 }, 5*time.Second, 10*time.Millisecond,
		"gone once killed")
}
