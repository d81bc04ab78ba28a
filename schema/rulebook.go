package schema

import "github.com/ampwright/ampwright/schema/unit"

// Rulebook is every limit, factor and table the checks use, each table with
// its source. Field names follow #Rulebook in cue/rulebook.cue. A nil table
// is one the design's rulebook does not give.
type Rulebook struct {
	Name             string            `json:"name,omitempty"`
	Edition          string            `json:"edition,omitempty"`
	VoltageDrop      *VoltageDropRule  `json:"voltageDrop,omitempty"`
	Resistance       *ResistanceRule   `json:"resistance,omitempty"`
	Ampacity         *AmpacityRule     `json:"ampacity,omitempty"`
	EngineSpace      *EngineSpaceRule  `json:"engineSpace,omitempty"`
	Bundling         *BundlingRule     `json:"bundling,omitempty"`
	Protection       *ProtectionRule   `json:"protection,omitempty"`
	MinimumSize      *MinimumSizeRule  `json:"minimumSize,omitempty"`
	PV               *PVRule           `json:"pv,omitempty"`
	VocFactor        *VocFactorRule    `json:"vocFactor,omitempty"`
	DepthOfDischarge *DepthRule        `json:"depthOfDischarge,omitempty"`
	ChargeRate       *ChargeRateRule   `json:"chargeRate,omitempty"`
	CapacityTemp     *CapacityTempRule `json:"capacityTemperature,omitempty"`
	Charging         *ChargingRule     `json:"charging,omitempty"`
	Sources          *SourcesRule      `json:"sources,omitempty"`
	BOM              *BOMRule          `json:"bom,omitempty"`
	Review           *ReviewRule       `json:"review,omitempty"`
	Surge            *SurgeRule        `json:"surge,omitempty"`
	Inverter         *InverterRule     `json:"inverter,omitempty"`
	Demand           *DemandRule       `json:"demand,omitempty"`
	Shunt            *ShuntRule        `json:"shunt,omitempty"`
	Lithium          *LithiumRule      `json:"lithium,omitempty"`
	Acceptance       *AcceptanceRule   `json:"acceptance,omitempty"`
	CellTemperature  *CellTempRule     `json:"cellTemperature,omitempty"`
}

// Sourced is where a rulebook table comes from.
type Sourced struct {
	Source string `json:"source"`
	Status string `json:"status"`
	Note   string `json:"note,omitempty"`
}

// Caveat returns the warning shown with a value that was not read in a
// published text, or "" for a published one.
func (s Sourced) Caveat() string {
	if s.Status == "published" || s.Status == "" {
		return ""
	}
	return s.Status + "; verify against the edition you work to"
}

// VoltageDropRule holds the voltage-drop limits in percent.
type VoltageDropRule struct {
	Sourced
	Critical      float64  `json:"critical"`
	Other         float64  `json:"other"`
	CriticalKinds []string `json:"criticalKinds"`
	Charging      string   `json:"charging"`
}

// ResistanceRule is how conductor resistance is found.
type ResistanceRule struct {
	Sourced
	Resistivity  float64          `json:"resistivity"` // Ω·mm²/m at 20 °C
	Alpha        float64          `json:"alpha"`       // 1/K at 20 °C
	Temperature  unit.Temperature `json:"temperature"`
	LayFactor    float64          `json:"layFactor"`
	TinnedFactor float64          `json:"tinnedFactor"`
	Metric       MetricResistance `json:"metric"`
}

// MetricResistance is maximum resistance at 20 °C, Ω/km, by size.
type MetricResistance struct {
	Plain  map[string]float64 `json:"plain"`
	Tinned map[string]float64 `json:"tinned"`
}

// AmpacityRule is allowable amperes by size, then insulation rating, both
// written as quantities ("10 AWG", "105 °C").
type AmpacityRule struct {
	Sourced
	Table map[string]map[string]float64 `json:"table"`
}

// EngineSpaceRule is the engine-space ampacity factor by insulation rating.
type EngineSpaceRule struct {
	Sourced
	Factor map[string]float64 `json:"factor"`
}

// BundlingRule is the ampacity factor by bundle count.
type BundlingRule struct {
	Sourced
	Steps      []BundleStep `json:"steps"`
	MinVoltage float64      `json:"minVoltage"`
}

// BundleStep applies Factor from From conductors up.
type BundleStep struct {
	From   int     `json:"from"`
	Factor float64 `json:"factor"`
}

// ProtectionRule holds the overcurrent device rules.
type ProtectionRule struct {
	Sourced
	Ratio          float64     `json:"ratio"`
	Within         unit.Length `json:"within"`
	WithinSheathed unit.Length `json:"withinSheathed"`
	WithinBattery  unit.Length `json:"withinBattery"`
	// StandardRatings are device ratings in amperes, ascending.
	StandardRatings []float64 `json:"standardRatings"`
	// FaultVoltage is the full-charge rest voltage as a multiple of nominal.
	FaultVoltage float64 `json:"faultVoltage"`
}

// MinimumSizeRule is the smallest conductor allowed.
type MinimumSizeRule struct {
	Sourced
	General  unit.Size `json:"general"`
	Sheathed unit.Size `json:"sheathed"`
}

// PVRule holds the factors on module short-circuit current.
type PVRule struct {
	Sourced
	InputFactor     float64 `json:"inputFactor"`
	ConductorFactor float64 `json:"conductorFactor"`
	FuseMin         float64 `json:"fuseMin"`
	FuseMax         float64 `json:"fuseMax"`
}

// VocFactorRule is the low-temperature Voc factor table.
type VocFactorRule struct {
	Sourced
	Rows []VocRow `json:"rows"`
}

// VocRow applies Factor from the temperature From down to the next row.
type VocRow struct {
	From   unit.Temperature `json:"from"`
	Factor float64          `json:"factor"`
}

// DepthRule is the usable depth of discharge by chemistry.
type DepthRule struct {
	Sourced
	Flooded float64 `json:"flooded"`
	AGM     float64 `json:"agm"`
	Gel     float64 `json:"gel"`
	LiFePO4 float64 `json:"lifepo4"`
}

// ChargeRateRule bounds lead-acid charge current as a fraction of capacity.
type ChargeRateRule struct {
	Sourced
	LeadAcidMin float64 `json:"leadAcidMin"`
	LeadAcidMax float64 `json:"leadAcidMax"`
}

// CapacityTempRule is the lead-acid sizing factor by temperature.
type CapacityTempRule struct {
	Sourced
	Rows []VocRow `json:"rows"`
}

// ChargingRule holds the charging voltage where a battery gives none. Its
// efficiencies and taper belong to the first charge model, which
// AcceptanceRule replaced; they are decoded so that old rulebooks load.
type ChargingRule struct {
	Sourced
	LeadAcidEfficiency float64 `json:"leadAcidEfficiency"`
	LiFePO4Efficiency  float64 `json:"lifepo4Efficiency"`
	TaperFrom          float64 `json:"taperFrom"`
	TaperEnd           float64 `json:"taperEnd"`
	ChargeVoltage      float64 `json:"chargeVoltage"`
}

// AcceptanceRule is the charge model of the state-of-charge run: the
// kinetic battery model of each lead-acid chemistry, the ampere-hour
// efficiency of LiFePO4, and the state of charge counted as full.
type AcceptanceRule struct {
	Sourced
	Flooded           Kinetic `json:"flooded"`
	AGM               Kinetic `json:"agm"`
	Gel               Kinetic `json:"gel"`
	LiFePO4Efficiency float64 `json:"lifepo4Efficiency"`
	Full              float64 `json:"full"`
}

// Kinetic holds one chemistry's kinetic battery model (Manwell & McGowan
// 1993): the available well's share of the capacity c, the rate constant
// k (per hour) and the ampere-hour efficiency of charge.
type Kinetic struct {
	CapacityRatio float64 `json:"capacityRatio"`
	RateConstant  float64 `json:"rateConstant"`
	Efficiency    float64 `json:"efficiency"`
}

// For returns the kinetic model of a lead-acid chemistry, and false for
// another.
func (a AcceptanceRule) For(chemistry string) (Kinetic, bool) {
	switch chemistry {
	case "flooded":
		return a.Flooded, true
	case "agm":
		return a.AGM, true
	case "gel":
		return a.Gel, true
	}
	return Kinetic{}, false
}

// CellTempRule is the rise of the installed NOCT by the gap behind the
// modules, and the gap taken for each mount.
type CellTempRule struct {
	Sourced
	// Rise lists the NOCT rise (°C) from each standoff up, largest first.
	Rise     []RiseStep             `json:"rise"`
	Standoff map[string]unit.Length `json:"standoff"`
	Flexible unit.Length            `json:"flexible"`
}

// RiseStep adds Add °C to NOCT from a standoff of From up.
type RiseStep struct {
	From unit.Length `json:"from"`
	Add  float64     `json:"add"`
}

// RiseAt is the NOCT rise, °C, for a standoff of s metres: the first
// step whose From s is at or above, else the last.
func (c CellTempRule) RiseAt(s float64) float64 {
	for _, r := range c.Rise {
		if s >= r.From.Metres()-1e-9 {
			return r.Add
		}
	}
	if len(c.Rise) == 0 {
		return 0
	}
	return c.Rise[len(c.Rise)-1].Add
}

// SourcesRule holds defaults of charge sources.
type SourcesRule struct {
	Sourced
	AlternatorHotFactor float64 `json:"alternatorHotFactor"`
}

// CurvePoint is a point of a time-current curve: at Multiple × its
// rating a device takes at least Seconds to open.
type CurvePoint struct {
	Multiple float64 `json:"multiple"`
	Seconds  float64 `json:"seconds"`
}

// SurgeRule holds the default time-current curves by kind of device.
type SurgeRule struct {
	Sourced
	Fuse    []CurvePoint `json:"fuse"`
	Breaker []CurvePoint `json:"breaker"`
}

// InverterRule holds inverter defaults.
type InverterRule struct {
	Sourced
	Cutoff float64 `json:"cutoff"`
}

// DemandRule is the demand factor of a feeder by the circuits it feeds.
type DemandRule struct {
	Sourced
	Steps []BundleStep `json:"steps"`
}

// ShuntRule says which loads may return around a shunt.
type ShuntRule struct {
	Sourced
	BypassKinds []string `json:"bypassKinds"`
}

// LithiumRule holds LiFePO4 defaults by cell temperature.
type LithiumRule struct {
	Sourced
	Capacity []VocRow `json:"capacity"`
	Charge   []VocRow `json:"charge"`
}

// BOMRule holds bill-of-materials allowances.
type BOMRule struct {
	Sourced
	Slack float64 `json:"slack"`
}

// ReviewRule is when a diff flags a finding whose margin shrank without
// its status changing: the margin lost at least Shrink of what it was
// (a fraction) and is now below Near × the limit.
type ReviewRule struct {
	Sourced
	Shrink float64 `json:"shrink"`
	Near   float64 `json:"near"`
}

// Over returns r with every table that o gives replaced by o's, and o's
// name and edition when it gives them: a yard's rulebook may override the
// default one table at a time.
func (r Rulebook) Over(o *Rulebook) Rulebook {
	if o == nil {
		return r
	}
	if o.Name != "" {
		r.Name = o.Name
	}
	if o.Edition != "" {
		r.Edition = o.Edition
	}
	pick(&r.VoltageDrop, o.VoltageDrop)
	pick(&r.Resistance, o.Resistance)
	pick(&r.Ampacity, o.Ampacity)
	pick(&r.EngineSpace, o.EngineSpace)
	pick(&r.Bundling, o.Bundling)
	pick(&r.Protection, o.Protection)
	pick(&r.MinimumSize, o.MinimumSize)
	pick(&r.PV, o.PV)
	pick(&r.VocFactor, o.VocFactor)
	pick(&r.DepthOfDischarge, o.DepthOfDischarge)
	pick(&r.ChargeRate, o.ChargeRate)
	pick(&r.BOM, o.BOM)
	pick(&r.CapacityTemp, o.CapacityTemp)
	pick(&r.Charging, o.Charging)
	pick(&r.Sources, o.Sources)
	pick(&r.Review, o.Review)
	pick(&r.Surge, o.Surge)
	pick(&r.Inverter, o.Inverter)
	pick(&r.Demand, o.Demand)
	pick(&r.Shunt, o.Shunt)
	pick(&r.Lithium, o.Lithium)
	pick(&r.Acceptance, o.Acceptance)
	pick(&r.CellTemperature, o.CellTemperature)
	return r
}

func pick[T any](dst **T, src *T) {
	if src != nil {
		*dst = src
	}
}
