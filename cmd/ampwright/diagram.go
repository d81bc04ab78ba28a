package main

import (
	"bytes"
	"fmt"
	"io"
	"path/filepath"
	"strings"

	"github.com/spf13/cobra"

	"github.com/ampwright/ampwright/report"
)

type diagramOptions struct {
	out    string
	paper  string
	stdout io.Writer
	stderr io.Writer
}

func newDiagramCmd() *cobra.Command {
	opts := &diagramOptions{}
	c := &cobra.Command{
		Use:   "diagram DESIGN -o FILE.svg|FILE.pdf",
		Short: "Draw a design's one-line diagram as SVG or PDF",
		Long: `diagram compiles a design and draws its one-line diagram, the one in the
calculation pack, on its own: every bank with its runs, protective devices,
switches, buses and loads (with their quantities), the links between banks,
the charge sources, converters, the AC side behind an inverter, and the
negative side with its shunts and negative buses, in the graphic symbols of
IEC 60617. The format follows FILE's extension: .svg for a pull request or a
yard's wiki, .pdf for print.

The drawing is laid out on sheets of the pack's landscape page (--paper); a
system too large for one sheet continues on the next, with references both
ways. The SVG holds its sheets one under the other.

FILE is written to a temporary file and renamed, so an invalid design or a
file that cannot be written leaves any earlier FILE as it was. The same
inputs give the same bytes; a PDF is dated as pack dates it
(SOURCE_DATE_EPOCH, else the commit time).

Exit status: 0 when every check passes or warns, 1 when a check fails (the
diagram is written, its failing runs drawn in red), 2 on an input or usage
error or when FILE cannot be written.`,
		Example: `  ampwright diagram designs/hulls/tystie -o tystie.svg
  ampwright diagram designs/hulls/sanderling -o sanderling.pdf
  ampwright diagram --paper letter designs/hulls/marram -o marram.svg`,
		Args: cobra.ExactArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			opts.stdout, opts.stderr = cmd.OutOrStdout(), cmd.ErrOrStderr()
			return runDiagram(opts, args[0])
		},
	}
	c.Flags().StringVarP(&opts.out, flagOut, "o", "", "the file to write, .svg or .pdf (required)")
	c.Flags().StringVar(&opts.paper, flagPaper, "a4", "paper the sheets are laid out for, landscape: a4|letter")
	_ = c.MarkFlagFilename(flagOut, "svg", "pdf")
	_ = c.RegisterFlagCompletionFunc(flagPaper, func(*cobra.Command, []string, string) ([]string, cobra.ShellCompDirective) {
		return []string{"a4", "letter"}, cobra.ShellCompDirectiveNoFileComp
	})
	return c
}

func runDiagram(opts *diagramOptions, dir string) error {
	if opts.out == "" {
		return usageError("diagram needs --%s FILE.svg or FILE.pdf", flagOut)
	}
	format := strings.ToLower(filepath.Ext(opts.out))
	if format != ".svg" && format != ".pdf" {
		return usageError("--%s %s: expected a file ending in .svg or .pdf", flagOut, opts.out)
	}
	var paper string
	switch strings.ToLower(opts.paper) {
	case "a4":
		paper = "A4"
	case "letter":
		paper = "Letter"
	default:
		return usageError("--%s %q: expected a4|letter", flagPaper, opts.paper)
	}
	date, err := sourceDateEpoch()
	if err != nil {
		return usageError("%v", err)
	}

	r, err := compileOne(dir)
	if err != nil {
		if err := printProblems(opts.stderr, dir, r); err != nil {
			return err
		}
		return &exitError{code: exitInput}
	}
	var b bytes.Buffer
	o := report.DiagramOptions{PageSize: paper, Date: date}
	if format == ".svg" {
		err = report.DiagramSVG(&b, r, o)
	} else {
		err = report.DiagramPDF(&b, r, o)
	}
	if err != nil {
		return &exitError{code: exitInput, err: err}
	}
	if err := writeFileAtomic(opts.out, b.Bytes()); err != nil {
		return &exitError{code: exitInput, err: fmt.Errorf("cannot write %s: %v", opts.out, pathErr(err))}
	}
	if c := r.Count(); c.Fail > 0 {
		fmt.Fprintf(opts.stdout, "wrote %s: NOT APPROVED, %s\n", opts.out, failSummary(r))
		return &exitError{code: exitFail}
	}
	fmt.Fprintf(opts.stdout, "wrote %s\n", opts.out)
	return nil
}
