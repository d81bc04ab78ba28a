package energy

import "math"

// Kinetic is the kinetic battery model of a lead-acid bank (J. F. Manwell
// and J. G. McGowan, "Lead acid battery storage model for hybrid energy
// systems", Solar Energy 50(5), 1993). The bank's charge sits in two
// wells: the available well, a fraction C of the capacity, which the
// terminals charge and discharge, and the bound well, which exchanges
// charge with it in proportion to the difference of their heights
// (h1 = q1/c, h2 = q2/(1 − c)) at the rate constant K:
//
//	dq1/dt = −I − K(1 − c)q1 + K c q2
//	dq2/dt =      K(1 − c)q1 − K c q2
//
// with I the current, positive discharging. A bank at rest has both wells
// at one height. Charging fills the available well first; the bound well
// follows at the rate constant, so that the current a bank accepts falls
// as it fills: the absorption stage of a lead-acid charge.
//
// A LiFePO4 bank is the model with one well (C = 1): all its charge is
// available.
type Kinetic struct {
	C    float64 // capacity ratio, 0 < C ≤ 1
	K    float64 // rate constant, per hour
	Qmax float64 // capacity, Ah
	// e, f and den are the one-hour step's constants:
	// e = exp(−K), f = K − 1 + e, den = 1 − e + C·f.
	e, f, den float64
}

// Wells is the charge in each well, Ah.
type Wells struct {
	Q1, Q2 float64 // available, bound
}

// Q is the bank's charge, Ah.
func (w Wells) Q() float64 { return w.Q1 + w.Q2 }

// NewKinetic is the model of a bank of capacity qmax (Ah) with capacity
// ratio c and rate constant k (per hour); c ≥ 1 gives one well.
func NewKinetic(c, k, qmax float64) Kinetic {
	m := Kinetic{C: min(c, 1), K: k, Qmax: qmax}
	if m.C < 1 {
		m.e = math.Exp(-k)
		m.f = k - 1 + m.e
		m.den = 1 - m.e + m.C*m.f
	}
	return m
}

// single reports whether the model has one well.
func (m *Kinetic) single() bool { return m.C >= 1 }

// At is the bank at rest at state of charge soc (0–1): both wells at one
// height.
func (m *Kinetic) At(soc float64) Wells {
	q := soc * m.Qmax
	return Wells{Q1: m.C * q, Q2: (1 - m.C) * q}
}

// Step is the bank after a constant current i (A, positive discharging)
// for one hour.
func (m *Kinetic) Step(w Wells, i float64) Wells {
	if m.single() {
		return Wells{Q1: w.Q1 - i}
	}
	return m.step(w, i, m.e, m.f)
}

// StepFor is Step over dt hours.
func (m *Kinetic) StepFor(w Wells, i, dt float64) Wells {
	if m.single() {
		return Wells{Q1: w.Q1 - i*dt}
	}
	e := math.Exp(-m.K * dt)
	return m.step(w, i, e, m.K*dt-1+e)
}

// step is the model's closed form for a constant current over dt hours
// (Manwell & McGowan 1993), with e = exp(−k·dt) and f = k·dt − 1 + e:
//
//	q1 = q1,0·e + (q0·k·c − I)(1 − e)/k − I·c·f/k
//	q2 = q2,0·e + q0(1 − c)(1 − e) − I(1 − c)·f/k
func (m *Kinetic) step(w Wells, i, e, f float64) Wells {
	q0 := w.Q1 + w.Q2
	c, k := m.C, m.K
	return Wells{
		Q1: w.Q1*e + (q0*k*c-i)*(1-e)/k - i*c*f/k,
		Q2: w.Q2*e + q0*(1-c)*(1-e) - i*(1-c)*f/k,
	}
}

// MaxCharge is the largest constant current, A, that the bank's wells
// take over the next hour: the current that leaves the available well
// full (q1 = c·qmax) at the hour's end, by the model's closed form
//
//	I_c,max = (k·c·qmax − k·q1,0·e − q0·k·c(1 − e)) / (1 − e + c·f)
//
// It is what the bank stores, before the charge efficiency, and never
// below 0.
func (m *Kinetic) MaxCharge(w Wells) float64 {
	if m.single() {
		return max(0, m.Qmax-w.Q1)
	}
	q0 := w.Q1 + w.Q2
	c, k := m.C, m.K
	i := (k*c*m.Qmax - k*w.Q1*m.e - q0*k*c*(1-m.e)) / m.den
	return max(0, i)
}

// MaxDischarge is the largest constant current, A, the bank gives over
// the next hour: the current that empties the available well at the
// hour's end,
//
//	I_d,max = (k·q1,0·e + q0·k·c(1 − e)) / (1 − e + c·f)
func (m *Kinetic) MaxDischarge(w Wells) float64 {
	if m.single() {
		return max(0, w.Q1)
	}
	q0 := w.Q1 + w.Q2
	c, k := m.C, m.K
	return max(0, (k*w.Q1*m.e+q0*k*c*(1-m.e))/m.den)
}
