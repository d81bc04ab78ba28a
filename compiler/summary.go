package compiler

import (
	"fmt"
	"math"
	"strings"

	"github.com/ampwright/ampwright/checks"
	"github.com/ampwright/ampwright/result"
	"github.com/ampwright/ampwright/schema"
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
	net, errs := buildNetwork(d)
	if len(errs) > 0 {
		return nil, nil, errs
	}
	r := d.Result()
	in := &checks.Input{Design: d.Spec, Rules: d.Rules, Position: d.Position, Network: net}
	var figures []result.Figure
	r.Checks, figures = checks.RunAll(checks.All, in)
	r.Figures = append(r.Figures, figures...)
	r.Wiring = wiringTable(net, r)
	r.Budget = budgetTable(in.Budget())
	r.Harvest = in.HarvestResult()
	r.Voyage = in.VoyageResult()
	r.BOM = billOfMaterials(d)
	if err := finite(r); err != nil {
		return nil, nil, err
	}
	return r, d, nil
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

// Result returns the result skeleton of d: identity, rulebook, summary
// and the figures that describe what it declares.
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
	for _, name := range schema.Names(s.Loads) {
		l := s.Loads[name]
		draw := ""
		switch {
		case l.Current != nil:
			draw = l.Current.Text
		case l.Power != nil:
			draw = l.Power.Text
		}
		r.Summary.Loads = append(r.Summary.Loads, result.LoadLine{
			Name: name, Circuit: l.Circuit, Kind: l.Kind, Draw: draw, Duty: l.Duty, Inverter: l.Inverter,
		})
	}
	b := s.Bank
	r.Summary.Bank = result.BankLine{Battery: b.Battery.ID, Chemistry: b.Battery.Chemistry, Series: b.Series, Parallel: b.Parallel}
	for _, name := range schema.Names(s.Arrays) {
		a := s.Arrays[name]
		kind := ""
		if c, ok := s.Controllers[a.Controller]; ok {
			kind = c.Part.Kind
		}
		r.Summary.Arrays = append(r.Summary.Arrays, result.ArrayLine{
			Name: name, Module: a.Module.ID, Series: a.Series, Strings: a.Strings, Controller: a.Controller, ControllerKind: kind,
		})
	}
	for _, name := range schema.Names(s.Wiring) {
		c := s.Wiring[name]
		line := result.CircuitLine{Name: name, From: c.From, To: c.To, Length: c.Length.Text, Size: c.Size.Text}
		if c.Protection != nil {
			line.Protection = c.Protection.ID
		}
		r.Summary.Circuits = append(r.Summary.Circuits, line)
	}
	r.Figures = append(r.Figures, bankFigures(d)...)
	r.Figures = append(r.Figures, arrayFigures(d)...)
	return r
}

const defined = "definition"

func bankFigures(d *Design) []result.Figure {
	b := d.Spec.Bank
	v := b.Battery.Voltage.Volts()
	ah := b.Battery.Capacity.Ah()
	ns, np := float64(b.Series), float64(b.Parallel)
	return []result.Figure{
		{
			ID: "bank.nominalVoltage", Subject: "bank", Value: ns * v, Unit: "V",
			Formula: "V_bank = N_series × V_battery",
			Inputs: []result.Input{
				{Name: "N_series", Value: ns, From: "bank.series"},
				{Name: "V_battery", Value: v, Unit: "V", From: "bank.battery.voltage"},
			},
			Source: defined,
		},
		{
			ID: "bank.capacity", Subject: "bank", Value: np * ah, Unit: "Ah",
			Formula: "C_bank = N_parallel × C_battery",
			Inputs: []result.Input{
				{Name: "N_parallel", Value: np, From: "bank.parallel"},
				{Name: "C_battery", Value: ah, Unit: "Ah", From: "bank.battery.capacity"},
			},
			Source: defined,
		},
		{
			ID: "bank.nominalEnergy", Subject: "bank", Value: ns * v * np * ah, Unit: "Wh",
			Formula: "E_bank = N_series × V_battery × N_parallel × C_battery",
			Inputs: []result.Input{
				{Name: "N_series", Value: ns, From: "bank.series"},
				{Name: "V_battery", Value: v, Unit: "V", From: "bank.battery.voltage"},
				{Name: "N_parallel", Value: np, From: "bank.parallel"},
				{Name: "C_battery", Value: ah, Unit: "Ah", From: "bank.battery.capacity"},
			},
			Source: defined,
		},
	}
}

func arrayFigures(d *Design) []result.Figure {
	var out []result.Figure
	for _, name := range schema.Names(d.Spec.Arrays) {
		a := d.Spec.Arrays[name]
		p := a.Module.Pmax.Watts()
		ns, np := float64(a.Series), float64(a.Strings)
		path := "arrays." + quoteLabel(name)
		out = append(out, result.Figure{
			ID: "array.stcPower", Subject: name, Value: ns * np * p, Unit: "W",
			Formula: "P_STC = N_series × N_strings × Pmax",
			Inputs: []result.Input{
				{Name: "N_series", Value: ns, From: path + ".series"},
				{Name: "N_strings", Value: np, From: path + ".strings"},
				{Name: "Pmax", Value: p, Unit: "W", From: path + ".module.pmax"},
			},
			Source: "module datasheet at STC (1000 W/m², 25 °C cell temperature)",
		})
	}
	return out
}

// wiringTable is one line per run with the figures of the wiring checks
// and the worst status of its wiring and protection findings.
func wiringTable(net *checks.Network, r *result.Result) []result.WiringLine {
	fig := map[[2]string]float64{}
	for _, f := range r.Figures {
		fig[[2]string{f.ID, f.Subject}] = f.Value
	}
	status := map[string]result.Status{}
	limit := map[string]float64{}
	for _, f := range r.Checks {
		if !strings.HasPrefix(f.ID, "wiring.") && !strings.HasPrefix(f.ID, "protection.") {
			continue
		}
		if s, ok := status[f.Subject]; !ok || f.Status.Rank() < s.Rank() {
			status[f.Subject] = f.Status
		}
		if f.ID == "wiring.voltageDrop" {
			limit[f.Subject] = f.Limit
		}
	}
	var out []result.WiringLine
	for _, run := range net.Runs {
		line := result.WiringLine{
			Name: run.Name, From: run.Spec.From, To: run.Spec.To, Role: string(run.Role),
			Length: run.Spec.Length.Metres(), LengthText: run.Spec.Length.Text,
			Size: run.Spec.Size.Text, Current: round3(run.Current), CurrentBasis: run.Basis,
			Class: run.Class, Drop: fig[[2]string{"wiring.voltageDrop", run.Name}], DropLimit: limit[run.Name],
			Ampacity: fig[[2]string{"wiring.ampacity", run.Name}],
			Status:   status[run.Name],
		}
		if p := run.Spec.Protection; p != nil {
			line.Protection = p.Rating.Text + " " + p.Kind
		}
		if line.Status == "" {
			line.Status = result.Pass
		}
		out = append(out, line)
	}
	return out
}

func round3(x float64) float64 { return math.Round(x*1000) / 1000 }

// budgetTable is the energy budget of each scenario, for reports.
func budgetTable(budget []checks.ScenarioEnergy) []result.ScenarioBudget {
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
