package vacuum

import (
	"math/big"
	"strings"
	"sync"
	"testing"

	"loopmatch/expr"
)

// resetTwoLoopCache empties the reducer cache (tests and benchmarks).
func resetTwoLoopCache() {
	reducersMu.Lock()
	reducers = map[string]*reducer{}
	reducersMu.Unlock()
}

// powersUpTo lists every (a1, a2, a3) with all a_i ≥ 1 and a1 + a2 + a3 ≤ n.
func powersUpTo(n int) [][3]int {
	var out [][3]int
	for s := 3; s <= n; s++ {
		for a1 := 1; a1 <= s-2; a1++ {
			for a2 := 1; a1+a2 <= s-1; a2++ {
				out = append(out, [3]int{a1, a2, s - a1 - a2})
			}
		}
	}
	return out
}

// gammaRatio returns Γ(x + n)/Γ(x) for an integer n as a rational function of x.
func gammaRatio(t *testing.T, x expr.RatFunc, n int) expr.RatFunc {
	t.Helper()
	r := expr.RFInt(1)
	for i := 0; i < n; i++ {
		r = r.Mul(x.Add(expr.RFInt(int64(i))))
	}
	for i := -1; i >= n; i-- {
		var err error
		if r, err = r.Div(x.Add(expr.RFInt(int64(i)))); err != nil {
			t.Fatal(err)
		}
	}
	return r
}

func factorial(n int) *big.Rat {
	return new(big.Rat).SetInt(new(big.Int).MulRange(1, int64(max(n, 1))))
}

// onlyAtom returns c if e = c·atom for the single atom product with the given text, else fails.
func onlyAtom(t *testing.T, e expr.Expr, atom string) expr.RatFunc {
	t.Helper()
	if e.Len() != 1 {
		t.Fatalf("%s: want a single multiple of %s", e, atom)
	}
	tm := e.Terms()[0]
	one := expr.FromTerm(expr.Term{Coef: expr.RFInt(1), Atoms: tm.Atoms})
	if one.String() != atom {
		t.Fatalf("%s: want a multiple of %s", e, atom)
	}
	return tm.Coef
}

// TestTwoLoopGammaExact compares the reduction with the cases that are products of Γ functions,
// exactly in d. With Schwinger parameters and the Euclidean measure d^dk/π^{d/2} per loop,
//
//	E(a; x1, x2, x3) = Π_i 1/Γ(a_i) ∫ dα α_i^{a_i−1} e^{−Σ α_i x_i} U^{−d/2},  U = α1α2 + α1α3 + α2α3.
//
// For x3 = 0 the α3 integral is ∫ dα3 α3^{a3−1} (α1α2 + α3(α1+α2))^{−d/2} =
// (α1α2)^{a3−d/2} (α1+α2)^{−a3} Γ(a3)Γ(d/2−a3)/Γ(d/2); then α1 = ρξ, α2 = ρ(1−ξ) give
//
//	E(a; m², m², 0) = Γ(a1+a3−d/2) Γ(a2+a3−d/2) Γ(d/2−a3) Γ(Σa−d) / (Γ(a1)Γ(a2)Γ(d/2)Γ(a1+a2+2a3−d)) (m²)^{d−Σa},
//
// and with x2 = 0 as well (the α2 integral done the same way first)
//
//	E(a; m², 0, 0) = Γ(a2+a3−d/2) Γ(d/2−a2) Γ(d/2−a3) Γ(Σa−d) / (Γ(a1)Γ(a2)Γ(a3)Γ(d/2)) (m²)^{d−Σa}.
//
// (The same formulas are in A.I. Davydychev, J.B. Tausk, Nucl. Phys. B397 (1993) 123, section 2 —
// from memory; the derivation above is what the test relies on.) In our normalisation
// J(a) = (−1)^{Σa} e^{2γ_E ε} μ^{4ε} E(a) and Tad(m²)² = e^{2γ_E ε} μ^{4ε} (Γ(1−d/2) (m²)^{d/2−1})², so
// J(a; m², 0, 0)/J(1,1,1; m², 0, 0) and J(a; m², m², 0)/Tad(m²)² are rational in d: the reduction
// must give exactly these multiples of Sun(0, 0, m²) and Tad(m²)² (at (m, m, 0) the Källén function
// vanishes and the sunset itself reduces to tadpoles).
func TestTwoLoopGammaExact(t *testing.T) {
	d := expr.RFVar(expr.DimSymbol)
	h := d.Scale(big.NewRat(1, 2)) // d/2
	m2 := sq("m")
	zero := expr.RFInt(0)
	one := expr.RFInt(1)
	for _, a := range powersUpTo(8) {
		sum := a[0] + a[1] + a[2]
		sign := int64(1 - 2*(sum%2))
		mp, err := m2.Pow(3 - sum)
		if err != nil {
			t.Fatal(err)
		}

		// (m, 0, 0): E(a)/E(1,1,1), all three line orders.
		ratio := gammaRatio(t, one.Scale(big.NewRat(2, 1)).Sub(h), a[1]+a[2]-2). // Γ(a2+a3−d/2)/Γ(2−d/2)
												Mul(gammaRatio(t, h.Sub(one), 1-a[1])). // Γ(d/2−a2)/Γ(d/2−1)
												Mul(gammaRatio(t, h.Sub(one), 1-a[2])).
												Mul(gammaRatio(t, expr.RFInt(3).Sub(d), sum-3)) // Γ(Σa−d)/Γ(3−d)
		ratio = ratio.Scale(new(big.Rat).Inv(factorial(a[0] - 1))).Scale(new(big.Rat).Inv(factorial(a[1] - 1))).Scale(new(big.Rat).Inv(factorial(a[2] - 1)))
		want := ratio.Mul(mp).Scale(big.NewRat(-sign, 1)) // (−1)^{Σa−3}
		for _, perm := range [][3]int{{0, 1, 2}, {1, 0, 2}, {1, 2, 0}} {
			var pw [3]int
			var ms [3]expr.RatFunc
			for k := range 3 {
				pw[perm[k]] = a[k]
				ms[perm[k]] = []expr.RatFunc{m2, zero, zero}[k]
			}
			got, info, err := TwoLoop(pw, ms, Numerator{})
			if err != nil {
				t.Fatal(err)
			}
			c := onlyAtom(t, got, "Sun(0, 0, m^2)")
			if !c.Equal(want) {
				t.Errorf("J%v(m,0,0) = %s·Sun, want %s", pw, c, want)
			}
			if len(info.Scaleless) == 0 {
				t.Errorf("J%v(m,0,0): the scaleless factorised integrals were not reported", pw)
			}
		}

		// (m, m, 0): E(a)/T_E².
		x := expr.RFInt(int64(sum)).Sub(d)              // Σa − d
		ratio = gammaRatio(t, one.Sub(h), a[0]+a[2]-1). // Γ(a1+a3−d/2)/Γ(1−d/2)
								Mul(gammaRatio(t, one.Sub(h), a[1]+a[2]-1)).
								Mul(gammaRatio(t, h, -a[2])) // Γ(d/2−a3)/Γ(d/2)
		gx := gammaRatio(t, x, a[2]) // Γ(Σa−d+a3)/Γ(Σa−d)
		if ratio, err = ratio.Div(gx); err != nil {
			t.Fatal(err)
		}
		ratio = ratio.Scale(new(big.Rat).Inv(factorial(a[0] - 1))).Scale(new(big.Rat).Inv(factorial(a[1] - 1)))
		mp2, _ := m2.Pow(2 - sum)
		want = ratio.Mul(mp2).Scale(big.NewRat(sign, 1))
		for _, perm := range [][3]int{{0, 1, 2}, {2, 0, 1}, {1, 2, 0}} {
			var pw [3]int
			var ms [3]expr.RatFunc
			for k := range 3 {
				pw[perm[k]] = a[k]
				ms[perm[k]] = []expr.RatFunc{m2, m2, zero}[k]
			}
			got, _, err := TwoLoop(pw, ms, Numerator{})
			if err != nil {
				t.Fatal(err)
			}
			c := onlyAtom(t, got, "Tad(m^2)^2")
			if !c.Equal(want) {
				t.Errorf("J%v(m,m,0) = %s·Tad², want %s", pw, c, want)
			}
		}
	}
}

// TestTwoLoopPaths reduces every integral with total power ≤ 7 along the two paths of the
// recursion (different seeds, rows and elimination order) for mass sets of every kind; the
// results must be identical.
func TestTwoLoopPaths(t *testing.T) {
	zero := expr.RFInt(0)
	a2 := sq("a")
	sets := [][3]expr.RatFunc{
		{sq("a"), sq("b"), sq("c")},
		{sq("a"), sq("a"), sq("b")},
		{sq("a"), sq("a"), sq("a")},
		{zero, sq("a"), sq("b")},
		{zero, zero, sq("a")},
		{zero, sq("a"), sq("a")},
		{a2, a2.Scale(big.NewRat(4, 1)), a2.Scale(big.NewRat(9, 1))}, // threshold m3 = m1 + m2
		{expr.RFInt(1), expr.RFInt(2), expr.RFInt(5)},
	}
	n := 7
	if testing.Short() {
		n = 6
	}
	for _, ms := range sets {
		ms = sortMasses(ms)
		r0, r1 := newReducer(ms, 0), newReducer(ms, 1)
		for _, b := range powersUpTo(n) {
			e0, _, err0 := r0.integral(b)
			e1, _, err1 := r1.integral(b)
			if err0 != nil || err1 != nil {
				t.Fatalf("%v J%v: %v, %v", ms, b, err0, err1)
			}
			if !e0.Equal(e1) {
				t.Errorf("%v J%v: path 0 gives %s, path 1 gives %s", ms, b, e0, e1)
			}
		}
		if r0.rank3 && r0.noFast {
			t.Errorf("%v: the fast arithmetic was not used", ms)
		}
		if r0.rank3 && len(ms[0].Vars()) > 0 {
			// the plain rational-function recursion (used where a mass is not a polynomial)
			rs := newReducer(ms, 0)
			rs.noFast = true
			for _, b := range powersUpTo(6) {
				e0, _, _ := r0.integral(b)
				es, _, err := rs.integral(b)
				if err != nil || !e0.Equal(es) {
					t.Errorf("%v J%v: fast arithmetic %s, plain %s (%v)", ms, b, e0, es, err)
				}
			}
		}
	}
}

// TestTwoLoopThreshold checks that at λ² = 0 the sunset reduces to tadpoles and the result does
// not depend on which line is written first.
func TestTwoLoopThreshold(t *testing.T) {
	a2 := sq("a")
	ms := [3]expr.RatFunc{a2, a2.Scale(big.NewRat(4, 1)), a2.Scale(big.NewRat(9, 1))}
	e, _, err := TwoLoop([3]int{1, 1, 1}, ms, Numerator{})
	if err != nil {
		t.Fatal(err)
	}
	if strings.Contains(e.String(), SunName) || e.IsZero() {
		t.Errorf("threshold sunset = %s, want tadpoles only", e)
	}
	e2, _, err := TwoLoop([3]int{1, 1, 1}, [3]expr.RatFunc{ms[2], ms[0], ms[1]}, Numerator{})
	if err != nil || !e.Equal(e2) {
		t.Errorf("threshold sunset depends on the line order: %s vs %s (%v)", e, e2, err)
	}
}

// TestTwoLoopNumerators checks numerators against a second momentum routing: with l → −k − l
// (lines 2 and 3 exchanged) k·l becomes −k² − k·l, so
// I[k·l](m1, m2, m3) = −I[k²](m1, m3, m2) − I[k·l](m1, m3, m2) for the same powers with lines 2
// and 3 exchanged, and l² becomes (k+l)². It also checks a factorised integral with (k·l)²
// against the angular average (k·l)² → k² l²/d.
func TestTwoLoopNumerators(t *testing.T) {
	x := [3]expr.RatFunc{sq("a"), sq("b"), sq("c")}
	xs := [3]expr.RatFunc{x[0], x[2], x[1]}
	for _, p := range [][3]int{{1, 1, 1}, {2, 1, 1}, {1, 2, 3}, {2, 2, 1}} {
		ps := [3]int{p[0], p[2], p[1]}
		lhs, _, err := TwoLoop(p, x, Numerator{KL: 1})
		if err != nil {
			t.Fatal(err)
		}
		r1, _, err := TwoLoop(ps, xs, Numerator{K2: 1})
		if err != nil {
			t.Fatal(err)
		}
		r2, _, err := TwoLoop(ps, xs, Numerator{KL: 1})
		if err != nil {
			t.Fatal(err)
		}
		if rhs := r1.Add(r2).Neg(); !lhs.Equal(rhs) {
			t.Errorf("k·l with powers %v: %s, rerouted %s", p, lhs, rhs)
		}
		// l² ↔ (k+l)²: ∫ l²/(…) = ∫ (k+l)²/(…) with lines 2, 3 exchanged, and (k+l)² = k² + l² + 2k·l.
		l2, _, err := TwoLoop(p, x, Numerator{L2: 1})
		if err != nil {
			t.Fatal(err)
		}
		q2 := expr.Zero()
		for _, nm := range []struct {
			n Numerator
			c int64
		}{{Numerator{K2: 1}, 1}, {Numerator{L2: 1}, 1}, {Numerator{KL: 1}, 2}} {
			e, _, err := TwoLoop(ps, xs, nm.n)
			if err != nil {
				t.Fatal(err)
			}
			q2 = q2.Add(e.Scale(expr.RFInt(nm.c)))
		}
		if !l2.Equal(q2) {
			t.Errorf("l² with powers %v: %s, rerouted %s", p, l2, q2)
		}
	}
	// ∫∫ (k·l)²/((k²−a²)²(l²−b²)²) = (1/d) ∫ k²/(k²−a²)² ∫ l²/(l²−b²)²
	got, _, err := TwoLoop([3]int{2, 2, 0}, x, Numerator{KL: 2})
	if err != nil {
		t.Fatal(err)
	}
	ik, _, _ := Loop1(1, []Line{{x[0], 2}})
	il, _, _ := Loop1(1, []Line{{x[1], 2}})
	want := ik.MustMul(il).Scale(expr.RFInt(1).Mul(mustInv(t, expr.RFVar(expr.DimSymbol))))
	if !got.Equal(want) {
		t.Errorf("(k·l)² factorised: %s, want %s", got, want)
	}
}

func mustInv(t *testing.T, r expr.RatFunc) expr.RatFunc {
	t.Helper()
	inv, err := r.Inv()
	if err != nil {
		t.Fatal(err)
	}
	return inv
}

func TestTwoLoopErrors(t *testing.T) {
	x := [3]expr.RatFunc{sq("a"), sq("b"), sq("c")}
	if _, _, err := TwoLoop([3]int{10, 10, 10}, x, Numerator{}); err == nil {
		t.Error("no error for a total power beyond the limit")
	}
	if _, _, err := TwoLoop([3]int{1, 1, 1}, x, Numerator{K2: -1}); err == nil {
		t.Error("no error for a negative numerator power")
	}
	if _, _, err := TwoLoop([3]int{1, 1, 1}, [3]expr.RatFunc{rf("d"), x[1], x[2]}, Numerator{}); err == nil {
		t.Error("no error for a mass named d")
	}
	zero := expr.RFInt(0)
	e, info, err := TwoLoop([3]int{2, 1, 1}, [3]expr.RatFunc{zero, zero, zero}, Numerator{})
	if err != nil || !e.IsZero() || len(info.Scaleless) == 0 {
		t.Errorf("massless sunset: %s, %v, %v", e, info, err)
	}
	// Two numerator lines: the l integral has no scale.
	e, info, err = TwoLoop([3]int{2, -1, -1}, x, Numerator{})
	if err != nil || !e.IsZero() || len(info.Scaleless) == 0 {
		t.Errorf("J(2,-1,-1): %s, %v, %v", e, info, err)
	}
}

// TestTwoLoopConcurrent reduces the same integrals from several goroutines (run with -race).
func TestTwoLoopConcurrent(t *testing.T) {
	resetTwoLoopCache()
	x := [3]expr.RatFunc{sq("p"), sq("q"), sq("r")}
	ref, _, err := TwoLoop([3]int{2, 2, 1}, x, Numerator{KL: 1})
	if err != nil {
		t.Fatal(err)
	}
	resetTwoLoopCache()
	var wg sync.WaitGroup
	errs := make(chan string, 8)
	for g := range 4 {
		wg.Add(1)
		go func() {
			defer wg.Done()
			ms := x
			if g%2 == 1 {
				ms = [3]expr.RatFunc{x[2], x[0], x[1]}
			}
			pw := [3]int{2, 2, 1}
			if g%2 == 1 {
				pw = [3]int{1, 2, 2}
			}
			e, _, err := TwoLoop(pw, ms, Numerator{})
			if err != nil {
				errs <- err.Error()
			}
			_ = e
		}()
	}
	wg.Wait()
	close(errs)
	for e := range errs {
		t.Error(e)
	}
	again, _, err := TwoLoop([3]int{2, 2, 1}, x, Numerator{KL: 1})
	if err != nil || !again.Equal(ref) {
		t.Errorf("cached result differs: %v", err)
	}
}
