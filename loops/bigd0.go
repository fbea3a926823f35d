package loops

import (
	"fmt"
	"math"
	"math/big"
)

// bbox is a box with arbitrary-precision entries (see box).
type bbox struct {
	m2 [4]*big.Float
	s  [4][4]*big.Float
}

func (n bnum) box(inv [6]*big.Float, m [4]*big.Float) bbox {
	var b bbox
	for i := 0; i < 4; i++ {
		b.m2[i] = n.fl(m[i])
		b.s[i][i] = n.f(0)
	}
	set := func(i, j int, v *big.Float) { b.s[i][j], b.s[j][i] = n.fl(v), n.fl(v) }
	set(0, 1, inv[0])
	set(1, 2, inv[1])
	set(2, 3, inv[2])
	set(0, 3, inv[3])
	set(0, 2, inv[4])
	set(1, 3, inv[5])
	return b
}

func (n bnum) boxFromFloat(b *box) bbox {
	var inv [6]*big.Float
	for k, p := range [][2]int{{0, 1}, {1, 2}, {2, 3}, {0, 3}, {0, 2}, {1, 3}} {
		inv[k] = n.f(b.s[p[0]][p[1]])
	}
	var m [4]*big.Float
	for i := range m {
		m[i] = n.f(b.m2[i])
	}
	return n.box(inv, m)
}

func (n bnum) toFloatBox(b *bbox) box {
	var u box
	for i := 0; i < 4; i++ {
		u.m2[i], _ = b.m2[i].Float64()
		for j := 0; j < 4; j++ {
			u.s[i][j], _ = b.s[i][j].Float64()
		}
	}
	u.fillY()
	return u
}

func (n bnum) by(b *bbox, i, j int) *big.Float {
	if i == j {
		return n.fl(b.m2[i])
	}
	y := n.sum3(b.m2[i], b.m2[j], b.s[i][j])
	return y.Quo(y, n.f(2))
}

// d0 evaluates D0 at working precision n.w.
func (n bnum) d0(b *bbox, mu2 *big.Float) (BigValue, error) {
	fb := n.toFloatBox(b)
	sc := fb.scale()
	if v, ok, err := n.d0Divergent(b, &fb, sc, mu2); ok {
		return v, err
	}
	f, err := n.d0Finite(b)
	return BigValue{Pole2: n.zero(), Pole1: n.zero(), Finite: f}, err
}

func (n bnum) d0Finite(b *bbox) (bc, error) {
	fb := n.toFloatBox(b)
	if fb.scale() == 0 {
		return bc{}, fmt.Errorf("%w: D0 with all masses and invariants zero (scaleless)", ErrNotCovered)
	}
	allZero := true
	for i := 0; i < 4; i++ {
		for j := i + 1; j < 4; j++ {
			if b.s[i][j].Sign() != 0 {
				allZero = false
			}
		}
	}
	if allZero {
		g := n.dividedXlnX(b.m2[:])
		return n.r(g.Neg(g)), nil
	}
	ch, err := selectProjection(&fb)
	if err != nil {
		return bc{}, err
	}
	P, l, err := n.projectionPoint(b, ch)
	if err != nil {
		return bc{}, err
	}
	sum := n.zero()
	for i := 0; i < 4; i++ {
		if P[i].Sign() == 0 {
			continue
		}
		var v [3]int
		k := 0
		for j := 0; j < 4; j++ {
			if j != i {
				v[k] = j
				k++
			}
		}
		var t btri
		prod := n.f(1)
		for p := 0; p < 3; p++ {
			lj := l[v[p]]
			prod.Mul(prod, lj)
			t.m2[p] = new(big.Float).SetPrec(n.w).Quo(b.m2[v[p]], new(big.Float).SetPrec(n.w).Mul(lj, lj))
		}
		for p := 0; p < 3; p++ {
			t.s[p][p] = n.f(0)
		}
		for p := 0; p < 3; p++ {
			for q := p + 1; q < 3; q++ {
				yq := new(big.Float).SetPrec(n.w).Quo(n.by(b, v[p], v[q]), new(big.Float).SetPrec(n.w).Mul(l[v[p]], l[v[q]]))
				sv := new(big.Float).SetPrec(n.w).Add(t.m2[p], t.m2[q])
				sv.Sub(sv, yq.Mul(yq, n.f(2)))
				t.s[p][q], t.s[q][p] = sv, n.fl(sv)
			}
		}
		c, err := n.c0Finite(&t)
		if err != nil {
			return bc{}, err
		}
		coef := new(big.Float).SetPrec(n.w).Quo(P[i], prod)
		coef.Mul(coef, n.f(-0.5))
		sum = sum.Add(c.Scale(coef))
	}
	return sum, nil
}

// projectionPoint recomputes the chosen projection point in arbitrary precision.
func (n bnum) projectionPoint(b *bbox, ch projChoice) (P, l [4]*big.Float, err error) {
	w := n.w
	for i := range P {
		P[i] = n.f(0)
	}
	if ch.edge {
		a, c := ch.a, ch.b
		switch {
		case ch.nu == 0:
			P[a] = n.f(1)
		case ch.mu == 0:
			P[c] = n.f(1)
		default:
			// μ/ν root of Y_aa r² + 2 Y_ab r + Y_bb = 0 (or the linear case), nearest the float64 choice
			A, B, C := n.by(b, a, a), n.by(b, a, c), n.by(b, c, c)
			var roots []*big.Float
			if A.Sign() == 0 {
				r := new(big.Float).SetPrec(w).Quo(C, new(big.Float).SetPrec(w).Mul(B, n.f(-2)))
				roots = append(roots, r)
			} else {
				disc := new(big.Float).SetPrec(w).Mul(B, B)
				disc.Sub(disc, new(big.Float).SetPrec(w).Mul(A, C))
				if disc.Sign() < 0 {
					return P, l, fmt.Errorf("%w: D0 projection point lost in arbitrary precision", ErrNotCovered)
				}
				roots = n.stableRoots(A, B, C, disc)
			}
			want := ch.mu / ch.nu
			best := roots[0]
			for _, r := range roots[1:] {
				f0, _ := best.Float64()
				f1, _ := r.Float64()
				if math.Abs(f1-want) < math.Abs(f0-want) {
					best = r
				}
			}
			P[a] = best
			P[c] = n.f(1)
		}
	} else {
		Z, ok := n.inverse4(b)
		if !ok {
			return P, l, fmt.Errorf("%w: D0 with a singular Cayley matrix", ErrNotCovered)
		}
		var one, d [4]*big.Float
		for i := 0; i < 4; i++ {
			one[i] = n.f(1)
			d[i] = n.f(ch.d[i])
		}
		q := func(x, y [4]*big.Float) *big.Float {
			s := n.f(0)
			for i := 0; i < 4; i++ {
				for j := 0; j < 4; j++ {
					t := new(big.Float).SetPrec(w).Mul(x[i], Z[i][j])
					s.Add(s, t.Mul(t, y[j]))
				}
			}
			return s
		}
		c0, c1, c2 := q(one, one), q(one, d), q(d, d)
		var taus []*big.Float
		if c2.Sign() == 0 {
			t := new(big.Float).SetPrec(w).Quo(c0, new(big.Float).SetPrec(w).Mul(c1, n.f(-2)))
			taus = append(taus, t)
		} else {
			disc := new(big.Float).SetPrec(w).Mul(c1, c1)
			disc.Sub(disc, new(big.Float).SetPrec(w).Mul(c0, c2))
			if disc.Sign() < 0 {
				return P, l, fmt.Errorf("%w: D0 projection point lost in arbitrary precision", ErrNotCovered)
			}
			taus = n.stableRoots(c2, c1, c0, disc)
		}
		tau := taus[0]
		for _, t := range taus[1:] {
			f0, _ := tau.Float64()
			f1, _ := t.Float64()
			if math.Abs(f1-ch.tau) < math.Abs(f0-ch.tau) {
				tau = t
			}
		}
		var v [4]*big.Float
		for i := 0; i < 4; i++ {
			v[i] = new(big.Float).SetPrec(w).Mul(tau, d[i])
			v[i].Add(v[i], n.f(1))
		}
		for i := 0; i < 4; i++ {
			for j := 0; j < 4; j++ {
				P[i].Add(P[i], new(big.Float).SetPrec(w).Mul(Z[i][j], v[j]))
			}
		}
	}
	for i := 0; i < 4; i++ {
		l[i] = n.f(0)
		for j := 0; j < 4; j++ {
			l[i].Add(l[i], new(big.Float).SetPrec(w).Mul(n.by(b, i, j), P[j]))
		}
	}
	return P, l, nil
}

// stableRoots returns the roots of A r² + 2B r + C = 0 (disc = B² − AC ≥ 0) as q/A and C/q with
// q = −(B + sign(B)√disc), free of cancellation when one root is much smaller than the other.
func (n bnum) stableRoots(A, B, C, disc *big.Float) []*big.Float {
	w := n.w
	sq := new(big.Float).SetPrec(w).Sqrt(disc)
	if B.Sign() < 0 {
		sq.Neg(sq)
	}
	q := new(big.Float).SetPrec(w).Add(B, sq)
	q.Neg(q)
	var out []*big.Float
	if q.Sign() != 0 {
		out = append(out, new(big.Float).SetPrec(w).Quo(q, A), new(big.Float).SetPrec(w).Quo(C, q))
	} else {
		out = append(out, n.f(0))
	}
	return out
}

func (n bnum) inverse4(b *bbox) ([4][4]*big.Float, bool) {
	w := n.w
	var a [4][8]*big.Float
	for i := 0; i < 4; i++ {
		for j := 0; j < 8; j++ {
			a[i][j] = n.f(0)
		}
		for j := 0; j < 4; j++ {
			a[i][j] = n.by(b, i, j)
		}
		a[i][4+i] = n.f(1)
	}
	for c := 0; c < 4; c++ {
		p := c
		for r := c + 1; r < 4; r++ {
			if new(big.Float).Abs(a[r][c]).Cmp(new(big.Float).Abs(a[p][c])) > 0 {
				p = r
			}
		}
		if a[p][c].Sign() == 0 {
			return [4][4]*big.Float{}, false
		}
		a[c], a[p] = a[p], a[c]
		piv := n.fl(a[c][c])
		for j := 0; j < 8; j++ {
			a[c][j] = new(big.Float).SetPrec(w).Quo(a[c][j], piv)
		}
		for r := 0; r < 4; r++ {
			if r != c && a[r][c].Sign() != 0 {
				f := n.fl(a[r][c])
				for j := 0; j < 8; j++ {
					a[r][j] = new(big.Float).SetPrec(w).Sub(a[r][j], new(big.Float).SetPrec(w).Mul(f, a[c][j]))
				}
			}
		}
	}
	var z [4][4]*big.Float
	for i := 0; i < 4; i++ {
		for j := 0; j < 4; j++ {
			z[i][j] = a[i][4+j]
		}
	}
	return z, true
}

// d0Divergent is the arbitrary-precision counterpart of d0Divergent.
func (n bnum) d0Divergent(b *bbox, fb *box, sc float64, mu2 *big.Float) (BigValue, bool, error) {
	terms, divergent, err := irSubtraction(fb, sc)
	if !divergent {
		return BigValue{}, false, nil
	}
	if err != nil {
		return BigValue{}, true, err
	}
	sb := n.snapOnShell(b, fb, sc)
	v, err := n.d0Subtracted(&sb, fb, terms, mu2)
	return v, true, err
}

// snapOnShell is the arbitrary-precision form of snapOnShell.
func (n bnum) snapOnShell(b *bbox, fb *box, sc float64) bbox {
	out := *b
	set := func(i, j int, v *big.Float) { out.s[i][j], out.s[j][i] = n.fl(v), n.fl(v) }
	soft, coll := irStructure(fb, sc)
	for _, a := range soft {
		p, q := (a+3)%4, (a+1)%4
		set(a, p, b.m2[p])
		set(a, q, b.m2[q])
	}
	for _, pr := range coll {
		set(pr[0], pr[1], n.f(0))
	}
	return out
}

// d0Subtracted is the arbitrary-precision form of d0Subtracted; the regulator is λ² = 2^{−(w+64)}
// of the scale: the remainder vanishes like λ² ln²λ, below the working precision, while λ² stays
// far above the infinitesimals 2^{−3w} of the formulas and inside the float64 range of the image
// used to choose projection points.
func (n bnum) d0Subtracted(b *bbox, fb *box, terms []irTerm, mu2 *big.Float) (BigValue, error) {
	sc := fb.scale()
	e := int(n.w) + 64
	if e > 1000 {
		e = 1000
	}
	reg := n.f(math.Ldexp(sc, -e))
	v := BigValue{n.zero(), n.zero(), n.zero()}
	sLam := n.zero()
	sub := func(l [3]int, r *big.Float) btri {
		m := func(i int) *big.Float {
			if b.m2[i].Sign() == 0 && r != nil {
				return r
			}
			return b.m2[i]
		}
		return n.tri(b.s[l[0]][l[1]], b.s[l[1]][l[2]], b.s[l[0]][l[2]], m(l[0]), m(l[1]), m(l[2]))
	}
	K := func(i, j int) *big.Float { return new(big.Float).SetPrec(n.w).Sub(b.s[i][j], b.m2[j]) }
	mul := func(x, y *big.Float) *big.Float { return new(big.Float).SetPrec(n.w).Mul(x, y) }
	for _, t := range terms {
		var k *big.Float
		switch t.kind {
		case 0:
			k = new(big.Float).SetPrec(n.w).Quo(n.f(1), K(t.a, t.c))
		default:
			kac, kbc, kad, kbd := K(t.a, t.c), K(t.b, t.c), K(t.a, t.d), K(t.b, t.d)
			delta := new(big.Float).SetPrec(n.w).Sub(mul(kac, kbd), mul(kad, kbc))
			if t.kind == 1 {
				k = new(big.Float).SetPrec(n.w).Sub(kac, kbc)
			} else {
				k = new(big.Float).SetPrec(n.w).Sub(kbd, kad)
			}
			k.Quo(k, delta)
		}
		tr := sub(t.lines, nil)
		c, err := n.c0(&tr, mu2)
		if err != nil {
			return BigValue{}, err
		}
		v.Pole2 = v.Pole2.Add(c.Pole2.Scale(k))
		v.Pole1 = v.Pole1.Add(c.Pole1.Scale(k))
		v.Finite = v.Finite.Add(c.Finite.Scale(k))
		trl := sub(t.lines, reg)
		cl, err := n.c0Finite(&trl)
		if err != nil {
			return BigValue{}, err
		}
		sLam = sLam.Add(cl.Scale(k))
	}
	bl := *b
	for i := range bl.m2 {
		if bl.m2[i].Sign() == 0 {
			bl.m2[i] = reg
		}
	}
	dl, err := n.d0Finite(&bl)
	if err != nil {
		return BigValue{}, err
	}
	v.Finite = v.Finite.Add(dl.Sub(sLam))
	return v, nil
}
