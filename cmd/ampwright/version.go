package main

import (
	"fmt"
	"runtime/debug"

	"github.com/spf13/cobra"
)

func newVersionCmd() *cobra.Command {
	return &cobra.Command{
		Use:     "version",
		Short:   "Print the version and the source revision it was built from",
		Example: `  ampwright version`,
		Args:    cobra.NoArgs,
		RunE: func(cmd *cobra.Command, _ []string) error {
			_, err := fmt.Fprintln(cmd.OutOrStdout(), versionString())
			return err
		},
	}
}

// versionString reports the module version and, when the binary was built
// from a checkout, the VCS revision and whether the tree was modified.
func versionString() string {
	info, ok := debug.ReadBuildInfo()
	if !ok {
		return "ampwright (no build information)"
	}
	s := "ampwright " + info.Main.Version
	var rev, when, modified string
	for _, kv := range info.Settings {
		switch kv.Key {
		case "vcs.revision":
			rev = kv.Value
		case "vcs.time":
			when = kv.Value
		case "vcs.modified":
			modified = kv.Value
		}
	}
	if rev != "" {
		s += " revision " + rev
		if when != "" {
			s += " (" + when + ")"
		}
		if modified == "true" {
			s += " with uncommitted changes"
		}
	}
	return s + " " + info.GoVersion
}
