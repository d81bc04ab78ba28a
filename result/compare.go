package result

import (
	"math"
	"sort"
)

// YardDelta is what a change does to every hull of a yard.
type YardDelta struct {
	Base string `json:"base"` // the base revision or directory
	Head string `json:"head"`
	// Hulls are every hull at either side, sorted by path.
	Hulls []HullDelta `json:"hulls"`
	// Counts sums them up.
	Counts DeltaCounts `json:"counts"`
	// Shared are the changes hulls take from outside their own files (a
	// catalog part, a table of the yard's rulebook), each listed once with
	// the hulls it reaches.
	Shared []SharedChange `json:"shared,omitempty"`
}

// DeltaCounts is the one-line summary of a YardDelta.
type DeltaCounts struct {
	Hulls       int `json:"hulls"`
	Changed     int `json:"changed"`
	Unchanged   int `json:"unchanged"`
	Added       int `json:"added"`
	Removed     int `json:"removed"`
	Broken      int `json:"broken"`
	Regressions int `json:"regressions"`
	Fixes       int `json:"fixes"`
	// Failing is the number of failing findings at the head.
	Failing int `json:"failing"`
	// Margins is the number of findings whose margin shrank past the
	// rulebook's review threshold without their status changing.
	Margins int `json:"margins"`
}

// The states of a hull between two revisions.
const (
	HullUnchanged = "unchanged" // same inputs hash: not compiled twice
	HullChanged   = "changed"
	HullAdded     = "added"
	HullRemoved   = "removed"
	HullBroken    = "broken" // input errors at the head
)

// HullDelta is what a change does to one hull.
type HullDelta struct {
	Path   string        `json:"path"`
	Name   string        `json:"name,omitempty"`
	Hull   string        `json:"hull,omitempty"`
	State  string        `json:"state"`
	Inputs []InputChange `json:"inputs,omitempty"`
	// Entries are the changes written in the hull's own files, grouped
	// by the entry of the design they belong to; the changes it takes
	// from a shared part or table are in the YardDelta's Shared.
	Entries []EntryChange `json:"entries,omitempty"`
	// Margins are the findings whose margin shrank past the rulebook's
	// review threshold without their status changing.
	Margins  []MarginChange `json:"margins,omitempty"`
	Figures  []FigureChange `json:"figures,omitempty"`
	Findings []StatusChange `json:"findings,omitempty"`
	BOM      []BOMChange    `json:"bom,omitempty"`
	// Cost is the change of the bill of materials' total, and
	// CostComplete false when either side's total is incomplete.
	Cost         float64 `json:"cost"`
	CostComplete bool    `json:"costComplete"`
	Currency     string  `json:"currency,omitempty"`
	// Verdict is the head's verdict ("" when removed).
	Verdict Status `json:"verdict,omitempty"`
	// Problems are the head's input errors, for a broken hull.
	Problems []Problem `json:"problems,omitempty"`
}

// InputChange is one design value that differs.
type InputChange struct {
	Path string `json:"path"`
	Old  string `json:"old,omitempty"` // "" when added
	New  string `json:"new,omitempty"` // "" when removed
}

// FigureChange is one computed figure that differs.
type FigureChange struct {
	ID      FigureID `json:"id"`
	Subject string   `json:"subject"`
	Unit    string   `json:"unit"`
	Old     float64  `json:"old"`
	New     float64  `json:"new"`
	Diff    float64  `json:"diff"`
	// Percent is the change relative to Old; 0 when Old is 0.
	Percent float64 `json:"percent"`
	// Added and Removed mark a figure on one side only.
	Added   bool `json:"added,omitempty"`
	Removed bool `json:"removed,omitempty"`
}

// StatusChange is one finding whose status changed.
type StatusChange struct {
	ID      CheckID `json:"id"`
	Subject string  `json:"subject"`
	Old     Status  `json:"old,omitempty"` // "" when the finding is new
	New     Status  `json:"new,omitempty"` // "" when it is gone
	// Regression is true when it got worse (pass → warn or fail, warn →
	// fail, or a new failing finding); Fix when it got better.
	Regression bool    `json:"regression,omitempty"`
	Fix        bool    `json:"fix,omitempty"`
	Message    string  `json:"message"`
	Value      float64 `json:"value"`
	Limit      float64 `json:"limit"`
	Unit       string  `json:"unit"`
	OldValue   float64 `json:"oldValue"`
}

// BOMChange is one part whose quantity or price changed.
type BOMChange struct {
	Part     string  `json:"part"`
	Category string  `json:"category"`
	Old      float64 `json:"old"` // quantity
	New      float64 `json:"new"`
	Unit     string  `json:"unit"`
	// OldTotal and NewTotal are the line totals, nil without a price.
	OldTotal *float64 `json:"oldTotal,omitempty"`
	NewTotal *float64 `json:"newTotal,omitempty"`
}

// figureTolerance is the relative change below which two figures are the
// same: results are rounded where computed, so a smaller difference is
// noise of the last digit.
const figureTolerance = 1e-9

// Compare returns what changed from old to new of one hull: its figures,
// its findings' statuses and its bill of materials. Inputs are compared
// by CompareInputs, from the compiled designs.
func Compare(old, new *Result) HullDelta {
	d := HullDelta{Path: new.Design.Path, Name: new.Design.Name, Hull: new.Design.Hull, State: HullChanged, Verdict: new.Verdict()}
	type key struct {
		id      string
		subject string
	}
	of := map[key]Figure{}
	for _, f := range old.Figures {
		of[key{string(f.ID), f.Subject}] = f
	}
	nf := map[key]bool{}
	for _, f := range new.Figures {
		k := key{string(f.ID), f.Subject}
		nf[k] = true
		o, ok := of[k]
		switch {
		case !ok:
			d.Figures = append(d.Figures, FigureChange{ID: f.ID, Subject: f.Subject, Unit: f.Unit, New: f.Value, Diff: f.Value, Added: true})
		case !same(o.Value, f.Value):
			fc := FigureChange{ID: f.ID, Subject: f.Subject, Unit: f.Unit, Old: o.Value, New: f.Value, Diff: f.Value - o.Value}
			if o.Value != 0 {
				fc.Percent = (f.Value - o.Value) / math.Abs(o.Value) * 100
			}
			d.Figures = append(d.Figures, fc)
		}
	}
	for _, f := range old.Figures {
		if !nf[key{string(f.ID), f.Subject}] {
			d.Figures = append(d.Figures, FigureChange{ID: f.ID, Subject: f.Subject, Unit: f.Unit, Old: f.Value, Diff: -f.Value, Removed: true})
		}
	}
	sort.SliceStable(d.Figures, func(i, j int) bool {
		a, b := d.Figures[i], d.Figures[j]
		if a.ID != b.ID {
			return a.ID < b.ID
		}
		return a.Subject < b.Subject
	})

	ok := map[key]Finding{}
	for _, f := range old.Checks {
		ok[key{string(f.ID), f.Subject}] = f
	}
	seen := map[key]bool{}
	for _, f := range new.Checks {
		k := key{string(f.ID), f.Subject}
		seen[k] = true
		o, had := ok[k]
		if had && o.Status == f.Status {
			continue
		}
		sc := StatusChange{ID: f.ID, Subject: f.Subject, New: f.Status, Message: f.Message, Value: f.Value, Limit: f.Limit, Unit: f.Unit}
		if had {
			sc.Old, sc.OldValue = o.Status, o.Value
			sc.Regression = f.Status.Rank() < o.Status.Rank()
			sc.Fix = f.Status.Rank() > o.Status.Rank()
		} else {
			sc.Regression = f.Status != Pass
		}
		d.Findings = append(d.Findings, sc)
	}
	for _, f := range old.Checks {
		if k := (key{string(f.ID), f.Subject}); !seen[k] {
			d.Findings = append(d.Findings, StatusChange{ID: f.ID, Subject: f.Subject, Old: f.Status, Fix: f.Status != Pass, Message: "no longer checked: " + f.Message, OldValue: f.Value, Unit: f.Unit})
		}
	}
	sort.SliceStable(d.Findings, func(i, j int) bool {
		a, b := d.Findings[i], d.Findings[j]
		if a.Regression != b.Regression {
			return a.Regression
		}
		if a.ID != b.ID {
			return a.ID < b.ID
		}
		return a.Subject < b.Subject
	})

	if old.BOM != nil && new.BOM != nil {
		d.BOM, d.Cost = compareBOM(old.BOM, new.BOM)
		d.CostComplete = old.BOM.Complete && new.BOM.Complete
		d.Currency = new.BOM.Currency
	}
	return d
}

func compareBOM(old, new *BOM) ([]BOMChange, float64) {
	type key struct{ cat, part string }
	ol := map[key]BOMLine{}
	for _, l := range old.Lines {
		ol[key{l.Category, l.Part}] = l
	}
	var out []BOMChange
	seen := map[key]bool{}
	for _, l := range new.Lines {
		k := key{l.Category, l.Part}
		seen[k] = true
		o, had := ol[k]
		if had && same(o.Quantity, l.Quantity) && samePrice(o.Total, l.Total) {
			continue
		}
		c := BOMChange{Part: l.Part, Category: l.Category, New: l.Quantity, Unit: l.Unit, NewTotal: l.Total}
		if had {
			c.Old, c.OldTotal = o.Quantity, o.Total
		}
		out = append(out, c)
	}
	for _, l := range old.Lines {
		if !seen[key{l.Category, l.Part}] {
			out = append(out, BOMChange{Part: l.Part, Category: l.Category, Old: l.Quantity, Unit: l.Unit, OldTotal: l.Total})
		}
	}
	sort.SliceStable(out, func(i, j int) bool {
		if out[i].Category != out[j].Category {
			return out[i].Category < out[j].Category
		}
		return out[i].Part < out[j].Part
	})
	return out, math.Round((new.Total-old.Total)*100) / 100
}

// CompareInputs lists the design values that differ between two
// revisions, by CUE path.
func CompareInputs(old, new map[string]string) []InputChange {
	var out []InputChange
	for p, nv := range new {
		if ov, ok := old[p]; !ok || ov != nv {
			out = append(out, InputChange{Path: p, Old: old[p], New: nv})
		}
	}
	for p, ov := range old {
		if _, ok := new[p]; !ok {
			out = append(out, InputChange{Path: p, Old: ov})
		}
	}
	sort.Slice(out, func(i, j int) bool { return out[i].Path < out[j].Path })
	return out
}

// HasChanges reports whether anything of the hull differs: inputs,
// figures, findings, margins, parts, or input errors at the head.
func (d *HullDelta) HasChanges() bool {
	return len(d.Inputs)+len(d.Figures)+len(d.Findings)+len(d.Margins)+len(d.BOM)+len(d.Problems) > 0
}

// HasEffect reports whether the change did more to the hull than alter
// inputs it takes from a shared part or table: a figure, a finding, a
// margin, a part or its cost moved, the hull's own files changed, or it
// was added, removed or broken. A hull reached by a catalog change
// without effect is counted under the change, not listed.
func (d *HullDelta) HasEffect() bool {
	if d.State != HullChanged {
		return d.State != HullUnchanged
	}
	return len(d.Entries)+len(d.Figures)+len(d.Findings)+len(d.Margins)+len(d.BOM)+len(d.Problems) > 0
}

// Regressions counts the findings of d that got worse.
func (d *HullDelta) Regressions() int {
	return d.countFindings(func(f StatusChange) bool { return f.Regression })
}

// Fixes counts the findings of d that got better.
func (d *HullDelta) Fixes() int {
	return d.countFindings(func(f StatusChange) bool { return f.Fix })
}

func (d *HullDelta) countFindings(match func(StatusChange) bool) int {
	n := 0
	for _, f := range d.Findings {
		if match(f) {
			n++
		}
	}
	return n
}

func same(a, b float64) bool {
	return math.Abs(a-b) <= figureTolerance*math.Max(math.Abs(a), math.Abs(b))
}

func samePrice(a, b *float64) bool {
	if a == nil || b == nil {
		return a == b
	}
	return same(*a, *b)
}
