package main

import (
	"fmt"
	"slices"
	"sort"
	"strings"
	"text/tabwriter"

	"github.com/spf13/cobra"

	"github.com/ampwright/ampwright/checks"
)

func newExplainCmd() *cobra.Command {
	return &cobra.Command{
		Use:   "explain [CHECK | FIGURE]",
		Short: "Say what a check or a figure is: method, formula, limit and source",
		Long: `explain with no argument lists every check, then every figure the checks
report; with a check's ID it prints what the check checks, the method and
formula it uses, the limit and the limit's source; with a figure's ID (as
the calculation sheets and the JSON name it) what the figure is and which
check reports it.`,
		Example: `  ampwright explain
  ampwright explain bank.voltage
  ampwright explain bank.usableEnergy`,
		Args: cobra.MaximumNArgs(1),
		ValidArgsFunction: func(*cobra.Command, []string, string) ([]string, cobra.ShellCompDirective) {
			var ids []string
			for _, c := range checks.All {
				ids = append(ids, string(c.ID)+"\t"+c.Title)
			}
			for _, f := range checks.Figures {
				ids = append(ids, string(f.ID)+"\t"+f.Title)
			}
			return ids, cobra.ShellCompDirectiveNoFileComp
		},
		RunE: func(cmd *cobra.Command, args []string) error {
			out := cmd.OutOrStdout()
			if len(args) == 0 {
				tw := tabwriter.NewWriter(out, 0, 0, 2, ' ', 0)
				fmt.Fprintln(tw, "Checks")
				for _, c := range checks.All {
					fmt.Fprintf(tw, "  %s\t%s\n", c.ID, c.Title)
				}
				fmt.Fprintln(tw, "\nFigures")
				for _, f := range checks.Figures {
					fmt.Fprintf(tw, "  %s\t%s\n", f.ID, f.Title)
				}
				return tw.Flush()
			}
			if c, ok := checks.Lookup(args[0]); ok {
				_, err := fmt.Fprintf(out, "%s: %s\n\n%s\n", c.ID, c.Title, c.Doc)
				return err
			}
			if f, ok := checks.LookupFigure(args[0]); ok {
				_, err := fmt.Fprintf(out, "%s (figure): %s\n\n%s\n", f.ID, f.Title, f.Doc)
				return err
			}
			var ids []string
			for _, c := range checks.All {
				ids = append(ids, string(c.ID))
			}
			for _, f := range checks.Figures {
				ids = append(ids, string(f.ID))
			}
			sort.Strings(ids)
			ids = slices.Compact(ids)
			return usageError("no check or figure %q; they are %s", args[0], strings.Join(ids, ", "))
		},
	}
}
