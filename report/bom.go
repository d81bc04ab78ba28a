package report

import (
	"encoding/csv"
	"fmt"
	"io"
	"strconv"
	"strings"
	"text/tabwriter"

	"github.com/ampwright/ampwright/result"
)

// BOMText writes the bill of materials as a table for the terminal.
func BOMText(w io.Writer, r *result.Result) error {
	b := r.BOM
	p := &printer{w: w}
	p.line("Bill of materials: %s  %s", r.Design.Name, r.Design.Hull)
	p.line("cable includes both conductors of each run and %g %% slack (%s)", b.Slack*100, b.SlackSource)
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	row := func(cells ...string) {
		if p.err == nil {
			_, p.err = fmt.Fprintln(tw, strings.Join(inertCells(cells), "\t"))
		}
	}
	row("category", "part", fmt.Sprintf("%8s", "quantity"), "unit", fmt.Sprintf("%10s", "unit price"), fmt.Sprintf("%10s", "total"), "description")
	cat := ""
	for _, l := range b.Lines {
		c := l.Category
		if c == cat {
			c = ""
		}
		cat = l.Category
		row(c, l.Part, fmt.Sprintf("%8s", num2(l.Quantity)), l.Unit, fmt.Sprintf("%10s", money(l.UnitPrice)), fmt.Sprintf("%10s", money(l.Total)), l.Description)
	}
	if err := tw.Flush(); err != nil && p.err == nil {
		p.err = err
	}
	total := fmt.Sprintf("total %s %s", strconv.FormatFloat(b.Total, 'f', 2, 64), b.Currency)
	if !b.Complete {
		total += fmt.Sprintf(" (incomplete: %d lines have no price and are not counted)", unpriced(b))
	}
	p.line("%s", total)
	return p.err
}

// BOMCSV writes the bill of materials as CSV: a header row, one part a
// line, plain numbers with a decimal point and no thousands separators, so
// that it opens cleanly in a spreadsheet.
func BOMCSV(w io.Writer, r *result.Result) error {
	b := r.BOM
	cw := csv.NewWriter(w)
	_ = cw.Write([]string{"category", "part", "description", "quantity", "unit", "length_m", "unit_price", "total", "currency", "for"})
	for _, l := range b.Lines {
		length := ""
		if l.Length > 0 {
			length = strconv.FormatFloat(l.Length, 'f', -1, 64)
		}
		_ = cw.Write([]string{csvText(l.Category), csvText(l.Part), csvText(l.Description), strconv.FormatFloat(l.Quantity, 'f', -1, 64), csvText(l.Unit), length, plain(l.UnitPrice), plain(l.Total), csvText(b.Currency), csvText(l.For)})
	}
	cw.Flush()
	return cw.Error()
}

func unpriced(b *result.BOM) int {
	n := 0
	for _, l := range b.Lines {
		if l.UnitPrice == nil {
			n++
		}
	}
	return n
}

func money(p *float64) string {
	if p == nil {
		return "no price"
	}
	return strconv.FormatFloat(*p, 'f', 2, 64)
}

func plain(p *float64) string {
	if p == nil {
		return ""
	}
	return strconv.FormatFloat(*p, 'f', 2, 64)
}

func num2(x float64) string { return strconv.FormatFloat(x, 'f', -1, 64) }
