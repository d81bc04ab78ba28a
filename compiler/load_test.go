package compiler

import (
	"flag"
	"math"
	"os"
	"path"
	"path/filepath"
	"reflect"
	"slices"
	"strings"
	"testing"

	"cuelang.org/go/cue/cuecontext"

	"github.com/ampwright/ampwright/schema"
)

var update = flag.Bool("update", false, "rewrite golden files")

// The corpus lives in testdata/designs at the repository root: yard is one
// small CUE module with a hull package per case, standalone and
// standalone-noid are hulls in no module, and remote is a module that asks
// for a module from a registry.
const (
	corpus = "testdata/designs"
	yard   = corpus + "/yard"
	golden = corpus + "/golden"
)

// toRoot makes the repository root the working directory for the test, so
// that the file names in messages, which are relative to the working
// directory when the file lies below it, read testdata/designs/... and do
// not depend on where the checkout sits.
func toRoot(t *testing.T) {
	t.Helper()
	t.Chdir("..")
	if _, err := os.Stat(filepath.Join(corpus, "golden")); err != nil {
		t.Fatalf("not at the repository root: %v", err)
	}
	// cue/load is given a registry that refuses; make sure nothing else
	// would be consulted either.
	t.Setenv("CUE_REGISTRY", "127.0.0.1:9")
	t.Setenv("CUE_CACHE_DIR", t.TempDir())
}

func hull(name string) string { return yard + "/hulls/" + name }

// badCases are designs with deliberate faults, each one unless named many.
// paths are the CUE paths of the errors expected, in the order reported.
var badCases = []struct {
	name  string
	dir   string
	paths []string
}{
	{"syntax", hull("syntax"), []string{""}},
	{"wrong-unit", hull("wrong-unit"), []string{"vessel.length"}},
	{"malformed-unit", hull("malformed-unit"), []string{`wiring."bank-panel".length`}},
	{"out-of-limits", hull("out-of-limits"), []string{"site.latitude", `wiring."panel-lights".length`}},
	{"negative", hull("negative"), []string{`wiring."panel-fridge".length`}},
	{"missing-field", hull("missing-field"), []string{"bank"}},
	{"missing-nested", hull("missing-nested"), []string{`wiring."panel-lights".size`}},
	// A misspelt field is both not allowed and, as the field it should
	// have been, missing.
	{"misspelt-field", hull("misspelt-field"), []string{`wiring."panel-fridge".length`, `wiring."panel-fridge".lenght`}},
	{"unknown-part", hull("unknown-part"), []string{"bank.battery"}},
	{"unknown-circuit", hull("unknown-circuit"), []string{"loads.fridge.circuit"}},
	{"unknown-node", hull("unknown-node"), []string{`wiring."panel-lights".to`}},
	{"unknown-scenario", hull("unknown-scenario"), []string{"loads.lights.hours.anchorage"}},
	{"duplicate-names", hull("duplicate-names"), []string{"loads.fridge", "loads.bilge_pump"}},
	{"duplicate-month", hull("duplicate-month"), []string{"site.months[2]"}},
	{"irradiation-missing-month", hull("irradiation-missing-month"), []string{"site.irradiation"}},
	{"current-and-power", hull("current-and-power"), []string{"loads.lights"}},
	{"enum", hull("enum"), []string{"vessel.system"}},
	{"type-mismatch", hull("type-mismatch"), []string{"site.latitude"}},
	{"many", hull("many"), manyPaths},
	{"huge-value", hull("huge-value"), []string{`wiring."bank-panel".length`}},
	{"nan-value", hull("nan-value"), []string{`wiring."bank-panel".length`}},
	{"empty-value", hull("empty-value"), []string{"vessel.name", `wiring."panel-fridge".length`}},
	{"incomplete-value", hull("incomplete-value"), []string{`wiring."bank-panel".length`}},
	{"conflicting-values", hull("conflicting-values"), []string{"vessel.system"}},
	{"deep-nesting", hull("deep-nesting"), []string{"notes"}},

	// The same faults in hulls that do not import the schema.
	{"wrong-unit-noschema", hull("wrong-unit-noschema"), []string{"vessel.length"}},
	{"misspelt-field-noschema", hull("misspelt-field-noschema"), []string{`wiring."panel-fridge".length`, `wiring."panel-fridge".lenght`}},
	{"enum-noschema", hull("enum-noschema"), []string{"vessel.system"}},
	{"missing-nested-noschema", hull("missing-nested-noschema"), []string{`wiring."panel-lights".size`}},
	{"unknown-part-noschema", hull("unknown-part-noschema"), []string{"bank.battery"}},
	{"many-noschema", hull("many-noschema"), manyPaths},

	// Outside any module.
	{"standalone-noid", corpus + "/standalone-noid", []string{"bank.battery.id"}},
	{"remote", corpus + "/remote/hulls/remote", []string{"test.example/remote/hulls/remote@v0"}},
}

// manyPaths are the six faults of the many cases, in the order of their
// lines in the file.
var manyPaths = []string{
	"vessel.kind",
	"vessel.length",
	"site.latitude",
	"loads.fridge.dutty",
	"loads.fridge.hours.ancor",
	"loads.lights.circuit",
}

func TestLoadErrors(t *testing.T) {
	toRoot(t)
	for _, tc := range badCases {
		t.Run(tc.name, func(t *testing.T) {
			d, err := Load(tc.dir)
			if err == nil {
				t.Fatalf("Load(%s) succeeded; want input errors", tc.dir)
			}
			if d != nil {
				t.Errorf("Load(%s) returned a design with its errors", tc.dir)
			}
			list, ok := err.(ErrorList)
			if !ok {
				t.Fatalf("Load(%s) error is %T, not an ErrorList: %v", tc.dir, err, err)
			}
			if len(list) == 0 {
				t.Fatalf("Load(%s) returned an empty ErrorList", tc.dir)
			}
			text := list.Error()

			var paths []string
			for _, e := range list {
				paths = append(paths, e.Path)
			}
			if !slices.Equal(paths, tc.paths) {
				t.Errorf("error paths:\n got %q\nwant %q\nerrors:\n%s", paths, tc.paths, text)
			}

			for _, e := range list {
				switch {
				case !e.Pos.IsValid():
					t.Errorf("error with no position: %s", e)
				case isSchemaPos(e.Pos):
					t.Errorf("error positioned in the schema, not the design: %s", e)
				case path.Dir(displayName(e.Pos.Filename())) != tc.dir:
					t.Errorf("error positioned outside the hull's own files (%s): %s", displayName(e.Pos.Filename()), e)
				}
				for _, r := range e.Related {
					if !r.IsValid() {
						t.Errorf("related position not valid in: %s", e)
					}
				}
				for _, bad := range []string{"_|_", "empty disjunction"} {
					if strings.Contains(e.Msg, bad) {
						t.Errorf("message shows CUE's %q: %s", bad, e)
					}
				}
			}

			sorted := slices.Clone(list)
			sorted.Sort()
			if got := sorted.Error(); got != text {
				t.Errorf("errors not sorted; sorted they read:\n%s\nas returned:\n%s", got, text)
			}

			checkGolden(t, filepath.Join(golden, tc.name+".txt"), text+"\n")
		})
	}
}

func checkGolden(t *testing.T, file, got string) {
	t.Helper()
	if *update {
		if err := os.WriteFile(file, []byte(got), 0o644); err != nil {
			t.Fatal(err)
		}
		return
	}
	want, err := os.ReadFile(file)
	if err != nil {
		t.Fatalf("%v (run go test ./compiler -update to write it)", err)
	}
	if got != string(want) {
		t.Errorf("errors differ from %s:\n--- got\n%s--- want\n%s", file, got, want)
	}
}

// Every case in the corpus has its golden file, and every golden file its
// case.
func TestGoldenFilesHaveCases(t *testing.T) {
	toRoot(t)
	files, err := filepath.Glob(filepath.Join(golden, "*.txt"))
	if err != nil {
		t.Fatal(err)
	}
	names := map[string]bool{}
	for _, tc := range badCases {
		names[tc.name] = true
	}
	for _, tc := range graphCases { // graph_test.go
		names[tc.name] = true
	}
	for _, f := range files {
		if n := strings.TrimSuffix(filepath.Base(f), ".txt"); !names[n] {
			t.Errorf("golden file %s has no case", f)
		}
	}
	hulls, err := os.ReadDir(yard + "/hulls")
	if err != nil {
		t.Fatal(err)
	}
	for _, h := range hulls {
		if n := h.Name(); !names[n] && !strings.HasPrefix(n, "good") {
			t.Errorf("hull %s is in no case", n)
		}
	}
}

func TestLoadRefusesRegistry(t *testing.T) {
	toRoot(t)
	_, err := Load(corpus + "/remote/hulls/remote")
	if err == nil {
		t.Fatal("a design that asks for a registry module loaded")
	}
	msg := err.Error()
	for _, want := range []string{
		"registry.example/parts@v0.1.0",
		"ampwright never downloads modules",
		"remote.cue:5:8",
	} {
		if !strings.Contains(msg, want) {
			t.Errorf("error does not say %q:\n%s", want, msg)
		}
	}
}

// defaultRules is the built-in rulebook, decoded.
func defaultRules(t *testing.T) schema.Rulebook {
	t.Helper()
	v, err := schema.Build(cuecontext.New())
	if err != nil {
		t.Fatal(err)
	}
	var r schema.Rulebook
	if err := v.LookupPath(schema.DefaultPath).Decode(&r); err != nil {
		t.Fatal(err)
	}
	return r
}

func mustLoad(t *testing.T, dir string) *Design {
	t.Helper()
	d, err := Load(dir)
	if err != nil {
		t.Fatalf("Load(%s):\n%v", dir, err)
	}
	return d
}

// awgArea is the cross-section in mm² of a gauge by ASTM B258: the
// diameter is 0.127 mm × 92^((36−n)/39).
func awgArea(n int) float64 {
	d := 0.127 * math.Pow(92, float64(36-n)/39)
	return math.Pi * d * d / 4
}

func near(a, b float64) bool { return math.Abs(a-b) <= 1e-9*math.Max(1, math.Abs(b)) }

func TestLoadGood(t *testing.T) {
	toRoot(t)
	d := mustLoad(t, hull("good"))
	s := d.Spec

	if got := s.Vessel.Length.Metres(); got != 7.5 {
		t.Errorf("vessel.length = %v m, want 7.5", got)
	}
	if s.Vessel.System != "12 V" || s.Vessel.SystemVolts() != 12 {
		t.Errorf("vessel.system = %q (%v V), want 12 V", s.Vessel.System, s.Vessel.SystemVolts())
	}
	if s.Vessel.Units != "metric" {
		t.Errorf("vessel.units = %q, want the default metric", s.Vessel.Units)
	}
	if s.Site.Latitude != 50.1 || s.Site.Longitude != -5.0 {
		t.Errorf("site at %v, %v; want 50.1, -5", s.Site.Latitude, s.Site.Longitude)
	}
	if got := s.Site.Irradiation.Monthly["Jun"].KWhPerM2Day(); got != 5.9 {
		t.Errorf("site.irradiation.Jun = %v kWh/m²/day, want 5.9", got)
	}
	if s.Site.Irradiation.Source != "test data" || len(s.Site.Irradiation.Monthly) != 2 {
		t.Errorf("site.irradiation = %+v; want source and two months", s.Site.Irradiation)
	}
	if got := s.Site.RecordLow.Celsius(); got != 2 {
		t.Errorf("site.recordLow = %v °C, want 2", got)
	}
	if got := s.Scenarios["anchor"].Hours; got != 24 {
		t.Errorf("scenarios.anchor.hours = %v, want the default 24", got)
	}

	fridge := s.Loads["fridge"]
	if fridge.Current == nil || fridge.Current.Amps() != 4 || fridge.Power != nil {
		t.Errorf("loads.fridge draw = %v, %v; want 4 A and no power", fridge.Current, fridge.Power)
	}
	if fridge.Duty != 0.4 || fridge.Hours["anchor"] != 24 || fridge.Quantity != 1 {
		t.Errorf("loads.fridge = %+v", fridge)
	}
	lights := s.Loads["lights"]
	if lights.Power == nil || lights.Power.Watts() != 10 || lights.Current != nil {
		t.Errorf("loads.lights draw = %v, %v; want 10 W and no current", lights.Current, lights.Power)
	}

	b := s.Bank
	if b.Battery.ID != "agm105" || b.Battery.Chemistry != "agm" || b.Battery.Capacity.Ah() != 105 {
		t.Errorf("bank.battery = %+v; want the catalog's agm105", b.Battery)
	}
	if got := b.Battery.Resistance.Ohms(); !near(got, 0.004) {
		t.Errorf("bank.battery.resistance = %v Ω, want 0.004", got)
	}
	if b.Series != 1 || b.Parallel != 2 || b.Battery.RatedHours != 20 {
		t.Errorf("bank = %d × %d, rated at %v h; want 1 × 2 at 20 h", b.Series, b.Parallel, b.Battery.RatedHours)
	}

	if len(s.Wiring) != 3 {
		t.Errorf("%d conductors, want 3", len(s.Wiring))
	}
	for name, gauge := range map[string]int{"bank-panel": 6, "panel-fridge": 12} {
		c := s.Wiring[name]
		g, ok := c.Size.AWG()
		if !ok || g != gauge {
			t.Errorf("wiring.%s.size = %v, want %d AWG", name, c.Size, gauge)
			continue
		}
		if got, want := c.Size.MM2(), awgArea(gauge); !near(got, want) {
			t.Errorf("wiring.%s.size = %v mm², want %v mm² (ASTM B258)", name, got, want)
		}
	}
	// Published figures: 12 AWG is 3.31 mm², 6 AWG 13.3 mm².
	if got := s.Wiring["panel-fridge"].Size.MM2(); math.Abs(got-3.31) > 0.005 {
		t.Errorf("12 AWG = %v mm², want 3.31", got)
	}
	if got := s.Wiring["bank-panel"].Size.MM2(); math.Abs(got-13.30) > 0.01 {
		t.Errorf("6 AWG = %v mm², want 13.30", got)
	}
	lightsRun := s.Wiring["panel-lights"]
	if got := lightsRun.Size.MM2(); got != 2.5 || lightsRun.Size.Family() != "mm²" {
		t.Errorf("wiring.panel-lights.size = %v %s, want 2.5 mm²", got, lightsRun.Size.Family())
	}
	if got := lightsRun.Length.Metres(); got != 6 {
		t.Errorf("wiring.panel-lights.length = %v m, want 6", got)
	}
	if lightsRun.Material != "tinned-copper" || lightsRun.Insulation.Celsius() != 105 || lightsRun.Bundle != 1 {
		t.Errorf("wiring.panel-lights defaults = %q, %v, %d", lightsRun.Material, lightsRun.Insulation, lightsRun.Bundle)
	}
	feed := s.Wiring["bank-panel"]
	if p := feed.Protection; p == nil || p.ID != "mrbf100" || p.Rating.Amps() != 100 || p.Distance == nil || p.Distance.Metres() != 0 {
		t.Errorf("wiring.bank-panel.protection = %+v; want mrbf100 at 0 m", feed.Protection)
	}
	if c := s.Wiring["panel-fridge"].Cable; c == nil || c.ID != "awg12" || c.SaleUnit.Metres() != 1 {
		t.Errorf("wiring.panel-fridge.cable = %+v; want awg12 sold by the metre", c)
	}

	// The yard's rulebook gives its name, edition and the bom table; the
	// default gives the rest.
	def := defaultRules(t)
	r := d.Rules
	if r.Name != "Test yard rulebook" || r.Edition != "T-1" {
		t.Errorf("rulebook %q edition %q; want the yard's", r.Name, r.Edition)
	}
	if r.BOM == nil || r.BOM.Slack != 0.20 || r.BOM.Status != "common-practice" {
		t.Errorf("rules.bom = %+v; want the yard's 20 %%", r.BOM)
	}
	if r.Ampacity == nil || r.Ampacity.Table["12 AWG"]["105 °C"] != 45 {
		t.Errorf("rules.ampacity = %+v; want the default's table", r.Ampacity)
	}
	if !reflect.DeepEqual(r.Ampacity, def.Ampacity) || !reflect.DeepEqual(r.VoltageDrop, def.VoltageDrop) ||
		!reflect.DeepEqual(r.Protection, def.Protection) || !reflect.DeepEqual(r.DepthOfDischarge, def.DepthOfDischarge) {
		t.Error("tables the yard's rulebook does not give differ from the default's")
	}

	root, _ := filepath.Abs(yard)
	if d.Root != root {
		t.Errorf("Root = %s, want %s", d.Root, root)
	}
	if d.Dir != hull("good") {
		t.Errorf("Dir = %s, want %s", d.Dir, hull("good"))
	}
	for _, f := range []string{"hulls/good/good.cue", "catalog/catalog.cue", "rulebook/rulebook.cue"} {
		if !slices.Contains(d.Files, filepath.Join(root, f)) {
			t.Errorf("Files lack %s: %q", f, d.Files)
		}
	}
	if !slices.IsSorted(d.Files) {
		t.Errorf("Files not sorted: %q", d.Files)
	}
	if len(d.Hash) != 64 {
		t.Errorf("Hash = %q, want SHA-256 hex", d.Hash)
	}
	if got, want := d.Position(`wiring."bank-panel"`), hull("good")+"/good.cue:"; !strings.HasPrefix(got, want) {
		t.Errorf(`Position(wiring."bank-panel") = %q, want %s...`, got, want)
	}

	// Loading again gives the same design and hash.
	again := mustLoad(t, hull("good"))
	if again.Hash != d.Hash || !reflect.DeepEqual(again.Spec, d.Spec) {
		t.Error("a second Load of the same design differs")
	}
}

// A hull that does not import the schema decodes as one that embeds it.
func TestLoadGoodNoSchema(t *testing.T) {
	toRoot(t)
	with := mustLoad(t, hull("good"))
	without := mustLoad(t, hull("good-noschema"))
	if !reflect.DeepEqual(with.Spec, without.Spec) {
		t.Errorf("good-noschema decodes differently from good:\n%+v\n%+v", without.Spec, with.Spec)
	}
	if !reflect.DeepEqual(with.Rules, without.Rules) {
		t.Error("good-noschema has a different rulebook from good")
	}
	if with.Hash == without.Hash {
		t.Error("different inputs have the same hash")
	}
	if got := without.Spec.Vessel.Length.Metres(); got != 7.5 {
		t.Errorf("vessel.length = %v m, want 7.5", got)
	}
}

// A hull in no module, importing nothing, with its parts inline.
func TestLoadStandalone(t *testing.T) {
	toRoot(t)
	dir := corpus + "/standalone"
	d := mustLoad(t, dir)
	s := d.Spec

	abs, _ := filepath.Abs(dir)
	if d.Root != abs {
		t.Errorf("Root = %s, want the design directory %s", d.Root, abs)
	}
	if want := []string{filepath.Join(abs, "standalone.cue")}; !slices.Equal(d.Files, want) {
		t.Errorf("Files = %q, want %q", d.Files, want)
	}
	if got := s.Vessel.Length.Metres(); !near(got, 18*0.3048) {
		t.Errorf("vessel.length = %v m, want 18 ft = 5.4864 m", got)
	}
	if !s.Vessel.Length.Imperial() {
		t.Error("vessel.length written in feet is not imperial")
	}
	if s.Bank.Battery.ID != "launch-agm60" || s.Bank.Battery.Capacity.Ah() != 60 {
		t.Errorf("bank.battery = %+v", s.Bank.Battery)
	}
	pump := s.Wiring["bank-pump"]
	if got := pump.Size.MM2(); !near(got, awgArea(14)) {
		t.Errorf("14 AWG = %v mm², want %v", got, awgArea(14))
	}
	if p := pump.Protection; p == nil || p.ID != "atc10" || p.Distance == nil || !near(p.Distance.Metres(), 0.127) {
		t.Errorf("wiring.bank-pump.protection = %+v; want atc10 at 5 in", pump.Protection)
	}
	if got := s.Scenarios["daysail"].Hours; got != 12 {
		t.Errorf("scenarios.daysail.hours = %v, want 12", got)
	}
	if s.Rules != nil {
		t.Errorf("rules = %+v, want none", s.Rules)
	}
	if !reflect.DeepEqual(d.Rules, defaultRules(t)) {
		t.Errorf("rulebook %q: want the default, whole", d.Rules.Name)
	}
	if d.Rules.Name != "ampwright default rulebook" {
		t.Errorf("rulebook name %q", d.Rules.Name)
	}
}
