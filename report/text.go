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
// sorted by encoding/json, so the same result gives the same bytes.
func JSON(w io.Writer, v any) error {
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
	p.section("Bank")
	p.line("%d × %d %s (%s)", s.Bank.Series, s.Bank.Parallel, s.Bank.Battery, s.Bank.Chemistry)
	for _, f := range r.Figures {
		if strings.HasPrefix(f.ID, "bank.") {
			p.line("  %-16s %s   %s", f.ID[len("bank."):], num(f.Value, f.Unit), f.Formula)
		}
	}

	p.section("Arrays")
	if len(s.Arrays) == 0 {
		p.line("none")
	}
	for _, a := range s.Arrays {
		stc := ""
		for _, f := range r.Figures {
			if f.ID == "array.stcPower" && f.Subject == a.Name {
				stc = num(f.Value, f.Unit) + " at STC"
			}
		}
		p.line("%s: %d series × %d strings of %s → %s (%s), %s", a.Name, a.Series, a.Strings, a.Module, a.Controller, strings.ToUpper(a.ControllerKind), stc)
	}

	p.section(fmt.Sprintf("Loads (%d)", len(s.Loads)))
	t := p.table("load", "circuit", "kind", "draw", "duty", "via")
	for _, l := range s.Loads {
		t.row(l.Name, l.Circuit, l.Kind, l.Draw, strconv.FormatFloat(l.Duty, 'f', -1, 64), l.Inverter)
	}
	t.flush()

	p.section(fmt.Sprintf("Wiring (%d runs)", len(r.Wiring)))
	imperial := d.Units == "imperial"
	t = p.table("circuit", "from → to", "length", "size", "current", "drop", "limit", "ampacity", "protection", "status")
	for _, w := range r.Wiring {
		drop, limit := "-", "-"
		if w.DropLimit > 0 {
			drop, limit = fmt.Sprintf("%.2f %%", w.Drop), fmt.Sprintf("%g %%", w.DropLimit)
		}
		t.row(w.Name, w.From+" → "+w.To, length(w.Length, imperial), w.Size,
			fmt.Sprintf("%.1f A", w.Current), drop, limit, fmt.Sprintf("%.0f A", w.Ampacity), orDash(w.Protection), string(w.Status))
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
		var b strings.Builder
		if e.Position != "" {
			b.WriteString(e.Position + ": ")
		}
		if e.Path != "" {
			b.WriteString(e.Path + ": ")
		}
		b.WriteString(e.Message)
		p.line("%s", b.String())
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

func (p *printer) line(format string, args ...any) {
	if p.err == nil {
		_, p.err = fmt.Fprintf(p.w, format+"\n", args...)
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
		_, t.p.err = fmt.Fprintln(t.tw, "  "+strings.Join(cells, "\t"))
	}
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
