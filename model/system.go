// Package model is one hull's DC system as a typed model: its banks and
// the links between them, charge sources, converters, inverters, buses and
// panels, loads, the positive wiring as a tree from each bank, and the
// negative side with its shunt. Every run carries its role, the bank and
// voltage of its side, its design current and voltage-drop class, and its
// return conductor.
//
// Build makes the model once from the decoded design and the rulebook in
// force. The energy analyses, the checks, the result, the bill of
// materials and the diagram read it; none of them rebuilds it. The package
// imports only the schema and its units.
package model

import (
	"regexp"
	"strconv"

	"github.com/ampwright/ampwright/schema"
	"github.com/ampwright/ampwright/schema/unit"
)

// System is a hull's DC system.
type System struct {
	Design *schema.Design
	Rules  schema.Rulebook
	// Volts is the vessel's nominal system voltage.
	Volts float64

	Banks       []*Bank // by name
	Links       []*Link
	Sources     []*Source // every charge source, by name
	Arrays      []*Array
	Controllers []*Controller
	Inverters   []*Inverter
	Converters  []*Converter
	Buses       []*Bus
	Loads       []*Load
	// Runs are the positive runs, by name; Returns the negative
	// conductors the design draws, by name.
	Runs    []*Run
	Returns []*Run
	// Shunts are the battery monitor's shunts, and NegativeBuses the
	// negative buses, when the design draws its negative side.
	Shunts        []*Shunt
	NegativeBuses []*NegativeBus

	// Nodes are the positive side's nodes, Negatives the negative side's,
	// by name.
	Nodes     map[string]*Node
	Negatives map[string]*Node

	// ampRows caches the parsed rows of the ampacity table.
	ampRows []ampacityRow
}

// Kind is what a node of the wiring is.
type Kind string

// The kinds of node.
const (
	KindBank       Kind = "bank"
	KindBus        Kind = "bus"
	KindLoad       Kind = "load"
	KindArray      Kind = "array"
	KindController Kind = "controller"
	KindInverter   Kind = "inverter"
	KindCharger    Kind = "charger"
	KindLink       Kind = "link"
	KindConverter  Kind = "converter"
	// On the negative side: a bank's negative post is a KindBank node.
	KindNegativeBus Kind = "negative-bus"
	KindShunt       Kind = "shunt"
)

// Node is a point of the wiring: a bank, a bus, or a part a run ends at.
type Node struct {
	Name string
	Kind Kind
	// Path is the CUE path of its declaration: buses."main-bus".
	Path string
	// Bank is the bank whose side it is on; nil for a link, which is on
	// two sides, and for a node no run reaches.
	Bank *Bank
	// Volts is the nominal voltage of its side (a converter's input side).
	Volts float64
	// In is the run that reaches it from its bank; nil for a bank, and for
	// a link (see Link).
	In *Run
	// Out are the runs continuing from it, by name.
	Out []*Run
}

// Role is what a run carries.
type Role string

// The roles of a run.
const (
	// Supply runs carry current from a bank to loads, inverters,
	// converters and a DC-DC charger's input.
	Supply Role = "supply"
	// Charge runs carry a charge source's output to a bank.
	Charge Role = "charge"
	// PV runs carry an array's output to its controller.
	PV Role = "pv"
	// Return runs are negative conductors the design draws.
	Return Role = "return"
)

// Run is one conductor run.
type Run struct {
	Name string
	// Path is the run's CUE path: wiring."bank-main", or
	// negative.wiring."shunt-bus".
	Path string
	Spec *schema.Conductor
	// Up is the end nearer the bank (for a PV run, the controller end);
	// Down the far end.
	Up, Down         string
	UpNode, DownNode *Node
	Role             Role
	// Bank is the bank whose side the run is on, and Volts the nominal
	// voltage of that side (a converter's output beyond it).
	Bank  *Bank
	Volts float64
	// Parent is the next run toward the bank, nil for a run from a bank.
	Parent   *Run
	Children []*Run
	// Loads are the loads the run feeds, directly or through others.
	Loads []string
	// Current is the design current, amperes, and Basis says how it was
	// found.
	Current float64
	Basis   string
	// DropCurrent is the current the voltage drop is taken at, and
	// DropVoltage the voltage it is a percentage of: for most runs the
	// design current and the nominal voltage of the run's side; for a
	// solar run the strings' current at maximum power and the voltage the
	// array works at (the strings' Vmp behind an MPPT controller, the
	// battery behind PWM).
	DropCurrent float64
	DropBasis   string
	DropVoltage float64
	VoltBasis   string
	// Class is the voltage-drop class, "critical" or "other", and
	// ClassBasis says why.
	Class      string
	ClassBasis string
	// Strings and Isc describe the PV strings a PV run carries.
	Strings int
	Isc     float64
	// Ret is how the run's current returns to its bank.
	Ret ReturnPath
}

// otherEnd is the end of the run that is not the node named name.
func (r *Run) otherEnd(name string) string {
	if r.Spec.To == name {
		return r.Spec.From
	}
	return r.Spec.To
}

// ReturnPath is how a positive run's current returns.
type ReturnPath struct {
	// Own is true when the run has a return conductor of its own: every
	// run of a design that draws no negative side; with one, every run but
	// one that feeds a bus whose circuits return to a negative bus of their
	// own, or a bus (a switch) beyond which every run returns some other
	// way.
	Own bool
	// Mirror is true when its own return conductor is of the run's size
	// and length, as on every design that draws no negative side.
	Mirror bool
	// Size and Length (m) of the run's own return conductor, and
	// LengthText as the design writes it.
	Size       unit.Size
	Length     float64
	LengthText string
	// Lands is the negative node its own return conductor lands on; nil
	// where the design draws no negative side, and for a PV run.
	Lands *Node
	// Via is the negative conductor that carries the run's return instead
	// of one of its own: the conductor feeding the negative bus paired with
	// the bus the run feeds.
	Via *Run
	// Joins is the run whose return conductor this run's return joins: a
	// run from a bus with no negative bus of its own returns beside the run
	// that feeds the bus.
	Joins *Run
}

// Bank is a battery bank.
type Bank struct {
	Name string
	Path string
	Spec *schema.Bank
	Role string
	// Volts is the nominal voltage of the bank's side: the vessel's system
	// voltage, or the bank's own.
	Volts  float64
	System string
	Node   *Node
	// Negative is the bank's negative post on the negative side.
	Negative *Node
	// Loads are the loads on the bank's side (through converters and
	// inverters too); Sources the charge sources that charge it.
	Loads   []*Load
	Sources []*Source
}

// NominalVoltage is N_series × V_battery.
func (b *Bank) NominalVoltage() float64 {
	return float64(b.Spec.Series) * b.Spec.Battery.Voltage.Volts()
}

// Capacity is N_parallel × C_battery, Ah.
func (b *Bank) Capacity() float64 {
	return float64(b.Spec.Parallel) * b.Spec.Battery.Capacity.Ah()
}

// Load is one consumer.
type Load struct {
	Name string
	Path string
	Spec *schema.Load
	// Circuit is the run that feeds a DC load; Inverter the inverter of an
	// AC load.
	Circuit  *Run
	Inverter *Inverter
	Bank     *Bank
	// Volts is the nominal voltage of a DC load's side, or of the side of an
	// AC load's inverter.
	Volts float64
	// Current is a DC load's full draw at Volts, all of them fitted.
	Current float64
}

// Array is a solar array.
type Array struct {
	Name       string
	Path       string
	Spec       *schema.Array
	Node       *Node
	Controller *Controller
}

// Controller is a solar charge controller.
type Controller struct {
	Name   string
	Path   string
	Spec   *schema.Controller
	Node   *Node
	Arrays []*Array
}

// Inverter feeds AC loads from its bank's side.
type Inverter struct {
	Name  string
	Path  string
	Spec  *schema.Inverter
	Node  *Node
	Loads []*Load
}

// Converter feeds loads at another voltage from its bank's side.
type Converter struct {
	Name string
	Path string
	Spec *schema.Converter
	Node *Node
	// In and Out are the nominal voltages of its two sides.
	In, Out float64
	// Loads are the loads beyond it.
	Loads []*Load
}

// Link joins two banks.
type Link struct {
	Name string
	Path string
	Spec *schema.Link
	Node *Node
	// From and To are its banks; FromRun and ToRun the runs that reach it
	// from each side.
	From, To       *Bank
	FromRun, ToRun *Run
}

// Bus is a positive bus, panel or switch.
type Bus struct {
	Name string
	Path string
	Spec *schema.Bus
	Node *Node
	// Negative is the negative bus its circuits return to, if any.
	Negative *Node
}

// NegativeBus is a negative busbar.
type NegativeBus struct {
	Name string
	Path string
	Spec *schema.NegativeBus
	Node *Node
}

// Shunt is a battery monitor's shunt.
type Shunt struct {
	Name string
	Path string
	Spec *schema.Shunt
	Node *Node
}

// SourceKind is what a charge source is.
type SourceKind string

// The kinds of charge source.
const (
	Solar           SourceKind = "solar"
	Alternator      SourceKind = "alternator"
	ShoreCharger    SourceKind = "shore"
	Generator       SourceKind = "generator"
	DCDCSource      SourceKind = "dc-dc"
	InverterCharger SourceKind = "inverter-charger"
)

// Source is a charge source: a solar controller, an alternator, a shore
// or generator charger, an inverter-charger on shore power. A link
// carries charge between banks and is not a source.
type Source struct {
	Name string
	Path string
	Kind SourceKind
	Node *Node
	// Bank is the bank it charges.
	Bank *Bank
	// Output is the current it delivers, A, and OutputBasis how that was
	// found.
	Output      float64
	OutputBasis string
	// CurrentLimited is true when the source limits its current to what
	// a lithium bank accepts: a solar controller, a charger, a regulator
	// that says so.
	CurrentLimited bool
	// Charger is the design's charger entry (nil for a solar controller
	// or an inverter-charger); Controller and Inverter the others'.
	Charger    *schema.Charger
	Controller *Controller
	Inverter   *Inverter
}

// Issue is a fault of the design that the model finds: a loop in the
// wiring, a run that leads nowhere, a link wired to the wrong bank. Path
// is the CUE path it concerns.
type Issue struct {
	Path string
	Msg  string
}

var plainLabel = regexp.MustCompile(`^[A-Za-z_$][A-Za-z0-9_$]*$`)

// Label spells a name as a CUE path element: quoted unless it is an
// identifier, as CUE prints paths.
func Label(name string) string {
	if plainLabel.MatchString(name) {
		return name
	}
	return strconv.Quote(name)
}

// Primary is the bank the boat's energy checks are about where a design
// has several: the first house bank by name, else the first bank.
func (s *System) Primary() *Bank {
	for _, b := range s.Banks {
		if b.Role == "house" {
			return b
		}
	}
	if len(s.Banks) > 0 {
		return s.Banks[0]
	}
	return nil
}

// Bank returns the bank with the given name, or nil.
func (s *System) Bank(name string) *Bank {
	for _, b := range s.Banks {
		if b.Name == name {
			return b
		}
	}
	return nil
}

// Run returns the positive or negative run with the given name, or nil.
func (s *System) Run(name string) *Run {
	for _, list := range [][]*Run{s.Runs, s.Returns} {
		for _, r := range list {
			if r.Name == name {
				return r
			}
		}
	}
	return nil
}

// Load returns the load with the given name, or nil.
func (s *System) Load(name string) *Load {
	for _, l := range s.Loads {
		if l.Name == name {
			return l
		}
	}
	return nil
}

// Controller returns the controller with the given name, or nil.
func (s *System) Controller(name string) *Controller {
	for _, c := range s.Controllers {
		if c.Name == name {
			return c
		}
	}
	return nil
}

// BankOf returns the bank whose side the named node is on, or nil.
func (s *System) BankOf(node string) *Bank {
	if n := s.Nodes[node]; n != nil {
		return n.Bank
	}
	return nil
}

// MultiBank reports whether the design has several banks.
func (s *System) MultiBank() bool { return len(s.Banks) > 1 }
