package propose

import (
	"fmt"
	"strconv"
	"strings"

	"github.com/ampwright/ampwright/result"
	"github.com/ampwright/ampwright/schema"
)

// dir says how a failure generalises along one choice, by the monotone
// premises (Premises).
type dir int

const (
	// exact: the failure holds for this option only.
	exact dir = iota
	// family: for every amount of this option's family (a bank of this
	// battery in any number of strings).
	family
	// atMost: for this family at this amount or less (fewer batteries in
	// parallel, fewer strings).
	atMost
	// atLeast: for this family at this amount or more.
	atLeast
)

// dep is one choice a finding depends on, and how its failure generalises
// along it.
type dep struct {
	dim int
	dir dir
}

// fact is a failure found: the combinations matching its key, with every
// atMost amount at most and every atLeast amount at least its own, fail
// the same check.
type fact struct {
	amounts []int
}

// signature is a kind of fact: a check's failure on a subject, and the
// choices it depends on.
type signature struct {
	check   result.CheckID
	subject string
	deps    []dep
	ident   string // id, once known
}

func (s signature) id() string {
	if s.ident != "" {
		return s.ident
	}
	var b strings.Builder
	fmt.Fprintf(&b, "%s\x00%s", s.check, s.subject)
	for _, d := range s.deps {
		fmt.Fprintf(&b, "\x00%d:%d", d.dim, d.dir)
	}
	return b.String()
}

// factBook holds the failures the search has learnt, indexed so that a
// combination is tested against them in a few map lookups.
type factBook struct {
	sigs  []signature
	known map[string]bool
	facts map[string][]fact // by signature id and the key of the combination
}

func newFactBook() *factBook {
	return &factBook{known: map[string]bool{}, facts: map[string][]fact{}}
}

// key is the part of a combination a signature's facts must match
// exactly: the option of each exact dep, the family of the others.
func (p *problem) key(s signature, combo []int) string {
	b := make([]byte, 0, 64)
	b = append(b, s.id()...)
	for _, d := range s.deps {
		b = append(b, 1)
		if d.dir == exact {
			b = strconv.AppendInt(b, int64(combo[d.dim]), 10)
		} else {
			b = append(b, p.dims[d.dim].opts[combo[d.dim]].family...)
		}
	}
	return string(b)
}

// add records that combo fails the signature's check.
func (p *problem) addFact(s signature, combo []int) {
	fb := p.facts
	id := s.id()
	s.ident = id
	if !fb.known[id] {
		fb.known[id] = true
		fb.sigs = append(fb.sigs, s)
	}
	f := fact{amounts: make([]int, len(s.deps))}
	for i, d := range s.deps {
		f.amounts[i] = p.dims[d.dim].opts[combo[d.dim]].amount
	}
	k := p.key(s, combo)
	for _, g := range fb.facts[k] {
		if covers(s, g, f) {
			return
		}
	}
	fb.facts[k] = append(fb.facts[k], f)
}

// covers reports whether fact g covers the amounts of fact f.
func covers(s signature, g, f fact) bool {
	for i, d := range s.deps {
		switch d.dir {
		case atMost:
			if f.amounts[i] > g.amounts[i] {
				return false
			}
		case atLeast:
			if f.amounts[i] < g.amounts[i] {
				return false
			}
		}
	}
	return true
}

// ruledOut returns the fact's signature that decides combo fails, if one
// does.
func (p *problem) ruledOut(combo []int) (signature, bool) {
	fb := p.facts
	for _, s := range fb.sigs {
		list := fb.facts[p.key(s, combo)]
		if len(list) == 0 {
			continue
		}
		f := fact{amounts: make([]int, len(s.deps))}
		for i, d := range s.deps {
			f.amounts[i] = p.dims[d.dim].opts[combo[d.dim]].amount
		}
		for _, g := range list {
			if covers(s, g, f) {
				return s, true
			}
		}
	}
	return signature{}, false
}

// depsOf is the choices a failing finding depends on, and how it
// generalises along each (see Premises). A failure that depends on no
// choice the search makes is one no proposal can mend.
func (p *problem) depsOf(f result.Finding) []dep {
	var out []dep
	add := func(kind dimKind, name string, d dir) {
		for i, dm := range p.dims {
			if dm.kind == kind && (name == "" || dm.name == name) {
				out = append(out, dep{i, d})
			}
		}
	}
	ctrlOf := func(array string) string {
		if a, ok := p.base.Arrays[array]; ok {
			return a.Controller
		}
		return ""
	}
	bankOfCtrl := func(ctrl string) string {
		if n := p.sys0.Nodes[ctrl]; n != nil && n.Bank != nil {
			return n.Bank.Name
		}
		return ""
	}
	primary := ""
	if b := p.sys0.Primary(); b != nil {
		primary = b.Name
	}
	// The controllers and links that charge bank k, and the arrays of
	// those controllers.
	chargersOf := func(k string, d dir) {
		for i, dm := range p.dims {
			switch dm.kind {
			case dimController:
				if bankOfCtrl(dm.name) == k {
					out = append(out, dep{i, d})
				}
			case dimArray:
				if bankOfCtrl(ctrlOf(dm.name)) == k {
					out = append(out, dep{i, d})
				}
			case dimLink:
				l := p.base.Links[dm.name]
				if l.To == k || l.From == k {
					out = append(out, dep{i, exact})
				}
			}
		}
	}
	// A completion failure on a part of bank k's side depends on bank k
	// (its fault current and charging voltage) and on what sets the
	// currents: the controllers, arrays and links.
	side := func(k string, bankDir dir) {
		add(dimBank, k, bankDir)
		add(dimArray, "", exact)
		add(dimController, "", exact)
		add(dimLink, "", exact)
	}
	sideOf := func(f result.Finding) string {
		if r := p.sys0.Run(f.Subject); r != nil && r.Bank != nil {
			return r.Bank.Name
		}
		if l := p.sys0.Load(f.Subject); l != nil && l.Bank != nil {
			return l.Bank.Name
		}
		if n := p.sys0.Nodes[f.Subject]; n != nil && n.Bank != nil {
			return n.Bank.Name
		}
		return ""
	}
	switch f.ID {
	case result.CheckBankVoltage:
		add(dimBank, f.Subject, exact)
	case result.CheckEquipmentSystem:
		add(dimController, f.Subject, exact)
		add(dimLink, f.Subject, exact)
	case result.CheckStringFuse:
		add(dimArray, f.Subject, exact)
	case result.CheckColdVoc:
		add(dimArray, f.Subject, exact)
		add(dimController, ctrlOf(f.Subject), exact)
	case result.CheckHotVmp:
		add(dimArray, f.Subject, exact)
		add(dimController, ctrlOf(f.Subject), exact)
		add(dimBank, bankOfCtrl(ctrlOf(f.Subject)), family)
	case result.CheckInputCurrent:
		add(dimController, f.Subject, exact)
		for _, n := range schema.Names(p.base.Arrays) {
			if p.base.Arrays[n].Controller == f.Subject {
				add(dimArray, n, atLeast)
			}
		}
	case result.CheckAutonomy:
		add(dimBank, primary, atMost)
	case result.CheckBankDischarge, result.CheckBankPeak:
		add(dimBank, f.Subject, atMost)
	case result.CheckColdCharge:
		add(dimBank, f.Subject, family)
	case result.CheckChargeRate:
		add(dimBank, f.Subject, atMost)
		for i, dm := range p.dims {
			switch dm.kind {
			case dimController:
				if bankOfCtrl(dm.name) == f.Subject {
					out = append(out, dep{i, exact})
				}
			case dimLink:
				out = append(out, dep{i, exact})
			}
		}
	case result.CheckVoyageFloor:
		add(dimBank, primary, atMost)
		chargersOf(primary, atMost)
	case result.CheckChargePath:
		add(dimBank, "", family)
		add(dimLink, "", exact)
	case result.CheckLinkCurrent:
		add(dimLink, f.Subject, exact)
		add(dimController, "", exact)
	case result.CheckBusWays, result.CheckTotalDrop:
		// A panel's circuits are the design's, and a whole path is
		// checked at currents of the loads alone: when the completion
		// cannot mend them with the largest parts, no choice can.
	case "model":
		// The model refused the combination: it alone fails.
		for i := range p.dims {
			out = append(out, dep{i, exact})
		}
	case result.CheckInterrupting:
		// More batteries in parallel never lower the fault current.
		if k := sideOf(f); k != "" {
			side(k, atLeast)
		} else {
			for i := range p.dims {
				out = append(out, dep{i, exact})
			}
		}
	default:
		// The wiring, the devices and the buses are the completion's; a
		// failure it could not mend depends on its bank's side and on
		// what sets the currents.
		if isCompletionCheck(f.ID) {
			if k := sideOf(f); k != "" {
				side(k, exact)
			} else {
				for i := range p.dims {
					out = append(out, dep{i, exact})
				}
			}
		}
	}
	return out
}

func isCompletionCheck(id result.CheckID) bool {
	for _, c := range completionChecks {
		if c.ID == id {
			return true
		}
	}
	return false
}

// monotoneInBank are the checks a bank passes better with more batteries
// in parallel of the same battery (Premises).
var monotoneInBank = map[result.CheckID]bool{
	result.CheckAutonomy: true, result.CheckBankDischarge: true, result.CheckBankPeak: true,
	result.CheckChargeRate: true, result.CheckVoyageFloor: true,
}
