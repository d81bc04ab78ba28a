package compiler

import (
	"encoding/json"
	"os"
	"path"
	"path/filepath"
	"reflect"
	"strings"
	"testing"

	"github.com/ampwright/ampwright/result"
	"github.com/ampwright/ampwright/schema"
	"github.com/ampwright/ampwright/schema/unit"
)

// graphCases are hulls that load, being valid CUE and valid against the
// schema, but whose wiring is not a tree from the bank: Compile must
// refuse them with one positioned error. decl is the text that begins the
// line declaring the entry the error must point into, in the hull's own
// file.
var graphCases = []struct {
	name string
	path string // CUE path of the error
	msg  string // a fragment of its message
	decl string
}{
	// bank → panel → aux and bank → aux: aux is reached twice.
	{"graph-loop", `wiring."panel-aux"`, `the wiring forms a loop: this run joins "aux" and "panel"`, `"panel-aux": {`},
	// A busbar and lamp that nothing joins to the bank.
	{"graph-island", `wiring."deck-lamp"`, `the run from "deck" to "lamp" has no path to the bank`, `"deck-lamp": {`},
	// A run to a busbar with nothing beyond and no load on it.
	{"graph-dangling", `wiring."panel-spare"`, `the run connects to nothing: nothing continues from "spare"`, `"panel-spare": {`},
	// An array wired to the panel, not through its controller.
	{"graph-array", "arrays.deck", `array "deck" is wired toward the bank without passing its controller "mppt"`, `arrays: deck: {`},
}

func TestGraphErrors(t *testing.T) {
	toRoot(t)
	for _, tc := range graphCases {
		t.Run(tc.name, func(t *testing.T) {
			dir := hull(tc.name)
			// The fault is in the shape of the wiring, not in the input:
			// the design loads.
			mustLoad(t, dir)

			r, d, err := Compile(dir)
			if err == nil {
				t.Fatalf("Compile(%s) succeeded; want a wiring error", dir)
			}
			if r != nil || d != nil {
				t.Errorf("Compile(%s) returned a result with its errors", dir)
			}
			list, ok := err.(ErrorList)
			if !ok {
				t.Fatalf("Compile(%s) error is %T, not an ErrorList: %v", dir, err, err)
			}
			text := list.Error()
			if len(list) != 1 {
				t.Fatalf("%d errors, want 1:\n%s", len(list), text)
			}
			e := list[0]
			if e.Path != tc.path {
				t.Errorf("error path %q, want %q: %s", e.Path, tc.path, e)
			}
			if !strings.Contains(e.Msg, tc.msg) {
				t.Errorf("error %q does not say %q", e.Msg, tc.msg)
			}

			file := displayName(e.Pos.Filename())
			switch {
			case !e.Pos.IsValid():
				t.Fatalf("error with no position: %s", e)
			case isSchemaPos(e.Pos):
				t.Fatalf("error positioned in the schema, not the design: %s", e)
			case path.Dir(file) != dir:
				t.Fatalf("error positioned outside the hull's own files (%s): %s", file, e)
			}
			src, err := os.ReadFile(file)
			if err != nil {
				t.Fatal(err)
			}
			// An entry's position is that of its first field written in
			// the hull (ownPos), so the error lies just inside the block
			// that declares the entry.
			decl := 0
			for i, line := range strings.Split(string(src), "\n") {
				if strings.HasPrefix(strings.TrimSpace(line), tc.decl) {
					decl = i + 1
				}
			}
			if n := e.Pos.Line(); decl == 0 || n < decl || n > decl+3 {
				t.Errorf("error at line %d, want within the block declaring %s at line %d (%s)", n, tc.decl, decl, e)
			}

			checkGolden(t, filepath.Join(golden, tc.name+".txt"), text+"\n")
		})
	}
}

// exampleHulls are the hulls of the example yard in designs/.
func exampleHulls(t *testing.T) []string {
	t.Helper()
	entries, err := os.ReadDir("designs/hulls")
	if err != nil {
		t.Fatal(err)
	}
	var out []string
	for _, e := range entries {
		if e.IsDir() {
			out = append(out, e.Name())
		}
	}
	if len(out) < 3 {
		t.Fatalf("example hulls %q; want at least dunnock, marram and brackenwell", out)
	}
	return out
}

// TestExampleWiring compares each example hull's wiring table with its
// golden file in testdata/wiring (rewrite with go test ./compiler -update).
func TestExampleWiring(t *testing.T) {
	toRoot(t)
	for _, h := range exampleHulls(t) {
		t.Run(h, func(t *testing.T) {
			r, _, err := Compile("designs/hulls/" + h)
			if err != nil {
				t.Fatalf("Compile(%s):\n%v", h, err)
			}
			if len(r.Wiring) != len(r.Summary.Circuits) {
				t.Errorf("%d wiring lines for %d circuits", len(r.Wiring), len(r.Summary.Circuits))
			}
			b, err := json.MarshalIndent(r.Wiring, "", "  ")
			if err != nil {
				t.Fatal(err)
			}
			checkGolden(t, filepath.Join("testdata", "wiring", h+".json"), string(b)+"\n")
		})
	}
}

// Brackenwell's windlass run is its deliberate fault (designs/README.md):
// 85 A over 40 ft of 4 AWG, dropping over the 10 % allowed.
func TestBrackenwellWindlass(t *testing.T) {
	toRoot(t)
	r, _, err := Compile("designs/hulls/brackenwell")
	if err != nil {
		t.Fatalf("Compile(brackenwell):\n%v", err)
	}
	var failing []string
	for _, w := range r.Wiring {
		if w.Status == result.Fail {
			failing = append(failing, w.Name)
		}
	}
	if !reflect.DeepEqual(failing, []string{"windlass-run"}) {
		t.Fatalf("failing wiring lines %q, want exactly [windlass-run]", failing)
	}
	var fails []result.Finding
	for _, f := range r.Checks {
		if f.Subject == "windlass-run" && f.Status == result.Fail {
			fails = append(fails, f)
		}
	}
	// The undersized run drops too much, and the 150 A fuse its windlass's
	// start needs is more than it may carry: one fault, two findings.
	var ids []string
	for _, f := range fails {
		ids = append(ids, string(f.ID))
	}
	if !reflect.DeepEqual(ids, []string{"protection.present", "wiring.voltageDrop"}) {
		t.Fatalf("windlass-run fails %q, want protection.present and wiring.voltageDrop", ids)
	}
	fails = fails[1:]
	f := fails[0]
	if f.Value <= f.Limit || f.Limit != 10 {
		t.Errorf("windlass-run drop %g %% against limit %g %%; want above the 10 %% for other circuits", f.Value, f.Limit)
	}
	// The change names a size: "use 1 AWG: drop 8.25 % ..." at the time of
	// writing; any AWG size larger than the present 4 AWG will do.
	rest, ok := strings.CutPrefix(f.Change, "use ")
	if !ok {
		t.Fatalf("change %q does not begin \"use \"", f.Change)
	}
	name, _, _ := strings.Cut(rest, ":")
	s, err := unit.ParseAs(name, unit.DimSize)
	if err != nil {
		t.Fatalf("change %q does not name a size: %v", f.Change, err)
	}
	four, _ := unit.ParseAs("4 AWG", unit.DimSize)
	if s.Unit != "AWG" || s.Value <= four.Value {
		t.Errorf("change %q names %s; want an AWG size larger than 4 AWG", f.Change, s.Text)
	}
	if !strings.HasPrefix(f.Position, "designs/hulls/brackenwell/wiring.cue:") {
		t.Errorf("finding positioned at %q, want brackenwell's wiring.cue", f.Position)
	}
}

// TestRulesOverride checks that a hull's own rulebook changes a result: the
// good-rules-override hull is good with an inline rulebook whose
// voltageDrop table sets 1 % critical, 2 % other and counts refrigeration
// as critical. good's fridge run drops 1.14 % (4 A × 2 × 3 m × 5.69 mΩ/m
// of tinned 12 AWG at 30 °C, ÷ 12 V): it passes the default 10 % for other
// circuits and fails the override's 1 % for critical ones.
func TestRulesOverride(t *testing.T) {
	toRoot(t)
	good, _, err := Compile(hull("good"))
	if err != nil {
		t.Fatalf("Compile(good):\n%v", err)
	}
	over, d, err := Compile(hull("good-rules-override"))
	if err != nil {
		t.Fatalf("Compile(good-rules-override):\n%v", err)
	}
	drop := func(r *result.Result, run string) result.Finding {
		t.Helper()
		for _, f := range r.Checks {
			if f.ID == "wiring.voltageDrop" && f.Subject == run {
				return f
			}
		}
		t.Fatalf("no wiring.voltageDrop finding for %s", run)
		return result.Finding{}
	}
	tests := []struct {
		run        string
		goodStatus result.Status
		goodLimit  float64
		overStatus result.Status
		overLimit  float64
	}{
		{"panel-fridge", result.Pass, 10, result.Fail, 1}, // refrigeration: other by default, critical in the override
		{"panel-lights", result.Pass, 10, result.Pass, 2}, // lighting: other, 0.71 % < 2 %
		{"bank-panel", result.Pass, 3, result.Pass, 1},    // panel feeder: critical, 0.17 % < 1 %
	}
	for _, tt := range tests {
		t.Run(tt.run, func(t *testing.T) {
			g, o := drop(good, tt.run), drop(over, tt.run)
			if g.Status != tt.goodStatus || g.Limit != tt.goodLimit {
				t.Errorf("good: %s at limit %g %%, want %s at %g %% (%s)", g.Status, g.Limit, tt.goodStatus, tt.goodLimit, g.Message)
			}
			if o.Status != tt.overStatus || o.Limit != tt.overLimit {
				t.Errorf("override: %s at limit %g %%, want %s at %g %% (%s)", o.Status, o.Limit, tt.overStatus, tt.overLimit, o.Message)
			}
			if g.Value != o.Value {
				t.Errorf("drop %g %% in good, %g %% with the override; the rulebook changes the limit, not the drop", g.Value, o.Value)
			}
			if tt.overStatus == result.Fail && !strings.HasPrefix(o.Change, "use ") {
				t.Errorf("failing run's change = %q, want a size", o.Change)
			}
		})
	}

	if got := over.Rulebook; got.Name != "Override test rulebook" || got.Edition != "T-2" {
		t.Errorf("result rulebook %q edition %q, want the override's name and edition", got.Name, got.Edition)
	}
	if got := good.Rulebook.Name; got != "Test yard rulebook" {
		t.Errorf("good's result rulebook %q, want the yard's", got)
	}
	// The override gives only voltageDrop: every other table is the
	// default's (bom too, which the yard rulebook good uses would change).
	def := defaultRules(t)
	if d.Rules.VoltageDrop.Critical != 1 || d.Rules.VoltageDrop.Other != 2 || d.Rules.VoltageDrop.Status != "common-practice" {
		t.Errorf("rules.voltageDrop = %+v, want the override's", d.Rules.VoltageDrop)
	}
	if !reflect.DeepEqual(d.Rules.Ampacity, def.Ampacity) || !reflect.DeepEqual(d.Rules.Resistance, def.Resistance) ||
		!reflect.DeepEqual(d.Rules.Protection, def.Protection) || !reflect.DeepEqual(d.Rules.BOM, def.BOM) {
		t.Error("tables the override does not give differ from the default's")
	}
	// Without a name, the rulebook in force keeps the default's.
	if got := def.Over(&schema.Rulebook{VoltageDrop: d.Rules.VoltageDrop}); got.Name != def.Name || got.Edition != def.Edition {
		t.Errorf("an unnamed override gives rulebook %q edition %q, want the default's %q %q", got.Name, got.Edition, def.Name, def.Edition)
	}
}
