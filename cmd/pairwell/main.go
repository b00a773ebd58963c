// Command pairwell finds and characterises the well of interatomic pair
// potentials: equilibrium distance, depth, Taylor coefficients, force
// constant and harmonic frequency, anharmonic motion, and the range over
// which the harmonic picture holds. Run "pairwell --help" for the commands.
//
// Exit codes: 0 success; 1 a computation, plugin or file operation failed
// (for check and baseline verify also: a check failed); 2 bad input.
package main

import (
	"bufio"
	"fmt"
	"io"
	"os"
	"strings"
	"unicode/utf8"
)

func main() {
	os.Exit(run(os.Args[1:], os.Stdin, os.Stdout, os.Stderr))
}

// maxMessage is the longest error line pairwell prints, in characters: a
// message quoting hostile input (a huge spec, a plugin's answer) is cut.
const maxMessage = 2000

// truncateMessage cuts msg to maxMessage characters, saying so.
func truncateMessage(msg string) string {
	if utf8.RuneCountInString(msg) <= maxMessage {
		return msg
	}
	r := []rune(msg)
	return string(r[:maxMessage]) + fmt.Sprintf("… (%d more characters)", len(r)-maxMessage)
}

// run executes the command line args and returns the exit code.
func run(args []string, stdin io.Reader, stdout, stderr io.Writer) int {
	// Output goes through one buffer, written in large blocks (a table of
	// 10 000 rows is a few dozen writes, not one per cell), and flushed
	// before any error line so that the order on a shared terminal holds.
	out := bufio.NewWriterSize(stdout, 64<<10)
	env := newEnv(out, stderr)
	stop := env.handleSignals()
	defer stop()
	defer env.close()
	root := newRootCmd(env)
	root.SetArgs(args)
	root.SetIn(stdin)
	root.SetOut(env.stdout)
	root.SetErr(env.stderr)
	err := root.Execute()
	if fErr := out.Flush(); fErr != nil && err == nil {
		err = failErr(fmt.Errorf("writing output: %w", fErr))
	}
	if err == nil {
		return 0
	}
	var name string
	if _, scanErr := fmt.Sscanf(err.Error(), "unknown command %q", &name); scanErr == nil {
		// cobra's own error for a mistyped command: say it our way.
		if sub, _, findErr := root.Find(args); findErr == nil || sub == root {
			err = unknownCommand(sub, name)
		}
	}
	err = withPluginFailures(err, env.failedPlugins)
	fmt.Fprintf(env.stderr, "pairwell: %s\n", truncateMessage(oneLine(err.Error())))
	if c := caretOf(err); c != "" {
		fmt.Fprintln(env.stderr, c)
	}
	return exitCode(err)
}

// oneLine joins the lines of a message and collapses its white space.
func oneLine(s string) string {
	return strings.Join(strings.Fields(strings.ReplaceAll(s, "\n", " ")), " ")
}
