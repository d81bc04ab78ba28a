package report

import (
	"fmt"
	"io"
	"sort"
	"strconv"
	"strings"

	"github.com/ampwright/ampwright/result"
)

// ProposalText writes a proposal as the terminal report of `ampwright
// propose`: what the search proved, the two designs' costs side by side,
// each change with the margin it is sized to and the next smaller option
// and the check it fails, the margins that bind, and the premises.
func ProposalText(w io.Writer, pr *result.Proposal) error {
	p := &printer{w: w}
	d := pr.Design
	p.line("%s  %s: proposal from the yard's catalog", d.Name, d.Hull)
	p.line("design:   %s", d.Path)
	p.line("status:   %s", ProposalStatus(pr))
	if pr.Cut != "" {
		p.line("          %s", pr.Cut)
	}
	switch {
	case pr.Status == "none":
	case len(pr.Designer.Bank) == 0:
		p.line("cost:     %s (the design leaves parts open: it has no cost of its own)", cost(pr.Proposed, pr.Currency))
	default:
		p.line("cost:     %s against the designer's %s%s", cost(pr.Proposed, pr.Currency), cost(pr.Designer, pr.Currency), saving(pr))
	}
	side := func(name string, s result.ProposalSide) {
		p.line("%s %s; %d pass, %d warn, %d fail", name, strings.Join(append(append([]string{}, s.Bank...), s.Arrays...), "; "), s.Pass, s.Warn, s.Fail)
	}
	if len(pr.Designer.Bank) > 0 {
		side("designer:", pr.Designer)
	}
	if pr.Status != "none" {
		side("proposal:", pr.Proposed)
	}
	p.line("search:   %s", SearchText(pr))

	if len(pr.Blocking) > 0 {
		p.section("Nothing in the catalog passes")
		p.line("The closest the search came still fails:")
		for _, f := range pr.Blocking {
			p.line("FAIL %s %s: %s", f.ID, f.Subject, f.Message)
			if f.Change != "" {
				p.line("     needed: %s", f.Change)
			}
		}
	}
	if pr.Status != "none" {
		p.section(fmt.Sprintf("Changes (%d)", len(pr.Changes)))
		if len(pr.Changes) == 0 {
			p.line("none: the designer's design is the cheapest that passes")
		}
		for _, c := range pr.Changes {
			p.line("%s  %s: %s → %s", c.Entry, c.What, c.From, c.To)
			if c.Binds != "" {
				p.line("    sized to  %s", c.Binds)
			}
			switch {
			case c.Smaller != "":
				p.line("    smaller   %s fails %s", c.Smaller, c.SmallerFails)
			case c.What == "controller" || c.What == "link" || c.What == "bank" || c.What == "array":
				p.line("    smaller   none: nothing cheaper in the catalog")
			}
		}
		p.section("Margins that bind")
		t := p.table("check", "subject", "value", "limit", "margin")
		for _, f := range pr.Binding {
			t.row(string(f.ID), f.Subject, num(f.Value, f.Unit), num(f.Limit, f.Unit), num(f.Margin, f.Unit))
		}
		t.flush()
	}
	p.section("Premises")
	p.line("The search prunes by these rules; its proof rests on them and on the catalog's prices:")
	for _, s := range pr.Premises {
		p.line("- %s", s)
	}
	if pr.File != "" {
		p.section("Written")
		p.line("%s: `ampwright check` checks it like any other design", pr.File)
	}
	return p.err
}

// ProposalStatus says in words what the search found.
func ProposalStatus(pr *result.Proposal) string {
	switch pr.Status {
	case "proven":
		return "proven the cheapest: no cheaper design from the catalog passes every check"
	case "best-found":
		return "the cheapest passing design found, not proven the cheapest: the search was cut"
	case "none":
		if pr.Cut != "" {
			return "nothing found that passes every check before the search was cut"
		}
		return "nothing from the catalog passes every check"
	}
	return pr.Status
}

// SearchText says in a line what the search covered.
func SearchText(pr *result.Proposal) string {
	s := pr.Search
	var dims []string
	for _, k := range sortedKeys(s.Options) {
		dims = append(dims, fmt.Sprintf("%s (%d)", k, s.Options[k]))
	}
	all := fmt.Sprintf("%s combinations of %s", strconv.FormatFloat(s.Combinations, 'f', 0, 64), strings.Join(dims, " × "))
	if pr.Status == "none" {
		return fmt.Sprintf("%s; %d reached, %d checked, the rest ruled out by failures found and the premises", all, s.Considered, s.Evaluated)
	}
	return fmt.Sprintf("%s; %d reached below the cost bound (the others cost no less than the proposal), %d checked, the rest ruled out by failures found and the premises",
		all, s.Considered, s.Evaluated)
}

func sortedKeys(m map[string]int) []string {
	out := make([]string, 0, len(m))
	for k := range m {
		out = append(out, k)
	}
	sort.Strings(out)
	return out
}

func cost(s result.ProposalSide, currency string) string {
	out := strconv.FormatFloat(s.Cost, 'f', 2, 64)
	if currency != "" {
		out += " " + currency
	}
	if !s.Complete {
		out += " (incomplete: a part has no price)"
	}
	return out
}

func saving(pr *result.Proposal) string {
	switch {
	case pr.Saving > 0:
		return fmt.Sprintf(", %s less", strconv.FormatFloat(pr.Saving, 'f', 2, 64))
	case pr.Saving < 0 && pr.Designer.Fail > 0:
		return fmt.Sprintf(", %s more: the designer's fails %d check(s)", strconv.FormatFloat(-pr.Saving, 'f', 2, 64), pr.Designer.Fail)
	case pr.Saving < 0:
		return fmt.Sprintf(", %s more", strconv.FormatFloat(-pr.Saving, 'f', 2, 64))
	}
	return ""
}
