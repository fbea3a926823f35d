package expr

import (
	"math"
	"math/big"
	"testing"
)

func TestZetaValue(t *testing.T) {
	// ζ(2) = π²/6, ζ(4) = π⁴/90, ζ(6) = π⁶/945 (Abramowitz & Stegun 23.2.24).
	for k, w := range map[int]string{2: "1/6*pi^2", 4: "1/90*pi^4", 6: "1/945*pi^6", 3: "zeta3"} {
		if got := ZetaValue(k).String(); got != w {
			t.Errorf("zeta(%d) = %s, want %s", k, got, w)
		}
	}
}

// TestExpGammaSeries checks e^{γε}Γ(1+ε) to O(ε⁴) against the coefficients that follow from
// ln Γ(1+z) = −γz + Σ_{k≥2} (−1)^k ζ(k) z^k/k (Abramowitz & Stegun 6.1.33), expanded by hand:
// 1 + ζ2/2 ε² − ζ3/3 ε³ + (ζ4/4 + ζ2²/8) ε⁴ = 1 + π²/12 ε² − ζ3/3 ε³ + π⁴/160 ε⁴.
func TestExpGammaSeries(t *testing.T) {
	s, err := ExpGamma(1, big.NewRat(1, 1), 5)
	if err != nil {
		t.Fatal(err)
	}
	want := "1 + 1/12*pi^2*eps^2 - 1/3*zeta3*eps^3 + 1/160*pi^4*eps^4 + O(eps^5)"
	if got := s.String(); got != want {
		t.Errorf("e^{γε}Γ(1+ε) = %s\nwant %s", got, want)
	}
	// Γ(ε) e^{γε} = 1/ε + π²ε/12 + … (Γ(ε) = Γ(1+ε)/ε).
	s0, err := ExpGamma(0, big.NewRat(1, 1), 2)
	if err != nil {
		t.Fatal(err)
	}
	if got, want := s0.String(), "1/eps + 1/12*pi^2*eps + O(eps^2)"; got != want {
		t.Errorf("e^{γε}Γ(ε) = %s, want %s", got, want)
	}
	// Γ(−1+ε) e^{γε} = −1/ε − 1 − (1 + π²/12) ε + …: Γ(−1+ε) = Γ(1+ε)/((−1+ε) ε).
	sm, err := ExpGamma(-1, big.NewRat(1, 1), 1)
	if err != nil {
		t.Fatal(err)
	}
	if got, want := sm.String(), "-1/eps - 1 + O(eps)"; got != want {
		t.Errorf("e^{γε}Γ(−1+ε) = %s, want %s", got, want)
	}
}

func TestSeriesArithmetic(t *testing.T) {
	// 1/(d − 4) = −1/(2ε) exactly.
	x, _ := RFInt(1).Div(RFVar("d").Sub(RFInt(4)))
	s, err := SeriesFromRatFunc(x, 2)
	if err != nil {
		t.Fatal(err)
	}
	if got, want := s.String(), "-1/2/eps + O(eps^2)"; got != want {
		t.Errorf("1/(d-4) = %s, want %s", got, want)
	}
	// (d − 2)/(d − 1) at d = 4 − 2ε: (2 − 2ε)/(3 − 2ε) = 2/3 − 2/9 ε − 4/27 ε² + …
	y, _ := RFVar("d").Sub(RFInt(2)).Div(RFVar("d").Sub(RFInt(1)))
	s, err = SeriesFromRatFunc(y, 3)
	if err != nil {
		t.Fatal(err)
	}
	if got, want := s.String(), "2/3 - 2/9*eps - 4/27*eps^2 + O(eps^3)"; got != want {
		t.Errorf("(d-2)/(d-1) = %s, want %s", got, want)
	}
	// s · (1/s) = 1
	inv, err := s.Inv()
	if err != nil {
		t.Fatal(err)
	}
	one, _ := s.Mul(inv)
	if got := one.String(); got != "1 + O(eps^3)" {
		t.Errorf("s/s = %s", got)
	}
}

// TestExpGammaNumeric compares the truncated series of e^{γε}Γ(n+ε) with math.Gamma at small
// ε: the difference must be of the size of the first omitted term.
func TestExpGammaNumeric(t *testing.T) {
	const gammaE = 0.57721566490153286061 // Euler's constant (A&S 6.1.3)
	for _, n := range []int{-2, -1, 0, 1, 2, 3} {
		s, err := ExpGamma(n, big.NewRat(1, 1), 5)
		if err != nil {
			t.Fatal(err)
		}
		for _, eps := range []float64{1e-2, -3e-3} {
			var sum complex128
			for k := s.Lo; k < s.Order; k++ {
				c, err := s.Coef(k).Eval(nil)
				if err != nil {
					t.Fatal(err)
				}
				sum += c * complex(math.Pow(eps, float64(k)), 0)
			}
			want := math.Exp(gammaE*eps) * math.Gamma(float64(n)+eps)
			if d := math.Abs(real(sum) - want); d > 50*math.Pow(math.Abs(eps), 5)*math.Max(1, math.Abs(want)) {
				t.Errorf("n=%d eps=%g: series %.15g, Gamma %.15g (diff %.2g)", n, eps, real(sum), want, d)
			}
		}
	}
}
