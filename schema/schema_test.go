package schema

import (
	"reflect"
	"strings"
	"testing"

	"cuelang.org/go/cue"
	"cuelang.org/go/cue/ast"
	"cuelang.org/go/cue/cuecontext"
	"cuelang.org/go/cue/parser"

	"github.com/ampwright/ampwright/schema/unit"
)

// patternDims maps each quantity pattern of quantity.cue to the dimension
// its fields must name in @q.
var patternDims = map[string]unit.Dim{
	"#Length":      unit.DimLength,
	"#Size":        unit.DimSize,
	"#Voltage":     unit.DimVoltage,
	"#Current":     unit.DimCurrent,
	"#Power":       unit.DimPower,
	"#Energy":      unit.DimEnergy,
	"#Charge":      unit.DimCharge,
	"#Temperature": unit.DimTemperature,
	"#Irradiation": unit.DimIrradiation,
	"#TempCoeff":   unit.DimTempCoeff,
	"#Resistance":  unit.DimResistance,
}

func TestBuild(t *testing.T) {
	v, err := Build(cuecontext.New())
	if err != nil {
		t.Fatalf("schema does not compile: %v", err)
	}
	if !v.LookupPath(DesignPath).Exists() {
		t.Fatalf("no %v in the schema", DesignPath)
	}
	var r Rulebook
	if err := v.LookupPath(DefaultPath).Decode(&r); err != nil {
		t.Fatalf("default rulebook does not decode: %v", err)
	}
	// 33 CFR 183.425 Table 5: 10 AWG with 105 °C insulation, 60 A.
	if got := r.Ampacity.Table["10 AWG"]["105 °C"]; got != 60 {
		t.Errorf("default ampacity 10 AWG 105 °C = %v, want 60 (33 CFR 183.425 Table 5)", got)
	}
	// 33 CFR 183.455: within 7 in of the source (0.1778 m).
	if got := r.Protection.Within.Metres(); got != 7*0.0254 {
		t.Errorf("protection.within = %v m, want 0.1778 (33 CFR 183.455: 7 in)", got)
	}
	// The diff's margin threshold is a rule of thumb, and says so.
	if r.Review == nil || r.Review.Shrink != 0.5 || r.Review.Near != 0.5 || r.Review.Status != "common-practice" {
		t.Errorf("default review table = %+v, want shrink 0.5, near 0.5, status common-practice", r.Review)
	}
	over := r.Over(&Rulebook{Review: &ReviewRule{Shrink: 0.3, Near: 1}})
	if over.Review.Shrink != 0.3 || r.Review.Shrink != 0.5 {
		t.Errorf("a yard's review table does not replace the default's: got %v over %v", over.Review.Shrink, r.Review.Shrink)
	}
}

// TestQuantityAttributes checks every field that uses a quantity pattern
// carries a @q attribute naming the pattern's dimension, and that each
// limit in a @q parses as that dimension.
func TestQuantityAttributes(t *testing.T) {
	names, contents := Files()
	count := 0
	for _, n := range names {
		f, err := parser.ParseFile(n, contents[n], parser.ParseComments)
		if err != nil {
			t.Fatal(err)
		}
		ast.Walk(f, func(node ast.Node) bool {
			field, ok := node.(*ast.Field)
			if !ok {
				return true
			}
			want, uses := usedPattern(field.Value)
			var q *ast.Attribute
			for _, a := range field.Attrs {
				if strings.HasPrefix(a.Text, "@q(") {
					q = a
				}
			}
			label, _, _ := ast.LabelName(field.Label)
			where := n + ": field " + label
			switch {
			case uses && q == nil:
				t.Errorf("%s uses a quantity pattern but has no @q attribute", where)
				return true
			case q == nil:
				return true
			}
			count++
			args := strings.Split(strings.TrimSuffix(strings.TrimPrefix(q.Text, "@q("), ")"), ",")
			dim, ok := unit.DimByName(args[0])
			if !ok {
				t.Errorf("%s: @q names unknown dimension %q", where, args[0])
				return true
			}
			if uses && dim != want {
				t.Errorf("%s: @q(%s) on a %v pattern", where, args[0], want)
			}
			for _, kv := range args[1:] {
				op, val, _ := strings.Cut(kv, "=")
				switch op {
				case "gt", "ge", "lt", "le":
				default:
					t.Errorf("%s: unknown limit %q", where, op)
				}
				if _, err := unit.ParseAs(strings.Trim(val, `"`), dim); err != nil {
					t.Errorf("%s: limit %s: %v", where, kv, err)
				}
			}
			return true
		}, nil)
	}
	if count < 40 {
		t.Errorf("found only %d @q attributes; the walk is broken", count)
	}
}

// usedPattern reports whether x refers to one of the quantity patterns.
func usedPattern(x ast.Expr) (unit.Dim, bool) {
	var dim unit.Dim
	found := false
	ast.Walk(x, func(n ast.Node) bool {
		switch n.(type) {
		case *ast.StructLit, *ast.ListLit:
			return false // fields inside are checked on their own
		}
		if id, ok := n.(*ast.Ident); ok {
			if d, ok := patternDims[id.Name]; ok {
				dim, found = d, true
			}
		}
		return true
	}, nil)
	return dim, found
}

// TestPatternsAgreeWithParser keeps the CUE patterns, which `cue vet`
// uses, in step with the Go parser, which ampwright uses: each dimension's
// example values match its pattern, and values of another dimension do
// not.
func TestPatternsAgreeWithParser(t *testing.T) {
	ctx := cuecontext.New()
	v, err := Build(ctx)
	if err != nil {
		t.Fatal(err)
	}
	examples := map[unit.Dim][]string{}
	for _, d := range unit.Dims() {
		for _, ex := range strings.Split(d.Examples(), " or ") {
			examples[d] = append(examples[d], strings.Trim(ex, `"`))
		}
	}
	for def, dim := range patternDims {
		pattern := v.LookupPath(cue.ParsePath(def))
		for d, exs := range examples {
			for _, ex := range exs {
				err := pattern.Unify(ctx.CompileString(`"` + ex + `"`)).Validate(cue.Concrete(true))
				_, perr := unit.ParseAs(ex, dim)
				if (err == nil) != (perr == nil) {
					t.Errorf("%s on %q (a %v): pattern error %v, parser error %v; they must agree", def, ex, d, err, perr)
				}
			}
		}
	}
}

// TestPatternsAcceptEverySpelling checks that each pattern takes every
// unit spelling the parser takes for its dimension, with and without a
// space, so that `cue vet` never rejects what ampwright accepts.
func TestPatternsAcceptEverySpelling(t *testing.T) {
	ctx := cuecontext.New()
	v, err := Build(ctx)
	if err != nil {
		t.Fatal(err)
	}
	for def, dim := range patternDims {
		pattern := v.LookupPath(cue.ParsePath(def))
		for _, sp := range unit.Spellings(dim) {
			num := "12"
			if dim == unit.DimSize && (sp == "AWG" || sp == "awg") {
				num = "2/0"
			}
			for _, space := range []string{" ", "", "\u00a0"} {
				in := num + space + sp
				if _, err := unit.ParseAs(in, dim); err != nil {
					t.Errorf("parser rejects %q: %v", in, err)
					continue
				}
				if err := pattern.Unify(ctx.Encode(in)).Validate(cue.Concrete(true)); err != nil {
					t.Errorf("%s rejects %q, which the parser accepts: %v", def, in, err)
				}
			}
		}
	}
}

// TestRulebookOverCoversEveryTable: Over takes every table a yard's
// rulebook gives. A table added to Rulebook but not to Over would be
// silently ignored in a yard's override.
func TestRulebookOverCoversEveryTable(t *testing.T) {
	rt := reflect.TypeOf(Rulebook{})
	for i := 0; i < rt.NumField(); i++ {
		f := rt.Field(i)
		if f.Type.Kind() != reflect.Pointer {
			continue
		}
		var over Rulebook
		table := reflect.New(f.Type.Elem())
		reflect.ValueOf(&over).Elem().Field(i).Set(table)
		got := Rulebook{}.Over(&over)
		if reflect.ValueOf(got).Field(i).Pointer() != table.Pointer() {
			t.Errorf("Rulebook.Over ignores the %s table (%s): add it to Over", f.Name, f.Tag.Get("json"))
		}
	}
}
