package main

import (
	"encoding/json"
	"fmt"
	"io"
	"os"
	"strconv"
	"strings"

	"github.com/spf13/cobra"

	"github.com/ampwright/ampwright/report"
	"github.com/ampwright/ampwright/result"
	"github.com/ampwright/ampwright/yard"
)

const (
	flagShard = "shard"
	flagMerge = "merge"
)

type fleetOptions struct {
	format, shard string
	merge         bool
	stdout        io.Writer
	stderr        io.Writer
}

func newFleetCmd() *cobra.Command {
	opts := &fleetOptions{}
	c := &cobra.Command{
		Use:   "fleet DIR | fleet --merge FILE...",
		Short: "Check every hull of a yard, one line per hull",
		Long: `fleet finds every hull under DIR (a package that declares a vessel; cue.mod
and hidden directories are skipped), compiles them concurrently, as many at
once as there are cores, and prints one line per hull, sorted by path:
verdict, failing and warning counts, bank, array, worst voltage drop
against its limit and the lowest state of charge on the design voyage. A
broken hull is reported with its errors and does not stop the others;
each hull is compiled in a worker process, and one that passes --timeout
or --max-memory is stopped and reported broken.

--shard K/N takes a stable 1/N share of the hulls, so a large yard can be
spread over the parallel jobs of a CI matrix; --merge combines the shards'
JSON outputs into one fleet.

A progress bar is shown on a terminal, never when the output is not a
terminal or CI is set.

Exit status: 0 every hull passes or warns, 1 a hull fails a check, 2 a hull
has input errors (or a usage error).`,
		Example: `  ampwright fleet designs
  ampwright fleet --format markdown designs >> "$GITHUB_STEP_SUMMARY"
  ampwright fleet --shard 2/4 --format json designs > shard-2.json
  ampwright fleet --merge shard-*.json`,
		RunE: func(cmd *cobra.Command, args []string) error {
			if err := checkFormat(opts.format, "text", "json", "markdown"); err != nil {
				return err
			}
			opts.stdout, opts.stderr = cmd.OutOrStdout(), cmd.ErrOrStderr()
			if opts.merge {
				if len(args) == 0 {
					return usageError("--merge needs the JSON files of the shards")
				}
				return runFleetMerge(opts, args)
			}
			if len(args) != 1 {
				return usageError("fleet needs one yard directory")
			}
			return runFleet(opts, args[0])
		},
	}
	formatFlag(c, &opts.format, "text", "json", "markdown")
	c.Flags().StringVar(&opts.shard, flagShard, "", "take share K of N of the hulls: K/N")
	c.Flags().BoolVar(&opts.merge, flagMerge, false, "merge the JSON outputs of shards given as arguments")
	return c
}

func parseShard(s string) (k, n int, err error) {
	if s == "" {
		return 1, 1, nil
	}
	a, b, ok := strings.Cut(s, "/")
	k, err1 := strconv.Atoi(a)
	n, err2 := strconv.Atoi(b)
	if !ok || err1 != nil || err2 != nil || n < 1 || k < 1 || k > n {
		return 0, 0, usageError("--%s %q: expected K/N with 1 ≤ K ≤ N, such as 2/4", flagShard, s)
	}
	return k, n, nil
}

func runFleet(opts *fleetOptions, dir string) error {
	k, n, err := parseShard(opts.shard)
	if err != nil {
		return err
	}
	if fi, err := os.Stat(dir); err != nil || !fi.IsDir() {
		return usageError("%s is not a directory", dir)
	}
	all, err := yard.Hulls(dir, nil)
	if err != nil {
		return &exitError{code: exitInput, err: err}
	}
	var hulls []string
	for _, h := range all {
		if yard.InShard(h, k, n) {
			hulls = append(hulls, h)
		}
	}
	f := &result.Fleet{Version: result.Version}
	if n > 1 {
		f.Shard = opts.shard
	}
	run, done := newPool(opts.stderr)
	defer done()
	run.Progress = progressBar(opts.stderr)
	f.Hulls = yard.Fleet(dir, hulls, run)
	return printFleet(opts, f)
}

func runFleetMerge(opts *fleetOptions, files []string) error {
	merged := &result.Fleet{Version: result.Version, Hulls: []result.FleetLine{}}
	seen := map[string]string{}
	for _, name := range files {
		b, err := os.ReadFile(name)
		if err != nil {
			return &exitError{code: exitInput, err: err}
		}
		var f result.Fleet
		if err := json.Unmarshal(b, &f); err != nil {
			return &exitError{code: exitInput, err: fmt.Errorf("%s: not a fleet JSON result: %v", name, err)}
		}
		for _, l := range f.Hulls {
			if other, dup := seen[l.Path]; dup {
				return &exitError{code: exitInput, err: fmt.Errorf("hull %s is in both %s and %s", l.Path, other, name)}
			}
			seen[l.Path] = name
			merged.Hulls = append(merged.Hulls, l)
		}
	}
	result.SortFleet(merged.Hulls)
	return printFleet(opts, merged)
}

func printFleet(opts *fleetOptions, f *result.Fleet) error {
	if f.Hulls == nil {
		f.Hulls = []result.FleetLine{}
	}
	var err error
	switch opts.format {
	case "json":
		err = report.JSON(opts.stdout, f)
	case "markdown":
		err = report.FleetMarkdown(opts.stdout, f)
	default:
		err = report.FleetText(opts.stdout, f)
	}
	if err != nil {
		return err
	}
	code := exitOK
	for _, l := range f.Hulls {
		switch {
		case l.Broken():
			code = exitInput
		case l.Verdict == result.Fail && code == exitOK:
			code = exitFail
		}
	}
	if code != exitOK {
		return &exitError{code: code}
	}
	return nil
}

// progressBar returns a progress callback drawing on w when w is a
// terminal and CI is not set, else nil.
func progressBar(w io.Writer) func(done, total int) {
	f, ok := w.(*os.File)
	if !ok || os.Getenv("CI") != "" {
		return nil
	}
	fi, err := f.Stat()
	if err != nil || fi.Mode()&os.ModeCharDevice == 0 {
		return nil
	}
	return func(done, total int) {
		const width = 30
		n := done * width / total
		fmt.Fprintf(f, "\r[%s%s] %d/%d hulls", strings.Repeat("#", n), strings.Repeat(".", width-n), done, total)
		if done == total {
			fmt.Fprint(f, "\r\033[K")
		}
	}
}
