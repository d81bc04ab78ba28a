package main

import (
	"errors"
	"fmt"
	"io"
	"os"

	"github.com/spf13/cobra"

	"github.com/ampwright/ampwright/compiler"
	"github.com/ampwright/ampwright/report"
)

// Exit statuses.
const (
	exitOK    = 0 // every check passes
	exitFail  = 1 // a check fails (diff: a regression)
	exitInput = 2 // input or usage error
)

// Flag names.
const (
	flagFormat    = "format"
	flagOut       = "out"
	flagTimeout   = "timeout"
	flagMaxMemory = "max-memory"
)

// exitError carries an exit status through cobra.
type exitError struct {
	code int
	err  error  // already printed when nil
	hint string // for a bad command line: where to read the usage
}

func (e *exitError) Error() string {
	if e.err == nil {
		return fmt.Sprintf("exit status %d", e.code)
	}
	return e.err.Error()
}

// usageError is a bad command line.
func usageError(format string, args ...any) error {
	return &exitError{code: exitInput, err: fmt.Errorf(format, args...)}
}

// failed is what a command's error becomes: its own exit status, or, for
// an error that is not a bad command line (a file that cannot be written,
// output that cannot be written), status 2 and no word about usage.
func failed(err error) error {
	var ee *exitError
	if err == nil || errors.As(err, &ee) {
		return err
	}
	return &exitError{code: exitInput, err: err}
}

// Main runs the command line and returns the exit status.
func Main() int {
	return run(os.Args[1:], os.Stdout, os.Stderr)
}

func run(args []string, stdout, stderr io.Writer) int {
	root := newRootCmd(stdout, stderr)
	root.SetArgs(args)
	err := root.Execute()
	if err == nil {
		return exitOK
	}
	// Messages go through report.Printf: an error may name a file of the
	// yard, whose name is the yard's text.
	var ee *exitError
	if errors.As(err, &ee) {
		if ee.err != nil {
			report.Printf(stderr, "ampwright: %v\n", ee.err)
		}
		if ee.hint != "" {
			fmt.Fprintln(stderr, ee.hint)
		}
		return ee.code
	}
	// cobra's own errors: unknown command, wrong argument count.
	report.Printf(stderr, "ampwright: %v\n", err)
	fmt.Fprintln(stderr, "Run 'ampwright help' for usage.")
	return exitInput
}

// pristine are the limits before any flag sets them: each run starts from
// them (tests call run many times in one process).
var pristine = compiler.DefaultLimits

func newRootCmd(stdout, stderr io.Writer) *cobra.Command {
	compiler.DefaultLimits = pristine
	root := &cobra.Command{
		Use:   "ampwright",
		Short: "Check a boat's DC and solar-charging design written in CUE",
		Long: `ampwright compiles a boat's DC electrical and solar-charging design, written
in CUE, into checked results: it validates the design against its schema,
runs the sizing, wiring and protection checks, and reports every figure with
its inputs, formula and source.

A design is a CUE package for one hull, usually inside a yard's CUE module
that also holds the yard's catalog and rulebook.

ampwright supports a qualified marine electrician; it does not replace them,
nor the standards and local rules that apply to the boat.`,
		Example: `  ampwright check designs/hulls/dunnock
  ampwright check --format json designs/hulls/*
  ampwright pack designs/hulls/marram -o marram.pdf
  ampwright diagram designs/hulls/tystie -o tystie.svg
  ampwright propose designs/hulls/dunnock -o designs/hulls/dunnock-proposed
  ampwright fleet designs
  ampwright diff --base origin/main --format markdown designs
  ampwright explain wiring.voltageDrop
  ampwright schema --out cue.mod/pkg/ampwright.dev/schema`,
		SilenceErrors: true,
		SilenceUsage:  true,
		PersistentPreRunE: func(*cobra.Command, []string) error {
			if compiler.DefaultLimits.Timeout <= 0 {
				return usageError("--%s %s: expected a duration of more than 0, such as 60s", flagTimeout, compiler.DefaultLimits.Timeout)
			}
			return nil
		},
	}
	root.SetOut(stdout)
	root.SetErr(stderr)
	root.PersistentFlags().DurationVar(&compiler.DefaultLimits.Timeout, flagTimeout, compiler.DefaultLimits.Timeout,
		"stop work on a design that takes longer than this (its compile; for pack, also its drawing)")
	root.PersistentFlags().Var(sizeValue{&compiler.DefaultLimits.MaxMemory}, flagMaxMemory,
		"stop work on a design whose compile needs more memory than this, such as 512MiB or 2GiB")
	root.SetFlagErrorFunc(func(c *cobra.Command, err error) error {
		return &exitError{code: exitInput, err: err, hint: fmt.Sprintf("Run '%s --help' for usage.", c.CommandPath())}
	})
	root.AddCommand(
		newCheckCmd(),
		newBOMCmd(),
		newDiagramCmd(),
		newDiffCmd(),
		newFleetCmd(),
		newExplainCmd(),
		newPackCmd(),
		newProposeCmd(),
		newSchemaCmd(),
		newVersionCmd(),
		newWorkerCmd(),
	)
	for _, c := range root.Commands() {
		if run := c.RunE; run != nil {
			c.RunE = func(cmd *cobra.Command, args []string) error { return failed(run(cmd, args)) }
		}
	}
	return root
}

// formatFlag adds --format with the given choices, the first the default.
func formatFlag(c *cobra.Command, target *string, choices ...string) {
	c.Flags().StringVar(target, flagFormat, choices[0], "output format: "+joinChoices(choices))
	_ = c.RegisterFlagCompletionFunc(flagFormat, func(*cobra.Command, []string, string) ([]string, cobra.ShellCompDirective) {
		return choices, cobra.ShellCompDirectiveNoFileComp
	})
}

func checkFormat(got string, choices ...string) error {
	for _, c := range choices {
		if got == c {
			return nil
		}
	}
	return usageError("--%s %q: expected %s", flagFormat, got, joinChoices(choices))
}

func joinChoices(choices []string) string {
	s := ""
	for i, c := range choices {
		if i > 0 {
			s += "|"
		}
		s += c
	}
	return s
}
