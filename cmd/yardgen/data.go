package main

// The invented boats, people, places and loads the generated hulls are
// made of. Every name is invented.

// tmpl is a kind of load a boat may have, with the ranges its figures are
// drawn from.
type tmpl struct {
	name, kind string
	panel      string // "nav", "dc", "bilge", "bank" (off the bank) or "ac" (through the inverter)
	share      string // loads of one panel with the same key share a circuit
	amps       [2]float64
	watts      [2]float64
	qty        [2]int
	duty       [2]float64
	hours      [3]float64 // anchor, under way, third scenario; -1: the engine's hours
	surge      float64    // starting current as a multiple of the running one
	reach      [2]float64 // run length from the panel, as a fraction of the boat's length
	need       string     // "", "sail", "motor", "big", "windlass", "cold", "inverter"
	must       bool
	note       string
}

var templates = []tmpl{
	// Navigation panel.
	{name: "tricolour", kind: "navigation-lights", panel: "nav", share: "masthead", watts: [2]float64{2, 3}, hours: [3]float64{0, 9, 0}, reach: [2]float64{1.3, 1.6}, need: "sail", must: true, note: "at the masthead, for sailing at night"},
	{name: "nav-lights", kind: "navigation-lights", panel: "nav", watts: [2]float64{2, 2}, qty: [2]int{2, 4}, hours: [3]float64{0, 3, 0}, reach: [2]float64{0.6, 1.0}, must: true},
	{name: "steaming-light", kind: "navigation-lights", panel: "nav", share: "mast-lights", watts: [2]float64{2, 2}, hours: [3]float64{0, 2, 0}, reach: [2]float64{0.8, 1.0}, need: "sail"},
	{name: "deck-light", kind: "lighting", panel: "nav", share: "mast-lights", watts: [2]float64{10, 20}, hours: [3]float64{0.3, 0.1, 0.2}, reach: [2]float64{0.8, 1.0}, need: "sail"},
	{name: "anchor-light", kind: "navigation-lights", panel: "nav", share: "masthead", watts: [2]float64{2, 2}, hours: [3]float64{10, 0, 9}, reach: [2]float64{1.3, 1.6}, must: true},
	{name: "vhf", kind: "communications", panel: "nav", share: "comms", amps: [2]float64{5, 6}, duty: [2]float64{0.1, 0.15}, hours: [3]float64{2, 24, 8}, reach: [2]float64{0.2, 0.4}, must: true, note: "on transmit, a fraction of the time"},
	{name: "ais", kind: "communications", panel: "nav", share: "comms", watts: [2]float64{3, 5}, hours: [3]float64{2, 24, 8}, reach: [2]float64{0.2, 0.4}},
	{name: "plotter", kind: "electronics", panel: "nav", share: "helm", watts: [2]float64{15, 30}, hours: [3]float64{0.5, 24, 6}, reach: [2]float64{0.3, 0.6}, must: true},
	{name: "radar", kind: "electronics", panel: "nav", share: "helm", watts: [2]float64{30, 45}, hours: [3]float64{0, 8, 1}, reach: [2]float64{0.7, 1.0}, need: "big"},
	{name: "instruments", kind: "electronics", panel: "nav", share: "instruments", watts: [2]float64{4, 10}, hours: [3]float64{1, 24, 7}, reach: [2]float64{0.3, 0.6}, must: true, note: "depth, speed and wind displays"},
	{name: "wind-alarm", kind: "electronics", panel: "nav", share: "instruments", watts: [2]float64{1, 2}, hours: [3]float64{12, 24, 8}, reach: [2]float64{0.3, 0.6}},
	{name: "autopilot", kind: "autopilot", panel: "nav", amps: [2]float64{4, 10}, duty: [2]float64{0.25, 0.35}, hours: [3]float64{0, 18, 4}, reach: [2]float64{0.6, 0.9}, must: true},
	{name: "horn", kind: "general", panel: "nav", amps: [2]float64{6, 10}, hours: [3]float64{0, 0.02, 0.01}, reach: [2]float64{0.3, 0.6}},
	{name: "satcom", kind: "communications", panel: "nav", share: "data", watts: [2]float64{10, 20}, hours: [3]float64{2, 12, 2}, reach: [2]float64{0.4, 0.8}, need: "big"},
	{name: "wifi-router", kind: "electronics", panel: "nav", share: "data", watts: [2]float64{5, 8}, hours: [3]float64{6, 2, 4}, reach: [2]float64{0.3, 0.5}},
	{name: "searchlight", kind: "lighting", panel: "nav", amps: [2]float64{8, 10}, hours: [3]float64{0, 0.1, 0.05}, reach: [2]float64{0.3, 0.5}, need: "motor"},

	// Domestic panel.
	{name: "fridge", kind: "refrigeration", panel: "dc", share: "refrigeration", amps: [2]float64{2.5, 4.5}, duty: [2]float64{0.3, 0.45}, hours: [3]float64{24, 24, 24}, reach: [2]float64{0.3, 0.6}, must: true},
	{name: "freezer", kind: "refrigeration", panel: "dc", share: "refrigeration", amps: [2]float64{2.5, 4}, duty: [2]float64{0.4, 0.5}, hours: [3]float64{24, 24, 24}, reach: [2]float64{0.3, 0.6}, need: "big"},
	{name: "lights-saloon", kind: "lighting", panel: "dc", share: "lights-main", watts: [2]float64{3, 4}, qty: [2]int{4, 8}, hours: [3]float64{4, 2, 4}, reach: [2]float64{0.3, 0.6}, must: true},
	{name: "lights-galley", kind: "lighting", panel: "dc", share: "lights-main", watts: [2]float64{3, 3}, qty: [2]int{2, 4}, hours: [3]float64{2, 1, 2}, reach: [2]float64{0.3, 0.6}},
	{name: "lights-fwd-cabin", kind: "lighting", panel: "dc", share: "lights-fwd", watts: [2]float64{3, 3}, qty: [2]int{2, 4}, hours: [3]float64{2, 1, 2}, reach: [2]float64{0.4, 0.7}, must: true},
	{name: "lights-heads", kind: "lighting", panel: "dc", share: "lights-fwd", watts: [2]float64{2, 3}, qty: [2]int{1, 2}, hours: [3]float64{1, 0.5, 1}, reach: [2]float64{0.4, 0.7}},
	{name: "lights-aft-cabin", kind: "lighting", panel: "dc", share: "lights-aft", watts: [2]float64{3, 3}, qty: [2]int{2, 4}, hours: [3]float64{2, 1, 2}, reach: [2]float64{0.3, 0.6}},
	{name: "reading-lights", kind: "lighting", panel: "dc", share: "lights-aft", watts: [2]float64{2, 2}, qty: [2]int{2, 6}, hours: [3]float64{2, 1, 1}, reach: [2]float64{0.3, 0.6}},
	{name: "cockpit-lights", kind: "lighting", panel: "dc", share: "lights-cockpit", watts: [2]float64{3, 3}, qty: [2]int{2, 4}, hours: [3]float64{2, 0.5, 2}, reach: [2]float64{0.4, 0.7}},
	{name: "courtesy-lights", kind: "lighting", panel: "dc", share: "lights-cockpit", watts: [2]float64{1, 1}, qty: [2]int{4, 8}, hours: [3]float64{3, 1, 3}, reach: [2]float64{0.4, 0.7}},
	{name: "water-pump", kind: "water-pump", panel: "dc", share: "pumps", amps: [2]float64{4, 7}, hours: [3]float64{0.4, 0.2, 0.3}, reach: [2]float64{0.3, 0.6}, must: true},
	{name: "shower-sump", kind: "water-pump", panel: "dc", share: "pumps", amps: [2]float64{3, 4}, hours: [3]float64{0.1, 0.05, 0.1}, reach: [2]float64{0.3, 0.6}},
	{name: "deck-wash", kind: "water-pump", panel: "dc", share: "pumps", amps: [2]float64{5, 8}, hours: [3]float64{0.1, 0, 0.05}, reach: [2]float64{0.5, 0.8}},
	{name: "macerator", kind: "general", panel: "dc", amps: [2]float64{10, 15}, hours: [3]float64{0.05, 0.05, 0.03}, reach: [2]float64{0.4, 0.7}, need: "big", note: "holding-tank macerator in the heads"},
	{name: "usb-saloon", kind: "charging", panel: "dc", share: "usb", watts: [2]float64{20, 30}, hours: [3]float64{3, 2, 2}, reach: [2]float64{0.3, 0.5}, must: true, note: "phones, tablets and a handheld VHF"},
	{name: "usb-cabins", kind: "charging", panel: "dc", share: "usb", watts: [2]float64{10, 15}, hours: [3]float64{2, 1, 1}, reach: [2]float64{0.3, 0.5}},
	{name: "fans", kind: "fan", panel: "dc", share: "comfort", watts: [2]float64{4, 6}, qty: [2]int{2, 4}, hours: [3]float64{8, 4, 6}, reach: [2]float64{0.3, 0.7}},
	{name: "heater", kind: "heater", panel: "dc", share: "comfort", amps: [2]float64{1.5, 3}, duty: [2]float64{0.5, 0.7}, hours: [3]float64{4, 0, 2}, reach: [2]float64{0.4, 0.7}, need: "cold", note: "diesel air heater: fan and pump"},
	{name: "gas-solenoid", kind: "galley", panel: "dc", share: "galley", amps: [2]float64{0.8, 1.2}, hours: [3]float64{1.5, 1, 1}, reach: [2]float64{0.3, 0.5}},
	{name: "cooker-hood", kind: "fan", panel: "dc", share: "galley", amps: [2]float64{2, 3}, hours: [3]float64{0.5, 0.2, 0.3}, reach: [2]float64{0.3, 0.5}},
	{name: "stereo", kind: "entertainment", panel: "dc", share: "entertainment", watts: [2]float64{15, 30}, hours: [3]float64{2, 1, 2}, reach: [2]float64{0.3, 0.5}},
	{name: "tv", kind: "entertainment", panel: "dc", share: "entertainment", watts: [2]float64{30, 50}, hours: [3]float64{1.5, 0, 1}, reach: [2]float64{0.3, 0.5}},
	{name: "watermaker", kind: "general", panel: "dc", amps: [2]float64{8, 12}, hours: [3]float64{1.5, 1, 0}, reach: [2]float64{0.4, 0.7}, need: "big", note: "DC reverse-osmosis unit"},
	{name: "laptop", kind: "charging", panel: "ac", watts: [2]float64{65, 90}, hours: [3]float64{2, 1.5, 1.5}, reach: [2]float64{0.3, 0.5}},
	{name: "microwave", kind: "galley", panel: "ac", watts: [2]float64{600, 750}, hours: [3]float64{0.1, 0.05, 0.1}, need: "inverter"},
	{name: "coffee-maker", kind: "galley", panel: "ac", watts: [2]float64{450, 650}, hours: [3]float64{0.1, 0.05, 0.1}, need: "inverter"},

	// Bilge panel (the domestic panel on a small boat).
	{name: "bilge-fwd", kind: "bilge-pump", panel: "bilge", share: "bilge-fwd", amps: [2]float64{3, 4}, hours: [3]float64{0.1, 0.2, 0.1}, reach: [2]float64{0.3, 0.6}, must: true},
	{name: "bilge-alarm", kind: "electronics", panel: "bilge", share: "bilge-fwd", watts: [2]float64{1, 1}, hours: [3]float64{24, 24, 24}, reach: [2]float64{0.3, 0.6}},
	{name: "bilge-aft", kind: "bilge-pump", panel: "bilge", amps: [2]float64{3, 4}, hours: [3]float64{0.1, 0.2, 0.1}, reach: [2]float64{0.4, 0.8}, must: true},
	{name: "blower", kind: "bilge-blower", panel: "bilge", amps: [2]float64{3, 5}, hours: [3]float64{-1, -1, -1}, reach: [2]float64{0.4, 0.6}, need: "motor", note: "engine-room extraction, run with the engines"},

	// Off the bank.
	{name: "windlass", kind: "windlass", panel: "bank", amps: [2]float64{60, 90}, surge: 2.4, hours: [3]float64{0.1, 0, 0.05}, reach: [2]float64{0.6, 0.9}, need: "windlass", must: true},
}

// extraLights fills a boat up to its number of loads.
var extraLights = tmpl{kind: "lighting", panel: "dc", share: "lights-main", watts: [2]float64{2, 3}, qty: [2]int{2, 4}, hours: [3]float64{1, 0.5, 1}, reach: [2]float64{0.3, 0.6}}

// site is a cruising ground, its season and its climate (invented demo
// figures, of the right order for the latitude).
type site struct {
	name              string
	lat, lon          float64
	months            []string
	irr               []float64 // kWh/m²/day, by month in use
	recordLow, design float64   // °C
}

var sites = []site{
	{"Western Channel and South Brittany", 50.2, -4.9, []string{"May", "Jun", "Jul", "Aug", "Sep"}, []float64{5.4, 5.9, 5.8, 4.9, 3.6}, 0, 28},
	{"Solent and the Channel Islands", 50.7, -1.5, []string{"Apr", "May", "Jun", "Jul", "Aug", "Sep"}, []float64{4.1, 5.2, 5.6, 5.5, 4.6, 3.3}, -2, 29},
	{"Scottish west coast", 56.4, -5.5, []string{"Apr", "May", "Jun", "Jul", "Aug", "Sep"}, []float64{3.6, 4.6, 4.9, 4.6, 3.7, 2.6}, -3, 26},
	{"Baltic: Stockholm archipelago", 59.3, 18.6, []string{"May", "Jun", "Jul", "Aug"}, []float64{5.0, 5.8, 5.5, 4.3}, -2, 28},
	{"Canary Islands, winter season", 28.1, -15.4, []string{"Nov", "Dec", "Jan", "Feb", "Mar", "Apr"}, []float64{3.9, 3.3, 3.6, 4.4, 5.5, 6.2}, 9, 30},
	{"Balearics", 39.5, 2.6, []string{"May", "Jun", "Jul", "Aug", "Sep", "Oct"}, []float64{6.2, 7.0, 7.2, 6.2, 4.8, 3.3}, 8, 33},
	{"Leeward Islands, winter", 17.1, -61.8, []string{"Dec", "Jan", "Feb", "Mar", "Apr", "May"}, []float64{4.9, 5.2, 5.8, 6.3, 6.5, 6.3}, 19, 32},
	{"Brittany and Biscay", 47.5, -3.0, []string{"May", "Jun", "Jul", "Aug", "Sep"}, []float64{5.6, 6.1, 6.2, 5.3, 4.1}, 2, 30},
}

type boatKind struct {
	kind, model string
	sail        bool
	lo, hi      float64 // length overall, m
}

var kinds = []boatKind{
	{"sloop", "KQ", true, 7.5, 12},
	{"sloop", "KQ", true, 8.5, 13},
	{"cutter", "KQ Cutter", true, 9, 14},
	{"ketch", "KQ Ketch", true, 11, 16},
	{"yawl", "KQ Yawl", true, 9, 13},
	{"catamaran", "KQ Cat", true, 10, 15},
	{"motor-cruiser", "KQ Flybridge", false, 8, 14},
	{"trawler", "KQ Trawler", false, 10, 16},
	{"workboat", "KQ Workboat", false, 8, 13},
}

var (
	nameFirst = []string{"Silver", "Northern", "Quiet", "Little", "Bright", "Grey", "Wild", "Morning",
		"Evening", "Salt", "Amber", "Westerly", "Blue", "Drifting", "Tidal", "Lucky", "Gentle", "Far", "Red", "Old"}
	nameSecond = []string{"Petrel", "Shearwater", "Tern", "Guillemot", "Curlew", "Redshank", "Plover", "Heron",
		"Kestrel", "Merlin", "Dipper", "Wren", "Linnet", "Skylark", "Sanderling", "Whimbrel", "Godwit", "Avocet",
		"Samphire", "Thrift", "Sedge", "Heather", "Sorrel", "Campion"}
	people   = []string{"Elinor", "Hamish", "Ines", "Oskar", "Priya", "Jory", "Fiona", "Callum", "Morwenna", "Tamsin", "Aled", "Nerys", "Ruaridh", "Signe"}
	surnames = []string{"Pascoe", "Lindqvist", "MacAulay", "Trevithick", "Penrose", "Nanjappa", "Strachan", "Carne", "Rowe", "Tregear", "Jenner", "Moyle"}
	staff    = []string{"Tamsin Rowe", "Callum Strachan", "Priya Nanjappa", "Jory Penhallow", "Morwenna Treloar"}
)
