package dirac

import (
	"fmt"
	"math/big"
	"slices"
	"strings"

	"loopmatch/expr"
)

// Leg is an on-shell external leg: its physical momentum (a combination of momentum names, as
// in the notation's "momentum p - q") and its mass (zero for a massless leg). The spinor kind
// (u, v, ubar, vbar) is read from each chain.
type Leg struct {
	Name string
	Mom  expr.Mom
	Mass expr.RatFunc
	// Coloured marks a leg in the fundamental representation (a quark): a chain between
	// coloured legs carries a colour line even without generators (δ_ij), which Fierz must
	// rearrange too.
	Coloured bool
}

// Kinematics lists the external legs. Every leg is on shell: P² = m², and the Dirac equation
// holds at a chain's ends, (P̸ − m) u(P) = 0, ū(P)(P̸ − m) = 0, (P̸ + m) v(P) = 0,
// v̄(P)(P̸ + m) = 0. Legs of any type may be listed (bosons give P² = m² only).
type Kinematics struct {
	Legs []Leg
}

func (k Kinematics) leg(name string) (Leg, bool) {
	for _, l := range k.Legs {
		if l.Name == name {
			return l, true
		}
	}
	return Leg{}, false
}

// external reports whether a momentum name occurs in a leg momentum.
func (k Kinematics) external(p string) bool {
	for _, l := range k.Legs {
		for _, t := range l.Mom {
			if t.Name == p {
				return true
			}
		}
	}
	return false
}

// comp is one term c·slash(name) of a rewritten slash.
type comp struct {
	name string
	c    *big.Rat
}

// ends describes the spinors of a chain and the slash rewriting that lets the Dirac equation
// act at its ends.
type ends struct {
	left, right       *Leg
	leftSign, rtSign  int // +1 for ubar/u, −1 for vbar/v (the sign of m in the Dirac equation)
	rules             map[string][]comp
	note              string
	leftMom, rightMom expr.Mom
}

// pivots chooses the momentum names eliminated in a chain: the first name (in sorted order) of
// the right leg's momentum P_R, and the first other name that keeps the left leg's momentum P_L
// independent of P_R. Solving P_R, P_L for these names rewrites their slashes as slashes of P_R,
// P_L and of the remaining names; slash(P_R) is then moved to u/v and slash(P_L) to ubar/vbar.
// When P_L is a multiple of P_R (or one end is not a listed leg) only one name is eliminated.
func (e *ends) pivots() {
	e.rules = map[string][]comp{}
	var R, L expr.Mom
	if e.right != nil {
		R = e.right.Mom
	}
	if e.left != nil {
		L = e.left.Mom
	}
	if len(R) == 0 && len(L) == 0 {
		return
	}
	names := unionNames(R, L)
	if len(R) == 0 {
		// only the left end: p_b = (P_L − Σ l_o p_o)/l_b
		b := L[0].Name
		e.rules[b] = solveOne(L, b, pseudoL)
		e.note = fmt.Sprintf("slash(%s) = (slash(P_%s) − …)/%s", b, e.left.Name, L.Coef(b).RatString())
		return
	}
	a := R[0].Name
	ca := R.Coef(a)
	b := ""
	var det *big.Rat
	if len(L) > 0 {
		for _, n := range names {
			if n == a {
				continue
			}
			d := new(big.Rat).Sub(new(big.Rat).Mul(ca, L.Coef(n)), new(big.Rat).Mul(R.Coef(n), L.Coef(a)))
			if d.Sign() != 0 {
				b, det = n, d
				break
			}
		}
	}
	if b == "" {
		e.rules[a] = solveOne(R, a, pseudoR)
		e.note = fmt.Sprintf("slash(%s) rewritten through the momentum of %s", a, e.right.Name)
		return
	}
	// P_R = ca pa + cb pb + Σ r_o p_o,  P_L = la pa + lb pb + Σ l_o p_o
	cb, la, lb := R.Coef(b), L.Coef(a), L.Coef(b)
	inv := new(big.Rat).Inv(det)
	// pa = [lb (P_R − Σ r_o p_o) − cb (P_L − Σ l_o p_o)]/det
	// pb = [ca (P_L − Σ l_o p_o) − la (P_R − Σ r_o p_o)]/det
	mk := func(kR, kL *big.Rat) []comp {
		kR = new(big.Rat).Mul(kR, inv)
		kL = new(big.Rat).Mul(kL, inv)
		var out []comp
		if kR.Sign() != 0 {
			out = append(out, comp{pseudoR, kR})
		}
		if kL.Sign() != 0 {
			out = append(out, comp{pseudoL, kL})
		}
		for _, n := range names {
			if n == a || n == b {
				continue
			}
			c := new(big.Rat).Add(new(big.Rat).Mul(kR, R.Coef(n)), new(big.Rat).Mul(kL, L.Coef(n)))
			c.Neg(c)
			if c.Sign() != 0 {
				out = append(out, comp{n, c})
			}
		}
		return out
	}
	e.rules[a] = mk(lb, new(big.Rat).Neg(cb))
	e.rules[b] = mk(new(big.Rat).Neg(la), ca)
	e.note = fmt.Sprintf("slash(%s), slash(%s) rewritten through the momenta of %s and %s", a, b, e.right.Name, e.left.Name)
}

// solveOne solves P = Σ c_n p_n for p_a: p_a = (P − Σ_{n≠a} c_n p_n)/c_a, with P the pseudo slot.
func solveOne(P expr.Mom, a, pseudo string) []comp {
	inv := new(big.Rat).Inv(P.Coef(a))
	out := []comp{{pseudo, inv}}
	for _, t := range P {
		if t.Name == a {
			continue
		}
		out = append(out, comp{t.Name, new(big.Rat).Neg(new(big.Rat).Mul(t.Coef, inv))})
	}
	return out
}

func unionNames(a, b expr.Mom) []string {
	var out []string
	for _, t := range a {
		out = append(out, t.Name)
	}
	for _, t := range b {
		if !slices.Contains(out, t.Name) {
			out = append(out, t.Name)
		}
	}
	slices.Sort(out)
	return out
}

// DotRule is one on-shell substitution of a scalar product of external momenta.
type DotRule struct {
	Dot   expr.Dot
	Value expr.Expr
}

// onShellRules solves the relations P_l² = m_l² of all legs for scalar products of the external
// momentum names. Columns are ordered squares first (p.p in name order), then mixed products in
// name order, and the system is brought to reduced row-echelon form: each pivot column is
// replaced by the remaining (later) products and masses. The rules are the same for every term,
// so equal structures stay equal.
func onShellRules(k Kinematics) ([]DotRule, error) {
	var names []string
	for _, l := range k.Legs {
		for _, t := range l.Mom {
			if !slices.Contains(names, t.Name) {
				names = append(names, t.Name)
			}
		}
	}
	slices.Sort(names)
	var cols []expr.Dot
	for _, n := range names {
		cols = append(cols, expr.NewDot(n, n))
	}
	for i, a := range names {
		for _, b := range names[i+1:] {
			cols = append(cols, expr.NewDot(a, b))
		}
	}
	col := map[expr.Dot]int{}
	for i, c := range cols {
		col[c] = i
	}
	type row struct {
		a   []*big.Rat
		rhs expr.RatFunc
	}
	var rows []row
	for _, l := range k.Legs {
		if len(l.Mom) == 0 {
			continue
		}
		r := row{a: make([]*big.Rat, len(cols)), rhs: l.Mass.Mul(l.Mass)}
		for i := range r.a {
			r.a[i] = new(big.Rat)
		}
		for _, x := range l.Mom {
			for _, y := range l.Mom {
				j := col[expr.NewDot(x.Name, y.Name)]
				r.a[j].Add(r.a[j], new(big.Rat).Mul(x.Coef, y.Coef))
			}
		}
		rows = append(rows, r)
	}
	// reduced row echelon form
	var pivCols []int
	rank := 0
	for c := 0; c < len(cols) && rank < len(rows); c++ {
		p := -1
		for i := rank; i < len(rows); i++ {
			if rows[i].a[c].Sign() != 0 {
				p = i
				break
			}
		}
		if p < 0 {
			continue
		}
		rows[rank], rows[p] = rows[p], rows[rank]
		inv := new(big.Rat).Inv(rows[rank].a[c])
		for j := range rows[rank].a {
			rows[rank].a[j].Mul(rows[rank].a[j], inv)
		}
		rows[rank].rhs = rows[rank].rhs.Mul(ratOf(inv))
		for i := range rows {
			if i == rank || rows[i].a[c].Sign() == 0 {
				continue
			}
			f := new(big.Rat).Set(rows[i].a[c])
			for j := range rows[i].a {
				rows[i].a[j].Sub(rows[i].a[j], new(big.Rat).Mul(f, rows[rank].a[j]))
			}
			rows[i].rhs = rows[i].rhs.Sub(rows[rank].rhs.Mul(ratOf(f)))
		}
		pivCols = append(pivCols, c)
		rank++
	}
	for i := rank; i < len(rows); i++ {
		if !rows[i].rhs.IsZero() {
			return nil, fmt.Errorf("the on-shell conditions of the legs contradict each other (%s = 0); check the legs' momenta and masses", rows[i].rhs)
		}
	}
	var out []DotRule
	for i, c := range pivCols {
		v := expr.FromRF(rows[i].rhs)
		for j := c + 1; j < len(cols); j++ {
			if rows[i].a[j].Sign() == 0 {
				continue
			}
			v = v.Sub(expr.FromAtom(cols[j], 1).Scale(ratOf(rows[i].a[j])))
		}
		out = append(out, DotRule{Dot: cols[c], Value: v})
	}
	return out, nil
}

func (r DotRule) String() string {
	return r.Dot.Key() + " = " + r.Value.String()
}

func ruleText(rs []DotRule) string {
	parts := make([]string, len(rs))
	for i, r := range rs {
		parts[i] = r.String()
	}
	return strings.Join(parts, ", ")
}
