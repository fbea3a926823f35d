package vacuum

import (
	"errors"
	"fmt"
	"slices"
	"sync"

	"loopmatch/expr"
)

// Integration-by-parts reduction of J(a1, a2, a3) (all a_i ≥ 1) to the sunset master and
// products of tadpoles.
//
// Route line p with momentum P, the third line k with an independent momentum, and line q with
// P plus that momentum (the vacuum sunset is symmetric, so every ordered pair (p, q) of lines
// admits such a routing). ∫∫ ∂/∂P·(P F) = 0, with F the integrand and
// 2P·(momentum of q) = D_p + D_q − D_k + m_p² + m_q² − m_k², gives
//
//	(d − 2a_p − a_q) J − 2a_p m_p² p⁺J − a_q q⁺p⁻J + a_q q⁺k⁻J − a_q (m_p² + m_q² − m_k²) q⁺J = 0,
//
// where p⁺ raises a_p by one and p⁻ lowers it (the standard integration-by-parts identities of
// K.G. Chetyrkin, F.V. Tkachov, Nucl. Phys. B192 (1981) 159, written out for this topology as in
// A.I. Davydychev, J.B. Tausk, Nucl. Phys. B397 (1993) 123, section 2). With u_i = a_i i⁺J the six
// identities and the homogeneity relation Σ_i m_i² u_i = (d − a1 − a2 − a3) J (J has mass
// dimension 2d − 2Σa and ∂J/∂m_i² = a_i i⁺J) are seven linear equations for (u1, u2, u3) whose
// matrix depends on the masses only and whose right-hand sides contain integrals of total power
// one lower. Three independent rows give every J(b) with Σb = N + 1 from integrals with total
// power N: a recursion that ends at J(1, 1, 1) or at integrals with a non-positive power, which
// factorise into one-loop integrals.
//
// The determinant of the (u_p, u_q) block of the rows (p, q) and (q, p) is −λ², λ² the Källén
// function of the squared masses. Where λ² = 0 (thresholds m3 = m1 + m2 and pseudo-thresholds
// such as (m, m, 0)) the matrix has rank 2. The left null vectors c of the matrix remove the
// raised integrals: Σ_row c_row rhs_row(a) = 0 relates integrals of the seed's own total power.
// At the seed (1, 1, 1) these relations decide whether J(1, 1, 1) is the master Sun (no relation
// involves it: λ² ≠ 0) or a combination of tadpoles (λ² = 0); at λ² = 0 they determine every
// total power without raising (solveLevel).

// row index 0…5: ordered pairs of lines; 6: the homogeneity relation.
var rowPairs = [6][2]int{{0, 1}, {0, 2}, {1, 0}, {1, 2}, {2, 0}, {2, 1}}

const nRows = 7

// reducer reduces the integrals of one canonical mass set along one path (the order in which
// lines are lowered, rows used and unknowns eliminated), caching every result. Its mutex guards
// the caches.
type reducer struct {
	mu   sync.Mutex
	x    [3]expr.RatFunc
	path int
	d    expr.RatFunc

	ready    bool
	err      error
	rank3    bool             // three independent rows exist (λ² ≠ 0)
	weight   [3][]rowWeight   // u_i = Σ weight·rhs_row (rank3)
	null     [][]expr.RatFunc // basis of the left null space of the 7×3 row matrix
	solved   map[int]bool     // levels solved by solveLevel
	massless bool
	memo     map[[3]int]result

	// fast arithmetic (twoloop_lcoef.go), used by raise where the denominators allow it
	lf     *lfactors
	lw     [3][]lweight
	lmemo  map[[3]int]lvec
	atoms  map[string]expr.Expr
	noFast bool
}

type lweight struct {
	row int
	w   lcoef
}

type rowWeight struct {
	row int
	w   expr.RatFunc
}

type result struct {
	e    expr.Expr
	info Info
}

func newReducer(x [3]expr.RatFunc, path int) *reducer {
	return &reducer{x: x, path: path, d: expr.RFVar(expr.DimSymbol), memo: map[[3]int]result{}, solved: map[int]bool{},
		lmemo: map[[3]int]lvec{}, atoms: map[string]expr.Expr{}}
}

// gram returns m_p² + m_q² − m_k² for lines p ≠ q.
func (r *reducer) gram(p, q int) expr.RatFunc {
	k := 3 - p - q
	return r.x[p].Add(r.x[q]).Sub(r.x[k])
}

// rowCoef returns the coefficients of (u1, u2, u3) in a row.
func (r *reducer) rowCoef(row int) [3]expr.RatFunc {
	var c [3]expr.RatFunc
	for i := range c {
		c[i] = expr.RFInt(0)
	}
	if row == 6 {
		return r.x
	}
	p, q := rowPairs[row][0], rowPairs[row][1]
	c[p] = r.x[p].Scale(ratInt(-2))
	c[q] = r.gram(p, q).Neg()
	return c
}

// integral returns J(b) for any integer powers. The caller holds r.mu.
func (r *reducer) integral(b [3]int) (expr.Expr, Info, error) {
	if res, ok := r.memo[b]; ok {
		return res.e, res.info, nil
	}
	if err := r.prepare(); err != nil {
		return expr.Expr{}, Info{}, err
	}
	var res result
	var err error
	switch {
	case b[0] <= 0 || b[1] <= 0 || b[2] <= 0:
		res, err = r.factorised(b)
	case r.massless:
		res = result{info: Info{Scaleless: []string{fmt.Sprintf("J(%d, %d, %d) with three massless lines = 0", b[0], b[1], b[2])}}}
	case b == [3]int{1, 1, 1} || !r.rank3:
		n := b[0] + b[1] + b[2]
		if !r.solved[n] {
			if err := r.solveLevel(n); err != nil {
				return expr.Expr{}, Info{}, err
			}
		}
		var ok bool
		if res, ok = r.memo[b]; !ok {
			return expr.Expr{}, Info{}, fmt.Errorf("vacuum: the integration-by-parts relations do not determine J(%d, %d, %d) for masses (%s, %s, %s)", b[0], b[1], b[2], r.x[0], r.x[1], r.x[2])
		}
	case !r.noFast:
		var v lvec
		if v, err = r.lintegral(b); err == nil {
			var e expr.Expr
			e, err = r.fromLVec(v)
			res = result{e, v.info}
		} else if err == errNotFast {
			r.noFast = true
			res, err = r.raise(b)
		}
	default:
		res, err = r.raise(b)
	}
	if err != nil {
		return expr.Expr{}, Info{}, err
	}
	r.memo[b] = res
	return res.e, res.info, nil
}

// factorised evaluates J(b) with a non-positive power by moving that line to the third place.
func (r *reducer) factorised(b [3]int) (result, error) {
	z := 2
	for i := range 3 {
		if b[i] <= 0 {
			z = i
			break
		}
	}
	o := [3]int{(z + 1) % 3, (z + 2) % 3, z}
	e, info, err := factorised([3]int{b[o[0]], b[o[1]], b[o[2]]}, [3]expr.RatFunc{r.x[o[0]], r.x[o[1]], r.x[o[2]]})
	return result{e, info}, err
}

// raise returns J(b) = u_i/a_i at the seed a = b − e_i for a line i with b_i ≥ 2; path 0 lowers
// the line with the highest power (the first of equals), path 1 the last line with b_i ≥ 2.
func (r *reducer) raise(b [3]int) (result, error) {
	i := r.lowerLine(b)
	a := b
	a[i]--
	// Combine the rows' coefficients of each integral first (small rational functions), then
	// add the integrals once each.
	type wterm struct {
		b [3]int
		w expr.RatFunc
	}
	var terms []wterm
	scale := expr.RFRat(ratFrac(1, int64(a[i])))
	for _, rw := range r.weight[i] {
		for _, t := range r.rhsTerms(rw.row, a) {
			w := rw.w.Mul(t.w).Mul(scale)
			k := slices.IndexFunc(terms, func(x wterm) bool { return x.b == t.b })
			if k < 0 {
				terms = append(terms, wterm{t.b, w})
			} else {
				terms[k].w = terms[k].w.Add(w)
			}
		}
	}
	var info Info
	u := expr.Zero()
	for _, t := range terms {
		if t.w.IsZero() {
			continue
		}
		j, jinfo, err := r.integral(t.b)
		if err != nil {
			return result{}, err
		}
		mergeInfo(&info, jinfo)
		u = u.Add(j.Scale(t.w))
	}
	return result{u, info}, nil
}

// lowerLine returns the line whose power the recursion lowers: path 0 the highest power (the
// first of equals), path 1 the last line with power ≥ 2.
func (r *reducer) lowerLine(b [3]int) int {
	i := -1
	for k := range 3 {
		if b[k] < 2 {
			continue
		}
		switch {
		case i < 0:
			i = k
		case r.path == 0 && b[k] > b[i]:
			i = k
		case r.path == 1:
			i = k
		}
	}
	return i
}

// prepare chooses three independent rows for this path and inverts them; where there are none
// (λ² = 0) it keeps the left null space of the row matrix for solveLevel.
func (r *reducer) prepare() error {
	if r.ready || r.err != nil {
		return r.err
	}
	r.ready = true
	r.massless = r.x[0].IsZero() && r.x[1].IsZero() && r.x[2].IsZero()
	if r.massless {
		return nil
	}
	var m [nRows][]expr.RatFunc
	for row := range nRows {
		c := r.rowCoef(row)
		m[row] = c[:]
	}
	// left null space: vectors c with Σ_row c_row m[row] = 0, i.e. the null space of mᵀ.
	mt := make([][]expr.RatFunc, 3)
	for i := range 3 {
		mt[i] = make([]expr.RatFunc, nRows)
		for row := range nRows {
			mt[i][row] = m[row][i]
		}
	}
	r.null = nullSpace(mt, nRows)
	// Preferred rows: the pair identities (p, q), (q, p) and the homogeneity relation, whose
	// determinant is −m_k² λ² (k the third line), so that only λ² and masses appear in
	// denominators; the two paths use different pairs. Any other independent triple is the
	// fallback (e.g. for a massless line k).
	triples := [][3]int{{0, 2, 6}, {1, 4, 6}, {3, 5, 6}}
	if r.path == 1 {
		triples = [][3]int{{1, 4, 6}, {3, 5, 6}, {0, 2, 6}}
	}
	for a := 0; a < nRows; a++ {
		for b := a + 1; b < nRows; b++ {
			for c := b + 1; c < nRows; c++ {
				triples = append(triples, [3]int{a, b, c})
			}
		}
	}
	if r.path == 1 {
		slices.Reverse(triples[3:])
	}
	for _, t := range triples {
		var mm [3][3]expr.RatFunc
		for k, row := range t {
			copy(mm[k][:], m[row])
		}
		inv, ok := invert3(mm)
		if !ok {
			continue
		}
		for i := range 3 {
			for k, row := range t {
				if !inv[i][k].IsZero() {
					r.weight[i] = append(r.weight[i], rowWeight{row, inv[i][k]})
				}
			}
		}
		r.rank3 = true
		r.prepareFast()
		return nil
	}
	return nil
}

// solveLevel determines the integrals J(b), all b_i ≥ 1, Σb = n, from the relations that the left
// null vectors c of the row matrix give at every seed a of that level: Σ_row c_row rhs_row(a) = 0
// (the raised integrals drop out), a linear system among integrals of level n and factorised
// ones. At n = 3 it decides whether J(1, 1, 1) is the master (no relation involves it) or a
// combination of tadpoles; where three independent rows are missing (λ² = 0) it reduces every
// level. Unknowns left undetermined stay out of the memo (integral reports them).
func (r *reducer) solveLevel(n int) error {
	r.solved[n] = true
	var unknowns [][3]int
	for a0 := n - 2; a0 >= 1; a0-- {
		for a1 := n - 1 - a0; a1 >= 1; a1-- {
			unknowns = append(unknowns, [3]int{a0, a1, n - a0 - a1})
		}
	}
	if r.path == 1 {
		slices.Reverse(unknowns)
	}
	index := map[[3]int]int{}
	for i, u := range unknowns {
		index[u] = i
	}
	type equation struct {
		c   []expr.RatFunc
		rhs expr.Expr // Σ c·J = rhs
	}
	var info Info
	type pivot struct {
		col int
		eq  equation
	}
	var pivots []pivot
	complete := false
	for _, a := range unknowns {
		for _, nv := range r.null {
			eq := equation{c: make([]expr.RatFunc, len(unknowns)), rhs: expr.Zero()}
			for i := range eq.c {
				eq.c[i] = expr.RFInt(0)
			}
			for row, cr := range nv {
				if cr.IsZero() {
					continue
				}
				for _, t := range r.rhsTerms(row, a) {
					w := cr.Mul(t.w)
					if w.IsZero() {
						continue
					}
					if i, ok := index[t.b]; ok {
						eq.c[i] = eq.c[i].Add(w)
						continue
					}
					j, jinfo, err := r.integral(t.b) // factorised
					if err != nil {
						return err
					}
					mergeInfo(&info, jinfo)
					eq.rhs = eq.rhs.Sub(j.Scale(w))
				}
			}
			// Reduce by the pivots found so far (each has coefficient 1 in its column).
			for _, p := range pivots {
				f := eq.c[p.col]
				if f.IsZero() {
					continue
				}
				for k := range eq.c {
					if !p.eq.c[k].IsZero() {
						eq.c[k] = eq.c[k].Sub(f.Mul(p.eq.c[k]))
					}
				}
				eq.rhs = eq.rhs.Sub(p.eq.rhs.Scale(f))
			}
			col := slices.IndexFunc(eq.c, func(c expr.RatFunc) bool { return !c.IsZero() })
			if col < 0 {
				if !eq.rhs.IsZero() {
					return fmt.Errorf("vacuum: inconsistent integration-by-parts relations at level %d for masses (%s, %s, %s) (internal error)", n, r.x[0], r.x[1], r.x[2])
				}
				continue
			}
			inv, err := eq.c[col].Inv()
			if err != nil {
				return err
			}
			for k := range eq.c {
				eq.c[k] = eq.c[k].Mul(inv)
			}
			eq.rhs = eq.rhs.Scale(inv)
			pivots = append(pivots, pivot{col, eq})
			if len(pivots) == len(unknowns) {
				complete = true
				break
			}
		}
		if complete {
			break
		}
	}
	// Back substitution: clear each pivot column from the earlier pivots.
	for i := len(pivots) - 1; i >= 0; i-- {
		pi := pivots[i]
		for j := 0; j < i; j++ {
			f := pivots[j].eq.c[pi.col]
			if f.IsZero() {
				continue
			}
			for k := range pivots[j].eq.c {
				if !pi.eq.c[k].IsZero() {
					pivots[j].eq.c[k] = pivots[j].eq.c[k].Sub(f.Mul(pi.eq.c[k]))
				}
			}
			pivots[j].eq.rhs = pivots[j].eq.rhs.Sub(pi.eq.rhs.Scale(f))
		}
	}
	for _, p := range pivots {
		determined := true
		for k, c := range p.eq.c {
			if k != p.col && !c.IsZero() {
				determined = false
				break
			}
		}
		if determined {
			r.memo[unknowns[p.col]] = result{p.eq.rhs, info}
		}
	}
	if n == 3 {
		if _, ok := r.memo[[3]int{1, 1, 1}]; !ok {
			r.memo[[3]int{1, 1, 1}] = result{Sun(r.x[0], r.x[1], r.x[2]), info}
		}
	}
	return nil
}

// rhsTerm is one integral J(b) with weight w in the right-hand side of a row.
type rhsTerm struct {
	b [3]int
	w expr.RatFunc
}

// rhsTerms lists the right-hand side of a row at the seed a:
// −(d − 2a_p − a_q) J(a) + a_q J(a + e_q − e_p) − a_q J(a + e_q − e_k) for the pair (p, q), and
// (d − Σa) J(a) for the homogeneity relation.
func (r *reducer) rhsTerms(row int, a [3]int) []rhsTerm {
	if row == 6 {
		return []rhsTerm{{a, r.d.Sub(expr.RFInt(int64(a[0] + a[1] + a[2])))}}
	}
	p, q := rowPairs[row][0], rowPairs[row][1]
	k := 3 - p - q
	bp, bk := a, a
	bp[q]++
	bp[p]--
	bk[q]++
	bk[k]--
	return []rhsTerm{
		{a, r.d.Sub(expr.RFInt(int64(2*a[p] + a[q]))).Neg()},
		{bp, expr.RFInt(int64(a[q]))},
		{bk, expr.RFInt(int64(-a[q]))},
	}
}

// nullSpace returns a basis of {v : A v = 0} for the matrix A with ncols columns.
func nullSpace(A [][]expr.RatFunc, ncols int) [][]expr.RatFunc {
	m := make([][]expr.RatFunc, len(A))
	for i := range A {
		m[i] = slices.Clone(A[i])
	}
	var pivCols []int
	rowi := 0
	for col := 0; col < ncols && rowi < len(m); col++ {
		piv := -1
		for i := rowi; i < len(m); i++ {
			if !m[i][col].IsZero() {
				piv = i
				break
			}
		}
		if piv < 0 {
			continue
		}
		m[rowi], m[piv] = m[piv], m[rowi]
		inv, _ := m[rowi][col].Inv()
		for k := range m[rowi] {
			m[rowi][k] = m[rowi][k].Mul(inv)
		}
		for i := range m {
			if i == rowi || m[i][col].IsZero() {
				continue
			}
			f := m[i][col]
			for k := range m[i] {
				m[i][k] = m[i][k].Sub(f.Mul(m[rowi][k]))
			}
		}
		pivCols = append(pivCols, col)
		rowi++
	}
	isPiv := map[int]int{}
	for i, c := range pivCols {
		isPiv[c] = i
	}
	var basis [][]expr.RatFunc
	for free := 0; free < ncols; free++ {
		if _, ok := isPiv[free]; ok {
			continue
		}
		v := make([]expr.RatFunc, ncols)
		for k := range v {
			v[k] = expr.RFInt(0)
		}
		v[free] = expr.RFInt(1)
		for c, i := range isPiv {
			v[c] = m[i][free].Neg()
		}
		basis = append(basis, v)
	}
	return basis
}

// invert3 returns the inverse of m, or false if it is singular.
func invert3(m [3][3]expr.RatFunc) ([3][3]expr.RatFunc, bool) {
	var cof [3][3]expr.RatFunc
	for i := range 3 {
		for j := range 3 {
			a, b := (i+1)%3, (i+2)%3
			c, e := (j+1)%3, (j+2)%3
			cof[i][j] = m[a][c].Mul(m[b][e]).Sub(m[a][e].Mul(m[b][c]))
		}
	}
	det := m[0][0].Mul(cof[0][0]).Add(m[0][1].Mul(cof[0][1])).Add(m[0][2].Mul(cof[0][2]))
	dinv, err := det.Inv()
	if det.IsZero() || err != nil {
		return cof, false
	}
	var inv [3][3]expr.RatFunc
	for i := range 3 {
		for j := range 3 {
			inv[i][j] = cof[j][i].Mul(dinv) // the adjugate is the transposed cofactor matrix
		}
	}
	return inv, true
}

// errNotFast reports a coefficient whose denominator the fast arithmetic cannot hold.
var errNotFast = errors.New("vacuum: coefficient outside the fast arithmetic")

// prepareFast sets up the fast arithmetic for the chosen rows, if the masses allow it.
func (r *reducer) prepareFast() {
	lf, ok := newLFactors(r.x, kallen(r.x[0], r.x[1], r.x[2]))
	if !ok {
		r.noFast = true
		return
	}
	r.lf = lf
	for i := range 3 {
		for _, rw := range r.weight[i] {
			c, ok := lf.fromRat(rw.w)
			if !ok {
				r.noFast = true
				return
			}
			r.lw[i] = append(r.lw[i], lweight{rw.row, c})
		}
	}
}

// lintegral is integral in the fast arithmetic.
func (r *reducer) lintegral(b [3]int) (lvec, error) {
	if v, ok := r.lmemo[b]; ok {
		return v, nil
	}
	var v lvec
	if b[0] <= 0 || b[1] <= 0 || b[2] <= 0 || b == [3]int{1, 1, 1} {
		e, info, err := r.integral(b)
		if err != nil {
			return lvec{}, err
		}
		var ok bool
		if v, ok = r.toLVec(e, info); !ok {
			return lvec{}, errNotFast
		}
	} else {
		i := r.lowerLine(b)
		a := b
		a[i]--
		type wterm struct {
			b [3]int
			w lcoef
		}
		var terms []wterm
		inv := expr.RFRat(ratFrac(1, int64(a[i])))
		for _, rw := range r.lw[i] {
			for _, t := range r.rhsTerms(rw.row, a) {
				tw, ok := r.lf.fromRat(t.w.Mul(inv))
				if !ok {
					return lvec{}, errNotFast
				}
				w := r.lf.mul(rw.w, tw)
				k := slices.IndexFunc(terms, func(x wterm) bool { return x.b == t.b })
				if k < 0 {
					terms = append(terms, wterm{t.b, w})
				} else {
					terms[k].w = r.lf.add(terms[k].w, w)
				}
			}
		}
		v = lvec{c: map[string]lcoef{}}
		for _, t := range terms {
			if t.w.num.IsZero() {
				continue
			}
			j, err := r.lintegral(t.b)
			if err != nil {
				return lvec{}, err
			}
			mergeInfo(&v.info, j.info)
			for key, c := range j.c {
				p := r.lf.mul(t.w, c)
				if old, ok := v.c[key]; ok {
					p = r.lf.add(old, p)
				}
				v.c[key] = p
			}
		}
		for key, c := range v.c {
			if c.num.IsZero() {
				delete(v.c, key)
			}
		}
	}
	r.lmemo[b] = v
	return v, nil
}
