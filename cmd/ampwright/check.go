package main

import (
	"errors"
	"fmt"
	"io"
	"runtime"
	"sync"

	"github.com/spf13/cobra"

	"github.com/ampwright/ampwright/cache"
	"github.com/ampwright/ampwright/compiler"
	"github.com/ampwright/ampwright/report"
	"github.com/ampwright/ampwright/result"
	"github.com/ampwright/ampwright/yard"
)

type checkOptions struct {
	format string
	cache  string
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

` + cacheHelp("What check finds") + `

Exit status: 0 when every check passes or warns, 1 when a check fails,
2 on an input or usage error.`,
		Example: `  ampwright check designs/hulls/dunnock
  ampwright check designs/hulls/dunnock designs/hulls/marram
  ampwright check --format json designs/hulls/marram | jq '.checks[] | select(.status == "fail")'
  ampwright check --result-cache off designs/hulls/dunnock
  ampwright check --result-cache /tmp/ampwright-cache designs/hulls/*`,
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
	cacheFlag(c, &opts.cache)
	return c
}

func runCheck(opts *checkOptions, dirs []string) error {
	code := exitOK
	results := compileAll(opts.stderr, dirs, openCache(opts.cache, opts.stderr))
	for i, r := range results {
		dir := dirs[i]
		if len(r.Problems) > 0 {
			code = exitInput
		} else if r.Verdict() == result.Fail && code == exitOK {
			code = exitFail
		}
		if opts.format == "json" {
			continue
		}
		if i > 0 {
			fmt.Fprintln(opts.stdout)
		}
		if len(r.Problems) > 0 {
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

// compileAll compiles designs, or finds them in the result cache ch, one
// in this process under the watchdog, several in worker processes, and
// returns their results in order; a design with input errors, or that
// passed a bound, has problems.
func compileAll(stderr io.Writer, dirs []string, ch *cache.Cache) []*result.Result {
	out := make([]*result.Result, len(dirs))
	if len(dirs) == 1 {
		stop := watchOne(stderr, dirs[0], 0)
		defer stop()
		c := yard.Check(dirs[0], ch)
		out[0] = c.Result
		if !c.OK() {
			out[0] = brokenResult(dirs[0], c.Problems)
		}
		return out
	}
	opts, done := newPool(stderr, ch)
	defer done()
	run, finished := opts.Runner()
	defer finished()
	var wg sync.WaitGroup
	sem := make(chan struct{}, runtime.GOMAXPROCS(0))
	for i, dir := range dirs {
		wg.Add(1)
		go func() {
			defer wg.Done()
			sem <- struct{}{}
			defer func() { <-sem }()
			c := run(yard.Side{}, dir, yard.WantResult)
			if c.OK() {
				c.Result.Design.Path = dir
				out[i] = c.Result
				return
			}
			out[i] = brokenResult(dir, c.Problems)
		}()
	}
	wg.Wait()
	return out
}

// printProblems writes a design's input errors as every command does: a
// count, then one error a line.
func printProblems(w io.Writer, dir string, r *result.Result) error {
	if err := report.Printf(w, "%s: %d input error(s)\n", dir, len(r.Problems)); err != nil {
		return err
	}
	return report.Problems(w, r.Problems)
}

// compileOne compiles one design in this process; on input errors the
// result carries them as problems and the error is returned too.
func compileOne(dir string) (*result.Result, error) {
	r, _, err := yard.Compile(dir)
	if err == nil {
		return r, nil
	}
	return brokenResult(dir, problemsOf(err)), err
}

// problemsOf turns an error of the compiler into a result's problems.
func problemsOf(err error) []result.Problem {
	var list compiler.ErrorList
	if errors.As(err, &list) {
		return list.Problems()
	}
	return []result.Problem{{Message: err.Error()}}
}

// brokenResult is the result of a design that did not compile.
func brokenResult(dir string, problems []result.Problem) *result.Result {
	return &result.Result{Version: result.Version, Design: result.Identity{Path: dir}, Figures: []result.Figure{}, Checks: []result.Finding{}, Problems: problems}
}
