package expr

import "slices"

// This file contracts repeated Lorentz indices inside a term: g(mu, mu) = d, g(mu, nu) renames
// the other occurrence of mu, p[mu] q[mu] = p.q, p[mu] levi(mu, …) = levi(p, …) and
// p[mu] gamma(mu) = slash(p) inside Dirac strings. Gamma-matrix identities (γ^mu γ_mu = d, …)
// belong to expr/dirac.

// DimSymbol is the symbol of the space-time dimension d = 4 − 2ε.
const DimSymbol = "d"

// indexed reports whether an atom carries Lorentz indices.
func indexed(a Atom) bool {
	switch x := a.(type) {
	case Vec, Metric:
		return true
	case Levi:
		for _, s := range x.S {
			if s.Index {
				return true
			}
		}
	case Chain:
		return len(ncIndices(x.Elems)) > 0
	case Trace:
		return len(ncIndices(x.Elems)) > 0
	}
	return false
}

func hasIndices(t Term) bool {
	for _, a := range t.Atoms {
		if indexed(a.A) {
			return true
		}
	}
	for _, n := range t.NC {
		if n.Op == NCGamma || n.Op == NCSigma {
			return true
		}
	}
	return false
}

// Indices returns the Lorentz indices of an atom or element, with multiplicity.
func atomIndices(a Atom) []string {
	switch x := a.(type) {
	case Vec:
		return []string{x.Mu}
	case Metric:
		return []string{x.Mu, x.Nu}
	case Levi:
		var out []string
		for _, s := range x.S {
			if s.Index {
				out = append(out, s.Name)
			}
		}
		return out
	case Chain:
		return ncIndices(x.Elems)
	case Trace:
		return ncIndices(x.Elems)
	}
	return nil
}

func ncIndices(elems []NC) []string {
	var out []string
	for _, e := range elems {
		if e.Op == NCGamma || e.Op == NCSigma {
			out = append(out, e.Args...)
		}
	}
	return out
}

// FreeIndices returns the Lorentz indices that occur once in the term, sorted.
func (t Term) FreeIndices() []string {
	cnt := map[string]int{}
	for _, a := range t.Atoms {
		for _, i := range atomIndices(a.A) {
			cnt[i] += max(a.Pow, 1)
		}
	}
	for _, i := range ncIndices(t.NC) {
		cnt[i]++
	}
	var out []string
	for i, c := range cnt {
		if c == 1 {
			out = append(out, i)
		}
	}
	slices.Sort(out)
	return out
}

// renameIndex replaces the index old by nu in an atom.
func renameIndex(a Atom, old, nu string) (Atom, int) {
	switch x := a.(type) {
	case Vec:
		if x.Mu == old {
			return Vec{x.P, nu}, 1
		}
	case Metric:
		m, n := x.Mu, x.Nu
		if m == old {
			m = nu
		} else if n == old {
			n = nu
		}
		return NewMetric(m, n), 1
	case Levi:
		s := x.S
		for i := range s {
			if s[i].Index && s[i].Name == old {
				s[i].Name = nu
			}
		}
		l, sign := NewLevi(s)
		return l, sign
	case Chain:
		return NewChain(renameNC(x.Elems, old, nu)), 1
	case Trace:
		return NewTrace(renameNC(x.Elems, old, nu)), 1
	}
	return a, 1
}

func renameNC(elems []NC, old, nu string) []NC {
	out := make([]NC, len(elems))
	for i, e := range elems {
		if e.Op == NCGamma || e.Op == NCSigma {
			args := append([]string{}, e.Args...)
			for j := range args {
				if args[j] == old {
					args[j] = nu
				}
			}
			e = NC{Op: e.Op, Args: args}
		}
		out[i] = e
	}
	return out
}

// slashIn replaces gamma(mu) by slash(p) in a string; ok reports a replacement.
func slashIn(elems []NC, mu, p string) ([]NC, bool) {
	for i, e := range elems {
		if e.Op == NCGamma && e.Args[0] == mu {
			out := append([]NC{}, elems...)
			out[i] = NC{Op: NCSlash, Args: []string{p}}
			return out, true
		}
	}
	return elems, false
}

// contract applies the contraction rules until none applies. ok is false when the term
// vanishes (e.g. a Levi-Civita symbol with two equal slots).
func contract(t Term) (Term, bool) {
	// Expand positive powers of indexed atoms into separate factors.
	var fs []Atom
	var rest []AtomPow
	for _, a := range t.Atoms {
		if indexed(a.A) && a.Pow > 0 {
			for range a.Pow {
				fs = append(fs, a.A)
			}
			continue
		}
		rest = append(rest, a)
	}
	nc := t.NC
	coef := t.Coef
	d := RFVar(DimSymbol)
	for changed := true; changed; {
		changed = false
		// Count index holders.
		type loc struct{ f int } // f ≥ 0: factor index; f = −1: open string
		where := map[string][]loc{}
		for i, f := range fs {
			for _, mu := range atomIndices(f) {
				where[mu] = append(where[mu], loc{i})
			}
		}
		for _, mu := range ncIndices(nc) {
			where[mu] = append(where[mu], loc{-1})
		}
		names := make([]string, 0, len(where))
		for mu := range where {
			names = append(names, mu)
		}
		slices.Sort(names) // deterministic order, so equal inputs give equal outputs
		for _, mu := range names {
			ls := where[mu]
			if len(ls) != 2 {
				continue
			}
			a, b := ls[0].f, ls[1].f
			// g(mu, mu) = d
			if a == b && a >= 0 {
				if g, ok := fs[a].(Metric); ok && g.Mu == g.Nu {
					coef = coef.Mul(d)
					fs = append(fs[:a], fs[a+1:]...)
					changed = true
					break
				}
				continue
			}
			// Metric with another holder: rename.
			if a >= 0 && isMetric(fs[a]) || b >= 0 && isMetric(fs[b]) {
				gi, oi := a, b
				if !(gi >= 0 && isMetric(fs[gi])) {
					gi, oi = b, a
				}
				g := fs[gi].(Metric)
				other := g.Nu
				if g.Nu == mu {
					other = g.Mu
				}
				if oi >= 0 {
					na, sign := renameIndex(fs[oi], mu, other)
					if sign == 0 {
						return Term{}, false
					}
					if sign < 0 {
						coef = coef.Neg()
					}
					fs[oi] = na
				} else {
					nc = renameNC(nc, mu, other)
				}
				fs = append(fs[:gi], fs[gi+1:]...)
				changed = true
				break
			}
			// Vector with another holder.
			vi, oi := a, b
			if !(vi >= 0 && isVec(fs[vi])) {
				vi, oi = b, a
			}
			if !(vi >= 0 && isVec(fs[vi])) {
				continue
			}
			v := fs[vi].(Vec)
			if oi < 0 {
				if out, ok := slashIn(nc, mu, v.P); ok {
					nc = out
					fs = append(fs[:vi], fs[vi+1:]...)
					changed = true
					break
				}
				continue
			}
			switch o := fs[oi].(type) {
			case Vec:
				fs[vi] = NewDot(v.P, o.P)
				fs = append(fs[:oi], fs[oi+1:]...)
				changed = true
			case Levi:
				s := o.S
				for i := range s {
					if s[i].Index && s[i].Name == mu {
						s[i] = Slot{Name: v.P}
					}
				}
				l, sign := NewLevi(s)
				if sign == 0 {
					return Term{}, false
				}
				if sign < 0 {
					coef = coef.Neg()
				}
				fs[oi] = l
				fs = append(fs[:vi], fs[vi+1:]...)
				changed = true
			case Chain:
				if out, ok := slashIn(o.Elems, mu, v.P); ok {
					fs[oi] = NewChain(out)
					fs = append(fs[:vi], fs[vi+1:]...)
					changed = true
				}
			case Trace:
				if out, ok := slashIn(o.Elems, mu, v.P); ok {
					fs[oi] = NewTrace(out)
					fs = append(fs[:vi], fs[vi+1:]...)
					changed = true
				}
			}
			if changed {
				break
			}
		}
	}
	atoms := rest
	for _, f := range fs {
		atoms = append(atoms, AtomPow{f, 1})
	}
	atoms, coef, ok := mergeAtoms(atoms, coef)
	if !ok {
		return Term{}, false
	}
	t.Atoms, t.NC, t.Coef = atoms, nc, coef
	return t, true
}

func isMetric(a Atom) bool { _, ok := a.(Metric); return ok }
func isVec(a Atom) bool    { _, ok := a.(Vec); return ok }
