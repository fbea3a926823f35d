package pv

import (
	"errors"
	"fmt"
	"math/big"
	"strings"
	"sync"

	"loopmatch/expr"
)

// ErrZeroGram reports an integral whose momenta have a vanishing Gram determinant (zero or
// collinear external momenta), where the Passarino–Veltman recursion would divide by zero.
var ErrZeroGram = errors.New("vanishing Gram determinant")

// Reducer computes the tensor coefficients of one N-point function. It memoises every
// coefficient of the function and of its sub-integrals, so that asking for many coefficients
// of the same kinematics costs little more than asking for the hardest one. A Reducer is safe
// for concurrent use.
type Reducer struct {
	kin    *Kinematics
	mu     sync.Mutex
	memo   map[memoKey]comb
	frames map[uint8]*frame
	atoms  map[uint8]atomEntry
	fs     *factorSet
}

// memoKey identifies a coefficient of the sub-integral with the propagators in mask, in that
// sub-integral's own momentum basis.
type memoKey struct {
	mask uint8
	l    label
}

// frame is a sub-integral (or the whole integral) seen in its own basis: its propagators
// labels (increasing), the reference propagator labels[0] whose denominator is q² − m0², and
// the momenta p_a = P_{labels[a]} − P_{labels[0]}, a = 1 … n.
type frame struct {
	mask    uint8
	labels  []int
	n       int
	m0      expr.RatFunc
	twoM0   mult     // 2 m0²
	f       []mult   // f_a = p_a² − m_a² + m0², a = 1 … n (index a−1)
	zinv    [][]mult // inverse of Z_ab = 2 p_a·p_b when it exists
	rowSum  []mult   // −Σ_b (Z⁻¹)_ab
	rowF    []mult   // −Σ_b (Z⁻¹)_ab f_b
	zeroP   bool     // n = 1 and p1² = 0: the closed form of zeromom.go applies
	gramErr error    // set when n ≥ 2 and det Z = 0
}

// NewReducer returns a reducer for the kinematics k.
func NewReducer(k *Kinematics) *Reducer {
	return &Reducer{kin: k, memo: map[memoKey]comb{}, frames: map[uint8]*frame{}, atoms: map[uint8]atomEntry{}, fs: newFactorSet()}
}

// Kinematics returns the kinematics the reducer works on.
func (r *Reducer) Kinematics() *Kinematics { return r.kin }

// Coefficient returns the tensor coefficient T^N_idx (see the package comment; idx lists the
// indices, 0 in pairs for the metric, 1 … N−1 for the momenta, in any order) as a combination
// of scalar-integral atoms with coefficients rational in d. It fails with an error wrapping
// ErrZeroGram when the reduction meets a vanishing Gram determinant of three or four
// propagators, and with an error wrapping expr.ErrTooLarge when the coefficients outgrow
// MaxCoefTerms.
func (r *Reducer) Coefficient(idx []int) (expr.Expr, error) {
	l, err := parseIndex(r.kin.n, idx)
	if err != nil {
		return expr.Expr{}, err
	}
	r.mu.Lock()
	defer r.mu.Unlock()
	top := uint8(1<<r.kin.n - 1)
	var c comb
	if fr := r.frameOf(top); l.rank() > 0 && fr.gramErr != nil {
		err = fr.gramErr // every tensor coefficient needs the function's own Gram inverse
	} else {
		c, err = r.coef(top, l)
	}
	if err != nil {
		return expr.Expr{}, fmt.Errorf("pv: %s: %w", Name(r.kin.n, idx), err)
	}
	return r.toExpr(c)
}

// Coefficient returns the tensor coefficient T^N_idx of the kinematics k (see
// Reducer.Coefficient); use a Reducer to share work between coefficients.
func Coefficient(k *Kinematics, idx []int) (expr.Expr, error) {
	return NewReducer(k).Coefficient(idx)
}

// frameOf returns the frame of the sub-integral mask, building it once.
func (r *Reducer) frameOf(mask uint8) *frame {
	if fr, ok := r.frames[mask]; ok {
		return fr
	}
	k := r.kin
	labels := labelsOf(mask)
	fr := &frame{mask: mask, labels: labels, n: len(labels) - 1, m0: k.m2[labels[0]]}
	fs := r.fs
	fr.twoM0 = fs.fromRat(fr.m0.Scale(bigTwo))
	for a := 1; a <= fr.n; a++ {
		la := labels[a]
		fr.f = append(fr.f, fs.fromRat(k.s[labels[0]][la].Sub(k.m2[la]).Add(fr.m0)))
	}
	if fr.n >= 1 {
		z := gramOf(k, labels)
		dt := det(z)
		switch {
		case fr.n == 1 && dt.IsZero():
			fr.zeroP = true
		case dt.IsZero():
			fr.gramErr = fmt.Errorf("%w of %s: its external momenta are zero or collinear, so the Passarino–Veltman recursion does not apply; use the vacuum path or a reduction without inverse Gram determinants", ErrZeroGram, k.describe(mask))
		default:
			// Z⁻¹ = adj(Z)/det Z with the determinant registered as a denominator factor.
			adj := adjugate(z)
			dm := fs.fromRat(dt)
			c, d := fs.split(dm.num) // det Z = c·Π(factors d)/dm.den
			detInv := mult{num: fs.poly(dm.den).Scale(new(big.Rat).Inv(c)), den: d}
			for a := range fr.n {
				var row []mult
				var sum, sumF mult
				for b := range fr.n {
					x := mulMult(fs.fromRat(adj[a][b]), detInv)
					row = append(row, x)
					sum = fs.addMult(sum, x)
					sumF = fs.addMult(sumF, mulMult(x, fr.f[b]))
				}
				fr.zinv = append(fr.zinv, row)
				fr.rowSum = append(fr.rowSum, mult{num: sum.num.Neg(), den: sum.den})
				fr.rowF = append(fr.rowF, mult{num: sumF.num.Neg(), den: sumF.den})
			}
		}
	}
	r.frames[mask] = fr
	return fr
}

// describe names the (sub-)integral mask with its kinematics.
func (k *Kinematics) describe(mask uint8) string {
	labels := labelsOf(mask)
	n := len(labels)
	var sb strings.Builder
	if n == k.n {
		fmt.Fprintf(&sb, "the %d-point function %c0(", n, "ABCD"[n-1])
	} else {
		fmt.Fprintf(&sb, "the %d-point sub-integral %c0 with propagators %v of the %d-point function (", n, "ABCD"[n-1], labels, k.n)
	}
	names := [...][]string{
		2: {"p1²"},
		3: {"p1²", "(p2−p1)²", "p2²"},
		4: {"p1²", "(p2−p1)²", "(p3−p2)²", "p3²", "p2²", "(p3−p1)²"},
	}[n]
	for i, p := range invariantPairs[n] {
		if i > 0 {
			sb.WriteString(", ")
		}
		fmt.Fprintf(&sb, "%s = %s", names[i], k.s[labels[p[0]]][labels[p[1]]])
	}
	sb.WriteString("; ")
	for i, l := range labels {
		if i > 0 {
			sb.WriteString(", ")
		}
		fmt.Fprintf(&sb, "m%d² = %s", i, k.m2[l])
	}
	sb.WriteString(")")
	return sb.String()
}

// coef returns the coefficient l of the sub-integral mask in its own basis (memoised).
func (r *Reducer) coef(mask uint8, l label) (comb, error) {
	key := memoKey{mask, l}
	if c, ok := r.memo[key]; ok {
		return c, nil
	}
	fr := r.frameOf(mask)
	var c comb
	var err error
	switch {
	case fr.zeroP:
		c = r.zeroMomentum(fr, l)
	case l.rank() == 0:
		if fr.n > 0 || !fr.m0.IsZero() { // a massless tadpole is scaleless: zero
			c = unit(mask)
		}
	case l.j > 0:
		c, err = r.metricStep(fr, l)
	default:
		if fr.gramErr != nil {
			return comb{}, fr.gramErr
		}
		c, err = r.gramStep(fr, l)
	}
	if err != nil {
		return comb{}, err
	}
	c = r.fs.tidy(c)
	if err := r.kin.checkSize(c, mask); err != nil {
		return comb{}, err
	}
	r.memo[key] = c
	return c, nil
}

// metricStep computes a coefficient with j ≥ 1 pairs of 0 from the contraction of the tensor
// integral with the metric, q² = N0 + m0² (docs/PASSARINO.md, eq. (M)):
//
//	2(d + P − N − 1) T_{00 α} = 2 m0² T_α + S_α + Σ_k f_k T_{α+k},
//
// where α stands for the remaining indices (j − 1 pairs and the momenta), P is the rank and S
// the sub-integral without N0 in this frame's basis. (The contraction alone gives
// 2S_α − Σ_k [K^(k)_{α+k} − S_{α+k}] in place of S_α; K^(k) has no component along p_k, and
// the shift invariance of S gives Σ_k S_{α+k} = −S_α.)
func (r *Reducer) metricStep(fr *frame, l label) (comb, error) {
	p := l.rank()
	lo := l
	lo.j--
	s, err := r.cancelRef(fr, lo)
	if err != nil {
		return comb{}, err
	}
	t, err := r.coef(fr.mask, lo)
	if err != nil {
		return comb{}, err
	}
	fs := r.fs
	c := fs.add(fs.add(comb{}, s, constMult(1, 1)), t, fr.twoM0)
	for k := 1; k <= fr.n; k++ {
		up := lo
		up.a[k-1]++
		tk, err := r.coef(fr.mask, up)
		if err != nil {
			return comb{}, err
		}
		c = fs.add(c, tk, fr.f[k-1])
	}
	// 1/(2(d + P − N − 1)) with N = n + 1
	lin := expr.PolyVar(expr.DimSymbol).Add(expr.PolyInt(int64(p - fr.n - 2)))
	id, _ := fs.register(lin) // monic: content 1
	return fs.scale(c, mult{num: expr.PolyConst(big.NewRat(1, 2)), den: denom{{id, 1}}}), nil
}

// gramStep computes a coefficient without 0s from the contraction with the momenta
// (docs/PASSARINO.md, eq. (G)): with h the highest index in α and β = α − h,
//
//	T_α = Σ_k (Z⁻¹)_hk [K^(k)_β − S_β − f_k T_β − 2 β_k T_{00 β−k}].
func (r *Reducer) gramStep(fr *frame, l label) (comb, error) {
	h := -1
	for a := fr.n; a >= 1; a-- {
		if l.a[a-1] > 0 {
			h = a
			break
		}
	}
	if h < 0 {
		return comb{}, fmt.Errorf("internal error: index %v has no momentum", l)
	}
	beta := l
	beta.a[h-1]--
	s, err := r.cancelRef(fr, beta)
	if err != nil {
		return comb{}, err
	}
	t, err := r.coef(fr.mask, beta)
	if err != nil {
		return comb{}, err
	}
	// −Σ_k (Z⁻¹)_hk and −Σ_k (Z⁻¹)_hk f_k multiply S_β and T_β once.
	fs := r.fs
	c := fs.add(fs.add(comb{}, s, fr.rowSum[h-1]), t, fr.rowF[h-1])
	for k := 1; k <= fr.n; k++ {
		z := fr.zinv[h-1][k-1]
		if z.num.IsZero() {
			continue
		}
		kk, err := r.cancelK(fr, k, beta)
		if err != nil {
			return comb{}, err
		}
		c = fs.add(c, kk, z)
		if b := beta.a[k-1]; b > 0 {
			up := beta
			up.a[k-1]--
			up.j++
			t00, err := r.coef(fr.mask, up)
			if err != nil {
				return comb{}, err
			}
			c = fs.add(c, t00, mult{num: z.num.Scale(big.NewRat(int64(-2*b), 1)), den: z.den})
		}
	}
	return c, nil
}

// cancelK returns the coefficient l (rank P, this frame's basis) of the tensor integral with
// the denominator N_k (k = 1 … n) cancelled. The loop momentum stays, so the sub-integral's
// momenta are this frame's without p_k: its coefficients carry over and those with an index k
// vanish.
func (r *Reducer) cancelK(fr *frame, k int, l label) (comb, error) {
	if l.a[k-1] > 0 {
		return comb{}, nil
	}
	var sub label
	sub.j = l.j
	b := 0
	for a := 1; a <= fr.n; a++ {
		if a == k {
			continue
		}
		sub.a[b] = l.a[a-1]
		b++
	}
	return r.coef(fr.mask&^(1<<fr.labels[k]), sub)
}

// cancelRef returns the coefficient l (this frame's basis) of the tensor integral with the
// denominator N0 cancelled. That integral has the propagators labels[1:], so its own loop
// momentum is q' = q + p_1 and its momenta are p'_b = p_{b+1} − p_1; expanding q = q' − p_1
// and p'_b in this frame's basis gives (docs/PASSARINO.md, eq. (S))
//
//	S_{0…0 γ} = (−1)^{γ1} Σ_{t+|δ|=γ1} γ1!/(t! δ!) Sub_{0…0, γ_{≥2}+δ}.
func (r *Reducer) cancelRef(fr *frame, l label) (comb, error) {
	if fr.n == 0 {
		return comb{}, nil // no propagator left: a scaleless integral
	}
	subMask := fr.mask &^ (1 << fr.labels[0])
	g1 := l.a[0]
	var out comb
	m := fr.n - 1 // momenta of the sub-integral
	var err error
	// enumerate δ ∈ N^m with |δ| ≤ g1; t = g1 − |δ|
	var rec func(b, left int, delta [MaxPoints - 1]int)
	rec = func(b, left int, delta [MaxPoints - 1]int) {
		if err != nil {
			return
		}
		if b == m {
			t := left
			var sub label
			sub.j = l.j
			w := factorial(g1) / factorial(t)
			for i := range m {
				sub.a[i] = l.a[i+1] + delta[i]
				w /= factorial(delta[i])
			}
			if g1%2 == 1 {
				w = -w
			}
			var c comb
			c, err = r.coef(subMask, sub)
			out = r.fs.add(out, c, constMult(w, 1))
			return
		}
		for x := 0; x <= left; x++ {
			delta[b] = x
			rec(b+1, left-x, delta)
		}
	}
	rec(0, g1, [MaxPoints - 1]int{})
	return out, err
}
