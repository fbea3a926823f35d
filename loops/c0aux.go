package loops

import (
	"fmt"
	"math"
	"math/cmplx"
	"sort"
	"sync"

	"gonum.org/v1/gonum/integrate/quad"
)

// dividedXlnX returns the divided difference g[x_0, …, x_{n−1}] of g(x) = x ln x (all x ≥ 0). At
// zero external momenta partial fractions give C0 = −g[m0², m1², m2²] and D0 = −g[m0², …, m3²]
// (the poles and constants cancel because the divided differences of 1 and x vanish for n ≥ 3).
// Clustered points (spread ≤ 0.3 of the middle value) use the Taylor series about the middle value,
// g[…] = Σ_k g^{(k+n−1)}(b)/(k+n−1)! h_k(x − b), with g^{(j)}(b) = (−1)^j (j−2)!/b^{j−1} and h_k the
// complete homogeneous symmetric polynomials; otherwise the recursion with first differences in
// the form ln b + a ln(a/b)/(a − b), which keeps close pairs accurate.
func dividedXlnX(xs []float64) float64 {
	x := append([]float64(nil), xs...)
	sort.Float64s(x)
	n := len(x)
	b := x[n/2]
	if b > 0 && x[n-1]-x[0] <= 0.3*b {
		d := make([]float64, n)
		for i := range x {
			d[i] = (x[i] - b) / b
		}
		// h_k(d) by the product of 1/(1 − d_i z)
		const K = 60
		h := make([]float64, K)
		h[0] = 1
		for _, di := range d {
			for k := 1; k < K; k++ {
				h[k] += di * h[k-1]
			}
		}
		// g^{(k+n−1)}(b)/(k+n−1)! = (−1)^{k+n−1} (k+n−3)!/((k+n−1)! b^{k+n−2})
		s := 0.0
		for k := 0; k < K; k++ {
			j := float64(k + n - 1)
			t := h[k] / (j * (j - 1))
			if (k+n-1)%2 == 1 {
				t = -t
			}
			s += t
			if k > 4 && math.Abs(t) < 1e-18*math.Abs(s) {
				break
			}
		}
		return s / math.Pow(b, float64(n-2))
	}
	// recursion on consecutive points
	g := make([]float64, n)
	for i := 0; i+1 < n; i++ {
		g[i] = firstDiffXlnX(x[i], x[i+1])
	}
	for order := 2; order < n; order++ {
		for i := 0; i+order < n; i++ {
			g[i] = (g[i+1] - g[i]) / (x[i+order] - x[i])
		}
	}
	return g[0]
}

// firstDiffXlnX returns (a ln a − b ln b)/(a − b) (= 1 + ln a for a = b).
func firstDiffXlnX(a, b float64) float64 {
	if a == b {
		return 1 + math.Log(a)
	}
	if a == 0 {
		return math.Log(b)
	}
	if b == 0 {
		return math.Log(a)
	}
	// ln b + 1 + [a ln(a/b) − (a − b)]/(a − b) = ln b + (a/(a−b)) ln(1 + (a−b)/b)
	d := (a - b) / b
	return math.Log(b) + (a/b)*math.Log1p(d)/d
}

// quadKappa bounds the relative variation of F over the simplex below which C0 is integrated by
// Gauss–Legendre quadrature (see variation).
const quadKappa = 0.1

// variation returns κ with |F(x)/Fc − 1| ≤ κ on the simplex, Fc the mean squared mass:
// F − Fc = Σ x_i (m_i² − Fc) − Σ_{i<j} x_i x_j s_ij and Σ_{i<j} x_i x_j ≤ 1/3. It is +Inf when a
// mass vanishes.
func (t *tri) variation() float64 {
	fc := (t.m2[0] + t.m2[1] + t.m2[2]) / 3
	if t.m2[0] == 0 || t.m2[1] == 0 || t.m2[2] == 0 {
		return math.Inf(1)
	}
	dm := 0.0
	for _, m := range t.m2 {
		dm = math.Max(dm, math.Abs(m-fc))
	}
	ds := scaleOf(t.s[0][1], t.s[1][2], t.s[0][2])
	return (dm + ds/3) / fc
}

// gaussPoints returns the n-point Gauss–Legendre rule on [0, 1] (gonum).
func gaussPoints(n int) (x, w []float64) {
	gaussOnce.Do(func() {
		gaussRules = make([][2][]float64, 40)
		for k := 1; k < 40; k++ {
			xs := make([]float64, k)
			ws := make([]float64, k)
			quad.Legendre{}.FixedLocations(xs, ws, 0, 1)
			gaussRules[k] = [2][]float64{xs, ws}
		}
	})
	r := gaussRules[n]
	return r[0], r[1]
}

var (
	gaussOnce  sync.Once
	gaussRules [][2][]float64
)

// nodesFor returns the number of Gauss points per dimension that integrates the first terms of the
// Taylor series of 1/F (or 1/F²) in F/Fc − 1 exactly, so that the error is bounded by the tail,
// ≲ (tailPower+1) κ^{n−lost} < 1e-17.
func nodesFor(kappa float64, lost int) int {
	n := int(math.Ceil(-17/math.Log10(kappa))) + lost
	if n < 4 {
		n = 4
	}
	if n > 39 {
		n = 39
	}
	return n
}

// quadrature returns −∫_simplex 1/F by a collapsed (Duffy) product Gauss rule, x1 = u,
// x2 = (1−u) v. With n points per direction all Taylor terms (F/Fc − 1)^k, k < n, of 1/F are
// integrated exactly (they are polynomials of degree ≤ 2k+1 in u and 2k in v), so the error is
// below 2 κ^n/(1−κ)/Fc for a variation κ.
func (t *tri) quadrature(kappa float64) float64 {
	n := nodesFor(kappa, 1)
	x, w := gaussPoints(n)
	s := 0.0
	for a := 0; a < n; a++ {
		u := x[a]
		for b := 0; b < n; b++ {
			v := x[b]
			x1 := u
			x2 := (1 - u) * v
			x0 := 1 - x1 - x2
			f := x0*t.m2[0] + x1*t.m2[1] + x2*t.m2[2] - x0*x1*t.s[0][1] - x1*x2*t.s[1][2] - x0*x2*t.s[0][2]
			s += w[a] * w[b] * (1 - u) / f
		}
	}
	return -s
}

// c0DegenerateGram handles λ(p1², (p2−p1)², p2²) = 0 (collinear external momenta). Then the two
// points P coincide, the polar form is constant on the plane, B = b·(x0+x1+x2), x* lies at infinity
// and C0 = (1/(2b)) Σ_i P_i ∫₀¹ ln F_i(t) dt. If also b = 0, F is constant along P and the
// integral reduces to one dimension (chord).
func c0DegenerateGram(t *tri) (complex128, float64, error) {
	s01, s12, s02 := t.s[0][1], t.s[1][2], t.s[0][2]
	q := sum3(s02, s12, -s01)
	var P [3]float64
	if math.Abs(s02) >= math.Abs(s12) {
		a := -q / (2 * s02)
		P = [3]float64{a, 1, -a - 1}
	} else {
		b := -q / (2 * s12)
		P = [3]float64{1, b, -1 - b}
	}
	var l [3]float64
	lmax := 0.0
	for i := 0; i < 3; i++ {
		for k := 0; k < 3; k++ {
			l[i] += t.y(i, k) * P[k]
		}
		lmax = math.Max(lmax, math.Abs(t.y(i, i)))
	}
	b := (l[0] + l[1] + l[2]) / 3
	pn := math.Abs(P[0]) + math.Abs(P[1]) + math.Abs(P[2])
	if math.Abs(b) <= 1e-9*pn*math.Max(lmax, t.scale()) {
		return c0Chord(t, P)
	}
	var sum complex128
	mag := 0.0
	for i := 0; i < 3; i++ {
		if P[i] == 0 {
			continue
		}
		j, k := edge(i)
		li := logIntegral(t.s[j][k], t.m2[j], t.m2[k])
		sum += complex(P[i], 0) * li
		mag += math.Abs(P[i]) * cmplx.Abs(li)
	}
	sum /= complex(2*b, 0)
	return sum, mag / (2 * math.Abs(b)) / math.Max(cmplx.Abs(sum), 1e-300), nil
}

// c0Chord evaluates C0 = −∫ 1/F when F is constant along the direction P of the plane: with η a
// linear coordinate across P, the lengths of the chords η = const form a tent of area ½ over the
// edge from the vertex of lowest η to the vertex of highest η, and C0 = −∫₀¹ T(τ)/F_e(τ) dτ along
// that edge.
func c0Chord(t *tri, P [3]float64) (complex128, float64, error) {
	// w = P × (1,1,1) is orthogonal to P and to (1,1,1)
	w := [3]float64{P[1] - P[2], P[2] - P[0], P[0] - P[1]}
	idx := []int{0, 1, 2}
	sort.Slice(idx, func(a, b int) bool { return w[idx[a]] < w[idx[b]] })
	lo, mid, hi := idx[0], idx[1], idx[2]
	if w[hi]-w[lo] <= 0 {
		return 0, 0, fmt.Errorf("%w: C0 with a degenerate chord direction", ErrNotCovered)
	}
	tm := (w[mid] - w[lo]) / (w[hi] - w[lo])
	// F on the edge lo → hi: A τ² + B τ + C
	A := t.s[lo][hi]
	B := 2 * (t.yy[lo][hi] - t.yy[lo][lo])
	C := t.m2[lo]
	disc := edgeDisc(t.yy[lo][hi], t.yy[lo][lo], t.yy[hi][hi])
	var sum complex128
	if tm > 0 {
		sum += intLinOverQuad(0, 1/tm, A, B, C, disc, 0, tm)
	}
	if tm < 1 {
		sum += intLinOverQuad(1/(1-tm), -1/(1-tm), A, B, C, disc, tm, 1)
	}
	return -sum, 1, nil
}

// intLinOverQuad returns ∫_lo^hi (a0 + a1 τ)/(Aτ² + Bτ + C − i0) dτ.
func intLinOverQuad(a0, a1, A, B, C, disc, lo, hi float64) complex128 {
	roots, _, ok := quadRootsI0(A, B, C, disc)
	if !ok {
		return cmplx.Inf()
	}
	lead := complex(A, 0)
	switch len(roots) {
	case 0:
		return complex((a0*(hi-lo)+a1*(hi*hi-lo*lo)/2)/C, 0)
	case 1:
		lead = complex(B, 0)
		y := roots[0]
		// (a0 + a1 τ)/(B(τ − y)) = a1/B + (a0 + a1 y)/(B(τ − y))
		l := clog(complex(hi, 0)-y) - clog(complex(lo, 0)-y)
		return (complex(a1*(hi-lo), 0) + (complex(a0, 0)+complex(a1, 0)*y)*l) / lead
	}
	y1, y2 := roots[0], roots[1]
	c1 := (complex(a0, 0) + complex(a1, 0)*y1) / (y1 - y2)
	c2 := (complex(a0, 0) + complex(a1, 0)*y2) / (y2 - y1)
	l1 := clog(complex(hi, 0)-y1) - clog(complex(lo, 0)-y1)
	l2 := clog(complex(hi, 0)-y2) - clog(complex(lo, 0)-y2)
	return (c1*l1 + c2*l2) / lead
}

// c0Fallback re-evaluates an ill-conditioned triangle in arbitrary precision.
func c0Fallback(t *tri, cause error) (complex128, error) {
	if cause != nil {
		return 0, cause
	}
	return c0BigFallback(t)
}
