package emit

import (
	"errors"
	"fmt"
	"math"
	"math/big"
	"slices"
	"sort"

	"loopmatch/expr"
)

// This file makes a function of one positive variable x numerically stable in float64. The
// closed form is kept where its rounding error is small; elsewhere a series branch takes over:
//
//   - around a removable singularity x0 > 0 (a zero of a denominator where the function stays
//     finite), a Taylor series in w = (x − x0)/(x + x0), which maps x ∈ (0, ∞) onto
//     w ∈ (−1, 1) and so converges up to the singularities at x = 0 and x = ∞ instead of the
//     nearer one of |x − x0| < x0;
//   - at x → 0 a series in x, and at x → ∞ one in t = 1/x, with coefficients polynomial in
//     log x, when the closed form loses digits there.
//
// Where a branch is needed, and how many terms it takes, follows from an error estimate
// evaluated in high precision on a grid of points: three standard deviations of the rounding
// error of the float64 program in the model of independent roundings (ir.go), plus, for a
// series, the size of its tail estimated from the exact coefficients. The estimate must stay
// below half the target of Tolerance.

// Tolerance is the accuracy the emitted functions aim at: an absolute error below
// Rel·|f(x)| + Abs·M(x), where M(x) is the largest |f| within a factor 10 of x. The second part
// matters only near the zeros of f, where a relative accuracy is not attainable.
var Tolerance = struct{ Rel, Abs float64 }{1e-13, 1e-15}

// Domain is the range of the main variable the analysis checks: the branches make the
// functions accurate within it (and the emitted tests check it).
var Domain = struct{ Lo, Hi float64 }{1e-10, 1e10}

// branchKind says where a series branch is used.
type branchKind uint8

const (
	around branchKind = iota // lo < x < hi, series in w = (x − x0)/(x + x0)
	atZero                   // x < hi, series in x with powers of log x
	atInf                    // x > lo, series in t = 1/x with powers of log x
)

// branch is a series evaluation used on an interval of x.
type branch struct {
	kind   branchKind
	at     *big.Rat // around: the point x0
	lo, hi float64  // used for lo < x < hi (atZero: x < hi; atInf: x > lo)
	low    int      // power of the first coefficient
	coef   [][]*big.Float
	terms  int     // number of powers of the series variable kept
	body   *body   // the float64 program, argument x
	worst  float64 // largest estimate/target on the branch's grid points
}

// function is a stable float64 program for a function of one variable.
type function struct {
	vars     []string
	expr     expr.Expr
	naive    *body
	branches []*branch
	zeros    []float64  // zeros of f inside the domain
	special  []*big.Rat // removable singularities
	poles    []*big.Rat // points inside the domain where f diverges
	notes    []string
	worst    float64 // largest estimate/target over the grid
	pole     int     // highest multiplicity of a denominator factor
}

// eval evaluates f in float64.
func (f *function) eval(args []float64) float64 {
	if len(f.branches) > 0 {
		x := args[0]
		for _, b := range f.branches {
			if x > b.lo && x < b.hi {
				return b.body.eval(args)
			}
		}
	}
	return f.naive.eval(args)
}

// sample is one grid point of the analysis.
type sample struct {
	x      float64
	f      *big.Float // exact value
	est    float64    // error estimate of the closed form (3σ), +Inf where it fails
	target float64
}

// stabilise analyses e as a function of x alone.
func stabilise(e expr.Expr, x string) (*function, error) {
	prec := precFor(e)
	naive, err := closedForm(e, []string{x}, prec)
	if err != nil {
		return nil, err
	}
	fn := &function{vars: []string{x}, expr: e, naive: naive, pole: maxPole(e)}
	if e.IsZero() {
		return fn, nil
	}
	points, err := fn.interiorPoints(x)
	if err != nil {
		return nil, err
	}
	for _, p := range points {
		s, err := expr.TaylorAt(e, x, p, 1)
		switch {
		case errors.Is(err, expr.ErrTaylor):
			fn.notes = append(fn.notes, fmt.Sprintf("%s = %s: %v", x, p.RatString(), err))
			continue
		case err != nil:
			return nil, err
		}
		if s.Low < 0 {
			fn.poles = append(fn.poles, p)
			fn.notes = append(fn.notes, fmt.Sprintf("the function has a pole at %s = %s", x, p.RatString()))
			continue
		}
		fn.special = append(fn.special, p)
	}
	grid := fn.grid()
	samples := make([]sample, 0, len(grid))
	for _, xv := range grid {
		samples = append(samples, fn.sampleAt(xv, prec))
	}
	setTargets(samples)
	if err := fn.placeBranches(x, samples, prec); err != nil {
		return nil, err
	}
	fn.check(samples, prec)
	fn.zeros = findZeros(fn, samples, prec)
	return fn, nil
}

// precFor chooses the working precision: enough to evaluate the closed form at 1e-12 from a
// pole of the highest order of its terms.
func precFor(e expr.Expr) uint { return uint(160 + 48*maxPole(e)) }

// evalPrec is the precision of error estimates where no cancellation is expected.
const evalPrec = 128

// pointPrec is the precision that evaluates the closed form at x with about 100 good bits: the
// terms near a pole of order k at x0 are larger than the function by up to |x/(x − x0)|^k.
func (fn *function) pointPrec(xv float64, prec uint) uint {
	lost := 0.0
	for _, p := range slices.Concat(fn.special, fn.poles) {
		x0, _ := p.Float64()
		if d := math.Abs(xv-x0) / x0; d < 1 {
			lost = math.Max(lost, float64(fn.pole)*math.Log2(1/d))
		}
	}
	return min(prec, uint(128+lost))
}

func (fn *function) sampleAt(xv float64, prec uint) sample {
	prec = fn.pointPrec(xv, prec)
	xb := new(big.Float).SetPrec(prec).SetFloat64(xv)
	r := fn.naive.bound([]*big.Float{xb}, prec)
	s := sample{x: xv, f: r.v, est: math.Inf(1)}
	if !r.e.IsInf() {
		sd, _ := r.s2.Float64()
		s.est = 3 * math.Sqrt(sd)
	}
	return s
}

// setTargets fills in the target of every sample: half of Tolerance, with M(x) from the
// samples within a factor 10.
func setTargets(ss []sample) {
	af := make([]float64, len(ss))
	for i, s := range ss {
		if !math.IsInf(s.est, 1) {
			f, _ := s.f.Float64()
			af[i] = math.Abs(f)
		}
	}
	// ss is sorted by x: slide a window [x/10, 10x].
	lo, hi := 0, 0
	for i := range ss {
		for lo < i && ss[lo].x < ss[i].x/10 {
			lo++
		}
		for hi < len(ss) && ss[hi].x <= ss[i].x*10 {
			hi++
		}
		m := 0.0
		for j := lo; j < hi; j++ {
			m = math.Max(m, af[j])
		}
		fi, _ := ss[i].f.Float64()
		ss[i].target = 0.5 * (Tolerance.Rel*math.Abs(fi) + Tolerance.Abs*m)
	}
}

// interiorPoints returns the rational zeros in (0, ∞) of the denominators of e.
func (fn *function) interiorPoints(x string) ([]*big.Rat, error) {
	seen := map[string]bool{}
	var out []*big.Rat
	for _, t := range fn.expr.Terms() {
		_, fs := expr.SquareFree(t.Coef.Den())
		for _, f := range fs {
			roots, irrational := positiveRoots(f.P, x)
			for _, r := range roots {
				if !seen[r.RatString()] {
					seen[r.RatString()] = true
					out = append(out, r)
				}
			}
			for _, r := range irrational {
				fn.notes = append(fn.notes, fmt.Sprintf("the denominator factor %s vanishes at %s ≈ %.6g, not a rational number: no series branch there", f.P, x, r))
			}
		}
	}
	slices.SortFunc(out, func(a, b *big.Rat) int { return a.Cmp(b) })
	return out, nil
}

// positiveRoots returns the positive rational roots of p (a polynomial in x) and approximate
// positive roots that are not rational.
func positiveRoots(p expr.Poly, x string) ([]*big.Rat, []float64) {
	_, pp := p.PrimitiveZ()
	cs := pp.CoeffsIn(x)
	ints := make([]*big.Int, len(cs))
	for i, c := range cs {
		v, ok := c.ConstValue()
		if !ok || !v.IsInt() {
			return nil, nil
		}
		ints[i] = v.Num()
	}
	for len(ints) > 0 && ints[0].Sign() == 0 { // x = 0 is the domain's end, not inside it
		ints = ints[1:]
	}
	if len(ints) < 2 {
		return nil, nil
	}
	var roots []*big.Rat
	a0, an := ints[0], ints[len(ints)-1]
	if a0.IsInt64() && an.IsInt64() && abs64(a0.Int64()) <= 1e6 && abs64(an.Int64()) <= 1e6 {
		for _, pn := range divisors(abs64(a0.Int64())) {
			for _, qn := range divisors(abs64(an.Int64())) {
				r := big.NewRat(pn, qn)
				if evalInt(ints, r).Sign() == 0 && !slices.ContainsFunc(roots, func(s *big.Rat) bool { return s.Cmp(r) == 0 }) {
					roots = append(roots, r)
				}
			}
		}
	}
	// Sign changes of the polynomial on a grid find the other positive real roots.
	var approx []float64
	prev := math.NaN()
	for k := -400; k <= 400; k++ {
		xv := math.Pow(10, float64(k)/40)
		v, _ := evalInt(ints, new(big.Rat).SetFloat64(xv)).Float64()
		if !math.IsNaN(prev) && (v == 0 || prev*v < 0) {
			near := false
			for _, r := range roots {
				rf, _ := r.Float64()
				if math.Abs(rf-xv) < 0.2*xv {
					near = true
				}
			}
			if !near {
				approx = append(approx, xv)
			}
		}
		prev = v
	}
	return roots, approx
}

func abs64(n int64) int64 {
	if n < 0 {
		return -n
	}
	return n
}

func divisors(n int64) []int64 {
	var out []int64
	for d := int64(1); d*d <= n; d++ {
		if n%d == 0 {
			out = append(out, d)
			if d*d != n {
				out = append(out, n/d)
			}
		}
	}
	return out
}

func evalInt(cs []*big.Int, x *big.Rat) *big.Rat {
	acc := new(big.Rat)
	for i := len(cs) - 1; i >= 0; i-- {
		acc.Mul(acc, x)
		acc.Add(acc, new(big.Rat).SetInt(cs[i]))
	}
	return acc
}

// grid returns the analysis points: 20 per decade over the domain, and points approaching each
// special point and pole from both sides down to 1e-12 relative (20 per decade of the distance
// down to 1e-3, 4 per decade closer).
func (fn *function) grid() []float64 {
	var g []float64
	for k := math.Log10(Domain.Lo) * 20; k <= math.Log10(Domain.Hi)*20+1e-9; k++ {
		g = append(g, math.Pow(10, k/20))
	}
	for _, p := range slices.Concat(fn.special, fn.poles) {
		x0, _ := p.Float64()
		for k := -12.0; k <= 0.3; k += step(k) {
			s := math.Pow(10, k)
			g = append(g, x0*(1+s), x0/(1+s))
		}
	}
	sort.Float64s(g)
	out := g[:0]
	for _, x := range g {
		if x < Domain.Lo || x > Domain.Hi || len(out) > 0 && x == out[len(out)-1] {
			continue
		}
		skip := false
		for _, p := range slices.Concat(fn.special, fn.poles) {
			if new(big.Rat).SetFloat64(x).Cmp(p) == 0 {
				skip = true
			}
		}
		if !skip {
			out = append(out, x)
		}
	}
	return out
}

// step is the spacing in log10 of the distance of grid points to a special point: coarse very
// close to it, where the series is accurate anyway, fine where the closed form takes over.
func step(k float64) float64 {
	if k < -3 {
		return 0.25
	}
	return 0.05
}

func (s sample) bad() bool { return !(s.est <= s.target) }

// placeBranches covers the samples where the closed form misses its target by series
// branches: around each removable singularity, and at the ends of the domain.
func (fn *function) placeBranches(x string, ss []sample, prec uint) error {
	covered := make([]bool, len(ss))
	for _, p := range fn.special {
		x0, _ := p.Float64()
		// The bad run around x0, extended to the first good sample on either side.
		i := sort.Search(len(ss), func(i int) bool { return ss[i].x > x0 })
		lo, hi := i-1, i
		for lo >= 0 && ss[lo].bad() {
			lo--
		}
		for hi < len(ss) && ss[hi].bad() {
			hi++
		}
		r := 0.0
		for _, j := range []int{lo, hi} {
			if j >= 0 && j < len(ss) {
				r = math.Max(r, math.Abs((ss[j].x-x0)/(ss[j].x+x0)))
			}
		}
		if lo < 0 || hi >= len(ss) {
			r = 0.95
		}
		b, err := fn.seriesAround(x, p, r, ss, prec)
		if err != nil {
			return err
		}
		fn.branches = append(fn.branches, b)
		for j := range ss {
			if ss[j].x > b.lo && ss[j].x < b.hi {
				covered[j] = true
			}
		}
	}
	// The ends: a run of bad samples from the first (or last) one.
	if n := 0; len(ss) > 0 {
		for n < len(ss) && ss[n].bad() && !covered[n] {
			n++
		}
		if n > 0 {
			hi := Domain.Hi
			if n < len(ss) {
				hi = ss[n].x
			}
			b, err := fn.seriesAtEnd(x, atZero, hi, ss, prec)
			if err != nil {
				fn.notes = append(fn.notes, fmt.Sprintf("no series at %s → 0: %v", x, err))
			} else {
				fn.branches = append(fn.branches, b)
				for j := 0; j < n; j++ {
					covered[j] = true
				}
			}
		}
		m := len(ss)
		for m > 0 && ss[m-1].bad() && !covered[m-1] {
			m--
		}
		if m < len(ss) {
			lo := Domain.Lo
			if m > 0 {
				lo = ss[m-1].x
			}
			b, err := fn.seriesAtEnd(x, atInf, lo, ss, prec)
			if err != nil {
				fn.notes = append(fn.notes, fmt.Sprintf("no series at %s → ∞: %v", x, err))
			} else {
				fn.branches = append(fn.branches, b)
			}
		}
	}
	return nil
}

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

// check records the largest ratio of estimate to target over all samples with the branches in
// place.
func (fn *function) check(ss []sample, prec uint) {
	worst := 0.0
	for _, s := range ss {
		inBranch := false
		for _, b := range fn.branches {
			if s.x > b.lo && s.x < b.hi {
				inBranch = true
				worst = math.Max(worst, b.worst)
				break
			}
		}
		if !inBranch {
			worst = math.Max(worst, s.est/(2*s.target))
		}
	}
	fn.worst = worst
	if worst > 1 {
		fn.notes = append(fn.notes, fmt.Sprintf("the estimated float64 error exceeds the target by a factor %.3g somewhere in [%g, %g]", worst, Domain.Lo, Domain.Hi))
	}
}

// findZeros locates the sign changes of f between samples and refines them by bisection.
func findZeros(fn *function, ss []sample, prec uint) []float64 {
	var zs []float64
	for i := 1; i < len(ss); i++ {
		a, b := ss[i-1], ss[i]
		if math.IsInf(a.est, 1) || math.IsInf(b.est, 1) || a.f.Sign()*b.f.Sign() >= 0 {
			continue
		}
		lo, hi := a.x, b.x
		sa := a.f.Sign()
		for k := 0; k < 200 && math.Nextafter(lo, hi) < hi; k++ {
			mid := lo + (hi-lo)/2
			s := fn.sampleAt(mid, prec)
			if s.f.Sign() == sa {
				lo = mid
			} else {
				hi = mid
			}
		}
		zs = append(zs, lo)
	}
	return zs
}

func bigLog(x *big.Float, prec uint) *big.Float {
	return funcBound(opLog, valErr{x, new(big.Float), new(big.Float)}, prec).v
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
