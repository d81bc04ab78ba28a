package main

import (
	"bytes"
	"encoding/json"
	"fmt"
	"io"
	"os"
	"path"
	"path/filepath"
	"strconv"
	"strings"

	"github.com/spf13/cobra"

	"github.com/ampwright/ampwright/compiler"
	"github.com/ampwright/ampwright/report"
	"github.com/ampwright/ampwright/result"
	"github.com/ampwright/ampwright/schema"
	"github.com/ampwright/ampwright/yard"
)

const (
	flagShard   = "shard"
	flagMerge   = "merge"
	flagSort    = "sort"
	flagFailing = "failing"
	flagWarning = "warning"
	flagUses    = "uses"
	flagSince   = "since"
	flagPacks   = "packs"
)

type fleetOptions struct {
	format, shard          string
	merge                  bool
	sort                   string
	failing, warning, uses string
	since, packs, paper    string
	cache                  string
	stdout                 io.Writer
	stderr                 io.Writer
}

func newFleetCmd() *cobra.Command {
	opts := &fleetOptions{}
	c := &cobra.Command{
		Use:   "fleet DIR | fleet --merge FILE...",
		Short: "Check every hull of a yard, one line per hull",
		Long: `fleet finds every hull under DIR (a package that declares a vessel; cue.mod
and hidden directories are skipped), compiles them concurrently, as many at
once as there are cores, and prints one line per hull, sorted by path:
verdict, failing and warning counts, cost (the bill of materials' total,
"incomplete" when a part has no price), bank, array, worst voltage drop
against its limit, the lowest state of charge on the design voyage, and
the IDs of the checks that fail and warn. A broken hull is reported with
its errors and does not stop the others; each hull is compiled in a worker
process, and one that passes --timeout or --max-memory is stopped and
reported broken. A DIR with no hulls is an error: a mistyped yard must
fail a CI job, not pass it.

--sort verdict puts the worst hulls first, --sort cost the dearest.
--failing CHECK and --warning CHECK keep the hulls on which a check fails
or warns, and --uses PART those whose bill of materials has a part (by its
catalog id): which hulls does a catalog change reach? CHECK and PART may be
globs ('wiring.*', '*'). Broken hulls are always kept: their checks and
parts are unknown.

--since REV marks the hulls whose inputs (their files and everything they
import) differ from those at git revision REV, or are new since; nothing
is compiled twice. --packs DIR writes the calculation pack of each hull
listed, or with --since of each changed hull, to DIR/<hull>.pdf, from the
same compilation.

--shard K/N takes a stable 1/N share of the hulls, so a large yard can be
spread over the parallel jobs of a CI matrix; --merge combines the shards'
JSON outputs into one fleet (the filters and --sort apply to it too), and
renders a fleet's JSON again as text or Markdown without compiling.

` + cacheHelp("Each hull's result") + `

A fleet looks every hull up before it starts a worker: a fleet of hulls all
found compiles nothing.

A progress bar is shown on a terminal, never when the output is not a
terminal or CI is set.

Exit status: 0 every hull listed passes or warns, 1 a hull fails a check,
2 a hull has input errors, DIR has no hulls, or a usage error.`,
		Example: `  ampwright fleet designs
  ampwright fleet --sort verdict designs
  ampwright fleet --failing 'wiring.*' designs
  ampwright fleet --uses tern-agm105 designs
  ampwright fleet --since origin/main --packs out/packs --format json designs > fleet.json
  ampwright fleet --merge fleet.json --format markdown >> "$GITHUB_STEP_SUMMARY"
  ampwright fleet --shard 2/4 --format json designs > shard-2.json
  ampwright fleet --merge shard-*.json
  ampwright fleet --result-cache "$RUNNER_TEMP/ampwright-cache" designs
  ampwright fleet --result-cache off designs`,
		RunE: func(cmd *cobra.Command, args []string) error {
			if err := checkFormat(opts.format, "text", "json", "markdown"); err != nil {
				return err
			}
			switch opts.sort {
			case result.ByPath, result.ByVerdict, result.ByCost:
			default:
				return usageError("--%s %q: expected path|verdict|cost", flagSort, opts.sort)
			}
			for name, pattern := range map[string]string{flagFailing: opts.failing, flagWarning: opts.warning, flagUses: opts.uses} {
				if _, err := path.Match(pattern, ""); err != nil {
					return usageError("--%s %q: %v", name, pattern, err)
				}
			}
			opts.stdout, opts.stderr = cmd.OutOrStdout(), cmd.ErrOrStderr()
			if opts.merge {
				if len(args) == 0 {
					return usageError("--merge needs the JSON files of the shards")
				}
				if opts.since != "" || opts.packs != "" {
					return usageError("--%s and --%s compile the yard; give them without --merge", flagSince, flagPacks)
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
	c.Flags().StringVar(&opts.sort, flagSort, result.ByPath, "order: path|verdict|cost")
	c.Flags().StringVar(&opts.failing, flagFailing, "", "keep the hulls on which a check matching CHECK fails")
	c.Flags().StringVar(&opts.warning, flagWarning, "", "keep the hulls on which a check matching CHECK warns")
	c.Flags().StringVar(&opts.uses, flagUses, "", "keep the hulls whose bill of materials has a part matching PART")
	c.Flags().StringVar(&opts.since, flagSince, "", "mark the hulls whose inputs changed since git revision REV")
	c.Flags().StringVar(&opts.packs, flagPacks, "", "write the pack of each hull listed (with --since, each changed hull) into DIR")
	c.Flags().StringVar(&opts.paper, flagPaper, "a4", "paper size of the packs: a4|letter")
	cacheFlag(c, &opts.cache)
	_ = c.MarkFlagDirname(flagPacks)
	_ = c.RegisterFlagCompletionFunc(flagSort, func(*cobra.Command, []string, string) ([]string, cobra.ShellCompDirective) {
		return []string{result.ByPath, result.ByVerdict, result.ByCost}, cobra.ShellCompDirectiveNoFileComp
	})
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
	paper, err := paperSize(opts.paper)
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
	if len(all) == 0 {
		return &exitError{code: exitInput, err: fmt.Errorf("%s: no hulls found (a hull is a package with a top-level vessel field; cue.mod and hidden directories are skipped)", dir)}
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
	changed, err := changedSince(opts.since, dir, hulls)
	if err != nil {
		return &exitError{code: exitInput, err: err}
	}
	f.Since = opts.since
	keep := func(h string) bool { return opts.packs != "" && (opts.since == "" || changed[h]) }
	run, done := newPool(opts.stderr, openCache(opts.cache, opts.stderr))
	defer done()
	run.Progress, run.Keep = progressBar(opts.stderr), keep
	var results map[string]*result.Result
	f.Hulls, results = yard.Fleet(dir, hulls, run)
	for i := range f.Hulls {
		f.Hulls[i].Changed = changed[f.Hulls[i].Path]
	}
	filterFleet(opts, f)
	if opts.packs != "" {
		// Only the hulls listed get a pack: the filters apply.
		listed := map[string]bool{}
		for _, l := range f.Hulls {
			listed[l.Path] = true
		}
		for h := range results {
			if !listed[h] {
				delete(results, h)
			}
		}
		if err := writePacks(opts, dir, paper, results); err != nil {
			return err
		}
	}
	return printFleet(opts, f)
}

// changedSince marks the hulls (relative to dir) whose inputs differ from
// those at revision since; nil without one.
func changedSince(since, dir string, hulls []string) (map[string]bool, error) {
	if since == "" {
		return nil, nil
	}
	root, err := yardRoot(dir)
	if err != nil {
		return nil, err
	}
	absDir, err := filepath.Abs(dir)
	if err != nil {
		return nil, err
	}
	prefix, err := filepath.Rel(root, absDir)
	if err != nil {
		return nil, err
	}
	inModule := make([]string, len(hulls))
	for i, h := range hulls {
		inModule[i] = path.Join(filepath.ToSlash(prefix), h)
	}
	c, err := yard.ChangedSince(root, since, inModule)
	if err != nil {
		return nil, err
	}
	out := map[string]bool{}
	for i, h := range hulls {
		out[h] = c[inModule[i]]
	}
	return out, nil
}

// writePacks renders the packs of the results given into the packs
// directory, one DIR/<hull>.pdf each, in path order.
func writePacks(opts *fleetOptions, dir, paper string, results map[string]*result.Result) error {
	date, err := sourceDateEpoch()
	if err != nil {
		return usageError("%v", err)
	}
	for _, h := range schema.Names(results) {
		// The cover's history is git's, asked afresh of the hull's files.
		var history result.History
		if g, err := compiler.Gather(filepath.Join(dir, filepath.FromSlash(h))); err == nil {
			history = yard.History(g.Root, g.Paths())
		}
		var b bytes.Buffer
		if err := report.Pack(&b, results[h], report.PackOptions{PageSize: paper, Date: date, History: history}); err != nil {
			return &exitError{code: exitInput, err: fmt.Errorf("%s: %v", h, err)}
		}
		out := filepath.Join(opts.packs, filepath.FromSlash(h)+".pdf")
		if err := os.MkdirAll(filepath.Dir(out), 0o755); err != nil {
			return &exitError{code: exitInput, err: err}
		}
		if err := writeFileAtomic(out, b.Bytes()); err != nil {
			return &exitError{code: exitInput, err: fmt.Errorf("cannot write %s: %v", out, pathErr(err))}
		}
	}
	fmt.Fprintf(opts.stderr, "wrote %d pack(s) to %s\n", len(results), opts.packs)
	return nil
}

// filterFleet keeps the hulls that --failing, --warning and --uses ask
// for (and the broken ones, whose checks and parts are unknown), and
// orders them by --sort.
func filterFleet(opts *fleetOptions, f *result.Fleet) {
	var filters []string
	for _, fl := range []struct {
		flag, pattern string
		match         func(result.FleetLine, string) bool
	}{
		{flagFailing, opts.failing, result.FleetLine.Fails},
		{flagWarning, opts.warning, result.FleetLine.Warns},
		{flagUses, opts.uses, result.FleetLine.Uses},
	} {
		if fl.pattern == "" {
			continue
		}
		filters = append(filters, "--"+fl.flag+" "+fl.pattern)
		if f.Of == 0 {
			f.Of = len(f.Hulls)
		}
		kept := f.Hulls[:0]
		for _, l := range f.Hulls {
			if l.Broken() || fl.match(l, fl.pattern) {
				kept = append(kept, l)
			}
		}
		f.Hulls = kept
	}
	if len(filters) > 0 {
		f.Filter = strings.Join(filters, " ")
	}
	result.SortFleetBy(f.Hulls, opts.sort)
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
		if f.Since != "" {
			merged.Since = f.Since
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
	filterFleet(opts, merged)
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
