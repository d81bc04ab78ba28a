package result

import "strings"

// CheckID names a check, stable across runs: "wiring.voltageDrop". Every
// check's ID is a constant here; package checks holds each one's title and
// doc, which `ampwright explain` prints.
type CheckID string

// FigureID names a computed quantity, stable across runs:
// "bank.nominalEnergy". Every figure's ID is a constant here; package
// checks holds each one's title and doc.
type FigureID string

// Area is the part of the ID before its first dot: "wiring".
func (id CheckID) Area() string { return area(string(id)) }

// Area is the part of the ID before its first dot: "bank".
func (id FigureID) Area() string { return area(string(id)) }

func area(id string) string {
	a, _, _ := strings.Cut(id, ".")
	return a
}

// The checks.
const (
	CheckBankVoltage     CheckID = "bank.voltage"
	CheckEquipmentSystem CheckID = "equipment.system"
	CheckResistance      CheckID = "wiring.resistance"
	CheckVoltageDrop     CheckID = "wiring.voltageDrop"
	CheckAmpacity        CheckID = "wiring.ampacity"
	CheckMinimumSize     CheckID = "wiring.minimumSize"
	CheckProtected       CheckID = "protection.present"
	CheckRating          CheckID = "protection.rating"
	CheckDistance        CheckID = "protection.distance"
	CheckInterrupting    CheckID = "protection.interrupting"
	CheckStringFuse      CheckID = "pv.stringFuse"
	CheckEnergyBudget    CheckID = "energy.budget"
	CheckAutonomy        CheckID = "bank.autonomy"
	CheckChargeRate      CheckID = "bank.chargeRate"
	CheckColdCharge      CheckID = "bank.coldCharge"
	CheckEnergyHarvest   CheckID = "energy.harvest"
	CheckColdVoc         CheckID = "pv.coldVoc"
	CheckHotVmp          CheckID = "pv.hotVmp"
	CheckInputCurrent    CheckID = "pv.inputCurrent"
	CheckVoyageFloor     CheckID = "voyage.floor"
	CheckSystemFigures   CheckID = "system.figures"
	CheckInverterLoad    CheckID = "inverter.continuous"
	CheckInverterSurge   CheckID = "inverter.surge"
	CheckInverterDC      CheckID = "inverter.dcCurrent"
	CheckProtectionSurge CheckID = "protection.surge"
	CheckVoltageRating   CheckID = "equipment.voltage"
	CheckBusCurrent      CheckID = "bus.current"
	CheckBusWays         CheckID = "bus.ways"
	CheckBankDischarge   CheckID = "bank.discharge"
	CheckBankPeak        CheckID = "bank.peak"
	CheckTotalDrop       CheckID = "wiring.totalDrop"
	CheckShunt           CheckID = "return.shunt"
	CheckChargePath      CheckID = "source.limited"
	CheckLinkCurrent     CheckID = "link.current"
)

// The figures.
const (
	FigBankNominalVoltage FigureID = "bank.nominalVoltage"
	FigBankCapacity       FigureID = "bank.capacity"
	FigBankNominalEnergy  FigureID = "bank.nominalEnergy"
	FigBankUsableEnergy   FigureID = "bank.usableEnergy"
	FigBankAutonomy       FigureID = "bank.autonomy"
	FigArraySTCPower      FigureID = "array.stcPower"
	FigArrayEfficiency    FigureID = "array.efficiency"
	FigEnergyScenario     FigureID = "energy.scenario"
	FigEnergyHarvest      FigureID = "energy.harvest"
	FigSolarFraction      FigureID = "energy.solarFraction"
	FigVoyageLowestSoC    FigureID = "voyage.lowestSoC"
	FigColdVoc            FigureID = "pv.coldVoc"
	FigVoltageDrop        FigureID = "wiring.voltageDrop"
	FigResistance         FigureID = "wiring.resistance"
	FigAmpacity           FigureID = "wiring.ampacity"
	FigFaultCurrent       FigureID = "protection.faultCurrent"
	FigConverterInput     FigureID = "converter.inputCurrent"
	FigLinkCurrent        FigureID = "link.current"
	FigReturnCurrent      FigureID = "return.current"
	FigShuntCurrent       FigureID = "return.shuntCurrent"
	FigSourceOutput       FigureID = "source.output"
	FigInverterDemand     FigureID = "inverter.demand"
	FigInverterPeak       FigureID = "inverter.peak"
	FigInverterDCCurrent  FigureID = "inverter.dcCurrent"
	FigSurgeCurrent       FigureID = "protection.surgeCurrent"
	FigMaxVoltage         FigureID = "equipment.maxVoltage"
	FigBusCurrent         FigureID = "bus.current"
	FigBankDischarge      FigureID = "bank.dischargeCurrent"
	FigBankPeak           FigureID = "bank.peakCurrent"
	FigTotalDrop          FigureID = "wiring.totalDrop"
)
