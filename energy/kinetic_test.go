package energy

import (
	"math"
	"testing"
)

// integrate solves the kinetic battery model's two-well equations
// (Manwell & McGowan 1993)
//
//	dq1/dt = −I − k(1 − c)q1 + k c q2
//	dq2/dt =      k(1 − c)q1 − k c q2
//
// for a constant current i over dt hours by the classical fourth-order
// Runge–Kutta method at n steps: the model's equations themselves, worked
// numerically, against which its closed form is checked.
func integrate(c, k float64, w Wells, i, dt float64, n int) Wells {
	d := func(q1, q2 float64) (float64, float64) {
		flow := k*(1-c)*q1 - k*c*q2
		return -i - flow, flow
	}
	h := dt / float64(n)
	q1, q2 := w.Q1, w.Q2
	for range n {
		a1, a2 := d(q1, q2)
		b1, b2 := d(q1+h/2*a1, q2+h/2*a2)
		c1, c2 := d(q1+h/2*b1, q2+h/2*b2)
		d1, d2 := d(q1+h*c1, q2+h*c2)
		q1 += h / 6 * (a1 + 2*b1 + 2*c1 + d1)
		q2 += h / 6 * (a2 + 2*b2 + 2*c2 + d2)
	}
	return Wells{q1, q2}
}

// TestKineticClosedForm checks the closed form of a constant-current step
// against the model's equations integrated numerically (Manwell & McGowan
// 1993: the closed form is the exact solution for a constant current), for
// discharges, charges and rest, over several time steps.
func TestKineticClosedForm(t *testing.T) {
	tests := []struct {
		name    string
		c, k    float64
		soc     float64 // at rest before the step
		current float64 // A, positive discharging
		dt      float64 // h
	}{
		{"flooded discharge at C/20", 0.4, 1.0, 1, 5, 1},
		{"flooded discharge at C/2", 0.4, 1.0, 0.9, 50, 1},
		{"AGM charge from 50 %", 0.5, 1.0, 0.5, -25, 1},
		{"gel charge over a quarter hour", 0.4, 0.7, 0.6, -20, 0.25},
		{"slow exchange, long step", 0.3, 0.5, 0.7, 10, 3},
		{"fast exchange, rest", 0.6, 1.5, 0.4, 0, 2},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			m := NewKinetic(tt.c, tt.k, 100)
			start := m.At(tt.soc)
			// Out of equilibrium too: half an hour at a heavy discharge first.
			for _, w := range []Wells{start, m.StepFor(start, 40, 0.5)} {
				closed := m.StepFor(w, tt.current, tt.dt)
				numeric := integrate(tt.c, tt.k, w, tt.current, tt.dt, 20000)
				if math.Abs(closed.Q1-numeric.Q1) > 1e-6 || math.Abs(closed.Q2-numeric.Q2) > 1e-6 {
					t.Errorf("from %+v: closed form %+v, integrated %+v", w, closed, numeric)
				}
				// The total changes by the current alone.
				if got, want := closed.Q(), w.Q()-tt.current*tt.dt; math.Abs(got-want) > 1e-9 {
					t.Errorf("from %+v: total %v Ah, want %v", w, got, want)
				}
			}
			if tt.dt == 1 {
				if a, b := m.Step(start, tt.current), m.StepFor(start, tt.current, 1); a != b {
					t.Errorf("Step %+v differs from StepFor one hour %+v", a, b)
				}
			}
		})
	}
}

// TestKineticLimits checks the closed-form maximum charge and discharge
// currents against the model's equations: held for an hour, the maximum
// charge current leaves the available well full (q1 = c·qmax) and the
// maximum discharge current leaves it empty (Manwell & McGowan 1993).
func TestKineticLimits(t *testing.T) {
	for _, p := range []struct{ c, k float64 }{{0.4, 1.0}, {0.5, 1.0}, {0.4, 0.7}, {0.3, 0.5}, {0.6, 1.5}} {
		m := NewKinetic(p.c, p.k, 200)
		for _, soc := range []float64{0.3, 0.5, 0.8, 0.95} {
			w := m.At(soc)
			ic := m.MaxCharge(w)
			if got := integrate(p.c, p.k, w, -ic, 1, 20000); math.Abs(got.Q1-p.c*200) > 1e-6 {
				t.Errorf("c %v k %v at %v: charging at I_c,max = %.4f A leaves q1 = %.6f, want c·qmax = %v", p.c, p.k, soc, ic, got.Q1, p.c*200)
			}
			id := m.MaxDischarge(w)
			if got := integrate(p.c, p.k, w, id, 1, 20000); math.Abs(got.Q1) > 1e-6 {
				t.Errorf("c %v k %v at %v: discharging at I_d,max = %.4f A leaves q1 = %.6f, want 0", p.c, p.k, soc, id, got.Q1)
			}
		}
		// A full bank at rest takes nothing.
		if ic := m.MaxCharge(m.At(1)); math.Abs(ic) > 1e-9 {
			t.Errorf("c %v k %v: a full bank accepts %v A, want 0", p.c, p.k, ic)
		}
	}
	// One well: everything is available.
	m := NewKinetic(1, 1, 100)
	if got := m.MaxCharge(m.At(0.6)); math.Abs(got-40) > 1e-9 {
		t.Errorf("one well at 60 %%: accepts %v Ah in the hour, want 40", got)
	}
	if got := m.MaxDischarge(m.At(0.6)); math.Abs(got-60) > 1e-9 {
		t.Errorf("one well at 60 %%: gives %v Ah in the hour, want 60", got)
	}
}
