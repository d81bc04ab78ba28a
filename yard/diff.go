package yard

import (
	"errors"
	"path/filepath"

	"github.com/ampwright/ampwright/compiler"
	"github.com/ampwright/ampwright/result"
	"github.com/ampwright/ampwright/schema"
)

// Side is one side of a comparison: a yard module on disk, or a yard
// module read from a git revision.
type Side struct {
	// Name is how the side is shown: a revision, "working tree", a path.
	Name string
	// Dir is the module root on disk, used when Rev is nil.
	Dir string
	// Rev is the module read from a git revision.
	Rev *Revision
}

func (s Side) hulls() ([]string, error) {
	if s.Rev != nil {
		return Hulls("", s.Rev.Source)
	}
	return Hulls(s.Dir, nil)
}

func (s Side) compile(hull string) (*result.Result, *compiler.Design, error) {
	var r *result.Result
	var d *compiler.Design
	var err error
	if s.Rev != nil {
		r, d, err = compiler.CompileFrom(hull, s.Rev.Source)
		if err == nil {
			attach(r, Facts{Revision: s.Rev.Commit, Time: s.Rev.Time})
		}
	} else {
		r, d, err = Compile(filepath.Join(s.Dir, filepath.FromSlash(hull)))
	}
	if r != nil {
		r.Design.Path = hull
	}
	return r, d, err
}

// DiffYard compares every hull of a yard between two sides. A hull whose
// inputs are the same on both sides (its own files and everything it
// imports, catalog and rulebook included, found by quickHasher) is listed
// as unchanged without being compiled.
func DiffYard(base, head Side) (*result.YardDelta, error) {
	bh, err := base.hulls()
	if err != nil {
		return nil, err
	}
	hh, err := head.hulls()
	if err != nil {
		return nil, err
	}
	at := map[string][2]bool{}
	for _, h := range bh {
		v := at[h]
		v[0] = true
		at[h] = v
	}
	for _, h := range hh {
		v := at[h]
		v[1] = true
		at[h] = v
	}
	yd := &result.YardDelta{Base: base.Name, Head: head.Name, Hulls: []result.HullDelta{}}
	bq, hq := newQuickHasher(base), newQuickHasher(head)
	taken := map[string][]result.SharedChange{}
	for _, hull := range schema.Names(at) {
		sides := at[hull]
		var hd result.HullDelta
		switch {
		case !sides[1]:
			hd = result.HullDelta{Path: hull, State: result.HullRemoved}
			if r, _, err := base.compile(hull); err == nil {
				hd.Name, hd.Hull = r.Design.Name, r.Design.Hull
			}
		case !sides[0]:
			hd = headOnly(head, hull)
		default:
			hd, taken[hull] = diffHull(base, head, hull, bq, hq)
		}
		yd.Hulls = append(yd.Hulls, hd)
	}
	yd.Counts = countDelta(yd.Hulls)
	if shared := result.CollectShared(yd.Hulls, taken); len(shared) > 0 {
		yd.Shared = shared
	}
	return yd, nil
}

// headOnly is a hull added at the head: every finding that does not pass
// counts against it.
func headOnly(head Side, hull string) result.HullDelta {
	r, _, err := head.compile(hull)
	if err != nil {
		return broken(hull, err)
	}
	empty := &result.Result{Design: r.Design, BOM: &result.BOM{Complete: true}}
	hd := result.Compare(empty, r)
	hd.Path, hd.State, hd.Figures = hull, result.HullAdded, nil
	return hd
}

// diffHull compares one hull present on both sides, and returns with its
// delta the shared changes (catalog parts, rulebook tables) it takes.
func diffHull(base, head Side, hull string, bq, hq *quickHasher) (result.HullDelta, []result.SharedChange) {
	bHash, bErr := bq.Hash(hull)
	hHash, hErr := hq.Hash(hull)
	if bErr == nil && hErr == nil && bHash == hHash {
		return result.HullDelta{Path: hull, State: result.HullUnchanged}, nil
	}
	// The two sides compile at once, one a core, each listing its inputs.
	type side struct {
		r   *result.Result
		c   compiled
		err error
	}
	run := func(s Side) side {
		r, d, err := s.compile(hull)
		if err != nil {
			return side{err: err}
		}
		return side{r: r, c: compiled{d: d, inputs: d.Inputs()}}
	}
	bc := make(chan side, 1)
	go func() { bc <- run(base) }()
	h := run(head)
	b := <-bc
	if h.err != nil {
		return broken(hull, h.err), nil
	}
	br := b.r
	if b.err != nil {
		// A base that did not compile: compare with an empty design, so
		// that every finding of the head shows.
		br = &result.Result{Design: h.r.Design, BOM: &result.BOM{Complete: true}}
	}
	delta := result.Compare(br, h.r)
	delta.Path = hull
	var shared []result.SharedChange
	if b.err == nil {
		delta.Inputs = result.CompareInputs(b.c.inputs, h.c.inputs)
		delta.Entries, shared = splitInputs(delta.Inputs, b.c, h.c)
		if rv := h.c.d.Rules.Review; rv != nil {
			delta.Margins = result.ShrunkMargins(br, h.r, rv.Shrink, rv.Near)
		}
	}
	if !delta.HasChanges() {
		delta.State = result.HullUnchanged
	}
	return delta, shared
}

func broken(hull string, err error) result.HullDelta {
	hd := result.HullDelta{Path: hull, State: result.HullBroken}
	var list compiler.ErrorList
	if errors.As(err, &list) {
		hd.Problems = list.Problems()
	} else {
		hd.Problems = []result.Problem{{Message: err.Error()}}
	}
	return hd
}

func countDelta(hs []result.HullDelta) result.DeltaCounts {
	c := result.DeltaCounts{Hulls: len(hs)}
	for i := range hs {
		h := &hs[i]
		switch h.State {
		case result.HullUnchanged:
			c.Unchanged++
		case result.HullChanged:
			c.Changed++
		case result.HullAdded:
			c.Added++
		case result.HullRemoved:
			c.Removed++
		case result.HullBroken:
			c.Broken++
		}
		c.Regressions += h.Regressions()
		c.Fixes += h.Fixes()
		c.Margins += len(h.Margins)
		for _, f := range h.Findings {
			if f.New == result.Fail {
				c.Failing++
			}
		}
	}
	return c
}
