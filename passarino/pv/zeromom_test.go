package pv

import (
	"fmt"
	"math"
	"testing"

	"loopmatch/expr"
)

// betaMoment returns ∫₀¹ x^a (1−x)^b dx = a! b!/(a+b+1)!.
func betaMoment(a, b int) float64 {
	return float64(factorial(a)) * float64(factorial(b)) / float64(factorial(a+b+1))
}

// masslessEndRef evaluates (F) for N = 2, p² = 0 with one mass zero in closed form, since the
// logarithm at the massless end spoils Gauss–Legendre quadrature. With e = j and
// Δ = x m1² (m0 = 0): ∫x^a Δ^e (H_e − ln(Δ/μ²)) = m1^{2e} [(H_e − ln(m1²/μ²))/(a+e+1) + 1/(a+e+1)²];
// with Δ = (1−x) m0² (m1 = 0): m0^{2e} B(a+1, e+1) [H_e − ln(m0²/μ²) − (H_e − H_{a+e+1})], using
// ∫x^a(1−x)^e ln(1−x) = B(a+1, e+1)(H_e − H_{a+e+1}) (derivative of the Beta function).
func masslessEndRef(l label, m02, m12, mu2 float64) fpResult {
	j, a := l.j, l.a[0]
	e := j
	h := func(n int) float64 {
		s := 0.0
		for k := 1; k <= n; k++ {
			s += 1 / float64(k)
		}
		return s
	}
	var mom, logMom float64 // ∫x^a Δ^e and ∫x^a Δ^e ln(Δ/μ²)
	if m02 == 0 {
		n := float64(a + e + 1)
		mom = math.Pow(m12, float64(e)) / n
		logMom = math.Pow(m12, float64(e)) * (math.Log(m12/mu2)/n - 1/(n*n))
	} else {
		b := betaMoment(a, e)
		mom = math.Pow(m02, float64(e)) * b
		logMom = math.Pow(m02, float64(e)) * b * (math.Log(m02/mu2) + h(e) - h(a+e+1))
	}
	c := math.Pow(2, -float64(j)) / float64(factorial(e))
	if l.rank()%2 == 1 {
		c = -c
	}
	return fpResult{pole: c * mom, finite: c * (h(e)*mom - logMom)}
}

// TestZeroMomentumTwoPoint checks the closed form used for two-point functions with p² = 0
// (zeromom.go), all coefficients to rank 6, against (F): Gauss–Legendre quadrature for two
// masses, the Beta-function moments above with one mass zero, and zero (a scaleless integral)
// with both.
func TestZeroMomentumTwoPoint(t *testing.T) {
	cases := []struct{ m02, m12 float64 }{{1, 3}, {3, 1}, {2.5, 2.5}, {0, 2}, {2, 0}, {0, 0}}
	for _, tc := range cases {
		t.Run(fmt.Sprintf("m0²=%g,m1²=%g", tc.m02, tc.m12), func(t *testing.T) {
			k, err := NewKinematics([]expr.RatFunc{expr.RFInt(0)}, []expr.RatFunc{ratOf(tc.m02), ratOf(tc.m12)})
			if err != nil {
				t.Fatal(err)
			}
			pt := fpPoint{n: 2, mu2: 1.3, m2: [MaxPoints]float64{tc.m02, tc.m12}}
			red := NewReducer(k)
			ev := newBigEvaluator(pt.mu2)
			for r := 0; r <= MaxRank; r++ {
				for _, idx := range Indices(2, r) {
					l, _ := parseIndex(2, idx)
					e, err := red.Coefficient(idx)
					if err != nil {
						t.Fatalf("%s: %v", Name(2, idx), err)
					}
					if tc.m02 == 0 && tc.m12 == 0 {
						if !e.IsZero() {
							t.Errorf("%s with two massless lines = %s, want 0 (scaleless)", Name(2, idx), e)
						}
						continue
					}
					var want fpResult
					if tc.m02 == 0 || tc.m12 == 0 {
						want = masslessEndRef(l, tc.m02, tc.m12, pt.mu2)
					} else {
						want = fpCoefficients(pt, []label{l}, 40)[0]
					}
					bp, bf, err := ev.eval(e)
					if err != nil {
						t.Fatal(err)
					}
					pole, _ := bp.Float64()
					fin, _ := bf.Float64()
					if math.Abs(fin-want.finite) > 1e-12*math.Max(1, math.Abs(want.finite)) || math.Abs(pole-want.pole) > 1e-12*math.Max(1, math.Abs(want.pole)) {
						t.Errorf("%s = %s: pole %.15g finite %.15g, want pole %.15g finite %.15g", Name(2, idx), e, pole, fin, want.pole, want.finite)
					}
				}
			}
		})
	}
}

// TestLightlikeLegs checks triangles and boxes with light-like external legs, whose two-point
// sub-integrals have p² = 0 and go through the closed form inside the recursion, against the
// quadrature of (F) (all masses positive, so Δ > 0 on the simplex): a triangle with p1² = 0 to
// rank 4 and a box with p1² = (p2−p1)² = (p3−p2)² = p3² = 0, s = p2² = −3, t = (p3−p1)² = −2 to
// rank 3.
func TestLightlikeLegs(t *testing.T) {
	cases := []struct {
		name    string
		s       []float64
		m2      []float64
		maxRank int
	}{
		{"C p1²=0", []float64{0, -2.5, -1.5}, []float64{1.5, 0.75, 2}, 4},
		{"D massless legs", []float64{0, 0, 0, 0, -3, -2}, []float64{1, 2, 1.5, 0.5}, 3},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			n := len(tc.m2)
			pt := fpPoint{n: n, mu2: 1.1}
			var inv, m2 []expr.RatFunc
			for i, p := range invariantPairs[n] {
				pt.s[p[0]][p[1]], pt.s[p[1]][p[0]] = tc.s[i], tc.s[i]
				inv = append(inv, ratOf(tc.s[i]))
			}
			for i, m := range tc.m2 {
				pt.m2[i] = m
				m2 = append(m2, ratOf(m))
			}
			k, err := NewKinematics(inv, m2)
			if err != nil {
				t.Fatal(err)
			}
			var idxs [][]int
			var ls []label
			for r := 0; r <= tc.maxRank; r++ {
				for _, idx := range Indices(n, r) {
					l, _ := parseIndex(n, idx)
					idxs = append(idxs, idx)
					ls = append(ls, l)
				}
			}
			ref := fpCoefficients(pt, ls, 40)
			red := NewReducer(k)
			ev := newBigEvaluator(pt.mu2)
			for i, idx := range idxs {
				e, err := red.Coefficient(idx)
				if err != nil {
					t.Fatalf("%s: %v", Name(n, idx), err)
				}
				bp, bf, err := ev.eval(e)
				if err != nil {
					t.Fatal(err)
				}
				pole, _ := bp.Float64()
				fin, _ := bf.Float64()
				if math.Abs(fin-ref[i].finite) > 1e-8*math.Abs(ref[i].finite) || math.Abs(pole-ref[i].pole) > 1e-10*math.Max(1, math.Abs(ref[i].pole)) {
					t.Errorf("%s: pole %.15g finite %.15g, quadrature pole %.15g finite %.15g", Name(n, idx), pole, fin, ref[i].pole, ref[i].finite)
				}
			}
		})
	}
}
