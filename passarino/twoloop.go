package passarino

import (
	"fmt"
	"math/big"
	"slices"
	"sync"

	"loopmatch/expr"
	"loopmatch/loops/vacuum"
)

// This file reduces two-loop vacuum integrals: tensors in the loop momenta k and l are reduced
// by projecting onto products of metrics (the Gram matrix of the pairings, exact in d), and the
// scalar integrals — propagators with momenta k, l and k + l up to signs and relabelling, several
// masses on a line split by partial fractions, numerators k², l², k·l — go to vacuum.TwoLoop.

// pairingsOf lists the perfect matchings of the slots 0 … 2n−1.
func pairingsOf(n int) [][][2]int {
	slots := make([]int, 2*n)
	for i := range slots {
		slots[i] = i
	}
	var out [][][2]int
	pairings(slots, func(p [][2]int) { out = append(out, slices.Clone(p)) })
	return out
}

// cycles counts the cycles of the union of two perfect matchings of 2n points.
func cycles(p, q [][2]int, n int) int {
	mp := make([]int, 2*n)
	mq := make([]int, 2*n)
	for _, e := range p {
		mp[e[0]], mp[e[1]] = e[1], e[0]
	}
	for _, e := range q {
		mq[e[0]], mq[e[1]] = e[1], e[0]
	}
	seen := make([]bool, 2*n)
	c := 0
	for s := range seen {
		if seen[s] {
			continue
		}
		c++
		for x := s; !seen[x]; {
			seen[x] = true
			y := mp[x]
			seen[y] = true
			x = mq[y]
		}
	}
	return c
}

// pairingInverse caches, per rank 2n, the inverse of the matrix M_PQ = d^{cycles(P ∪ Q)} of
// contractions between metric products.
var pairingInverse sync.Map // int → [][]expr.RatFunc

// maxTwoLoopRank bounds the rank of a two-loop vacuum tensor ((2n−1)!! pairings).
const maxTwoLoopRank = 8

func pairingInv(n int) ([][]expr.RatFunc, error) {
	if v, ok := pairingInverse.Load(n); ok {
		return v.([][]expr.RatFunc), nil
	}
	ps := pairingsOf(n)
	m := len(ps)
	d := expr.RFVar(expr.DimSymbol)
	a := make([][]expr.RatFunc, m)
	inv := make([][]expr.RatFunc, m)
	for i := range ps {
		a[i] = make([]expr.RatFunc, m)
		inv[i] = make([]expr.RatFunc, m)
		for j := range ps {
			p, _ := d.Pow(cycles(ps[i], ps[j], n))
			a[i][j] = p
			inv[i][j] = expr.RFInt(0)
		}
		inv[i][i] = expr.RFInt(1)
	}
	// Gauss–Jordan elimination over rational functions of d.
	for col := 0; col < m; col++ {
		piv := -1
		for r := col; r < m; r++ {
			if !a[r][col].IsZero() {
				piv = r
				break
			}
		}
		if piv < 0 {
			return nil, fmt.Errorf("singular pairing matrix at rank %d", 2*n)
		}
		a[col], a[piv] = a[piv], a[col]
		inv[col], inv[piv] = inv[piv], inv[col]
		f, _ := a[col][col].Inv()
		for c := 0; c < m; c++ {
			a[col][c] = a[col][c].Mul(f)
			inv[col][c] = inv[col][c].Mul(f)
		}
		for r := 0; r < m; r++ {
			if r == col || a[r][col].IsZero() {
				continue
			}
			g := a[r][col]
			for c := 0; c < m; c++ {
				a[r][c] = a[r][c].Sub(g.Mul(a[col][c]))
				inv[r][c] = inv[r][c].Sub(g.Mul(inv[col][c]))
			}
		}
	}
	pairingInverse.Store(n, inv)
	return inv, nil
}

// reduceMultiLoopTerm reduces a vacuum term integrated over several loop momenta: the tensor
// structure by projection onto metric products, then the scalar integral with scalar.
func reduceMultiLoopTerm(t expr.Term, loops []string) (expr.Expr, vacuum.Info, error) {
	var info vacuum.Info
	isLoop := func(p string) bool { return slices.Contains(loops, p) }
	for _, a := range t.Atoms {
		if x, ok := a.A.(expr.Prop); ok {
			for _, m := range x.K {
				if !isLoop(m.Name) {
					return expr.Expr{}, info, fmt.Errorf("propagator %s still depends on external momenta; expand it first", x.Key())
				}
			}
		}
	}
	// Slots: occurrences of a loop momentum contracted with something else.
	sl, err := openSlots(t, isLoop, false)
	if err != nil {
		return expr.Expr{}, info, err
	}
	rank := len(sl.idx)
	if sl.zero || rank%2 == 1 {
		return expr.Zero(), info, nil
	}
	if rank > maxTwoLoopRank {
		return expr.Expr{}, info, fmt.Errorf("tensor rank %d of a multi-loop vacuum integral exceeds the limit %d", rank, maxTwoLoopRank)
	}
	slotIdx, slotMom, nt := sl.idx, sl.mom, sl.term
	base := expr.FromTerm(nt)
	if rank > 0 {
		n := rank / 2
		inv, err := pairingInv(n)
		if err != nil {
			return expr.Expr{}, info, err
		}
		ps := pairingsOf(n)
		// Σ_P G_P Σ_Q (M⁻¹)_PQ R_Q with R_Q the product of the slots' scalar products.
		rq := make([]expr.Expr, len(ps))
		for q, pq := range ps {
			r := expr.Int(1)
			for _, e := range pq {
				r = r.MustMul(expr.FromAtom(expr.NewDot(slotMom[e[0]], slotMom[e[1]]), 1))
			}
			rq[q] = r
		}
		sym := expr.Zero()
		for p, pp := range ps {
			g := expr.Int(1)
			for _, e := range pp {
				g = g.MustMul(expr.FromAtom(expr.NewMetric(slotIdx[e[0]], slotIdx[e[1]]), 1))
			}
			c := expr.Zero()
			for q := range ps {
				if inv[p][q].IsZero() {
					continue
				}
				c = c.Add(rq[q].Scale(inv[p][q]))
			}
			sym = sym.Add(g.MustMul(c))
		}
		var err2 error
		if base, err2 = base.Mul(sym); err2 != nil {
			return expr.Expr{}, info, err2
		}
	}
	// Scalar integrals.
	res := expr.Zero()
	for _, st := range base.Terms() {
		r, si, err := twoLoopScalar(st, loops)
		if err != nil {
			return expr.Expr{}, info, err
		}
		info.Merge(si)
		res = res.Add(r)
	}
	return res, info, nil
}

// line is one propagator class of a two-loop vacuum integral: its momentum (over k, l) and the
// masses with powers on it.
type line struct {
	c   [2]int // coefficients of k and l
	den []vacuum.Line
	num []vacuum.Line // numerator factors (K² − m²)^n
}

// twoLoopScalar evaluates a term whose only loop dependence is propagators and the scalar
// products k², l², k·l.
func twoLoopScalar(t expr.Term, loops []string) (expr.Expr, vacuum.Info, error) {
	var info vacuum.Info
	if len(loops) != 2 {
		return expr.Expr{}, info, fmt.Errorf("%d-loop vacuum integrals are not available", len(loops))
	}
	k, l := loops[0], loops[1]
	coefOf := func(m expr.Mom) ([2]int, error) {
		var c [2]int
		for _, x := range m {
			if !x.Coef.IsInt() || !x.Coef.Num().IsInt64() {
				return c, fmt.Errorf("loop momentum coefficient %s", x.Coef)
			}
			v := int(x.Coef.Num().Int64())
			switch x.Name {
			case k:
				c[0] = v
			case l:
				c[1] = v
			}
		}
		return c, nil
	}
	var lines []*line
	findLine := func(c [2]int) *line {
		for _, ln := range lines {
			if ln.c == c || (ln.c[0] == -c[0] && ln.c[1] == -c[1]) {
				return ln
			}
		}
		ln := &line{c: c}
		lines = append(lines, ln)
		return ln
	}
	rest := expr.Term{Coef: t.Coef, NC: t.NC}
	var num [3]int // powers of k², l², k·l
	for _, a := range t.Atoms {
		switch x := a.A.(type) {
		case expr.Prop:
			c, err := coefOf(x.K)
			if err != nil {
				return expr.Expr{}, info, err
			}
			ln := findLine(c)
			if a.Pow < 0 {
				ln.den = append(ln.den, vacuum.Line{M2: x.M2, Pow: -a.Pow})
			} else {
				ln.num = append(ln.num, vacuum.Line{M2: x.M2, Pow: a.Pow})
			}
			continue
		case expr.Dot:
			switch {
			case x.A == k && x.B == k:
				num[0] += a.Pow
				continue
			case x.A == l && x.B == l:
				num[1] += a.Pow
				continue
			case (x.A == k && x.B == l) || (x.A == l && x.B == k):
				num[2] += a.Pow
				continue
			}
		}
		rest.Atoms = append(rest.Atoms, a)
	}
	if len(lines) > 3 {
		return expr.Expr{}, info, fmt.Errorf("a two-loop vacuum integral with %d different line momenta", len(lines))
	}
	// Choose lines i, j with independent momenta and map them to k' and l'; the third (if any)
	// must be ±(k' + l').
	var A, B, C *line
	for i := range lines {
		for j := range lines {
			if i == j {
				continue
			}
			a, b := lines[i].c, lines[j].c
			if a[0]*b[1]-a[1]*b[0] == 0 {
				continue
			}
			if len(lines) == 3 {
				c := lines[3-i-j].c
				// c = α a + β b with α, β = ±1
				found := false
				for _, al := range []int{1, -1} {
					for _, be := range []int{1, -1} {
						if c[0] == al*a[0]+be*b[0] && c[1] == al*a[1]+be*b[1] || c[0] == -(al*a[0]+be*b[0]) && c[1] == -(al*a[1]+be*b[1]) {
							A = &line{c: [2]int{al * a[0], al * a[1]}, den: lines[i].den, num: lines[i].num}
							B = &line{c: [2]int{be * b[0], be * b[1]}, den: lines[j].den, num: lines[j].num}
							C = lines[3-i-j]
							found = true
						}
					}
				}
				if !found {
					continue
				}
			} else {
				A, B = lines[i], lines[j]
				C = &line{c: [2]int{a[0] + b[0], a[1] + b[1]}}
			}
			break
		}
		if A != nil {
			break
		}
	}
	if A == nil {
		if len(lines) <= 1 {
			info.Scaleless = append(info.Scaleless, "a two-loop integral in which one loop momentum has no propagator = 0")
			return expr.Zero(), info, nil
		}
		return expr.Expr{}, info, fmt.Errorf("the propagator momenta of a two-loop vacuum integral are not of the form k, l, k + l")
	}
	// (k', l') = T (k, l) with T = [A.c; B.c], |det T| = 1 required.
	det := A.c[0]*B.c[1] - A.c[1]*B.c[0]
	if det != 1 && det != -1 {
		return expr.Expr{}, info, fmt.Errorf("two-loop momentum routing with Jacobian %d is not handled", det)
	}
	// (k, l) = T⁻¹ (k', l'): T⁻¹ = [[B1, −A1], [−B0, A0]]/det.
	u := [2][2]int{{B.c[1] * det, -A.c[1] * det}, {-B.c[0] * det, A.c[0] * det}}
	// Old scalar products in terms of the new ones: k = u00 k' + u01 l', l = u10 k' + u11 l'.
	kk := quad(u[0][0], u[0][1], u[0][0], u[0][1])
	ll := quad(u[1][0], u[1][1], u[1][0], u[1][1])
	kl := quad(u[0][0], u[0][1], u[1][0], u[1][1])
	numer := expr.Int(1)
	for i, q := range []quadForm{kk, ll, kl} {
		for range num[i] {
			numer = numer.MustMul(q.expr())
		}
	}
	// Numerator propagator factors (K² − m²)^n of each line, in terms of k'², l'², k'·l'.
	for li, ln := range []*line{A, B, C} {
		for _, nf := range ln.num {
			sq := []quadForm{{1, 0, 0}, {0, 1, 0}, {1, 1, 2}}[li]
			f := sq.expr().Sub(expr.FromRF(nf.M2))
			for range nf.Pow {
				numer = numer.MustMul(f)
			}
		}
	}
	// Partial fractions on every line.
	frs := make([][]vacuum.Fraction, 3)
	for li, ln := range []*line{A, B, C} {
		if len(ln.den) == 0 {
			frs[li] = []vacuum.Fraction{{Coef: expr.RFInt(1), M2: expr.RFInt(0), Pow: 0}}
			continue
		}
		fr, err := vacuum.Fractions(ln.den)
		if err != nil {
			return expr.Expr{}, info, err
		}
		frs[li] = fr
	}
	measure := expr.FromAtom(expr.I, 2).MustMul(expr.FromAtom(expr.Pi, -4)).Scale(expr.RFRat(big.NewRat(1, 256)))
	res := expr.Zero()
	for _, nterm := range numer.Terms() {
		var nm vacuum.Numerator
		for _, a := range nterm.Atoms {
			d := a.A.(expr.Dot)
			switch {
			case d.A == "k'" && d.B == "k'":
				nm.K2 += a.Pow
			case d.A == "l'" && d.B == "l'":
				nm.L2 += a.Pow
			default:
				nm.KL += a.Pow
			}
		}
		for _, f0 := range frs[0] {
			for _, f1 := range frs[1] {
				for _, f2 := range frs[2] {
					v, vi, err := vacuum.TwoLoop([3]int{f0.Pow, f1.Pow, f2.Pow}, [3]expr.RatFunc{f0.M2, f1.M2, f2.M2}, nm)
					if err != nil {
						return expr.Expr{}, info, err
					}
					info.Merge(vi)
					c := nterm.Coef.Mul(f0.Coef).Mul(f1.Coef).Mul(f2.Coef)
					res = res.Add(v.Scale(c))
				}
			}
		}
	}
	out, err := expr.FromTerm(rest).Mul(res)
	if err != nil {
		return expr.Expr{}, info, err
	}
	return out.MustMul(measure), info, nil
}

// quadForm is a k'² + b l'² + c k'·l'.
type quadForm struct{ a, b, c int }

// quad returns (x0 k' + x1 l')·(y0 k' + y1 l').
func quad(x0, x1, y0, y1 int) quadForm {
	return quadForm{x0 * y0, x1 * y1, x0*y1 + x1*y0}
}

func (q quadForm) expr() expr.Expr {
	e := expr.Zero()
	add := func(c int, a, b string) {
		if c != 0 {
			e = e.Add(expr.FromAtom(expr.NewDot(a, b), 1).Scale(expr.RFInt(int64(c))))
		}
	}
	add(q.a, "k'", "k'")
	add(q.b, "l'", "l'")
	add(q.c, "k'", "l'")
	return e
}
