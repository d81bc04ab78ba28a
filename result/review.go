package result

import (
	"math"
	"sort"
	"strings"
)

// The ways an entry of a design can change.
const (
	EntryAdded   = "added"
	EntryRemoved = "removed"
	EntryChanged = "changed"
)

// EntryChange is one entry of a design that was added, removed or changed
// (a load, a conductor run, an array, the bank, the vessel), with the
// input values under it: a reviewer reads one row for an added load
// rather than one for each of its values.
type EntryChange struct {
	// Entry is the entry's CUE path: loads.fridge, wiring."panel-pilot".
	Entry  string `json:"entry"`
	Change string `json:"change"`
	// Inputs are the values that differ, their paths relative to the
	// entry ("" for the entry's own value).
	Inputs []InputChange `json:"inputs"`
}

// GroupEntries groups input changes by the entry each belongs to, as
// entryOf names it. An entry whose every value is new is added, one whose
// every value is gone is removed. Entries are sorted by path, and each
// entry's inputs put a part's id first, since a changed id says the part
// was swapped and the other values follow from it.
func GroupEntries(changes []InputChange, entryOf func(path string) string) []EntryChange {
	byEntry := map[string]*EntryChange{}
	var order []string
	for _, c := range changes {
		e := entryOf(c.Path)
		ec, ok := byEntry[e]
		if !ok {
			ec = &EntryChange{Entry: e}
			byEntry[e] = ec
			order = append(order, e)
		}
		ec.Inputs = append(ec.Inputs, InputChange{Path: RelPath(c.Path, e), Old: c.Old, New: c.New})
	}
	sort.Strings(order)
	out := make([]EntryChange, 0, len(order))
	for _, e := range order {
		ec := byEntry[e]
		added, removed := true, true
		for _, in := range ec.Inputs {
			added = added && in.Old == ""
			removed = removed && in.New == ""
		}
		switch {
		case added:
			ec.Change = EntryAdded
		case removed:
			ec.Change = EntryRemoved
		default:
			ec.Change = EntryChanged
		}
		sortIDFirst(ec.Inputs)
		out = append(out, *ec)
	}
	return out
}

func sortIDFirst(ins []InputChange) {
	isID := func(p string) bool { return p == "id" || strings.HasSuffix(p, ".id") }
	sort.SliceStable(ins, func(i, j int) bool {
		a, b := isID(ins[i].Path), isID(ins[j].Path)
		if a != b {
			return a
		}
		return ins[i].Path < ins[j].Path
	})
}

// RelPath is the CUE path p relative to prefix, "" when p is prefix, or p
// itself when prefix is not a prefix of it on a selector boundary.
func RelPath(p, prefix string) string {
	switch {
	case p == prefix:
		return ""
	case prefix == "" || !strings.HasPrefix(p, prefix):
		return p
	}
	rest := p[len(prefix):]
	switch rest[0] {
	case '.':
		return rest[1:]
	case '[':
		return rest
	}
	return p
}

// The kinds of a shared change.
const (
	SharedPart  = "part"  // a part, usually of the yard's catalog
	SharedRules = "rules" // a table of the yard's rulebook
	SharedValue = "value" // any other value a hull imports
)

// SharedChange is a change that hulls take from outside their own files:
// a catalog part, a table of the yard's rulebook, another imported value.
// A YardDelta lists each once, with the hulls it reaches, rather than
// under every hull.
type SharedChange struct {
	Kind string `json:"kind"`
	// Subject names what changed: "battery tern-agm105", "rulebook table
	// voltageDrop", "currency".
	Subject string `json:"subject"`
	// Part is the part's id, for a part.
	Part string `json:"part,omitempty"`
	// Changes are the values that differ, their paths relative to the
	// part or table.
	Changes []InputChange `json:"changes"`
	// Hulls are the paths of the hulls that take the change, Regressed
	// those of them with a regression, and Margins those with a margin
	// that shrank past the review threshold.
	Hulls     []string `json:"hulls"`
	Regressed []string `json:"regressed"`
	Margins   []string `json:"margins"`
}

// key identifies a shared change across hulls: the same subject changed
// the same way.
func (s SharedChange) key() string {
	var b strings.Builder
	b.WriteString(s.Kind + "\x00" + s.Subject)
	for _, c := range s.Changes {
		b.WriteString("\x00" + c.Path + "\x00" + c.Old + "\x00" + c.New)
	}
	return b.String()
}

// CollectShared lists each shared change once with the hulls that take
// it. taken gives, by hull path, the shared changes each hull takes
// (Hulls and Regressed unset); hulls are the yard's deltas, for their
// regressions and margins. The changes with regressions come first, then
// those with margins to review, then those reaching more hulls, then by
// subject.
func CollectShared(hulls []HullDelta, taken map[string][]SharedChange) []SharedChange {
	byKey := map[string]*SharedChange{}
	for i := range hulls {
		h := &hulls[i]
		for _, s := range taken[h.Path] {
			k := s.key()
			c, ok := byKey[k]
			if !ok {
				c = &SharedChange{Kind: s.Kind, Subject: s.Subject, Part: s.Part, Changes: s.Changes, Hulls: []string{}, Regressed: []string{}, Margins: []string{}}
				byKey[k] = c
			}
			c.Hulls = append(c.Hulls, h.Path)
			if h.Regressions() > 0 {
				c.Regressed = append(c.Regressed, h.Path)
			}
			if len(h.Margins) > 0 {
				c.Margins = append(c.Margins, h.Path)
			}
		}
	}
	out := make([]SharedChange, 0, len(byKey))
	for _, c := range byKey {
		sort.Strings(c.Hulls)
		sort.Strings(c.Regressed)
		sort.Strings(c.Margins)
		out = append(out, *c)
	}
	sort.Slice(out, func(i, j int) bool {
		a, b := out[i], out[j]
		if len(a.Regressed) != len(b.Regressed) {
			return len(a.Regressed) > len(b.Regressed)
		}
		if len(a.Margins) != len(b.Margins) {
			return len(a.Margins) > len(b.Margins)
		}
		if len(a.Hulls) != len(b.Hulls) {
			return len(a.Hulls) > len(b.Hulls)
		}
		return a.key() < b.key()
	})
	return out
}

// MarginChange is a finding whose status did not change but whose margin
// (how far its value lies inside its limit) shrank past the rulebook's
// review threshold: a change a reviewer should see before it becomes a
// failure.
type MarginChange struct {
	ID      CheckID `json:"id"`
	Subject string  `json:"subject"`
	Status  Status  `json:"status"`
	Unit    string  `json:"unit"`
	// OldValue and Value are the finding's value before and after,
	// OldLimit and Limit its limit, OldMargin and Margin its margin.
	OldValue  float64 `json:"oldValue"`
	Value     float64 `json:"value"`
	OldLimit  float64 `json:"oldLimit"`
	Limit     float64 `json:"limit"`
	OldMargin float64 `json:"oldMargin"`
	Margin    float64 `json:"margin"`
}

// ShrunkMargins lists the findings of new whose status is what it was in
// old, pass or warn, and whose margin lost at least shrink of itself (a
// fraction) and is now below near × the limit (this second test is left
// out where the limit is 0, when nothing scales it). Failing findings are
// left out: they are failures already, not margins.
func ShrunkMargins(old, new *Result, shrink, near float64) []MarginChange {
	if shrink <= 0 {
		return nil
	}
	type key struct{ id, subject string }
	was := map[key]Finding{}
	for _, f := range old.Checks {
		was[key{string(f.ID), f.Subject}] = f
	}
	var out []MarginChange
	for _, f := range new.Checks {
		o, ok := was[key{string(f.ID), f.Subject}]
		if !ok || o.Status != f.Status || f.Status == Fail || o.Margin <= 0 {
			continue
		}
		if o.Margin-f.Margin < shrink*o.Margin {
			continue
		}
		if f.Limit != 0 && f.Margin >= near*math.Abs(f.Limit) {
			continue
		}
		out = append(out, MarginChange{ID: f.ID, Subject: f.Subject, Status: f.Status, Unit: f.Unit,
			OldValue: o.Value, Value: f.Value, OldLimit: o.Limit, Limit: f.Limit, OldMargin: o.Margin, Margin: f.Margin})
	}
	sort.Slice(out, func(i, j int) bool {
		if out[i].ID != out[j].ID {
			return out[i].ID < out[j].ID
		}
		return out[i].Subject < out[j].Subject
	})
	return out
}
