// Package checks holds ampwright's engineering checks. Each check is a
// small value, Check, listed once in All; a check reads a validated design
// and its rulebook and reports findings, never printing. `ampwright explain`
// prints each check's Doc.
package checks

import (
	"fmt"
	"regexp"

	"github.com/ampwright/ampwright/result"
	"github.com/ampwright/ampwright/schema"
)

// Input is what a check reads: the decoded design, the rulebook in force,
// and where the design declares each named entry.
type Input struct {
	Design *schema.Design
	Rules  schema.Rulebook
	// Position returns file:line:col for a CUE path such as
	// wiring."bank-main", or "".
	Position func(path string) string
}

// Check is one engineering check.
type Check struct {
	// ID is the stable name of the check, used in results: "bank.voltage".
	ID string
	// Title is a one-line summary.
	Title string
	// Doc is what `ampwright explain ID` prints: what it checks, the
	// method, the formula, the limit and its source.
	Doc string
	// Run reports the check's findings on the design.
	Run func(*Input) []result.Finding
}

// All is every check, in the order they run.
var All = []*Check{
	BankVoltage,
	EquipmentSystem,
}

// Lookup returns the check with the given ID.
func Lookup(id string) (*Check, bool) {
	for _, c := range All {
		if c.ID == id {
			return c, true
		}
	}
	return nil, false
}

var idPattern = regexp.MustCompile(`^[a-z]+(\.[a-z][a-zA-Z]*)+$`)

// Validate reports a check list with a bad or duplicate ID, or one without
// a title, doc or run function.
func Validate(list []*Check) error {
	seen := map[string]bool{}
	for _, c := range list {
		switch {
		case !idPattern.MatchString(c.ID):
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

// Run runs every check in list over in and returns the findings, worst
// first.
func Run(list []*Check, in *Input) []result.Finding {
	var out []result.Finding
	for _, c := range list {
		for _, f := range c.Run(in) {
			f.ID = c.ID
			out = append(out, f)
		}
	}
	r := result.Result{Checks: out}
	r.SortChecks()
	return r.Checks
}
