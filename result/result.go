// Package result defines what ampwright reports about a design: the JSON
// contract of `ampwright check --format json`, and the values every report
// (text, Markdown, PDF, diff) is a view of. It uses only the standard
// library, so that any tool can import it to read results.
//
// Field names are stable: a field may be added, none renamed or removed
// without a new Version.
package result

import "sort"

// Version is the version of this contract, written into every Result.
const Version = "ampwright.result/v1"

// Status is a finding's verdict.
type Status string

// The verdicts, from worst to best.
const (
	Fail Status = "fail"
	Warn Status = "warn"
	Pass Status = "pass"
)

// Rank orders statuses worst first.
func (s Status) Rank() int {
	switch s {
	case Fail:
		return 0
	case Warn:
		return 1
	}
	return 2
}

// Result is everything ampwright found about one design.
type Result struct {
	Version string   `json:"version"`
	Design  Identity `json:"design"`
	// Rulebook names the rulebook the checks used.
	Rulebook Rulebook `json:"rulebook"`
	// Summary describes the validated design.
	Summary Summary `json:"summary"`
	// Figures are the computed values, each traceable to its inputs.
	Figures []Figure `json:"figures"`
	// Checks are the findings of every check, worst first.
	Checks []Finding `json:"checks"`
	// Wiring is one line per conductor run with its wiring figures.
	Wiring []WiringLine `json:"wiring"`
	// Budget is the energy budget of each scenario.
	Budget []ScenarioBudget `json:"budget"`
	// Harvest is each array's mean daily harvest by month.
	Harvest []ArrayHarvest `json:"harvest"`
	// Voyage is the state-of-charge run over the design voyage, if any.
	Voyage *Voyage `json:"voyage,omitempty"`
	// BOM is the bill of materials.
	BOM *BOM `json:"bom,omitempty"`
	// System is the design's topology, for the one-line diagram.
	System *System `json:"system,omitempty"`
	// Problems are input errors; a Result with problems has no figures.
	Problems []Problem `json:"problems,omitempty"`
	// Proposal is the cheapest passing design from the yard's catalog,
	// when it was asked for (ampwright pack --with-proposal).
	Proposal *Proposal `json:"proposal,omitempty"`
}

// Identity names the design a result is for.
type Identity struct {
	Name   string `json:"name"`
	Hull   string `json:"hull"`
	Kind   string `json:"kind,omitempty"`
	System string `json:"system,omitempty"`
	// Path is the design directory as given on the command line.
	Path string `json:"path"`
	// InputsHash is the SHA-256 of every input file, the schema included.
	InputsHash string `json:"inputsHash"`
	// Revision is the git commit the design was read from, if any.
	Revision string `json:"revision,omitempty"`
	// Dirty is true when one of the design's input files (its own and
	// those it imports) differs from Revision or is not in it; changes
	// elsewhere in the work tree leave it false.
	Dirty bool `json:"dirty,omitempty"`
	// Units is the design's preferred units: metric or imperial.
	Units string `json:"units,omitempty"`
	// CommitTime is the revision's commit time, Unix seconds, or 0.
	CommitTime int64 `json:"commitTime,omitempty"`
	// The people and the boat named on the pack.
	Length   string `json:"length,omitempty"`
	Client   string `json:"client,omitempty"`
	Yard     string `json:"yard,omitempty"`
	Designer string `json:"designer,omitempty"`
	Checker  string `json:"checker,omitempty"`
	Approver string `json:"approver,omitempty"`
}

// Rulebook names the rulebook used and its edition.
type Rulebook struct {
	Name    string `json:"name"`
	Edition string `json:"edition"`
}

// Summary is an overview of the validated design.
type Summary struct {
	Loads []LoadLine `json:"loads"`
	// Bank is the primary bank (the house bank of a boat with several);
	// Banks are every bank.
	Bank     BankLine      `json:"bank"`
	Banks    []BankLine    `json:"banks"`
	Arrays   []ArrayLine   `json:"arrays"`
	Circuits []CircuitLine `json:"circuits"`
}

// LoadLine is one load as declared.
type LoadLine struct {
	Name     string  `json:"name"`
	Circuit  string  `json:"circuit"`
	Kind     string  `json:"kind"`
	Draw     string  `json:"draw"`
	Duty     float64 `json:"duty"`
	Inverter string  `json:"inverter,omitempty"`
	Quantity int     `json:"quantity"`
	// Bank is the bank that feeds it, on a boat with several.
	Bank string `json:"bank,omitempty"`
}

// BankLine is the bank as declared.
type BankLine struct {
	Battery   string `json:"battery"`
	Chemistry string `json:"chemistry"`
	Series    int    `json:"series"`
	Parallel  int    `json:"parallel"`
	// Name, Role and System are given on a boat with several banks.
	Name   string `json:"name,omitempty"`
	Role   string `json:"role,omitempty"`
	System string `json:"system,omitempty"`
}

// ArrayLine is one array as declared.
type ArrayLine struct {
	Name           string `json:"name"`
	Module         string `json:"module"`
	Series         int    `json:"series"`
	Strings        int    `json:"strings"`
	Controller     string `json:"controller"`
	ControllerKind string `json:"controllerKind"`
}

// CircuitLine is one conductor as declared.
type CircuitLine struct {
	Name       string `json:"name"`
	From       string `json:"from"`
	To         string `json:"to"`
	Length     string `json:"length"`
	Size       string `json:"size"`
	Protection string `json:"protection,omitempty"`
}

// BOM is a design's bill of materials.
type BOM struct {
	Currency string    `json:"currency,omitempty"`
	Lines    []BOMLine `json:"lines"`
	// Total is the sum of the priced lines; Complete is false when some
	// line has no price, and the total then leaves it out.
	Total    float64 `json:"total"`
	Complete bool    `json:"complete"`
	// Slack is the rulebook's cable allowance, a fraction, and its source.
	Slack       float64 `json:"slack"`
	SlackSource string  `json:"slackSource"`
}

// BOMLine is one part, or one cable, and how many are needed.
type BOMLine struct {
	Category    string `json:"category"`
	Part        string `json:"part"`
	Description string `json:"description"`
	// Quantity is in Unit: "each", or a cable's sale unit such as "30 m".
	Quantity float64 `json:"quantity"`
	Unit     string  `json:"unit"`
	// Length is a cable's total length, metres, slack included.
	Length float64 `json:"length,omitempty"`
	// UnitPrice and Total are absent when the catalog gives no price.
	UnitPrice *float64 `json:"unitPrice,omitempty"`
	Total     *float64 `json:"total,omitempty"`
	// For says what the part is for: the runs, arrays or devices.
	For string `json:"for"`
}

// ArrayHarvest is one array's harvest by month.
type ArrayHarvest struct {
	Array      string `json:"array"`
	Controller string `json:"controller"`
	Kind       string `json:"kind"`
	// Alternative names the other controller kind, whose figure is AltWh.
	Alternative string         `json:"alternative"`
	Months      []MonthHarvest `json:"months"`
	// STC is the array's power at STC, W. CellModel names the cell
	// temperature model ("SAM NOCT" or "Sandia" and its coefficient set);
	// NOCT is the module's and NOCTRise what the array's mounting adds to
	// it, °C, for the gap Standoff (m) behind the modules.
	STC       float64 `json:"stc,omitempty"`
	CellModel string  `json:"cellModel,omitempty"`
	NOCT      float64 `json:"noct,omitempty"`
	NOCTRise  float64 `json:"noctRise,omitempty"`
	Standoff  float64 `json:"standoff,omitempty"`
}

// MonthHarvest is an array's mean day in one month.
type MonthHarvest struct {
	Month string `json:"month"`
	// Irradiation is the designer's daily horizontal value and POA the
	// daily value on the array, kWh/m²/day.
	Irradiation float64 `json:"irradiation"`
	POA         float64 `json:"poa"`
	// Wh is delivered into the bank per day; AltWh with the other
	// controller kind; Clipped lost to the controller's output limit.
	Wh      float64 `json:"wh"`
	AltWh   float64 `json:"altWh"`
	Clipped float64 `json:"clipped"`
	// PeakCell is the day's highest cell temperature, °C; Cell its mean
	// weighted by the irradiance on the array and Ambient the ambient it
	// was found at, °C.
	PeakCell float64 `json:"peakCell"`
	Cell     float64 `json:"cell,omitempty"`
	Ambient  float64 `json:"ambient,omitempty"`
	// TempFactor is 1 + γ (Cell − 25 °C) (α for PWM), Wiring the fraction
	// the wiring's drops leave, weighted by energy, and Capped what a PWM
	// controller would take above the array's maximum power, Wh.
	TempFactor float64 `json:"tempFactor,omitempty"`
	Wiring     float64 `json:"wiring,omitempty"`
	Capped     float64 `json:"capped,omitempty"`
}

// Voyage is the state-of-charge run over the design voyage. Its
// top-level figures (embedded BankVoyage) are the primary bank's; Banks
// lists every bank's run and Links what each link passed.
type Voyage struct {
	Start string `json:"start"`
	Hours int    `json:"hours"`
	BankVoyage
	Banks []BankVoyage `json:"banks,omitempty"`
	Links []LinkVoyage `json:"links,omitempty"`
}

// BankVoyage is one bank's run over the design voyage.
type BankVoyage struct {
	// Bank and Role name the bank; Checked is true when voyage.floor
	// checks it (it carries loads, or it is the primary bank).
	Bank    string `json:"bank,omitempty"`
	Role    string `json:"role,omitempty"`
	Checked bool   `json:"checked,omitempty"`
	// Lowest is the lowest state of charge, percent of full, on day
	// LowestDay (from 0) at LowestHour.
	Lowest         float64 `json:"lowest"`
	LowestDay      int     `json:"lowestDay"`
	LowestHour     int     `json:"lowestHour"`
	LowestScenario string  `json:"lowestScenario"`
	LowestMonth    string  `json:"lowestMonth"`
	// Floor is the depth-of-discharge floor, percent of full.
	Floor float64 `json:"floor"`
	// Unmet is the energy the loads asked of the bank below its floor, Wh.
	Unmet float64 `json:"unmet"`
	// RecoverDays is the days from the lowest point until the bank is
	// full again (at Full percent), 0 if it never fell below full, −1 if
	// it was not full again within the voyage.
	RecoverDays float64 `json:"recoverDays"`
	Full        float64 `json:"full"`
	// AbsorptionHours are the hours the bank was offered more charge than
	// it accepted before it was full.
	AbsorptionHours int `json:"absorptionHours"`
	// The energy ledger, Wh at the bank's nominal voltage: what the
	// sources and links offered, what was stored, drawn, not taken and
	// lost to charge efficiency; they balance as
	// endWh − startWh = charged − drawn + unmet and
	// offered = linkOut + direct + charged + chargeLoss + spilled.
	Offered    float64 `json:"offered"`
	Charged    float64 `json:"charged"`
	Drawn      float64 `json:"drawn"`
	Spilled    float64 `json:"spilled"`
	ChargeLoss float64 `json:"chargeLoss"`
	// Direct is what the sources gave the loads while they ran, Peukert
	// the part of Drawn that Peukert's law adds, Loads what the loads drew
	// in all; LinkIn and LinkOut what came in and went out through links.
	Direct  float64 `json:"direct"`
	Peukert float64 `json:"peukert"`
	Loads   float64 `json:"loads"`
	LinkIn  float64 `json:"linkIn"`
	LinkOut float64 `json:"linkOut"`
	StartWh float64 `json:"startWh"`
	EndWh   float64 `json:"endWh"`
	// SoC is the state of charge at the end of each hour, percent.
	SoC []float64 `json:"soc"`
}

// LinkVoyage is what a link between banks passed over the voyage: the
// charge delivered into its output bank (a combiner's either way), Ah,
// and the energy lost in it, Wh (a DC-DC charger's conversion, an
// isolator's forward drop).
type LinkVoyage struct {
	Link string  `json:"link"`
	Kind string  `json:"kind"`
	From string  `json:"from"`
	To   string  `json:"to"`
	Ah   float64 `json:"ah"`
	Loss float64 `json:"loss"`
}

// System is a design's topology: every node the wiring joins, positive
// side and negative, with what it is. The runs are the wiring schedule's
// lines and the loads the summary's.
type System struct {
	Nodes []Node `json:"nodes"`
}

// Node is one node of the wiring.
type Node struct {
	Name string `json:"name"`
	// Kind is bank, bus, panel, switch, fuse-block, terminal-block, load,
	// array, controller, inverter, charger, link, converter, negative-bus
	// or shunt.
	Kind string `json:"kind"`
	// Negative is true for a node of the negative side (a bank's negative
	// post is a bank node there).
	Negative bool `json:"negative,omitempty"`
	// Bank is the bank whose side it is on.
	Bank string `json:"bank,omitempty"`
	// Volts is the nominal voltage of its side.
	Volts float64 `json:"volts,omitempty"`
	// Label says what it is, in a few words: "2S × 2P skua-lfp200",
	// "DC-DC charger 30 A"; Part is the catalog part, if any.
	Label string `json:"label"`
	Part  string `json:"part,omitempty"`
	// Pair is a positive bus's negative bus; From and To a link's banks.
	Pair string `json:"pair,omitempty"`
	From string `json:"from,omitempty"`
	To   string `json:"to,omitempty"`
}

// ScenarioBudget is the energy one period of a scenario draws from the bank.
type ScenarioBudget struct {
	Scenario string  `json:"scenario"`
	Hours    float64 `json:"hours"`
	Wh       float64 `json:"wh"`
	Ah       float64 `json:"ah"`
	WhPerDay float64 `json:"whPerDay"`
	// MeanCurrent is the mean current from the bank, A.
	MeanCurrent float64 `json:"meanCurrent"`
	// Loads are largest first.
	Loads []LoadBudget `json:"loads"`
}

// LoadBudget is one load's share of a scenario's energy.
type LoadBudget struct {
	Name    string  `json:"name"`
	Wh      float64 `json:"wh"`
	Share   float64 `json:"share"` // percent of the scenario's energy
	Formula string  `json:"formula"`
}

// WiringLine is one conductor run of the wiring schedule.
type WiringLine struct {
	Name string `json:"name"`
	// From and To are the run's ends, From nearer the bank.
	From string `json:"from"`
	To   string `json:"to"`
	// Role is supply, charge or pv.
	Role string `json:"role"`
	// Length is the one-way length in metres; LengthText as written.
	Length     float64 `json:"length"`
	LengthText string  `json:"lengthText"`
	Size       string  `json:"size"`
	// Current is the design current, A, and CurrentBasis how it was found:
	// the current the ampacity is checked against. DropCurrent is the
	// current the drop is taken at where it differs: a solar run's strings
	// at maximum power.
	Current      float64 `json:"current"`
	CurrentBasis string  `json:"currentBasis"`
	DropCurrent  float64 `json:"dropCurrent,omitempty"`
	Class        string  `json:"class"`
	// Drop and DropLimit are percent of nominal voltage.
	Drop      float64 `json:"drop"`
	DropLimit float64 `json:"dropLimit"`
	// Ampacity is the derated allowable current, A.
	Ampacity   float64 `json:"ampacity"`
	Protection string  `json:"protection,omitempty"`
	// ReturnSize and ReturnLength (m) describe a return conductor that is
	// not of the run's size and length; ReturnVia names the negative
	// conductor a run's return travels on instead of its own; ReturnTo the
	// negative bus, shunt or bank post its own return lands on.
	ReturnSize   string  `json:"returnSize,omitempty"`
	ReturnLength float64 `json:"returnLength,omitempty"`
	ReturnVia    string  `json:"returnVia,omitempty"`
	ReturnTo     string  `json:"returnTo,omitempty"`
	// Status is the worst of the run's wiring and protection findings.
	Status Status `json:"status"`
}

// Figure is a computed value with what it was computed from.
type Figure struct {
	// ID names the quantity, stable across runs: "bank.nominalEnergy".
	ID FigureID `json:"id"`
	// Subject is the design's own name for what the figure is about.
	Subject string  `json:"subject"`
	Value   float64 `json:"value"`
	Unit    string  `json:"unit"`
	// Formula is the formula in words and symbols, as on a calculation sheet.
	Formula string  `json:"formula"`
	Inputs  []Input `json:"inputs"`
	Source  string  `json:"source"`
}

// Input is one input to a figure, with its value as used.
type Input struct {
	Name  string  `json:"name"`
	Value float64 `json:"value"`
	Unit  string  `json:"unit"`
	// From says where the input came from: a CUE path or a figure ID.
	From string `json:"from,omitempty"`
}

// Finding is one check's verdict on one subject.
type Finding struct {
	ID      CheckID `json:"id"`
	Subject string  `json:"subject"`
	Status  Status  `json:"status"`
	Value   float64 `json:"value"`
	Limit   float64 `json:"limit"`
	Unit    string  `json:"unit"`
	// Margin is how far the value is inside its limit, in Unit; negative
	// when the limit is exceeded.
	Margin  float64 `json:"margin"`
	Message string  `json:"message"`
	Source  string  `json:"source"`
	// Position is the design position of the subject, file:line:col.
	Position string `json:"position,omitempty"`
	// Change says what to change when the finding fails.
	Change string `json:"change,omitempty"`
}

// Problem is an input error: where, what and what was expected.
type Problem struct {
	// Position is file:line:col in the design, or "" when none is known.
	Position string `json:"position"`
	// Path is the CUE path of the offending value.
	Path    string `json:"path"`
	Message string `json:"message"`
	// Related are further positions that contributed, such as the schema's.
	Related []string `json:"related,omitempty"`
}

// Counts tallies findings by status.
type Counts struct {
	Fail int `json:"fail"`
	Warn int `json:"warn"`
	Pass int `json:"pass"`
}

// Count returns the tally of r's findings.
func (r *Result) Count() Counts {
	var c Counts
	for _, f := range r.Checks {
		switch f.Status {
		case Fail:
			c.Fail++
		case Warn:
			c.Warn++
		default:
			c.Pass++
		}
	}
	return c
}

// Verdict is the overall status: fail if any check fails, warn if any
// warns, pass otherwise.
func (r *Result) Verdict() Status {
	c := r.Count()
	switch {
	case c.Fail > 0:
		return Fail
	case c.Warn > 0:
		return Warn
	}
	return Pass
}

// SortChecks orders findings worst first, then by check and subject, so
// that results are stable.
func (r *Result) SortChecks() {
	sort.SliceStable(r.Checks, func(i, j int) bool {
		a, b := r.Checks[i], r.Checks[j]
		if a.Status.Rank() != b.Status.Rank() {
			return a.Status.Rank() < b.Status.Rank()
		}
		if a.ID != b.ID {
			return a.ID < b.ID
		}
		return a.Subject < b.Subject
	})
}

// History is what git says of how a design came to be: the commits that
// touched its input files, newest first, since the tag Since (or the last
// few, without a tag); More is true when there were more than are listed.
// It is shown on a pack's cover and is never part of a result: git's
// answers are attached where they are shown.
type History struct {
	Since   string
	Commits []Commit
	More    bool
}

// Commit is one commit of a History.
type Commit struct {
	Commit  string
	Time    int64 // committer time, Unix seconds
	Author  string
	Subject string
}
