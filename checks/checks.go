// Package checks holds ampwright's engineering checks: verdicts over a
// hull's system model (package model) and its energy analyses (package
// energy). Each check is a small value, Check, listed once in All; a check
// reports findings and the figures behind them, never printing. The
// catalogue of figures (figures.go) gives every figure ID a title and a
// doc; `ampwright explain` prints the docs of checks and figures alike.
package checks

import (
	"fmt"
	"regexp"

	"github.com/ampwright/ampwright/energy"
	"github.com/ampwright/ampwright/model"
	"github.com/ampwright/ampwright/result"
	"github.com/ampwright/ampwright/schema"
)

// Input is what a check reads: the system model, its energy analyses, and
// where the design declares each named entry.
type Input struct {
	Sys    *model.System
	Energy *energy.Analysis
	// Design and Rules are the model's, for brevity.
	Design *schema.Design
	Rules  schema.Rulebook
	// Position returns file:line:col for a CUE path such as
	// wiring."bank-main", or "".
	Position func(path string) string
}

// NewInput is the Input of checks over sys and its analyses.
func NewInput(sys *model.System, a *energy.Analysis, position func(string) string) *Input {
	if position == nil {
		position = func(string) string { return "" }
	}
	return &Input{Sys: sys, Energy: a, Design: sys.Design, Rules: sys.Rules, Position: position}
}

// Report collects what checks find.
type Report struct {
	Findings []result.Finding
	Figures  []result.Figure
}

// Add records a finding.
func (r *Report) Add(f result.Finding) { r.Findings = append(r.Findings, f) }

// Figure records a computed figure.
func (r *Report) Figure(f result.Figure) { r.Figures = append(r.Figures, f) }

// Check is one engineering check.
type Check struct {
	// ID is the stable name of the check, used in results: "bank.voltage".
	ID result.CheckID
	// Title is a one-line summary.
	Title string
	// Doc is what `ampwright explain ID` prints: what it checks, the
	// method, the formula, the limit and its source.
	Doc string
	// Run reports the check's findings, and the figures behind them.
	Run func(*Input, *Report)
}

// All is every check, in the order they run.
var All = []*Check{
	SystemFigures,
	BankVoltage,
	EquipmentSystem,
	Resistance,
	VoltageDrop,
	Ampacity,
	MinimumSize,
	Protected,
	Rating,
	Distance,
	Interrupting,
	StringFuse,
	EnergyBudget,
	Autonomy,
	ChargeRate,
	ColdCharge,
	EnergyHarvest,
	ColdVoc,
	HotVmp,
	InputCurrent,
	VoyageFloor,
	InverterContinuous,
	InverterSurge,
	InverterDC,
	ProtectionSurge,
	VoltageRating,
	BusCurrent,
	BusWays,
	BankDischarge,
	BankPeak,
	TotalDrop,
	ShuntPlacement,
	ChargePath,
	LinkCurrent,
}

// Lookup returns the check with the given ID.
func Lookup(id string) (*Check, bool) {
	for _, c := range All {
		if string(c.ID) == id {
			return c, true
		}
	}
	return nil, false
}

var idPattern = regexp.MustCompile(`^[a-z]+(\.[a-z][a-zA-Z]*)+$`)

// Validate reports a check list with a bad or duplicate ID, or one without
// a title, doc or run function.
func Validate(list []*Check) error {
	seen := map[result.CheckID]bool{}
	for _, c := range list {
		switch {
		case !idPattern.MatchString(string(c.ID)):
			return fmt.Errorf("check %q: ID must look like area.name", c.ID)
		case seen[c.ID]:
			return fmt.Errorf("check %q listed twice", c.ID)
		case c.Title == "" || c.Doc == "" || c.Run == nil:
			return fmt.Errorf("check %q: needs Title, Doc and Run", c.ID)
		}
		seen[c.ID] = true
	}
	return nil
}

// RunAll runs every check in list over in and returns the findings, worst
// first, and the figures in the order the checks gave them.
func RunAll(list []*Check, in *Input) ([]result.Finding, []result.Figure) {
	var all Report
	for _, c := range list {
		var rep Report
		c.Run(in, &rep)
		for _, f := range rep.Findings {
			f.ID = c.ID
			all.Findings = append(all.Findings, f)
		}
		all.Figures = append(all.Figures, rep.Figures...)
	}
	tidy(all.Findings, all.Figures)
	r := result.Result{Checks: all.Findings}
	r.SortChecks()
	return r.Checks, all.Figures
}
