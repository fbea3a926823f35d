package passarino

import (
	"fmt"
	"math/big"
	"slices"
	"strings"
	"sync"

	"loopmatch/expr"
	"loopmatch/loops/vacuum"
	"loopmatch/passarino/pv"
)

// This file is the general route: one-loop integrands at general kinematics are written as
// Passarino–Veltman tensor coefficients (package pv) times the tensor structures built from the
// metric and the propagator momenta, and so as combinations of the scalar integrals A0 … D0.
//
// Per term: the loop propagators are brought to the form (k + P_i)² − m_i²; propagators with
// the same momentum and different masses (R_ξ gauges) are split by partial fractions; when a
// single momentum is left the integral is a vacuum integral after a shift and goes to the
// vacuum reduction (any powers); otherwise the loop momentum is shifted so that the first
// propagator has P_0 = 0, every occurrence of k in the numerator becomes k^{i_s} with a fresh
// index (k² counts as k^{i}k^{j}g_{ij}), and
//
//	∫ k^{i_1} … k^{i_R} / (D_0 … D_{N−1}) = Σ_{structures} {g…g P…P}^{i_1…i_R} T^N_{0…0 j…},
//
// the sum running over all ways of pairing slots into metrics and giving the others a momentum
// P_j (docs/PASSARINO.md). The contraction with the rest of the term is left to expr's
// canonical form (indices) and the Dirac algebra (gamma(i) … gamma(i) inside chains).

// DotFunc returns the scalar product a·b of two external momenta as a rational function of the
// parameters (on-shell rules, declared invariants, or symbols chosen by the caller).
type DotFunc func(a, b string) (expr.RatFunc, error)

// GeneralInfo reports what a general-route reduction did.
type GeneralInfo struct {
	// Scaleless lists integrals without a scale (set to zero).
	Scaleless []string
	// Points counts the scalar integrals by number of distinct propagators after partial
	// fractions (index N = 1 … 4).
	Points [pv.MaxPoints + 1]int
}

// ErrRaisedPower is wrapped by the error for an integral with two or more distinct propagator
// momenta and a propagator raised to a power: the Passarino–Veltman recursions of package pv
// take each propagator once.
var ErrRaisedPower = fmt.Errorf("raised propagator power at general kinematics")

// General reduces every one-loop term of e to scalar-integral atoms (loops.Atom: Tad, Bub,
// Tri, Box with squared masses) with coefficients rational in d, the parameters and the values
// of dot, times i/(16π²). Terms without loops pass unchanged. Tree-level, vacuum-like (one
// propagator momentum) and general terms may be mixed.
func General(e expr.Expr, dot DotFunc) (expr.Expr, GeneralInfo, error) {
	g := &generalReducer{dot: dot, reducers: map[string]*pv.Reducer{}, structs: map[string][]genStructure{}}
	var out []expr.Expr
	for _, t := range e.Terms() {
		switch len(t.Loops) {
		case 0:
			out = append(out, expr.FromTerm(t))
			continue
		case 1:
		default:
			return expr.Expr{}, g.info, fmt.Errorf("general route: %d-loop term; Passarino–Veltman reduction is one-loop only", len(t.Loops))
		}
		r, err := g.term(t)
		if err != nil {
			return expr.Expr{}, g.info, err
		}
		out = append(out, r)
	}
	return expr.Sum(out...), g.info, nil
}

// general holds the caches of one reduction.
type generalReducer struct {
	dot      DotFunc
	info     GeneralInfo
	mu       sync.Mutex
	reducers map[string]*pv.Reducer
	structs  map[string][]genStructure
}

// genLine is one denominator (k + P)² − M2 raised to Pow ≥ 1.
type genLine struct {
	P   expr.Mom
	M2  expr.RatFunc
	Pow int
}

// genMeasure is i/(16π²), the factor of every one-loop scalar integral.
func genMeasure() expr.Expr {
	return expr.FromAtom(expr.I, 1).MustMul(expr.FromAtom(expr.Pi, -2)).Scale(expr.RFRat(big.NewRat(1, 16)))
}

// term reduces one one-loop term.
func (g *generalReducer) term(t expr.Term) (expr.Expr, error) {
	k := t.Loops[0]
	num := expr.Term{Coef: t.Coef, NC: t.NC, Loops: t.Loops}
	var dens []genLine
	extra := expr.Int(1)
	for _, a := range t.Atoms {
		p, ok := a.A.(expr.Prop)
		if !ok || p.K.Coef(k).Sign() == 0 {
			num.Atoms = append(num.Atoms, a)
			continue
		}
		c := p.K.Coef(k)
		var P expr.Mom
		switch {
		case c.Cmp(big.NewRat(1, 1)) == 0:
			P = p.K.Sub(expr.MomOf(k))
		case c.Cmp(big.NewRat(-1, 1)) == 0:
			P = p.K.Add(expr.MomOf(k)).Scale(big.NewRat(-1, 1))
		default:
			return expr.Expr{}, fmt.Errorf("propagator %s: the loop momentum must enter with coefficient ±1", p.Key())
		}
		if a.Pow > 0 { // a propagator in the numerator: expand it
			kp := expr.MomOf(k).Add(P)
			x := dotMom(kp, kp).Sub(expr.FromRF(p.M2))
			xp, err := x.Pow(a.Pow)
			if err != nil {
				return expr.Expr{}, err
			}
			if extra, err = extra.Mul(xp); err != nil {
				return expr.Expr{}, err
			}
			continue
		}
		dens = append(dens, genLine{P: P, M2: p.M2, Pow: -a.Pow})
	}
	numerator, err := expr.FromTerm(num).Mul(extra)
	if err != nil {
		return expr.Expr{}, err
	}
	if len(dens) == 0 {
		g.note(fmt.Sprintf("∫ without propagators = 0: %s", expr.FromTerm(t)))
		return expr.Zero(), nil
	}
	// Group by momentum, split different masses by partial fractions.
	var groups []genGroup
	for _, d := range dens {
		i := slices.IndexFunc(groups, func(gr genGroup) bool { return gr.P.Equal(d.P) })
		if i < 0 {
			groups = append(groups, genGroup{P: d.P})
			i = len(groups) - 1
		}
		groups[i].lines = append(groups[i].lines, vacuum.Line{M2: d.M2, Pow: d.Pow})
	}
	slices.SortFunc(groups, func(a, b genGroup) int { return strings.Compare(genMomKey(a.P), genMomKey(b.P)) })
	for i := range groups {
		fr, err := vacuum.Fractions(groups[i].lines)
		if err != nil {
			return expr.Expr{}, err
		}
		groups[i].fracs = fr
	}
	res := expr.Zero()
	var rec func(i int, coef expr.RatFunc, chosen []genLine) error
	rec = func(i int, coef expr.RatFunc, chosen []genLine) error {
		if i == len(groups) {
			r, err := g.integral(numerator, k, chosen)
			if err != nil {
				return err
			}
			res = res.Add(r.Scale(coef))
			return nil
		}
		for _, f := range groups[i].fracs {
			next := append(slices.Clone(chosen), genLine{P: groups[i].P, M2: f.M2, Pow: f.Pow})
			if err := rec(i+1, coef.Mul(f.Coef), next); err != nil {
				return err
			}
		}
		return nil
	}
	if err := rec(0, expr.RFInt(1), nil); err != nil {
		return expr.Expr{}, err
	}
	return res.MustMul(genMeasure()), nil
}

type genGroup struct {
	P     expr.Mom
	lines []vacuum.Line
	fracs []vacuum.Fraction
}

// genMomKey orders momenta: zero first, then by text.
func genMomKey(p expr.Mom) string {
	if p.IsZero() {
		return ""
	}
	return "~" + p.String()
}

func (g *generalReducer) note(s string) {
	g.mu.Lock()
	defer g.mu.Unlock()
	g.info.Scaleless = append(g.info.Scaleless, s)
}

// integral reduces ∫ numerator / Π lines (distinct momenta) without the loop measure.
func (g *generalReducer) integral(numerator expr.Expr, k string, lines []genLine) (expr.Expr, error) {
	// Shift k → k − P_0 so that the first propagator is k² − m0².
	p0 := lines[0].P
	shifted := numerator
	if !p0.IsZero() {
		var err error
		if shifted, err = SubstMomentum(numerator, k, expr.MomOf(k).Sub(p0)); err != nil {
			return expr.Expr{}, err
		}
	}
	var moms []expr.Mom
	var m2 []expr.RatFunc
	for _, l := range lines {
		moms = append(moms, l.P.Sub(p0))
		m2 = append(m2, l.M2)
	}
	n := len(lines)
	g.mu.Lock()
	g.info.Points[min(n, pv.MaxPoints)]++
	g.mu.Unlock()
	if n == 1 {
		// A vacuum integral with any power.
		out := expr.Zero()
		for _, nt := range shifted.Terms() {
			full := nt
			full.Atoms = append(slices.Clone(nt.Atoms), expr.AtomPow{A: expr.NewProp(expr.MomOf(k), m2[0]), Pow: -lines[0].Pow})
			r, info, err := reduceVacuumTerm(full, k, vacuum.Loop1)
			if err != nil {
				return expr.Expr{}, err
			}
			for _, s := range info.Scaleless {
				g.note(s)
			}
			out = out.Add(r)
		}
		return out, nil
	}
	if n > pv.MaxPoints {
		return expr.Expr{}, fmt.Errorf("general route: %d distinct propagators; Passarino–Veltman reduction handles up to %d", n, pv.MaxPoints)
	}
	for _, l := range lines {
		if l.Pow != 1 {
			return expr.Expr{}, fmt.Errorf("%w: ((k + %s)^2 - %s)^%d with %d distinct propagator momenta; write the integral with distinct propagators", ErrRaisedPower, l.P, l.M2, l.Pow, n)
		}
	}
	red, err := g.reducer(moms, m2)
	if err != nil {
		return expr.Expr{}, err
	}
	out := expr.Zero()
	for _, nt := range shifted.Terms() {
		// every occurrence of k becomes an index (k² → g(i, j) with two slots)
		sl, err := openSlots(nt, func(p string) bool { return p == k }, true)
		if err != nil {
			return expr.Expr{}, err
		}
		if sl.zero {
			continue // the structure vanished (Levi-Civita symbol with two equal slots)
		}
		base, slots := sl.term, sl.idx
		if len(slots) > pv.MaxRank {
			return expr.Expr{}, fmt.Errorf("general route: tensor rank %d exceeds %d", len(slots), pv.MaxRank)
		}
		for _, s := range g.structures(slots, moms[1:]) {
			c, err := red.Coefficient(s.idx)
			if err != nil {
				return expr.Expr{}, err
			}
			if c.IsZero() {
				continue
			}
			x, err := expr.FromTerm(base).Mul(s.e)
			if err != nil {
				return expr.Expr{}, err
			}
			if x, err = x.Mul(c); err != nil {
				return expr.Expr{}, err
			}
			out = out.Add(x)
		}
	}
	return out, nil
}

// reducer returns the (cached) Passarino–Veltman reducer of the kinematics.
func (g *generalReducer) reducer(moms []expr.Mom, m2 []expr.RatFunc) (*pv.Reducer, error) {
	n := len(moms)
	pairs := [][][2]int{2: {{0, 1}}, 3: {{0, 1}, {1, 2}, {0, 2}}, 4: {{0, 1}, {1, 2}, {2, 3}, {0, 3}, {0, 2}, {1, 3}}}[n]
	var inv []expr.RatFunc
	var key strings.Builder
	for _, pr := range pairs {
		q := moms[pr[1]].Sub(moms[pr[0]])
		s, err := g.square(q)
		if err != nil {
			return nil, err
		}
		inv = append(inv, s)
		key.WriteString(s.String() + ";")
	}
	for _, m := range m2 {
		key.WriteString(m.String() + ";")
	}
	g.mu.Lock()
	defer g.mu.Unlock()
	if r, ok := g.reducers[key.String()]; ok {
		return r, nil
	}
	kin, err := pv.NewKinematics(inv, m2)
	if err != nil {
		return nil, err
	}
	r := pv.NewReducer(kin)
	g.reducers[key.String()] = r
	return r, nil
}

// square returns q² through the caller's scalar products.
func (g *generalReducer) square(q expr.Mom) (expr.RatFunc, error) {
	s := expr.RFInt(0)
	for _, a := range q {
		for _, b := range q {
			v, err := g.dot(a.Name, b.Name)
			if err != nil {
				return expr.RatFunc{}, err
			}
			s = s.Add(v.Scale(new(big.Rat).Mul(a.Coef, b.Coef)))
		}
	}
	return s, nil
}

// genStructure is the sum of the symmetric tensor structures of one coefficient index.
type genStructure struct {
	idx []int
	e   expr.Expr
}

// structures returns, for the slots (index names) and the momenta P_1 … P_{N−1}, the sum of
// tensor structures of every coefficient index: all ways of pairing slots into metrics and
// giving the other slots a momentum, grouped by the index they belong to.
func (g *generalReducer) structures(slots []string, moms []expr.Mom) []genStructure {
	var key strings.Builder
	key.WriteString(strings.Join(slots, ","))
	for _, m := range moms {
		key.WriteString("|" + m.String())
	}
	g.mu.Lock()
	if s, ok := g.structs[key.String()]; ok {
		g.mu.Unlock()
		return s
	}
	g.mu.Unlock()
	acc := map[string]*genStructure{}
	var order []string
	used := make([]bool, len(slots))
	var rec func(cur expr.Expr, zeros int, counts []int)
	rec = func(cur expr.Expr, zeros int, counts []int) {
		s := slices.Index(used, false)
		if s < 0 {
			var idx []int
			for range zeros {
				idx = append(idx, 0)
			}
			for i, c := range counts {
				for range c {
					idx = append(idx, i+1)
				}
			}
			kk := fmt.Sprint(idx)
			st, ok := acc[kk]
			if !ok {
				st = &genStructure{idx: idx}
				acc[kk] = st
				order = append(order, kk)
			}
			st.e = st.e.Add(cur)
			return
		}
		used[s] = true
		for i, P := range moms { // slot s carries P_{i+1}
			v := expr.Zero()
			for _, t := range P {
				v = v.Add(expr.FromAtom(expr.Vec{P: t.Name, Mu: slots[s]}, 1).Scale(expr.RFRat(t.Coef)))
			}
			c := slices.Clone(counts)
			c[i]++
			rec(cur.MustMul(v), zeros, c)
		}
		for u := s + 1; u < len(slots); u++ { // slot s paired with u
			if used[u] {
				continue
			}
			used[u] = true
			rec(cur.MustMul(expr.FromAtom(expr.NewMetric(slots[s], slots[u]), 1)), zeros+2, counts)
			used[u] = false
		}
		used[s] = false
	}
	rec(expr.Int(1), 0, make([]int, len(moms)))
	out := make([]genStructure, 0, len(order))
	for _, kk := range order {
		out = append(out, *acc[kk])
	}
	g.mu.Lock()
	g.structs[key.String()] = out
	g.mu.Unlock()
	return out
}

// SubstMomentum replaces the momentum name p by the combination by everywhere in e (scalar
// products, vector components, Levi-Civita slots, slashes in chains and traces, propagator
// momenta); by may contain p itself (a shift p → p + P). Open Dirac strings are not rewritten:
// a slash of p in one is an error.
func SubstMomentum(e expr.Expr, p string, by expr.Mom) (expr.Expr, error) {
	for _, t := range e.Terms() {
		for _, el := range t.NC {
			if el.Op == expr.NCSlash && el.Args[0] == p {
				return expr.Expr{}, fmt.Errorf("SubstMomentum: slash(%s) in an open Dirac string", p)
			}
		}
	}
	vec := func(mu string) expr.Expr {
		v := expr.Zero()
		for _, t := range by {
			v = v.Add(expr.FromAtom(expr.Vec{P: t.Name, Mu: mu}, 1).Scale(expr.RFRat(t.Coef)))
		}
		return v
	}
	return e.MapAtoms(func(a expr.Atom) (expr.Expr, bool) {
		switch x := a.(type) {
		case expr.Dot:
			if x.A != p && x.B != p {
				return expr.Expr{}, false
			}
			ma, mb := expr.MomOf(x.A), expr.MomOf(x.B)
			if x.A == p {
				ma = by
			}
			if x.B == p {
				mb = by
			}
			return dotMom(ma, mb), true
		case expr.Vec:
			if x.P != p {
				return expr.Expr{}, false
			}
			return vec(x.Mu), true
		case expr.Prop:
			c := x.K.Coef(p)
			if c.Sign() == 0 {
				return expr.Expr{}, false
			}
			K := x.K.Sub(expr.MomOf(p).Scale(c)).Add(by.Scale(c))
			return expr.FromAtom(expr.NewProp(K, x.M2), 1), true
		case expr.Levi:
			has := false
			for _, s := range x.S {
				if !s.Index && s.Name == p {
					has = true
				}
			}
			if !has {
				return expr.Expr{}, false
			}
			res := expr.Zero()
			var rec func(i int, s [4]expr.Slot, c *big.Rat)
			rec = func(i int, s [4]expr.Slot, c *big.Rat) {
				if i == 4 {
					l, sign := expr.NewLevi(s)
					if sign != 0 {
						res = res.Add(expr.FromAtom(l, 1).Scale(expr.RFRat(new(big.Rat).Mul(c, big.NewRat(int64(sign), 1)))))
					}
					return
				}
				if s[i].Index || s[i].Name != p {
					rec(i+1, s, c)
					return
				}
				for _, t := range by {
					s2 := s
					s2[i] = expr.Slot{Name: t.Name}
					rec(i+1, s2, new(big.Rat).Mul(c, t.Coef))
				}
			}
			rec(0, x.S, big.NewRat(1, 1))
			return res, true
		case expr.Chain, expr.Trace:
			elems, rebuild, _ := stringOf(x)
			if !slices.ContainsFunc(elems, func(el expr.NC) bool { return el.Op == expr.NCSlash && el.Args[0] == p }) {
				return expr.Expr{}, false
			}
			res := expr.Zero()
			var rec func(i int, cur []expr.NC, c *big.Rat)
			rec = func(i int, cur []expr.NC, c *big.Rat) {
				if i == len(elems) {
					res = res.Add(expr.FromAtom(rebuild(slices.Clone(cur)), 1).Scale(expr.RFRat(c)))
					return
				}
				el := elems[i]
				if el.Op != expr.NCSlash || el.Args[0] != p {
					rec(i+1, append(slices.Clone(cur), el), c)
					return
				}
				for _, t := range by {
					rec(i+1, append(slices.Clone(cur), expr.NC{Op: expr.NCSlash, Args: []string{t.Name}}), new(big.Rat).Mul(c, t.Coef))
				}
			}
			rec(0, nil, big.NewRat(1, 1))
			return res, true
		}
		return expr.Expr{}, false
	})
}
