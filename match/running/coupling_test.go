package running

import (
	"errors"
	"math"
	"testing"
)

// Quark masses used only as inputs of these checks (MS-bar m(m), GeV; common values); the
// charm and bottom thresholds sit at scaleFactor times their masses.
func smCoupling(scaleFactor float64) Coupling {
	return Coupling{
		AlphaS0: 0.118, Mu0: 91.1876, Nf0: 5, Loops: 4, MatchLoops: 3,
		Thresholds: []Threshold{
			{Nf: 4, Mass: 1.27, Scale: scaleFactor * 1.27},
			{Nf: 5, Mass: 4.18, Scale: scaleFactor * 4.18},
			{Nf: 6, Mass: 162.5},
		},
	}
}

// Ballpark values (common practice, no source; loose bands only): αs(m_b) ≈ 0.225,
// αs(2 GeV) ≈ 0.30 in the 4-flavour theory, αs(1 TeV) ≈ 0.089 with six flavours.
func TestCouplingBallpark(t *testing.T) {
	c := smCoupling(1)
	tests := []struct {
		mu, lo, hi float64
		nf         int
	}{
		{4.18, 0.220, 0.230, 5},
		{2, 0.290, 0.310, 4},
		{1000, 0.085, 0.092, 6},
	}
	for _, tc := range tests {
		if nf := c.NfAt(tc.mu); nf != tc.nf {
			t.Errorf("NfAt(%g) = %d, want %d", tc.mu, nf, tc.nf)
		}
		as, err := c.AlphaS(tc.mu)
		if err != nil {
			t.Fatal(err)
		}
		if as < tc.lo || as > tc.hi {
			t.Errorf("αs(%g) = %.5f outside [%g, %g]", tc.mu, as, tc.lo, tc.hi)
		}
	}
}

// Down across two thresholds and back up returns the start value (issue 8: 1e-10), also with
// threshold scales away from the masses (which needs m_h(μ_th) from the mass running).
func TestCouplingRoundTripAcrossThresholds(t *testing.T) {
	for _, k := range []float64{1, 0.5, 2} {
		for loops := 1; loops <= 4; loops++ {
			c := smCoupling(k)
			c.Loops, c.MatchLoops = loops, loops-1
			low := 1.6
			if k == 2 {
				low = 3 // the 4-flavour window is then [2.54, 8.36) GeV
			}
			as, err := c.AlphaS(low)
			if err != nil {
				t.Fatal(err)
			}
			back := Coupling{AlphaS0: as, Mu0: low, Nf0: c.NfAt(low), Loops: c.Loops, MatchLoops: c.MatchLoops, Thresholds: c.Thresholds}
			got, err := back.AlphaS(91.1876)
			if err != nil {
				t.Fatal(err)
			}
			if d := relDiff(got, 0.118); d > 1e-10 {
				t.Errorf("scale×%g, %d loops: back at MZ %.15g (rel %.2g)", k, loops, got, d)
			}
			m, err := c.Mass(0.093, 2.0, 91.1876)
			if err != nil {
				t.Fatal(err)
			}
			mb, err := c.Mass(m, 91.1876, 2.0)
			if err != nil {
				t.Fatal(err)
			}
			if d := relDiff(mb, 0.093); d > 1e-10 {
				t.Errorf("scale×%g, %d loops: mass round trip %.15g", k, loops, mb)
			}
		}
	}
}

// With 4-loop running and 3-loop matching the choice of the threshold scale (m_h/2 … 2m_h)
// moves αs below the thresholds by a few 1e-4 at most; with 2-loop running and 1-loop matching
// by a few 1e-3 (common practice, no source: the reason for matching to higher order).
func TestCouplingThresholdScaleDependence(t *testing.T) {
	spread := func(loops int) float64 {
		lo, hi := math.Inf(1), 0.0
		for _, k := range []float64{0.5, 1, 2} {
			c := smCoupling(k)
			c.Loops, c.MatchLoops = loops, loops-1
			as, err := c.AlphaSNf(3, 4)
			if err != nil {
				t.Fatal(err)
			}
			lo, hi = math.Min(lo, as), math.Max(hi, as)
		}
		return (hi - lo) / hi
	}
	s4, s2 := spread(4), spread(2)
	t.Logf("relative spread of αs^(4)(3 GeV): 2 loops %.3g, 4 loops %.3g", s2, s4)
	if s4 > 1e-3 || s4 > s2/5 {
		t.Errorf("threshold-scale spread %.3g (4 loops) vs %.3g (2 loops)", s4, s2)
	}
}

func TestCouplingErrors(t *testing.T) {
	bad := smCoupling(1)
	bad.Thresholds = []Threshold{{Nf: 5, Mass: 4.18}, {Nf: 6, Mass: 3}}
	if _, err := bad.AlphaS(10); err == nil {
		t.Error("misordered thresholds accepted")
	}
	out := smCoupling(1)
	out.Mu0 = 2 // inside the 4-flavour window but Nf0 = 5
	if _, err := out.AlphaS(10); err == nil {
		t.Error("μ0 outside the Nf0 window accepted")
	}
	c := smCoupling(1)
	if _, err := c.AlphaS(0.3); !errors.Is(err, ErrNonPerturbative) {
		t.Errorf("αs(0.3 GeV): %v", err)
	}
	c.MatchLoops = 4
	if _, err := c.AlphaS(10); err == nil {
		t.Error("4-loop matching accepted")
	}
}
