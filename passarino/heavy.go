// Package passarino turns integrands with loop momenta in the numerator into scalar integrals
// with exact coefficients. This file is the heavy-mass route: propagators are Taylor-expanded
// in the small quantities (external momenta and light masses) to a requested total order, the
// resulting vacuum tensor integrals are reduced to scalar ones (tensor.go) and those to masters
// exactly in d (loops/vacuum). The general route (Passarino–Veltman) lives in passarino/pv.
package passarino

import (
	"fmt"
	"math/big"
	"slices"

	"loopmatch/expr"
	"loopmatch/loops/vacuum"
)

// Small names the small quantities of an expansion and the order to keep.
type Small struct {
	Momenta []string // external momenta counted as order 1
	Masses  []string // light masses counted as order 1 (their squares as order 2)
	Order   int      // total order in the small quantities
	// OnShell lists the momenta of the external legs with their squared masses: a tree-level
	// propagator without a heavy mass whose momentum is a leg's momentum is not expanded but
	// evaluated on that leg's mass shell, 1/(P² − m²) = 1/(m_leg² − m²) (the external-leg
	// diagrams of flavour-changing transitions).
	OnShell []OnShellMomentum
}

// OnShellMomentum is the momentum of an external leg and its squared mass.
type OnShellMomentum struct {
	Mom expr.Mom
	M2  expr.RatFunc
}

func (s Small) isMom(p string) bool  { return slices.Contains(s.Momenta, p) }
func (s Small) isMass(m string) bool { return slices.Contains(s.Masses, m) }
func (s Small) hasAny(r expr.RatFunc) bool {
	for _, v := range r.Vars() {
		if s.isMass(v) {
			return true
		}
	}
	return false
}

// Info reports what a reduction did.
type Info struct {
	vacuum.Info
	Dropped int // terms beyond the expansion order that were dropped
}

// atomDegree is the order of an atom in the small momenta.
func (s Small) atomDegree(a expr.Atom) (int, error) {
	switch x := a.(type) {
	case expr.Dot:
		n := 0
		if s.isMom(x.A) {
			n++
		}
		if s.isMom(x.B) {
			n++
		}
		return n, nil
	case expr.Vec:
		if s.isMom(x.P) {
			return 1, nil
		}
	case expr.Levi:
		n := 0
		for _, sl := range x.S {
			if !sl.Index && s.isMom(sl.Name) {
				n++
			}
		}
		return n, nil
	case expr.Chain, expr.Trace:
		elems, _, _ := stringOf(x)
		n := 0
		for _, e := range elems {
			if e.Op == expr.NCSlash && s.isMom(e.Args[0]) {
				n++
			}
		}
		return n, nil
	case expr.Fn:
		for _, arg := range x.Args {
			for _, v := range arg.Vars() {
				if s.isMass(v) {
					return 0, fmt.Errorf("%s depends on the light mass %s non-analytically; the heavy-mass route cannot expand it", x.Key(), v)
				}
			}
		}
	}
	return 0, nil
}

// termDegree is the order of a term's atoms in the small quantities (propagators count 0).
func (s Small) termDegree(t expr.Term) (int, error) {
	n := 0
	for _, a := range t.Atoms {
		if _, ok := a.A.(expr.Prop); ok {
			continue
		}
		d, err := s.atomDegree(a.A)
		if err != nil {
			return 0, err
		}
		if a.Pow < 0 && d > 0 {
			return 0, fmt.Errorf("%s appears in a denominator; the heavy-mass route cannot expand it", a.A.Key())
		}
		n += d * a.Pow
	}
	return n, nil
}

// monoDegree is the degree of a monomial in the light masses.
func (s Small) monoDegree(m expr.Mono) int {
	n := 0
	for _, vp := range m {
		if s.isMass(vp.Var) {
			n += vp.Exp
		}
	}
	return n
}

// denDegree is the degree of a denominator in the light masses; it must be homogeneous (all
// monomials of the same degree) for the order of a term to be defined.
func (s Small) denDegree(d expr.Poly) (int, error) {
	deg := -1
	for _, pt := range d.Terms() {
		k := s.monoDegree(pt.Mono)
		if deg >= 0 && k != deg {
			return 0, fmt.Errorf("the denominator %s mixes orders in the light masses; the heavy-mass route cannot expand it", d)
		}
		deg = k
	}
	return max(deg, 0), nil
}

// Truncate drops every part of e beyond order s.Order in the small quantities. A coefficient may
// have light masses in its denominator (from on-shell external-leg propagators) if the
// denominator is homogeneous in them; its order then counts negatively.
func (s Small) Truncate(e expr.Expr) (expr.Expr, int, error) {
	var out []expr.Expr
	dropped := 0
	for _, t := range e.Terms() {
		deg, err := s.termDegree(t)
		if err != nil {
			return expr.Expr{}, 0, err
		}
		dd, err := s.denDegree(t.Coef.Den())
		if err != nil {
			return expr.Expr{}, 0, err
		}
		deg -= dd
		var keep []expr.PolyTerm
		for _, pt := range t.Coef.Num().Terms() {
			if deg+s.monoDegree(pt.Mono) <= s.Order {
				keep = append(keep, pt)
			} else {
				dropped++
			}
		}
		if len(keep) == 0 {
			continue
		}
		num := expr.Poly{}
		for _, pt := range keep {
			num = num.Add(expr.PolyMono(pt.Coef, pt.Mono))
		}
		c, err := expr.NewRatFunc(num, t.Coef.Den())
		if err != nil {
			return expr.Expr{}, 0, err
		}
		nt := t
		nt.Coef = c
		out = append(out, expr.FromTerm(nt))
	}
	return expr.Sum(out...), dropped, nil
}

// lowestDegree is the lowest order of any part of e (0 for zero).
func (s Small) lowestDegree(e expr.Expr) (int, error) {
	low, first := 0, true
	for _, t := range e.Terms() {
		deg, err := s.termDegree(t)
		if err != nil {
			return 0, err
		}
		dd, err := s.denDegree(t.Coef.Den())
		if err != nil {
			return 0, err
		}
		for _, pt := range t.Coef.Num().Terms() {
			k := deg - dd + s.monoDegree(pt.Mono)
			if first || k < low {
				low, first = k, false
			}
		}
	}
	return low, nil
}

// truncMul multiplies and truncates.
func (s Small) truncMul(a, b expr.Expr) (expr.Expr, error) {
	p, err := a.Mul(b)
	if err != nil {
		return expr.Expr{}, err
	}
	r, _, err := s.Truncate(p)
	return r, err
}

// splitMass writes M² = H + L with L the part that depends on light masses.
func (s Small) splitMass(m2 expr.RatFunc) (h, l expr.RatFunc, err error) {
	if !s.hasAny(m2) {
		return m2, expr.RFInt(0), nil
	}
	if s.hasAny(expr.RF(m2.Den())) {
		return expr.RatFunc{}, expr.RatFunc{}, fmt.Errorf("mass %s has a light mass in its denominator", m2)
	}
	var hp, lp expr.Poly
	for _, pt := range m2.Num().Terms() {
		part := expr.PolyMono(pt.Coef, pt.Mono)
		if s.monoDegree(pt.Mono) > 0 {
			lp = lp.Add(part)
		} else {
			hp = hp.Add(part)
		}
	}
	h, _ = expr.NewRatFunc(hp, m2.Den())
	l, _ = expr.NewRatFunc(lp, m2.Den())
	return h, l, nil
}

// expandProp returns the Taylor expansion of 1/D^n, D = (k + P)² − M² (k the loop momentum or
// absent), in the small quantities: D = D0 + δ with D0 = k² − H, δ = 2k·P + P² − L, and
// 1/D^n = Σ_j (−1)^j binom(n+j−1, j) δ^j / D0^{n+j}, up to the order of s.
func (s Small) expandProp(p expr.Prop, n int, loops []string) (expr.Expr, error) {
	// K = Lp + P with Lp the loop momenta (coefficients ±1 each, any number of loops) and P the
	// external part.
	var lp, ext []expr.MomTerm
	for _, t := range p.K {
		if slices.Contains(loops, t.Name) {
			if c := new(big.Rat).Abs(t.Coef); c.Cmp(big.NewRat(1, 1)) != 0 {
				return expr.Expr{}, fmt.Errorf("propagator %s: a loop momentum must enter with coefficient ±1", p.Key())
			}
			lp = append(lp, t)
		} else {
			ext = append(ext, t)
		}
	}
	Lp, P := expr.NewMom(lp...), expr.NewMom(ext...)
	loop := len(Lp) > 0
	for _, t := range P {
		if !s.isMom(t.Name) {
			return expr.Expr{}, fmt.Errorf("propagator %s depends on %s, which is not declared small (expand it, or use the general route)", p.Key(), t.Name)
		}
	}
	h, l, err := s.splitMass(p.M2)
	if err != nil {
		return expr.Expr{}, err
	}
	if !loop && h.IsZero() {
		for _, os := range s.OnShell {
			if os.Mom.Equal(P) || os.Mom.Equal(P.Scale(big.NewRat(-1, 1))) {
				// 1/(P² − L)^n on the leg's mass shell.
				d := os.M2.Sub(l)
				if d.IsZero() {
					return expr.Expr{}, fmt.Errorf("propagator %s is on its own mass shell (a diagonal external-leg correction needs wave-function renormalisation, not a propagator)", p.Key())
				}
				inv, err := d.Pow(-n)
				if err != nil {
					return expr.Expr{}, err
				}
				return expr.FromRF(inv), nil
			}
		}
		return expr.Expr{}, fmt.Errorf("propagator %s has no heavy mass and its momentum is not an external leg's; a light tree-level propagator cannot be expanded", p.Key())
	}
	// δ = 2 Lp·P + P² − L
	delta := dotMom(P, P).Sub(expr.FromRF(l))
	if loop {
		delta = delta.Add(dotMom(Lp, P).Scale(expr.RFInt(2)))
	}
	var d0 expr.Expr // 1/D0 as a factor
	if loop {
		d0 = expr.FromAtom(expr.NewProp(Lp, h), -1)
	} else {
		inv, err := h.Neg().Inv()
		if err != nil {
			return expr.Expr{}, err
		}
		d0 = expr.FromRF(inv)
	}
	res := expr.Zero()
	term, err := d0.Pow(n) // j = 0
	if err != nil {
		return expr.Expr{}, err
	}
	for j := 0; j <= s.Order; j++ {
		if j > 0 {
			// term_j = term_{j−1} · (−δ/D0) · (n+j−1)/j
			if term, err = s.truncMul(term, delta.Neg()); err != nil {
				return expr.Expr{}, err
			}
			if term, err = term.Mul(d0); err != nil {
				return expr.Expr{}, err
			}
			term = term.Scale(expr.RFRat(big.NewRat(int64(n+j-1), int64(j))))
		}
		if term.IsZero() {
			break
		}
		res = res.Add(term)
	}
	return res, nil
}

// dependsOnAny reports whether a momentum combination contains one of the loop momenta.
func dependsOnAny(k expr.Mom, loops []string) bool {
	for _, t := range k {
		if slices.Contains(loops, t.Name) {
			return true
		}
	}
	return false
}

func dotMom(a, b expr.Mom) expr.Expr {
	res := expr.Zero()
	for _, x := range a {
		for _, y := range b {
			c := new(big.Rat).Mul(x.Coef, y.Coef)
			res = res.Add(expr.FromAtom(expr.NewDot(x.Name, y.Name), 1).Scale(expr.RFRat(c)))
		}
	}
	return res
}

// ExpandProps Taylor-expands every propagator of every term in the small quantities (loop
// propagators around k² − M², tree-level heavy propagators around −M²), keeping the total order
// s.Order including the small factors already in the numerator.
func (s Small) ExpandProps(e expr.Expr) (expr.Expr, Info, error) {
	var info Info
	var out []expr.Expr
	for _, t := range e.Terms() {
		loops := t.Loops
		rest := expr.Term{Coef: t.Coef, NC: t.NC, Loops: t.Loops}
		var props []expr.AtomPow
		for _, a := range t.Atoms {
			if _, ok := a.A.(expr.Prop); ok && a.Pow < 0 {
				props = append(props, a)
				continue
			}
			rest.Atoms = append(rest.Atoms, a)
		}
		// On-shell external-leg propagators bring negative orders (1/m²); expand the others
		// further by as much, and truncate once the term is complete.
		var onshell, other []expr.AtomPow
		for _, pa := range props {
			if !dependsOnAny(pa.A.(expr.Prop).K, loops) {
				if h, _, err := s.splitMass(pa.A.(expr.Prop).M2); err == nil && h.IsZero() {
					onshell = append(onshell, pa)
					continue
				}
			}
			other = append(other, pa)
		}
		acc := expr.FromTerm(rest)
		for _, pa := range onshell {
			x, err := s.expandProp(pa.A.(expr.Prop), -pa.Pow, loops)
			if err != nil {
				return expr.Expr{}, info, err
			}
			if acc, err = acc.Mul(x); err != nil {
				return expr.Expr{}, info, err
			}
		}
		low, err := s.lowestDegree(acc)
		if err != nil {
			return expr.Expr{}, info, err
		}
		wide := s
		wide.Order = s.Order - min(low, 0)
		for _, pa := range other {
			x, err := wide.expandProp(pa.A.(expr.Prop), -pa.Pow, loops)
			if err != nil {
				return expr.Expr{}, info, err
			}
			if acc, err = wide.truncMul(acc, x); err != nil {
				return expr.Expr{}, info, err
			}
		}
		if low >= 0 {
			var dropped int
			if acc, dropped, err = s.Truncate(acc); err != nil {
				return expr.Expr{}, info, err
			}
			info.Dropped += dropped
		}
		out = append(out, acc)
	}
	return expr.Sum(out...), info, nil
}

// Heavy expands e in the small quantities and reduces its one-loop integrals to vacuum masters
// exactly in d. Every loop integral ∫ (measure of the notation) becomes i/(16π²) times a
// combination of Tad masters; tree-level terms are only expanded.
func Heavy(e expr.Expr, s Small) (expr.Expr, Info, error) {
	x, info, err := s.ExpandProps(e)
	if err != nil {
		return expr.Expr{}, info, err
	}
	r, vinfo, err := ReduceVacuum(x)
	info.Merge(vinfo)
	return r, info, err
}
