package main

import (
	"bytes"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"strconv"
	"strings"
	"time"

	"github.com/spf13/cobra"

	"github.com/ampwright/ampwright/compiler"
	"github.com/ampwright/ampwright/propose"
	"github.com/ampwright/ampwright/report"
	"github.com/ampwright/ampwright/result"
	"github.com/ampwright/ampwright/yard"
)

const (
	flagPaper        = "paper"
	flagRequirePass  = "require-pass"
	flagMaxPages     = "max-pages"
	flagWithProposal = "with-proposal"
)

type packOptions struct {
	out          string
	paper        string
	requirePass  bool
	maxPages     int
	withProposal bool
	stdout       io.Writer
	stderr       io.Writer
}

func newPackCmd() *cobra.Command {
	opts := &packOptions{}
	c := &cobra.Command{
		Use:   "pack DESIGN -o FILE.pdf",
		Short: "Print a design's calculation pack as a PDF",
		Long: `pack compiles a design, runs every check and writes its calculation pack:
a PDF with a cover (the verdict and a sign-off block), the findings, the
energy budget, the solar harvest and monthly balance, the design voyage, the
wiring schedule, charts, a one-line diagram, calculation sheets for every
figure, the bill of materials and the cautions.

A pack of a design that fails a check is still written, marked NOT APPROVED
on every page, and pack exits 1; with --require-pass it is not written at
all. An invalid design or a file that cannot be written leaves any earlier
FILE as it was: the pack is written to a temporary file and renamed.

The same inputs give the same bytes. The pack is dated by SOURCE_DATE_EPOCH
(Unix seconds) when it is set, else by the design's git commit time, else
not dated (its PDF dates are then ` + report.PackEpoch.Format("2006-01-02") + `).

With --with-proposal the pack ends with an appendix: the cheapest design
from the yard's catalog that passes every check, beside this one (see
` + "`ampwright propose`" + `; --timeout bounds its search).

Exit status: 0 when every check passes or warns, 1 when a check fails,
2 on an input or usage error or when FILE cannot be written.`,
		Example: `  ampwright pack designs/hulls/dunnock -o dunnock.pdf
  ampwright pack designs/hulls/marram --paper letter -o marram.pdf
  ampwright pack --require-pass designs/hulls/brackenwell -o brackenwell.pdf
  SOURCE_DATE_EPOCH=1767225600 ampwright pack designs/hulls/dunnock -o dunnock.pdf
  ampwright pack --with-proposal designs/hulls/brackenwell -o brackenwell.pdf`,
		Args: cobra.ExactArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			opts.stdout, opts.stderr = cmd.OutOrStdout(), cmd.ErrOrStderr()
			return runPack(opts, args[0])
		},
	}
	c.Flags().StringVarP(&opts.out, flagOut, "o", "", "the PDF file to write (required)")
	c.Flags().StringVar(&opts.paper, flagPaper, "a4", "paper size: a4|letter")
	c.Flags().BoolVar(&opts.requirePass, flagRequirePass, false, "write no pack when a check fails")
	c.Flags().IntVar(&opts.maxPages, flagMaxPages, 500, "write no pack that would have more pages than this")
	c.Flags().BoolVar(&opts.withProposal, flagWithProposal, false, "add the cheapest passing design from the yard's catalog as an appendix")
	_ = c.MarkFlagFilename(flagOut, "pdf")
	_ = c.RegisterFlagCompletionFunc(flagPaper, func(*cobra.Command, []string, string) ([]string, cobra.ShellCompDirective) {
		return []string{"a4", "letter"}, cobra.ShellCompDirectiveNoFileComp
	})
	return c
}

func runPack(opts *packOptions, dir string) error {
	if opts.out == "" {
		return usageError("pack needs --%s FILE.pdf", flagOut)
	}
	paper, err := paperSize(opts.paper)
	if err != nil {
		return err
	}
	date, err := sourceDateEpoch()
	if err != nil {
		return usageError("%v", err)
	}

	if opts.maxPages < 1 {
		return usageError("--%s %d: expected at least 1", flagMaxPages, opts.maxPages)
	}

	stop := watchOne(opts.stderr, dir, 0)
	r, _, history, err := yard.CompileWithHistory(dir)
	stop()
	if err != nil {
		if err := printProblems(opts.stderr, dir, brokenResult(dir, problemsOf(err))); err != nil {
			return err
		}
		return &exitError{code: exitInput}
	}
	if opts.withProposal {
		// The search stops itself at until with the best it has; the
		// watchdog, a little later, is for its memory and a search that
		// does not.
		until := time.Now().Add(compiler.DefaultLimits.Timeout)
		stop := watchOne(opts.stderr, dir, drawGrace)
		r.Proposal, err = proposalFor(dir, r, until)
		stop()
		if err != nil {
			return &exitError{code: exitInput, err: err}
		}
	}
	c := r.Count()
	if c.Fail > 0 && opts.requirePass {
		report.Printf(opts.stderr, "%s: %s; no pack written (--%s)\n", dir, failSummary(r), flagRequirePass)
		return &exitError{code: exitFail}
	}

	// Drawing has the same time bound as compiling, checked page by page;
	// the watchdog, a little later, is for a page that never ends.
	lim := compiler.DefaultLimits
	stop = watchOne(opts.stderr, dir, drawGrace)
	defer stop()
	var b bytes.Buffer
	err = report.Pack(&b, r, report.PackOptions{PageSize: paper, Date: date, MaxPages: opts.maxPages, Deadline: time.Now().Add(lim.Timeout), History: history})
	var bound *report.PackBoundError
	switch {
	case errors.As(err, &bound) && bound.Time:
		return &exitError{code: exitInput, err: fmt.Errorf("%s: %v (the --%s bound of %s); raise --%s if the design is merely large", dir, err, flagTimeout, lim.Timeout, flagTimeout)}
	case errors.As(err, &bound):
		return &exitError{code: exitInput, err: fmt.Errorf("%s: %v (--%s); raise --%s, or split the design", dir, err, flagMaxPages, flagMaxPages)}
	case err != nil:
		return &exitError{code: exitInput, err: err}
	}
	if err := writeFileAtomic(opts.out, b.Bytes()); err != nil {
		return &exitError{code: exitInput, err: fmt.Errorf("cannot write %s: %v", opts.out, pathErr(err))}
	}
	if c.Fail > 0 {
		if err := report.Printf(opts.stdout, "wrote %s: NOT APPROVED, %s\n", opts.out, failSummary(r)); err != nil {
			return err
		}
		return &exitError{code: exitFail}
	}
	return report.Printf(opts.stdout, "wrote %s: %d checks pass, %d warn\n", opts.out, c.Pass, c.Warn)
}

// proposalFor searches the yard's catalog for the design's proposal, for
// the pack's appendix.
func proposalFor(dir string, r *result.Result, until time.Time) (*result.Proposal, error) {
	d, err := compiler.Load(dir)
	if err != nil {
		return nil, err
	}
	cat, _, err := d.Catalog()
	if err != nil {
		return nil, err
	}
	p, err := propose.Propose(d, r, cat, propose.Options{Until: until})
	if err != nil {
		return nil, fmt.Errorf("%s: %v", dir, err)
	}
	return p.Report, nil
}

// paperSize maps --paper to the pack's page size.
func paperSize(s string) (string, error) {
	switch strings.ToLower(s) {
	case "a4":
		return "A4", nil
	case "letter":
		return "Letter", nil
	}
	return "", usageError("--%s %q: expected a4|letter", flagPaper, s)
}

// drawGrace is how much longer than --timeout the watchdog lets a pack's
// drawing run: the drawing checks its own deadline at each page.
const drawGrace = 10 * time.Second

// failSummary says how many checks fail and which.
func failSummary(r *result.Result) string {
	var names []string
	for _, f := range r.Checks {
		if f.Status == result.Fail {
			names = append(names, string(f.ID)+" "+f.Subject)
		}
	}
	n := len(names)
	if len(names) > 4 {
		names = append(names[:4], "…")
	}
	word := "checks fail"
	if n == 1 {
		word = "check fails"
	}
	return fmt.Sprintf("%d %s (%s)", n, word, strings.Join(names, ", "))
}

// sourceDateEpoch is the time SOURCE_DATE_EPOCH gives, or zero when it is
// not set.
func sourceDateEpoch() (time.Time, error) {
	s, ok := os.LookupEnv("SOURCE_DATE_EPOCH")
	if !ok || s == "" {
		return time.Time{}, nil
	}
	n, err := strconv.ParseInt(s, 10, 64)
	if err != nil || n < 0 {
		return time.Time{}, fmt.Errorf("SOURCE_DATE_EPOCH %q: expected Unix seconds", s)
	}
	return time.Unix(n, 0).UTC(), nil
}

// pathErr drops the temporary file's name from an error about it.
func pathErr(err error) error {
	var pe *fs.PathError
	if errors.As(err, &pe) {
		return pe.Err
	}
	return err
}
