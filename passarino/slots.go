package passarino

import (
	"fmt"
	"math/big"
	"slices"

	"loopmatch/expr"
)

// slotted is a term whose loop-momentum occurrences are replaced by Lorentz indices, the slots
// of a tensor integral.
type slotted struct {
	term expr.Term // the term with its loop momenta replaced (no loop list)
	idx  []string  // the index of each slot
	mom  []string  // the loop momentum of each slot
	zero bool      // the term vanishes (a Levi-Civita symbol with two equal slots)
}

// openSlots replaces every occurrence of a loop momentum (isLoop) in the numerator of t by a
// fresh Lorentz index: p·k → p^i, k^μ → the slot μ, a Levi-Civita slot k → i, slash(k) in chains,
// traces and open Dirac strings → γ^i, and, with squares, k·k → g(i, j) with two slots. Other
// scalar products of loop momenta and the propagators stay as they are. This is the one place
// where the one-loop vacuum, the multi-loop vacuum and the general reductions open a numerator.
func openSlots(t expr.Term, isLoop func(string) bool, squares bool) (slotted, error) {
	isSlash := func(el expr.NC) bool { return el.Op == expr.NCSlash && isLoop(el.Args[0]) }
	// Count the slots, for fresh index names, and reject what cannot be opened.
	n := 0
	for _, a := range t.Atoms {
		switch x := a.A.(type) {
		case expr.Dot:
			open := 0
			switch {
			case isLoop(x.A) != isLoop(x.B):
				open = 1
			case squares && x.A == x.B && isLoop(x.A):
				open = 2
			}
			if open > 0 && a.Pow < 0 {
				return slotted{}, fmt.Errorf("%s in a denominator", x.Key())
			}
			n += open * max(a.Pow, 0)
		case expr.Vec:
			if isLoop(x.P) {
				n += a.Pow
			}
		case expr.Levi:
			for _, s := range x.S {
				if !s.Index && isLoop(s.Name) {
					n++
				}
			}
		case expr.Chain, expr.Trace:
			elems, _, _ := stringOf(x)
			if m := len(slices.DeleteFunc(slices.Clone(elems), func(el expr.NC) bool { return !isSlash(el) })); m > 0 {
				if a.Pow != 1 {
					return slotted{}, fmt.Errorf("a power of %s depends on the loop momentum; write the factors separately", x.Key())
				}
				n += m
			}
		}
	}
	for _, el := range t.NC {
		if isSlash(el) {
			n++
		}
	}
	fresh := freshIndices(t, n)
	var s slotted
	take := func(p string) string {
		i := fresh[len(s.idx)]
		s.idx = append(s.idx, i)
		s.mom = append(s.mom, p)
		return i
	}
	nt := expr.Term{Coef: t.Coef}
	for _, a := range t.Atoms {
		switch x := a.A.(type) {
		case expr.Dot:
			if isLoop(x.A) != isLoop(x.B) {
				lp, other := x.A, x.B
				if isLoop(x.B) {
					lp, other = x.B, x.A
				}
				for range a.Pow {
					nt.Atoms = append(nt.Atoms, expr.AtomPow{A: expr.Vec{P: other, Mu: take(lp)}, Pow: 1})
				}
				continue
			}
			if squares && x.A == x.B && isLoop(x.A) {
				for range a.Pow {
					i, j := take(x.A), take(x.A)
					nt.Atoms = append(nt.Atoms, expr.AtomPow{A: expr.NewMetric(i, j), Pow: 1})
				}
				continue
			}
		case expr.Vec:
			if isLoop(x.P) {
				for range a.Pow {
					s.idx = append(s.idx, x.Mu)
					s.mom = append(s.mom, x.P)
				}
				continue
			}
		case expr.Levi:
			sl := x.S // an array: a copy
			changed := false
			for i := range sl {
				if !sl[i].Index && isLoop(sl[i].Name) {
					sl[i] = expr.Slot{Name: take(sl[i].Name), Index: true}
					changed = true
				}
			}
			if changed {
				l, sign := expr.NewLevi(sl)
				if sign == 0 {
					return slotted{zero: true}, nil
				}
				nt.Coef = nt.Coef.Scale(big.NewRat(int64(sign), 1))
				nt.Atoms = append(nt.Atoms, expr.AtomPow{A: l, Pow: a.Pow})
				continue
			}
		case expr.Chain, expr.Trace:
			orig, rebuild, _ := stringOf(x)
			if slices.ContainsFunc(orig, isSlash) {
				nt.Atoms = append(nt.Atoms, expr.AtomPow{A: rebuild(openString(orig, isSlash, take)), Pow: 1})
				continue
			}
		}
		nt.Atoms = append(nt.Atoms, a)
	}
	nt.NC = openString(t.NC, isSlash, take)
	s.term = nt
	return s, nil
}

// openString replaces the loop-momentum slashes of a Dirac string by γ matrices with fresh
// indices.
func openString(elems []expr.NC, isSlash func(expr.NC) bool, take func(string) string) []expr.NC {
	if !slices.ContainsFunc(elems, isSlash) {
		return elems
	}
	out := slices.Clone(elems)
	for i, el := range out {
		if isSlash(el) {
			out[i] = expr.NC{Op: expr.NCGamma, Args: []string{take(el.Args[0])}}
		}
	}
	return out
}
