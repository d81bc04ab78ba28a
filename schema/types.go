package schema

import (
	"encoding/json"
	"fmt"
	"sort"

	"github.com/ampwright/ampwright/schema/unit"
)

// Design is a validated hull design, every quantity in SI units. Field
// names and meanings follow #Design in cue/design.cue.
type Design struct {
	Vessel      Vessel                `json:"vessel"`
	Site        Site                  `json:"site"`
	Scenarios   map[string]Scenario   `json:"scenarios"`
	Loads       map[string]Load       `json:"loads"`
	Inverters   map[string]Inverter   `json:"inverters,omitempty"`
	Voyage      *Voyage               `json:"voyage,omitempty"`
	Autonomy    *Autonomy             `json:"autonomy,omitempty"`
	Bank        *Bank                 `json:"bank,omitempty"`
	Banks       map[string]Bank       `json:"banks,omitempty"`
	Links       map[string]Link       `json:"links,omitempty"`
	Converters  map[string]Converter  `json:"converters,omitempty"`
	Negative    *Negative             `json:"negative,omitempty"`
	Arrays      map[string]Array      `json:"arrays,omitempty"`
	Controllers map[string]Controller `json:"controllers,omitempty"`
	Chargers    map[string]Charger    `json:"chargers,omitempty"`
	Buses       map[string]Bus        `json:"buses,omitempty"`
	Wiring      map[string]Conductor  `json:"wiring"`
	Currency    string                `json:"currency,omitempty"`
	Rules       *Rulebook             `json:"rules,omitempty"`
}

// Vessel is the boat and the people named on its pack.
type Vessel struct {
	Name     string      `json:"name"`
	Hull     string      `json:"hull"`
	Kind     string      `json:"kind"`
	Length   unit.Length `json:"length"`
	Client   string      `json:"client,omitempty"`
	Yard     string      `json:"yard,omitempty"`
	Designer string      `json:"designer,omitempty"`
	Checker  string      `json:"checker,omitempty"`
	Approver string      `json:"approver,omitempty"`
	System   string      `json:"system"`
	Units    string      `json:"units"`
}

// SystemVolts returns the nominal system voltage in volts.
func (v Vessel) SystemVolts() float64 { return Volts(v.System) }

// Volts returns a nominal system voltage ("12 V", "24 V", "48 V") in
// volts, or 0 for anything else.
func Volts(system string) float64 {
	q, err := unit.ParseAs(system, unit.DimVoltage)
	if err != nil {
		return 0 // the schema allows only 12, 24 or 48 V
	}
	return q.Value
}

// Site is the cruising ground and its climate.
type Site struct {
	Name        string                      `json:"name,omitempty"`
	Latitude    float64                     `json:"latitude"`
	Longitude   float64                     `json:"longitude"`
	Months      []string                    `json:"months"`
	Irradiation Irradiation                 `json:"irradiation"`
	DayAmbient  map[string]unit.Temperature `json:"dayAmbient,omitempty"`
	RecordLow   unit.Temperature            `json:"recordLow"`
	DesignHigh  unit.Temperature            `json:"designHigh"`
	EngineSpace unit.Temperature            `json:"engineSpace"`
	Albedo      float64                     `json:"albedo"`
	WindSpeed   float64                     `json:"windSpeed"`
}

// Irradiation is the designer's mean daily horizontal irradiation by month
// and the name of its source.
type Irradiation struct {
	Source  string
	Monthly map[string]unit.Irradiation
}

// UnmarshalJSON decodes the CUE struct {source: ..., Jan: ..., ...}.
func (ir *Irradiation) UnmarshalJSON(b []byte) error {
	var raw map[string]json.RawMessage
	if err := json.Unmarshal(b, &raw); err != nil {
		return err
	}
	ir.Monthly = make(map[string]unit.Irradiation)
	for k, v := range raw {
		if k == "source" {
			if err := json.Unmarshal(v, &ir.Source); err != nil {
				return err
			}
			continue
		}
		var q unit.Irradiation
		if err := json.Unmarshal(v, &q); err != nil {
			return fmt.Errorf("irradiation.%s: %w", k, err)
		}
		ir.Monthly[k] = q
	}
	return nil
}

// MarshalJSON writes the same shape it reads.
func (ir Irradiation) MarshalJSON() ([]byte, error) {
	m := map[string]any{"source": ir.Source}
	for k, v := range ir.Monthly {
		m[k] = v
	}
	return json.Marshal(m)
}

// Scenario is one way of using the boat.
type Scenario struct {
	Description string  `json:"description,omitempty"`
	Hours       float64 `json:"hours"`
	EngineHours float64 `json:"engineHours"`
	ShorePower  bool    `json:"shorePower"`
}

// Window is a time of day, hours from midnight; To below From runs past
// midnight.
type Window struct {
	From float64 `json:"from"`
	To   float64 `json:"to"`
}

// Hours is the length of the window.
func (w Window) Hours() float64 {
	if w.To >= w.From {
		return w.To - w.From
	}
	return 24 - w.From + w.To
}

// Load is one consumer.
type Load struct {
	Circuit string             `json:"circuit,omitempty"`
	Kind    string             `json:"kind"`
	Current *unit.Current      `json:"current,omitempty"`
	Power   *unit.Power        `json:"power,omitempty"`
	Duty    float64            `json:"duty"`
	Hours   map[string]float64 `json:"hours"`
	Class   string             `json:"class,omitempty"`
	Surge   *unit.Current      `json:"surge,omitempty"`
	// SurgePower is an AC load's starting power; SurgeSeconds how long a
	// start lasts.
	SurgePower   *unit.Power `json:"surgePower,omitempty"`
	SurgeSeconds float64     `json:"surgeSeconds"`
	Inverter     string      `json:"inverter,omitempty"`
	Quantity     int         `json:"quantity"`
	Windows      []Window    `json:"windows,omitempty"`
}

// Inverter feeds AC loads.
type Inverter struct {
	Part     InverterPart       `json:"part"`
	Circuit  string             `json:"circuit"`
	Hours    map[string]float64 `json:"hours,omitempty"`
	Charging *InverterCharging  `json:"charging,omitempty"`
}

// InverterCharging is how an inverter-charger charges on shore power.
type InverterCharging struct {
	Hours map[string]float64 `json:"hours,omitempty"`
}

// Voyage is the design voyage.
type Voyage struct {
	Start string `json:"start"`
	Legs  []Leg  `json:"legs"`
}

// Leg is one leg of the design voyage.
type Leg struct {
	Scenario string  `json:"scenario"`
	Days     float64 `json:"days"`
}

// Autonomy is the days the bank alone must carry a scenario.
type Autonomy struct {
	Days     float64 `json:"days"`
	Scenario string  `json:"scenario"`
}

// Bank is the house battery bank.
type Bank struct {
	Battery          Battery          `json:"battery"`
	Series           int              `json:"series"`
	Parallel         int              `json:"parallel"`
	Location         string           `json:"location"`
	Temperature      unit.Temperature `json:"temperature"`
	EndOfLife        float64          `json:"endOfLife"`
	DepthOfDischarge *float64         `json:"depthOfDischarge,omitempty"`
	Role             string           `json:"role"`
	System           string           `json:"system,omitempty"`
}

// Array is one solar array.
type Array struct {
	Module         Module      `json:"module"`
	Series         int         `json:"series"`
	Strings        int         `json:"strings"`
	Controller     string      `json:"controller"`
	Mount          string      `json:"mount"`
	Tilt           float64     `json:"tilt"`
	Azimuth        float64     `json:"azimuth"`
	SwingsAtAnchor bool        `json:"swingsAtAnchor"`
	StringFuse     *Protection `json:"stringFuse,omitempty"`
	Shading        float64     `json:"shading"`
	Soiling        float64     `json:"soiling"`
	Mismatch       float64     `json:"mismatch"`

	// Standoff is the gap behind the modules; nil takes the rulebook's
	// for the mount.
	Standoff *unit.Length `json:"standoff,omitempty"`
	// Place is the mounting place the array sits on, where the design
	// names one.
	Place *Place `json:"place,omitempty"`
}

// Place is a mounting place for modules and what it takes.
type Place struct {
	Name       string       `json:"name,omitempty"`
	MaxModules int          `json:"maxModules,omitempty"`
	Length     *unit.Length `json:"length,omitempty"`
	Width      *unit.Length `json:"width,omitempty"`
}

// Controller is a charge controller fitted to the boat.
type Controller struct {
	Part ControllerPart `json:"part"`
}

// Charger is a charge source other than solar.
type Charger struct {
	Kind        string             `json:"kind"`
	Part        *ChargerPart       `json:"part,omitempty"`
	Output      *unit.Current      `json:"output,omitempty"`
	Hours       map[string]float64 `json:"hours,omitempty"`
	Windows     []Window           `json:"windows,omitempty"`
	Description string             `json:"description,omitempty"`
}

// Link joins two banks. A design may leave its part open (Part.Kind is
// then ""), for `ampwright propose` to choose one of Kind, if given.
type Link struct {
	Part LinkPart `json:"part"`
	Kind string   `json:"kind,omitempty"`
	From string   `json:"from"`
	To   string   `json:"to"`
}

// Open reports whether the design leaves the link's part to be chosen.
func (l Link) Open() bool { return l.Part.Kind == "" }

// Converter feeds loads at another voltage.
type Converter struct {
	Part ConverterPart `json:"part"`
}

// Negative is the return side of the wiring.
type Negative struct {
	Buses  map[string]NegativeBus `json:"buses,omitempty"`
	Shunts map[string]Shunt       `json:"shunts,omitempty"`
	Wiring map[string]Conductor   `json:"wiring,omitempty"`
}

// NegativeBus is a negative busbar.
type NegativeBus struct {
	Part *Busbar `json:"part,omitempty"`
}

// Shunt is a battery monitor's shunt.
type Shunt struct {
	Part ShuntPart `json:"part"`
}

// ChargeHours is how long the charger runs in one period of scenario s:
// its hours, else an alternator's the engine's, a shore charger's the
// whole period on shore power.
func (c Charger) ChargeHours(s string, sc Scenario) float64 {
	if h, ok := c.Hours[s]; ok {
		return h
	}
	switch {
	case c.Kind == "alternator":
		return sc.EngineHours
	case c.Kind == "shore" && sc.ShorePower:
		return sc.Hours
	}
	return 0
}

// Bus is a junction in the wiring.
type Bus struct {
	Kind     string  `json:"kind"`
	Part     *Busbar `json:"part,omitempty"`
	Negative string  `json:"negative,omitempty"`
}

// Conductor is a DC run, positive and return.
type Conductor struct {
	From        string           `json:"from"`
	To          string           `json:"to"`
	Length      unit.Length      `json:"length"`
	Size        unit.Size        `json:"size"`
	Material    string           `json:"material"`
	Insulation  unit.Temperature `json:"insulation"`
	EngineSpace bool             `json:"engineSpace"`
	Bundle      int              `json:"bundle"`
	Class       string           `json:"class,omitempty"`
	Colour      string           `json:"colour,omitempty"`
	Sheathed    bool             `json:"sheathed"`
	Cable       *Cable           `json:"cable,omitempty"`
	Protection  *Protection      `json:"protection,omitempty"`
	Return      *Return          `json:"return,omitempty"`
}

// Return is a run's return conductor where it differs from the run.
type Return struct {
	Size   *unit.Size   `json:"size,omitempty"`
	Length *unit.Length `json:"length,omitempty"`
	To     string       `json:"to,omitempty"`
}

// Part is what every catalog part has.
type Part struct {
	ID          string   `json:"id"`
	Maker       string   `json:"maker,omitempty"`
	Model       string   `json:"model,omitempty"`
	Description string   `json:"description,omitempty"`
	Price       *float64 `json:"price,omitempty"`
}

// Battery is one battery of a bank.
type Battery struct {
	Part
	Chemistry        string            `json:"chemistry"`
	Voltage          unit.Voltage      `json:"voltage"`
	Capacity         unit.Charge       `json:"capacity"`
	RatedHours       float64           `json:"ratedHours"`
	Peukert          *float64          `json:"peukert,omitempty"`
	MaxCharge        *unit.Current     `json:"maxCharge,omitempty"`
	Resistance       unit.Resistance   `json:"resistance"`
	DepthOfDischarge *float64          `json:"depthOfDischarge,omitempty"`
	ChargeLowLimit   *unit.Temperature `json:"chargeLowLimit,omitempty"`
	Absorption       *unit.Voltage     `json:"absorption,omitempty"`
	Float            *unit.Voltage     `json:"float,omitempty"`
	MaxDischarge     *unit.Current     `json:"maxDischarge,omitempty"`
	PeakDischarge    *unit.Current     `json:"peakDischarge,omitempty"`
	PeakSeconds      float64           `json:"peakSeconds"`
	// CapacityByTemperature and ChargeByTemperature are the maker's
	// fractions of capacity and of maxCharge by cell temperature.
	CapacityByTemperature []VocRow `json:"capacityByTemperature,omitempty"`
	ChargeByTemperature   []VocRow `json:"chargeByTemperature,omitempty"`
}

// LeadAcid reports whether the battery is a lead-acid chemistry.
func (b Battery) LeadAcid() bool { return b.Chemistry != "lifepo4" }

// Module is a PV module at STC.
type Module struct {
	Part
	Pmax          unit.Power        `json:"pmax"`
	Vmp           unit.Voltage      `json:"vmp"`
	Imp           unit.Current      `json:"imp"`
	Voc           unit.Voltage      `json:"voc"`
	Isc           unit.Current      `json:"isc"`
	GammaPmax     unit.TempCoeff    `json:"gammaPmax"`
	BetaVoc       *unit.TempCoeff   `json:"betaVoc,omitempty"`
	AlphaIsc      *unit.TempCoeff   `json:"alphaIsc,omitempty"`
	NOCT          *unit.Temperature `json:"noct,omitempty"`
	Construction  string            `json:"construction"`
	Cells         string            `json:"cells,omitempty"`
	LengthDim     unit.Length       `json:"lengthDim"`
	WidthDim      unit.Length       `json:"widthDim"`
	MaxSeriesFuse unit.Current      `json:"maxSeriesFuse"`
	MaxSystem     *unit.Voltage     `json:"maxSystem,omitempty"`
}

// ControllerPart is a charge controller model.
type ControllerPart struct {
	Part
	Kind         string        `json:"kind"`
	MaxPVVoltage unit.Voltage  `json:"maxPVVoltage"`
	MaxPVCurrent *unit.Current `json:"maxPVCurrent,omitempty"`
	Output       unit.Current  `json:"output"`
	Efficiency   float64       `json:"efficiency"`
	Headroom     unit.Voltage  `json:"headroom"`
	Systems      []string      `json:"systems,omitempty"`
}

// InverterPart is an inverter model.
type InverterPart struct {
	Part
	Continuous unit.Power  `json:"continuous"`
	Surge      *unit.Power `json:"surge,omitempty"`
	Efficiency float64     `json:"efficiency"`
	Idle       unit.Power  `json:"idle"`
	Systems    []string    `json:"systems,omitempty"`
	// Cutoff is the low-voltage cut-off.
	Cutoff *unit.Voltage `json:"cutoff,omitempty"`
	// Charger and PassThrough describe an inverter-charger.
	Charger     *unit.Current `json:"charger,omitempty"`
	PassThrough *unit.Current `json:"passThrough,omitempty"`
}

// ChargerPart is an alternator or a charger.
type ChargerPart struct {
	Part
	Kind           string        `json:"kind"`
	Output         unit.Current  `json:"output"`
	HotFactor      *float64      `json:"hotFactor,omitempty"`
	Regulator      *unit.Voltage `json:"regulator,omitempty"`
	CurrentLimited bool          `json:"currentLimited"`
	Absorption     *unit.Voltage `json:"absorption,omitempty"`
	Float          *unit.Voltage `json:"float,omitempty"`
	Efficiency     float64       `json:"efficiency"`
	Systems        []string      `json:"systems,omitempty"`
}

// LinkPart is a combiner, isolator or DC-DC charger.
type LinkPart struct {
	Part
	Kind           string        `json:"kind"`
	Rating         unit.Current  `json:"rating"`
	Voltage        *unit.Voltage `json:"voltage,omitempty"`
	CloseAt        *unit.Voltage `json:"closeAt,omitempty"`
	OpenAt         *unit.Voltage `json:"openAt,omitempty"`
	Drop           *unit.Voltage `json:"drop,omitempty"`
	Efficiency     float64       `json:"efficiency"`
	CurrentLimited bool          `json:"currentLimited"`
	Inputs         []string      `json:"inputs,omitempty"`
	Outputs        []string      `json:"outputs,omitempty"`
	Absorption     *unit.Voltage `json:"absorption,omitempty"`
}

// ConverterPart is a DC-DC converter feeding loads.
type ConverterPart struct {
	Part
	Inputs     []string     `json:"inputs,omitempty"`
	Output     string       `json:"output"`
	Rating     unit.Current `json:"rating"`
	Efficiency float64      `json:"efficiency"`
	Idle       unit.Power   `json:"idle"`
	Isolated   bool         `json:"isolated"`
}

// ShuntPart is a battery monitor's shunt.
type ShuntPart struct {
	Part
	Rating  unit.Current  `json:"rating"`
	Output  *unit.Voltage `json:"output,omitempty"`
	Voltage *unit.Voltage `json:"voltage,omitempty"`
}

// Protection is a fuse or breaker and how it is fitted.
type Protection struct {
	Part
	Kind         string        `json:"kind"`
	Style        string        `json:"style,omitempty"`
	Rating       unit.Current  `json:"rating"`
	Interrupting unit.Current  `json:"interrupting"`
	Voltage      *unit.Voltage `json:"voltage,omitempty"`
	Holder       *Part         `json:"holder,omitempty"`
	Distance     *unit.Length  `json:"distance,omitempty"`
	Sheathed     bool          `json:"sheathed"`
	// Curve is the maker's time-current curve, if given.
	Curve []CurvePoint `json:"curve,omitempty"`
}

// Cable is a cable family cut to length.
type Cable struct {
	Part
	Size       unit.Size        `json:"size"`
	Insulation unit.Temperature `json:"insulation"`
	Material   string           `json:"material"`
	Colour     string           `json:"colour,omitempty"`
	SaleUnit   unit.Length      `json:"saleUnit"`
	Terminal   *Terminal        `json:"terminal,omitempty"`
	// ReturnCable is the same size in the return colour.
	ReturnCable *Cable `json:"returnCable,omitempty"`
}

// Terminal is a crimp terminal for one conductor size.
type Terminal struct {
	Part
	Size unit.Size `json:"size"`
	Stud string    `json:"stud,omitempty"`
	Per  int       `json:"per"`
}

// Busbar is a busbar, terminal block or fuse block.
type Busbar struct {
	Part
	Kind    string        `json:"kind,omitempty"`
	Rating  *unit.Current `json:"rating,omitempty"`
	Studs   int           `json:"studs,omitempty"`
	Ways    int           `json:"ways,omitempty"`
	Voltage *unit.Voltage `json:"voltage,omitempty"`
}

// Names returns the keys of a map of named things, sorted, so that every
// walk over a design is in a stable order.
func Names[V any](m map[string]V) []string {
	out := make([]string, 0, len(m))
	for k := range m {
		out = append(out, k)
	}
	sort.Strings(out)
	return out
}
