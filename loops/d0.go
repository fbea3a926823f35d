package loops

import (
	"fmt"
	"math"
	"math/cmplx"
)

// box describes a box: squared internal masses m2[i] and invariants s[i][j] = (k_i − k_j)² with
// k_0 = 0, k_i = p_i (Denner's order: s01 = p1², s12 = (p2−p1)², s23 = (p3−p2)², s03 = p3²,
// s02 = p2², s13 = (p3−p1)²).
type box struct {
	m2 [4]float64
	s  [4][4]float64
	yy [4][4]float64 // Y_ij = (m_i² + m_j² − s_ij)/2
}

func newBox(s01, s12, s23, s03, s02, s13, m02, m12, m22, m32 float64) box {
	var b box
	b.m2 = [4]float64{m02, m12, m22, m32}
	set := func(i, j int, v float64) { b.s[i][j], b.s[j][i] = v, v }
	set(0, 1, s01)
	set(1, 2, s12)
	set(2, 3, s23)
	set(0, 3, s03)
	set(0, 2, s02)
	set(1, 3, s13)
	b.fillY()
	return b
}

func (b *box) fillY() {
	for i := 0; i < 4; i++ {
		b.yy[i][i] = b.m2[i]
		for j := i + 1; j < 4; j++ {
			v := 0.5 * sum3(b.m2[i], b.m2[j], -b.s[i][j])
			b.yy[i][j], b.yy[j][i] = v, v
		}
	}
}

func (b *box) y(i, j int) float64 { return b.yy[i][j] }

func (b *box) scale() float64 {
	s := 0.0
	for i := 0; i < 4; i++ {
		s = math.Max(s, b.m2[i])
		for j := i + 1; j < 4; j++ {
			s = math.Max(s, math.Abs(b.s[i][j]))
		}
	}
	return s
}

// D0 returns the scalar four-point function
// D0(p1², (p2−p1)², (p3−p2)², p3², p2², (p3−p1)²; m0, m1, m2, m3) for real invariants
// s1 … s6 in that order and squared masses m02 … m32 ≥ 0. Infrared-divergent boxes covered are
// listed in docs/INTEGRALS.md; others return an error wrapping ErrNotCovered.
func D0(s1, s2, s3, s4, s5, s6, m02, m12, m22, m32, mu2 float64) (Value, error) {
	if err := checkInputs("D0", []float64{s1, s2, s3, s4, s5, s6}, []float64{m02, m12, m22, m32}, mu2); err != nil {
		return Value{}, err
	}
	b := newBox(s1, s2, s3, s4, s5, s6, m02, m12, m22, m32)
	if v, ok, err := d0Divergent(&b, mu2); ok {
		return v, err
	}
	f, err := d0Finite(&b)
	if err != nil {
		return Value{}, err
	}
	return Value{Finite: f}, nil
}

const d0Cond = 1e3

// d0Finite evaluates an infrared-finite box.
func d0Finite(b *box) (complex128, error) {
	sc := b.scale()
	if sc == 0 {
		return 0, fmt.Errorf("%w: D0 with all masses and invariants zero (scaleless)", ErrNotCovered)
	}
	allZero := true
	for i := 0; i < 4; i++ {
		for j := i + 1; j < 4; j++ {
			if !same(b.s[i][j], 0, sc) {
				allZero = false
			}
		}
	}
	if allZero {
		return complex(-dividedXlnX(b.m2[:]), 0), nil
	}
	if k := b.variation(); k <= quadKappa4 {
		return complex(b.quadrature(k), 0), nil
	}
	v, cond, err := d0Projection(b)
	if err == nil && cond <= d0Cond {
		return v, nil
	}
	if err != nil && !isIllConditioned(err) {
		return 0, err
	}
	return d0BigFallback(b)
}

// projPoint is a point P = μ e_a + ν e_b on the quadric F = 0 (on the line through the vertices
// a and b of the simplex) with its polar form l = Y P.
type projPoint struct {
	a, b   int
	mu, nu float64
	l      [4]float64
	score  float64
}

// d0Projection evaluates D0 = ∫_simplex F^{−2} by projecting from a real point P of the quadric
// F = 0 whose polar form B(x) = xᵀ Y P has one sign on the simplex. With h = −P/(2 B F), div h = F^{−2}
// (because Pᵀ Y P = 0), and the projective Stokes formula gives
//
//	D0 = ½ Σ_i P_i ∫_{face i} dx / (B F),
//
// where face i is the face x_i = 0. On a face B = Σ_j l_j x_j with all l_j of one sign, and the
// substitution x_j = u_j/l_j (Cheng–Wu) turns ∫ 1/(B F) into −C0(Y′)/Π_j l_j with the rescaled
// Cayley matrix Y′_jk = Y_jk/(l_j l_k): a triangle with real masses m′_j² = m_j²/l_j² and real
// invariants, to which C0 applies with the same −i0 (the rescaling keeps the sign of F). P is taken
// on an edge line (μ e_a + ν e_b), or at a vertex of a massless line (P = e_a, one face).
// Derivation and conditions in docs/INTEGRALS.md.
func d0Projection(bx *box) (complex128, float64, error) {
	ch, err := selectProjection(bx)
	if err != nil {
		return 0, 0, err
	}
	return d0FromPoint(bx, ch.P, ch.l)
}

// projChoice records the projection point chosen for a box, so that the arbitrary-precision
// path can recompute the same point: an edge point μ e_a + ν e_b, or P = Y⁻¹ v with
// v = 1 + τ d.
type projChoice struct {
	edge   bool
	a, b   int
	mu, nu float64
	d      [4]float64
	tau    float64
	P, l   [4]float64
}

// selectProjection prefers a well-balanced edge point (two faces), then a general point (four
// faces), then any admissible edge point.
func selectProjection(bx *box) (projChoice, error) {
	best := projPoint{score: -1}
	for a := 0; a < 4; a++ {
		for c := a + 1; c < 4; c++ {
			pts, np := edgePoints(bx, a, c)
			for _, p := range pts[:np] {
				if p.score > best.score {
					best = p
				}
			}
		}
	}
	edgeChoice := func() projChoice {
		ch := projChoice{edge: true, a: best.a, b: best.b, mu: best.mu, nu: best.nu, l: best.l}
		ch.P[best.a], ch.P[best.b] = best.mu, best.nu
		return ch
	}
	if best.score >= 0.05 {
		return edgeChoice(), nil
	}
	if ch, ok := generalPoint(bx); ok {
		return ch, nil
	}
	if best.score > 0 {
		return edgeChoice(), nil
	}
	return projChoice{}, fmt.Errorf("%w: D0 with no real point P of the quadric F = 0 whose polar form xᵀYP keeps one sign on the simplex (a physical-region configuration; invariants %v, masses² %v)",
		ErrNotCovered, bx.s, bx.m2)
}

// d0FromPoint evaluates D0 = ½ Σ_i P_i ∫_{face i} 1/(B F) = −½ Σ_i P_i C0(face i, rescaled by l)/Π_{j≠i} l_j.
func d0FromPoint(bx *box, P, l [4]float64) (complex128, float64, error) {
	var sum complex128
	mag := 0.0
	for i := 0; i < 4; i++ {
		if P[i] == 0 {
			continue
		}
		var v [3]int
		n := 0
		for j := 0; j < 4; j++ {
			if j != i {
				v[n] = j
				n++
			}
		}
		// rescaled Cayley matrix Y′_pq = Y_pq/(l_p l_q) of the face
		var yf [3][3]float64
		prod := 1.0
		for p := 0; p < 3; p++ {
			prod *= l[v[p]]
			for q := 0; q < 3; q++ {
				yf[p][q] = bx.y(v[p], v[q]) / (l[v[p]] * l[v[q]])
			}
		}
		t := triFromY(yf)
		if _, div, _ := c0Divergent(&t, 1); div {
			return 0, 0, fmt.Errorf("%w: D0 projection onto an infrared-singular face", ErrNotCovered)
		}
		c, err := c0Finite(&t)
		if err != nil {
			return 0, 0, err
		}
		term := -0.5 * complex(P[i]/prod, 0) * c
		sum += term
		mag += cmplx.Abs(term)
	}
	return sum, mag / math.Max(cmplx.Abs(sum), 1e-300), nil
}

// generalPoint looks for v > 0 with vᵀ Y⁻¹ v = 0 along the lines v = 1 + τ d for a few directions d,
// keeping the most balanced v (largest min v/max v). Then P = Y⁻¹ v lies on the quadric and its
// polar form Σ v_j x_j is positive on the simplex.
func generalPoint(bx *box) (ch projChoice, ok bool) {
	Z, inv := inverse4(bx)
	if !inv {
		return ch, false
	}
	q := func(a, b [4]float64) float64 {
		s := 0.0
		for i := 0; i < 4; i++ {
			for j := 0; j < 4; j++ {
				s += a[i] * Z[i][j] * b[j]
			}
		}
		return s
	}
	one := [4]float64{1, 1, 1, 1}
	bestScore := 0.0
	try := func(d [4]float64) {
		// (1 + τ d)ᵀ Z (1 + τ d) = c0 + 2 c1 τ + c2 τ² = 0
		c0, c1, c2 := q(one, one), q(one, d), q(d, d)
		var taus []float64
		if c2 == 0 {
			if c1 != 0 {
				taus = append(taus, -c0/(2*c1))
			}
		} else if disc := c1*c1 - c0*c2; disc >= 0 {
			r := -(c1 + math.Copysign(math.Sqrt(disc), c1))
			taus = append(taus, r/c2)
			if r != 0 {
				taus = append(taus, c0/r)
			}
		}
		for _, tau := range taus {
			var v [4]float64
			lo, hi := math.Inf(1), 0.0
			for i := range v {
				v[i] = 1 + tau*d[i]
				lo = math.Min(lo, v[i])
				hi = math.Max(hi, math.Abs(v[i]))
			}
			if lo <= 0 || lo/hi <= bestScore {
				continue
			}
			bestScore = lo / hi
			ch = projChoice{d: d, tau: tau, l: v}
			for i := 0; i < 4; i++ {
				for j := 0; j < 4; j++ {
					ch.P[i] += Z[i][j] * v[j]
				}
			}
			ok = true
		}
	}
	for i := 0; i < 4; i++ {
		var d [4]float64
		d[i] = 1
		try(d)
		for j := i + 1; j < 4; j++ {
			var e [4]float64
			e[i], e[j] = 1, -1
			try(e)
			e[i], e[j] = 1, 1
			try(e)
		}
	}
	return ch, ok && bestScore > 1e-3
}

// inverse4 returns Y⁻¹ by Gauss–Jordan elimination with partial pivoting.
func inverse4(bx *box) ([4][4]float64, bool) {
	var a [4][8]float64
	for i := 0; i < 4; i++ {
		for j := 0; j < 4; j++ {
			a[i][j] = bx.y(i, j)
		}
		a[i][4+i] = 1
	}
	sc := bx.scale()
	for c := 0; c < 4; c++ {
		p := c
		for r := c + 1; r < 4; r++ {
			if math.Abs(a[r][c]) > math.Abs(a[p][c]) {
				p = r
			}
		}
		if math.Abs(a[p][c]) <= 1e-13*sc {
			return [4][4]float64{}, false
		}
		a[c], a[p] = a[p], a[c]
		piv := a[c][c]
		for j := 0; j < 8; j++ {
			a[c][j] /= piv
		}
		for r := 0; r < 4; r++ {
			if r != c && a[r][c] != 0 {
				f := a[r][c]
				for j := 0; j < 8; j++ {
					a[r][j] -= f * a[c][j]
				}
			}
		}
	}
	var z [4][4]float64
	for i := 0; i < 4; i++ {
		for j := 0; j < 4; j++ {
			z[i][j] = a[i][4+j]
		}
	}
	return z, true
}

// edgePoints returns the real points μ e_a + ν e_b of the quadric on the line through vertices
// a and b (Y_aa μ² + 2 Y_ab μν + Y_bb ν² = 0) whose polar form has one strict sign on the faces
// used, scored by min|l|/max|l| over those faces (at most two; n is their number).
func edgePoints(bx *box, a, c int) (out [2]projPoint, n int) {
	A, B, C := bx.y(a, a), bx.y(a, c), bx.y(c, c)
	var cands [2][2]float64 // (μ, ν)
	nc := 0
	add := func(mu, nu float64) { cands[nc] = [2]float64{mu, nu}; nc++ }
	switch {
	case A == 0 && C == 0:
		if B == 0 {
			return out, 0
		}
		add(1, 0)
		add(0, 1)
	case A == 0:
		// ν (2B μ + C ν) = 0: ν = 0 (P = e_a) or μ = −C/(2B) ν
		add(1, 0)
		if B != 0 {
			add(-C/(2*B), 1)
		}
	case C == 0:
		add(0, 1)
		if B != 0 {
			add(1, -A/(2*B))
		}
	default:
		disc := B*B - A*C
		if disc <= 0 {
			return out, 0
		}
		// μ/ν roots of A r² + 2B r + C = 0
		q := -(B + math.Copysign(math.Sqrt(disc), B))
		add(q/A, 1)
		add(C/q, 1)
	}
	for k := 0; k < nc; k++ {
		p := projPoint{a: a, b: c, mu: cands[k][0], nu: cands[k][1]}
		for j := 0; j < 4; j++ {
			p.l[j] = p.mu*bx.y(j, a) + p.nu*bx.y(j, c)
		}
		lo, hi := math.Inf(1), 0.0
		sign := 0.0
		ok := true
		for j := 0; j < 4; j++ {
			used := (p.mu != 0 && j != a) || (p.nu != 0 && j != c)
			if !used {
				continue
			}
			if p.l[j] == 0 || (sign != 0 && math.Signbit(p.l[j]) != math.Signbit(sign)) {
				ok = false
				break
			}
			sign = p.l[j]
			lo = math.Min(lo, math.Abs(p.l[j]))
			hi = math.Max(hi, math.Abs(p.l[j]))
		}
		if !ok || hi == 0 {
			continue
		}
		p.score = lo / hi
		out[n] = p
		n++
	}
	return out, n
}

const quadKappa4 = 0.05

// variation returns κ with |F/Fc − 1| ≤ κ on the simplex (Σ_{i<j} x_i x_j ≤ 3/8 for four variables).
func (b *box) variation() float64 {
	fc := 0.25 * (b.m2[0] + b.m2[1] + b.m2[2] + b.m2[3])
	dm := 0.0
	for _, m := range b.m2 {
		if m == 0 {
			return math.Inf(1)
		}
		dm = math.Max(dm, math.Abs(m-fc))
	}
	ds := 0.0
	for i := 0; i < 4; i++ {
		for j := i + 1; j < 4; j++ {
			ds = math.Max(ds, math.Abs(b.s[i][j]))
		}
	}
	return (dm + 0.375*ds) / fc
}

// quadrature returns ∫_simplex F^{−2} by a collapsed product Gauss rule (x1 = u, x2 = (1−u)v,
// x3 = (1−u)(1−v)w); the Taylor terms (F/Fc − 1)^k with k ≤ n−2 are integrated exactly.
func (b *box) quadrature(kappa float64) float64 {
	n := nodesFor(kappa, 2)
	x, w := gaussPoints(n)
	s := 0.0
	for i := 0; i < n; i++ {
		u := x[i]
		for j := 0; j < n; j++ {
			v := x[j]
			for k := 0; k < n; k++ {
				ww := x[k]
				x1 := u
				x2 := (1 - u) * v
				x3 := (1 - u) * (1 - v) * ww
				x0 := 1 - x1 - x2 - x3
				xs := [4]float64{x0, x1, x2, x3}
				f := 0.0
				for p := 0; p < 4; p++ {
					f += xs[p] * b.m2[p]
					for q := p + 1; q < 4; q++ {
						f -= xs[p] * xs[q] * b.s[p][q]
					}
				}
				jac := (1 - u) * (1 - u) * (1 - v)
				s += w[i] * w[j] * w[k] * jac / (f * f)
			}
		}
	}
	return s
}
