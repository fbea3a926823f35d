package dirac

import (
	"slices"
	"strings"

	"loopmatch/expr"
)

// rename gives the contracted indices of every term canonical names: the atoms are ordered by
// their text with contracted names masked, the contracted names are numbered in order of first
// appearance, and the k-th one gets the k-th name of the pool (the sorted contracted names of
// the input plus Options.Dummies; adjoint colour indices likewise). The names are the input's
// own, so the canonical text still parses, and equal structures with different dummy names
// print equally.
func (s *simplifier) rename(e expr.Expr) (expr.Expr, error) {
	changed := false
	parts := make([]expr.Expr, 0, e.Len())
	for _, t := range e.Terms() {
		nt, ok := s.renameTerm(t)
		if ok {
			changed = true
			parts = append(parts, nt)
			continue
		}
		parts = append(parts, expr.FromTerm(t))
	}
	if !changed {
		return e, nil
	}
	return expr.Sum(parts...), nil
}

func (s *simplifier) renameTerm(t expr.Term) (expr.Expr, bool) {
	lc, cc := termIndexCounts(t)
	isDummy := func(n string) bool { return lc[n] >= 2 }
	isCDummy := func(n string) bool { return cc[n] >= 2 }
	if !hasAny(lc, 2) && !hasAny(cc, 2) {
		return expr.Expr{}, false
	}
	// adjoint deltas take part in the colour renaming
	for _, a := range t.Atoms {
		if c, ok := a.A.(expr.Colour); ok && c.Name == "delta" && (cc[c.Args[0]] > 0 || cc[c.Args[1]] > 0) {
			for _, x := range c.Args {
				cc[x]++
			}
		}
	}
	type item struct {
		masked string
		a      expr.AtomPow
	}
	items := make([]item, len(t.Atoms))
	for i, a := range t.Atoms {
		items[i] = item{maskedKey(a.A, isDummy, isCDummy), a}
	}
	slices.SortStableFunc(items, func(x, y item) int {
		if c := strings.Compare(x.masked, y.masked); c != 0 {
			return c
		}
		return strings.Compare(x.a.A.Key(), y.a.A.Key())
	})
	lmap, cmap := map[string]string{}, map[string]string{}
	ln, cn := 0, 0
	assign := func(n string, colour bool) {
		if colour {
			if _, ok := cmap[n]; !ok && isCDummy(n) && cn < len(s.cpool) {
				cmap[n] = s.cpool[cn]
				cn++
			}
			return
		}
		if _, ok := lmap[n]; !ok && isDummy(n) && ln < len(s.pool) {
			lmap[n] = s.pool[ln]
			ln++
		}
	}
	for _, it := range items {
		switch x := it.a.A.(type) {
		case expr.Chain:
			for _, el := range x.Elems {
				switch el.Op {
				case expr.NCGamma, expr.NCSigma:
					for _, a := range el.Args {
						assign(a, false)
					}
				case expr.NCT:
					assign(el.Args[0], true)
				}
			}
		case expr.Levi:
			for _, sl := range x.S {
				if sl.Index {
					assign(sl.Name, false)
				}
			}
		case expr.Vec:
			assign(x.Mu, false)
		case expr.Metric:
			assign(x.Mu, false)
			assign(x.Nu, false)
		case expr.Colour:
			for _, a := range x.Args {
				assign(a, true)
			}
		}
	}
	identity := true
	for k, v := range lmap {
		identity = identity && k == v
	}
	for k, v := range cmap {
		identity = identity && k == v
	}
	if identity {
		return expr.Expr{}, false
	}
	lm := func(n string) string {
		if v, ok := lmap[n]; ok {
			return v
		}
		return n
	}
	cm := func(n string) string {
		if v, ok := cmap[n]; ok {
			return v
		}
		return n
	}
	coef := t.Coef
	atoms := make([]expr.AtomPow, 0, len(t.Atoms))
	for _, a := range t.Atoms {
		switch x := a.A.(type) {
		case expr.Chain:
			el := make([]expr.NC, len(x.Elems))
			for i, e := range x.Elems {
				switch e.Op {
				case expr.NCGamma, expr.NCSigma:
					args := make([]string, len(e.Args))
					for j, n := range e.Args {
						args[j] = lm(n)
					}
					e = expr.NC{Op: e.Op, Args: args}
				case expr.NCT:
					e = expr.NC{Op: e.Op, Args: []string{cm(e.Args[0])}}
				}
				el[i] = e
			}
			atoms = append(atoms, expr.AtomPow{A: expr.NewChain(el), Pow: a.Pow})
		case expr.Levi:
			sl := x.S
			for i := range sl {
				if sl[i].Index {
					sl[i].Name = lm(sl[i].Name)
				}
			}
			l, sign := expr.NewLevi(sl)
			if sign == 0 {
				return expr.Zero(), true
			}
			if sign < 0 && a.Pow%2 != 0 {
				coef = coef.Neg()
			}
			atoms = append(atoms, expr.AtomPow{A: l, Pow: a.Pow})
		case expr.Vec:
			atoms = append(atoms, expr.AtomPow{A: expr.Vec{P: x.P, Mu: lm(x.Mu)}, Pow: a.Pow})
		case expr.Metric:
			atoms = append(atoms, expr.AtomPow{A: expr.NewMetric(lm(x.Mu), lm(x.Nu)), Pow: a.Pow})
		case expr.Colour:
			if x.Name == "f" {
				c, sign := expr.NewStructureF(cm(x.Args[0]), cm(x.Args[1]), cm(x.Args[2]))
				if sign == 0 {
					return expr.Zero(), true
				}
				if sign < 0 && a.Pow%2 != 0 {
					coef = coef.Neg()
				}
				atoms = append(atoms, expr.AtomPow{A: c, Pow: a.Pow})
			} else {
				atoms = append(atoms, expr.AtomPow{A: expr.NewDelta(cm(x.Args[0]), cm(x.Args[1])), Pow: a.Pow})
			}
		default:
			atoms = append(atoms, a)
		}
	}
	return expr.FromTerm(expr.Term{Coef: coef, Atoms: atoms, Loops: t.Loops}), true
}

func hasAny(m map[string]int, n int) bool {
	for _, v := range m {
		if v >= n {
			return true
		}
	}
	return false
}

// maskedKey is the atom's text with contracted names replaced by a placeholder.
func maskedKey(a expr.Atom, dummy, cdummy func(string) bool) string {
	m := func(n string, colour bool) string {
		if colour && cdummy(n) || !colour && dummy(n) {
			return "·"
		}
		return n
	}
	switch x := a.(type) {
	case expr.Chain:
		parts := make([]string, len(x.Elems))
		for i, e := range x.Elems {
			switch e.Op {
			case expr.NCGamma, expr.NCSigma:
				args := make([]string, len(e.Args))
				for j, n := range e.Args {
					args[j] = m(n, false)
				}
				parts[i] = expr.NC{Op: e.Op, Args: args}.Key()
			case expr.NCT:
				parts[i] = "T(" + m(e.Args[0], true) + ")"
			default:
				parts[i] = e.Key()
			}
		}
		return "9" + strings.Join(parts, " ")
	case expr.Levi:
		parts := make([]string, 4)
		for i, sl := range x.S {
			if sl.Index {
				parts[i] = m(sl.Name, false)
			} else {
				parts[i] = sl.Name
			}
		}
		return "5levi(" + strings.Join(parts, ",") + ")"
	case expr.Colour:
		parts := make([]string, len(x.Args))
		for i, n := range x.Args {
			parts[i] = m(n, true)
		}
		return "7" + x.Name + "(" + strings.Join(parts, ",") + ")"
	}
	return "0" + a.Key()
}
