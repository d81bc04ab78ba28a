package main

import (
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"strings"
	"time"

	"github.com/spf13/cobra"

	"github.com/ampwright/ampwright/compiler"
	"github.com/ampwright/ampwright/propose"
	"github.com/ampwright/ampwright/report"
	"github.com/ampwright/ampwright/result"
)

type proposeOptions struct {
	out    string
	format string
	stdout io.Writer
	stderr io.Writer
}

func newProposeCmd() *cobra.Command {
	opts := &proposeOptions{}
	c := &cobra.Command{
		Use:   "propose DESIGN [-o FILE.cue | -o DIR]",
		Short: "Find the cheapest design from the yard's catalog that passes every check",
		Long: `propose keeps a hull's loads, scenarios, voyage, site and wiring (its runs,
their lengths and what they feed) and finds, from the yard's catalog, the
cheapest choice that passes every check of:

  - each bank's battery and its series × parallel;
  - each array's module and series × strings, for an array whose design
    names its mounting place (arrays.NAME.place: maxModules, or the
    place's length and width); an array without a place is kept;
  - each charge controller;
  - the part of each link the design leaves open (a link with no part,
    of the kind it names);
  - every conductor's size and cable, every protective device where the
    design has one, every bus's part and the string fuses.

It prints the proposal beside the designer's design: each change, the cost
of both (the bill of materials' total), the margins that bind, and for each
choice the next smaller option and the check it fails.

The search is a branch and bound over the catalog's options in order of
price. It is exhaustive over the combinations below the cost of the best
design found, deciding many without checking them by monotone premises (a
bigger bank never lowers the lowest state of charge, a bigger conductor
never raises a drop; they are printed); when it completes, the proposal is
proven the cheapest. It stops at --timeout (the time the whole command may
take) and then gives the cheapest passing design found so far, marked not
proven. The same inputs give the same proposal; ties go by name.

-o writes the proposal as a CUE package of one file, FILE.cue or
DIR/<hull>.cue, in a directory of its own inside the yard's module: the
hull's files merged, its other declarations kept with their comments, the
chosen parts referred to in the catalog, each change commented. It is
checked as ` + "`ampwright check`" + ` would before it is written (to a temporary
name, then renamed).

Exit status: 0 when a proposal passes every check, 1 when nothing in the
catalog passes (the checks no choice met are printed, with what would be
needed), 2 on an input or usage error.`,
		Example: `  ampwright propose designs/hulls/dunnock
  ampwright propose designs/hulls/dunnock -o designs/hulls/dunnock-proposed
  ampwright propose --timeout 20s --format json designs/hulls/tystie
  ampwright check designs/hulls/dunnock-proposed`,
		Args: cobra.ExactArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			if err := checkFormat(opts.format, "text", "json"); err != nil {
				return err
			}
			opts.stdout, opts.stderr = cmd.OutOrStdout(), cmd.ErrOrStderr()
			return runPropose(opts, args[0])
		},
	}
	formatFlag(c, &opts.format, "text", "json")
	c.Flags().StringVarP(&opts.out, flagOut, "o", "", "write the proposal as CUE: FILE.cue, or DIR for DIR/<hull>.cue")
	_ = c.MarkFlagFilename(flagOut, "cue")
	return c
}

func runPropose(opts *proposeOptions, dir string) error {
	until := time.Now().Add(compiler.DefaultLimits.Timeout)
	r, d, err := compiler.CompileOpen(dir)
	if err != nil {
		return proposeInputError(opts, dir, err)
	}
	cat, ref, err := d.Catalog()
	if err != nil {
		return proposeInputError(opts, dir, err)
	}
	target := ""
	if opts.out != "" {
		if target, err = proposalTarget(opts.out, d); err != nil {
			return usageError("-%s %s: %v", "o", opts.out, err)
		}
	}
	p, err := propose.Propose(d, r, cat, propose.Options{Until: until})
	if err != nil {
		return &exitError{code: exitInput, err: fmt.Errorf("%s: %v", dir, err)}
	}
	rep := p.Report
	if p.Spec != nil && target != "" {
		b, err := d.Rewrite(p.Spec, cat, ref, p.Header, p.Notes)
		if err != nil {
			return &exitError{code: exitInput, err: err}
		}
		// The file is checked as `ampwright check` checks it before it is
		// written: a proposal that did not pass would be this command's
		// fault, not the design's, and is not left behind.
		if err := verifyProposal(d, target, b); err != nil {
			return &exitError{code: exitInput, err: fmt.Errorf("internal error: the proposal for %s %v", target, err)}
		}
		if err := os.MkdirAll(filepath.Dir(target), 0o755); err != nil {
			return &exitError{code: exitInput, err: fmt.Errorf("cannot write %s: %v", target, pathErr(err))}
		}
		if err := writeFileAtomic(target, b); err != nil {
			return &exitError{code: exitInput, err: fmt.Errorf("cannot write %s: %v", target, pathErr(err))}
		}
		rep.File = target
	}
	if opts.format == "json" {
		err = report.JSON(opts.stdout, rep)
	} else {
		err = report.ProposalText(opts.stdout, rep)
	}
	if err != nil {
		return err
	}
	if p.Spec == nil {
		return &exitError{code: exitFail}
	}
	return nil
}

// proposeInputError prints a design's input errors and exits 2.
func proposeInputError(opts *proposeOptions, dir string, err error) error {
	var list compiler.ErrorList
	if !errors.As(err, &list) {
		return &exitError{code: exitInput, err: fmt.Errorf("%s: %v", dir, err)}
	}
	r := &result.Result{Problems: list.Problems()}
	if err := printProblems(opts.stderr, dir, r); err != nil {
		return err
	}
	return &exitError{code: exitInput}
}

// verifyProposal compiles the proposal's CUE b as if written at target,
// from the yard's module read into memory (its .cue files only, within the
// compiler's bounds), and fails unless every check passes.
func verifyProposal(d *compiler.Design, target string, b []byte) error {
	root, err := filepath.Abs(d.Root)
	if err != nil {
		return err
	}
	abs, err := filepath.Abs(target)
	if err != nil {
		return err
	}
	files := map[string][]byte{}
	err = filepath.WalkDir(root, func(p string, e os.DirEntry, err error) error {
		if err != nil {
			return err
		}
		if e.IsDir() {
			if p != root && strings.HasPrefix(e.Name(), ".") {
				return filepath.SkipDir
			}
			return nil
		}
		if !strings.HasSuffix(p, ".cue") || e.Type()&os.ModeSymlink != 0 {
			return nil
		}
		rel, err := filepath.Rel(root, p)
		if err != nil {
			return err
		}
		if files[filepath.ToSlash(rel)], err = os.ReadFile(p); err != nil {
			return err
		}
		return nil
	})
	if err != nil {
		return err
	}
	rel, err := filepath.Rel(root, abs)
	if err != nil {
		return err
	}
	files[filepath.ToSlash(rel)] = b
	vr, _, err := compiler.CompileFrom(filepath.ToSlash(filepath.Dir(rel)), &compiler.Source{Files: files, Label: filepath.ToSlash(root) + "/"})
	switch {
	case err != nil:
		return fmt.Errorf("does not load: %v", err)
	case vr.Verdict() == result.Fail:
		return fmt.Errorf("fails %s", failSummary(vr))
	}
	return nil
}

// proposalTarget is the file -o names: FILE.cue, or DIR/<hull>.cue. Its
// directory must be the proposal's own, inside the design's module (its
// catalog and rulebook imports resolve there), and hold no other .cue
// file: a CUE package is every file of its directory, and the proposal
// is a whole hull.
func proposalTarget(out string, d *compiler.Design) (string, error) {
	file := out
	if !strings.HasSuffix(out, ".cue") {
		file = filepath.Join(out, filepath.Base(filepath.Clean(d.Dir))+".cue")
	}
	abs, err := filepath.Abs(file)
	if err != nil {
		return "", err
	}
	outDir := filepath.Dir(abs)
	own, err := filepath.Abs(d.Dir)
	if err != nil {
		return "", err
	}
	if outDir == own {
		return "", fmt.Errorf("is the design's own directory; write the proposal to a directory of its own")
	}
	if root, err := filepath.Abs(d.Root); err == nil && root != own {
		if rel, err := filepath.Rel(root, outDir); err != nil || rel == ".." || strings.HasPrefix(rel, ".."+string(filepath.Separator)) {
			return "", fmt.Errorf("is outside the yard's module %s, where the proposal's imports resolve", d.Root)
		}
	}
	entries, err := os.ReadDir(outDir)
	if err != nil && !os.IsNotExist(err) {
		return "", err
	}
	for _, e := range entries {
		if !e.IsDir() && strings.HasSuffix(e.Name(), ".cue") && e.Name() != filepath.Base(abs) {
			return "", fmt.Errorf("%s holds %s: the proposal is a whole hull package and needs a directory of its own", filepath.Dir(file), e.Name())
		}
	}
	return file, nil
}
