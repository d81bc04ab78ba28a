// Package report renders results for people and programs: plain text for
// the terminal and JSON. It reads only package result, never CUE, so every
// view shows the same figures.
package report

import (
	"encoding/json"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"
	"text/tabwriter"

	"github.com/ampwright/ampwright/result"
)

// JSON writes v as indented JSON with a final newline. Map keys are
// sorted by encoding/json, so the same result gives the same bytes. A
// number that is not finite, which JSON cannot hold, is refused before a
// byte is written (the compiler refuses such a design first).
func JSON(w io.Writer, v any) error {
	if p, bad := result.NonFinite(v); bad {
		return fmt.Errorf("the value at %s is not a finite number, which JSON cannot hold; no JSON written", p)
	}
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	enc.SetEscapeHTML(false)
	return enc.Encode(v)
}

// Text writes a result as the terminal report of `ampwright check`.
func Text(w io.Writer, r *result.Result) error {
	p := &printer{w: w}
	d := r.Design
	p.line("%s  %s  (%s, %s)", d.Name, d.Hull, d.Kind, d.System)
	p.line("design:   %s", d.Path)
	p.line("inputs:   sha256 %s", short(d.InputsHash))
	p.line("rulebook: %s, edition %s", r.Rulebook.Name, r.Rulebook.Edition)
	c := r.Count()
	p.line("verdict:  %s (%d fail, %d warn, %d pass)", strings.ToUpper(string(r.Verdict())), c.Fail, c.Warn, c.Pass)

	s := r.Summary
	banks := banksOf(r)
	if len(banks) > 1 {
		p.section("Banks")
	} else {
		p.section("Bank")
	}
	for _, b := range banks {
		if b.Name != "" {
			p.line("%s (%s, %s): %d × %d %s (%s)", b.Name, b.Role, b.System, b.Series, b.Parallel, b.Battery, b.Chemistry)
		} else {
			p.line("%d × %d %s (%s)", b.Series, b.Parallel, b.Battery, b.Chemistry)
		}
		for _, f := range r.Figures {
			if f.ID.Area() == "bank" && (b.Name == "" || f.Subject == b.Name) {
				p.line("  %-16s %s   %s", strings.TrimPrefix(string(f.ID), "bank."), num(f.Value, f.Unit), f.Formula)
			}
		}
	}

	p.section("Arrays")
	if len(s.Arrays) == 0 {
		p.line("none")
	}
	for _, a := range s.Arrays {
		stc := ""
		for _, f := range r.Figures {
			if f.ID == result.FigArraySTCPower && f.Subject == a.Name {
				stc = num(f.Value, f.Unit) + " at STC"
			}
		}
		p.line("%s: %d series × %d strings of %s → %s (%s), %s", a.Name, a.Series, a.Strings, a.Module, a.Controller, strings.ToUpper(a.ControllerKind), stc)
	}

	p.section(fmt.Sprintf("Loads (%d)", len(s.Loads)))
	t := p.table("load", "circuit", "kind", "draw", "duty", "via")
	for _, l := range s.Loads {
		t.row(l.Name, orDash(l.Circuit), l.Kind, l.Draw, strconv.FormatFloat(l.Duty, 'f', -1, 64), l.Inverter)
	}
	t.flush()

	p.section("Energy budget")
	for _, b := range r.Budget {
		p.line("%s: %.0f Wh per %g h (%.1f Ah, mean %.2f A, %.0f Wh per day)", b.Scenario, b.Wh, b.Hours, b.Ah, b.MeanCurrent, b.WhPerDay)
		for i, l := range b.Loads {
			if i == 5 {
				p.line("    … and %d more", len(b.Loads)-5)
				break
			}
			p.line("    %-22s %7.0f Wh  %4.1f %%  %s", l.Name, l.Wh, l.Share, l.Formula)
		}
	}

	if len(r.Harvest) > 0 {
		p.section("Solar harvest (Wh per day into the bank, mean day of the month)")
		hdr := []string{"array", "controller"}
		for _, m := range r.Harvest[0].Months {
			hdr = append(hdr, m.Month)
		}
		t = p.table(hdr...)
		for _, a := range r.Harvest {
			row := []string{a.Array, a.Controller + " (" + strings.ToUpper(a.Kind) + ")"}
			alt := []string{"", "with " + a.Alternative}
			for _, m := range a.Months {
				row = append(row, fmt.Sprintf("%.0f", m.Wh))
				alt = append(alt, fmt.Sprintf("%.0f", m.AltWh))
			}
			t.row(row...)
			t.row(alt...)
		}
		t.flush()
	}

	if len(s.Arrays) > 0 {
		p.section("String voltage window")
		for _, a := range s.Arrays {
			var parts []string
			for _, f := range r.Checks {
				if f.Subject != a.Name && f.Subject != a.Controller {
					continue
				}
				switch f.ID {
				case result.CheckColdVoc:
					parts = append(parts, fmt.Sprintf("cold Voc %.1f V ≤ %g V max", f.Value, f.Limit))
				case result.CheckHotVmp:
					parts = append(parts, fmt.Sprintf("hot Vmp %.1f V ≥ %.1f V needed", f.Value, f.Limit))
				case result.CheckInputCurrent:
					if f.Limit > 0 {
						parts = append(parts, fmt.Sprintf("input %.1f A ≤ %g A", f.Value, f.Limit))
					}
				}
			}
			p.line("%s: %s", a.Name, strings.Join(parts, "; "))
		}
	}

	if len(r.Harvest) > 0 && len(r.Budget) > 0 {
		p.section("Balance (solar harvest as a share of each scenario's use per day)")
		hdr := []string{"scenario", "use/day"}
		for _, m := range r.Harvest[0].Months {
			hdr = append(hdr, m.Month)
		}
		t = p.table(hdr...)
		for _, b := range r.Budget {
			row := []string{b.Scenario, fmt.Sprintf("%.0f Wh", b.WhPerDay)}
			for _, m := range r.Harvest[0].Months {
				cell := "-"
				for _, f := range r.Figures {
					if f.ID == result.FigSolarFraction && f.Subject == b.Scenario+" "+m.Month {
						cell = fmt.Sprintf("%.0f %%", f.Value)
					}
				}
				row = append(row, cell)
			}
			t.row(row...)
		}
		t.flush()
	}

	if v := r.Voyage; v != nil {
		p.voyage(v)
	}

	p.section(fmt.Sprintf("Wiring (%d runs)", len(r.Wiring)))
	imperial := d.Units == "imperial"
	t = p.table("circuit", "from → to", "length", "size", "current", "drop", "limit", "ampacity", "protection", "status")
	for _, w := range r.Wiring {
		drop, limit := "-", "-"
		if w.DropLimit > 0 {
			drop, limit = fmt.Sprintf("%.2f %%", w.Drop), fmt.Sprintf("%g %%", w.DropLimit)
		}
		current := fmt.Sprintf("%.1f A", w.Current)
		if w.DropCurrent > 0 {
			// A solar run: ampacity at the strings' short-circuit factor,
			// the drop at their maximum-power current.
			current += fmt.Sprintf(" (drop at %.1f A)", w.DropCurrent)
		}
		t.row(w.Name, w.From+" → "+w.To, length(w.Length, imperial), w.Size,
			current, drop, limit, fmt.Sprintf("%.0f A", w.Ampacity), orDash(w.Protection), string(w.Status))
	}
	t.flush()

	p.section("Findings")
	passed := 0
	for _, f := range r.Checks {
		if f.Status == result.Pass {
			passed++
			continue
		}
		p.line("%s %s %s: %s", strings.ToUpper(string(f.Status)), f.ID, f.Subject, f.Message)
		if f.Change != "" {
			p.line("     change: %s", f.Change)
		}
		if f.Position != "" {
			p.line("     at %s", f.Position)
		}
		p.line("     limit from: %s", f.Source)
	}
	p.line("%d findings pass; `--format json` lists every one with its figures", passed)
	return p.err
}

// voyage writes the design voyage: the primary bank's run, and where
// there are several banks every bank's and what the links passed.
func (p *printer) voyage(v *result.Voyage) {
	p.section(fmt.Sprintf("Design voyage (%s days from %s)", strconv.FormatFloat(float64(v.Hours)/24, 'f', -1, 64), v.Start))
	if len(v.Banks) > 1 {
		t := p.table("bank", "lowest", "when", "floor", "unmet", "full again", "offered", "to loads", "stored", "drawn", "not taken", "links in", "out")
		for _, b := range v.Banks {
			name := b.Bank
			if !b.Checked {
				name += " (no loads)"
			}
			t.row(name, fmt.Sprintf("%.1f %%", b.Lowest), voyageWhen(b), fmt.Sprintf("%.0f %%", b.Floor), fmt.Sprintf("%.0f Wh", b.Unmet), recoverText(b),
				fmt.Sprintf("%.0f Wh", b.Offered), fmt.Sprintf("%.0f Wh", b.Direct), fmt.Sprintf("%.0f Wh", b.Charged), fmt.Sprintf("%.0f Wh", b.Drawn),
				fmt.Sprintf("%.0f Wh", b.Spilled), fmt.Sprintf("%.0f Wh", b.LinkIn), fmt.Sprintf("%.0f Wh", b.LinkOut))
		}
		t.flush()
		for _, l := range v.Links {
			p.line("  %s (%s, %s → %s): %.0f Ah delivered, %.0f Wh lost in it", l.Link, l.Kind, l.From, l.To, l.Ah, l.Loss)
		}
		p.line("  Wh at each bank's nominal voltage; a bank of no loads is run, not checked")
		return
	}
	b := v.BankVoyage
	p.line("lowest state of charge %.1f %% on %s; floor %.0f %%", b.Lowest, voyageWhen(b), b.Floor)
	if b.Unmet > 0 {
		p.line("the floor is reached: %.0f Wh asked of the bank goes unmet", b.Unmet)
	}
	line := recoverText(b)
	if b.Full > 0 {
		switch {
		case b.RecoverDays > 0:
			line = fmt.Sprintf("full again (%.0f %%) %s after the lowest point", b.Full, recoverText(b))
		case b.RecoverDays < 0:
			line = fmt.Sprintf("not full again (%.0f %%) within the voyage", b.Full)
		default:
			line = "never below full"
		}
		line += fmt.Sprintf("; %d h offered more than it accepted (absorption)", b.AbsorptionHours)
	}
	p.line("%s", line)
	p.line("energy: %.0f Wh offered by the sources: %.0f Wh to the loads directly, %.0f Wh stored, %.0f Wh charge losses, %.0f Wh not taken; %.0f Wh drawn from the bank (Peukert %.0f Wh)",
		b.Offered, b.Direct, b.Charged, b.ChargeLoss, b.Spilled, b.Drawn, b.Peukert)
}

// voyageWhen says when a bank was lowest: "day 6 at 05:00 (anchor, Jun)".
func voyageWhen(b result.BankVoyage) string {
	if b.LowestScenario == "" || b.Lowest >= 100 {
		return "-"
	}
	return fmt.Sprintf("day %d at %02d:00 (%s, %s)", b.LowestDay+1, b.LowestHour, b.LowestScenario, b.LowestMonth)
}

// recoverText is how long a bank took to be full again.
func recoverText(b result.BankVoyage) string {
	switch {
	case b.RecoverDays < 0:
		return "not within the voyage"
	case b.RecoverDays == 0:
		return "never below full"
	}
	return strconv.FormatFloat(b.RecoverDays, 'f', 1, 64) + " days"
}

// banksOf is every bank of a result; a result written before banks were
// listed has only its one bank.
func banksOf(r *result.Result) []result.BankLine {
	if len(r.Summary.Banks) > 0 {
		return r.Summary.Banks
	}
	return []result.BankLine{r.Summary.Bank}
}

// length writes metres in the design's preferred units.
func length(m float64, imperial bool) string {
	if imperial {
		return strconv.FormatFloat(math.Round(m/0.3048*10)/10, 'f', -1, 64) + " ft"
	}
	return strconv.FormatFloat(math.Round(m*100)/100, 'f', -1, 64) + " m"
}

func orDash(s string) string {
	if s == "" {
		return "-"
	}
	return s
}

// Problems writes input errors, one a line, each with its related
// positions indented, the way CUE prints them.
func Problems(w io.Writer, ps []result.Problem) error {
	p := &printer{w: w}
	for _, e := range ps {
		p.line("%s", problemText(e))
		for _, r := range e.Related {
			p.line("    %s", r)
		}
	}
	return p.err
}

type printer struct {
	w   io.Writer
	err error
}

// line prints one line, its string arguments made inert: a design's text
// never reaches the output as it was written.
func (p *printer) line(format string, args ...any) {
	if p.err == nil {
		_, p.err = fmt.Fprintf(p.w, format+"\n", inertArgs(args)...)
	}
}

func (p *printer) section(title string) {
	p.line("")
	p.line("%s", title)
}

type table struct {
	p  *printer
	tw *tabwriter.Writer
}

func (p *printer) table(headers ...string) *table {
	t := &table{p: p, tw: tabwriter.NewWriter(p.w, 0, 0, 2, ' ', 0)}
	t.row(headers...)
	return t
}

func (t *table) row(cells ...string) {
	if t.p.err == nil {
		_, t.p.err = fmt.Fprintln(t.tw, "  "+strings.Join(inertCells(cells), "\t"))
	}
}

// inertCells makes a table's cells inert, so that no tab or line break in
// a design's text can shift a column or forge a row.
func inertCells(cells []string) []string {
	out := make([]string, len(cells))
	for i, c := range cells {
		out[i] = Inert(c)
	}
	return out
}

func (t *table) flush() {
	if err := t.tw.Flush(); err != nil && t.p.err == nil {
		t.p.err = err
	}
}

func num(v float64, unit string) string {
	return strconv.FormatFloat(v, 'f', -1, 64) + " " + unit
}

func short(hash string) string {
	if len(hash) > 16 {
		return hash[:16]
	}
	return hash
}
