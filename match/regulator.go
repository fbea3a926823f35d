package match

import (
	"fmt"
	"math"
	"math/cmplx"
	"slices"
	"strings"

	"loopmatch/expr"
	"loopmatch/expr/dirac"
	"loopmatch/expr/notation"
	"loopmatch/passarino"
)

// blockCanon returns the canonical form of a block: the legs on shell (mass shell, Dirac
// equation, transverse polarisations) unless the block is off shell, and the values of its
// kinematics lines. It does not truncate.
func blockCanon(p *notation.Program, mb *notation.MatchBlock, opt Options) (*Canon, error) {
	var c *Canon
	if mb.OffShell {
		c = &Canon{kin: &Kinematics{Legs: p.Legs, rules: map[expr.Dot]expr.Expr{}}, opt: opt.Dirac}
		if c.opt.Dummies == nil {
			c.opt.Dummies = p.NamesOf(notation.KindIndex)
			c.opt.ColourDummies = p.NamesOf(notation.KindAdjoint)
		}
		c.dkin = dirac.Kinematics{}
	} else {
		var err error
		if c, err = NewCanon(p, passarino.Small{}, false, opt); err != nil {
			return nil, err
		}
	}
	if err := c.kin.addLines(mb.Kinematics); err != nil {
		return nil, err
	}
	return c, nil
}

// addLines adds the values of kinematics lines to the rules: each must name a scalar product
// that the legs leave free.
func (k *Kinematics) addLines(lines []notation.KinRule) error {
	for _, l := range lines {
		if r, ok := k.rules[l.Dot]; ok {
			return fmt.Errorf("%s: kinematics: %s is fixed by the external legs (%s = %s)", l.Pos, l.Dot.Key(), l.Dot.Key(), r)
		}
		v := expr.FromRF(l.Value)
		for d, r := range k.rules {
			nr, err := r.MapAtoms(func(a expr.Atom) (expr.Expr, bool) {
				x, ok := a.(expr.Dot)
				if ok && x == l.Dot {
					return v, true
				}
				return expr.Expr{}, false
			})
			if err != nil {
				return err
			}
			k.rules[d] = nr
		}
		k.rules[l.Dot] = v
		k.free = slices.DeleteFunc(k.free, func(d expr.Dot) bool { return d == l.Dot })
	}
	return nil
}

// blockDot returns the scalar products of external momenta at the kinematics of the block, as
// rational functions of the parameters; a product that neither the legs nor the kinematics
// lines fix is an error that says what to add.
func blockDot(p *notation.Program, mb *notation.MatchBlock) (passarino.DotFunc, error) {
	c, err := blockCanon(p, mb, Options{})
	if err != nil {
		return nil, err
	}
	return func(a, b string) (expr.RatFunc, error) {
		e, err := c.kin.Apply(expr.FromAtom(expr.NewDot(a, b), 1))
		if err != nil {
			return expr.RatFunc{}, err
		}
		r, ok := e.AsRatFunc()
		if !ok {
			d := expr.NewDot(a, b)
			return expr.RatFunc{}, fmt.Errorf("the general route needs the value of %s (add a line: kinematics %s = …); it is %s here", d.Key(), d.Key(), e)
		}
		return r, nil
	}, nil
}

// hasMomentum reports whether a structure atom involves one of the momenta.
func hasMomentum(a expr.Atom, moms []string) bool {
	switch x := a.(type) {
	case expr.Dot:
		return slices.Contains(moms, x.A) || slices.Contains(moms, x.B)
	case expr.Vec:
		return slices.Contains(moms, x.P)
	case expr.Levi:
		for _, s := range x.S {
			if !s.Index && slices.Contains(moms, s.Name) {
				return true
			}
		}
	case expr.Chain:
		for _, el := range x.Elems {
			if el.Op == expr.NCSlash && slices.Contains(moms, el.Args[0]) {
				return true
			}
		}
	}
	return false
}

// kinematicsUseRegulators reports whether a kinematics line of the block is written in terms
// of its regulators (small external momenta).
func kinematicsUseRegulators(mb *notation.MatchBlock) bool {
	for _, l := range mb.Kinematics {
		for _, v := range l.Value.Vars() {
			if slices.Contains(mb.Regulators, v) {
				return true
			}
		}
	}
	return false
}

// dropPowerSuppressed removes the structures of e that the basis does not contain and that
// carry external momenta: at leading power in small momenta they are corrections suppressed by
// powers of the momenta over the heavy masses. It returns the rest and the dropped part.
func dropPowerSuppressed(e expr.Expr, basis []expr.Expr, moms []string) (expr.Expr, expr.Expr) {
	known := map[string]bool{}
	for _, b := range basis {
		for _, g := range b.Collect(IsStructure) {
			known[g.Key] = true
		}
	}
	out, dropped := expr.Zero(), expr.Zero()
	for _, g := range e.Collect(IsStructure) {
		s := g.Coef
		for _, a := range g.Atoms {
			s = s.MustMul(expr.FromAtom(a.A, a.Pow))
		}
		if !known[g.Key] && slices.ContainsFunc(g.Atoms, func(a expr.AtomPow) bool { return hasMomentum(a.A, moms) }) {
			dropped = dropped.Add(s)
			continue
		}
		out = out.Add(s)
	}
	return out, dropped
}

// momentumPower counts the external momenta in a structure (slashes, vectors, scalar products,
// Levi-Civita slots), each counted once per occurrence.
func momentumPower(atoms []expr.AtomPow, moms []string) int {
	n := 0
	for _, a := range atoms {
		k := 0
		switch x := a.A.(type) {
		case expr.Dot:
			for _, m := range []string{x.A, x.B} {
				if slices.Contains(moms, m) {
					k++
				}
			}
		case expr.Vec:
			if slices.Contains(moms, x.P) {
				k++
			}
		case expr.Levi:
			for _, sl := range x.S {
				if !sl.Index && slices.Contains(moms, sl.Name) {
					k++
				}
			}
		case expr.Chain:
			for _, el := range x.Elems {
				if el.Op == expr.NCSlash && slices.Contains(moms, el.Args[0]) {
					k++
				}
			}
		}
		n += k * a.Pow
	}
	return n
}

// powerCheck checks numerically that the structures dropped as power corrections are small:
// each dropped coefficient times Λ^n (n external momenta in the structure, Λ² the largest
// |p_i·p_j| at the point) must shrink when the regulators shrink tenfold (at least like one
// power), or be below 1e-10 of the largest kept coefficient.
func powerCheck(p *notation.Program, mb *notation.MatchBlock, dropped, kept expr.Expr) Check {
	ch := Check{Name: "structures dropped as power corrections (small external momenta) vanish at leading power"}
	pt, err := pointOf(p, mb)
	if err != nil {
		ch.Detail = "needs numerical values: " + err.Error()
		return ch
	}
	dot, err := blockDot(p, mb)
	if err != nil {
		ch.Detail = err.Error()
		return ch
	}
	moms := momentaOf(p)
	size := func(q point) (drop, keep float64, err error) {
		lam2 := 0.0
		for _, a := range moms {
			for _, b := range moms {
				r, err := dot(a, b)
				if err != nil {
					continue
				}
				v, err := EvalFinite(expr.FromRF(r), q)
				if err != nil {
					return 0, 0, err
				}
				lam2 = max(lam2, cmplx.Abs(v))
			}
		}
		for _, g := range dropped.Collect(IsStructure) {
			v, err := EvalFinite(g.Coef, q)
			if err != nil {
				return 0, 0, err
			}
			drop = max(drop, cmplx.Abs(v)*math.Pow(lam2, float64(momentumPower(g.Atoms, moms))/2))
		}
		for _, g := range kept.Collect(IsStructure) {
			v, err := EvalFinite(g.Coef, q)
			if err != nil {
				return 0, 0, err
			}
			keep = max(keep, cmplx.Abs(v))
		}
		return drop, keep, nil
	}
	d1, k1, err1 := size(pt)
	ch10 := map[string]float64{}
	for _, r := range mb.Regulators {
		ch10[r] = pt[r] / 10
	}
	d2, _, err2 := size(pt.with(ch10))
	if err1 != nil || err2 != nil {
		ch.Detail = fmt.Sprintf("evaluation failed: %v %v", err1, err2)
		return ch
	}
	ch.Passed = d1 <= 1e-10*k1 || (len(mb.Regulators) > 0 && d2 <= 0.2*d1)
	ch.Detail = fmt.Sprintf("%d dropped structures: largest size %.3g at the point, %.3g at the regulators /10 (largest kept coefficient %.3g)", len(dropped.Collect(IsStructure)), d1, d2, k1)
	return ch
}

// leadingPower returns the limit of e as the regulator reg → 0 at leading power: the
// coefficient rational functions are expanded in reg around 0, positive powers are dropped, and
// the terms with log(reg) are returned separately (they must cancel). A negative power that
// survives, or reg inside another function, is an error.
func leadingPower(e expr.Expr, reg string) (lead, logs expr.Expr, err error) {
	isLog := func(a expr.Atom) bool {
		f, ok := a.(expr.Fn)
		return ok && f.Name == expr.FnLog && len(f.Args) == 1 && f.Args[0].Equal(expr.Sym(reg))
	}
	type part struct {
		power int
		e     expr.Expr
	}
	var parts []part
	for _, t := range e.Terms() {
		for _, a := range t.Atoms {
			if !isLog(a.A) && atomHas(a.A, reg) {
				return expr.Expr{}, expr.Expr{}, fmt.Errorf("%s depends on the regulator %s in a way that is not expanded in closed form", a.A.Key(), reg)
			}
		}
		rest := expr.Term{Coef: expr.RFInt(1), Atoms: t.Atoms, NC: t.NC, Loops: t.Loops}
		ser, low, err := laurentIn(t.Coef, reg)
		if err != nil {
			return expr.Expr{}, expr.Expr{}, err
		}
		for i, c := range ser {
			if n := low + i; n <= 0 {
				parts = append(parts, part{n, expr.FromTerm(rest).Scale(c)})
			}
		}
	}
	neg := expr.Zero()
	for _, pt := range parts {
		switch {
		case pt.power < 0:
			rp, _ := expr.RFVar(reg).Pow(pt.power)
			neg = neg.Add(pt.e.Scale(rp))
		default:
			lead = lead.Add(pt.e)
		}
	}
	if !neg.IsZero() {
		return expr.Expr{}, expr.Expr{}, fmt.Errorf("the coefficient diverges as %s → 0: %s", reg, neg)
	}
	// split off the logarithms of the regulator
	var keep expr.Expr
	for _, t := range lead.Terms() {
		if slices.ContainsFunc(t.Atoms, func(a expr.AtomPow) bool { return isLog(a.A) }) {
			logs = logs.Add(expr.FromTerm(t))
		} else {
			keep = keep.Add(expr.FromTerm(t))
		}
	}
	return keep, logs, nil
}

// atomHas reports whether an atom depends on the symbol v.
func atomHas(a expr.Atom, v string) bool {
	return slices.Contains(expr.FromAtom(a, 1).Vars(), v)
}

// laurentIn expands the rational function r in v around 0 up to v^0: it returns the
// coefficients of v^low … v^0 (rational functions free of v).
func laurentIn(r expr.RatFunc, v string) ([]expr.RatFunc, int, error) {
	num := r.Num().CoeffsIn(v)
	den := r.Den().CoeffsIn(v)
	// den = v^a (d_0 + d_1 v + …) with d_0 ≠ 0
	a := 0
	for a < len(den) && den[a].IsZero() {
		a++
	}
	den = den[a:]
	b := 0 // num = v^b (n_0 + …)
	for b < len(num) && num[b].IsZero() {
		b++
	}
	if b == len(num) {
		return nil, 0, nil
	}
	num = num[b:]
	low := b - a
	if low > 0 {
		return nil, low, nil
	}
	n := -low + 1 // coefficients v^low … v^0
	d0 := expr.RF(den[0])
	q := make([]expr.RatFunc, n)
	for j := range n {
		s := expr.RFInt(0)
		if j < len(num) {
			s = expr.RF(num[j])
		}
		for i := 1; i <= j && i < len(den); i++ {
			s = s.Sub(expr.RF(den[i]).Mul(q[j-i]))
		}
		x, err := s.Div(d0)
		if err != nil {
			return nil, 0, err
		}
		q[j] = x
	}
	return q, low, nil
}

// numericChecks evaluates the coefficients of the general route at the point of the file and,
// when the block has regulators, at the regulators divided by 10 and 100: the logarithms of the
// regulators must cancel (changes that shrink like the powers, not like logarithms).
func numericChecks(p *notation.Program, mb *notation.MatchBlock, res *Result, pt point) []Check {
	var out []Check
	for _, r := range mb.Regulators {
		if v, ok := pt[r]; !ok || v == 0 {
			return []Check{{Name: "regulator logarithms cancel in full minus effective theory (numerically)", Detail: fmt.Sprintf("the regulator %s needs a nonzero value (values %s = …)", r, r)}}
		}
	}
	vals := make([][]complex128, 3)
	scales := []float64{1, 0.1, 0.01}
	for si, s := range scales {
		q := pt
		if len(mb.Regulators) > 0 {
			ch := map[string]float64{}
			for _, r := range mb.Regulators {
				ch[r] = pt[r] * s
			}
			q = pt.with(ch)
		} else if si > 0 {
			break
		}
		for _, c := range res.Coeffs {
			v, err := EvalFinite(c.Value, q)
			if err != nil {
				return append(out, Check{Name: "numerical evaluation of the coefficients", Detail: err.Error()})
			}
			vals[si] = append(vals[si], v)
		}
	}
	var parts []string
	for i, c := range res.Coeffs {
		parts = append(parts, fmt.Sprintf("C_%s = %s", c.Operator, fmtC(vals[0][i])))
	}
	res.Notes = append(res.Notes, "general route: at "+pt.text(p)+": "+strings.Join(parts, ", "))
	if len(mb.Regulators) == 0 {
		return out
	}
	ch := Check{Name: "regulator logarithms cancel in full minus effective theory (" + strings.Join(mb.Regulators, ", ") + " → 0, numerically)", Passed: true}
	var det []string
	for i, c := range res.Coeffs {
		d1 := vals[1][i] - vals[0][i]
		d2 := vals[2][i] - vals[1][i]
		scale := cmplx.Abs(vals[2][i])
		// A surviving logarithm changes C by the same amount per factor 10; powers shrink it.
		ok := cmplx.Abs(d2) <= 0.2*cmplx.Abs(d1) || cmplx.Abs(d2) <= 1e-10*scale
		if !ok {
			ch.Passed = false
		}
		// extrapolation with O(λ²) corrections
		lim := vals[2][i] + (vals[2][i]-vals[1][i])/99
		det = append(det, fmt.Sprintf("C_%s: %s, %s, %s at regulators ×1, ×1/10, ×1/100 (limit %s)", c.Operator, fmtC(vals[0][i]), fmtC(vals[1][i]), fmtC(vals[2][i]), fmtC(lim)))
	}
	ch.Detail = strings.Join(det, "; ")
	return append(out, ch)
}
