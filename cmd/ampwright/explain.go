package main

import (
	"fmt"
	"strings"
	"text/tabwriter"

	"github.com/spf13/cobra"

	"github.com/ampwright/ampwright/checks"
)

func newExplainCmd() *cobra.Command {
	return &cobra.Command{
		Use:   "explain [CHECK]",
		Short: "Say what a check checks, its method, formula, limit and source",
		Long: `explain with no argument lists every check; with a check's ID it prints
what the check checks, the method and formula it uses, the limit and the
limit's source.`,
		Example: `  ampwright explain
  ampwright explain bank.voltage`,
		Args: cobra.MaximumNArgs(1),
		ValidArgsFunction: func(*cobra.Command, []string, string) ([]string, cobra.ShellCompDirective) {
			var ids []string
			for _, c := range checks.All {
				ids = append(ids, c.ID+"\t"+c.Title)
			}
			return ids, cobra.ShellCompDirectiveNoFileComp
		},
		RunE: func(cmd *cobra.Command, args []string) error {
			out := cmd.OutOrStdout()
			if len(args) == 0 {
				tw := tabwriter.NewWriter(out, 0, 0, 2, ' ', 0)
				for _, c := range checks.All {
					fmt.Fprintf(tw, "%s\t%s\n", c.ID, c.Title)
				}
				return tw.Flush()
			}
			c, ok := checks.Lookup(args[0])
			if !ok {
				var ids []string
				for _, c := range checks.All {
					ids = append(ids, c.ID)
				}
				return usageError("no check %q; the checks are %s", args[0], strings.Join(ids, ", "))
			}
			_, err := fmt.Fprintf(out, "%s: %s\n\n%s\n", c.ID, c.Title, c.Doc)
			return err
		},
	}
}
