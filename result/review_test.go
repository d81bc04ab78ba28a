package result

import (
	"reflect"
	"strings"
	"testing"
)

// entryOf is the grouping a design gives: two labels under a collection,
// one otherwise.
func entryOf(p string) string {
	for _, c := range []string{"loads.", "wiring."} {
		if strings.HasPrefix(p, c) {
			rest := strings.TrimPrefix(p, c)
			if i := strings.IndexByte(rest, '.'); i >= 0 {
				rest = rest[:i]
			}
			return c + rest
		}
	}
	if i := strings.IndexAny(p, ".["); i >= 0 {
		return p[:i]
	}
	return p
}

func TestGroupEntries(t *testing.T) {
	tests := []struct {
		name    string
		changes []InputChange
		want    []EntryChange
	}{
		{
			name: "an added load is one entry",
			changes: []InputChange{
				{Path: "loads.fridge.circuit", New: `"panel-fridge"`},
				{Path: "loads.fridge.current", New: `"4 A"`},
				{Path: "loads.fridge.duty", New: "0.4"},
				{Path: "loads.fridge.hours.anchor", New: "24"},
			},
			want: []EntryChange{{Entry: "loads.fridge", Change: EntryAdded, Inputs: []InputChange{
				{Path: "circuit", New: `"panel-fridge"`}, {Path: "current", New: `"4 A"`}, {Path: "duty", New: "0.4"}, {Path: "hours.anchor", New: "24"},
			}}},
		},
		{
			name: "a removed run and a changed one",
			changes: []InputChange{
				{Path: `wiring."panel-pilot".length`, Old: `"6 m"`, New: `"12 m"`},
				{Path: "wiring.feed.from", Old: `"bank"`},
				{Path: "wiring.feed.size", Old: `"14 AWG"`},
			},
			want: []EntryChange{
				{Entry: `wiring."panel-pilot"`, Change: EntryChanged, Inputs: []InputChange{{Path: "length", Old: `"6 m"`, New: `"12 m"`}}},
				{Entry: "wiring.feed", Change: EntryRemoved, Inputs: []InputChange{{Path: "from", Old: `"bank"`}, {Path: "size", Old: `"14 AWG"`}}},
			},
		},
		{
			name: "a swapped part puts its id first",
			changes: []InputChange{
				{Path: "bank.battery.capacity", Old: `"105 Ah"`, New: `"150 Ah"`},
				{Path: "bank.battery.id", Old: `"a"`, New: `"b"`},
				{Path: "bank.parallel", Old: "3", New: "2"},
			},
			want: []EntryChange{{Entry: "bank", Change: EntryChanged, Inputs: []InputChange{
				{Path: "battery.id", Old: `"a"`, New: `"b"`}, {Path: "battery.capacity", Old: `"105 Ah"`, New: `"150 Ah"`}, {Path: "parallel", Old: "3", New: "2"},
			}}},
		},
		{
			name: "a list element and a top-level value",
			changes: []InputChange{
				{Path: "site.months[1]", Old: `"Jun"`, New: `"Jul"`},
				{Path: "currency", Old: `"GBP"`, New: `"EUR"`},
			},
			want: []EntryChange{
				{Entry: "currency", Change: EntryChanged, Inputs: []InputChange{{Path: "", Old: `"GBP"`, New: `"EUR"`}}},
				{Entry: "site", Change: EntryChanged, Inputs: []InputChange{{Path: "months[1]", Old: `"Jun"`, New: `"Jul"`}}},
			},
		},
		{name: "nothing", want: []EntryChange{}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			got := GroupEntries(tc.changes, entryOf)
			if !reflect.DeepEqual(got, tc.want) {
				t.Errorf("got  %+v\nwant %+v", got, tc.want)
			}
		})
	}
}

func TestRelPath(t *testing.T) {
	tests := []struct{ name, p, prefix, want string }{
		{"field", "bank.battery.maxCharge", "bank.battery", "maxCharge"},
		{"itself", "bank", "bank", ""},
		{"index", "site.months[0]", "site.months", "[0]"},
		{"quoted label", `wiring."a.b".length`, `wiring."a.b"`, "length"},
		{"not on a boundary", "loads.fridges.duty", "loads.fridge", "loads.fridges.duty"},
		{"not a prefix", "bank.parallel", "loads", "bank.parallel"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			if got := RelPath(tc.p, tc.prefix); got != tc.want {
				t.Errorf("RelPath(%q, %q) = %q, want %q", tc.p, tc.prefix, got, tc.want)
			}
		})
	}
}

func TestCollectShared(t *testing.T) {
	maxCharge := SharedChange{Kind: SharedPart, Subject: "battery tern", Part: "tern", Changes: []InputChange{{Path: "maxCharge", Old: `"50 A"`, New: `"30 A"`}}}
	price := SharedChange{Kind: SharedPart, Subject: "terminal ring", Part: "ring", Changes: []InputChange{{Path: "price", Old: "1.2", New: "1.3"}}}
	regressed := HullDelta{Path: "hulls/c", State: HullChanged, Findings: []StatusChange{{ID: "bank.chargeRate", Regression: true}}}
	margin := HullDelta{Path: "hulls/b", State: HullChanged, Margins: []MarginChange{{ID: "protection.interrupting"}}}
	hulls := []HullDelta{{Path: "hulls/a", State: HullChanged}, margin, regressed, {Path: "hulls/d", State: HullUnchanged}}
	taken := map[string][]SharedChange{
		"hulls/a": {maxCharge, price},
		"hulls/b": {price},
		"hulls/c": {maxCharge},
	}
	got := CollectShared(hulls, taken)
	if len(got) != 2 {
		t.Fatalf("got %d shared changes, want 2: %+v", len(got), got)
	}
	// The one with a regression first, though it reaches as many hulls.
	if got[0].Subject != "battery tern" || !reflect.DeepEqual(got[0].Hulls, []string{"hulls/a", "hulls/c"}) || !reflect.DeepEqual(got[0].Regressed, []string{"hulls/c"}) {
		t.Errorf("first = %+v, want battery tern reaching hulls/a and hulls/c, hulls/c regressed", got[0])
	}
	if got[1].Subject != "terminal ring" || len(got[1].Hulls) != 2 || len(got[1].Regressed) != 0 || !reflect.DeepEqual(got[1].Margins, []string{"hulls/b"}) {
		t.Errorf("second = %+v, want terminal ring reaching 2 hulls, none regressed, hulls/b with a margin", got[1])
	}
	// The same part changed two ways is two changes.
	other := maxCharge
	other.Changes = []InputChange{{Path: "maxCharge", Old: `"50 A"`, New: `"40 A"`}}
	got = CollectShared(hulls[:2], map[string][]SharedChange{"hulls/a": {maxCharge}, "hulls/b": {other}})
	if len(got) != 2 {
		t.Errorf("two different changes of one part collected as %d", len(got))
	}
}

func TestShrunkMargins(t *testing.T) {
	soc := func(status Status, value float64) *Result {
		return &Result{Checks: []Finding{{ID: "voyage.floor", Subject: "voyage", Status: status, Value: value, Limit: 10, Unit: "% SoC", Margin: value - 10}}}
	}
	tests := []struct {
		name     string
		old, new *Result
		want     int
	}{
		// The example: 31.9 % to 13.1 % against a 10 % floor.
		{"lowest state of charge close to its floor", soc(Pass, 31.9), soc(Pass, 13.1), 1},
		{"shrank by half, still far from the limit", soc(Pass, 50), soc(Pass, 30), 0},
		{"close to the limit, but shrank little", soc(Pass, 14), soc(Pass, 13.1), 0},
		{"grew", soc(Pass, 13.1), soc(Pass, 31.9), 0},
		{"the status changed: a regression, not a margin", soc(Pass, 31.9), soc(Warn, 13.1), 0},
		{"failing on both sides", soc(Fail, 9), soc(Fail, 2), 0},
		{"still warning, closer", soc(Warn, 31.9), soc(Warn, 13.1), 1},
		{"new finding", &Result{}, soc(Pass, 13.1), 0},
		{
			"a zero limit: only the shrink counts",
			&Result{Checks: []Finding{{ID: "bank.coldCharge", Subject: "bank", Status: Pass, Value: 8, Limit: 0, Margin: 8}}},
			&Result{Checks: []Finding{{ID: "bank.coldCharge", Subject: "bank", Status: Pass, Value: 3, Limit: 0, Margin: 3}}},
			1,
		},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			got := ShrunkMargins(tc.old, tc.new, 0.5, 0.5)
			if len(got) != tc.want {
				t.Fatalf("got %+v, want %d", got, tc.want)
			}
			if tc.want == 1 && got[0].Margin >= got[0].OldMargin {
				t.Errorf("margin %v → %v did not shrink", got[0].OldMargin, got[0].Margin)
			}
		})
	}
}

func TestHasEffect(t *testing.T) {
	tests := []struct {
		name string
		d    HullDelta
		want bool
	}{
		{"only shared inputs", HullDelta{State: HullChanged, Inputs: []InputChange{{Path: "bank.battery.maxCharge"}}}, false},
		{"an entry of its own", HullDelta{State: HullChanged, Entries: []EntryChange{{Entry: "loads.fridge"}}}, true},
		{"a figure moved", HullDelta{State: HullChanged, Figures: []FigureChange{{ID: "x"}}}, true},
		{"a margin shrank", HullDelta{State: HullChanged, Margins: []MarginChange{{ID: "x"}}}, true},
		{"added", HullDelta{State: HullAdded}, true},
		{"unchanged", HullDelta{State: HullUnchanged}, false},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			if got := tc.d.HasEffect(); got != tc.want {
				t.Errorf("HasEffect() = %v, want %v", got, tc.want)
			}
		})
	}
}
