package compiler

import (
	"fmt"
	"math"

	"github.com/ampwright/ampwright/checks"
	"github.com/ampwright/ampwright/energy"
	"github.com/ampwright/ampwright/model"
	"github.com/ampwright/ampwright/result"
)

// Compile loads the design in dir and runs every check over it. Input
// errors come back as an ErrorList, with no result.
func Compile(dir string) (*result.Result, *Design, error) {
	return CompileFrom(dir, nil)
}

// CompileFrom is Compile reading from src (see LoadFrom). It bounds what
// it reads (DefaultLimits), not its time or memory: that is for the process
// that runs it.
func CompileFrom(dir string, src *Source) (r *result.Result, d *Design, err error) {
	defer recovered(dir, &err)
	return compile(dir, src)
}

func compile(dir string, src *Source) (*result.Result, *Design, error) {
	d, err := LoadFrom(dir, src)
	if err != nil {
		return nil, nil, err
	}
	return d.compile()
}

// compile runs the model, the energy analyses and every check over a
// loaded design.
func (d *Design) compile() (*result.Result, *Design, error) {
	sys, issues := model.Build(d.Spec, d.Rules)
	if len(issues) > 0 {
		return nil, nil, d.modelErrors(issues)
	}
	d.Sys = sys
	a := energy.Analyze(sys)
	r := d.Result()
	in := checks.NewInput(sys, a, d.Position)
	r.Checks, r.Figures = checks.RunAll(checks.All, in)
	r.Wiring = wiringTable(sys, r)
	r.Budget = budgetTable(a.Budget)
	r.Harvest = harvestTable(a.Harvest)
	if a.Voyage != nil {
		r.Voyage = a.Voyage.Result(d.Spec.Voyage.Start)
	}
	r.BOM = billOfMaterials(d, sys)
	r.System = systemTable(sys)
	if err := finite(r); err != nil {
		return nil, nil, err
	}
	return r, d, nil
}

// modelErrors positions the model's issues at the design's entries.
func (d *Design) modelErrors(issues []model.Issue) ErrorList {
	var errs ErrorList
	for _, is := range issues {
		errs = append(errs, &Error{Pos: d.posOf(is.Path), Path: is.Path, Msg: is.Msg})
	}
	errs.Sort()
	return errs
}

// finite refuses a result with a number that is not finite: values within
// the schema's limits can still multiply or divide past what a float64
// holds, and no view (JSON least of all) could show the figure.
func finite(r *result.Result) error {
	p, bad := result.NonFinite(r)
	if !bad {
		return nil
	}
	e := &Error{Msg: fmt.Sprintf("the figure at %s is not a finite number: the design's values are too large or too small to compute with; check the values it is computed from", p)}
	var i int
	switch {
	case scan(p, "checks[%d]", &i) && i < len(r.Checks):
		f := r.Checks[i]
		e.Msg = fmt.Sprintf("check %s of %s computes a number that is not finite: the design's values are too large or too small to compute with; check the values of %s", f.ID, f.Subject, f.Subject)
		if f.Position != "" {
			e.Msg += " at " + f.Position
		}
	case scan(p, "figures[%d]", &i) && i < len(r.Figures):
		f := r.Figures[i]
		e.Msg = fmt.Sprintf("figure %s of %s is not a finite number: the design's values are too large or too small to compute with; check the values of %s", f.ID, f.Subject, f.Subject)
	}
	return ErrorList{e}
}

// scan reads an index from the front of a result path.
func scan(p, format string, i *int) bool {
	_, err := fmt.Sscanf(p, format, i)
	return err == nil
}

// Result returns the result skeleton of d: identity, rulebook and the
// summary of what it declares, read from its system model.
func (d *Design) Result() *result.Result {
	s := d.Spec
	r := &result.Result{
		Version: result.Version,
		Design: result.Identity{
			Name:       s.Vessel.Name,
			Hull:       s.Vessel.Hull,
			Kind:       s.Vessel.Kind,
			System:     s.Vessel.System,
			Path:       d.Dir,
			InputsHash: d.Hash,
			Units:      s.Vessel.Units,
			Length:     s.Vessel.Length.Text,
			Client:     s.Vessel.Client,
			Yard:       s.Vessel.Yard,
			Designer:   s.Vessel.Designer,
			Checker:    s.Vessel.Checker,
			Approver:   s.Vessel.Approver,
		},
		Rulebook: result.Rulebook{Name: d.Rules.Name, Edition: d.Rules.Edition},
		Figures:  []result.Figure{},
		Checks:   []result.Finding{},
	}
	sys := d.Sys
	for _, l := range sys.Loads {
		spec := l.Spec
		draw := ""
		switch {
		case spec.Current != nil:
			draw = spec.Current.Text
		case spec.Power != nil:
			draw = spec.Power.Text
		}
		line := result.LoadLine{
			Name: l.Name, Circuit: spec.Circuit, Kind: spec.Kind, Draw: draw, Duty: spec.Duty, Inverter: spec.Inverter,
			Quantity: max(spec.Quantity, 1),
		}
		if sys.MultiBank() && l.Bank != nil {
			line.Bank = l.Bank.Name
		}
		r.Summary.Loads = append(r.Summary.Loads, line)
	}
	for _, b := range sys.Banks {
		line := result.BankLine{Battery: b.Spec.Battery.ID, Chemistry: b.Spec.Battery.Chemistry, Series: b.Spec.Series, Parallel: b.Spec.Parallel}
		if sys.MultiBank() {
			line.Name, line.Role, line.System = b.Name, b.Role, b.System
		}
		r.Summary.Banks = append(r.Summary.Banks, line)
		if b == sys.Primary() {
			r.Summary.Bank = line
		}
	}
	for _, a := range sys.Arrays {
		r.Summary.Arrays = append(r.Summary.Arrays, result.ArrayLine{
			Name: a.Name, Module: a.Spec.Module.ID, Series: a.Spec.Series, Strings: a.Spec.Strings,
			Controller: a.Spec.Controller, ControllerKind: a.Controller.Spec.Part.Kind,
		})
	}
	for _, run := range append(sys.Runs[:len(sys.Runs):len(sys.Runs)], sys.Returns...) {
		c := run.Spec
		line := result.CircuitLine{Name: run.Name, From: c.From, To: c.To, Length: c.Length.Text, Size: c.Size.Text}
		if c.Protection != nil {
			line.Protection = c.Protection.ID
		}
		r.Summary.Circuits = append(r.Summary.Circuits, line)
	}
	return r
}

func round3(x float64) float64 { return math.Round(x*1000) / 1000 }

// wiringTable is one line per run, the negative conductors after the
// positive runs, with the figures of the wiring checks, computed from the
// model as the checks computed them, and the worst status of the run's
// wiring and protection findings.
func wiringTable(sys *model.System, r *result.Result) []result.WiringLine {
	status := map[string]result.Status{}
	for _, f := range r.Checks {
		if a := f.ID.Area(); a != "wiring" && a != "protection" {
			continue
		}
		if s, ok := status[f.Subject]; !ok || f.Status.Rank() < s.Rank() {
			status[f.Subject] = f.Status
		}
	}
	var out []result.WiringLine
	for _, run := range append(sys.Runs[:len(sys.Runs):len(sys.Runs)], sys.Returns...) {
		line := result.WiringLine{
			Name: run.Name, From: run.Spec.From, To: run.Spec.To, Role: string(run.Role),
			Length: run.Spec.Length.Metres(), LengthText: run.Spec.Length.Text,
			Size: run.Spec.Size.Text, Current: round3(run.Current), CurrentBasis: run.Basis,
			Class:  run.Class,
			Status: status[run.Name],
		}
		if run.DropCurrent > 0 && math.Abs(run.DropCurrent-run.Current) > 1e-9 {
			line.DropCurrent = round3(run.DropCurrent)
		}
		if run.DropCurrent > 0 {
			line.Drop = roundTo(sys.RunDrop(run, run.Spec.Size).Pct, 3)
			line.DropLimit = model.DropLimit(sys.Rules, run.Class)
		}
		if a := sys.RunAmpacity(run, run.Spec.Size); a.OK {
			line.Ampacity = roundTo(a.Derated, 2)
		}
		if p := run.Spec.Protection; p != nil {
			line.Protection = p.Rating.Text + " " + p.Kind
		}
		if run.Role != model.PV && run.Role != model.Return && !run.Ret.Mirror {
			switch {
			case run.Ret.Via != nil:
				line.ReturnVia = run.Ret.Via.Name
			default:
				line.ReturnSize, line.ReturnLength = run.Ret.Size.Text, run.Ret.Length
			}
		}
		if n, ok := sys.Landing(run); ok && run.Ret.Lands != nil {
			line.ReturnTo = n.Name
		}
		if line.Status == "" {
			line.Status = result.Pass
		}
		out = append(out, line)
	}
	return out
}

func roundTo(x float64, n int) float64 {
	p := math.Pow(10, float64(n))
	return math.Round(x*p) / p
}

// budgetTable is the energy budget of each scenario, for reports.
func budgetTable(budget []energy.ScenarioEnergy) []result.ScenarioBudget {
	var out []result.ScenarioBudget
	for _, se := range budget {
		sb := result.ScenarioBudget{
			Scenario: se.Name, Hours: se.Hours, Wh: round3(se.Wh), Ah: round3(se.Ah),
			WhPerDay: round3(se.WhPerDay), MeanCurrent: round3(se.MeanCurrent),
			Loads: []result.LoadBudget{},
		}
		for _, l := range se.Loads {
			share := 0.0
			if se.Wh > 0 {
				share = l.Wh / se.Wh * 100
			}
			sb.Loads = append(sb.Loads, result.LoadBudget{Name: l.Name, Wh: round3(l.Wh), Share: math.Round(share*10) / 10, Formula: l.Formula})
		}
		out = append(out, sb)
	}
	return out
}

// harvestTable is the harvest by array and month, for reports.
func harvestTable(harvest []energy.ArrayHarvest) []result.ArrayHarvest {
	var out []result.ArrayHarvest
	for _, ah := range harvest {
		ra := result.ArrayHarvest{Array: ah.Name, Controller: ah.Controller, Kind: ah.Kind, Alternative: checks.OtherKind(ah.Kind),
			STC: roundTo(ah.STC, 3), NOCT: roundTo(ah.Cell.NOCT, 2), NOCTRise: ah.Cell.Rise, Standoff: roundTo(ah.Cell.Standoff, 4)}
		ra.CellModel = "SAM NOCT"
		if !ah.Cell.SAM {
			ra.CellModel = "Sandia, " + ah.Cell.SandiaName
		}
		for _, m := range ah.Months {
			ra.Months = append(ra.Months, result.MonthHarvest{
				Month: m.Month, Irradiation: m.H, POA: roundTo(m.POA, 4), Wh: roundTo(m.Wh, 1),
				AltWh: roundTo(m.AltWh, 1), Clipped: roundTo(m.Clipped, 1), PeakCell: roundTo(m.PeakCell, 1),
				Cell: roundTo(m.Cell, 2), Ambient: roundTo(m.Ambient, 2), TempFactor: roundTo(m.TempFactor, 5),
				Wiring: roundTo(m.Wiring, 5), Capped: roundTo(m.Capped, 1),
			})
		}
		out = append(out, ra)
	}
	return out
}
