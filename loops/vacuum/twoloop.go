package vacuum

import (
	"fmt"
	"math/big"
	"slices"
	"strings"
	"sync"

	"loopmatch/expr"
)

// Two-loop vacuum integrals. The family is
//
//	J(a1, a2, a3; m1², m2², m3²) = ∫∫ 1/((k² − m1²)^{a1} (l² − m2²)^{a2} ((k+l)² − m3²)^{a3}),
//
// each loop with the measure of the package comment, (16π²/i) μ^{2ε} (e^{γ_E}/4π)^ε ∫ d^dk/(2π)^d.
// Every member reduces exactly in d to products of two one-loop tadpoles, Tad(·)·Tad(·), and the
// sunset master Sun(m1², m2², m3²) = J(1, 1, 1; m1², m2², m3²) (twoloop_ibp.go); the master's
// ε-expansion is in twoloop_master.go.

// SunName is the function name of the two-loop sunset master, Sun(m1², m2², m3²) with the three
// squared masses as arguments in canonical (sorted) order; the integral is symmetric in them.
const SunName = "Sun"

// Sun returns the master atom Sun(m1², m2², m3²) = J(1, 1, 1; m1², m2², m3²) with its arguments
// in canonical order. It does not reduce: TwoLoop replaces the sunset by tadpoles where it is
// reducible (at λ² = 0) and by zero where it is scaleless.
func Sun(m1sq, m2sq, m3sq expr.RatFunc) expr.Expr {
	m := sortMasses([3]expr.RatFunc{m1sq, m2sq, m3sq})
	return expr.FromAtom(expr.NewFn(SunName, 1, expr.FromRF(m[0]), expr.FromRF(m[1]), expr.FromRF(m[2])), 1)
}

// Numerator is the numerator monomial (k²)^K2 (l²)^L2 (k·l)^KL of a two-loop vacuum integral, with
// k the momentum of line 1, l that of line 2 and k + l that of line 3. A polynomial numerator is
// a sum of such monomials, each reduced on its own.
type Numerator struct {
	K2, L2, KL int
}

// MaxTwoLoopPower bounds Σ|a_i| plus the numerator degree of an integral that TwoLoop accepts:
// the exact coefficients grow quickly with it. With three different symbolic masses all integrals
// up to total power 8 take about 0.7 s, and each further unit of power about three times longer.
const MaxTwoLoopPower = 16

// TwoLoop returns the two-loop vacuum integral
//
//	∫∫ (k²)^{K2} (l²)^{L2} (k·l)^{KL} / ((k² − m1²)^{a1} (l² − m2²)^{a2} ((k+l)² − m3²)^{a3})
//
// (normalised as in the package comment) exactly in d, as a combination of Tad(·)·Tad(·) products
// and the master Sun(·, ·, ·), with coefficients rational in d and the squared masses. Powers may
// be zero or negative (numerator factors); masses may be zero or equal. Integrals without a scale
// vanish and are listed in Info.Scaleless. Reductions are cached, so repeated calls are cheap; the
// function is safe for concurrent use.
func TwoLoop(pow [3]int, m2 [3]expr.RatFunc, num Numerator) (expr.Expr, Info, error) {
	var info Info
	if num.K2 < 0 || num.L2 < 0 || num.KL < 0 {
		return expr.Expr{}, info, fmt.Errorf("vacuum: numerator powers must be non-negative, got %+v", num)
	}
	size := num.K2 + num.L2 + num.KL
	for _, a := range pow {
		size += max(a, -a)
	}
	if size > MaxTwoLoopPower {
		return expr.Expr{}, info, fmt.Errorf("vacuum: two-loop integral with powers %v and numerator %+v exceeds the supported total power %d", pow, num, MaxTwoLoopPower)
	}
	for _, m := range m2 {
		for _, v := range m.Vars() {
			if v == expr.DimSymbol || strings.HasSuffix(v, "·") {
				return expr.Expr{}, info, fmt.Errorf("vacuum: mass %s uses the reserved name %q", m, v)
			}
		}
	}
	// Rewrite the numerator in the denominators D1 = k² − m1², D2 = l² − m2², D3 = (k+l)² − m3²:
	// k² = D1 + m1², l² = D2 + m2², k·l = (D3 − D1 − D2 + m3² − m1² − m2²)/2.
	one := expr.RFInt(1)
	k2 := dpoly{{1, 0, 0}: one, {}: m2[0]}
	l2 := dpoly{{0, 1, 0}: one, {}: m2[1]}
	half := big.NewRat(1, 2)
	kl := dpoly{
		{0, 0, 1}: expr.RFRat(half),
		{1, 0, 0}: expr.RFRat(new(big.Rat).Neg(half)),
		{0, 1, 0}: expr.RFRat(new(big.Rat).Neg(half)),
		{}:        m2[2].Sub(m2[0]).Sub(m2[1]).Scale(half),
	}
	n := dpoly{{}: one}
	n = n.mul(k2.pow(num.K2)).mul(l2.pow(num.L2)).mul(kl.pow(num.KL))
	res := expr.Zero()
	for _, e := range n.sorted() {
		j, jinfo, err := twoLoopScalar([3]int{pow[0] - e[0], pow[1] - e[1], pow[2] - e[2]}, m2)
		if err != nil {
			return expr.Expr{}, info, err
		}
		mergeInfo(&info, jinfo)
		res = res.Add(j.Scale(n[e]))
	}
	return res, info, nil
}

// twoLoopScalar returns J(b; m2) through the cache of its canonical form.
func twoLoopScalar(b [3]int, m2 [3]expr.RatFunc) (expr.Expr, Info, error) {
	b, m2 = canonical(b, m2)
	r := reducerFor(m2, 0)
	r.mu.Lock()
	defer r.mu.Unlock()
	return r.integral(b)
}

// canonical permutes the lines (the vacuum sunset is symmetric under any permutation of its
// lines together with their masses) so that the masses are sorted and, among equal masses, the
// powers descend.
func canonical(b [3]int, m2 [3]expr.RatFunc) ([3]int, [3]expr.RatFunc) {
	idx := []int{0, 1, 2}
	slices.SortStableFunc(idx, func(i, j int) int {
		if c := strings.Compare(m2[i].String(), m2[j].String()); c != 0 {
			return c
		}
		return b[j] - b[i]
	})
	var cb [3]int
	var cm [3]expr.RatFunc
	for k, i := range idx {
		cb[k], cm[k] = b[i], m2[i]
	}
	return cb, cm
}

func sortMasses(m [3]expr.RatFunc) [3]expr.RatFunc {
	s := m[:]
	s = slices.Clone(s)
	slices.SortStableFunc(s, func(a, b expr.RatFunc) int { return strings.Compare(a.String(), b.String()) })
	return [3]expr.RatFunc{s[0], s[1], s[2]}
}

// The reducers, one per canonical mass set and reduction path, hold the cached reductions.
var (
	reducersMu sync.Mutex
	reducers   = map[string]*reducer{}
)

// maxReducers bounds the number of cached mass sets; beyond it the cache starts afresh.
const maxReducers = 4096

func reducerFor(m2 [3]expr.RatFunc, path int) *reducer {
	key := fmt.Sprintf("%d|%s|%s|%s", path, m2[0], m2[1], m2[2])
	reducersMu.Lock()
	defer reducersMu.Unlock()
	if r, ok := reducers[key]; ok {
		return r
	}
	if len(reducers) >= maxReducers {
		reducers = map[string]*reducer{}
	}
	r := newReducer(m2, path)
	reducers[key] = r
	return r
}

// factorised returns J(c) for powers with c[2] ≤ 0 (after the caller's permutation): the third
// line is a numerator ((k+l)² − m3²)^n, n = −c[2], and the integral factorises into one-loop
// integrals over k and l. With (k+l)² − m3² = k² + l² + 2k·l − m3² expanded multinomially, odd
// powers of k·l vanish and (k·l)^{2j} averages to (k²)^j (l²)^j (2j−1)!!/(d(d+2)⋯(d+2j−2)) over
// the directions (common practice, no source: the angular average of (k̂·l̂)^{2j} in d dimensions).
func factorised(c [3]int, m2 [3]expr.RatFunc) (expr.Expr, Info, error) {
	var info Info
	n := -c[2]
	d := expr.RFVar(expr.DimSymbol)
	res := expr.Zero()
	// multinomial n!/(p! q! r! s!) (k²)^p (l²)^q (2k·l)^r (−m3²)^s
	fact := func(k int) *big.Int { return new(big.Int).MulRange(1, int64(max(k, 1))) }
	for r := 0; r <= n; r += 2 {
		j := r / 2
		// angular average (2j−1)!!/(d(d+2)⋯(d+2j−2)) times 2^r
		avg := expr.RFInt(1)
		for i := 0; i < j; i++ {
			num := expr.RFInt(int64(2*i + 1))
			den := d.Add(expr.RFInt(int64(2 * i)))
			q, err := num.Div(den)
			if err != nil {
				return expr.Expr{}, info, err
			}
			avg = avg.Mul(q)
		}
		avg = avg.Scale(new(big.Rat).SetInt(new(big.Int).Lsh(big.NewInt(1), uint(r))))
		for p := 0; p+r <= n; p++ {
			for q := 0; p+q+r <= n; q++ {
				s := n - p - q - r
				mult := new(big.Int).Set(fact(n))
				mult.Quo(mult, fact(p))
				mult.Quo(mult, fact(q))
				mult.Quo(mult, fact(r))
				mult.Quo(mult, fact(s))
				ms, err := m2[2].Neg().Pow(s)
				if err != nil {
					return expr.Expr{}, info, err
				}
				coef := avg.Mul(ms).Scale(new(big.Rat).SetInt(mult))
				if coef.IsZero() {
					continue
				}
				ik, iinfo, err := Loop1(p+j, []Line{{M2: m2[0], Pow: c[0]}})
				if err != nil {
					return expr.Expr{}, info, err
				}
				mergeInfo(&info, iinfo)
				if ik.IsZero() {
					continue
				}
				il, iinfo, err := Loop1(q+j, []Line{{M2: m2[1], Pow: c[1]}})
				if err != nil {
					return expr.Expr{}, info, err
				}
				mergeInfo(&info, iinfo)
				prod, err := ik.Mul(il)
				if err != nil {
					return expr.Expr{}, info, err
				}
				res = res.Add(prod.Scale(coef))
			}
		}
	}
	return res, info, nil
}

// dpoly is a polynomial in D1, D2, D3 (exponents as keys) with rational-function coefficients.
type dpoly map[[3]int]expr.RatFunc

func (p dpoly) mul(q dpoly) dpoly {
	out := dpoly{}
	for e, c := range p {
		for f, g := range q {
			k := [3]int{e[0] + f[0], e[1] + f[1], e[2] + f[2]}
			if old, ok := out[k]; ok {
				out[k] = old.Add(c.Mul(g))
			} else {
				out[k] = c.Mul(g)
			}
		}
	}
	for k, c := range out {
		if c.IsZero() {
			delete(out, k)
		}
	}
	return out
}

func (p dpoly) pow(n int) dpoly {
	out := dpoly{{}: expr.RFInt(1)}
	for range n {
		out = out.mul(p)
	}
	return out
}

// sorted returns the exponents in a fixed order, so that sums are built deterministically.
func (p dpoly) sorted() [][3]int {
	keys := make([][3]int, 0, len(p))
	for k := range p {
		keys = append(keys, k)
	}
	slices.SortFunc(keys, func(a, b [3]int) int {
		for i := range 3 {
			if a[i] != b[i] {
				return a[i] - b[i]
			}
		}
		return 0
	})
	return keys
}

// mergeInfo adds the entries of src that dst does not have yet (the recursion meets the same
// scaleless integrals many times).
func mergeInfo(dst *Info, src Info) {
	for _, s := range src.Scaleless {
		if !slices.Contains(dst.Scaleless, s) {
			dst.Scaleless = append(dst.Scaleless, s)
		}
	}
}
