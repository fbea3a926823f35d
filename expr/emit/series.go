package emit

import (
	"fmt"
	"math"
	"math/big"

	"loopmatch/expr"
)

// This file builds the series branches: the exact expansion, the number of terms from the
// estimated tail, and the float64 program of the truncated series.

// seriesAround builds the branch around x0 covering |w| < r.
func (fn *function) seriesAround(x string, x0 *big.Rat, r float64, ss []sample, prec uint) (*branch, error) {
	const wSym = "·w"
	// x = x0 (1 + w)/(1 − w)
	num := expr.PolyConst(x0).Add(expr.PolyVar(wSym).Scale(x0))
	den := expr.PolyInt(1).Sub(expr.PolyVar(wSym))
	sub, err := expr.NewRatFunc(num, den)
	if err != nil {
		return nil, err
	}
	ew, err := fn.expr.Subst(x, sub)
	if err != nil {
		return nil, err
	}
	xf, _ := x0.Float64()
	b := &branch{kind: around, at: x0, lo: xf * (1 - r) / (1 + r), hi: xf * (1 + r) / (1 - r)}
	in := func(s sample) bool { return s.x > b.lo && s.x < b.hi }
	wOf := func(xv float64) *big.Float {
		xb := new(big.Float).SetPrec(prec).SetFloat64(xv)
		x0b := new(big.Float).SetPrec(prec).SetRat(x0)
		n := new(big.Float).SetPrec(prec).Sub(xb, x0b)
		return n.Quo(n, new(big.Float).SetPrec(prec).Add(xb, x0b))
	}
	err = fn.fitSeries(b, ew, wSym, nil, ss, in, wOf, prec)
	return b, err
}

// seriesAtEnd builds the branch at x → 0 (used below edge) or x → ∞ (used above edge).
func (fn *function) seriesAtEnd(x string, kind branchKind, edge float64, ss []sample, prec uint) (*branch, error) {
	b := &branch{kind: kind}
	var in func(sample) bool
	var varOf func(float64) *big.Float
	if kind == atZero {
		b.lo, b.hi = math.Inf(-1), edge
		in = func(s sample) bool { return s.x < edge }
		varOf = func(xv float64) *big.Float { return new(big.Float).SetPrec(prec).SetFloat64(xv) }
	} else {
		b.lo, b.hi = edge, math.Inf(1)
		in = func(s sample) bool { return s.x > edge }
		varOf = func(xv float64) *big.Float {
			return new(big.Float).SetPrec(prec).Quo(big.NewFloat(1), new(big.Float).SetPrec(prec).SetFloat64(xv))
		}
	}
	return b, fn.fitSeries(b, fn.expr, x, &kind, ss, in, varOf, prec)
}

// seriesOrders are the orders tried for the exact coefficients.
var seriesOrders = []int{24, 48, 80}

// fitSeries expands e in the variable v (around 0 for an interior branch in w, or at an end)
// and keeps the fewest terms whose estimated error meets the target on the samples in the
// branch.
func (fn *function) fitSeries(b *branch, e expr.Expr, v string, end *branchKind, ss []sample, in func(sample) bool, varOf func(float64) *big.Float, prec uint) error {
	var pts []sample
	for _, s := range ss {
		if in(s) {
			pts = append(pts, s)
		}
	}
	x := fn.vars[0]
	var lastErr error
	for _, order := range seriesOrders {
		var s expr.Taylor
		var err error
		switch {
		case end == nil:
			s, err = expr.TaylorAt(e, v, new(big.Rat), order)
		case *end == atZero:
			s, err = expr.TaylorAt(e, v, new(big.Rat), order)
		default:
			s, err = expr.TaylorAtInfinity(e, v, order)
		}
		if err != nil {
			return err
		}
		coef, err := logCoefficients(s, x, prec)
		if err != nil {
			return err
		}
		b.low = s.Low
		b.coef = coef
		// The tail beyond order, and the sum of the omitted known terms, at each sample.
		n, tas, ok := chooseTerms(b, pts, varOf, prec)
		if !ok {
			lastErr = fmt.Errorf("the series does not reach the target with %d terms", order)
			continue
		}
		b.terms = n
		b.body = seriesBody(b, x, prec)
		b.worst = 0
		for i, p := range pts {
			xb := new(big.Float).SetPrec(evalPrec).SetFloat64(p.x)
			r := b.body.bound([]*big.Float{xb}, evalPrec)
			sd, _ := r.s2.Float64()
			est := 3*math.Sqrt(sd) + tas[i].tail(b.low, n)
			b.worst = math.Max(b.worst, est/(2*p.target))
		}
		return nil
	}
	return lastErr
}

// logCoefficients evaluates the coefficients of a series, grouped by powers of log(x):
// out[j][n−Low] is the coefficient of log(x)^j·v^n.
func logCoefficients(s expr.Taylor, x string, prec uint) ([][]*big.Float, error) {
	logx := expr.NewFn(expr.FnLog, 1, expr.Sym(x))
	isLog := func(a expr.Atom) bool { return a.Key() == logx.Key() }
	var out [][]*big.Float
	for i, c := range s.Coef {
		for _, g := range c.Collect(isLog) {
			j := 0
			for _, a := range g.Atoms {
				if a.Pow < 0 {
					return nil, fmt.Errorf("a series coefficient has log(%s) in a denominator", x)
				}
				j = a.Pow
			}
			for len(out) <= j {
				out = append(out, make([]*big.Float, len(s.Coef)))
			}
			v, err := g.Coef.EvalBig(nil, prec)
			if err != nil {
				return nil, fmt.Errorf("series coefficient: %v", err)
			}
			if v.Im.Sign() != 0 {
				return nil, fmt.Errorf("a series coefficient is complex: %s", c)
			}
			out[j][i] = v.Re
		}
	}
	for j := range out {
		for i := range out[j] {
			if out[j][i] == nil {
				out[j][i] = new(big.Float).SetPrec(prec)
			}
		}
	}
	if len(out) == 0 {
		out = [][]*big.Float{make([]*big.Float, len(s.Coef))}
		for i := range out[0] {
			out[0][i] = new(big.Float).SetPrec(prec)
		}
	}
	return out, nil
}

func logOf(xv float64, prec uint) *big.Float {
	return bigLog(new(big.Float).SetPrec(prec).SetFloat64(xv), prec)
}

// coefMags returns |c_n(L)| for every stored coefficient at log x = L (L unused without logs).
func coefMags(b *branch, L *big.Float, prec uint) []float64 {
	out := make([]float64, len(b.coef[0]))
	for i := range out {
		if len(b.coef) == 1 {
			out[i], _ = b.coef[0][i].Float64()
			out[i] = math.Abs(out[i])
			continue
		}
		acc := new(big.Float).SetPrec(prec)
		for j := len(b.coef) - 1; j >= 0; j-- {
			acc.Mul(acc, L)
			acc.Add(acc, b.coef[j][i])
		}
		out[i], _ = acc.Float64()
		out[i] = math.Abs(out[i])
	}
	return out
}

// tailAt holds what the tail estimate needs at one point.
type tailAt struct {
	v    float64   // |series variable|
	mags []float64 // |c_n(log x)|
}

// tail estimates |Σ_{n ≥ low+terms} c_n v^n|: the known omitted terms in absolute value plus a
// geometric continuation beyond the last known coefficient, with the ratio taken from the root
// test on the last eight coefficients.
func (ta tailAt) tail(low, terms int) float64 {
	total := len(ta.mags)
	sum := 0.0
	for i := terms; i < total; i++ {
		sum += ta.mags[i] * math.Pow(ta.v, float64(low+i))
	}
	rho := 0.0
	for i := max(total-8, 0); i < total; i++ {
		if n := low + i; n > 0 && ta.mags[i] > 0 {
			rho = math.Max(rho, math.Pow(ta.mags[i], 1/float64(n)))
		}
	}
	if rho == 0 {
		return sum
	}
	cmax := 0.0
	for i := max(total-8, 0); i < total; i++ {
		cmax = math.Max(cmax, ta.mags[i]/math.Pow(rho, float64(low+i)))
	}
	q := rho * ta.v
	if q >= 1 {
		return math.Inf(1)
	}
	return sum + cmax*math.Pow(q, float64(low+total))/(1-q)
}

// chooseTerms returns the fewest terms whose tail stays below a quarter of the target at every
// point (the rounding error gets the other quarter of the half that the analysis aims at), and
// the tail data of the points.
func chooseTerms(b *branch, pts []sample, varOf func(float64) *big.Float, prec uint) (int, []tailAt, bool) {
	total := len(b.coef[0])
	tas := make([]tailAt, len(pts))
	for i, p := range pts {
		v, _ := varOf(p.x).Float64()
		var L *big.Float
		if len(b.coef) > 1 {
			L = logOf(p.x, prec)
		}
		tas[i] = tailAt{v: math.Abs(v), mags: coefMags(b, L, prec)}
	}
	okAt := func(terms int) bool {
		for i, p := range pts {
			if tas[i].tail(b.low, terms) > p.target/2 {
				return false
			}
		}
		return true
	}
	if !okAt(total) {
		return 0, nil, false
	}
	lo, hi := 1, total
	for lo < hi {
		mid := (lo + hi) / 2
		if okAt(mid) {
			hi = mid
		} else {
			lo = mid + 1
		}
	}
	return lo, tas, true
}

// seriesBody writes the float64 program of a branch: the series variable, its powers v^(2^k)
// as locals, each polynomial in Estrin's scheme (pairs c_i + c_{i+1}v, then pairs of pairs with
// v², …, which has a short dependency chain; its rounding error obeys the same bound as Horner's
// rule, Higham 2002 §5.1), and the powers of log x by Horner's rule.
func seriesBody(b *branch, x string, prec uint) *body {
	bl := newBuilder([]string{x}, prec)
	xv := arg(0)
	var v *node
	switch b.kind {
	case around:
		x0 := constRat(b.at, prec)
		v = bl.b.add(bl.name("w"), div(sub(xv, x0), add(xv, x0)))
	case atZero:
		v = xv
	case atInf:
		v = bl.b.add(bl.name("t"), div(constInt(1, prec), xv))
	}
	var L *node
	if len(b.coef) > 1 {
		L = bl.b.add(bl.name("log"+x), call(opLog, xv))
	}
	pows := map[int]*node{1: v}
	pow := func(m int) *node {
		if p, ok := pows[m]; ok {
			return p
		}
		for k := 2; k <= m; k *= 2 {
			if _, ok := pows[k]; !ok {
				pows[k] = bl.b.add(bl.name(fmt.Sprintf("%s%d", bl.b.nameOf(v, x), k)), mul(pows[k/2], pows[k/2]))
			}
		}
		return pows[m]
	}
	var estrin func(c []*big.Float) *node
	estrin = func(c []*big.Float) *node {
		allZero := true
		for _, x := range c {
			if x.Sign() != 0 {
				allZero = false
			}
		}
		if allZero {
			return nil
		}
		if len(c) == 1 {
			return constBig(c[0])
		}
		m := 1
		for 2*m < len(c) {
			m *= 2
		}
		lo, hi := estrin(c[:m]), estrin(c[m:])
		switch {
		case hi == nil:
			return lo
		case lo == nil:
			return mul(pow(m), hi)
		}
		return add(lo, mul(pow(m), hi))
	}
	var res *node
	for j := len(b.coef) - 1; j >= 0; j-- {
		p := estrin(b.coef[j][:b.terms])
		switch {
		case res == nil && p == nil:
		case res == nil:
			res = p
		case p == nil:
			res = mul(res, L)
		default:
			res = add(mul(res, L), p)
		}
	}
	if res == nil {
		res = constInt(0, prec)
	}
	// the leading power v^low
	switch {
	case b.low > 0:
		res = mul(res, powN(bl, v, b.low))
	case b.low < 0 && b.kind == atInf:
		res = mul(res, powN(bl, xv, -b.low))
	case b.low < 0:
		res = div(res, powN(bl, v, -b.low))
	}
	bl.b.result = res
	bl.b.prune()
	return &bl.b
}

func powN(bl *builder, v *node, n int) *node {
	ks := make([]*node, n)
	for i := range ks {
		ks[i] = v
	}
	return mul(ks...)
}

// nameOf returns the printed name of a local or argument node.
func (b *body) nameOf(n *node, argName string) string {
	if n.op == opLocal {
		return b.locals[n.idx].name
	}
	return argName
}
