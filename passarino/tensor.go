package passarino

import (
	"fmt"
	"math/big"
	"slices"

	"loopmatch/expr"
	"loopmatch/loops/vacuum"
)

// This file reduces one-loop vacuum tensor integrals: every occurrence of the loop momentum k in
// the numerator (k·X, k[mu], slash(k) in a chain, k in a Levi-Civita slot) becomes k^{i_s} with a
// fresh index i_s, and
//
//	∫ k^{i_1} … k^{i_2n} f(k²) = (k²)^n Σ_{pairings} g^{i_a i_b} … / [d(d+2)…(d+2n−2)] ∫ f(k²),
//
// odd ranks vanish (symmetric integration). The contractions of the fresh indices with the rest
// of the term are done by expr's canonical form (g(i, j) renames, p[i] q[i] = p.q, p[i] in a
// chain becomes slash(p)); gamma(i) … gamma(i) pairs inside chains are left for the Dirac algebra.

// stringOf returns the matrices of a chain or a trace and how to rebuild the atom from new ones.
func stringOf(a expr.Atom) ([]expr.NC, func([]expr.NC) expr.Atom, bool) {
	switch x := a.(type) {
	case expr.Chain:
		return x.Elems, func(e []expr.NC) expr.Atom { return expr.NewChain(e) }, true
	case expr.Trace:
		return x.Elems, func(e []expr.NC) expr.Atom { return expr.NewTrace(e) }, true
	}
	return nil, nil, false
}

// freshIndices returns n index names that do not occur in the term.
func freshIndices(t expr.Term, n int) []string {
	used := map[string]bool{}
	for _, a := range t.Atoms {
		switch x := a.A.(type) {
		case expr.Vec:
			used[x.Mu] = true
		case expr.Metric:
			used[x.Mu], used[x.Nu] = true, true
		case expr.Levi:
			for _, s := range x.S {
				used[s.Name] = true
			}
		case expr.Chain, expr.Trace:
			elems, _, _ := stringOf(x)
			for _, e := range elems {
				for _, arg := range e.Args {
					used[arg] = true
				}
			}
		}
	}
	var out []string
	for i := 1; len(out) < n; i++ {
		name := fmt.Sprintf("ix%d", i)
		if !used[name] {
			out = append(out, name)
		}
	}
	return out
}

// pairings calls f for every perfect matching of the slots 0 … 2n−1.
func pairings(slots []int, f func(pairs [][2]int)) {
	var rec func(rest []int, acc [][2]int)
	rec = func(rest []int, acc [][2]int) {
		if len(rest) == 0 {
			f(acc)
			return
		}
		a := rest[0]
		for i := 1; i < len(rest); i++ {
			b := rest[i]
			next := make([]int, 0, len(rest)-2)
			next = append(next, rest[1:i]...)
			next = append(next, rest[i+1:]...)
			rec(next, append(acc, [2]int{a, b}))
		}
	}
	rec(slots, nil)
}

// maxRank bounds the tensor rank of a vacuum integral ((2n−1)!! pairings).
const maxRank = 12

// ReduceVacuum reduces every loop term of e whose propagators depend on loop momenta only:
// one-loop terms to Tad masters, two-loop terms to Tad·Tad products and the sunset master, exact
// in d, times the loop factors (i/(16π²) per loop). Terms without loops pass through unchanged.
func ReduceVacuum(e expr.Expr) (expr.Expr, vacuum.Info, error) {
	var info vacuum.Info
	var out []expr.Expr
	measure := expr.FromAtom(expr.I, 1).MustMul(expr.FromAtom(expr.Pi, -2)).Scale(expr.RFRat(big.NewRat(1, 16)))
	for _, t := range e.Terms() {
		if len(t.Loops) == 0 {
			out = append(out, expr.FromTerm(t))
			continue
		}
		if len(t.Loops) > 1 {
			r, ti, err := reduceMultiLoopTerm(t, t.Loops)
			if err != nil {
				return expr.Expr{}, info, err
			}
			info.Merge(ti)
			out = append(out, r) // the two-loop measure is included
			continue
		}
		k := t.Loops[0]
		r, ti, err := reduceVacuumTerm(t, k, vacuum.Loop1)
		if err != nil {
			return expr.Expr{}, info, err
		}
		info.Merge(ti)
		out = append(out, r.MustMul(measure))
	}
	return expr.Sum(out...), info, nil
}

// scalarFunc evaluates the scalar vacuum integral ∫ (k²)^a / Π (k² − M_i²)^{n_i}.
type scalarFunc func(a int, lines []vacuum.Line) (expr.Expr, vacuum.Info, error)

// reduceVacuumTerm reduces the tensor structure of one term and evaluates its scalar integral
// with scalar (without the factor i/(16π²)).
func reduceVacuumTerm(t expr.Term, k string, scalarInt scalarFunc) (expr.Expr, vacuum.Info, error) {
	var info vacuum.Info
	// The propagators and the powers of k² go to the scalar integral; the other occurrences of k
	// become slots.
	ksq := 0
	var lines []vacuum.Line
	for _, a := range t.Atoms {
		switch x := a.A.(type) {
		case expr.Prop:
			if x.K.Coef(k).Sign() == 0 {
				continue
			}
			if !x.K.Equal(expr.MomOf(k)) {
				return expr.Expr{}, info, fmt.Errorf("propagator %s still depends on external momenta; expand it first", x.Key())
			}
			lines = append(lines, vacuum.Line{M2: x.M2, Pow: -a.Pow})
		case expr.Dot:
			if x.A == k && x.B == k {
				ksq += a.Pow
			}
		}
	}
	sl, err := openSlots(t, func(p string) bool { return p == k }, false)
	if err != nil {
		return expr.Expr{}, info, err
	}
	rank := len(sl.idx)
	if sl.zero || rank%2 == 1 {
		return expr.Zero(), info, nil
	}
	if rank > maxRank {
		return expr.Expr{}, info, fmt.Errorf("tensor rank %d exceeds the limit %d", rank, maxRank)
	}
	slotIdx := sl.idx
	nt := sl.term
	nt.Atoms = slices.DeleteFunc(slices.Clone(nt.Atoms), func(a expr.AtomPow) bool {
		switch x := a.A.(type) {
		case expr.Prop:
			return x.K.Coef(k).Sign() != 0
		case expr.Dot:
			return x.A == k && x.B == k
		}
		return false
	})
	base := expr.FromTerm(nt)
	// Symmetric tensor: Σ over pairings of metrics.
	sym := expr.Zero()
	slots := make([]int, len(slotIdx))
	for i := range slots {
		slots[i] = i
	}
	var perr error
	pairings(slots, func(pairs [][2]int) {
		g := expr.Int(1)
		for _, p := range pairs {
			m, err := g.Mul(expr.FromAtom(expr.NewMetric(slotIdx[p[0]], slotIdx[p[1]]), 1))
			if err != nil {
				perr = err
				return
			}
			g = m
		}
		sym = sym.Add(g)
	})
	if perr != nil {
		return expr.Expr{}, info, perr
	}
	n := rank / 2
	den := expr.RFInt(1)
	d := expr.RFVar(expr.DimSymbol)
	for j := 0; j < n; j++ {
		den = den.Mul(d.Add(expr.RFInt(int64(2 * j))))
	}
	inv, _ := den.Inv()
	tens, err := base.Mul(sym)
	if err != nil {
		return expr.Expr{}, info, err
	}
	scalar, vinfo, err := scalarInt(ksq+n, lines)
	if err != nil {
		return expr.Expr{}, info, err
	}
	info.Merge(vinfo)
	res, err := tens.Mul(scalar)
	if err != nil {
		return expr.Expr{}, info, err
	}
	return res.Scale(inv), info, nil
}
