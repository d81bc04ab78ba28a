package model

// DropTerm is one conductor's share of a path's voltage drop.
type DropTerm struct {
	// Run is the conductor's run; Return is true for a return conductor of
	// a positive run, and for a negative conductor.
	Run    *Run
	Return bool
	// Current (A), Length (m) and R (Ω/m at the conductor's temperature)
	// give Volts = Current × Length × R.
	Current, Length, R, Volts float64
}

// PathDrop is the voltage drop from the source of run r's side (its bank,
// or the converter it lies beyond, which regulates its output) to the far
// end of r and back: every positive run on the way, and the return: each
// run's own return conductor up to where the return reaches the negative
// side the design draws, then the negative conductors from there to the
// source. current gives each conductor's current (nil: its design
// current). Without a negative side every return is its run's own, of its
// size and length.
func (s *System) PathDrop(r *Run, current func(*Run) float64) (float64, []DropTerm) {
	if current == nil {
		current = func(x *Run) float64 {
			if x.Role == Return {
				return x.Current
			}
			return x.DropCurrent
		}
	}
	var terms []DropTerm
	landed := false
	target := s.returnTarget(r)
	for x := r; x != nil; x = x.Parent {
		temp := s.Temperature(x.Spec)
		res := ConductorResistance(s.Rules, x.Spec, x.Spec.Size, temp)
		l := x.Spec.Length.Metres()
		i := current(x)
		terms = append(terms, DropTerm{Run: x, Current: i, Length: l, R: res.RT, Volts: i * l * res.RT})
		if !landed {
			if x.Ret.Own {
				rr := res
				if !x.Ret.Mirror {
					rr = ConductorResistance(s.Rules, x.Spec, x.Ret.Size, temp)
				}
				terms = append(terms, DropTerm{Run: x, Return: true, Current: i, Length: x.Ret.Length, R: rr.RT, Volts: i * x.Ret.Length * rr.RT})
			}
			var from *Node
			switch {
			case x.Ret.Lands != nil:
				from = x.Ret.Lands
			case x.Ret.Via != nil:
				from = x.Ret.Via.DownNode
			}
			if from != nil {
				for _, n := range pathBetween(from, target) {
					nr := ConductorResistance(s.Rules, n.Spec, n.Spec.Size, s.Temperature(n.Spec))
					nl := n.Spec.Length.Metres()
					ni := current(n)
					terms = append(terms, DropTerm{Run: n, Return: true, Current: ni, Length: nl, R: nr.RT, Volts: ni * nl * nr.RT})
				}
				landed = true
			}
		}
		if x.UpNode.Kind == KindConverter {
			break
		}
	}
	var v float64
	for _, t := range terms {
		v += t.Volts
	}
	return v, terms
}

// LoadsThrough are the loads whose return current passes negative
// conductor n, by name.
func (s *System) LoadsThrough(n *Run) []string {
	var out []string
	for _, r := range s.Runs {
		if !r.Ret.Own || r.Ret.Lands == nil || r.Role != Supply {
			continue
		}
		for _, x := range pathBetween(r.Ret.Lands, s.returnTarget(r)) {
			if x == n {
				out = append(out, r.Loads...)
				break
			}
		}
	}
	return out
}
