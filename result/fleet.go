package result

import (
	"path"
	"sort"
	"strconv"
)

// Fleet is one line per hull of a yard.
type Fleet struct {
	Version string `json:"version"`
	// Shard is "K/N" when the fleet is one share of a yard, else "".
	Shard string      `json:"shard,omitempty"`
	Hulls []FleetLine `json:"hulls"`
	// Filter says which hulls were kept when not all were ("--uses
	// tern-agm105"), and Of how many there were before.
	Filter string `json:"filter,omitempty"`
	Of     int    `json:"of,omitempty"`
	// Since is the revision that Changed compares with, if any.
	Since string `json:"since,omitempty"`
}

// FleetLine is the summary of one hull.
type FleetLine struct {
	Path    string `json:"path"`
	Name    string `json:"name,omitempty"`
	Hull    string `json:"hull,omitempty"`
	Verdict Status `json:"verdict,omitempty"` // "" for a broken hull
	Fail    int    `json:"fail"`
	Warn    int    `json:"warn"`
	// Failing and Warning are the IDs of the checks that fail and warn,
	// each once, sorted.
	Failing []string `json:"failing,omitempty"`
	Warning []string `json:"warning,omitempty"`
	// Cost is the bill of materials' total in Currency; CostComplete is
	// false when a part has no price, and the total leaves it out.
	Cost         float64 `json:"cost"`
	Currency     string  `json:"currency,omitempty"`
	CostComplete bool    `json:"costComplete"`
	// Parts are the ids of the parts of the bill of materials, sorted.
	Parts []string `json:"parts,omitempty"`
	// Revision is the git commit the hull was read from and Dirty true
	// when one of its input files differs from it.
	Revision string `json:"revision,omitempty"`
	Dirty    bool   `json:"dirty,omitempty"`
	// Changed is true when the hull's inputs differ from those at the
	// fleet's Since revision (or the hull is new since).
	Changed bool `json:"changed,omitempty"`
	// Bank and Array describe the bank and the arrays' STC power.
	Bank  string  `json:"bank,omitempty"`
	Array float64 `json:"array"` // W at STC
	// WorstDrop is the largest voltage drop as a share of its limit, on
	// run WorstRun: Drop % against DropLimit %.
	WorstRun  string  `json:"worstRun,omitempty"`
	Drop      float64 `json:"drop"`
	DropLimit float64 `json:"dropLimit"`
	// LowestSoC is the lowest state of charge on the design voyage, %, or
	// −1 without a voyage.
	LowestSoC float64 `json:"lowestSoC"`
	// Problems are a broken hull's input errors.
	Problems []Problem `json:"problems,omitempty"`
}

// Broken reports whether the hull did not compile.
func (l FleetLine) Broken() bool { return len(l.Problems) > 0 }

// SortFleet orders hulls by path, so that fleets and merged shards are
// stable.
func SortFleet(ls []FleetLine) {
	sort.SliceStable(ls, func(i, j int) bool { return ls[i].Path < ls[j].Path })
}

// FleetLineOf summarises a compiled hull.
func FleetLineOf(path string, r *Result) FleetLine {
	c := r.Count()
	l := FleetLine{Path: path, Name: r.Design.Name, Hull: r.Design.Hull, Verdict: r.Verdict(), Fail: c.Fail, Warn: c.Warn, LowestSoC: -1,
		Revision: r.Design.Revision, Dirty: r.Design.Dirty}
	failing, warning := map[string]bool{}, map[string]bool{}
	for _, f := range r.Checks {
		switch f.Status {
		case Fail:
			failing[string(f.ID)] = true
		case Warn:
			warning[string(f.ID)] = true
		}
	}
	l.Failing, l.Warning = sortedKeys(failing), sortedKeys(warning)
	if r.BOM != nil {
		l.Cost, l.Currency, l.CostComplete = r.BOM.Total, r.BOM.Currency, r.BOM.Complete
		parts := map[string]bool{}
		for _, b := range r.BOM.Lines {
			parts[b.Part] = true
		}
		l.Parts = sortedKeys(parts)
	}
	l.Bank = r.Summary.Bank.Battery
	primary := r.Summary.Bank.Name
	if primary == "" {
		primary = "bank"
	}
	for _, f := range r.Figures {
		switch f.ID {
		case FigBankNominalEnergy:
			if f.Subject == primary {
				l.Bank = fmtBank(r.Summary.Bank, f.Value)
			}
		case FigArraySTCPower:
			l.Array += f.Value
		}
	}
	worst := -1.0
	for _, w := range r.Wiring {
		if w.DropLimit > 0 && w.Drop/w.DropLimit > worst {
			worst = w.Drop / w.DropLimit
			l.WorstRun, l.Drop, l.DropLimit = w.Name, w.Drop, w.DropLimit
		}
	}
	if r.Voyage != nil {
		l.LowestSoC = r.Voyage.Lowest
	}
	return l
}

func fmtBank(b BankLine, wh float64) string {
	return itoa(b.Series) + "×" + itoa(b.Parallel) + " " + b.Battery + " (" + b.Chemistry + ", " + itoa(int(wh+0.5)) + " Wh)"
}

func itoa(n int) string { return strconv.Itoa(n) }

func sortedKeys(m map[string]bool) []string {
	if len(m) == 0 {
		return nil
	}
	out := make([]string, 0, len(m))
	for k := range m {
		out = append(out, k)
	}
	sort.Strings(out)
	return out
}

// The orders a fleet can be sorted in.
const (
	ByPath    = "path"
	ByVerdict = "verdict"
	ByCost    = "cost"
)

// SortFleetBy orders hulls by path; by verdict, worst first (broken, then
// failing, warning, passing; more failing and warning checks first); or by
// cost, dearest first (broken hulls, which have none, last). Ties go by
// path.
func SortFleetBy(ls []FleetLine, by string) {
	rank := func(l FleetLine) int {
		if l.Broken() {
			return -1
		}
		return l.Verdict.Rank()
	}
	sort.SliceStable(ls, func(i, j int) bool {
		a, b := ls[i], ls[j]
		switch by {
		case ByVerdict:
			if rank(a) != rank(b) {
				return rank(a) < rank(b)
			}
			if a.Fail != b.Fail {
				return a.Fail > b.Fail
			}
			if a.Warn != b.Warn {
				return a.Warn > b.Warn
			}
		case ByCost:
			if a.Broken() != b.Broken() {
				return b.Broken()
			}
			if a.Cost != b.Cost {
				return a.Cost > b.Cost
			}
		}
		return a.Path < b.Path
	})
}

// Fails reports whether a check whose ID matches pattern fails on the
// hull; Warns whether one warns; Uses whether the hull's bill of
// materials has a part whose id matches pattern. A pattern is an ID, or
// a glob of path.Match ("wiring.*", "*").
func (l FleetLine) Fails(pattern string) bool { return anyMatch(pattern, l.Failing) }

// Warns: see Fails.
func (l FleetLine) Warns(pattern string) bool { return anyMatch(pattern, l.Warning) }

// Uses: see Fails.
func (l FleetLine) Uses(pattern string) bool { return anyMatch(pattern, l.Parts) }

func anyMatch(pattern string, names []string) bool {
	for _, n := range names {
		if ok, err := path.Match(pattern, n); (err == nil && ok) || n == pattern {
			return true
		}
	}
	return false
}
