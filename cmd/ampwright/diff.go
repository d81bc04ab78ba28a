package main

import (
	"bytes"
	"fmt"
	"io"
	"os"
	"path/filepath"

	"github.com/spf13/cobra"

	"github.com/ampwright/ampwright/report"
	"github.com/ampwright/ampwright/result"
	"github.com/ampwright/ampwright/yard"
)

const (
	flagBase     = "base"
	flagHead     = "head"
	flagFailOn   = "fail-on"
	flagMaxBytes = "max-bytes"
	flagJSONOut  = "json-out"
)

// minMaxBytes is the smallest --max-bytes: room for the heading, the
// counts and the notice that sections were left out.
const minMaxBytes = 4096

type diffOptions struct {
	base, head, format, failOn string
	cache                      string
	maxBytes                   int
	jsonOut                    string
	stdout, stderr             io.Writer
}

func newDiffCmd() *cobra.Command {
	opts := &diffOptions{}
	c := &cobra.Command{
		Use:   "diff [YARD | DIR_A DIR_B]",
		Short: "Show what a change does to every hull of a yard",
		Long: `diff compiles every hull of a yard at two revisions and reports, hull by
hull, the inputs that changed, the figures that changed (old → new,
difference, percent), the findings whose status changed (pass → fail is a
regression, fail → pass a fix) and the bill of materials and its cost.
Hulls added and removed are listed. A hull whose inputs (its own files and
everything it imports, catalog and rulebook included) are the same on both
sides is listed as unchanged without being compiled.

YARD is the yard's CUE module (default: the module holding the current
directory). The base is --base (default: the merge base with the default
branch, or HEAD), read from git's objects without touching the work tree;
the head is --head, or the work tree. Given two directories, diff compares
them instead.

The text and Markdown are a summary for the reviewer: the counts; each
change to a shared catalog part or rulebook table once, with how many hulls
use it and which regress; then the changed hulls, broken first, then those
with a regression, a fix, a margin that shrank past the rulebook's review
threshold (a warning, never a failure), and the rest; a hull's own changes
one row an entry (a load, a run, the bank). Unchanged hulls are one count.
The JSON is the whole diff.

The Markdown fits a pull-request comment: at most --max-bytes (64 KiB).
Over it, the hulls are named one a row, then the least urgent are left
out, with a notice that says so and where the full diff is. --json-out FILE writes the full JSON to FILE as well, from
the same run, for a CI job to keep as an artifact.

--format hulls prints the paths of the changed and added hulls, one a
line, for scripts (such as building a pack for each).

` + cacheHelp("Each side of a changed hull") + `

Exit status: 0 no regression, 1 a regression (or, with --fail-on failing,
any failing finding in a changed hull), 2 an error, or no hulls on either
side.`,
		Example: `  ampwright diff designs
  ampwright diff --base origin/main --format markdown designs >> "$GITHUB_STEP_SUMMARY"
  ampwright diff --base origin/main --format markdown --json-out diff.json designs > comment.md
  ampwright diff --base v1.2 --head v1.3 designs
  ampwright diff --result-cache "$RUNNER_TEMP/ampwright-cache" --base origin/main designs
  ampwright diff old-yard new-yard`,
		Args: cobra.MaximumNArgs(2),
		RunE: func(cmd *cobra.Command, args []string) error {
			if err := checkFormat(opts.format, "text", "markdown", "json", "hulls"); err != nil {
				return err
			}
			if opts.maxBytes < minMaxBytes {
				return usageError("--%s %d: expected at least %d", flagMaxBytes, opts.maxBytes, minMaxBytes)
			}
			switch opts.failOn {
			case "regression", "failing", "never":
			default:
				return usageError("--%s %q: expected regression|failing|never", flagFailOn, opts.failOn)
			}
			opts.stdout, opts.stderr = cmd.OutOrStdout(), cmd.ErrOrStderr()
			return runDiff(opts, args)
		},
	}
	c.Flags().StringVar(&opts.base, flagBase, "", "base revision (default: merge base with the default branch, or HEAD)")
	c.Flags().StringVar(&opts.head, flagHead, "", "head revision (default: the work tree)")
	c.Flags().StringVar(&opts.failOn, flagFailOn, "regression", "exit 1 on: regression|failing|never")
	c.Flags().IntVar(&opts.maxBytes, flagMaxBytes, report.DefaultMaxBytes, "the largest Markdown written, in bytes; less urgent sections are left out")
	c.Flags().StringVar(&opts.jsonOut, flagJSONOut, "", "also write the full diff as JSON to this file")
	_ = c.MarkFlagFilename(flagJSONOut, "json")
	cacheFlag(c, &opts.cache)
	formatFlag(c, &opts.format, "text", "markdown", "json", "hulls")
	return c
}

func runDiff(opts *diffOptions, args []string) error {
	var base, head yard.Side
	switch len(args) {
	case 2:
		if opts.base != "" || opts.head != "" {
			return usageError("give --base and --head with a yard, not with two directories")
		}
		for _, d := range args {
			if fi, err := os.Stat(d); err != nil || !fi.IsDir() {
				return usageError("%s is not a directory", d)
			}
		}
		base = yard.Side{Name: args[0], Dir: args[0]}
		head = yard.Side{Name: args[1], Dir: args[1]}
	default:
		dir := "."
		if len(args) == 1 {
			dir = args[0]
		}
		// A mistyped yard must fail, not fall back to a module above it.
		if fi, err := os.Stat(dir); err != nil || !fi.IsDir() {
			return usageError("%s is not a directory", dir)
		}
		root, err := yardRoot(dir)
		if err != nil {
			return &exitError{code: exitInput, err: err}
		}
		rev := opts.base
		if rev == "" {
			rev = yard.DefaultBase(root)
		}
		src, err := yard.ReadRevision(root, rev)
		if err != nil {
			return &exitError{code: exitInput, err: err}
		}
		defer src.Close()
		base = yard.Side{Name: rev, Rev: src}
		if opts.head != "" {
			hsrc, err := yard.ReadRevision(root, opts.head)
			if err != nil {
				return &exitError{code: exitInput, err: err}
			}
			defer hsrc.Close()
			head = yard.Side{Name: opts.head, Rev: hsrc}
		} else {
			head = yard.Side{Name: "work tree", Dir: root}
		}
	}
	run, done := newPool(opts.stderr, openCache(opts.cache, opts.stderr))
	defer done()
	d, err := yard.DiffYard(base, head, run)
	if err != nil {
		return &exitError{code: exitInput, err: err}
	}
	if len(d.Hulls) == 0 {
		return &exitError{code: exitInput, err: fmt.Errorf("no hulls in %s nor in %s (a hull is a package with a top-level vessel field)", base.Name, head.Name)}
	}
	if opts.jsonOut != "" {
		var b bytes.Buffer
		if err := report.JSON(&b, d); err != nil {
			return err
		}
		if err := writeFileAtomic(opts.jsonOut, b.Bytes()); err != nil {
			return &exitError{code: exitInput, err: fmt.Errorf("cannot write %s: %v", opts.jsonOut, pathErr(err))}
		}
	}
	switch opts.format {
	case "json":
		err = report.JSON(opts.stdout, d)
	case "markdown":
		err = report.DiffMarkdown(opts.stdout, d, report.DiffMarkdownOptions{MaxBytes: opts.maxBytes, FullJSON: opts.jsonOut})
	case "hulls":
		for _, h := range d.Hulls {
			if h.State == result.HullChanged || h.State == result.HullAdded {
				if err := report.Printf(opts.stdout, "%s\n", h.Path); err != nil {
					return err
				}
			}
		}
	default:
		err = report.DiffText(opts.stdout, d)
	}
	if err != nil {
		return err
	}
	if diffFails(opts.failOn, d) {
		return &exitError{code: exitFail}
	}
	return nil
}

// diffFails applies --fail-on: a regression (or a hull the change broke),
// any failing finding in a changed hull, or never.
func diffFails(failOn string, d *result.YardDelta) bool {
	switch failOn {
	case "never":
		return false
	case "failing":
		return d.Counts.Failing > 0 || d.Counts.Regressions > 0 || d.Counts.Broken > 0
	}
	return d.Counts.Regressions > 0 || d.Counts.Broken > 0
}

// yardRoot finds the CUE module holding dir.
func yardRoot(dir string) (string, error) {
	abs, err := filepath.Abs(dir)
	if err != nil {
		return "", err
	}
	for d := abs; ; {
		if fi, err := os.Stat(filepath.Join(d, "cue.mod")); err == nil && fi.IsDir() {
			return d, nil
		}
		parent := filepath.Dir(d)
		if parent == d {
			return "", fmt.Errorf("%s is not in a CUE module (no cue.mod directory above it)", dir)
		}
		d = parent
	}
}
