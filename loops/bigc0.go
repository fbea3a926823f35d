package loops

import (
	"fmt"
	"math"
	"math/big"
	"sort"
)

// btri is a triangle with arbitrary-precision entries (see tri).
type btri struct {
	m2 [3]*big.Float
	s  [3][3]*big.Float
}

func (n bnum) tri(s01, s12, s02, m0, m1, m2 *big.Float) btri {
	var t btri
	t.m2 = [3]*big.Float{n.fl(m0), n.fl(m1), n.fl(m2)}
	z := n.f(0)
	t.s = [3][3]*big.Float{{z, n.fl(s01), n.fl(s02)}, {n.fl(s01), z, n.fl(s12)}, {n.fl(s02), n.fl(s12), z}}
	return t
}

func (n bnum) triFromFloat(t *tri) btri {
	return n.tri(n.f(t.s[0][1]), n.f(t.s[1][2]), n.f(t.s[0][2]), n.f(t.m2[0]), n.f(t.m2[1]), n.f(t.m2[2]))
}

func (n bnum) ty(t *btri, i, j int) *big.Float {
	if i == j {
		return n.fl(t.m2[i])
	}
	y := n.sum3(t.m2[i], t.m2[j], t.s[i][j])
	return y.Quo(y, n.f(2))
}

func (n bnum) toFloatTri(t *btri) tri {
	var u tri
	for i := 0; i < 3; i++ {
		u.m2[i], _ = t.m2[i].Float64()
		for j := 0; j < 3; j++ {
			u.s[i][j], _ = t.s[i][j].Float64()
		}
	}
	u.fillY()
	return u
}

// sameBig compares within 2^{−w/2} of the scale (the arbitrary-precision counterpart of same).
func (n bnum) same(a, b *big.Float, scale float64) bool {
	d := new(big.Float).Sub(a, b)
	f, _ := d.Float64()
	return math.Abs(f) <= math.Ldexp(scale, -int(n.w/2))
}

// c0 evaluates C0 at working precision n.w (including the infrared-divergent triangles).
func (n bnum) c0(t *btri, mu2 *big.Float) (BigValue, error) {
	ft := n.toFloatTri(t)
	sc := ft.scale()
	if v, ok := n.c0Divergent(t, &ft, sc, mu2); ok {
		return v, nil
	}
	f, err := n.c0Finite(t)
	return BigValue{Pole2: n.zero(), Pole1: n.zero(), Finite: f}, err
}

func (n bnum) c0Finite(t *btri) (bc, error) {
	ft := n.toFloatTri(t)
	sc := ft.scale()
	if sc == 0 {
		return bc{}, fmt.Errorf("%w: C0 with all masses and invariants zero (scaleless)", ErrNotCovered)
	}
	if t.s[0][1].Sign() == 0 && t.s[1][2].Sign() == 0 && t.s[0][2].Sign() == 0 {
		g := n.dividedXlnX(t.m2[:])
		return n.r(g.Neg(g)), nil
	}
	s01, s12, s02 := t.s[0][1], t.s[1][2], t.s[0][2]
	lam := n.lambda3(s01, s12, s02)
	if lam.Sign() == 0 {
		return n.c0DegenerateGram(t)
	}
	if v, ok, err := n.c0OnLandau(t, lam); ok {
		return v, err
	}
	return n.c0Projective(t, lam)
}

func (n bnum) lambda3(a, b, c *big.Float) *big.Float {
	w := n.w
	sq := func(x *big.Float) *big.Float { return new(big.Float).SetPrec(w).Mul(x, x) }
	mul := func(x, y *big.Float) *big.Float { return new(big.Float).SetPrec(w).Mul(x, y) }
	s := sq(a)
	s.Add(s, sq(b))
	s.Add(s, sq(c))
	p := mul(a, b)
	p.Add(p, mul(b, c))
	p.Add(p, mul(c, a))
	p.Mul(p, n.f(2))
	return s.Sub(s, p)
}

// c0Projective is the arbitrary-precision form of the projective formula of c0Projective.
func (n bnum) c0Projective(t *btri, lam *big.Float) (bc, error) {
	w := n.w
	s01, s12, s02 := t.s[0][1], t.s[1][2], t.s[0][2]
	half := n.f(0.5)
	fStar, _ := n.fStar(t, lam)
	lnFStar := n.lnMinusI0(fStar)
	// P = (a, 1, −a−1) or (1, b, −1−b)
	qb := new(big.Float).SetPrec(w).Add(s02, s12)
	qb.Sub(qb, s01)
	var P [3]bc
	small := func(p, x bc) bool { return n.abs(p) < 0.5*(n.abs(x)+1) }
	if new(big.Float).Abs(s02).Cmp(new(big.Float).Abs(s12)) >= 0 {
		a := n.quadRoot(s02, qb, s12, lam)
		p2 := a.Neg().Sub(n.one())
		if small(p2, a) {
			if d := n.r(s12).Add(a.Scale(s02)); !d.IsZero() {
				p2 = a.Scale(s01).Quo(d).Neg()
			}
		}
		P = [3]bc{a, n.one(), p2}
	} else {
		b := n.quadRoot(s12, qb, s02, lam)
		p2 := b.Neg().Sub(n.one())
		if small(p2, b) {
			if d := b.Scale(s12).Add(n.r(s02)); !d.IsZero() {
				p2 = b.Scale(s01).Quo(d).Neg()
			}
		}
		P = [3]bc{n.one(), b, p2}
	}
	var l [3]bc
	for i := 0; i < 3; i++ {
		l[i] = n.zero()
		for k := 0; k < 3; k++ {
			l[i] = l[i].Add(P[k].Scale(n.ty(t, i, k)))
		}
	}
	sum := n.zero()
	for i := 0; i < 3; i++ {
		if P[i].IsZero() {
			continue
		}
		j, k := edge(i)
		if t.m2[k].Cmp(t.m2[j]) < 0 { // lighter vertex at t = 0 (see c0Projective)
			j, k = k, j
		}
		A := n.fl(t.s[j][k])
		B := new(big.Float).SetPrec(w).Sub(n.ty(t, j, k), n.ty(t, j, j))
		B.Mul(B, n.f(2))
		C := n.fl(t.m2[j])
		beta := l[k].Sub(l[j])
		pre := P[i].Scale(half)
		if beta.IsZero() {
			li := n.logIntegral(A, t.m2[j], t.m2[k])
			sum = sum.Add(pre.Mul(li.Sub(lnFStar)).Quo(l[j]))
			continue
		}
		t0 := l[j].Neg().Quo(beta)
		e, err := n.edgeIntegral(A, B, C, t0, fStar, lnFStar)
		if err != nil {
			return bc{}, err
		}
		sum = sum.Add(pre.Mul(e).Quo(beta))
	}
	return sum, nil
}

// fStar returns F* = m_r² + Φ* at the reference line r of smallest mass (see tri.fStar) and the
// size of its parts, |m_r²| + |Φ*|.
func (n bnum) fStar(t *btri, lam *big.Float) (fStar, parts *big.Float) {
	w := n.w
	mul := func(x, y *big.Float) *big.Float { return new(big.Float).SetPrec(w).Mul(x, y) }
	ref := 0
	for i := 1; i < 3; i++ {
		if t.m2[i].Cmp(t.m2[ref]) < 0 {
			ref = i
		}
	}
	ra, rb := (ref+1)%3, (ref+2)%3
	gaa, gbb := t.s[ref][ra], t.s[ref][rb]
	gab := new(big.Float).SetPrec(w).Add(t.s[ref][ra], t.s[ref][rb])
	gab.Sub(gab, t.s[ra][rb])
	gab.Mul(gab, n.f(0.5))
	detG := new(big.Float).SetPrec(w).Quo(lam, n.f(-4))
	fa := new(big.Float).SetPrec(w).Sub(n.ty(t, ref, ra), n.ty(t, ref, ref))
	fb := new(big.Float).SetPrec(w).Sub(n.ty(t, ref, rb), n.ty(t, ref, ref))
	q := mul(mul(fa, fa), gbb)
	q.Sub(q, mul(mul(mul(fa, fb), gab), n.f(2)))
	q.Add(q, mul(mul(fb, fb), gaa))
	phiStar := new(big.Float).SetPrec(w).Quo(q, detG)
	phiStar.Neg(phiStar)
	fStar = new(big.Float).SetPrec(w).Add(t.m2[ref], phiStar)
	parts = new(big.Float).SetPrec(w).Abs(t.m2[ref])
	parts.Add(parts, new(big.Float).Abs(phiStar))
	return fStar, parts
}

// c0OnLandau is the arbitrary-precision counterpart of c0NearLandau for F* = 0 to the working
// precision: the mean of C0 at masses m_i²(1 ± 2^{−w/3}), exact to O(2^{−2w/3}). ok is false
// away from the surface.
func (n bnum) c0OnLandau(t *btri, lam *big.Float) (bc, bool, error) {
	fStar, parts := n.fStar(t, lam)
	lim := new(big.Float).SetMantExp(parts, -int(n.w/2))
	if new(big.Float).Abs(fStar).Cmp(lim) > 0 {
		return bc{}, false, nil
	}
	delta := new(big.Float).SetMantExp(big.NewFloat(1), -int(n.w/3))
	sum := n.zero()
	for _, sign := range []int{1, -1} {
		f := new(big.Float).SetPrec(n.w).SetInt64(int64(sign))
		f.Mul(f, delta)
		f.Add(f, n.f(1))
		u := *t
		for i := range u.m2 {
			u.m2[i] = new(big.Float).SetPrec(n.w).Mul(t.m2[i], f)
		}
		v, err := n.c0Projective(&u, lam)
		if err != nil {
			return bc{}, true, err
		}
		sum = sum.Add(v.Scale(n.f(0.5)))
	}
	return sum, true, nil
}

func (n bnum) quadRoot(A, B, C, lam *big.Float) bc {
	w := n.w
	if A.Sign() == 0 {
		if B.Sign() == 0 {
			return n.zero()
		}
		r := new(big.Float).SetPrec(w).Quo(C, B)
		return n.r(r.Neg(r))
	}
	if lam.Sign() >= 0 {
		sq := new(big.Float).SetPrec(w).Sqrt(lam)
		if B.Sign() < 0 {
			sq.Neg(sq)
		}
		q := new(big.Float).SetPrec(w).Add(B, sq)
		q.Quo(q, n.f(-2))
		if q.Sign() == 0 {
			return n.zero()
		}
		return n.r(q.Quo(q, A))
	}
	sq := new(big.Float).SetPrec(w).Sqrt(new(big.Float).Neg(lam))
	twoA := new(big.Float).SetPrec(w).Mul(A, n.f(2))
	re := new(big.Float).SetPrec(w).Quo(new(big.Float).Neg(B), twoA)
	return bc{Re: re, Im: sq.Quo(sq, twoA)}
}

// edgeIntegral is the arbitrary-precision form of edgeIntegral: Σ_k R(t0, y_k) + 2πi k ∫dt/(t−t0),
// with t0 − y_k from F(t0) = F* when t0 is very close to a root.
func (n bnum) edgeIntegral(A, B, C *big.Float, t0 bc, fStar *big.Float, lnFStar bc) (bc, error) {
	roots, lnLead, ok := n.quadRootsI0(A, B, C)
	if !ok {
		return bc{}, fmt.Errorf("%w: C0 with a vanishing edge quadratic", ErrNotCovered)
	}
	cs := make([]bc, len(roots))
	for k, y := range roots {
		cs[k] = t0.Sub(y)
	}
	near := func(c, y bc) bool {
		lim := math.Ldexp(1+n.abs(y), -int(n.w)/4)
		return n.abs(c) < lim
	}
	for k, y := range roots {
		if !near(cs[k], y) || fStar.Sign() == 0 {
			continue
		}
		var re bc
		if len(roots) == 2 {
			if near(cs[1-k], roots[1-k]) {
				continue
			}
			re = n.r(fStar).Quo(cs[1-k].Scale(A))
		} else {
			re = n.r(new(big.Float).SetPrec(n.w).Quo(fStar, B))
		}
		if t0.Im.Sign() == 0 {
			re = bc{Re: re.Re, Im: n.fl(cs[k].Im)}
		}
		cs[k] = re
	}
	sum := n.zero()
	rough := lnLead.Sub(lnFStar)
	for k, y := range roots {
		sum = sum.Add(n.rfunC(t0, y, cs[k]))
		rough = rough.Add(n.log(cs[k]))
	}
	if k := math.Round(n.imF(rough) / (2 * math.Pi)); k != 0 {
		sum = sum.Add(bc{Re: n.f(0), Im: new(big.Float).SetPrec(n.w).Mul(n.pi(), n.f(2*k))}.Mul(n.lt0(t0)))
	}
	return sum, nil
}

func (n bnum) imF(z bc) float64 { f, _ := z.Im.Float64(); return f }

// dividedXlnX is the arbitrary-precision divided difference of x ln x (see dividedXlnX).
func (n bnum) dividedXlnX(xs []*big.Float) *big.Float {
	w := n.w
	x := make([]*big.Float, len(xs))
	for i := range xs {
		x[i] = n.fl(xs[i])
	}
	sort.Slice(x, func(i, j int) bool { return x[i].Cmp(x[j]) < 0 })
	m := len(x)
	b := x[m/2]
	spread := new(big.Float).SetPrec(w).Sub(x[m-1], x[0])
	lim := new(big.Float).SetPrec(w).Mul(b, n.f(0.3))
	if b.Sign() > 0 && spread.Cmp(lim) <= 0 {
		d := make([]*big.Float, m)
		for i := range x {
			d[i] = new(big.Float).SetPrec(w).Sub(x[i], b)
			d[i].Quo(d[i], b)
		}
		K := int(w) + 20
		h := make([]*big.Float, K)
		h[0] = n.f(1)
		for k := 1; k < K; k++ {
			h[k] = n.f(0)
		}
		for _, di := range d {
			for k := 1; k < K; k++ {
				h[k].Add(h[k], new(big.Float).SetPrec(w).Mul(di, h[k-1]))
			}
		}
		s := n.f(0)
		for k := 0; k < K; k++ {
			j := float64(k + m - 1)
			t := new(big.Float).SetPrec(w).Quo(h[k], n.f(j*(j-1)))
			if (k+m-1)%2 == 1 {
				s.Sub(s, t)
			} else {
				s.Add(s, t)
			}
		}
		bp := n.f(1)
		for i := 0; i < m-2; i++ {
			bp.Mul(bp, b)
		}
		return s.Quo(s, bp)
	}
	xlnx := func(v *big.Float) *big.Float {
		if v.Sign() == 0 {
			return n.f(0)
		}
		l := n.log(n.r(v)).Re
		return l.Mul(l, v)
	}
	g := make([]*big.Float, m)
	for i := 0; i+1 < m; i++ {
		if x[i].Cmp(x[i+1]) == 0 {
			g[i] = n.log(n.r(x[i])).Re
			g[i].Add(g[i], n.f(1))
		} else {
			g[i] = new(big.Float).SetPrec(w).Sub(xlnx(x[i+1]), xlnx(x[i]))
			g[i].Quo(g[i], new(big.Float).SetPrec(w).Sub(x[i+1], x[i]))
		}
	}
	for order := 2; order < m; order++ {
		for i := 0; i+order < m; i++ {
			g[i] = new(big.Float).SetPrec(w).Sub(g[i+1], g[i])
			g[i].Quo(g[i], new(big.Float).SetPrec(w).Sub(x[i+order], x[i]))
		}
	}
	return g[0]
}

// c0DegenerateGram is the arbitrary-precision form of c0DegenerateGram (λ = 0 exactly).
func (n bnum) c0DegenerateGram(t *btri) (bc, error) {
	w := n.w
	s01, s12, s02 := t.s[0][1], t.s[1][2], t.s[0][2]
	qv := new(big.Float).SetPrec(w).Add(s02, s12)
	qv.Sub(qv, s01)
	var P [3]*big.Float
	if new(big.Float).Abs(s02).Cmp(new(big.Float).Abs(s12)) >= 0 {
		a := new(big.Float).SetPrec(w).Quo(qv, new(big.Float).SetPrec(w).Mul(s02, n.f(-2)))
		P = [3]*big.Float{a, n.f(1), new(big.Float).SetPrec(w).Sub(new(big.Float).Neg(a), n.f(1))}
	} else {
		b := new(big.Float).SetPrec(w).Quo(qv, new(big.Float).SetPrec(w).Mul(s12, n.f(-2)))
		P = [3]*big.Float{n.f(1), b, new(big.Float).SetPrec(w).Sub(new(big.Float).Neg(b), n.f(1))}
	}
	var l [3]*big.Float
	for i := 0; i < 3; i++ {
		l[i] = n.f(0)
		for k := 0; k < 3; k++ {
			l[i].Add(l[i], new(big.Float).SetPrec(w).Mul(n.ty(t, i, k), P[k]))
		}
	}
	bb := new(big.Float).SetPrec(w).Add(l[0], l[1])
	bb.Add(bb, l[2])
	bb.Quo(bb, n.f(3))
	if bb.Sign() == 0 {
		return n.c0Chord(t, P)
	}
	sum := n.zero()
	for i := 0; i < 3; i++ {
		if P[i].Sign() == 0 {
			continue
		}
		j, k := edge(i)
		sum = sum.Add(n.logIntegral(t.s[j][k], t.m2[j], t.m2[k]).Scale(P[i]))
	}
	return sum.Scale(new(big.Float).SetPrec(w).Quo(n.f(0.5), bb)), nil
}

// c0Chord is the arbitrary-precision form of c0Chord.
func (n bnum) c0Chord(t *btri, P [3]*big.Float) (bc, error) {
	w := n.w
	wv := [3]*big.Float{
		new(big.Float).SetPrec(w).Sub(P[1], P[2]),
		new(big.Float).SetPrec(w).Sub(P[2], P[0]),
		new(big.Float).SetPrec(w).Sub(P[0], P[1]),
	}
	idx := []int{0, 1, 2}
	sort.Slice(idx, func(a, b int) bool { return wv[idx[a]].Cmp(wv[idx[b]]) < 0 })
	lo, mid, hi := idx[0], idx[1], idx[2]
	span := new(big.Float).SetPrec(w).Sub(wv[hi], wv[lo])
	if span.Sign() <= 0 {
		return bc{}, fmt.Errorf("%w: C0 with a degenerate chord direction", ErrNotCovered)
	}
	tm := new(big.Float).SetPrec(w).Sub(wv[mid], wv[lo])
	tm.Quo(tm, span)
	A := n.fl(t.s[lo][hi])
	B := new(big.Float).SetPrec(w).Sub(t.m2[hi], t.m2[lo])
	B.Sub(B, A)
	C := n.fl(t.m2[lo])
	sum := n.zero()
	one := n.f(1)
	if tm.Sign() > 0 {
		sum = sum.Add(n.intLinOverQuad(n.f(0), new(big.Float).SetPrec(w).Quo(one, tm), A, B, C, n.f(0), tm))
	}
	if tm.Cmp(one) < 0 {
		om := new(big.Float).SetPrec(w).Sub(one, tm)
		a0 := new(big.Float).SetPrec(w).Quo(one, om)
		sum = sum.Add(n.intLinOverQuad(a0, new(big.Float).Neg(a0), A, B, C, tm, one))
	}
	return sum.Neg(), nil
}

func (n bnum) intLinOverQuad(a0, a1, A, B, C, lo, hi *big.Float) bc {
	w := n.w
	roots, _, _ := n.quadRootsI0(A, B, C)
	lin := func(y bc) bc { return n.r(a0).Add(y.Scale(a1)) }
	logs := func(y bc) bc { return n.log(n.r(hi).Sub(y)).Sub(n.log(n.r(lo).Sub(y))) }
	switch len(roots) {
	case 0:
		d := new(big.Float).SetPrec(w).Sub(hi, lo)
		d.Mul(d, a0)
		h2 := new(big.Float).SetPrec(w).Mul(hi, hi)
		h2.Sub(h2, new(big.Float).SetPrec(w).Mul(lo, lo))
		h2.Mul(h2, a1)
		h2.Quo(h2, n.f(2))
		d.Add(d, h2)
		return n.r(d.Quo(d, C))
	case 1:
		y := roots[0]
		d := new(big.Float).SetPrec(w).Sub(hi, lo)
		d.Mul(d, a1)
		return n.r(d).Add(lin(y).Mul(logs(y))).Quo(n.r(B))
	}
	y1, y2 := roots[0], roots[1]
	c1 := lin(y1).Quo(y1.Sub(y2))
	c2 := lin(y2).Quo(y2.Sub(y1))
	return c1.Mul(logs(y1)).Add(c2.Mul(logs(y2))).Quo(n.r(A))
}
