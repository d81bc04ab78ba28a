package result

import (
	"math"
	"testing"
)

func TestNonFinite(t *testing.T) {
	r := &Result{Checks: []Finding{{Value: 1}, {Value: 2, Limit: math.Inf(1)}}}
	if p, bad := NonFinite(r); !bad || p != "checks[1].limit" {
		t.Errorf("NonFinite = %q, %v; want checks[1].limit", p, bad)
	}
	r.Checks[1].Limit = 3
	r.Voyage = &Voyage{BankVoyage: BankVoyage{Lowest: math.NaN()}}
	if p, bad := NonFinite(r); !bad || p != "voyage.lowest" {
		t.Errorf("NonFinite = %q, %v; want voyage.lowest", p, bad)
	}
	r.Voyage = nil
	if p, bad := NonFinite(r); bad {
		t.Errorf("NonFinite = %q on a finite result", p)
	}
}
