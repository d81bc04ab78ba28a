package yard

import (
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
		return hullsIn(s.Rev.FS())
	}
	return Hulls(s.Dir, nil)
}

// compile compiles a hull of the side, without git's facts.
func (s Side) compile(hull string) (*result.Result, *compiler.Design, error) {
	if s.Rev != nil {
		g, err := s.gather(hull, nil)
		if err != nil {
			return nil, nil, compiler.GatherError(err)
		}
		return g.Compile()
	}
	return compiler.Compile(hullDir(s.Dir, hull))
}

// gather reads the files of a hull of the side, through rd for a side on
// disk when rd is not nil.
func (s Side) gather(hull string, rd *compiler.Reader) (*compiler.Gathered, error) {
	switch {
	case s.Rev != nil:
		return compiler.GatherFS(s.Rev.FS(), hull, s.Rev.Label())
	case rd != nil:
		return rd.Gather(hullDir(s.Dir, hull))
	}
	return compiler.Gather(hullDir(s.Dir, hull))
}

// DiffYard compares every hull of a yard between two sides, compiling as
// opts says. A hull whose inputs are the same on both sides (its own files
// and everything it imports, catalog and rulebook included: see
// comparison) is listed as unchanged without being compiled. A base read
// from git is read only where it differs from the head: its hulls are
// listed from the head's where their directories are the same, and a
// hull's files are read from git only to compile it.
func DiffYard(base, head Side, opts Options) (*result.YardDelta, error) {
	cmp := newComparison(base, head)
	defer cmp.close()
	var hh []string
	var err error
	if head.Rev == nil {
		hh, err = cmp.head.hulls()
	} else {
		hh, err = head.hulls()
	}
	if err != nil {
		return nil, err
	}
	var bh []string
	if base.Rev != nil {
		bh = cmp.baseHulls(hh)
	} else if bh, err = base.hulls(); err != nil {
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
	names := schema.Names(at)
	run, done := opts.Runner()
	defer done()
	deltas := make([]result.HullDelta, len(names))
	taken := make([][]result.SharedChange, len(names))
	each(len(names), opts, func(i int) {
		hull := names[i]
		sides := at[hull]
		switch {
		case !sides[1]:
			deltas[i] = result.HullDelta{Path: hull, State: result.HullRemoved}
			if c := run(base, hull, WantResult); c.OK() {
				deltas[i].Name, deltas[i].Hull = c.Result.Design.Name, c.Result.Design.Hull
			}
		case !sides[0]:
			deltas[i] = headOnly(run(head, hull, WantResult), hull)
		case cmp.unchanged(hull):
			// Found here rather than before the loop, so that the first
			// changed hull is compiling while the others are compared.
			deltas[i] = result.HullDelta{Path: hull, State: result.HullUnchanged}
		default:
			// The two sides at once: a diff of one changed hull takes
			// the time of one compile, given two cores.
			var b Compiled
			done := make(chan struct{})
			go func() {
				defer close(done)
				b = run(base, hull, WantInputs)
			}()
			h := run(head, hull, WantInputs)
			<-done
			deltas[i], taken[i] = diffHull(b, h, hull)
		}
	})
	yd.Hulls = deltas
	yd.Counts = countDelta(yd.Hulls)
	byHull := map[string][]result.SharedChange{}
	for i, t := range taken {
		byHull[names[i]] = t
	}
	if shared := result.CollectShared(yd.Hulls, byHull); len(shared) > 0 {
		yd.Shared = shared
	}
	return yd, nil
}

// headOnly is a hull added at the head: every finding that does not pass
// counts against it.
func headOnly(h Compiled, hull string) result.HullDelta {
	if !h.OK() {
		return broken(hull, h.Problems)
	}
	r := h.Result
	empty := &result.Result{Design: r.Design, BOM: &result.BOM{Complete: true}}
	hd := result.Compare(empty, r)
	hd.Path, hd.State, hd.Figures = hull, result.HullAdded, nil
	return hd
}

// diffHull compares one hull present on both sides, and returns with its
// delta the shared changes (catalog parts, rulebook tables) it takes.
func diffHull(b, h Compiled, hull string) (result.HullDelta, []result.SharedChange) {
	if !h.OK() {
		return broken(hull, h.Problems), nil
	}
	br := b.Result
	if !b.OK() {
		// A base that did not compile: compare with an empty design, so
		// that every finding of the head shows.
		br = &result.Result{Design: h.Result.Design, BOM: &result.BOM{Complete: true}}
	}
	delta := result.Compare(br, h.Result)
	delta.Path = hull
	var shared []result.SharedChange
	if b.OK() {
		delta.Inputs = result.CompareInputs(b.Inputs, h.Inputs)
		delta.Entries, shared = splitInputs(delta.Inputs, compiledOf(b), compiledOf(h))
		if rv := h.Review; rv != nil {
			delta.Margins = result.ShrunkMargins(br, h.Result, rv.Shrink, rv.Near)
		}
	}
	if !delta.HasChanges() {
		delta.State = result.HullUnchanged
	}
	return delta, shared
}

func broken(hull string, problems []result.Problem) result.HullDelta {
	return result.HullDelta{Path: hull, State: result.HullBroken, Problems: problems}
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
