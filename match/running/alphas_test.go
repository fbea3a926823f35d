package running

import (
	"errors"
	"math"
	"testing"

	"gonum.org/v1/gonum/integrate/quad"
)

func relDiff(a, b float64) float64 { return math.Abs(a-b) / math.Max(math.Abs(b), 1e-300) }

// The β and γm coefficients against the decimals quoted with the original papers (αs/π
// convention, i.e. divided by 4^{i+1}): β3 = 114.23 − 27.134 nf + 1.5824 nf² + 0.005857 nf³
// (T. van Ritbergen, J.A.M. Vermaseren, S.A. Larin, PLB 400 (1997) 379) and
// γm3 = 98.9434 − 19.1075 nf + 0.276163 nf² + 0.00579322 nf³ (K.G. Chetyrkin, PLB 404 (1997)
// 161). From memory; the rational forms in beta.go were written independently.
func TestCoefficientDecimals(t *testing.T) {
	poly := func(f func(int) float64) [4]float64 {
		// Fit the cubic in nf through nf = 0..3 exactly (Newton differences).
		y := [4]float64{f(0), f(1), f(2), f(3)}
		d1 := [3]float64{y[1] - y[0], y[2] - y[1], y[3] - y[2]}
		d2 := [2]float64{d1[1] - d1[0], d1[2] - d1[1]}
		d3 := d2[1] - d2[0]
		c3 := d3 / 6
		c2 := d2[0]/2 - 3*c3
		c1 := d1[0] - c2 - c3
		return [4]float64{y[0], c1, c2, c3}
	}
	tests := []struct {
		name string
		got  [4]float64
		want [4]float64
		tol  [4]float64
	}{
		{"beta3", poly(func(n int) float64 { return BetaCoeffs(n)[3] / 256 }),
			[4]float64{114.23, -27.134, 1.5824, 0.005857}, [4]float64{0.005, 0.0005, 0.00005, 0.000001}},
		{"gammam3", poly(func(n int) float64 { return MassGammaCoeffs(n)[3] / 256 }),
			[4]float64{98.9434, -19.1075, 0.276163, 0.00579322}, [4]float64{0.00005, 0.00005, 0.0000005, 0.000000005}},
		{"beta2", poly(func(n int) float64 { return BetaCoeffs(n)[2] / 64 }),
			[4]float64{22.3203, -4.36892, 0.0940394, 0}, [4]float64{0.00005, 0.000005, 0.0000005, 1e-12}},
	}
	for _, tc := range tests {
		for i := range tc.want {
			if math.Abs(tc.got[i]-tc.want[i]) > tc.tol[i] {
				t.Errorf("%s nf^%d: got %.8g, want %.8g", tc.name, i, tc.got[i], tc.want[i])
			}
		}
	}
}

// One-loop numerical integration against the closed form (issue 8: 1e-12).
func TestAlphaS1LoopNumericVsClosedForm(t *testing.T) {
	tests := []struct {
		nf           int
		as0, mu0, mu float64
	}{
		{5, 0.118, 91.1876, 4.8},
		{5, 0.118, 91.1876, 1000},
		{5, 0.118, 91.1876, 1e16},
		{4, 0.2, 4.8, 1.5},
		{3, 0.3, 1.5, 1.0},
		{6, 0.108, 173, 3000},
		{0, 0.1, 100, 10},
	}
	for _, tc := range tests {
		num, err := Beta{Nf: tc.nf, Loops: 1}.AlphaS(tc.as0, tc.mu0, tc.mu)
		if err != nil {
			t.Fatal(err)
		}
		cf, err := AlphaS1Loop(tc.nf, tc.as0, tc.mu0, tc.mu)
		if err != nil {
			t.Fatal(err)
		}
		if d := relDiff(num, cf); d > 1e-12 {
			t.Errorf("nf=%d %g→%g GeV: numeric %.16g closed %.16g (rel %.2g)", tc.nf, tc.mu0, tc.mu, num, cf, d)
		}
	}
}

// Running up and back down returns the start value (issue 8: 1e-10), all loop orders.
func TestAlphaSUpAndDown(t *testing.T) {
	for loops := 1; loops <= 4; loops++ {
		for _, mu := range []float64{2, 4.8, 1e3, 1e10} {
			b := Beta{Nf: 5, Loops: loops}
			as, err := b.AlphaS(0.118, 91.1876, mu)
			if err != nil {
				t.Fatal(err)
			}
			back, err := b.AlphaS(as, mu, 91.1876)
			if err != nil {
				t.Fatal(err)
			}
			if d := relDiff(back, 0.118); d > 1e-10 {
				t.Errorf("%d loops via %g GeV: back %.15g (rel %.2g)", loops, mu, back, d)
			}
		}
	}
}

// implicitLnMu2OverLambda2 is the exact solution of the truncated RGE written as
// ln(μ²/Λ²) = 1/(b0 α) + (b1/b0²) ln(b0 α) − ∫_0^α dx [1/(x²B(x)) − 1/(b0 x²) + b1/(b0² x)],
// B = b0 + b1 x + b2 x² + b3 x³, b_i = β_i/(4π)^{i+1}: an integral, not an ODE, evaluated with
// gonum's Gauss–Legendre quadrature. The constant is the MS-bar convention for Λ, the one the
// asymptotic expansion of the PDG review inverts.
func implicitLnMu2OverLambda2(nf int, as float64) float64 {
	c := BetaCoeffs(nf)
	var b [4]float64
	for i := range b {
		b[i] = c[i] / math.Pow(4*math.Pi, float64(i+1))
	}
	g := func(x float64) float64 {
		if x == 0 {
			return b[1]*b[1]/(b[0]*b[0]*b[0]) - b[2]/(b[0]*b[0])
		}
		B := b[0] + x*(b[1]+x*(b[2]+x*b[3]))
		// 1/(x²B) − 1/(b0x²) + b1/(b0²x) = (b0 − B)/(x² b0 B) + b1/(b0² x), written to avoid cancellation
		return -(b[1]+x*(b[2]+x*b[3]))/(x*b[0]*B) + b[1]/(b[0]*b[0]*x)
	}
	integral := quad.Fixed(g, 0, as, 40, nil, 0)
	return 1/(b[0]*as) + b[1]/(b[0]*b[0])*math.Log(b[0]*as) - integral
}

// alphaSImplicit inverts implicitLnMu2OverLambda2 by bisection in αs.
func alphaSImplicit(nf int, lambda, mu float64) float64 {
	target := 2 * math.Log(mu/lambda)
	lo, hi := 1e-4, 0.9
	for range 200 {
		mid := (lo + hi) / 2
		if implicitLnMu2OverLambda2(nf, mid) > target {
			lo = mid
		} else {
			hi = mid
		}
	}
	return (lo + hi) / 2
}

// Four-loop running against (a) the exact implicit solution by quadrature, to 1e-10, and
// (b) the asymptotic Λ-expansion of the PDG review, to its truncation accuracy: the difference
// must stay well below the size of the expansion's 4-loop term (measured without accidental
// cancellations, as the sum of the moduli of its pieces) at every scale, and that ratio must
// fall below 0.02 at 10⁸ GeV (the omitted terms are down by a further ln t/t). Control: the same
// expansion without its β3 piece stays near 0.1 there, so the check sees β3.
func TestAlphaSFourLoopVsLambda(t *testing.T) {
	const nf, lambda = 5, 0.21
	start := 1e12
	as0 := alphaSImplicit(nf, lambda, start)
	b := lambdaB(BetaCoeffs(nf))
	noB3 := b
	noB3[3] = 0
	var last, lastCtrl float64
	for _, mu := range []float64{30, 91.1876, 1e3, 1e5, 1e8} {
		num, err := Beta{Nf: nf, Loops: 4}.AlphaS(as0, start, mu)
		if err != nil {
			t.Fatal(err)
		}
		exact := alphaSImplicit(nf, lambda, mu)
		if d := relDiff(num, exact); d > 1e-10 {
			t.Errorf("μ=%g: ODE %.15g vs quadrature %.15g (rel %.2g)", mu, num, exact, d)
		}
		exp4, err := AlphaSLambda(nf, 4, lambda, mu)
		if err != nil {
			t.Fatal(err)
		}
		tt := 2 * math.Log(mu/lambda)
		lt := math.Log(tt)
		envelope := (math.Abs(b[1]*b[1]*b[1]*(lt*lt*lt-2.5*lt*lt-2*lt+0.5)) + math.Abs(3*b[0]*b[1]*b[2]*lt) +
			math.Abs(0.5*b[0]*b[0]*b[3])) / (math.Pow(b[0], 7) * math.Pow(tt, 4))
		ratio := math.Abs(exp4-num) / envelope
		ctrl := math.Abs(lambdaExpansion(noB3, 4, tt)-num) / envelope
		t.Logf("μ=%8g αs=%.10f |expansion − RGE| = %.3g = %.3g × 4-loop term (without β3: %.3g ×)", mu, num, math.Abs(exp4-num), ratio, ctrl)
		if ratio > 0.15 {
			t.Errorf("μ=%g: expansion misses by %.3g of its last term", mu, ratio)
		}
		last, lastCtrl = ratio, ctrl
	}
	if last > 0.02 {
		t.Errorf("truncation ratio at 1e8 GeV is %.3g: did not fall", last)
	}
	if lastCtrl < 0.05 {
		t.Errorf("control without β3 gives %.3g at 1e8 GeV: the check is blind", lastCtrl)
	}
}

func TestMassRun1LoopAndRoundTrip(t *testing.T) {
	tests := []struct {
		nf               int
		m0, as0, mu0, mu float64
	}{
		{5, 4.18, 0.2253, 4.18, 91.1876},
		{4, 1.27, 0.38, 1.27, 4.18},
		{6, 163, 0.1088, 163, 1000},
	}
	for _, tc := range tests {
		num, err := Beta{Nf: tc.nf, Loops: 1}.MassRun(tc.m0, tc.as0, tc.mu0, tc.mu)
		if err != nil {
			t.Fatal(err)
		}
		cf, err := MassRun1Loop(tc.nf, tc.m0, tc.as0, tc.mu0, tc.mu)
		if err != nil {
			t.Fatal(err)
		}
		if d := relDiff(num, cf); d > 1e-12 {
			t.Errorf("one loop nf=%d: numeric %.15g closed %.15g (rel %.2g)", tc.nf, num, cf, d)
		}
		b := Beta{Nf: tc.nf, Loops: 4}
		m1, err := b.MassRun(tc.m0, tc.as0, tc.mu0, tc.mu)
		if err != nil {
			t.Fatal(err)
		}
		as1, _ := b.AlphaS(tc.as0, tc.mu0, tc.mu)
		back, err := b.MassRun(m1, as1, tc.mu, tc.mu0)
		if err != nil {
			t.Fatal(err)
		}
		if d := relDiff(back, tc.m0); d > 1e-10 {
			t.Errorf("4 loops round trip: %.15g vs %.15g", back, tc.m0)
		}
	}
}

// The 4-loop running of m_b from m_b(m_b) = 4.18 GeV with nf = 5 must lie below the 1-loop
// value by a few per cent at MZ (higher orders slow the running down: common practice, no
// source; loose bound only) and agree with the invariant-mass form at one loop.
func TestMassRunOrdering(t *testing.T) {
	as0, err := Beta{Nf: 5, Loops: 4}.AlphaS(0.118, 91.1876, 4.18)
	if err != nil {
		t.Fatal(err)
	}
	m4, _ := Beta{Nf: 5, Loops: 4}.MassRun(4.18, as0, 4.18, 91.1876)
	m1, _ := Beta{Nf: 5, Loops: 1}.MassRun(4.18, as0, 4.18, 91.1876)
	if !(m4 > 2.7 && m4 < 3.0) || !(m4 < m1) {
		t.Errorf("m_b(MZ): 4 loops %.4f, 1 loop %.4f GeV", m4, m1)
	}
}

func TestRunningErrors(t *testing.T) {
	b := Beta{Nf: 5, Loops: 4}
	cases := []struct {
		name    string
		f       func() error
		nonPert bool
	}{
		{"mu zero", func() error { _, err := b.AlphaS(0.118, 91, 0); return err }, false},
		{"mu negative", func() error { _, err := b.AlphaS(0.118, -1, 10); return err }, false},
		{"alpha negative", func() error { _, err := b.AlphaS(-0.1, 91, 10); return err }, false},
		{"alpha NaN", func() error { _, err := b.AlphaS(math.NaN(), 91, 10); return err }, false},
		{"loops 5", func() error { _, err := Beta{Nf: 5, Loops: 5}.AlphaS(0.118, 91, 10); return err }, false},
		{"nf 7", func() error { _, err := Beta{Nf: 7, Loops: 2}.AlphaS(0.118, 91, 10); return err }, false},
		{"Landau numeric", func() error { _, err := b.AlphaS(0.118, 91.1876, 0.2); return err }, true},
		{"Landau one loop", func() error { _, err := AlphaS1Loop(5, 0.118, 91.1876, 0.05); return err }, true},
		{"Landau numeric 1 loop", func() error { _, err := Beta{Nf: 5, Loops: 1}.AlphaS(0.118, 91.1876, 0.05); return err }, true},
		{"below Lambda", func() error { _, err := AlphaSLambda(5, 4, 0.2, 0.1); return err }, true},
		{"mass zero", func() error { _, err := b.MassRun(0, 0.118, 91, 10); return err }, false},
	}
	for _, tc := range cases {
		err := tc.f()
		if err == nil {
			t.Errorf("%s: no error", tc.name)
			continue
		}
		if tc.nonPert != errors.Is(err, ErrNonPerturbative) {
			t.Errorf("%s: %v (non-perturbative %v expected)", tc.name, err, tc.nonPert)
		}
	}
}
