package report

import (
	"bytes"
	"flag"
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/ampwright/ampwright/result"
)

var update = flag.Bool("update", false, "rewrite the golden files in testdata")

// yardDelta builds a yard's delta by hand: n hulls named hulls/hull0001
// on, each unchanged unless change gives its delta (Path is filled in).
func yardDelta(n int, change map[int]result.HullDelta, shared ...result.SharedChange) *result.YardDelta {
	d := &result.YardDelta{Base: "main", Head: "work tree", Shared: shared}
	for i := 1; i <= n; i++ {
		h, ok := change[i]
		if !ok {
			h = result.HullDelta{State: result.HullUnchanged}
		}
		h.Path = fmt.Sprintf("hulls/hull%04d", i)
		if h.Name == "" && h.State != result.HullBroken {
			h.Name, h.Hull = fmt.Sprintf("Hull %d", i), fmt.Sprintf("KQ-%d", i)
		}
		d.Hulls = append(d.Hulls, h)
	}
	d.Counts = result.DeltaCounts{Hulls: n}
	for _, h := range d.Hulls {
		switch h.State {
		case result.HullUnchanged:
			d.Counts.Unchanged++
		case result.HullChanged:
			d.Counts.Changed++
		case result.HullAdded:
			d.Counts.Added++
		case result.HullBroken:
			d.Counts.Broken++
		case result.HullRemoved:
			d.Counts.Removed++
		}
		d.Counts.Regressions += h.Regressions()
		d.Counts.Fixes += h.Fixes()
		d.Counts.Margins += len(h.Margins)
	}
	return d
}

// regressed is a hull whose tiller-pilot run now fails its voltage drop.
func regressed() result.HullDelta {
	return result.HullDelta{
		State:    result.HullChanged,
		Findings: []result.StatusChange{{ID: "wiring.voltageDrop", Subject: "panel-pilot", Old: result.Pass, New: result.Fail, Regression: true, Message: "4.60 % of 12 V", Value: 4.6, Limit: 3, Unit: "%"}},
		Entries:  []result.EntryChange{{Entry: `wiring."panel-pilot"`, Change: result.EntryChanged, Inputs: []result.InputChange{{Path: "length", Old: `"6 m"`, New: `"12 m"`}}}},
		Figures:  []result.FigureChange{{ID: "wiring.voltageDrop", Subject: "panel-pilot", Unit: "%", Old: 2.298, New: 4.596, Diff: 2.298, Percent: 100}},
		Verdict:  result.Fail,
	}
}

func markdown(t *testing.T, d *result.YardDelta, opts DiffMarkdownOptions) string {
	t.Helper()
	var b bytes.Buffer
	if err := DiffMarkdown(&b, d, opts); err != nil {
		t.Fatal(err)
	}
	return b.String()
}

// headings lists the hull sections' headings, in order.
func headings(s string) []string {
	var out []string
	for _, l := range strings.Split(s, "\n") {
		if strings.HasPrefix(l, "##### ") {
			out = append(out, l)
		}
	}
	return out
}

// TestDiffMarkdownYardScale: what a reviewer of a 200-hull yard reads.
func TestDiffMarkdownYardScale(t *testing.T) {
	// A catalog change reaching 72 hulls, three of which regress; the
	// other 69 take it with nothing of theirs moved.
	catalog := map[int]result.HullDelta{}
	var users, regressing []string
	for i := 1; i <= 72; i++ {
		h := result.HullDelta{State: result.HullChanged, Inputs: []result.InputChange{{Path: "bank.battery.maxCharge", Old: `"50 A"`, New: `"30 A"`}}}
		if i%24 == 5 {
			h.Findings = []result.StatusChange{{ID: "bank.chargeRate", Subject: "bank", Old: result.Pass, New: result.Fail, Regression: true, Value: 40, Limit: 30, Unit: "A"}}
			regressing = append(regressing, fmt.Sprintf("hulls/hull%04d", i))
		}
		catalog[i] = h
		users = append(users, fmt.Sprintf("hulls/hull%04d", i))
	}
	maxCharge := result.SharedChange{Kind: result.SharedPart, Subject: "battery tern-li100", Part: "tern-li100",
		Changes: []result.InputChange{{Path: "maxCharge", Old: `"50 A"`, New: `"30 A"`}}, Hulls: users, Regressed: regressing}

	tests := []struct {
		name      string
		d         *result.YardDelta
		maxLines  int
		headings  []string
		contains  []string
		notExists []string
	}{
		{
			name:     "one changed hull of 200",
			d:        yardDelta(200, map[int]result.HullDelta{48: regressed()}),
			maxLines: 25,
			headings: []string{"##### ✗ hulls/hull0048 (Hull 48 KQ-48): changed"},
			contains: []string{
				"#### Regressions (1)",
				`- changed wiring."panel-pilot": length 6 m → 12 m`,
				"199 hulls unchanged.",
			},
			notExists: []string{"hulls/hull0047", "hulls/hull0049", "Cut to fit"},
		},
		{
			name:     "a catalog change used by 72 hulls",
			d:        yardDelta(200, catalog, maxCharge),
			maxLines: 45,
			headings: []string{
				"##### ✗ hulls/hull0005 (Hull 5 KQ-5): changed",
				"##### ✗ hulls/hull0029 (Hull 29 KQ-29): changed",
				"##### ✗ hulls/hull0053 (Hull 53 KQ-53): changed",
			},
			contains: []string{
				"- battery tern-li100: maxCharge 50 A → 30 A; 72 hulls use it, 3 regress: hulls/hull0005, hulls/hull0029, hulls/hull0053",
				"- takes the shared battery tern-li100",
				"69 more hulls take the shared changes above with no figure, finding or part moved.",
				"128 hulls unchanged.",
			},
			notExists: []string{"hulls/hull0001", "maxCharge 50 A → 30 A; 72 hulls use it, 3 regress: hulls/hull0005, hulls/hull0029, hulls/hull0053\n- battery"},
		},
		{
			name: "many regressions are one row each",
			d: yardDelta(200, func() map[int]result.HullDelta {
				m := map[int]result.HullDelta{}
				for i := 101; i <= 130; i++ {
					m[i] = regressed()
				}
				return m
			}()),
			maxLines: 45,
			contains: []string{
				"#### Regressions (30)",
				"| hulls/hull0101 | Hull 101 KQ-101 | changed | regression wiring.voltageDrop panel-pilot pass → fail, 1 entry, 1 figure |",
				"170 hulls unchanged.",
			},
		},
		{
			name: "most urgent first",
			d: yardDelta(6, map[int]result.HullDelta{
				1: {State: result.HullChanged, Entries: []result.EntryChange{{Entry: "vessel", Change: result.EntryChanged, Inputs: []result.InputChange{{Path: "client", Old: `"A"`, New: `"B"`}}}}},
				2: {State: result.HullChanged, Margins: []result.MarginChange{{ID: "voyage.floor", Subject: "voyage", Status: result.Pass, Unit: "% SoC", OldValue: 31.9, Value: 13.1, OldLimit: 10, Limit: 10, OldMargin: 21.9, Margin: 3.1}}},
				3: {State: result.HullChanged, Findings: []result.StatusChange{{ID: "bank.autonomy", Subject: "anchor", Old: result.Fail, New: result.Pass, Fix: true}}},
				4: regressed(),
				5: {State: result.HullBroken, Problems: []result.Problem{{Position: "hulls/hull0005/hull.cue:3:9", Path: "vessel.length", Message: `"12 V" is a voltage`}}},
			}),
			maxLines: 80,
			headings: []string{
				"##### ✗ hulls/hull0005: broken",
				"##### ✗ hulls/hull0004 (Hull 4 KQ-4): changed",
				"##### ✓ hulls/hull0003 (Hull 3 KQ-3): changed",
				"##### ! hulls/hull0002 (Hull 2 KQ-2): changed",
				"##### • hulls/hull0001 (Hull 1 KQ-1): changed",
			},
			contains: []string{
				"| voyage.floor | voyage | pass | 31.9 % SoC | 13.1 % SoC | 10 % SoC | 21.9 % SoC → 3.1 % SoC |",
				"#### Margins to review (1)",
				"1 hull unchanged.",
			},
		},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			out := markdown(t, tc.d, DiffMarkdownOptions{MaxBytes: DefaultMaxBytes})
			if n := strings.Count(out, "\n"); n > tc.maxLines {
				t.Errorf("%d lines, want at most %d:\n%s", n, tc.maxLines, out)
			}
			got := headings(out)
			if strings.Join(got, "\n") != strings.Join(tc.headings, "\n") {
				t.Errorf("hull sections:\n%s\nwant:\n%s", strings.Join(got, "\n"), strings.Join(tc.headings, "\n"))
			}
			for _, s := range tc.contains {
				if !strings.Contains(out, s) {
					t.Errorf("lacks %q:\n%s", s, out)
				}
			}
			for _, s := range tc.notExists {
				if strings.Contains(out, s) {
					t.Errorf("has %q:\n%s", s, out)
				}
			}
		})
	}
}

// TestDiffMarkdownBound: the hulls of no regression, fix or margin have a
// section each when they are few, else a row each; a diff too large for a
// comment names them one a row, then, if that is still too large, is cut
// at the bound, least urgent first, with a notice saying where the full
// diff is.
func TestDiffMarkdownBound(t *testing.T) {
	// n hulls each with 40 figures changed; hull 5 regresses.
	yard := func(n int) *result.YardDelta {
		change := map[int]result.HullDelta{}
		for i := 1; i <= n; i++ {
			h := result.HullDelta{State: result.HullChanged}
			if i == 5 {
				h = regressed()
			}
			for j := 0; j < 40; j++ {
				h.Figures = append(h.Figures, result.FigureChange{ID: "wiring.voltageDrop", Subject: fmt.Sprintf("run-%d", j), Unit: "%", Old: 1, New: 1.5, Diff: 0.5, Percent: 50})
			}
			change[i] = h
		}
		return yardDelta(n, change)
	}
	rows := func(s string) int { return strings.Count(s, "\n| hulls/hull") }
	tests := []struct {
		name           string
		d              *result.YardDelta
		opts           DiffMarkdownOptions
		sections, rows int // hulls shown as sections and as rows
		notice         string
	}{
		{"300 hulls fit as rows", yard(300), DiffMarkdownOptions{MaxBytes: DefaultMaxBytes}, 1, 299, ""},
		{"3000 hulls are cut", yard(3000), DiffMarkdownOptions{MaxBytes: DefaultMaxBytes, FullJSON: "out/diff.json"}, 1, -1,
			"changed hulls are not shown, the least urgent. The full diff, never cut, is out/diff.json."},
		{"a raised bound", yard(3000), DiffMarkdownOptions{MaxBytes: 1 << 20}, 1, 2999, ""},
		{"no bound", yard(3000), DiffMarkdownOptions{}, 1, 2999, ""},
		{"a few hulls have sections", yard(11), DiffMarkdownOptions{MaxBytes: DefaultMaxBytes}, 11, 0, ""},
		{"a few too many are rows", yard(12), DiffMarkdownOptions{MaxBytes: DefaultMaxBytes}, 1, 11, ""},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			out := markdown(t, tc.d, tc.opts)
			if tc.opts.MaxBytes > 0 && len(out) > tc.opts.MaxBytes {
				t.Errorf("%d bytes, over the bound of %d", len(out), tc.opts.MaxBytes)
			}
			hs := headings(out)
			if len(hs) == 0 || !strings.Contains(hs[0], "hulls/hull0005") {
				t.Fatalf("the first section is not the regression: %q", hs[:min(len(hs), 1)])
			}
			if len(hs) != tc.sections {
				t.Errorf("%d sections, want %d", len(hs), tc.sections)
			}
			n := rows(out)
			switch {
			case tc.notice == "" && strings.Contains(out, "Cut to fit"):
				t.Errorf("cut, want everything shown")
			case tc.notice == "" && n != tc.rows:
				t.Errorf("%d rows, want %d", n, tc.rows)
			case tc.notice != "":
				want := fmt.Sprintf("%d %s", len(tc.d.Hulls)-len(hs)-n, tc.notice)
				if !strings.Contains(out, want) {
					t.Errorf("%d sections and %d rows shown; the notice lacks %q", len(hs), n, want)
				}
				if n < 100 {
					t.Errorf("only %d rows shown within %d bytes", n, tc.opts.MaxBytes)
				}
			}
		})
	}
}

// TestDiffMarkdownBoundRegressions: regressions whose sections together
// exceed the bound are named one a row, none left out.
func TestDiffMarkdownBoundRegressions(t *testing.T) {
	change := map[int]result.HullDelta{}
	for i := 1; i <= 5; i++ {
		h := regressed()
		for j := 0; j < 300; j++ {
			h.Figures = append(h.Figures, result.FigureChange{ID: "wiring.voltageDrop", Subject: fmt.Sprintf("run-%d", j), Unit: "%", Old: 1, New: 1.5, Diff: 0.5, Percent: 50})
		}
		change[i] = h
	}
	out := markdown(t, yardDelta(5, change), DiffMarkdownOptions{MaxBytes: DefaultMaxBytes})
	if hs := headings(out); len(hs) != 0 || strings.Contains(out, "Cut to fit") {
		t.Errorf("%d sections, cut %v; want the five as rows, uncut", len(hs), strings.Contains(out, "Cut to fit"))
	}
	if n := strings.Count(out, "| regression wiring.voltageDrop panel-pilot pass → fail, 1 entry, 301 figures |"); n != 5 {
		t.Errorf("%d rows, want 5:\n%s", n, out)
	}
}

// TestDiffGolden compares the text and Markdown of a small delta with
// every kind of change against testdata/diff.txt and diff.md; -update
// rewrites them.
func TestDiffGolden(t *testing.T) {
	price := func(x float64) *float64 { return &x }
	d := yardDelta(5, map[int]result.HullDelta{
		1: regressed(),
		2: {
			State: result.HullChanged, Name: "**Skua** <img src=x> @octocat",
			Entries: []result.EntryChange{
				{Entry: "loads.fridge", Change: result.EntryAdded, Inputs: []result.InputChange{
					{Path: "circuit", New: `"panel-fridge"`}, {Path: "current", New: `"4 A"`}, {Path: "duty", New: "0.4"},
					{Path: "hours.anchor", New: "24"}, {Path: "kind", New: `"refrigeration"`}}},
				{Entry: `wiring."panel-fridge"`, Change: result.EntryAdded, Inputs: []result.InputChange{{Path: "from", New: `"panel"`}}},
				{Entry: "loads.lamp", Change: result.EntryRemoved, Inputs: []result.InputChange{{Path: "power", Old: `"10 W"`}}},
				{Entry: "vessel", Change: result.EntryChanged, Inputs: []result.InputChange{{Path: "name", Old: `"Skua"`, New: `"**Skua** <img src=x> @octocat"`}}},
			},
			Findings: []result.StatusChange{{ID: "wiring.voltageDrop", Subject: "panel-fridge", New: result.Pass}, {ID: "wiring.voltageDrop", Subject: "lamp", Old: result.Pass}},
			Margins:  []result.MarginChange{{ID: "voyage.floor", Subject: "voyage", Status: result.Pass, Unit: "% SoC", OldValue: 31.9, Value: 13.1, OldLimit: 10, Limit: 10, OldMargin: 21.9, Margin: 3.1}},
			BOM:      []result.BOMChange{{Part: "awg12-red", Category: "cable", Old: 1, New: 2, Unit: "30 m", OldTotal: price(45), NewTotal: price(90)}},
			Cost:     45, CostComplete: true, Currency: "GBP",
		},
		3: {State: result.HullChanged, Inputs: []result.InputChange{{Path: "rules.voltageDrop.critical", Old: "3", New: "2.5"}}},
		4: {State: result.HullAdded, Findings: []result.StatusChange{{ID: "bank.autonomy", Subject: "anchor", New: result.Warn, Regression: true, Message: "1.5 days", Value: 1.5, Limit: 2, Unit: "days"}, {ID: "wiring.ampacity", Subject: "feed", New: result.Pass}}},
	}, result.SharedChange{Kind: result.SharedRules, Subject: "rulebook table voltageDrop", Changes: []result.InputChange{{Path: "critical", Old: "3", New: "2.5"}},
		Hulls: []string{"hulls/hull0001", "hulls/hull0003"}, Regressed: []string{"hulls/hull0001"}})
	for _, tc := range []struct {
		file  string
		write func(*bytes.Buffer) error
	}{
		{"diff.txt", func(b *bytes.Buffer) error { return DiffText(b, d) }},
		{"diff.md", func(b *bytes.Buffer) error { return DiffMarkdown(b, d, DiffMarkdownOptions{MaxBytes: DefaultMaxBytes}) }},
	} {
		t.Run(tc.file, func(t *testing.T) {
			var b bytes.Buffer
			if err := tc.write(&b); err != nil {
				t.Fatal(err)
			}
			golden := filepath.Join("testdata", tc.file)
			if *update {
				if err := os.WriteFile(golden, b.Bytes(), 0o644); err != nil {
					t.Fatal(err)
				}
			}
			want, err := os.ReadFile(golden)
			if err != nil {
				t.Fatalf("%v (run go test ./report -run TestDiffGolden -update)", err)
			}
			if !bytes.Equal(b.Bytes(), want) {
				t.Errorf("%s differs from the golden file (go test ./report -run TestDiffGolden -update, then read the diff):\n%s", tc.file, b.String())
			}
		})
	}
}
