package report

import (
	"fmt"
	"io"
	"strings"
	"text/tabwriter"

	"github.com/ampwright/ampwright/result"
)

// FleetText writes one line per hull.
func FleetText(w io.Writer, f *result.Fleet) error {
	p := &printer{w: w}
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	fmt.Fprintln(tw, "hull\tvessel\tverdict\tfail\twarn\tbank\tarray\tworst drop\tlowest SoC")
	for _, l := range f.Hulls {
		if l.Broken() {
			fmt.Fprintf(tw, "%s\t-\tERROR\t-\t-\t-\t-\t-\t-\n", Inert(l.Path))
			continue
		}
		fmt.Fprintf(tw, "%s\t%s\t%s\t%d\t%d\t%s\t%.0f W\t%s\t%s\n", inertArgs([]any{l.Path, strings.TrimSpace(l.Name + " " + l.Hull), strings.ToUpper(string(l.Verdict)),
			l.Fail, l.Warn, l.Bank, l.Array, dropText(l), socText(l)})...)
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
	p.line("| hull | vessel | verdict | fail | warn | bank | array | worst drop | lowest SoC |")
	p.line("| --- | --- | --- | ---: | ---: | --- | ---: | --- | ---: |")
	for _, l := range f.Hulls {
		if l.Broken() {
			p.line("| %s | | error: %s | | | | | | |", md(l.Path), md(problemText(l.Problems[0])))
			continue
		}
		p.line("| %s | %s | %s | %d | %d | %s | %.0f W | %s | %s |", md(l.Path), md(strings.TrimSpace(l.Name+" "+l.Hull)), l.Verdict,
			l.Fail, l.Warn, md(l.Bank), l.Array, md(dropText(l)), socText(l))
	}
	return p.err
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
	if f.Shard != "" {
		s += " (shard " + f.Shard + ")"
	}
	return s
}
