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
	fn.check(samples)
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

// check records the largest ratio of estimate to target over all samples with the branches in
// place.
func (fn *function) check(ss []sample) {
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
