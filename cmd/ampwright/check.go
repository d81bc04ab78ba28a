package main

import (
	"errors"
	"fmt"
	"io"

	"github.com/spf13/cobra"

	"github.com/ampwright/ampwright/compiler"
	"github.com/ampwright/ampwright/report"
	"github.com/ampwright/ampwright/result"
	"github.com/ampwright/ampwright/yard"
)

type checkOptions struct {
	format string
	stdout io.Writer
	stderr io.Writer
}

func newCheckCmd() *cobra.Command {
	opts := &checkOptions{}
	c := &cobra.Command{
		Use:   "check DESIGN...",
		Short: "Validate designs and run every check",
		Long: `check loads each design directory (a hull's CUE package), validates it
against the schema, runs every check and prints what it found.

Input errors are printed as file:line:col: path: message, all of a design's
errors at once, sorted by position.

Exit status: 0 when every check passes or warns, 1 when a check fails,
2 on an input or usage error.`,
		Example: `  ampwright check designs/hulls/dunnock
  ampwright check designs/hulls/dunnock designs/hulls/marram
  ampwright check --format json designs/hulls/marram | jq '.checks[] | select(.status == "fail")'`,
		Args: cobra.MinimumNArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			if err := checkFormat(opts.format, "text", "json"); err != nil {
				return err
			}
			opts.stdout, opts.stderr = cmd.OutOrStdout(), cmd.ErrOrStderr()
			return runCheck(opts, args)
		},
	}
	formatFlag(c, &opts.format, "text", "json")
	return c
}

func runCheck(opts *checkOptions, dirs []string) error {
	code := exitOK
	var results []*result.Result
	for i, dir := range dirs {
		r, err := compileOne(dir)
		if err != nil {
			code = exitInput
		} else if r.Verdict() == result.Fail && code == exitOK {
			code = exitFail
		}
		results = append(results, r)
		if opts.format == "json" {
			continue
		}
		if i > 0 {
			fmt.Fprintln(opts.stdout)
		}
		if err != nil {
			if err := printProblems(opts.stderr, dir, r); err != nil {
				return err
			}
			continue
		}
		if err := report.Text(opts.stdout, r); err != nil {
			return err
		}
	}
	if opts.format == "json" {
		var v any = results
		if len(results) == 1 {
			v = results[0]
		}
		if err := report.JSON(opts.stdout, v); err != nil {
			return err
		}
	}
	if code != exitOK {
		return &exitError{code: code}
	}
	return nil
}

// printProblems writes a design's input errors as every command does: a
// count, then one error a line.
func printProblems(w io.Writer, dir string, r *result.Result) error {
	if err := report.Printf(w, "%s: %d input error(s)\n", dir, len(r.Problems)); err != nil {
		return err
	}
	return report.Problems(w, r.Problems)
}

// compileOne compiles one design; on input errors the result carries them
// as problems and the error is returned too.
func compileOne(dir string) (*result.Result, error) {
	r, _, err := yard.Compile(dir)
	if err == nil {
		return r, nil
	}
	r = &result.Result{Version: result.Version, Design: result.Identity{Path: dir}, Figures: []result.Figure{}, Checks: []result.Finding{}}
	var list compiler.ErrorList
	if errors.As(err, &list) {
		r.Problems = list.Problems()
	} else {
		r.Problems = []result.Problem{{Message: err.Error()}}
	}
	return r, err
}
