package result

import (
	"sort"
	"strconv"
)

// Fleet is one line per hull of a yard.
type Fleet struct {
	Version string `json:"version"`
	// Shard is "K/N" when the fleet is one share of a yard, else "".
	Shard string      `json:"shard,omitempty"`
	Hulls []FleetLine `json:"hulls"`
}

// FleetLine is the summary of one hull.
type FleetLine struct {
	Path    string `json:"path"`
	Name    string `json:"name,omitempty"`
	Hull    string `json:"hull,omitempty"`
	Verdict Status `json:"verdict,omitempty"` // "" for a broken hull
	Fail    int    `json:"fail"`
	Warn    int    `json:"warn"`
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
	l := FleetLine{Path: path, Name: r.Design.Name, Hull: r.Design.Hull, Verdict: r.Verdict(), Fail: c.Fail, Warn: c.Warn, LowestSoC: -1}
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
