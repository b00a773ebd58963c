package main

import (
	"runtime"
	"runtime/debug"
	"strconv"

	"github.com/spf13/cobra"
)

// buildVersion is what the binary knows of its own build.
type buildVersion struct {
	Module   string `json:"module"`
	Version  string `json:"version"`  // module version, "(devel)" for a build from a checkout
	Commit   string `json:"commit"`   // VCS revision, "" when unknown
	Modified bool   `json:"modified"` // the checkout had uncommitted changes
	Go       string `json:"go"`       // the Go toolchain that built it
}

// readBuildVersion reads the build information embedded by the Go linker.
func readBuildVersion() buildVersion {
	v := buildVersion{Module: "github.com/pairwell/pairwell", Version: "(unknown)", Go: runtime.Version()}
	info, ok := debug.ReadBuildInfo()
	if !ok {
		return v
	}
	if info.Main.Path != "" {
		v.Module = info.Main.Path
	}
	if info.Main.Version != "" {
		v.Version = info.Main.Version
	}
	for _, s := range info.Settings {
		switch s.Key {
		case "vcs.revision":
			v.Commit = s.Value
		case "vcs.modified":
			v.Modified = s.Value == "true"
		}
	}
	return v
}

// toolVersion is the one-line version: "pairwell VERSION (COMMIT[-dirty])".
func toolVersion() string {
	b := readBuildVersion()
	v := "pairwell " + b.Version
	if rev := b.Commit; rev != "" {
		if len(rev) > 12 {
			rev = rev[:12]
		}
		if b.Modified {
			rev += "-dirty"
		}
		v += " (" + rev + ")"
	}
	return v
}

func newVersionCmd(e *env) *cobra.Command {
	return &cobra.Command{
		Use:   "version",
		Short: "Show the module version, commit and Go version of this build",
		Long: `version shows the module version ("(devel)" for a build from a checkout), the
commit it was built from (with -dirty when the checkout had changes) and the Go
toolchain that built it. "pairwell --version" prints the one-line form.

JSON keys: module, version, commit, modified, go.`,
		Example: `  pairwell version
  pairwell version --format json`,
		Args: exactArgs(0, ""),
		RunE: func(cmd *cobra.Command, args []string) error {
			b := readBuildVersion()
			if e.format == "csv" {
				// One row, the JSON keys as header.
				t := &table{cols: []column{{Title: "module"}, {Title: "version"}, {Title: "commit"}, {Title: "modified"}, {Title: "go"}}}
				t.add(b.Module, b.Version, b.Commit, strconv.FormatBool(b.Modified), b.Go)
				return e.emit(b, t)
			}
			t := &table{cols: []column{{Title: "quantity"}, {Title: "value"}}}
			commit := b.Commit
			if commit == "" {
				commit = "unknown"
			} else if b.Modified {
				commit += " (modified)"
			}
			t.add("module", b.Module)
			t.add("version", b.Version)
			t.add("commit", commit)
			t.add("go", b.Go)
			return e.emit(b, t)
		},
	}
}
