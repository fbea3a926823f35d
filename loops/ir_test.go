package loops

import (
	"math"
	"math/big"
	"math/cmplx"
	"testing"

	"gonum.org/v1/gonum/mat"
)

// laurentFromSamples fits ε²·I(ε) = c0 + c1 ε + c2 ε² + … through samples at negative ε (where the
// infrared-divergent parametric integrals converge) and returns (c0, c1, c2) = (Pole2, Pole1,
// Finite). The linear algebra uses gonum.
func laurentFromSamples(eps []float64, vals []complex128) (complex128, complex128, complex128) {
	n := len(eps)
	sc := 0.0
	for _, e := range eps {
		sc = math.Max(sc, math.Abs(e))
	}
	A := mat.NewDense(n, n, nil)
	for i, e := range eps {
		for j := 0; j < n; j++ {
			A.Set(i, j, math.Pow(e/sc, float64(j))) // scaled variable ε/sc
		}
	}
	solve := func(part func(complex128) float64) []float64 {
		b := mat.NewVecDense(n, nil)
		for i, v := range vals {
			b.SetVec(i, part(v)*eps[i]*eps[i])
		}
		var x mat.VecDense
		if err := x.SolveVec(A, b); err != nil {
			panic(err)
		}
		return x.RawVector().Data
	}
	re := solve(func(z complex128) float64 { return real(z) })
	im := solve(func(z complex128) float64 { return imag(z) })
	return complex(re[0], im[0]), complex(re[1], im[1]) / complex(sc, 0), complex(re[2], im[2]) / complex(sc*sc, 0)
}

var irEps = []float64{-0.03, -0.04, -0.05, -0.06, -0.07, -0.08, -0.09, -0.10, -0.11, -0.12}

// irEpsExact are the sample points for closed forms exact in ε (no quadrature noise).
var irEpsExact = []float64{-0.002, -0.004, -0.006, -0.008, -0.010, -0.012, -0.014, -0.016, -0.018, -0.020}

// normC0 is the normalisation −e^{γε}Γ(1+ε) of the triangle's parametric integral.
func normC0(e float64) float64 { return -math.Exp(0.5772156649015329*e) * math.Gamma(1+e) }

// powerGauss integrates f over [0,1]² after u = z1^{1/p1}, v = z2^{1/p2} (p = 1 leaves a variable
// alone), which turns integrable endpoint powers u^{p−1}… into smooth integrands.
func powerGauss(f func(u, v float64) float64, p1, p2 float64, n int) float64 {
	x, w := testGauss(n)
	s := 0.0
	for i := 0; i < n; i++ {
		u := math.Pow(x[i], 1/p1)
		ju := math.Pow(x[i], 1/p1-1) / p1
		for j := 0; j < n; j++ {
			v := math.Pow(x[j], 1/p2)
			jv := math.Pow(x[j], 1/p2-1) / p2
			s += w[i] * w[j] * ju * jv * f(u, v)
		}
	}
	return s
}

// TestC0CollinearNumerical checks the collinear triangles (two massless lines around a light-like
// leg, third mass M) against the d-dimensional parametric integral C0 = −e^{γε}Γ(1+ε)∫F^{−1−ε},
// evaluated numerically at nine negative ε and fitted. With x_c = u, x_a = (1−u)v, x_b = (1−u)(1−v):
// F = u G, G = (1−u)(al v + be (1−v)) + M² u; for al = 0 the corner u = v = 0 is split into the sectors
// u = v s and v = u s.
func TestC0CollinearNumerical(t *testing.T) {
	type cs struct{ M2, sac, sbc float64 }
	for _, c := range []cs{{2, -1, -3}, {1, 0.3, -2}, {3, -1, -1}, {1.5, 1.5, -2}, {1, 1, 1}} {
		al, be := c.M2-c.sac, c.M2-c.sbc
		var vals []complex128
		eps := irEps
		if al == 0 && be == 0 {
			eps = irEpsExact
		}
		for _, e := range eps {
			k := -e
			var I float64
			switch {
			case al != 0 && be != 0:
				f := func(u, v float64) float64 {
					G := (1-u)*(al*v+be*(1-v)) + c.M2*u
					return (1 - u) * math.Pow(u, -1-e) * math.Pow(G, -1-e)
				}
				// u^{−1−ε} du with u = z^{1/k} becomes (1/k) dz: smooth
				I = powerGauss(f, k, 1, 60)
			case al == 0 && be != 0:
				// sector I: v ≥ u, u = v s: (1 − v s) v^{−1−2ε} s^{−1−ε} H1^{−1−ε}, H1 = be(1 − v s) + M² s
				f1 := func(v, s float64) float64 {
					H := be*(1-v*s) + c.M2*s
					return (1 - v*s) * math.Pow(v, -1-2*e) * math.Pow(s, -1-e) * math.Pow(H, -1-e)
				}
				// sector II: u ≥ v, v = u s: (1 − u) u^{−1−2ε} H2^{−1−ε}, H2 = be(1 − u)s + M²
				f2 := func(u, s float64) float64 {
					H := be*(1-u)*s + c.M2
					return (1 - u) * math.Pow(u, -1-2*e) * math.Pow(H, -1-e)
				}
				I = powerGauss(f1, 2*k, k, 60) + powerGauss(f2, 2*k, 1, 60)
			default:
				// al = be = 0: F = M² x_c², ∫ x_c^{−2−2ε} = 1/(2ε) − 1/(1+2ε) over the simplex
				I = math.Pow(c.M2, -1-e) * (1/(2*e) - 1/(1+2*e))
			}
			vals = append(vals, complex(normC0(e)*I, 0))
		}
		p2, p1, f0 := laurentFromSamples(eps, vals)
		v, err := C0(0, c.sbc, c.sac, 0, 0, c.M2, 1) // lines a=0, b=1 massless, c=2: s01=0, s12=s_bc, s02=s_ac
		if err != nil {
			t.Fatal(err)
		}
		for _, p := range []struct {
			name      string
			got, want complex128
		}{{"1/ε²", v.Pole2, p2}, {"1/ε", v.Pole1, p1}, {"finite", v.Finite, f0}} {
			if cmplx.Abs(p.got-p.want) > 1e-7*(1+cmplx.Abs(p.want)) {
				t.Errorf("C0(0,%g,%g; 0,0,%g) %s = %v, numerical %v", c.sbc, c.sac, c.M2, p.name, p.got, p.want)
			}
		}
	}
}

// TestC0MasslessExact checks the triangles with three massless lines against their exact
// d-dimensional forms (Dirichlet integrals, derived in docs/INTEGRALS.md), expanded numerically:
// one light-like leg: −e^{γε}Γ(1+ε) Γ(−ε)Γ(1−ε)/Γ(1−2ε) (al^{−ε} − be^{−ε})/(−ε(al − be)),
// two light-like legs: e^{γε}Γ(1+ε)Γ(1−ε)²/Γ(1−2ε) (−s)^{−ε}/(s ε²).
// The same results are in R.K. Ellis, G. Zanderighi, JHEP 0802 (2008) 002, section 4 (triangles
// 1 and 2, in their r_Γ normalisation; quoted from memory, equation numbers not checked).
func TestC0MasslessExact(t *testing.T) {
	g := func(x float64) float64 { return math.Gamma(x) }
	for _, c := range [][2]float64{{-1, -3}, {-2, -0.5}, {-4, -4.5}} {
		s12, s02 := c[0], c[1] // s01 = 0
		al, be := -s02, -s12
		var vals []complex128
		for _, e := range irEpsExact {
			pref := -math.Exp(0.5772156649015329*e) * g(1+e) * g(-e) * g(1-e) / g(1-2*e)
			vals = append(vals, complex(pref*(math.Pow(al, -e)-math.Pow(be, -e))/(-e*(al-be)), 0))
		}
		p2, p1, f0 := laurentFromSamples(irEpsExact, vals)
		v, _ := C0(0, s12, s02, 0, 0, 0, 1)
		if cmplx.Abs(v.Pole2-p2) > 1e-8 || cmplx.Abs(v.Pole1-p1) > 1e-8 || cmplx.Abs(v.Finite-f0) > 1e-7 {
			t.Errorf("C0(0,%g,%g;0,0,0) = %v, exact form gives %v %v %v", s12, s02, v, p2, p1, f0)
		}
	}
	for _, s := range []float64{-2, -0.3} {
		var vals []complex128
		for _, e := range irEpsExact {
			pref := math.Exp(0.5772156649015329*e) * g(1+e) * g(1-e) * g(1-e) / g(1-2*e)
			vals = append(vals, complex(pref*math.Pow(-s, -e)/(s*e*e), 0))
		}
		p2, p1, f0 := laurentFromSamples(irEpsExact, vals)
		v, _ := C0(0, 0, s, 0, 0, 0, 1)
		tol := 1e-7 * (1 + cmplx.Abs(p2) + cmplx.Abs(p1))
		if cmplx.Abs(v.Pole2-p2) > tol || cmplx.Abs(v.Pole1-p1) > tol || cmplx.Abs(v.Finite-f0) > tol {
			t.Errorf("C0(0,0,%g;0,0,0) = %v, exact form gives %v %v %v", s, v, p2, p1, f0)
		}
	}
	// physical region: C0(0,0,s) for s > 0 continues (−s)^{−ε} → |s|^{−ε} e^{iπε}
	v, _ := C0(0, 0, 2, 0, 0, 0, 1)
	L := complex(math.Log(2), -math.Pi)
	want := (0.5*L*L - complex(math.Pi*math.Pi/12, 0)) / 2
	if cmplx.Abs(v.Finite-want) > 1e-14 {
		t.Errorf("C0(0,0,2;0,0,0) finite = %v, want %v", v.Finite, want)
	}
}

// TestC0SoftMassRegulator checks the soft triangles (one massless line between on-shell legs)
// against the finite general C0 with a small mass λ on that line: for a soft singularity with
// massive emitters, ln λ² replaces 1/ε + ln μ² (the soft region gives ½∫dy/Q · ln(Q/λ²)), so
// C0(λ) = Finite(μ² = λ²) + O(λ² ln²λ). The two sides share no code beyond Li2.
func TestC0SoftMassRegulator(t *testing.T) {
	for _, c := range [][3]float64{{1, 2.25, -2}, {1, 1.44, 0.5}, {1, 4, 12}, {0.09, 1, 0.5}, {1, 1, 0}, {1, 4, 9.5}} {
		mb2, mc2, s := c[0], c[1], c[2]
		const l2 = 1e-20
		reg, err := C0(mb2, s, mc2, l2, mb2, mc2, 1) // lines 0 (massless), 1 (mb), 2 (mc)
		if err != nil {
			t.Fatal(err)
		}
		dr, err := C0(mb2, s, mc2, 0, mb2, mc2, l2)
		if err != nil {
			t.Fatal(err)
		}
		if dr.Pole2 != 0 {
			t.Errorf("soft C0 has a double pole %v", dr.Pole2)
		}
		if d := cmplx.Abs(reg.Finite - dr.Finite); d > 1e-11*cmplx.Abs(dr.Finite) {
			t.Errorf("soft C0(%g,%g,%g; 0,%g,%g): regulated %v, dim. reg. at μ² = λ² %v (rel. %.2g)",
				mb2, s, mc2, mb2, mc2, reg.Finite, dr.Finite, d/cmplx.Abs(dr.Finite))
		}
	}
}

// TestB0PrimeInfrared checks B0′(m²; 0, m) in dimensional regularisation against B0′ with a small
// photon mass λ, −(1 + ½ ln(λ²/m²))/m² at λ → 0 (same dictionary as above), computed by the finite code.
func TestB0PrimeInfrared(t *testing.T) {
	for _, m2 := range []float64{1, 4, 0.3} {
		dr, _ := B0Prime(m2, 0, m2, 1e-14)
		reg, err := B0Prime(m2, 1e-14, m2, 1)
		if err != nil {
			t.Fatal(err)
		}
		if d := cmplx.Abs(reg.Finite - dr.Finite); d > 1e-6*cmplx.Abs(dr.Finite) {
			t.Errorf("B0′(%g; λ, m) = %v, dim. reg. at μ² = λ² %v", m2, reg.Finite, dr.Finite)
		}
		if real(dr.Pole1) != -0.5/m2 {
			t.Errorf("B0′ pole = %v", dr.Pole1)
		}
	}
}

// TestD0InfraredPartialFractions checks infrared-divergent boxes at p1 = 0, where
// D0 = [C0(lines 0,2,3) − C0(lines 1,2,3)]/(m0² − m1²) (partial fractions of N0 N1), against the
// triangle formulas: soft line 3 (neighbours 2 and 0 on-shell), and the collinear pair (2, 3) with
// and without soft ends. The box goes through the subtraction method, the right side through
// the triangle formulas.
func TestD0InfraredPartialFractions(t *testing.T) {
	type cs struct{ s02, s03, m0, m1, m2, m3 float64 }
	cases := []cs{
		{-2, 1, 1, 1.3, 1.5, 0},  // soft at 3: s23 = m2² set below, s03 = m0²
		{3, 1, 1, 0.7, 1.2, 0},   // soft, physical s02
		{20, 1, 1, 2, 1.5, 0},    // soft, above threshold
		{-2, -3, 1, 1.4, 0, 0},   // collinear (2,3) only
		{-2, 1, 1, 1.4, 0, 0},    // collinear + soft at 3 (s03 = m0²)
		{1.96, -3, 1, 1.4, 0, 0}, // collinear + soft at 2 (s12 = s02 = m1²)
		{5, 7, 1, 1.4, 0, 0},     // collinear, physical
	}
	for _, c := range cases {
		s23 := c.m2 * c.m2
		if c.m2 == 0 {
			s23 = 0
		}
		m02, m12, m22, m32 := c.m0*c.m0, c.m1*c.m1, c.m2*c.m2, c.m3*c.m3
		d, err := D0(0, c.s02, s23, c.s03, c.s02, c.s03, m02, m12, m22, m32, 1)
		if err != nil {
			t.Errorf("%+v: %v", c, err)
			continue
		}
		ca, err1 := C0(c.s02, s23, c.s03, m02, m22, m32, 1)
		cb, err2 := C0(c.s02, s23, c.s03, m12, m22, m32, 1)
		if err1 != nil || err2 != nil {
			t.Fatal(err1, err2)
		}
		k := complex(1/(m02-m12), 0)
		want := Value{(ca.Pole2 - cb.Pole2) * k, (ca.Pole1 - cb.Pole1) * k, (ca.Finite - cb.Finite) * k}
		for _, p := range [][2]complex128{{d.Pole2, want.Pole2}, {d.Pole1, want.Pole1}, {d.Finite, want.Finite}} {
			if cmplx.Abs(p[0]-p[1]) > 1e-10*(cmplx.Abs(p[1])+cmplx.Abs(want.Finite)) {
				t.Errorf("D0 at %+v = %v, partial fractions %v", c, d, want)
				break
			}
		}
	}
}

// TestD0InfraredSymmetry checks divergent boxes (one soft line; two opposite soft lines; a
// collinear pair with soft ends) under the dihedral relabellings, the μ dependence
// F(μ′) = F(μ) + P1 L + P2 L²/2 (L = ln(μ²/μ′²)), the independence of the regulator λ, and the
// agreement with the arbitrary-precision path.
func TestD0InfraredSymmetry(t *testing.T) {
	boxes := []box{
		newBox(1, -2, -1, 1.44, -3, -0.5, 0, 1, 2.25, 1.44), // soft line 0
		newBox(1, 1, 2.25, 2.25, -3, 5, 0, 1, 0, 2.25),      // soft lines 0 and 2
		newBox(0, 1, -2, 1, 6, -1.5, 0, 0, 1, 1.69),         // collinear (0,1), soft at 0 and 1? s03=m3²? no
		newBox(0, 1, -2, 1.69, -4, -1.5, 0, 0, 1, 1.69),     // collinear (0,1), soft at 0 (s03 = m3²)
		newBox(0, 1, 3, 1.69, 30, -1.5, 0, 0, 1, 1.69),      // collinear, soft at 0 and 1, physical
	}
	for _, b := range boxes {
		ref, err := d0Of(b)
		if err != nil {
			t.Errorf("%+v: %v", b, err)
			continue
		}
		for _, p := range perms4[1:] {
			v, err := d0Of(permBox(b, p))
			if err != nil {
				t.Errorf("%+v %v: %v", b, p, err)
				continue
			}
			if cmplx.Abs(v.Finite-ref.Finite)+cmplx.Abs(v.Pole1-ref.Pole1)+cmplx.Abs(v.Pole2-ref.Pole2) > 1e-10*(cmplx.Abs(ref.Finite)+cmplx.Abs(ref.Pole1)) {
				t.Errorf("D0 at %+v: perm %v gives %v, identity %v", b, p, v, ref)
			}
		}
		const mu2 = 3.7
		vm, _ := D0(b.s[0][1], b.s[1][2], b.s[2][3], b.s[0][3], b.s[0][2], b.s[1][3], b.m2[0], b.m2[1], b.m2[2], b.m2[3], mu2)
		L := complex(math.Log(mu2), 0)
		want := ref.Finite + ref.Pole1*L + ref.Pole2*L*L/2
		if cmplx.Abs(vm.Finite-want) > 1e-11*(cmplx.Abs(want)+1) {
			t.Errorf("D0 μ dependence at %+v: %v, want %v", b, vm.Finite, want)
		}
		f := big.NewFloat
		bv, err := D0Big(f(b.s[0][1]), f(b.s[1][2]), f(b.s[2][3]), f(b.s[0][3]), f(b.s[0][2]), f(b.s[1][3]), f(b.m2[0]), f(b.m2[1]), f(b.m2[2]), f(b.m2[3]), f(1), 64)
		if err != nil {
			t.Fatal(err)
		}
		if d := cmplx.Abs(bv.Finite.Complex128() - ref.Finite); d > 1e-11*(cmplx.Abs(ref.Finite)+cmplx.Abs(ref.Pole1)) {
			t.Errorf("D0 at %+v: float64 %v, big %v", b, ref, bv.Value())
		}
	}
}

// TestC0InfraredRelabelling checks divergent triangles (soft, collinear with and without soft ends,
// massless) at Euclidean and physical points under the six relabellings of their lines, their μ
// dependence F(μ′) = F(μ) + P1 L + P2 L²/2 (L = ln(μ²/μ′²)), and the agreement with the
// arbitrary-precision path.
func TestC0InfraredRelabelling(t *testing.T) {
	tris := []tri{
		newTri(1, -0.5, 2.25, 0, 1, 2.25), // soft, Euclidean third leg
		newTri(1, 7, 2.25, 0, 1, 2.25),    // soft, above threshold
		newTri(0, -2, -3, 0, 0, 1),        // collinear
		newTri(0, 5, 0.3, 0, 0, 1),        // collinear, physical
		newTri(0, 1, -3, 0, 0, 1),         // collinear + soft end
		newTri(0, 1, 4, 0, 0, 1),          // collinear + soft end, physical
		newTri(0, 1, 1, 0, 0, 1),          // both soft ends
		newTri(0, -2, 3, 0, 0, 0),         // massless, one light-like leg, physical
		newTri(0, 0, 5, 0, 0, 0),          // massless, two light-like legs, physical
	}
	f := big.NewFloat
	for _, tr := range tris {
		ref, err := c0Of(tr)
		if err != nil {
			t.Fatalf("%+v: %v", tr, err)
		}
		size := cmplx.Abs(ref.Finite) + cmplx.Abs(ref.Pole1) + cmplx.Abs(ref.Pole2)
		for _, p := range perms3[1:] {
			v, _ := c0Of(permTri(tr, p))
			if cmplx.Abs(v.Finite-ref.Finite)+cmplx.Abs(v.Pole1-ref.Pole1)+cmplx.Abs(v.Pole2-ref.Pole2) > 1e-12*size {
				t.Errorf("C0 at %+v: perm %v gives %v, identity %v", tr, p, v, ref)
			}
		}
		const mu2 = 0.37
		vm, _ := C0(tr.s[0][1], tr.s[1][2], tr.s[0][2], tr.m2[0], tr.m2[1], tr.m2[2], mu2)
		L := complex(math.Log(mu2), 0)
		want := ref.Finite + ref.Pole1*L + ref.Pole2*L*L/2
		if cmplx.Abs(vm.Finite-want) > 1e-12*size {
			t.Errorf("C0 μ dependence at %+v: %v, want %v", tr, vm.Finite, want)
		}
		bv, err := C0Big(f(tr.s[0][1]), f(tr.s[1][2]), f(tr.s[0][2]), f(tr.m2[0]), f(tr.m2[1]), f(tr.m2[2]), f(1), 64)
		if err != nil {
			t.Fatal(err)
		}
		b := bv.Value()
		if cmplx.Abs(b.Finite-ref.Finite)+cmplx.Abs(b.Pole1-ref.Pole1)+cmplx.Abs(b.Pole2-ref.Pole2) > 1e-12*size {
			t.Errorf("C0 at %+v: float64 %v, big %v", tr, ref, b)
		}
	}
}

// TestC0MasslessLimit checks the massless limit of the collinear triangles: with M² → 0 (al, be
// fixed away from 0) C0(0, s12, s02; 0, 0, M) tends to the three-massless-line result, and the
// poles do not change.
func TestC0MasslessLimit(t *testing.T) {
	for _, c := range [][2]float64{{-2, -3}, {-0.5, 4}, {3, 5}} {
		m0, _ := C0(0, c[0], c[1], 0, 0, 0, 1)
		for _, M2 := range []float64{1e-8, 1e-12} {
			v, _ := C0(0, c[0], c[1], 0, 0, M2, 1)
			if cmplx.Abs(v.Pole1-m0.Pole1) > 1e-6 || cmplx.Abs(v.Finite-m0.Finite) > 1e-5 || v.Pole2 != m0.Pole2 {
				t.Errorf("C0(0,%g,%g; 0,0,M²=%g) = %v, massless %v", c[0], c[1], M2, v, m0)
			}
		}
	}
}
