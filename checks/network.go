package checks

import "github.com/ampwright/ampwright/schema"

// Network is a design's DC wiring as a tree rooted at the bank: every run
// oriented from its end nearer the bank, with the loads it feeds and the
// current it is designed for. The compiler builds it; checks read it.
type Network struct {
	// Runs are every conductor run, sorted by name.
	Runs []*Run
}

// Role is what a run carries.
type Role string

// The roles of a run.
const (
	// Supply runs carry current from the bank to loads and inverters.
	Supply Role = "supply"
	// Charge runs carry a controller's output to the bank.
	Charge Role = "charge"
	// PV runs carry an array's output to its controller.
	PV Role = "pv"
)

// Run is one conductor run in the network.
type Run struct {
	Name string
	// Path is the run's CUE path: wiring."bank-main".
	Path string
	Spec *schema.Conductor
	// Up is the end nearer the bank (for a PV run, the controller end);
	// Down the far end.
	Up, Down string
	Role     Role
	// Parent is the next run toward the bank, nil for a run from the bank.
	Parent *Run
	// Loads are the loads the run feeds, directly or through others.
	Loads []string
	// Current is the design current, amperes, and Basis says how it was
	// found.
	Current float64
	Basis   string
	// DropCurrent is the current the voltage drop is taken at, and
	// DropVoltage the voltage it is a percentage of: for most runs the
	// design current and the nominal system voltage; for a solar run the
	// strings' current at maximum power and the voltage the array works at
	// (the strings' Vmp behind an MPPT controller, the battery behind PWM).
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
}

// Find returns the run with the given name, or nil.
func (n *Network) Find(name string) *Run {
	if n == nil {
		return nil
	}
	for _, r := range n.Runs {
		if r.Name == name {
			return r
		}
	}
	return nil
}
