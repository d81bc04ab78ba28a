package schema

// Catalog is a yard's catalog of parts, decoded: every part of each kind
// by its id. Field names and meanings follow #Catalog in cue/catalog.cue.
type Catalog struct {
	Name       string                    `json:"name,omitempty"`
	Currency   string                    `json:"currency,omitempty"`
	Battery    map[string]Battery        `json:"battery"`
	Module     map[string]Module         `json:"module"`
	Controller map[string]ControllerPart `json:"controller"`
	Inverter   map[string]InverterPart   `json:"inverter"`
	Protection map[string]Protection     `json:"protection"`
	Cable      map[string]Cable          `json:"cable"`
	Busbar     map[string]Busbar         `json:"busbar"`
	Terminal   map[string]Terminal       `json:"terminal"`
	Charger    map[string]ChargerPart    `json:"charger"`
	Link       map[string]LinkPart       `json:"link"`
	Converter  map[string]ConverterPart  `json:"converter"`
	Shunt      map[string]ShuntPart      `json:"shunt"`
}

// CatalogKinds are the fields of #Catalog that hold parts, in the order
// the schema gives them: a part is referred to as catalog.<kind>.<id>.
var CatalogKinds = []string{"battery", "module", "controller", "inverter", "protection", "cable", "busbar", "terminal", "charger", "link", "converter", "shunt"}
