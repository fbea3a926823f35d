package vacuum

import (
	"fmt"
	"math"
	"math/big"
	"math/cmplx"
	"strings"
	"testing"

	"gonum.org/v1/gonum/integrate/quad"

	"loopmatch/expr"
)

// laurent is a truncated Laurent series in ε with float coefficients of ε^{-2} … ε^{2}.
type laurent [5]float64

func (a laurent) mul(b laurent) laurent {
	var c laurent
	for i := range 5 {
		for j := range 5 {
			if k := i + j - 2; k >= 0 && k < 5 {
				c[k] += a[i] * b[j]
			}
		}
	}
	return c
}

func (a laurent) add(b laurent) laurent {
	for i := range a {
		a[i] += b[i]
	}
	return a
}

func (a laurent) scale(s float64) laurent {
	for i := range a {
		a[i] *= s
	}
	return a
}

// expEps is exp(c ε).
func expEps(c float64) laurent { return laurent{0, 0, 1, c, c * c / 2} }

// gammaLaurent is Π (e^{γ_E b ε} Γ(n + bε))^pow, expanded exactly by expr.ExpGamma and evaluated.
func gammaLaurent(t *testing.T, fs ...[3]int) laurent {
	t.Helper()
	res := laurent{0, 0, 1}
	for _, f := range fs {
		g, err := expr.ExpGamma(f[0], big.NewRat(int64(f[1]), 1), 6)
		if err != nil {
			t.Fatal(err)
		}
		if g, err = g.Pow(f[2]); err != nil {
			t.Fatal(err)
		}
		var l laurent
		for k := -2; k <= 2; k++ {
			v, err := g.Coef(k).Eval(nil)
			if err != nil {
				t.Fatal(err)
			}
			l[k+2] = real(v)
		}
		res = res.mul(l)
	}
	return res
}

// sunNumeric evaluates Sun(x1, x2, x3) (squared masses, x1 > 0) to O(ε^0) without the analytic
// result, by inserting the one-loop bubble of lines 2 and 3 into line 1 (Euclidean, measure
// d^dk/π^{d/2} per loop, Sun = −e^{2γ_E ε} μ^{4ε} E):
//
//	E = ∫ d^dk/π^{d/2} B(k²)/(k² + x1),  B(t) = Γ(ε) ∫₀¹ dz Δ^{−ε},  Δ = z(1−z)t + z x2 + (1−z) x3.
//
// The large-t behaviour of B in d dimensions (expansion by regions: the hard region with the
// massless bubbles G(1,1) t^{−ε}, G(2,1) t^{−1−ε}, and the two soft regions giving the tadpoles
// T(x) = Γ(−1+ε) x^{1−ε} over t) is
//
//	S(t) = Γ(ε)Γ(1−ε)²/Γ(2−2ε) t^{−ε} − (x2 + x3) Γ(1+ε)Γ(−ε)Γ(1−ε)/Γ(1−2ε) t^{−1−ε} + (T(x2) + T(x3))/t,
//
// (massless bubble G(a,b) = Γ(a+b−d/2)Γ(d/2−a)Γ(d/2−b)/(Γ(a)Γ(b)Γ(d−a−b)), common practice, no
// source). Its insertion into line 1 is exact in d through ∫ d^dk/π^{d/2} (k²)^α/(k² + x1) =
// Γ(α+d/2)Γ(1−α−d/2)/Γ(d/2) x1^{α+d/2−1}, and the remainder ∫ (B − S)/(k² + x1) converges at d = 4:
//
//	R = ∫₀^∞ dt t (B − S)|_{ε→0}/(t + x1),  (B − S)|_{ε→0} = −f(δ₊) − f(δ₋) + Σ_{j=2,3} (x_j/t)(1 − ln(x_j/t)),
//
// with f(δ) = (1+δ) ln(1+δ) − δ ln δ and δ± the positive roots of tδ² + (t ∓ x2 ± x3)δ − x2,3 = 0
// (Δ = t(1 + δ₊ − z)(z + δ₋), so ∫₀¹ ln(Δ/(t z(1−z))) dz = f(δ₊) + f(δ₋); this form keeps the
// cancellation at large t harmless). The t integral is done with gonum's Gauss–Legendre rule in
// s = ln t.
func sunNumeric(t *testing.T, x [3]float64, mu float64) laurent {
	t.Helper()
	x1, a, b := x[0], x[1], x[2]
	L1 := math.Log(x1)
	// insertion of the subtraction terms, times e^{2γ_E ε}
	sub1 := gammaLaurent(t, [3]int{0, 1, 1}, [3]int{1, -1, 2}, [3]int{-1, 2, 1}, [3]int{2, -1, -1}).
		mul(expEps(-2 * L1)).scale(x1)
	sub2 := gammaLaurent(t, [3]int{1, 1, 1}, [3]int{0, -1, 1}, [3]int{1, -1, 1}, [3]int{0, 2, 1}, [3]int{2, -1, -1}).
		mul(expEps(-2 * L1)).scale(-(a + b))
	g3 := gammaLaurent(t, [3]int{-1, 1, 1}, [3]int{1, -1, 1}, [3]int{0, 1, 1}, [3]int{2, -1, -1}).mul(expEps(-L1))
	var sub3 laurent
	for _, xj := range []float64{a, b} {
		if xj > 0 {
			sub3 = sub3.add(g3.mul(expEps(-math.Log(xj))).scale(xj))
		}
	}
	f := func(d float64) float64 {
		if d == 0 {
			return 0
		}
		return (1+d)*math.Log1p(d) - d*math.Log(d)
	}
	root := func(tt, B, c float64) float64 { // positive root of tt δ² + B δ − c = 0, c ≥ 0
		if c == 0 {
			return math.Max(0, -B/tt)
		}
		D := math.Sqrt(B*B + 4*tt*c)
		if B >= 0 {
			return 2 * c / (B + D)
		}
		return (-B + D) / (2 * tt)
	}
	integrand := func(s float64) float64 {
		tt := math.Exp(s)
		bs := -f(root(tt, tt-a+b, a)) - f(root(tt, tt+a-b, b))
		for _, xj := range []float64{a, b} {
			if xj > 0 {
				bs += xj / tt * (1 - math.Log(xj/tt))
			}
		}
		return tt * tt / (tt + x1) * bs
	}
	var R float64
	for s := -50.0; s < 50; s++ {
		R += quad.Fixed(integrand, s, s+1, 24, quad.Legendre{}, 0)
	}
	e := sub1.add(sub2).add(sub3)
	e[2] += R
	return e.mul(expEps(2 * math.Log(mu*mu))).scale(-1)
}

// sunSeriesAt expands e to O(ε^0) and evaluates the coefficients of ε^{-2}, ε^{-1}, ε^0.
func sunSeriesAt(t *testing.T, e expr.Expr, vals map[string]complex128) [3]complex128 {
	t.Helper()
	s, err := ExpandEps(e, 1, PositiveMasses)
	if err != nil {
		t.Fatal(err)
	}
	return evalSeries(t, s, vals)
}

func ratOf(f float64) expr.RatFunc { return expr.RFRat(new(big.Rat).SetFloat64(f)) }

// TestSunMasterNumeric compares the poles and the finite part of the master with the independent
// numerical evaluation sunNumeric, for numerical masses (where the form of the finite part is
// chosen by the sign of λ² and the largest mass) and for symbolic masses evaluated afterwards
// (the form averaged over the cuts, valid for every ordering).
func TestSunMasterNumeric(t *testing.T) {
	const mu = 1.3
	cases := []struct {
		name string
		x    [3]float64
	}{
		{"lambda2>0, m3 largest", [3]float64{1, 2, 9}},
		{"lambda2>0, m1 largest", [3]float64{5, 1, 0.5}},
		{"lambda2>0, hierarchy", [3]float64{1, 0.01, 0.02}},
		{"lambda2<0", [3]float64{2, 3, 1.5}},
		{"lambda2<0, two equal", [3]float64{1, 2, 2}},
		{"equal masses", [3]float64{1, 1, 1}},
		{"lambda2<0, right angle (Cl2(π/2), Cl2(π))", [3]float64{1, 1, 2}},
		{"threshold m3 = m1 + m2", [3]float64{1, 4, 9}},
		{"threshold with a massless line (m, m, 0)", [3]float64{2, 2, 0}},
		{"one massless line", [3]float64{1, 3, 0}},
		{"one massless line, reversed", [3]float64{3, 0, 1}},
		{"two massless lines", [3]float64{2, 0, 0}},
	}
	for _, c := range cases {
		want := sunNumeric(t, c.x, mu)
		// numerical masses
		e := Sun(ratOf(c.x[0]), ratOf(c.x[1]), ratOf(c.x[2]))
		got := sunSeriesAt(t, e, map[string]complex128{"mu": mu})
		// symbolic masses (zero masses stay zero)
		var xs [3]expr.RatFunc
		vals := map[string]complex128{"mu": mu}
		for i, v := range c.x {
			if v == 0 {
				xs[i] = expr.RFInt(0)
				continue
			}
			name := fmt.Sprintf("x%d", i+1)
			xs[i] = rf(name)
			vals[name] = complex(v, 0)
		}
		gotSym := sunSeriesAt(t, Sun(xs[0], xs[1], xs[2]), vals)
		for k := range 3 {
			tol := 1e-9 * math.Max(1, math.Abs(want[k]))
			if math.Abs(real(got[k])-want[k]) > tol || math.Abs(imag(got[k])) > tol {
				t.Errorf("%s %v, ε^%d: series %v, numerical %v", c.name, c.x, k-2, got[k], want[k])
			}
			if math.Abs(real(gotSym[k])-want[k]) > tol || math.Abs(imag(gotSym[k])) > tol {
				t.Errorf("%s %v (symbolic masses), ε^%d: series %v, numerical %v", c.name, c.x, k-2, gotSym[k], want[k])
			}
		}
	}
}

// TestSunMasterOrderings evaluates the form for symbolic masses at every ordering of mass sets
// of both signs of λ² (the form is written with the third argument as "z").
func TestSunMasterOrderings(t *testing.T) {
	e := Sun(rf("x1"), rf("x2"), rf("x3"))
	s, err := ExpandEps(e, 1, PositiveMasses)
	if err != nil {
		t.Fatal(err)
	}
	fin := s.Coef(0)
	for _, x := range [][3]float64{{1, 2, 9}, {0.7, 1.1, 1.3}, {5, 1, 0.5}, {0.01, 1, 0.02}} {
		want := sunNumeric(t, [3]float64{x[0], x[1], x[2]}, 1)[2]
		for _, p := range [][3]int{{0, 1, 2}, {0, 2, 1}, {1, 0, 2}, {1, 2, 0}, {2, 0, 1}, {2, 1, 0}} {
			vals := map[string]complex128{"mu": 1}
			for i := range 3 {
				vals[fmt.Sprintf("x%d", i+1)] = complex(x[p[i]], 0)
			}
			got, err := fin.Eval(vals)
			if err != nil {
				t.Fatal(err)
			}
			if cmplx.Abs(got-complex(want, 0)) > 1e-9*math.Max(1, math.Abs(want)) {
				t.Errorf("masses %v in order %v: finite part %v, numerical %v", x, p, got, want)
			}
		}
	}
}

// TestSunEqualMasses checks the exact form of the equal-mass finite part: at m = μ it is
// 21/2 + π²/4 − 2√3 Cl2(π/3) m² (from the finite part above with L = 0 and ξ = −4√3 m² Cl2(π/3)),
// compared with the numerical evaluation using Cl2(π/3) = 1.0149416064096536250 (PHYSICS.md,
// checked there with mpmath), and the symbolic coefficient of Cl2(π/3) is −2√3 m².
func TestSunEqualMasses(t *testing.T) {
	const cl2 = 1.0149416064096536250
	want := sunNumeric(t, [3]float64{1, 1, 1}, 1)[2]
	closed := 21.0/2 + math.Pi*math.Pi/4 - 2*math.Sqrt(3)*cl2
	if math.Abs(closed-want) > 1e-9 {
		t.Errorf("equal masses at m = μ: closed form %v, numerical %v", closed, want)
	}
	m2 := sq("m")
	s, err := ExpandEps(Sun(m2, m2, m2), 1, PositiveMasses)
	if err != nil {
		t.Fatal(err)
	}
	fin := s.Coef(0)
	groups := fin.Collect(func(a expr.Atom) bool {
		f, ok := a.(expr.Fn)
		return ok && f.Name == expr.FnCl2
	})
	sqrt3, _ := expr.Apply(expr.FnSqrt, 1, expr.Int(3))
	wantCoef := sqrt3.Scale(m2.Scale(big.NewRat(-2, 1)))
	found := false
	for _, g := range groups {
		if g.Key == "" {
			continue
		}
		if !strings.Contains(g.Key, "Cl2(1/3*pi)") || !g.Coef.Equal(wantCoef) {
			t.Errorf("equal-mass finite part has %s·%s, want %s·Cl2(π/3)", g.Coef, g.Key, wantCoef)
		}
		found = true
	}
	if !found {
		t.Errorf("equal-mass finite part %s has no Clausen term", fin)
	}
	v, err := fin.Eval(map[string]complex128{"m": 1, "mu": 1})
	if err != nil || math.Abs(real(v)-closed) > 1e-12 {
		t.Errorf("equal-mass finite part at m = μ: %v, want %v (%v)", v, closed, err)
	}
}

// TestSunThirdDerivative checks reduction and master together with the third-derivative method
// of PHYSICS.md: J(2, 2, 2) = ∂³Sun/∂m1²∂m2²∂m3² is finite, and its value at d = 4 is the
// Feynman-parameter integral (Euclidean, measure d^4k/π² per loop, (−1)^6 = 1)
//
//	J(2,2,2) = ∫ dα δ(1 − Σα) α1 α2 α3 / (U² (α1 m1² + α2 m2² + α3 m3²)²),  U = α1α2 + α1α3 + α2α3,
//
// (the general Feynman-parameter formula Γ(ν − Ld/2)/ΠΓ(ν_i) ∫ Πα^{ν_i−1} U^{ν−(L+1)d/2}/F^{ν−Ld/2}
// with F = U Σ α_i m_i² at zero momentum; common practice, no source), made smooth by sector
// decomposition: α_l = 1 in the sector where α_l is largest, then t_j = t_i s in the half where
// t_i ≥ t_j, so that each of the six pieces is ∫₀¹∫₀¹ t s/((1 + s + t s)² X²) dt ds with
// X = m_l² + t m_i² + t s m_j².
func TestSunThirdDerivative(t *testing.T) {
	feyn := func(x [3]float64) float64 {
		sum := 0.0
		for l := range 3 {
			for _, ij := range [][2]int{{(l + 1) % 3, (l + 2) % 3}, {(l + 2) % 3, (l + 1) % 3}} {
				i, j := ij[0], ij[1]
				inner := func(tt float64) float64 {
					return quad.Fixed(func(s float64) float64 {
						X := x[l] + tt*x[i] + tt*s*x[j]
						w := 1 + s + tt*s
						return tt * s / (w * w * X * X)
					}, 0, 1, 40, quad.Legendre{}, 0)
				}
				sum += quad.Fixed(inner, 0, 1, 40, quad.Legendre{}, 0)
			}
		}
		return sum
	}
	for _, x := range [][3]float64{{1, 2, 9}, {2, 3, 1.5}, {1, 1, 1}, {0.3, 4, 1}} {
		want := feyn(x)
		// numerical masses
		e, _, err := TwoLoop([3]int{2, 2, 2}, [3]expr.RatFunc{ratOf(x[0]), ratOf(x[1]), ratOf(x[2])}, Numerator{})
		if err != nil {
			t.Fatal(err)
		}
		got := sunSeriesAt(t, e, map[string]complex128{"mu": 1.7})
		// symbolic masses
		es, _, err := TwoLoop([3]int{2, 2, 2}, [3]expr.RatFunc{rf("x1"), rf("x2"), rf("x3")}, Numerator{})
		if err != nil {
			t.Fatal(err)
		}
		gotSym := sunSeriesAt(t, es, map[string]complex128{"mu": 0.6, "x1": complex(x[0], 0), "x2": complex(x[1], 0), "x3": complex(x[2], 0)})
		for _, g := range [][3]complex128{got, gotSym} {
			scale := math.Abs(want)
			if cmplx.Abs(g[0]) > 1e-9*scale || cmplx.Abs(g[1]) > 1e-9*scale {
				t.Errorf("J(2,2,2) at %v: poles %v, %v do not cancel", x, g[0], g[1])
			}
			if cmplx.Abs(g[2]-complex(want, 0)) > 1e-9*scale {
				t.Errorf("J(2,2,2) at %v: %v, Feynman parameters %v", x, g[2], want)
			}
		}
	}
}

// TestSunSeriesOrders checks the orders the master provides: any order where the sunset is a
// Γ-function expression (two massless lines, thresholds), O(ε^0) otherwise, with an error beyond.
func TestSunSeriesOrders(t *testing.T) {
	m2 := sq("m")
	zero := expr.RFInt(0)
	if _, err := ExpandEps(Sun(zero, zero, m2), 3, PositiveMasses); err != nil {
		t.Errorf("Sun(0,0,m²) to O(ε³): %v", err)
	}
	if _, err := ExpandEps(Sun(zero, m2, m2), 3, PositiveMasses); err != nil {
		t.Errorf("Sun(0,m²,m²) to O(ε³): %v", err)
	}
	if _, err := ExpandEps(Sun(m2, m2, m2), 2, PositiveMasses); err == nil {
		t.Error("Sun(m²,m²,m²) to O(ε²): no error")
	}
	// Sun(0, 0, m²) = −m² e^{2γε}(m²/μ²)^{−2ε} Γ(ε)Γ(1−ε)²Γ(−1+2ε)/Γ(2−ε): the O(ε) term at m = μ
	// from the expansion e^{2γε}Γ(1+ε)Γ(1−ε)Γ(1+2ε) = exp(3ζ2ε² − (8/3)ζ3ε³ + …) (ln Γ(1+z) =
	// −γz + Σ (−1)^k ζ_k z^k/k, Abramowitz–Stegun 6.1.33) and 1/((1−ε)(1−2ε)) = 1 + 3ε + 7ε² + 15ε³:
	// Sun = (m²/2ε²)(1 + 3ε + (7 + 3ζ2)ε² + (15 + 9ζ2 − (8/3)ζ3)ε³ + …).
	s, err := ExpandEps(Sun(zero, zero, m2), 2, PositiveMasses)
	if err != nil {
		t.Fatal(err)
	}
	v, err := s.Coef(1).Eval(map[string]complex128{"m": 1, "mu": 1})
	if err != nil {
		t.Fatal(err)
	}
	z2, z3 := math.Pi*math.Pi/6, 1.2020569031595942854
	if want := (15 + 9*z2 - 8.0/3*z3) / 2; math.Abs(real(v)-want) > 1e-12 {
		t.Errorf("Sun(0,0,m²) O(ε) term: %v, want %v", v, want)
	}
}
