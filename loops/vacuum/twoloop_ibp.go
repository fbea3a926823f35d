package vacuum

import (
	"errors"
	"fmt"
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
// At the seed (1, 1, 1) the seven equations in (u1, u2, u3, J(1, 1, 1)) have rank 3 in general,
// and J(1, 1, 1) is the master Sun. Where they have rank 4, J(1, 1, 1) itself is a combination of
// tadpoles: this happens exactly when the Källén function λ²(m1², m2², m3²) vanishes (threshold
// and pseudo-threshold masses such as (m, m, 0) or (m1, m2, m1 + m2)), where the determinant of the
// (u_p, u_q) block, −λ², vanishes.

// row index 0…5: ordered pairs of lines; 6: the homogeneity relation.
var rowPairs = [6][2]int{{0, 1}, {0, 2}, {1, 0}, {1, 2}, {2, 0}, {2, 1}}

const nRows = 7

// reducer reduces the integrals of one canonical mass set along one path (the order in which
// lines are lowered and the rows used), caching every result. Its mutex guards the caches.
type reducer struct {
	mu   sync.Mutex
	x    [3]expr.RatFunc
	path int
	d    expr.RatFunc

	ready  bool
	err    error
	weight [3][]rowWeight // u_i = Σ weight·rhs_row
	master result         // J(1, 1, 1)
	memo   map[[3]int]result
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
	return &reducer{x: x, path: path, d: expr.RFVar(expr.DimSymbol), memo: map[[3]int]result{}}
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

// rowRHS returns the right-hand side of a row at the seed a:
// −(d − 2a_p − a_q) J(a) + a_q J(a + e_q − e_p) − a_q J(a + e_q − e_k) for the pair (p, q), and
// (d − Σa) J(a) for the homogeneity relation. withJ = false leaves out the J(a) term (used at the
// seed (1, 1, 1), where J(a) is the unknown master).
func (r *reducer) rowRHS(row int, a [3]int, withJ bool) (expr.Expr, Info, error) {
	var info Info
	res := expr.Zero()
	var cJ expr.RatFunc
	if row == 6 {
		cJ = r.d.Sub(expr.RFInt(int64(a[0] + a[1] + a[2])))
	} else {
		p, q := rowPairs[row][0], rowPairs[row][1]
		k := 3 - p - q
		cJ = r.d.Sub(expr.RFInt(int64(2*a[p] + a[q]))).Neg()
		for _, t := range []struct {
			lower int
			sign  int64
		}{{p, 1}, {k, -1}} {
			c := a
			c[q]++
			c[t.lower]--
			j, jinfo, err := r.integral(c)
			if err != nil {
				return expr.Expr{}, info, err
			}
			info.Merge(jinfo)
			res = res.Add(j.Scale(expr.RFInt(t.sign * int64(a[q]))))
		}
	}
	if withJ {
		j, jinfo, err := r.integral(a)
		if err != nil {
			return expr.Expr{}, info, err
		}
		info.Merge(jinfo)
		res = res.Add(j.Scale(cJ))
	}
	return res, info, nil
}

// integral returns J(b) for any integer powers. The caller holds r.mu.
func (r *reducer) integral(b [3]int) (expr.Expr, Info, error) {
	if res, ok := r.memo[b]; ok {
		return res.e, res.info, nil
	}
	if !r.ready {
		if err := r.prepare(); err != nil {
			return expr.Expr{}, Info{}, err
		}
	}
	var res result
	var err error
	switch {
	case b[0] <= 0 || b[1] <= 0 || b[2] <= 0:
		res, err = r.factorised(b)
	case b == [3]int{1, 1, 1}:
		res = r.master
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
	a := b
	a[i]--
	var info Info
	u := expr.Zero()
	for _, rw := range r.weight[i] {
		rhs, rinfo, err := r.rowRHS(rw.row, a, true)
		if err != nil {
			return result{}, err
		}
		info.Merge(rinfo)
		u = u.Add(rhs.Scale(rw.w))
	}
	return result{u.Scale(expr.RFRat(ratFrac(1, int64(a[i])))), info}, nil
}

