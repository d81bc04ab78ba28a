package main

import (
	"errors"
	"fmt"
	"io"
	"os"

	"github.com/spf13/cobra"

	"github.com/ampwright/ampwright/compiler"
)

// Exit statuses.
const (
	exitOK    = 0 // every check passes
	exitFail  = 1 // a check fails (diff: a regression)
	exitInput = 2 // input or usage error
)

// Flag names.
const (
	flagFormat  = "format"
	flagOut     = "out"
	flagTimeout = "timeout"
)

// exitError carries an exit status through cobra.
type exitError struct {
	code int
	err  error // already printed when nil
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
	var ee *exitError
	if errors.As(err, &ee) {
		if ee.err != nil {
			fmt.Fprintf(stderr, "ampwright: %v\n", ee.err)
		}
		return ee.code
	}
	// cobra's own errors: unknown command or flag, wrong argument count.
	fmt.Fprintf(stderr, "ampwright: %v\nRun 'ampwright help' for usage.\n", err)
	return exitInput
}

func newRootCmd(stdout, stderr io.Writer) *cobra.Command {
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
  ampwright propose designs/hulls/dunnock -o designs/hulls/dunnock-proposed
  ampwright fleet designs
  ampwright diff --base origin/main --format markdown designs
  ampwright explain wiring.voltageDrop
  ampwright schema --out cue.mod/pkg/ampwright.dev/schema`,
		SilenceErrors: true,
		SilenceUsage:  true,
	}
	root.SetOut(stdout)
	root.SetErr(stderr)
	root.PersistentFlags().DurationVar(&compiler.DefaultLimits.Timeout, flagTimeout, compiler.DefaultLimits.Timeout,
		"give up on a design that takes longer than this to compile")
	root.SetFlagErrorFunc(func(c *cobra.Command, err error) error {
		return usageError("%v\nRun '%s --help' for usage.", err, c.CommandPath())
	})
	root.AddCommand(
		newCheckCmd(),
		newBOMCmd(),
		newDiffCmd(),
		newFleetCmd(),
		newExplainCmd(),
		newPackCmd(),
		newProposeCmd(),
		newSchemaCmd(),
		newVersionCmd(),
	)
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
