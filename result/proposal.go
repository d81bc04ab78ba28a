package result

// Proposal is the cheapest design ampwright found, from the yard's
// catalog, for a hull's loads, scenarios, voyage, site and wiring, that
// passes every check; with the designer's design beside it. `ampwright
// propose` prints it, and `ampwright pack --with-proposal` puts it in the
// pack as an appendix.
type Proposal struct {
	// Design names the hull the proposal is for.
	Design Identity `json:"design"`
	// Status is "proven" when the search completed: nothing in the
	// catalog costs less and passes; "best-found" when the search was cut
	// (see Cut) and the proposal is the cheapest found so far, not proven;
	// "none" when no choice from the catalog passes (see Blocking), or,
	// with Cut, when none that passes was found before the search was cut.
	Status string `json:"status"`
	// Cut says why the search stopped before it completed, if it did.
	Cut string `json:"cut,omitempty"`
	// Currency of every cost.
	Currency string `json:"currency,omitempty"`
	// Designer and Proposed are the two designs' costs and verdicts.
	Designer ProposalSide `json:"designer"`
	Proposed ProposalSide `json:"proposed"`
	// Saving is the designer's cost less the proposal's.
	Saving float64 `json:"saving"`
	// Changes are the entries the proposal changes, in the design's order:
	// banks, arrays, controllers, links, buses, then the wiring.
	Changes []ProposalChange `json:"changes"`
	// Binding are the proposal's findings with the least margin: what
	// keeps it from being smaller.
	Binding []Finding `json:"binding"`
	// Blocking are, when nothing passes, the checks no choice met in the
	// search, each with what would be needed.
	Blocking []Finding `json:"blocking,omitempty"`
	// Search says what the search covered.
	Search ProposalSearch `json:"search"`
	// Premises are the monotone rules the search prunes by: its proof of
	// optimality rests on them.
	Premises []string `json:"premises"`
	// File is the CUE file the proposal was written to, if any.
	File string `json:"file,omitempty"`
}

// ProposalSide is one design's cost and verdict.
type ProposalSide struct {
	// Cost is the bill of materials' total; Complete is false when a part
	// has no price (the total is then a lower bound).
	Cost     float64 `json:"cost"`
	Complete bool    `json:"complete"`
	// Pass, Warn and Fail count its findings.
	Pass int `json:"pass"`
	Warn int `json:"warn"`
	Fail int `json:"fail"`
	// Bank and Arrays describe it in a line each.
	Bank   []string `json:"bank"`
	Arrays []string `json:"arrays,omitempty"`
}

// ProposalChange is one entry the proposal changes.
type ProposalChange struct {
	// Entry is the CUE path of the entry: bank, arrays.rails,
	// wiring."panel-vhf".
	Entry string `json:"entry"`
	// What is the part of it that changes: "bank", "array", "controller",
	// "link", "part", "size", "protection", "string fuse".
	What string `json:"what"`
	From string `json:"from"`
	To   string `json:"to"`
	// Binds is the check and subject whose limit the choice is sized to,
	// with its margin, where one does.
	Binds string `json:"binds,omitempty"`
	// Smaller is the next smaller option, and SmallerFails the check it
	// fails and why: the reason the choice is the smallest that passes.
	Smaller      string `json:"smaller,omitempty"`
	SmallerFails string `json:"smallerFails,omitempty"`
}

// ProposalSearch says what the search covered.
type ProposalSearch struct {
	// Options counts the catalog's options for each choice the search
	// made, by the choice's CUE path.
	Options map[string]int `json:"options"`
	// Combinations is the number of combinations of those options.
	Combinations float64 `json:"combinations"`
	// Considered are the combinations the search reached below its bound;
	// Evaluated those it ran the checks on, the rest being decided by the
	// premises or by parts that cannot fit; Pruned those its cost bound
	// left out.
	Considered int     `json:"considered"`
	Evaluated  int     `json:"evaluated"`
	Pruned     float64 `json:"pruned"`
}
