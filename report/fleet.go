package report

import (
	"fmt"
	"io"
	"strings"
	"text/tabwriter"

	"github.com/ampwright/ampwright/result"
)

// FleetText writes one line per hull: its verdict, the counts and IDs of
// the checks that fail and warn, its cost, bank, array, worst voltage drop
// and lowest state of charge.
func FleetText(w io.Writer, f *result.Fleet) error {
	p := &printer{w: w}
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	fmt.Fprintln(tw, "hull\tvessel\tverdict\tfail\twarn\tcost\tbank\tarray\tworst drop\tlowest SoC\tchecks")
	for _, l := range f.Hulls {
		if l.Broken() {
			fmt.Fprintf(tw, "%s%s\t-\tERROR\t-\t-\t-\t-\t-\t-\t-\t-\n", Inert(l.Path), changedMark(l))
			continue
		}
		fmt.Fprintf(tw, "%s%s\t%s\t%s\t%d\t%d\t%s\t%s\t%.0f W\t%s\t%s\t%s\n", inertArgs([]any{l.Path, changedMark(l), strings.TrimSpace(l.Name + " " + l.Hull), strings.ToUpper(string(l.Verdict)),
			l.Fail, l.Warn, fleetCost(l), l.Bank, l.Array, dropText(l), socText(l), orDash(checksText(l))})...)
	}
	if err := tw.Flush(); err != nil {
		return err
	}
	for _, l := range f.Hulls {
		if l.Broken() {
			p.line("")
			p.line("%s: %d input error(s)", l.Path, len(l.Problems))
			for _, pr := range l.Problems {
				p.line("    %s", problemText(pr))
			}
		}
	}
	p.line("")
	p.line("%s", fleetCounts(f))
	return p.err
}

// FleetMarkdown writes the fleet as a Markdown table, design text escaped.
func FleetMarkdown(w io.Writer, f *result.Fleet) error {
	p := &printer{w: w}
	p.line("### ampwright fleet")
	p.line("")
	p.line("%s", md(fleetCounts(f)))
	p.line("")
	p.line("| hull | vessel | verdict | fail | warn | failing and warning checks | cost | bank | array | worst drop | lowest SoC |")
	p.line("| --- | --- | --- | ---: | ---: | --- | ---: | --- | ---: | --- | ---: |")
	for _, l := range f.Hulls {
		if l.Broken() {
			p.line("| %s%s | | error: %s | | | | | | | | |", md(l.Path), changedWord(l), md(problemText(l.Problems[0])))
			continue
		}
		p.line("| %s%s | %s | %s | %d | %d | %s | %s | %s | %.0f W | %s | %s |", md(l.Path), changedWord(l), md(strings.TrimSpace(l.Name+" "+l.Hull)), l.Verdict,
			l.Fail, l.Warn, md(checksText(l)), md(fleetCost(l)), md(l.Bank), l.Array, md(dropText(l)), socText(l))
	}
	return p.err
}

// changedMark marks a hull whose inputs changed since the fleet's Since.
func changedMark(l result.FleetLine) string {
	if l.Changed {
		return " *"
	}
	return ""
}

// changedWord is changedMark for Markdown, where a star is markup.
func changedWord(l result.FleetLine) string {
	if l.Changed {
		return " (changed)"
	}
	return ""
}

// checksText names the checks that fail and warn on a hull.
func checksText(l result.FleetLine) string {
	var parts []string
	if len(l.Failing) > 0 {
		parts = append(parts, "fail: "+strings.Join(l.Failing, ", "))
	}
	if len(l.Warning) > 0 {
		parts = append(parts, "warn: "+strings.Join(l.Warning, ", "))
	}
	return strings.Join(parts, "; ")
}

// fleetCost is a hull's bill of materials' total, marked incomplete when
// a part has no price.
func fleetCost(l result.FleetLine) string {
	s := strings.TrimSpace(fmt.Sprintf("%.2f %s", l.Cost, l.Currency))
	if !l.CostComplete {
		s += " incomplete"
	}
	return s
}

func dropText(l result.FleetLine) string {
	if l.WorstRun == "" {
		return "-"
	}
	return fmt.Sprintf("%.2f %% of %g %% (%s)", l.Drop, l.DropLimit, l.WorstRun)
}

func socText(l result.FleetLine) string {
	if l.LowestSoC < 0 {
		return "-"
	}
	return fmt.Sprintf("%.1f %%", l.LowestSoC)
}

func fleetCounts(f *result.Fleet) string {
	var pass, warn, fail, broken int
	for _, l := range f.Hulls {
		switch {
		case l.Broken():
			broken++
		case l.Verdict == result.Fail:
			fail++
		case l.Verdict == result.Warn:
			warn++
		default:
			pass++
		}
	}
	s := fmt.Sprintf("%d hulls: %d pass, %d warn, %d fail, %d broken", len(f.Hulls), pass, warn, fail, broken)
	if f.Filter != "" {
		s = fmt.Sprintf("%d of %d hulls (%s): %d pass, %d warn, %d fail, %d broken", len(f.Hulls), f.Of, f.Filter, pass, warn, fail, broken)
	}
	if f.Shard != "" {
		s += " (shard " + f.Shard + ")"
	}
	if f.Since != "" {
		n := 0
		for _, l := range f.Hulls {
			if l.Changed {
				n++
			}
		}
		s += fmt.Sprintf("; %d changed since %s", n, f.Since)
	}
	return s
}
