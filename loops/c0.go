package loops

import (
	"fmt"
	"math"
	"math/cmplx"
)

// tri describes a triangle: squared internal masses m2[i] and invariants s[i][j] = (k_i − k_j)²
// between lines i and j, with k_0 = 0, k_1 = p1, k_2 = p2 (Denner's order: s[0][1] = p1²,
// s[1][2] = (p2−p1)², s[0][2] = p2²).
//
// The modified Cayley matrix Y_ij = (m_i² + m_j² − s_ij)/2 is stored as well: a triangle built from
// a Cayley matrix (a rescaled face of a box) keeps its exact Y, whose small entries (on-shell legs
// next to small masses) carry the information that the rounded invariants would lose.
type tri struct {
	m2 [3]float64
	s  [3][3]float64
	yy [3][3]float64
	// fromY marks a triangle whose Cayley matrix is the primary data (a rescaled box face); for
	// the others differences of Y entries are formed from the masses and invariants.
	fromY bool
}

func newTri(s01, s12, s02, m02, m12, m22 float64) tri {
	var t tri
	t.m2 = [3]float64{m02, m12, m22}
	t.s[0][1], t.s[1][0] = s01, s01
	t.s[1][2], t.s[2][1] = s12, s12
	t.s[0][2], t.s[2][0] = s02, s02
	t.fillY()
	return t
}

// fillY computes Y from the masses and invariants.
func (t *tri) fillY() {
	for i := 0; i < 3; i++ {
		t.yy[i][i] = t.m2[i]
		for j := i + 1; j < 3; j++ {
			v := 0.5 * sum3(t.m2[i], t.m2[j], -t.s[i][j])
			t.yy[i][j], t.yy[j][i] = v, v
		}
	}
}

// triFromY builds a triangle from its Cayley matrix; the invariants are derived from it.
func triFromY(y [3][3]float64) tri {
	var t tri
	t.fromY = true
	t.yy = y
	for i := 0; i < 3; i++ {
		t.m2[i] = y[i][i]
		for j := i + 1; j < 3; j++ {
			v := sum3(y[i][i], y[j][j], -2*y[i][j])
			t.s[i][j], t.s[j][i] = v, v
		}
	}
	return t
}

// y returns the modified Cayley matrix element Y_ij = (m_i² + m_j² − s_ij)/2.
func (t *tri) y(i, j int) float64 { return t.yy[i][j] }

// edge returns the two vertices (lines) j < k of the edge opposite vertex i.
func edge(i int) (int, int) {
	switch i {
	case 0:
		return 1, 2
	case 1:
		return 0, 2
	}
	return 0, 1
}

// quad returns the coefficients of F on the edge opposite vertex i, parametrised from vertex j
// (t = 0) to vertex k (t = 1): F_i(t) = A t² + B t + C, and its discriminant
// B² − 4AC = 4(Y_jk² − Y_jj Y_kk) = λ(s_jk, m_j², m_k²) in product form.
func (t *tri) quad(i int) (A, B, C, disc float64) {
	j, k := edge(i)
	A = t.s[j][k]
	B = 2 * (t.yy[j][k] - t.yy[j][j]) // = m_k² − m_j² − s_jk
	C = t.m2[j]
	disc = edgeDisc(t.yy[j][k], t.yy[j][j], t.yy[k][k])
	return
}

// edgeDisc returns 4(y² − a b) = 4(y − √(ab))(y + √(ab)) for a, b ≥ 0.
func edgeDisc(y, a, b float64) float64 {
	r := math.Sqrt(a * b)
	return 4 * (y - r) * (y + r)
}

func (t *tri) scale() float64 {
	return scaleOf(t.m2[0], t.m2[1], t.m2[2], t.s[0][1], t.s[1][2], t.s[0][2])
}

// lambda3 returns the Källén function λ(a, b, c).
func lambda3(a, b, c float64) float64 {
	return a*a + b*b + c*c - 2*(a*b+b*c+c*a)
}

// C0 returns the scalar three-point function C0(p1², (p2−p1)², p2²; m0, m1, m2) with s1 = p1²,
// s2 = (p2−p1)², s3 = p2² and the squared masses m02, m12, m22, for any real invariants and
// non-negative masses. Infrared-divergent configurations (a massless line between two on-shell
// legs, or two massless lines around a light-like leg) give their poles in dimensional
// regularisation; docs/INTEGRALS.md lists them.
func C0(s1, s2, s3, m02, m12, m22, mu2 float64) (Value, error) {
	if err := checkInputs("C0", []float64{s1, s2, s3}, []float64{m02, m12, m22}, mu2); err != nil {
		return Value{}, err
	}
	t := newTri(s1, s2, s3, m02, m12, m22)
	if v, ok, err := c0Divergent(&t, mu2); ok {
		return v, err
	}
	f, err := c0Finite(&t)
	if err != nil {
		return Value{}, err
	}
	return Value{Finite: f}, nil
}

// c0Cond is the largest ratio (sum of the magnitudes of the parts)/(|result|) accepted from the
// float64 formula; above it the arbitrary-precision path is used.
const c0Cond = 1e3

// c0Finite evaluates an infrared-finite triangle.
func c0Finite(t *tri) (complex128, error) {
	sc := t.scale()
	if sc == 0 {
		return 0, fmt.Errorf("%w: C0 with all masses and invariants zero (scaleless)", ErrNotCovered)
	}
	// zero external momenta
	if same(t.s[0][1], 0, sc) && same(t.s[1][2], 0, sc) && same(t.s[0][2], 0, sc) {
		return complex(-dividedXlnX([]float64{t.m2[0], t.m2[1], t.m2[2]}), 0), nil
	}
	if k := t.variation(); k <= quadKappa {
		return complex(t.quadrature(k), 0), nil
	}
	if v, ok, err := c0NearLandau(t); ok {
		return v, err
	}
	v, cond, err := c0Projective(t)
	if err == nil && cond <= c0Cond {
		return v, nil
	}
	return c0Fallback(t, err)
}

// c0LandauTol is the size of F* relative to the triangle's scale below which c0NearLandau hands
// the triangle to the arbitrary-precision path.
const c0LandauTol = 1e-4

// c0NearLandau handles triangles on or next to the surface F* = 0, where the stationary point of
// the Feynman-parameter quadric has F = 0 (the leading Landau condition, here with the point
// outside the integration simplex, so C0 is regular): the projective formula below has terms
// ln F* there that cancel only analytically; in float64 it loses about half the digits at
// |F*| ~ 1e-7 of its parts and fails at F* = 0. The arbitrary-precision path keeps them and, at
// F* = 0 itself, averages over masses m_i²(1 ± δ) (bnum.c0OnLandau). ok is false away from the
// surface.
func c0NearLandau(t *tri) (complex128, bool, error) {
	lam := lambda3(t.s[0][1], t.s[1][2], t.s[0][2])
	sc := scaleOf(t.s[0][1], t.s[1][2], t.s[0][2])
	if t.fromY || math.Abs(lam) <= 1e-13*sc*sc {
		return 0, false, nil
	}
	if fStar, _, _ := t.fStar(lam); math.Abs(fStar) > c0LandauTol*t.scale() {
		return 0, false, nil
	}
	v, err := c0BigFallback(t)
	return v, true, err
}

// c0Projective evaluates C0 by the projective form of 't Hooft and Veltman's method
// (Nucl. Phys. B153 (1979) 365, section 5; derivation in docs/INTEGRALS.md):
//
//	C0 = ½ Σ_i P_i ∫₀¹ [ln(F_i(t) − i0) − ln(F* − i0)] / B_i(t) dt,
//
// where P (ΣP_i = 0, Pᵀ Y P = 0) is one of the two points where the line at infinity of the
// Feynman-parameter plane meets the conic F = 0, F_i and B_i(t) = (Y P)·x(t) are the quadric and
// the polar form on the edge opposite vertex i, and F* = det Y / det G is the value of F at the
// pole x* of the line at infinity. It returns the value and the ratio of the summed magnitudes of
// the parts to the magnitude of the result.
func c0Projective(t *tri) (complex128, float64, error) {
	s01, s12, s02 := t.s[0][1], t.s[1][2], t.s[0][2]
	lam := lambda3(s01, s12, s02)
	sc := scaleOf(s01, s12, s02)
	if math.Abs(lam) <= 1e-13*sc*sc {
		return c0DegenerateGram(t)
	}
	fStar, phiStar, ref := t.fStar(lam)
	fStarCond := (math.Abs(t.m2[ref]) + math.Abs(phiStar)) / math.Max(math.Abs(fStar), 1e-300)
	// P = (a, b, −a−b) with a² s02 + a b (s02 + s12 − s01) + b² s12 = 0 (either root).
	P, l := pointFromRoot(t, quadRoot2(t, lam, false))
	lnFStar := lnMinusI0(fStar)
	var sum complex128
	mag := 0.0
	for i := 0; i < 3; i++ {
		if P[i] == 0 {
			continue
		}
		j, k := edge(i)
		// Orient the edge so that its lighter vertex sits at t = 0: roots and t0 close to a vertex
		// with a small mass keep their digits there (∫₀¹ is invariant under t → 1 − t with j ↔ k).
		if t.m2[k] < t.m2[j] {
			j, k = k, j
		}
		A := t.s[j][k]
		B := 2 * (t.yy[j][k] - t.yy[j][j]) // m_k² − m_j² − s_jk
		C := t.m2[j]
		disc := edgeDisc(t.yy[j][k], t.yy[j][j], t.yy[k][k])
		// β = l_k − l_j = Σ_m P_m (Y_km − Y_jm) = ½ Σ_m P_m (s_jm − s_km) (the masses drop out because
		// ΣP = 0), formed without subtracting two large l's
		var beta complex128
		for m := 0; m < 3; m++ {
			if t.fromY {
				beta += P[m] * complex(t.yy[k][m]-t.yy[j][m], 0)
			} else {
				beta += P[m] * complex(0.5*(t.s[j][m]-t.s[k][m]), 0)
			}
		}
		pre := P[i] / 2
		if cabs(beta) <= 1e-15*(cabs(l[j])+cabs(l[k])) {
			// B_i constant on the edge
			li := logIntegral(A, t.m2[j], t.m2[k])
			e := (li - lnFStar) / l[j]
			sum += pre * e
			mag += l1(pre) * (l1(li) + l1(lnFStar)) / cabs(l[j])
			continue
		}
		t0 := -l[j] / beta
		e, m := edgeIntegral(A, B, C, disc, t0, fStar, fStarCond, lnFStar)
		sum += pre * e / beta
		mag += l1(pre/beta) * m
	}
	cond := mag / math.Max(l1(sum), 1e-300)
	return sum, cond, nil
}

// fStar returns F* = F(x*) = det Y / det G, the value of F at the pole of the line at infinity,
// as m_r² + Φ*, Φ* = −fᵀ adj(G) f / det G, with the Gram matrix G_ab = p_a·p_b of p_a = k_a − k_r and
// f_a = Y_ra − Y_rr taken at the reference line r of smallest mass: F* is small exactly when x* is
// near a vertex with a small mass (near-infrared kinematics), and this form keeps its digits.
// lam is λ(s01, s12, s02) (det G = −λ/4 for every reference).
func (t *tri) fStar(lam float64) (fStar, phiStar float64, ref int) {
	ref = 0
	for i := 1; i < 3; i++ {
		if t.m2[i] < t.m2[ref] {
			ref = i
		}
	}
	a, b := (ref+1)%3, (ref+2)%3
	gaa, gbb := t.s[ref][a], t.s[ref][b]
	gab := 0.5 * sum3(t.s[ref][a], t.s[ref][b], -t.s[a][b])
	detG := -lam / 4
	fa := t.yy[ref][a] - t.yy[ref][ref]
	fb := t.yy[ref][b] - t.yy[ref][ref]
	phiStar = -(fa*fa*gbb - 2*fa*fb*gab + fb*fb*gaa) / detG
	return t.m2[ref] + phiStar, phiStar, ref
}

// quadRoot2 returns a root of the quadratic for the first free component of P (a in (a, 1, ·)
// when |s02| ≥ |s12|, b in (1, b, ·) otherwise): the larger one by default, the smaller with other.
func quadRoot2(t *tri, lam float64, other bool) complex128 {
	s01, s12, s02 := t.s[0][1], t.s[1][2], t.s[0][2]
	qb := sum3(s02, s12, -s01)
	A, C := s02, s12
	if math.Abs(s02) < math.Abs(s12) {
		A, C = s12, s02
	}
	r := quadRoot(A, qb, C, lam)
	if other && lam >= 0 && r != 0 {
		return complex(C, 0) / (complex(A, 0) * r) // product of the roots is C/A
	}
	return r
}

// pointFromRoot completes P from the root r (see quadRoot2) and returns P and l = Y P. The third
// component also follows from Pᵀ Y P = −(P0 P1 s01 + P1 P2 s12 + P0 P2 s02) = 0; that form is used when
// −r−1 would cancel, i.e. when s01 is small against the others (a light-like or nearly light-like
// leg): the small component then keeps its relative accuracy, which the polar coefficients l need
// when some of them are small too.
func pointFromRoot(t *tri, r complex128) (P, l [3]complex128) {
	s01, s12, s02 := t.s[0][1], t.s[1][2], t.s[0][2]
	p2 := -r - 1
	if math.Abs(s02) >= math.Abs(s12) {
		if cabs(p2) < 0.5*(cabs(r)+1) {
			if d := complex(s12, 0) + r*complex(s02, 0); d != 0 {
				p2 = -r * complex(s01, 0) / d
			}
		}
		P = [3]complex128{r, 1, p2}
	} else {
		if cabs(p2) < 0.5*(cabs(r)+1) {
			if d := r*complex(s12, 0) + complex(s02, 0); d != 0 {
				p2 = -r * complex(s01, 0) / d
			}
		}
		P = [3]complex128{1, r, p2}
	}
	for i := 0; i < 3; i++ {
		for k := 0; k < 3; k++ {
			l[i] += complex(t.y(i, k), 0) * P[k]
		}
	}
	return P, l
}

// quadRoot returns a root of A x² + B x + C = 0 (A ≠ 0) with discriminant lam = B² − 4AC given,
// complex when lam < 0, computed without cancellation.
func quadRoot(A, B, C, lam float64) complex128 {
	if A == 0 {
		// linear (then λ = B² ≥ 0): the finite root; a root at infinity is the other component
		if B == 0 {
			return 0
		}
		return complex(-C/B, 0)
	}
	if lam >= 0 {
		q := -0.5 * (B + math.Copysign(math.Sqrt(lam), B))
		if q == 0 {
			return 0
		}
		return complex(q/A, 0)
	}
	return complex(-B/(2*A), math.Sqrt(-lam)/(2*A))
}

// lnMinusI0 returns ln(x − i0) for real x.
func lnMinusI0(x float64) complex128 {
	if x < 0 {
		return complex(math.Log(-x), -math.Pi)
	}
	return complex(math.Log(x), 0)
}

// edgeIntegral returns ∫₀¹ [ln(F(t) − i0) − ln(F* − i0)]/(t − t0) dt for F(t) = A t² + B t + C, and
// a magnitude estimate. With ln(F(t) − i0) = lnLead + Σ_k ln(t − y_k) on the segment it equals
// Σ_k R(t0, y_k) + [lnLead + Σ_k ln(t0 − y_k) − ln F*] ∫₀¹ dt/(t − t0), and the bracket is a multiple of
// 2πi: t0 lies on the line B = 0 through P and x*, along which F ≡ F* (F(x* + τP) = F(x*) because
// B(x*) = F(P) = 0), so F(t0) = F*. The same identity gives t0 − y_k = F*/(A (t0 − y_other)) without
// cancellation when t0 is close to a root (F* small: near-infrared or near-threshold kinematics).
func edgeIntegral(A, B, C, disc float64, t0 complex128, fStar, fStarCond float64, lnFStar complex128) (complex128, float64) {
	roots, lnLead, ok := quadRootsI0(A, B, C, disc)
	if !ok {
		return cmplx.NaN(), math.Inf(1)
	}
	var cs [2]complex128
	for k, y := range roots {
		cs[k] = t0 - y
	}
	// Use c_k = F*/(A c_other) (or F*/B) instead of t0 − y_k when its error estimate is smaller:
	// the direct difference has relative error ~ |t0|/|c_k|, the identity ~ fStarCond + |t0|/|c_other|
	// (fStarCond: the relative error factor of F* itself).
	if fStar != 0 {
		for k := range roots {
			errDirect := (cabs(t0) + cabs(roots[k])) / math.Max(cabs(cs[k]), 1e-300)
			var re complex128
			errID := fStarCond
			if len(roots) == 2 {
				other := cs[1-k]
				errID += (cabs(t0) + cabs(roots[1-k])) / math.Max(cabs(other), 1e-300)
				re = complex(fStar, 0) / (complex(A, 0) * other)
			} else {
				re = complex(fStar/B, 0)
			}
			if errID >= errDirect {
				continue
			}
			if imag(t0) == 0 {
				// keep the infinitesimal imaginary part exactly as the direct difference gives it
				re = complex(real(re), imag(cs[k]))
			}
			cs[k] = re
		}
	}
	var sum complex128
	mag := 0.0
	// only the imaginary part of lnLead + Σ ln(t0 − y_k) − ln F* is needed (its real part is 0)
	roughIm := imag(lnLead) - imag(lnFStar)
	if len(roots) == 2 && imag(t0) == 0 && roots[1] == cmplx.Conj(roots[0]) && imag(roots[0]) != 0 &&
		cs[1] == cmplx.Conj(cs[0]) {
		// complex-conjugate roots and real t0: R(t0, ȳ) = conj R(t0, y)
		r, m := rfunC(t0, roots[0], cs[0])
		sum = complex(2*real(r), 0)
		mag = 2 * m
		roughIm += arg(cs[0]) + arg(cs[1])
	} else {
		for k, y := range roots {
			r, m := rfunC(t0, y, cs[k])
			sum += r
			mag += m
			roughIm += arg(cs[k])
		}
	}
	if k := math.Round(roughIm / (2 * math.Pi)); k != 0 {
		l := complex(0, 2*math.Pi*k) * lt0(t0)
		sum += l
		mag += l1(l)
	}
	return sum, mag
}

// quadRootsI0 returns the roots of F(t) − i0 = A t² + B t + C − i0 (real roots carry the sign of
// their infinitesimal imaginary part, Im y = +0/F′(y)) and the constant ln A + 2πi n such that
// ln(F(t) − i0) = lnLead + Σ ln(t − y) on [0, 1]. ok is false for F ≡ 0.
//
// disc = B² − 4AC is passed by the caller in a form without cancellation (a Källén function in
// product form); disc ≤ −∞ (math.Inf(-1)) asks for B² − 4AC to be computed here.
func quadRootsI0(A, B, C, disc float64) (roots []complex128, lnLead complex128, ok bool) {
	var buf [2]complex128
	roots = buf[:0]
	switch {
	case A != 0:
		if math.IsInf(disc, -1) {
			disc = B*B - 4*A*C
		}
		if disc >= 0 {
			q := -0.5 * (B + math.Copysign(math.Sqrt(disc), B))
			var y1, y2 float64
			if q == 0 {
				y1, y2 = 0, 0
			} else {
				y1, y2 = q/A, C/q
			}
			// F′(y) = A(y − y_other)
			if y1 == y2 {
				// double root: F = A(t − y)² ≥ 0 or ≤ 0; give the pair opposite infinitesimals
				roots = append(roots, withI0(y1, 1), withI0(y2, -1))
			} else {
				roots = append(roots, withI0(y1, A*(y1-y2)), withI0(y2, A*(y2-y1)))
			}
		} else {
			sq := math.Sqrt(-disc)
			roots = append(roots, complex(-B/(2*A), sq/(2*A)), complex(-B/(2*A), -sq/(2*A)))
		}
		lnLead = lnMinusI0(A)
	case B != 0:
		y := -C / B
		roots = append(roots, withI0(y, B))
		lnLead = lnMinusI0(B)
	case C != 0:
		return nil, lnMinusI0(C), true
	default:
		return nil, 0, false
	}
	// fix the branch at a point of [0, 1] where F ≠ 0
	for _, tm := range []float64{0.5, 0.3819660112501051, 0.7236067977499789, 0.1, 0.9} {
		f := (A*tm+B)*tm + C
		if f == 0 {
			continue
		}
		// only the arguments matter: arg(F − i0) − arg(lead) − Σ arg(t − y) = 2π n
		ph := imag(lnLead)
		for _, y := range roots {
			ph += cmplx.Phase(complex(tm, 0) - y)
		}
		fph := 0.0
		if f < 0 {
			fph = -math.Pi
		}
		n := math.Round((fph - ph) / (2 * math.Pi))
		lnLead += complex(0, 2*math.Pi*n)
		break
	}
	return roots, lnLead, true
}
