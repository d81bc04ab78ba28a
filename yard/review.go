package yard

import (
	"sort"
	"strconv"

	"cuelang.org/go/cue"

	"github.com/ampwright/ampwright/result"
)

// compiled is one side of a hull in a diff: its input values and where
// each is written, as a worker sends them back.
type compiled struct {
	inputs  map[string]string
	entries map[string]string
	own     map[string]bool
}

func compiledOf(c Compiled) compiled {
	return compiled{inputs: c.Inputs, entries: c.Entries, own: c.Own}
}

// has reports whether the side has a value at p.
func (c compiled) has(p string) bool {
	_, ok := c.inputs[p]
	return ok
}

// entry is the entry of the design the input at p belongs to.
func (c compiled) entry(p string) string {
	if e, ok := c.entries[p]; ok {
		return e
	}
	if sels := cue.ParsePath(p).Selectors(); len(sels) > 0 {
		return cue.MakePath(sels[0]).String()
	}
	return p
}

// splitInputs sorts a hull's input changes into those written in its own
// files, grouped by entry, and those it takes from outside them (a catalog
// part, a table of the yard's rulebook, another imported value), grouped
// by part or table so that the diff can list each once for the yard.
//
// A part's value counts as shared only when the part's id is the same on
// both sides: a hull that swaps one catalog battery for another changes
// its own bank, though every value of the battery comes from the catalog.
func splitInputs(changes []result.InputChange, base, head compiled) ([]result.EntryChange, []result.SharedChange) {
	var own []result.InputChange
	shared := map[string]*result.SharedChange{}
	var order []string
	entryOf := func(p string) string {
		if head.has(p) {
			return head.entry(p)
		}
		return base.entry(p)
	}
	for _, c := range changes {
		s, ok := sharedOf(c, base, head, entryOf)
		if !ok {
			own = append(own, c)
			continue
		}
		k := s.Kind + "\x00" + s.Subject
		sc, seen := shared[k]
		if !seen {
			sc = &s
			shared[k] = sc
			order = append(order, k)
			continue
		}
		// A part used in several places (a terminal on every run of a
		// size) shows each of its changes once.
		dup := false
		for _, have := range sc.Changes {
			dup = dup || have == s.Changes[0]
		}
		if !dup {
			sc.Changes = append(sc.Changes, s.Changes[0])
		}
	}
	entries := result.GroupEntries(own, entryOf)
	sort.Strings(order)
	out := make([]result.SharedChange, 0, len(order))
	for _, k := range order {
		sc := shared[k]
		sort.Slice(sc.Changes, func(i, j int) bool { return sc.Changes[i].Path < sc.Changes[j].Path })
		out = append(out, *sc)
	}
	return entries, out
}

// sharedOf returns the shared change that input change c is a part of, or
// false when the hull's own files make it.
func sharedOf(c result.InputChange, base, head compiled, entryOf func(string) string) (result.SharedChange, bool) {
	if base.own[c.Path] || head.own[c.Path] {
		return result.SharedChange{}, false
	}
	sels := cue.ParsePath(c.Path).Selectors()
	for k := len(sels) - 1; k >= 1; k-- {
		prefix := cue.MakePath(sels[:k]...).String()
		bid, inBase := base.inputs[prefix+".id"]
		hid, inHead := head.inputs[prefix+".id"]
		if !inBase && !inHead {
			continue
		}
		if !inBase || !inHead || bid != hid {
			return result.SharedChange{}, false // a part swapped, added or removed
		}
		id := unquote(hid)
		return result.SharedChange{
			Kind: result.SharedPart, Part: id, Subject: partKind(sels[:k]) + " " + id,
			Changes: []result.InputChange{{Path: result.RelPath(c.Path, prefix), Old: c.Old, New: c.New}},
		}, true
	}
	if len(sels) > 0 && sels[0].String() == "rules" {
		subject, prefix := "rulebook", "rules"
		if len(sels) > 2 {
			subject, prefix = "rulebook table "+sels[1].String(), cue.MakePath(sels[:2]...).String()
		}
		return result.SharedChange{Kind: result.SharedRules, Subject: subject,
			Changes: []result.InputChange{{Path: result.RelPath(c.Path, prefix), Old: c.Old, New: c.New}}}, true
	}
	e := entryOf(c.Path)
	return result.SharedChange{Kind: result.SharedValue, Subject: e,
		Changes: []result.InputChange{{Path: result.RelPath(c.Path, e), Old: c.Old, New: c.New}}}, true
}

// partKind names a part by where a design holds it: the field's name
// (battery, module, protection, cable, terminal), or, for a field named
// part, its collection's (controller, inverter, busbar).
func partKind(sels []cue.Selector) string {
	last := sels[len(sels)-1].String()
	switch last {
	case "part":
		switch sels[0].String() {
		case "controllers":
			return "controller"
		case "inverters":
			return "inverter"
		case "buses":
			return "busbar"
		case "chargers":
			return "charger"
		}
	case "returnCable":
		return "cable"
	case "stringFuse":
		return "protection"
	}
	return last
}

// unquote is the string a quoted input value holds, or the value as it is.
func unquote(s string) string {
	if u, err := strconv.Unquote(s); err == nil {
		return u
	}
	return s
}
