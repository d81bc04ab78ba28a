package main

import (
	"errors"

	"github.com/spf13/cobra"

	"github.com/ampwright/ampwright/compiler"
	"github.com/ampwright/ampwright/report"
)

func newBOMCmd() *cobra.Command {
	var format string
	c := &cobra.Command{
		Use:   "bom DESIGN",
		Short: "Print the bill of materials of a design",
		Long: `bom lists every catalog part a design uses, by quantity: modules, batteries,
controllers, inverters, fuses and breakers with their holders, busbars and
panels, cable by catalog cable (both conductors of each run plus the
rulebook's slack, rounded up to the cable's sale unit) and crimp terminals,
with prices and totals where the catalog has them. A part without a price
leaves the total marked incomplete.

The CSV has a header row and one part a line, numbers with a decimal point
and no thousands separators.`,
		Example: `  ampwright bom designs/hulls/dunnock
  ampwright bom --format csv designs/hulls/marram > marram-bom.csv`,
		Args: cobra.ExactArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			if err := checkFormat(format, "text", "csv", "json"); err != nil {
				return err
			}
			stop := watchOne(cmd.ErrOrStderr(), args[0], 0)
			defer stop()
			// A bill of materials shows no revision: git is not asked.
			r, _, err := compiler.Compile(args[0])
			if err != nil {
				r = brokenResult(args[0], problemsOf(err))
				if perr := printProblems(cmd.ErrOrStderr(), args[0], r); perr != nil {
					return perr
				}
				return &exitError{code: exitInput}
			}
			if r.BOM == nil {
				return errors.New("internal error: no bill of materials")
			}
			out := cmd.OutOrStdout()
			switch format {
			case "csv":
				return report.BOMCSV(out, r)
			case "json":
				return report.JSON(out, r.BOM)
			}
			return report.BOMText(out, r)
		},
	}
	formatFlag(c, &format, "text", "csv", "json")
	return c
}
