package running

import (
	"errors"
	"math"
	"math/big"
	"testing"

	"gonum.org/v1/gonum/mat"
)

// Published magic numbers of A.J. Buras, M. Misiak, M. Münz, S. Pokorski, Nucl. Phys. B424
// (1994) 374: a_i, h_i with the printed digits (tol = half a unit of the last printed digit;
// exact fractions to 1e-10). PHYSICS.md lists h = -0.0186 for a = -0.8994 (from memory); the
// table gives -0.0185498, whose printed rounding is -0.0185, the value remembered from the
// paper here, while all four exact fractions and the other decimals agree: -0.0185 is used.
var magic = []struct{ a, aTol, h, hTol float64 }{
	{14.0 / 23, 1e-10, 626126.0 / 272277, 1e-10},
	{16.0 / 23, 1e-10, -56281.0 / 51730, 1e-10},
	{6.0 / 23, 1e-10, -3.0 / 7, 1e-10},
	{-12.0 / 23, 1e-10, -1.0 / 14, 1e-10},
	{0.4086, 5e-5, -0.6494, 5e-5},
	{-0.4230, 5e-5, -0.0380, 5e-5},
	{-0.8994, 5e-5, -0.0185, 5e-5},
	{0.1456, 5e-5, -0.0057, 5e-5},
}

func TestMagicNumbers(t *testing.T) {
	// Both shipped tables, read through the notation.
	for _, name := range []string{"deltaf1_dipole_lo", "deltaf1_cmm_lo"} {
		g0 := ratMatrix(exactTable(t, name, 0, 3, 5))
		ev, err := Evolution{G0: g0, Nf: 5}.Prepare()
		if err != nil {
			t.Fatal(err)
		}
		a := ev.Eigenvalues()
		h, err := ev.Components(6, 1) // C7 at μ_b from C2 at μ_W
		if err != nil {
			t.Fatal(err)
		}
		used := map[int]bool{}
		for _, m := range magic {
			k := -1
			for i := range a {
				if !used[i] && (k < 0 || math.Abs(a[i]-m.a) < math.Abs(a[k]-m.a)) {
					k = i
				}
			}
			used[k] = true
			if math.Abs(a[k]-m.a) > m.aTol {
				t.Errorf("%s: a = %.6f, published %.6f", name, a[k], m.a)
			}
			if math.Abs(h[k]-m.h) > m.hTol {
				t.Errorf("%s: h(a=%.4f) = %.6f, published %.6f", name, m.a, h[k], m.h)
			}
		}
	}
}

// The shipped standard-basis table is the shipped Chetyrkin–Misiak–Münz table in the other
// basis: exactly γ_Q = R γ_P R⁻¹ (rational arithmetic), and its 6×6 block is the standard LO
// matrix of Buchalla–Buras–Lautenbacher (PHYSICS.md), remembered independently of the CMM one.
func TestBasisChange(t *testing.T) {
	R := stdFromCMM()
	P := exactTable(t, "deltaf1_cmm_lo", 0, 3, 5)
	Q := exactTable(t, "deltaf1_dipole_lo", 0, 3, 5)
	mul := func(a, b [][]*big.Rat) [][]*big.Rat {
		out := make([][]*big.Rat, len(a))
		for i := range a {
			out[i] = make([]*big.Rat, len(b[0]))
			for j := range b[0] {
				s := new(big.Rat)
				for k := range b {
					s.Add(s, new(big.Rat).Mul(a[i][k], b[k][j]))
				}
				out[i][j] = s
			}
		}
		return out
	}
	// γ_Q R = R γ_P avoids the inverse.
	lhs, rhs := mul(Q, R), mul(R, P)
	for i := range lhs {
		for j := range lhs[i] {
			if lhs[i][j].Cmp(rhs[i][j]) != 0 {
				t.Errorf("(γ_Q R)[%d][%d] = %s, (R γ_P) = %s", i+1, j+1, lhs[i][j].RatString(), rhs[i][j].RatString())
			}
		}
	}
	block := exactTable(t, "deltaf1_lo", 0, 3, 5)
	for i := 0; i < 6; i++ {
		for j := 0; j < 6; j++ {
			if Q[i][j].Cmp(block[i][j]) != 0 {
				t.Errorf("6×6 block [%d][%d]: %s vs %s", i+1, j+1, Q[i][j].RatString(), block[i][j].RatString())
			}
		}
	}
}

// twoLoop returns αs(μ) with nf = 5 and a 2-loop β from αs(μ0).
func twoLoop(t *testing.T, nf int, as0, mu0, mu float64) float64 {
	t.Helper()
	as, err := Beta{Nf: nf, Loops: 2}.AlphaS(as0, mu0, mu)
	if err != nil {
		t.Fatal(err)
	}
	return as
}

// LO evolution of C7 from μ_W = M_W to μ_b = 4.8 GeV with the Standard Model matching
// C7(μ_W) = −0.18578056, C8(μ_W) = −0.09426583 (x_t = 4, PHYSICS.md; Inami–Lim functions of
// A.J. Buras, hep-ph/9806471) and C2 = 1, against the magic-number formula of Buras, Misiak,
// Münz, Pokorski at the same η to 1e-4, and the enlargement of |C7| in the loose band of
// PHYSICS.md (common practice, no source: roughly 50 to 60 %, taken as 45 to 65 %; η^{16/23} ≈ 0.7).
func TestC7LOEvolution(t *testing.T) {
	const muW, muB = 80.4, 4.8
	c := Coupling{AlphaS0: 0.118, Mu0: 91.1876, Nf0: 5, Loops: 1}
	c0 := []float64{0, 1, 0, 0, 0, 0, -0.18578056, -0.09426583}
	got, err := Evolve(DeltaF1DipoleADM, c, LO, ProductForm, muW, muB, c0)
	if err != nil {
		t.Fatal(err)
	}
	asW, _ := c.AlphaS(muW)
	asB, _ := c.AlphaS(muB)
	eta := asW / asB
	want := math.Pow(eta, 16.0/23)*c0[6] + 8.0/3*(math.Pow(eta, 14.0/23)-math.Pow(eta, 16.0/23))*c0[7]
	for _, m := range magic {
		want += m.h * math.Pow(eta, m.a)
	}
	t.Logf("η = %.5f, η^(16/23) = %.4f, C7(μ_b) = %.6f (formula %.6f), ratio %.3f", eta, math.Pow(eta, 16.0/23), got[6], want, got[6]/c0[6])
	if math.Abs(got[6]-want) > 1e-4 {
		t.Errorf("C7(μ_b) = %.6f, magic-number formula %.6f", got[6], want)
	}
	if r := got[6] / c0[6]; r < 1.45 || r > 1.65 {
		t.Errorf("|C7| enlarged by a factor %.3f, outside the loose band 1.45 to 1.65", r)
	}
	if p := math.Pow(eta, 16.0/23); p < 0.65 || p > 0.75 {
		t.Errorf("η^(16/23) = %.3f", p)
	}
}

// LO: the closed form U0 solves the one-loop RGE exactly, so the direct integration agrees to
// the integrator's accuracy.
func TestLOAgainstNumeric(t *testing.T) {
	g0, _ := DeltaF1DipoleLO(5)
	e := Evolution{G0: g0, Nf: 5}
	ev, err := e.Prepare()
	if err != nil {
		t.Fatal(err)
	}
	c0 := []float64{0.1, 1, -0.01, 0.02, 0.003, -0.03, -0.19, -0.09}
	num, as, err := e.Numeric(LO, 0.108, 160, 4.8, c0)
	if err != nil {
		t.Fatal(err)
	}
	cf, err := ev.Apply(LO, as, 0.108, c0)
	if err != nil {
		t.Fatal(err)
	}
	for i := range cf {
		if math.Abs(cf[i]-num[i]) > 1e-10 {
			t.Errorf("C%d: closed form %.12f, numeric %.12f", i+1, cf[i], num[i])
		}
	}
}

// scaleForEta finds μ < μ0 with αs(μ) = αs(μ0)·η (2-loop running, nf fixed) by bisection.
func scaleForEta(t *testing.T, nf int, as0, mu0, eta float64) float64 {
	t.Helper()
	lo, hi := math.Log(1e-3), math.Log(mu0)
	for range 200 {
		mid := (lo + hi) / 2
		as, err := Beta{Nf: nf, Loops: 2}.AlphaS(as0, mu0, math.Exp(mid))
		if err != nil || as > as0*eta {
			lo = mid
		} else {
			hi = mid
		}
	}
	return math.Exp((lo + hi) / 2)
}

// syntheticG1 is a deterministic, non-symmetric stand-in for a two-loop matrix (no physics
// meaning) used where only the algebra of the NLO formulas is under test.
func syntheticG1(n int) *mat.Dense {
	m := mat.NewDense(n, n, nil)
	for i := 0; i < n; i++ {
		for j := 0; j < n; j++ {
			m.Set(i, j, 40*math.Sin(float64(3*i+7*j+1))+float64(10*(i-j)))
		}
	}
	return m
}

// nloDifference returns max_i |U C0 − C_numeric(μ)| at αs(μ0) = as0 and η = αs(μ0)/αs(μ) = 1/etaInv.
func nloDifference(t *testing.T, e Evolution, as0, etaInv float64, c0 []float64) float64 {
	t.Helper()
	mu := scaleForEta(t, e.Nf, as0, 1000, etaInv)
	num, as, err := e.Numeric(NLO, as0, 1000, mu, c0)
	if err != nil {
		t.Fatal(err)
	}
	ev, err := e.Prepare()
	if err != nil {
		t.Fatal(err)
	}
	cf, err := ev.Apply(NLO, as, as0, c0)
	if err != nil {
		t.Fatal(err)
	}
	d := 0.0
	for i := range cf {
		d = math.Max(d, math.Abs(cf[i]-num[i]))
	}
	return d
}

// NLO closed form against the direct numerical solution of the coupled RGE (issue 8): at fixed
// η = αs(μ0)/αs(μ) the difference is O(αs²), so halving αs divides it by about 4.
func TestNLOAgainstNumeric(t *testing.T) {
	curG0, curG1, _ := CurrentCurrent(3, 5)
	d0, d1, _ := DeltaF2(3, 5)
	g0, _ := DeltaF1DipoleLO(5)
	cases := []struct {
		name string
		e    Evolution
		c0   []float64
	}{
		{"current-current NDR", Evolution{G0: curG0, G1: curG1, Nf: 5}, []float64{0.2, 1}},
		{"ΔF=2 NDR", Evolution{G0: d0, G1: d1, Nf: 5}, []float64{1}},
		{"8×8 with synthetic γ1", Evolution{G0: g0, G1: syntheticG1(8), Nf: 5}, []float64{0.1, 1, -0.01, 0.02, 0.003, -0.03, -0.19, -0.09}},
		{"8×8 expanded form", Evolution{G0: g0, G1: syntheticG1(8), Nf: 5, Form: ExpandedForm}, []float64{0.1, 1, -0.01, 0.02, 0.003, -0.03, -0.19, -0.09}},
	}
	for _, tc := range cases {
		var prev float64
		for k, as0 := range []float64{0.1, 0.05, 0.025} {
			d := nloDifference(t, tc.e, as0, 1.6, tc.c0)
			if k > 0 {
				r := prev / d
				t.Logf("%s: αs(μ0) %.3f → %.3f: difference %.3g → %.3g, ratio %.2f", tc.name, 2*as0, as0, prev, d, r)
				if r < 3.3 || r > 4.8 {
					t.Errorf("%s: ratio %.2f, want about 4 (O(αs²))", tc.name, r)
				}
			}
			prev = d
		}
	}
}

// ΔF = 2: the powers of η and J_nf of the RG-invariant bag parameter,
// B̂ = B(μ) αs(μ)^{−γ0/(2β0)} [1 + αs(μ)/(4π) J_nf], against the values printed by A.J. Buras,
// hep-ph/9806471 (section on ε_K; J3 = 307/162, J4 = 6719/3750, J5 = 5165/3174; from memory).
func TestDeltaF2(t *testing.T) {
	tests := []struct {
		nf      int
		a, jval float64
	}{
		{3, 2.0 / 9, 307.0 / 162},
		{4, 6.0 / 25, 6719.0 / 3750},
		{5, 6.0 / 23, 5165.0 / 3174},
	}
	for _, tc := range tests {
		g0, g1, err := DeltaF2(3, tc.nf)
		if err != nil {
			t.Fatal(err)
		}
		ev, err := Evolution{G0: g0, G1: g1, Nf: tc.nf}.Prepare()
		if err != nil {
			t.Fatal(err)
		}
		if a := ev.Eigenvalues()[0]; math.Abs(a-tc.a) > 1e-14 {
			t.Errorf("nf=%d: power %.15f, want %.15f", tc.nf, a, tc.a)
		}
		j, err := ev.J()
		if err != nil {
			t.Fatal(err)
		}
		if math.Abs(j.At(0, 0)-tc.jval) > 1e-13 {
			t.Errorf("nf=%d: J = %.15f, want %.15f", tc.nf, j.At(0, 0), tc.jval)
		}
	}
}

// Across the b threshold the LO ΔF = 2 factor is the product of the textbook factors of the two
// flavour windows, [αs5(m_b)/αs5(μ0)]^{6/23} [αs4(μ)/αs4(m_b)]^{6/25} (A.J. Buras, hep-ph/9806471).
func TestEvolveAcrossThreshold(t *testing.T) {
	c := Coupling{AlphaS0: 0.118, Mu0: 91.1876, Nf0: 5, Loops: 2, MatchLoops: 1,
		Thresholds: []Threshold{{Nf: 5, Mass: 4.18}, {Nf: 6, Mass: 162.5}}}
	got, err := Evolve(DeltaF2ADM, c, LO, ProductForm, 150, 2, []float64{1})
	if err != nil {
		t.Fatal(err)
	}
	a5hi, _ := c.AlphaSNf(150, 5)
	a5b, _ := c.AlphaSNf(4.18, 5)
	a4b, _ := c.AlphaSNf(4.18, 4)
	a4lo, _ := c.AlphaSNf(2, 4)
	want := math.Pow(a5hi/a5b, 6.0/23) * math.Pow(a4b/a4lo, 6.0/25)
	if relDiff(got[0], want) > 1e-12 {
		t.Errorf("across m_b: %.15f, want %.15f", got[0], want)
	}
	// LO evolution is a group: upwards and back down is the identity.
	up, err := Evolve(DeltaF2ADM, c, LO, ProductForm, 2, 150, got)
	if err != nil {
		t.Fatal(err)
	}
	down, _ := Evolve(DeltaF2ADM, c, LO, ProductForm, 150, 2, up)
	if relDiff(down[0], got[0]) > 1e-12 {
		t.Errorf("LO up and down: %.15f vs %.15f", down[0], got[0])
	}
	// NLO across the threshold is the product of the two fixed-flavour NLO matrices, each with
	// the coupling of its own window at both ends (the NLO product form is not a group: a
	// round trip differs from 1 at O(αs²)).
	nlo, err := Evolve(DeltaF2ADM, c, NLO, ProductForm, 150, 2, []float64{1})
	if err != nil {
		t.Fatal(err)
	}
	seg := func(nf int, as, as0 float64) float64 {
		g0, g1, _ := DeltaF2(3, nf)
		ev, _ := Evolution{G0: g0, G1: g1, Nf: nf}.Prepare()
		u, _ := ev.Matrix(NLO, as, as0)
		return u.At(0, 0)
	}
	if w := seg(5, a5b, a5hi) * seg(4, a4lo, a4b); relDiff(nlo[0], w) > 1e-12 {
		t.Errorf("NLO across m_b: %.15f, product of windows %.15f", nlo[0], w)
	}
}

// A degenerate pair 2β0 + γi − γj = 0: the product form refuses with a DegenerateError, the
// expanded form uses the limiting formula, which is continuous in the splitting and agrees with
// the numerical solution to O(αs²).
func TestDegenerateEigenvalues(t *testing.T) {
	b0 := BetaCoeffs(5)[0]
	g0 := func(eps float64) *mat.Dense { return mat.NewDense(2, 2, []float64{1, 0, 0, 1 + 2*b0 + eps}) }
	g1 := mat.NewDense(2, 2, []float64{3, 25, -40, 7})
	_, err := Evolution{G0: g0(0), G1: g1, Nf: 5}.Prepare()
	if err != nil {
		t.Fatal(err)
	}
	ev, _ := Evolution{G0: g0(0), G1: g1, Nf: 5}.Prepare()
	var de *DegenerateError
	if _, err := ev.Matrix(NLO, 0.2, 0.1); !errors.As(err, &de) {
		t.Fatalf("product form at the degeneracy: %v", err)
	}
	exact, _ := Evolution{G0: g0(0), G1: g1, Nf: 5, Form: ExpandedForm}.Prepare()
	u0, err := exact.Matrix(NLO, 0.2, 0.1)
	if err != nil {
		t.Fatal(err)
	}
	for _, eps := range []float64{1e-3, 1e-6} {
		near, _ := Evolution{G0: g0(eps), G1: g1, Nf: 5, Form: ExpandedForm}.Prepare()
		u, _ := near.Matrix(NLO, 0.2, 0.1)
		var d mat.Dense
		d.Sub(u, u0)
		if n := mat.Norm(&d, math.Inf(1)); n > 10*eps {
			t.Errorf("ε = %g: expanded form jumps by %.3g", eps, n)
		}
	}
	var prev float64
	for k, as0 := range []float64{0.1, 0.05, 0.025} {
		d := nloDifference(t, Evolution{G0: g0(0), G1: g1, Nf: 5, Form: ExpandedForm}, as0, 1.6, []float64{1, 0.5})
		if k > 0 && (prev/d < 3.3 || prev/d > 4.8) {
			t.Errorf("degenerate expanded form vs numeric: ratio %.2f, want about 4", prev/d)
		}
		prev = d
	}
}

func TestEvolutionErrors(t *testing.T) {
	g, _ := DeltaF1DipoleLO(5)
	cases := []struct {
		name string
		f    func() error
	}{
		{"non-square", func() error { _, err := Evolution{G0: mat.NewDense(2, 3, nil), Nf: 5}.Prepare(); return err }},
		{"complex", func() error {
			_, err := Evolution{G0: mat.NewDense(2, 2, []float64{0, 1, -1, 0}), Nf: 5}.Prepare()
			return err
		}},
		{"defective", func() error {
			_, err := Evolution{G0: mat.NewDense(2, 2, []float64{1, 1, 0, 1}), Nf: 5}.Prepare()
			return err
		}},
		{"NaN", func() error {
			_, err := Evolution{G0: mat.NewDense(1, 1, []float64{math.NaN()}), Nf: 5}.Prepare()
			return err
		}},
		{"NLO without γ1", func() error {
			ev, _ := Evolution{G0: g, Nf: 5}.Prepare()
			_, err := ev.Matrix(NLO, 0.2, 0.1)
			return err
		}},
		{"length", func() error {
			ev, _ := Evolution{G0: g, Nf: 5}.Prepare()
			_, err := ev.Apply(LO, 0.2, 0.1, []float64{1})
			return err
		}},
		{"dipole nf=4", func() error { _, err := DeltaF1DipoleLO(4); return err }},
		{"NLO with 1-loop αs", func() error {
			_, err := Evolve(DeltaF2ADM, Coupling{AlphaS0: 0.118, Mu0: 91, Nf0: 5, Loops: 1}, NLO, ProductForm, 91, 5, []float64{1})
			return err
		}},
		{"order 3", func() error { ev, _ := Evolution{G0: g, Nf: 5}.Prepare(); _, err := ev.Matrix(3, 0.2, 0.1); return err }},
	}
	for _, tc := range cases {
		if err := tc.f(); err == nil {
			t.Errorf("%s: no error", tc.name)
		}
	}
}
