package running

import (
	"math"
	"testing"
)

// decoupledSpread integrates out a heavy quark of mass m_h(m_h) = M at the scales M/4, M and
// 4M and runs the (nl)-flavour results back to M with 4-loop running. It returns the relative
// spread of αs^{(nl)}(M) and of a light-quark mass m^{(nl)}(M) over the three matching scales.
func decoupledSpread(t *testing.T, asM float64, nl, loops int) (dAlpha, dMass float64) {
	t.Helper()
	const M = 10.0
	hi := Beta{Nf: nl + 1, Loops: 4}
	lo := Beta{Nf: nl, Loops: 4}
	var as, ms []float64
	for _, mu := range []float64{M / 4, M, 4 * M} {
		asHi, err := hi.AlphaS(asM, M, mu)
		if err != nil {
			t.Fatal(err)
		}
		mh, err := hi.MassRun(M, asM, M, mu)
		if err != nil {
			t.Fatal(err)
		}
		mq, err := hi.MassRun(1, asM, M, mu)
		if err != nil {
			t.Fatal(err)
		}
		asLo, err := AlphaSDown(asHi, mu, mh, nl, loops)
		if err != nil {
			t.Fatal(err)
		}
		mqLo, err := MassDown(mq, asHi, mu, mh, nl, loops)
		if err != nil {
			t.Fatal(err)
		}
		back, err := lo.AlphaS(asLo, mu, M)
		if err != nil {
			t.Fatal(err)
		}
		mBack, err := lo.MassRun(mqLo, asLo, mu, M)
		if err != nil {
			t.Fatal(err)
		}
		as = append(as, back)
		ms = append(ms, mBack)
	}
	spread := func(v []float64) float64 {
		lo, hi := math.Min(v[0], math.Min(v[1], v[2])), math.Max(v[0], math.Max(v[1], v[2]))
		return (hi - lo) / hi
	}
	return spread(as), spread(ms)
}

// RG invariance of the decoupling relations: αs^{(nl)} and m^{(nl)} at a fixed scale must not
// depend on where the heavy quark was integrated out, up to the first omitted order. With the
// relation kept to n loops the spread scales like αs^{n+1} (αs: n = 0…3; masses: the first term
// is at two loops, so n = 1 behaves like n = 0 there). Halving αs must shrink the spread by
// 2^{n+1}: this checks every logarithm of Chetyrkin–Kniehl–Steinhauser, Nucl. Phys. B510 (1998)
// 61, against β and γm, for two values of nl.
func TestDecouplingRGInvariance(t *testing.T) {
	for _, nl := range []int{3, 5} {
		for loops := 0; loops <= 3; loops++ {
			a1, m1 := decoupledSpread(t, 0.04, nl, loops)
			a2, m2 := decoupledSpread(t, 0.02, nl, loops)
			pa := math.Log2(a1 / a2)
			pm := math.Log2(m1 / m2)
			wantA := float64(loops + 1)
			wantM := float64(max(loops, 1) + 1)
			t.Logf("nl=%d loops=%d: αs spread %.3g → power %.3f; mass spread %.3g → power %.3f", nl, loops, a1, pa, m1, pm)
			if math.Abs(pa-wantA) > 0.3 {
				t.Errorf("nl=%d loops=%d: αs spread scales as αs^%.2f, want %g", nl, loops, pa, wantA)
			}
			if math.Abs(pm-wantM) > 0.3 {
				t.Errorf("nl=%d loops=%d: mass spread scales as αs^%.2f, want %g", nl, loops, pm, wantM)
			}
		}
	}
}

// The constants at μ = m_h against the decimals printed by Chetyrkin, Kniehl, Steinhauser,
// Nucl. Phys. B510 (1998) 61 (from memory, to the four digits trusted):
// ζg² = 1 + 0.1528 x² + (0.9721 − 0.0847 nl) x³ and ζm = 1 + 0.2060 x² + (1.8476 + 0.0247 nl) x³,
// x = αs/π; the tolerance is the rounding of the printed digits.
func TestDecouplingConstants(t *testing.T) {
	for _, nl := range []int{3, 4, 5} {
		n := float64(nl)
		c2 := zetaG2(1, 0, nl, 2) - zetaG2(1, 0, nl, 1)
		c3 := zetaG2(1, 0, nl, 3) - zetaG2(1, 0, nl, 2)
		m2 := zetaM(1, 0, nl, 2) - 1
		m3 := zetaM(1, 0, nl, 3) - zetaM(1, 0, nl, 2)
		checks := []struct {
			name      string
			got, want float64
		}{
			{"ζg² x²", c2, 0.1528},
			{"ζg² x³", c3, 0.9721 - 0.0847*n},
			{"ζm x²", m2, 0.2060},
			{"ζm x³", m3, 1.8476 + 0.0247*n},
		}
		for _, c := range checks {
			if math.Abs(c.got-c.want) > 5e-5*(1+n) {
				t.Errorf("nl=%d %s: %.7f, want %.7f", nl, c.name, c.got, c.want)
			}
		}
	}
	// Direction: below the threshold the coupling of fewer flavours is larger at μ = m_h
	// (two loops and beyond), and at μ > m_h the one-loop logarithm lowers it.
	as4, _ := AlphaSDown(0.22, 4.2, 4.2, 4, 3)
	if !(as4 > 0.22) {
		t.Errorf("αs^(4)(m_b) = %g is not above αs^(5)(m_b) = 0.22", as4)
	}
	asAbove, _ := AlphaSDown(0.22, 8.4, 4.2, 4, 1)
	if !(asAbove < 0.22) {
		t.Errorf("one-loop decoupling at 2 m_b raised αs: %g", asAbove)
	}
}

func TestDecouplingRoundTrip(t *testing.T) {
	for loops := 0; loops <= 3; loops++ {
		for _, mu := range []float64{2, 4.2, 12} {
			lo, err := AlphaSDown(0.22, mu, 4.2, 4, loops)
			if err != nil {
				t.Fatal(err)
			}
			hi, err := AlphaSUp(lo, mu, 4.2, 4, loops)
			if err != nil {
				t.Fatal(err)
			}
			if d := relDiff(hi, 0.22); d > 1e-13 {
				t.Errorf("loops=%d μ=%g: up(down(0.22)) = %.16g", loops, mu, hi)
			}
			m, _ := MassDown(0.095, 0.22, mu, 4.2, 4, loops)
			mb, _ := MassUp(m, 0.22, mu, 4.2, 4, loops)
			if d := relDiff(mb, 0.095); d > 1e-14 {
				t.Errorf("loops=%d μ=%g: mass round trip %.16g", loops, mu, mb)
			}
		}
	}
	if _, err := AlphaSDown(0.2, 4, 4, 4, 4); err == nil {
		t.Error("4-loop decoupling accepted")
	}
	if _, err := AlphaSDown(0.2, 4, -1, 4, 2); err == nil {
		t.Error("negative heavy mass accepted")
	}
}
