package propose

import (
	"encoding/json"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"github.com/ampwright/ampwright/compiler"
	"github.com/ampwright/ampwright/energy"
	"github.com/ampwright/ampwright/model"
	"github.com/ampwright/ampwright/result"
)

// load compiles a hull (one that may leave parts open) and decodes its
// yard's catalog.
func load(t testing.TB, dir string) (*compiler.Design, *result.Result) {
	t.Helper()
	r, d, err := compiler.CompileOpen(dir)
	if err != nil {
		t.Fatalf("%s: %v", dir, err)
	}
	return d, r
}

// bruteForce completes and checks every combination of the search's
// choices, and the designer's design as written, and returns the cheapest
// that passes every check: what the search must find.
func bruteForce(t *testing.T, d *compiler.Design, designer *result.Result) (float64, []int, bool) {
	t.Helper()
	cat, _, err := d.Catalog()
	if err != nil {
		t.Fatal(err)
	}
	p, err := newProblem(d, cat, Options{})
	if err != nil {
		t.Fatal(err)
	}
	best, found := math.Inf(1), false
	var bestCombo []int
	if designer != nil && designer.Count().Fail == 0 {
		best, found = designer.BOM.Total, true
	}
	combo := make([]int, len(p.dims))
	for {
		ev := p.screen(combo)
		if len(ev.fails) == 0 {
			p.finish(ev)
			if ev.passes && ev.cost < best-costEps {
				best, found, bestCombo = ev.cost, true, append([]int(nil), combo...)
			}
		}
		// The next combination, the last choice fastest.
		i := len(combo) - 1
		for ; i >= 0; i-- {
			combo[i]++
			if combo[i] < len(p.dims[i].opts) {
				break
			}
			combo[i] = 0
		}
		if i < 0 {
			break
		}
	}
	return best, bestCombo, found
}

func catalogOf(batteries, modules, controllers string) map[string]string {
	return map[string]string{"battery": batteries, "module": modules, "controller": controllers}
}

// TestBruteForce: on small hand-made catalogs, the search's proposal costs
// what the cheapest passing design found by checking every combination
// costs, and nothing passes exactly when the brute force finds nothing.
func TestBruteForce(t *testing.T) {
	if testing.Short() {
		t.Skip("checks every combination of three catalogs")
	}
	leadAcid := battery("fl100", "flooded", "12 V", 100, 100) + battery("agm90", "agm", "12 V", 90, 150) + battery("fl6v220", "flooded", "6 V", 220, 140)
	modules := module("m100", 100, 18.2, 22.1, 90) + module("m160", 160, 19.6, 23.6, 150)
	controllers := controller("pwm20", "pwm", 30, 20, 35) + controller("mppt30", "mppt", 100, 30, 160)
	tests := []struct {
		name   string
		blocks map[string]string
		hull   string
		none   bool
	}{
		{
			// Three lead-acid batteries, one of them 6 V (two in series).
			name:   "lead-acid",
			blocks: catalogOf(leadAcid, modules, controllers),
			hull:   hull("fl100", 2, "m100", "pwm20", 2, 1),
		},
		{
			// A lithium battery the alternator may not charge unlimited, a
			// cheap flooded one that needs more array, and a bigger module.
			name: "lithium or more array",
			blocks: catalogOf(battery("lfp100", "lifepo4", "12.8 V", 100, 300)+battery("fl60", "flooded", "12 V", 60, 55),
				module("m50", 50, 18, 22, 40)+module("m200", 200, 20.4, 24.5, 170), controllers),
			hull: hull("fl60", 4, "m50", "pwm20", 3, 1),
		},
		{
			// A synthetic catalog: lead-acid of 6 and 12 V, lithium, PWM and
			// MPPT controllers.
			name:   "synthetic",
			blocks: syntheticCatalog(4, 3, 3),
			hull:   hull("bat-00", 3, "mod-00", "ctl-00", 2, 1),
		},
		{
			// Sixteen of the only battery cannot carry four days.
			name:   "nothing passes",
			blocks: catalogOf(battery("tiny20", "flooded", "12 V", 20, 30), modules, controllers),
			hull:   hull("tiny20", 4, "m100", "pwm20", 2, 4),
			none:   true,
		},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			root := testYard(t, tt.blocks, map[string]string{"small": tt.hull})
			d, r := load(t, filepath.Join(root, "hulls", "small"))
			cat, _, err := d.Catalog()
			if err != nil {
				t.Fatal(err)
			}
			got, err := Propose(d, r, cat, Options{})
			if err != nil {
				t.Fatal(err)
			}
			want, wantCombo, found := bruteForce(t, d, r)
			t.Logf("search %s %.2f (%d checked); brute force %v %.2f %v; blocking %v", got.Report.Status, got.Report.Proposed.Cost, got.Report.Search.Evaluated, found, want, wantCombo, got.Report.Blocking)
			if !found {
				if got.Spec != nil || got.Report.Status != "none" {
					t.Fatalf("brute force: nothing passes; the search proposes %s at %.2f", got.Report.Status, got.Report.Proposed.Cost)
				}
				if len(got.Report.Blocking) == 0 {
					t.Error("nothing passes, and the proposal names no check that blocks")
				}
				return
			}
			if tt.none {
				t.Fatalf("brute force found a passing design at %.2f; the case expects none", want)
			}
			if got.Spec == nil || got.Report.Status != "proven" {
				t.Fatalf("status %q; brute force found %.2f", got.Report.Status, want)
			}
			if math.Abs(got.Report.Proposed.Cost-want) > costEps {
				t.Errorf("proposal costs %.2f; the cheapest passing design found by brute force costs %.2f (%v)", got.Report.Proposed.Cost, want, wantCombo)
			}
		})
	}
}

// TestExampleYard: on every example hull the proposal passes `check` once
// written as CUE and loaded back, costs what the search said, and is never
// dearer than the designer's design when that passes.
func TestExampleYard(t *testing.T) {
	root := filepath.Join(t.TempDir(), "yard")
	if err := os.CopyFS(root, os.DirFS("../designs")); err != nil {
		t.Fatal(err)
	}
	for _, h := range []string{"dunnock", "marram", "brackenwell", "tystie", "sanderling"} {
		t.Run(h, func(t *testing.T) {
			d, r := load(t, filepath.Join(root, "hulls", h))
			cat, ref, err := d.Catalog()
			if err != nil {
				t.Fatal(err)
			}
			p, err := Propose(d, r, cat, Options{})
			if err != nil {
				t.Fatal(err)
			}
			if p.Spec == nil {
				t.Fatalf("no proposal: %s; blocking %v", p.Report.Status, p.Report.Blocking)
			}
			if p.Report.Status != "proven" {
				t.Errorf("status %q, want proven", p.Report.Status)
			}
			if r.Count().Fail == 0 && p.Report.Proposed.Cost > r.BOM.Total+costEps {
				t.Errorf("the proposal costs %.2f, more than the designer's passing design at %.2f", p.Report.Proposed.Cost, r.BOM.Total)
			}
			b, err := d.Rewrite(p.Spec, cat, ref, p.Header, p.Notes)
			if err != nil {
				t.Fatal(err)
			}
			out := filepath.Join(root, "hulls", h+"-proposed")
			if err := os.MkdirAll(out, 0o755); err != nil {
				t.Fatal(err)
			}
			if err := os.WriteFile(filepath.Join(out, h+".cue"), b, 0o644); err != nil {
				t.Fatal(err)
			}
			got, _, err := compiler.Compile(out)
			if err != nil {
				t.Fatalf("the written proposal does not load: %v", err)
			}
			if c := got.Count(); c.Fail > 0 {
				for _, f := range got.Checks {
					if f.Status == result.Fail {
						t.Errorf("the written proposal fails %s %s: %s", f.ID, f.Subject, f.Message)
					}
				}
			}
			if math.Abs(got.BOM.Total-p.Report.Proposed.Cost) > costEps {
				t.Errorf("the written proposal costs %.2f; the search said %.2f", got.BOM.Total, p.Report.Proposed.Cost)
			}
		})
	}
}

// TestDeterministic: the same inputs give the same proposal, byte for
// byte, and the same CUE.
func TestDeterministic(t *testing.T) {
	var reports, files [2][]byte
	for i := range 2 {
		d, r := load(t, "../designs/hulls/sanderling")
		cat, ref, err := d.Catalog()
		if err != nil {
			t.Fatal(err)
		}
		p, err := Propose(d, r, cat, Options{})
		if err != nil {
			t.Fatal(err)
		}
		if reports[i], err = json.Marshal(p.Report); err != nil {
			t.Fatal(err)
		}
		if files[i], err = d.Rewrite(p.Spec, cat, ref, p.Header, p.Notes); err != nil {
			t.Fatal(err)
		}
	}
	if string(reports[0]) != string(reports[1]) {
		t.Error("two searches of the same hull gave different reports")
	}
	if string(files[0]) != string(files[1]) {
		t.Error("two searches of the same hull gave different CUE")
	}
}

// TestTimeout: a search cut before it starts gives the designer's passing
// design, marked not proven.
func TestTimeout(t *testing.T) {
	d, r := load(t, "../designs/hulls/dunnock")
	cat, _, err := d.Catalog()
	if err != nil {
		t.Fatal(err)
	}
	past := time.Unix(0, 0)
	p, err := Propose(d, r, cat, Options{Until: past.Add(time.Second), Now: func() time.Time { return past.Add(time.Hour) }})
	if err != nil {
		t.Fatal(err)
	}
	if p.Report.Status != "best-found" || p.Report.Cut == "" {
		t.Errorf("status %q, cut %q; want best-found and why it was cut", p.Report.Status, p.Report.Cut)
	}
	if p.Spec == nil || p.Report.Proposed.Fail != 0 {
		t.Error("a cut search lost the designer's passing design")
	}
	// A design that fails, cut before anything passes: none, and no claim
	// that nothing would.
	d, r = load(t, "../designs/hulls/brackenwell")
	if cat, _, err = d.Catalog(); err != nil {
		t.Fatal(err)
	}
	p, err = Propose(d, r, cat, Options{Until: past.Add(time.Second), Now: func() time.Time { return past.Add(time.Hour) }})
	if err != nil {
		t.Fatal(err)
	}
	if p.Spec != nil || p.Report.Status != "none" || !strings.Contains(p.Report.Cut, "no proof that nothing in the catalog passes") {
		t.Errorf("status %q, cut %q; want none, and no proof", p.Report.Status, p.Report.Cut)
	}
}

// TestPremises checks the monotone premises the search prunes by on the
// example hulls, over the range the search visits: more batteries in
// parallel, or more strings, never lower the lowest state of charge.
func TestPremises(t *testing.T) {
	for _, h := range []string{"dunnock", "marram", "sanderling"} {
		d, _ := load(t, "../designs/hulls/"+h)
		lowest := func(parallel, strings int) float64 {
			spec := *d.Spec
			b := *spec.Bank
			b.Parallel = parallel
			spec.Bank = &b
			spec.Arrays = copyMap(spec.Arrays)
			for n, a := range spec.Arrays {
				a.Strings = strings
				spec.Arrays[n] = a
			}
			sys, issues := model.Build(&spec, d.Rules)
			if len(issues) > 0 {
				t.Fatal(issues)
			}
			return energy.Analyze(sys).Voyage.Primary.Run.Lowest
		}
		prev := -1.0
		for p := 1; p <= 16; p++ {
			got := lowest(p, 1)
			if got < prev-1e-12 {
				t.Errorf("%s: %d in parallel give a lowest state of charge of %.4f, below %d's %.4f", h, p, got, p-1, prev)
			}
			prev = got
		}
		prev = -1
		for n := 1; n <= 4; n++ {
			got := lowest(d.Spec.Bank.Parallel, n)
			if got < prev-1e-12 {
				t.Errorf("%s: %d strings give a lowest state of charge of %.4f, below %d's %.4f", h, n, got, n-1, prev)
			}
			prev = got
		}
	}
}

// TestFit: how many modules a place takes.
func TestFit(t *testing.T) {
	tests := []struct {
		pl, pw, ml, mw float64
		want           int
	}{
		{2.2, 1.4, 1.02, 0.67, 4}, // 2 × 2 one way round
		{2.2, 1.4, 1.58, 0.808, 1},
		{3.2, 2.0, 1.58, 0.808, 4},  // 2 × 2
		{1.0, 1.0, 1.02, 0.67, 0},   // too short either way
		{1.02, 0.67, 1.02, 0.67, 1}, // exactly
		{2.1, 0.7, 0.67, 1.02, 2},   // turned
	}
	for _, tt := range tests {
		if got := Fit(tt.pl, tt.pw, tt.ml, tt.mw); got != tt.want {
			t.Errorf("Fit(%g × %g place, %g × %g module) = %d, want %d", tt.pl, tt.pw, tt.ml, tt.mw, got, tt.want)
		}
	}
}

// BenchmarkPropose measures the search on each example hull, and on a
// synthetic hull (the small test hull, its rails taking up to four
// modules) with a catalog of 50 batteries, 30 modules and 20 controllers.
// Run it with
//
//	go test ./propose -run xxx -bench Propose -benchtime 3x
func BenchmarkPropose(b *testing.B) {
	run := func(b *testing.B, dir string) {
		d, r := load(b, dir)
		cat, _, err := d.Catalog()
		if err != nil {
			b.Fatal(err)
		}
		var p *Proposal
		for b.Loop() {
			if p, err = Propose(d, r, cat, Options{}); err != nil {
				b.Fatal(err)
			}
		}
		b.ReportMetric(float64(p.Report.Search.Evaluated), "checked")
		b.ReportMetric(float64(p.Report.Search.Considered), "reached")
		if p.Spec == nil {
			b.Fatalf("no proposal: %v", p.Report.Blocking)
		}
	}
	for _, h := range []string{"dunnock", "marram", "brackenwell", "tystie", "sanderling"} {
		b.Run("example/"+h, func(b *testing.B) { run(b, "../designs/hulls/"+h) })
	}
	b.Run("synthetic-50x30x20", func(b *testing.B) {
		root := testYard(b, syntheticCatalog(50, 30, 20), map[string]string{"synthetic": hull("bat-00", 3, "mod-00", "ctl-01", 4, 1.5)})
		run(b, filepath.Join(root, "hulls", "synthetic"))
	})
}

// TestPlaceErrors: a place that says neither how many modules it takes nor
// its size, or half its size, is an input error at the array.
func TestPlaceErrors(t *testing.T) {
	modules := module("m100", 100, 18.2, 22.1, 90)
	tests := []struct{ place, want string }{
		{`place: {length: "2 m"}`, "arrays.rails.place: give both length and width, or neither"},
		{`place: {name: "rails"}`, "arrays.rails.place: give maxModules, or the place's length and width"},
	}
	for _, tt := range tests {
		src := strings.Replace(hull("fl100", 2, "m100", "pwm20", 2, 1), "place: {maxModules: 2}", tt.place, 1)
		root := testYard(t, catalogOf(battery("fl100", "flooded", "12 V", 100, 100), modules, controller("pwm20", "pwm", 30, 20, 35)), map[string]string{"small": src})
		d, r := load(t, filepath.Join(root, "hulls", "small"))
		cat, _, err := d.Catalog()
		if err != nil {
			t.Fatal(err)
		}
		_, err = Propose(d, r, cat, Options{})
		if err == nil || !strings.Contains(err.Error(), tt.want) || !strings.Contains(err.Error(), "small.cue:") {
			t.Errorf("%s: error %v; want it positioned in small.cue and saying %q", tt.place, err, tt.want)
		}
	}
}

// TestBounds: the lower bounds that know a bank's fault current and a
// combination's light wiring prune only what cannot beat the best: with
// the floor alone, the search finds designs of the same cost.
func TestBounds(t *testing.T) {
	for _, h := range []string{"dunnock", "marram", "sanderling"} {
		d, r := load(t, "../designs/hulls/"+h)
		cat, _, err := d.Catalog()
		if err != nil {
			t.Fatal(err)
		}
		var costs [2]float64
		for i, weak := range []bool{false, true} {
			p, err := newProblem(d, cat, Options{})
			if err != nil {
				t.Fatal(err)
			}
			if weak {
				p.weak = true
				for _, dm := range p.dims {
					was := ""
					if dm.designer >= 0 {
						was = dm.opts[dm.designer].label
					}
					for c := range dm.opts {
						dm.opts[c].inc = 0
					}
					sortOptions(dm.opts)
					for c, o := range dm.opts {
						if o.label == was {
							dm.designer = c
						}
					}
				}
			}
			p.seed(r)
			p.search()
			if p.best == nil {
				t.Fatalf("%s: no proposal", h)
			}
			costs[i] = p.best.cost
		}
		if math.Abs(costs[0]-costs[1]) > costEps {
			t.Errorf("%s: the search costs its proposal at %.2f with its bounds and %.2f with the floor alone", h, costs[0], costs[1])
		}
	}
}
