package passarino

import (
	"errors"
	"fmt"
	"math"
	"math/big"
	"math/cmplx"
	"testing"

	gquad "gonum.org/v1/gonum/integrate/quad"

	"loopmatch/expr"
	"loopmatch/loops"
)

// The independent reference of these tests is the Feynman-parameter representation of the
// whole integrand, evaluated by nested Gauss–Legendre quadrature (gonum). With
// 1/(D_0⋯D_{N−1}) = Γ(N) ∫dX δ(1−ΣX) (Σ X_i D_i)^{−N}, D_i = (k + P_i)² − m_i², the shift
// k = l − X·P (X·P = Σ X_i P_i) and Δ = Σ X_i m_i² − Σ_{i<j} X_i X_j (P_i − P_j)²,
//
//	∫ 1/(l² − Δ)^N      = i/(16π²) (−1)^N   Γ(N−2+ε)/Γ(N) Δ^{2−N} (Δ/μ²)^{−ε} e^{γε},
//	∫ l^μ l^ν/(l² − Δ)^N = i/(16π²) (−1)^{N−1} (g^{μν}/2) Γ(N−3+ε)/Γ(N) Δ^{3−N} (Δ/μ²)^{−ε} e^{γε}
//
// (the MS-bar measure of PHYSICS.md; textbook Wick rotation, common practice, no source). The
// numerators tested are 1, k·a, (k·a)(k·b) and k²: (k·a)(k·b) → (X·P·a)(X·P·b) + (a·b) l²/d,
// k² → (X·P)² + l². Every Γ(−e+ε) e^{γε} is expanded to O(ε⁰). The kinematics are Euclidean
// (all momenta spacelike, Δ > 0), so the integrands are smooth.

// fpVec is a Euclidean four-vector; the Minkowski product of two spacelike vectors is minus the
// Euclidean one.
type fpVec [4]int64

func (a fpVec) dot(b fpVec) *big.Rat {
	s := int64(0)
	for i := range a {
		s += a[i] * b[i]
	}
	return big.NewRat(-s, 100) // components in units of 1/10
}

func (a fpVec) add(b fpVec, c int64) fpVec {
	var r fpVec
	for i := range a {
		r[i] = a[i] + c*b[i]
	}
	return r
}

// fpCase is an integrand: propagators (k + P_i)² − m_i² with P_i = Σ c·(named vector) and a
// numerator kind.
type fpCase struct {
	name  string
	props []fpProp
	num   string // "1", "a", "ab", "k2"
}

type fpProp struct {
	mom map[string]int64 // momentum name → integer coefficient
	m2  *big.Rat
}

var fpVectors = map[string]fpVec{
	"p": {3, -1, 2, 0}, "r": {-1, 4, 0, 2}, "s": {2, 2, -3, 1},
	"a": {1, 0, -2, 5}, "b": {-3, 1, 1, 2},
}

func (c fpProp) vec() fpVec {
	var v fpVec
	for n, x := range c.mom {
		v = v.add(fpVectors[n], x)
	}
	return v
}

func (c fpProp) momExpr(k string) expr.Mom {
	ts := []expr.MomTerm{{Name: k, Coef: big.NewRat(1, 1)}}
	for n, x := range c.mom {
		ts = append(ts, expr.MomTerm{Name: n, Coef: big.NewRat(x, 1)})
	}
	return expr.NewMom(ts...)
}

// integrand builds the loop term of the case.
func (c fpCase) integrand() expr.Expr {
	e := expr.Int(1)
	switch c.num {
	case "a":
		e = expr.FromAtom(expr.NewDot("k", "a"), 1)
	case "ab":
		e = expr.FromAtom(expr.NewDot("k", "a"), 1).MustMul(expr.FromAtom(expr.NewDot("k", "b"), 1))
	case "k2":
		e = expr.FromAtom(expr.NewDot("k", "k"), 1)
	}
	for _, p := range c.props {
		e = e.MustMul(expr.FromAtom(expr.NewProp(p.momExpr("k"), expr.RFRat(p.m2)), -1))
	}
	e, err := expr.Integrate(e, "k")
	if err != nil {
		panic(err)
	}
	return e
}

// fpDot gives the scalar products of the named vectors.
func fpDot(a, b string) (expr.RatFunc, error) {
	va, ok1 := fpVectors[a]
	vb, ok2 := fpVectors[b]
	if !ok1 || !ok2 {
		return expr.RatFunc{}, fmt.Errorf("no vector %s or %s", a, b)
	}
	return expr.RFRat(va.dot(vb)), nil
}

// reference evaluates the case by quadrature: pole and finite part of the integral without
// the factor i/(16π²), μ² = 1.
func (c fpCase) reference(nodes int) (pole, finite float64) {
	n := len(c.props)
	P := make([]fpVec, n)
	m2 := make([]float64, n)
	for i, p := range c.props {
		P[i] = p.vec()
		m2[i], _ = p.m2.Float64()
	}
	f := func(r *big.Rat) float64 { x, _ := r.Float64(); return x }
	s := func(i, j int) float64 { d := P[i].add(P[j], -1); return f(d.dot(d)) }
	xs := make([]float64, nodes)
	ws := make([]float64, nodes)
	gquad.Legendre{}.FixedLocations(xs, ws, 0, 1)
	X := make([]float64, n)
	var rec func(dim int, rest, w float64)
	rec = func(dim int, rest, w float64) {
		if dim == n-1 {
			X[0] = rest
			delta := 0.0
			for i := range n {
				delta += X[i] * m2[i]
				for j := i + 1; j < n; j++ {
					delta -= X[i] * X[j] * s(i, j)
				}
			}
			L := math.Log(delta)
			// X·P contracted with a vector v.
			xp := func(v fpVec) float64 {
				t := 0.0
				for i := range n {
					t += X[i] * f(P[i].dot(v))
				}
				return t
			}
			var xpxp float64 // (X·P)²
			for i := range n {
				for j := range n {
					xpxp += X[i] * X[j] * f(P[i].dot(P[j]))
				}
			}
			// scalar part: (−1)^N Γ(N−2+ε) Δ^{2−N−ε} e^{γε} → (pole, finite) weights
			scalar := func(e int) (float64, float64) { // e = N − 2 (the power of Γ(e+ε))
				switch {
				case e == 0:
					return 1, -L
				case e == -1:
					return delta, delta * (1 - L) // −Γ(−1+ε)Δ^{1−ε}e^{γε} = Δ(1/ε + 1 − L)
				default:
					return 0, math.Pow(-1, float64(n)) * math.Gamma(float64(e)) * math.Pow(delta, float64(-e))
				}
			}
			// l² part: (−1)^{N−1} (d/2) Γ(N−3+ε) Δ^{3−N−ε} e^{γε}; with d/2 = 2 − ε.
			lsq := func() (float64, float64) {
				switch e := n - 3; {
				case e == 0: // N = 3: (2 − ε)(1/ε − L)
					return 2, -2*L - 1
				case e == -1: // N = 2: −(2 − ε) Δ (−1/ε − 1 + L) = (2 − ε)Δ(1/ε + 1 − L)
					return 2 * delta, 2*delta*(1-L) - delta
				case e == -2: // N = 1 is not used
					panic("N = 1")
				default: // N = 4: −2 Γ(1)/Δ
					return 0, math.Pow(-1, float64(n-1)) * 2 * math.Gamma(float64(e)) * math.Pow(delta, float64(-e))
				}
			}
			sp, sf := scalar(n - 2)
			var p, fin float64
			switch c.num {
			case "1":
				p, fin = sp, sf
			case "a":
				t := -xp(fpVectors["a"])
				p, fin = t*sp, t*sf
			case "ab":
				t := xp(fpVectors["a"]) * xp(fpVectors["b"])
				lp, lf := lsq()
				ab := f(fpVectors["a"].dot(fpVectors["b"]))
				// (a·b) l²/d: the l² part carries d/2, so l²/d carries 1/2 exactly.
				p, fin = t*sp+ab*lp/4, t*sf+ab*(lf+lp/2)/4
			case "k2":
				lp, lf := lsq()
				p, fin = xpxp*sp+lp, xpxp*sf+lf
			}
			// Γ(N) from the parametrisation cancels the 1/Γ(N) of the momentum integral.
			pole += w * p
			finite += w * fin
			return
		}
		for i := range xs {
			x := xs[i] * rest
			X[n-1-dim] = x
			rec(dim+1, rest-x, w*ws[i]*rest)
		}
	}
	rec(0, 1, 1)
	return pole, finite
}

// evalGeneral reduces the case with General and evaluates pole and finite part numerically
// without the factor i/(16π²).
func evalGeneral(t *testing.T, e expr.Expr) (pole, finite complex128) {
	t.Helper()
	r, _, err := General(e, fpDot)
	if err != nil {
		t.Fatal(err)
	}
	// remaining scalar products of a, b with the momenta become numbers
	r, err = r.MapAtoms(func(a expr.Atom) (expr.Expr, bool) {
		d, ok := a.(expr.Dot)
		if !ok {
			return expr.Expr{}, false
		}
		v, err := fpDot(d.A, d.B)
		if err != nil {
			return expr.Expr{}, false
		}
		return expr.FromRF(v), true
	})
	if err != nil {
		t.Fatal(err)
	}
	v, err := loops.EvalLaurent(r, nil, 1)
	if err != nil {
		t.Fatal(err)
	}
	norm := complex(0, 1/(16*math.Pi*math.Pi))
	return v.Pole1 / norm, v.Finite / norm
}

func prop(m2 int64, mom ...any) fpProp {
	p := fpProp{mom: map[string]int64{}, m2: big.NewRat(m2, 1)}
	for i := 0; i < len(mom); i += 2 {
		p.mom[mom[i].(string)] = int64(mom[i+1].(int))
	}
	return p
}

// TestGeneralAgainstFeynmanParameters reduces integrands with shifted propagator momenta,
// numerators k·a, (k·a)(k·b) and k², two to four distinct propagators and two propagators with
// the same momentum and different masses (the R_ξ case, split by partial fractions), and
// compares pole and finite part with the quadrature of the whole integrand.
func TestGeneralAgainstFeynmanParameters(t *testing.T) {
	cases := []fpCase{
		{"bubble scalar", []fpProp{prop(1, "p", -1), prop(2, "r", 1)}, "1"},
		{"bubble rank 1", []fpProp{prop(1, "p", -1), prop(2, "r", 1)}, "a"},
		{"bubble rank 2", []fpProp{prop(1, "p", 1), prop(3, "r", 1)}, "ab"},
		{"bubble k^2", []fpProp{prop(1), prop(3, "r", 1)}, "k2"},
		{"triangle rank 1", []fpProp{prop(1, "p", 1), prop(2, "r", -1), prop(3, "s", 1)}, "a"},
		{"triangle rank 2", []fpProp{prop(2, "p", 1), prop(1, "r", 1), prop(3)}, "ab"},
		{"triangle k^2", []fpProp{prop(2, "p", 1), prop(1, "r", 1), prop(3, "s", 1)}, "k2"},
		{"two masses, one momentum", []fpProp{prop(1), prop(4), prop(2, "p", 1)}, "ab"},
		{"box rank 2", []fpProp{prop(1, "p", 1), prop(2, "r", 1), prop(3), prop(2, "s", -1)}, "ab"},
		{"box k^2", []fpProp{prop(1, "p", 1), prop(2, "r", 1), prop(3), prop(2, "s", -1)}, "k2"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			nodes := 48
			if len(c.props) == 4 {
				nodes = 24
			}
			wp, wf := c.reference(nodes)
			gp, gf := evalGeneral(t, c.integrand())
			if cmplx.Abs(gp-complex(wp, 0)) > 1e-8*(1+math.Abs(wp)) || cmplx.Abs(gf-complex(wf, 0)) > 1e-8*(1+math.Abs(wf)) {
				t.Errorf("pole %v, finite %v; quadrature pole %.12g, finite %.12g", gp, gf, wp, wf)
			}
		})
	}
}

// TestGeneralChainMatchesDot checks the contraction of the tensor structures with a Dirac
// chain: the reduction of ∫ ū slash(k) u /(D0 D1 D2) equals that of ∫ (k·a)/(D0 D1 D2) with
// every a·X replaced by ū slash(X) u (linearity in the loop momentum's slot).
func TestGeneralChainMatchesDot(t *testing.T) {
	c := fpCase{props: []fpProp{prop(1, "p", 1), prop(2, "r", -1), prop(3)}, num: "1"}
	den := c.integrand()
	chain := func(p string) expr.Expr {
		return expr.FromAtom(expr.NewChain([]expr.NC{{Op: expr.NCUBar, Args: []string{"x"}}, {Op: expr.NCSlash, Args: []string{p}}, {Op: expr.NCU, Args: []string{"y"}}}), 1)
	}
	withChain, _, err := General(den.MustMul(chain("k")), fpDot)
	if err != nil {
		t.Fatal(err)
	}
	withDot, _, err := General(den.MustMul(expr.FromAtom(expr.NewDot("k", "a"), 1)), fpDot)
	if err != nil {
		t.Fatal(err)
	}
	mapped, err := withDot.MapAtoms(func(a expr.Atom) (expr.Expr, bool) {
		d, ok := a.(expr.Dot)
		if !ok || (d.A != "a" && d.B != "a") {
			return expr.Expr{}, false
		}
		other := d.B
		if d.B == "a" {
			other = d.A
		}
		return chain(other), true
	})
	if err != nil {
		t.Fatal(err)
	}
	if !mapped.Equal(withChain) {
		t.Errorf("chain: %s\nfrom the dot product: %s", withChain, mapped)
	}
}

// TestGeneralAgainstHeavy compares the two routes on the same integrand: the general route
// keeps the external momenta exactly, the heavy-mass route Taylor-expands in them; at small
// momenta (scaled by λ) the difference must shrink like λ^(order+1). Two methods that share
// no code beyond the scalar tadpole.
func TestGeneralAgainstHeavy(t *testing.T) {
	// ∫ (k·a)(k·b) / ((k² − 1)((k + p)² − 4)((k − r)² − 9)) with p, r, a, b symbolic.
	mk := func(m2 int64, p expr.Mom) expr.Expr {
		return expr.FromAtom(expr.NewProp(expr.MomOf("k").Add(p), expr.RFInt(m2)), -1)
	}
	e := expr.FromAtom(expr.NewDot("k", "a"), 1).MustMul(expr.FromAtom(expr.NewDot("k", "b"), 1)).
		MustMul(mk(1, nil)).MustMul(mk(4, expr.MomOf("p"))).MustMul(mk(9, expr.MomOf("r").Scale(big.NewRat(-1, 1))))
	e, _ = expr.Integrate(e, "k")
	heavy, _, err := Heavy(e, Small{Momenta: []string{"p", "r"}, Order: 5})
	if err != nil {
		t.Fatal(err)
	}
	var prev float64
	for _, lam := range []int64{2, 4, 8} {
		// momenta p, r of size 1/λ (Euclidean), a and b of size 1
		dots := func(x, y string) (expr.RatFunc, error) {
			v := new(big.Rat).Set(fpVectors[x].dot(fpVectors[y]))
			for _, n := range []string{x, y} {
				if n == "p" || n == "r" {
					v.Quo(v, big.NewRat(lam, 1))
				}
			}
			return expr.RFRat(v), nil
		}
		num := func(r expr.Expr) complex128 {
			r, err := r.MapAtoms(func(a expr.Atom) (expr.Expr, bool) {
				d, ok := a.(expr.Dot)
				if !ok {
					return expr.Expr{}, false
				}
				v, _ := dots(d.A, d.B)
				return expr.FromRF(v), true
			})
			if err != nil {
				t.Fatal(err)
			}
			v, err := loops.EvalLaurent(r, nil, 1)
			if err != nil {
				t.Fatal(err)
			}
			return v.Finite
		}
		g, _, err := General(e, dots)
		if err != nil {
			t.Fatal(err)
		}
		gv, hv := num(g), num(heavy)
		// the remainder of the order-5 expansion is about λ^-6 relative; the float64
		// evaluation of the PV coefficients loses about λ^4 (inverse Gram determinants)
		tol := 1e-14*math.Pow(float64(lam), 4) + 1e-3*math.Pow(float64(lam), -6)
		d := cmplx.Abs(gv-hv) / cmplx.Abs(hv)
		if d > tol {
			t.Errorf("λ = %d: general %v, heavy %v (relative difference %.3g > %.3g)", lam, gv, hv, d, tol)
		}
		if testing.Verbose() {
			t.Logf("λ = %d: relative difference %.3g", lam, d)
		}
		if prev > 0 && d > prev/20 {
			t.Errorf("λ = %d: the difference %.3g did not shrink like λ^-6 (previous %.3g)", lam, d, prev)
		}
		prev = d
	}
}

// TestGeneralErrors checks the messages for integrals the general route does not reduce.
func TestGeneralErrors(t *testing.T) {
	k := expr.MomOf("k")
	p := expr.MomOf("p")
	raised := expr.FromAtom(expr.NewProp(k, expr.RFInt(1)), -2).MustMul(expr.FromAtom(expr.NewProp(k.Add(p), expr.RFInt(1)), -1))
	raised, _ = expr.Integrate(raised, "k")
	if _, _, err := General(raised, fpDot); !errors.Is(err, ErrRaisedPower) {
		t.Errorf("raised power: %v", err)
	}
	five := expr.Int(1)
	for i, n := range []string{"", "p", "r", "s", "a"} {
		m := k
		if n != "" {
			m = k.Add(expr.MomOf(n))
		}
		five = five.MustMul(expr.FromAtom(expr.NewProp(m, expr.RFInt(int64(i+1))), -1))
	}
	five, _ = expr.Integrate(five, "k")
	if _, _, err := General(five, fpDot); err == nil {
		t.Error("five distinct propagators: no error")
	}
}
