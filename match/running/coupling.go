package running

import (
	"fmt"
	"math"
	"sort"
)

// Threshold is a heavy-quark flavour threshold.
type Threshold struct {
	Nf    int     // active flavours above the threshold: the heavy quark is the Nf-th (4 charm, 5 bottom, 6 top)
	Mass  float64 // MS-bar mass m_h(m_h) in GeV, in the Nf-flavour theory
	Scale float64 // matching scale μ_th in GeV; 0 means Mass
}

func (t Threshold) scale() float64 {
	if t.Scale == 0 {
		return t.Mass
	}
	return t.Scale
}

// Coupling is αs with flavour thresholds: αs(Mu0) = AlphaS0 with Nf0 active flavours, run
// with a Loops-loop β function and matched with MatchLoops-loop MS-bar decoupling at each
// threshold (n-loop running pairs with (n−1)-loop matching).
type Coupling struct {
	AlphaS0    float64
	Mu0        float64
	Nf0        int
	Loops      int
	MatchLoops int
	Thresholds []Threshold
}

// Validate reports whether the coupling is usable: scales positive, thresholds of
// consecutive flavour numbers in increasing order of scale, Mu0 inside the Nf0 window.
func (c Coupling) Validate() error {
	if err := (Beta{Nf: c.Nf0, Loops: c.Loops}).Check(); err != nil {
		return err
	}
	if c.MatchLoops < 0 || c.MatchLoops > 3 {
		return fmt.Errorf("running: %d-loop decoupling: want 0 to 3 loops", c.MatchLoops)
	}
	if err := checkScale("μ0", c.Mu0); err != nil {
		return err
	}
	if err := checkAlphaS(c.AlphaS0); err != nil {
		return err
	}
	th := c.sorted()
	for i, t := range th {
		if t.Nf < 1 || t.Nf > 6 {
			return fmt.Errorf("running: threshold of flavour %d: want 1 to 6", t.Nf)
		}
		if err := checkScale("m_h", t.Mass); err != nil {
			return err
		}
		if t.Scale != 0 {
			if err := checkScale("μ_th", t.Scale); err != nil {
				return err
			}
		}
		if i > 0 {
			if t.Nf == th[i-1].Nf {
				return fmt.Errorf("running: two thresholds for flavour %d", t.Nf)
			}
			if t.scale() <= th[i-1].scale() {
				return fmt.Errorf("running: threshold of flavour %d at %g GeV is not above that of flavour %d at %g GeV",
					t.Nf, t.scale(), th[i-1].Nf, th[i-1].scale())
			}
		}
	}
	if nf := c.NfAt(c.Mu0); nf != c.Nf0 {
		return fmt.Errorf("running: μ0 = %g GeV lies in the %d-flavour window of the thresholds, not in that of Nf0 = %d", c.Mu0, nf, c.Nf0)
	}
	return nil
}

func (c Coupling) sorted() []Threshold {
	th := append([]Threshold(nil), c.Thresholds...)
	sort.Slice(th, func(i, j int) bool { return th[i].Nf < th[j].Nf })
	return th
}

func (c Coupling) threshold(nf int) (Threshold, bool) {
	for _, t := range c.Thresholds {
		if t.Nf == nf {
			return t, true
		}
	}
	return Threshold{}, false
}

// NfAt returns the number of active flavours at the scale mu: Nf0, raised by every threshold
// above Nf0 whose scale is at or below mu, lowered by every threshold at or below Nf0 whose
// scale is above mu.
func (c Coupling) NfAt(mu float64) int {
	nf := c.Nf0
	for {
		t, ok := c.threshold(nf + 1)
		if !ok || mu < t.scale() {
			break
		}
		nf++
	}
	for {
		t, ok := c.threshold(nf)
		if !ok || mu >= t.scale() {
			break
		}
		nf--
	}
	return nf
}

// AlphaS returns αs(mu) with NfAt(mu) active flavours.
func (c Coupling) AlphaS(mu float64) (float64, error) {
	if err := checkScale("μ", mu); err != nil {
		return 0, err
	}
	return c.AlphaSNf(mu, c.NfAt(mu))
}

// AlphaSNf returns αs(mu) in the theory with nf active flavours, reached from Mu0 by running
// to each threshold between Nf0 and nf and matching there; mu may lie outside the nf window
// (the coupling is then run with nf flavours past the threshold).
func (c Coupling) AlphaSNf(mu float64, nf int) (float64, error) {
	if err := c.Validate(); err != nil {
		return 0, err
	}
	if err := checkScale("μ", mu); err != nil {
		return 0, err
	}
	as, cur, at := c.AlphaS0, c.Nf0, c.Mu0
	for cur != nf {
		var err error
		as, cur, at, err = c.cross(as, cur, at, nf > cur)
		if err != nil {
			return 0, err
		}
	}
	return Beta{Nf: cur, Loops: c.Loops}.AlphaS(as, at, mu)
}

// cross runs αs in the cur-flavour theory from the scale at to the next threshold up or down
// and matches it there, returning αs, the new flavour number and the threshold scale.
func (c Coupling) cross(as float64, cur int, at float64, up bool) (float64, int, float64, error) {
	hf := cur // flavour of the heavy quark at this threshold
	if up {
		hf = cur + 1
	}
	t, ok := c.threshold(hf)
	if !ok {
		return 0, 0, 0, fmt.Errorf("running: no threshold given for flavour %d", hf)
	}
	muTh := t.scale()
	as, err := Beta{Nf: cur, Loops: c.Loops}.AlphaS(as, at, muTh)
	if err != nil {
		return 0, 0, 0, err
	}
	if !up {
		mh, err := c.heavyMass(t, as)
		if err != nil {
			return 0, 0, 0, err
		}
		as, err = AlphaSDown(as, muTh, mh, hf-1, c.MatchLoops)
		return as, hf - 1, muTh, err
	}
	// Upwards the heavy mass at μ_th depends on the coupling being solved for: iterate.
	asLow, asHigh := as, as
	for range 50 {
		mh, err := c.heavyMass(t, asHigh)
		if err != nil {
			return 0, 0, 0, err
		}
		next, err := AlphaSUp(asLow, muTh, mh, hf-1, c.MatchLoops)
		if err != nil {
			return 0, 0, 0, err
		}
		done := math.Abs(next-asHigh) < 1e-15*next
		asHigh = next
		if done {
			break
		}
	}
	return asHigh, hf, muTh, nil
}

// heavyMass returns m_h(μ_th) in the Nf-flavour theory from m_h(m_h), given αs^{(Nf)}(μ_th).
func (c Coupling) heavyMass(t Threshold, asTh float64) (float64, error) {
	muTh := t.scale()
	if muTh == t.Mass {
		return t.Mass, nil
	}
	b := Beta{Nf: t.Nf, Loops: c.Loops}
	asM, err := b.AlphaS(asTh, muTh, t.Mass)
	if err != nil {
		return 0, err
	}
	return b.MassRun(t.Mass, asM, t.Mass, muTh)
}

// Mass runs the MS-bar mass of a light quark from m(mu0) = m0 to mu across the thresholds,
// with the mass decoupled at each threshold to MatchLoops loops. The quark must be active on
// the whole path.
func (c Coupling) Mass(m0, mu0, mu float64) (float64, error) {
	if err := c.Validate(); err != nil {
		return 0, err
	}
	if err := checkScale("μ0", mu0); err != nil {
		return 0, err
	}
	if err := checkScale("μ", mu); err != nil {
		return 0, err
	}
	if !(m0 > 0) || math.IsInf(m0, 0) {
		return 0, fmt.Errorf("running: mass %g GeV: want a finite positive value", m0)
	}
	cur, target := c.NfAt(mu0), c.NfAt(mu)
	as, err := c.AlphaSNf(mu0, cur)
	if err != nil {
		return 0, err
	}
	m, at := m0, mu0
	for cur != target {
		up := target > cur
		hf := cur
		if up {
			hf = cur + 1
		}
		t, _ := c.threshold(hf)
		muTh := t.scale()
		b := Beta{Nf: cur, Loops: c.Loops}
		if m, err = b.MassRun(m, as, at, muTh); err != nil {
			return 0, err
		}
		var next int
		as, next, at, err = c.cross(as, cur, at, up)
		if err != nil {
			return 0, err
		}
		// ζm takes αs and m_h of the theory with the heavy quark.
		asHeavy := as
		if !up {
			if asHeavy, err = c.AlphaSNf(muTh, hf); err != nil {
				return 0, err
			}
		}
		mh, err := c.heavyMass(t, asHeavy)
		if err != nil {
			return 0, err
		}
		if up {
			m, err = MassUp(m, asHeavy, muTh, mh, hf-1, c.MatchLoops)
		} else {
			m, err = MassDown(m, asHeavy, muTh, mh, hf-1, c.MatchLoops)
		}
		if err != nil {
			return 0, err
		}
		cur = next
	}
	return Beta{Nf: cur, Loops: c.Loops}.MassRun(m, as, at, mu)
}
