package match

import (
	"fmt"
	"math/big"
	"slices"
	"strings"

	"loopmatch/expr"
	"loopmatch/expr/notation"
)

// Kinematics holds the scalar-product rules that follow from the external legs: every leg is on
// its mass shell (P² = m²) and the polarisation vector of a gauge boson is transverse (ε·P = 0).
// The rules eliminate as many scalar products as these linear relations determine — squares
// first, then mixed products in name order — and leave the rest as independent invariants.
type Kinematics struct {
	Legs  []*notation.Leg
	rules map[expr.Dot]expr.Expr
	free  []expr.Dot
}

// dotKey orders unknowns: squares before mixed products, then by name.
func dotLess(a, b expr.Dot) int {
	sa, sb := a.A == a.B, b.A == b.B
	if sa != sb {
		if sa {
			return -1
		}
		return 1
	}
	return strings.Compare(a.Key(), b.Key())
}

// NewKinematics derives the rules for the legs.
func NewKinematics(legs []*notation.Leg) (*Kinematics, error) {
	type eq struct {
		lhs map[expr.Dot]*big.Rat
		rhs expr.RatFunc
	}
	var eqs []eq
	unknown := map[expr.Dot]bool{}
	add := func(lhs map[expr.Dot]*big.Rat, rhs expr.RatFunc) {
		for d := range lhs {
			unknown[d] = true
		}
		eqs = append(eqs, eq{lhs, rhs})
	}
	for _, l := range legs {
		// P² = m²
		lhs := map[expr.Dot]*big.Rat{}
		for _, a := range l.Mom {
			for _, b := range l.Mom {
				d := expr.NewDot(a.Name, b.Name)
				c := new(big.Rat).Mul(a.Coef, b.Coef)
				if old, ok := lhs[d]; ok {
					c.Add(c, old)
				}
				lhs[d] = c
			}
		}
		m2 := expr.RFInt(0)
		if l.Mass != "" {
			m2 = expr.RFVar(l.Mass).Mul(expr.RFVar(l.Mass))
		}
		add(lhs, m2)
		if l.Pol != "" {
			lhs := map[expr.Dot]*big.Rat{}
			for _, a := range l.Mom {
				lhs[expr.NewDot(l.Pol, a.Name)] = new(big.Rat).Set(a.Coef)
			}
			add(lhs, expr.RFInt(0))
		}
	}
	cols := make([]expr.Dot, 0, len(unknown))
	for d := range unknown {
		cols = append(cols, d)
	}
	slices.SortFunc(cols, dotLess)
	// Gaussian elimination over the rationals (right-hand sides rational functions).
	mat := make([][]*big.Rat, len(eqs))
	rhs := make([]expr.RatFunc, len(eqs))
	for i, e := range eqs {
		mat[i] = make([]*big.Rat, len(cols))
		for j, d := range cols {
			if c, ok := e.lhs[d]; ok {
				mat[i][j] = new(big.Rat).Set(c)
			} else {
				mat[i][j] = new(big.Rat)
			}
		}
		rhs[i] = e.rhs
	}
	pivotOf := map[int]int{} // column → row
	used := make([]bool, len(eqs))
	for j := range cols {
		for i := range mat {
			if used[i] || mat[i][j].Sign() == 0 {
				continue
			}
			inv := new(big.Rat).Inv(mat[i][j])
			for c := range cols {
				mat[i][c].Mul(mat[i][c], inv)
			}
			rhs[i] = rhs[i].Scale(inv)
			for o := range mat {
				if o == i || mat[o][j].Sign() == 0 {
					continue
				}
				f := new(big.Rat).Set(mat[o][j])
				for c := range cols {
					mat[o][c].Sub(mat[o][c], new(big.Rat).Mul(f, mat[i][c]))
				}
				rhs[o] = rhs[o].Sub(rhs[i].Scale(f))
			}
			used[i] = true
			pivotOf[j] = i
			break
		}
	}
	for i := range mat {
		if !used[i] && !rhs[i].IsZero() {
			return nil, fmt.Errorf("the external legs are inconsistent: their on-shell conditions require %s = 0", rhs[i])
		}
	}
	k := &Kinematics{Legs: legs, rules: map[expr.Dot]expr.Expr{}}
	for j, d := range cols {
		i, ok := pivotOf[j]
		if !ok {
			k.free = append(k.free, d)
			continue
		}
		// d = rhs − Σ_{free c} mat[i][c]·c
		r := expr.FromRF(rhs[i])
		for c, dc := range cols {
			if c == j || mat[i][c].Sign() == 0 {
				continue
			}
			r = r.Sub(expr.FromAtom(dc, 1).Scale(expr.RFRat(mat[i][c])))
		}
		k.rules[d] = r
	}
	return k, nil
}

// Free lists the scalar products that stay independent.
func (k *Kinematics) Free() []expr.Dot { return k.free }

// Apply replaces the determined scalar products in e.
func (k *Kinematics) Apply(e expr.Expr) (expr.Expr, error) {
	return e.MapAtoms(func(a expr.Atom) (expr.Expr, bool) {
		d, ok := a.(expr.Dot)
		if !ok {
			return expr.Expr{}, false
		}
		r, ok := k.rules[d]
		return r, ok
	})
}

// Rules returns the substitutions as text, for reports.
func (k *Kinematics) Rules() []string {
	var out []string
	for d, r := range k.rules {
		out = append(out, d.Key()+" = "+r.String())
	}
	slices.Sort(out)
	return out
}
