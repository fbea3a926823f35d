package dirac

import (
	"fmt"
	"math/big"
	"slices"

	"loopmatch/expr"
)

// Four-fermion structures. After canonicalisation a product of two chains whose gamma
// matrices are all contracted with each other is S_n X ⊗ S_n Y, with
// S_n = γ^{μ1}…γ^{μn} in the same order on both chains and X, Y ∈ {PL, PR}. In d dimensions
//
//	S_n X ⊗ S_n Y = Σ_k f_nk(d) A_k X ⊗ Y,   A_k = γ^{[μ1…μk]} ⊗ γ_{[μ1…μk]},
//
// where multiplying by γ^μ ⊗ γ_μ on the right maps A_k to A_{k+1} + k(d − k + 1) A_{k−1}
// (derived from γ^{[μ1…μk]}γ^μ = γ^{[μ1…μk μ]} + Σ_i ± g^{μ_i μ} γ^{[…μ̂_i…]}; checked in the
// tests against explicit matrices). In four dimensions A_k = 0 for k ≥ 5, and with
// γ^{[μνρσ]} = i ε^{μνρσ} γ5·(sign), γ^{[μνρ]} = ±i ε^{μνρσ} γ_σ γ5 and
// ε^{μνρσ}ε_{μνρτ} = −6 δ^σ_τ, ε^{μνρσ}ε_{μνρσ} = −24:
//
//	A_4 X ⊗ Y = 24 s X ⊗ Y,  A_3 X ⊗ Y = 6 s γ^μ X ⊗ γ_μ Y,  A_2 PL ⊗ PR = 0,
//
// s = +1 for X = Y and −1 otherwise (γ5 PL = −PL). The evanescent operators are defined by
// continuing these images to d = 4 − 2ε with the shifts of Evanescent:
//
//	A_3 X ⊗ Y = s (6 + b3 ε) γ^μ X ⊗ γ_μ Y + E,  A_4 X ⊗ Y = s (24 + b4 ε) X ⊗ Y + E,
//	A_2 PL ⊗ PR = E, A_k = E (k ≥ 5),
//
// and A_0, A_1 and the equal-chirality A_2 = S_2 ⊗ S_2 − d S_0 ⊗ S_0 are physical.

// Evanescent fixes the O(ε) parts of the four-dimensional images above; a nil field takes its
// default. The defaults b3 = 2 (equal and opposite chiralities) give
//
//	γ^μγ^νγ^ρ PL ⊗ γ_μγ_νγ_ρ PL = (16 − 4ε) γ^μ PL ⊗ γ_μ PL + E,
//
// the definition of A.J. Buras, P.H. Weisz, Nucl. Phys. B333 (1990) 66 (also M.J. Dugan,
// B. Grinstein, Phys. Lett. B256 (1991) 239; quoted from memory: the stored copies of these
// papers reached only their openings, and the parametrisation "(4 + aε)" of the reversed order
// is visible in the opening of S. Herrlich, U. Nierste, hep-ph/9412375), and
// γ^μγ^νγ^ρ PL ⊗ γ_μγ_νγ_ρ PR = (4 − 8ε) γ^μ PL ⊗ γ_μ PR + E. The defaults b4 = 0 are the
// plain continuation (common practice, no source).
type Evanescent struct {
	Same3, Opp3, Same4, Opp4 *big.Rat
}

func (v Evanescent) check() error { return nil } // every rational shift is a valid definition

func (v Evanescent) get() (s3, o3, s4, o4 *big.Rat) {
	def := func(r *big.Rat, d int64) *big.Rat {
		if r == nil {
			return big.NewRat(d, 1)
		}
		return r
	}
	return def(v.Same3, 2), def(v.Opp3, 2), def(v.Same4, 0), def(v.Opp4, 0)
}

// String states the definition, with the n = 3 forms it implies.
func (v Evanescent) String() string {
	s3, o3, s4, o4 := v.get()
	aLL := new(big.Rat).Sub(big.NewRat(6, 1), s3)
	aLR := new(big.Rat).Add(big.NewRat(6, 1), o3)
	return fmt.Sprintf("evanescent operators defined by A3 = ±(6 + (%s)ε)γ^μ X⊗γ_μ Y, A4 = ±(24 + (%s|%s)ε) X⊗Y (equal|opposite chiralities, A3 opposite: %s), "+
		"i.e. γ^μγ^νγ^ρPL⊗γ_μγ_νγ_ρPL = (16 − (%s)ε)γ^μPL⊗γ_μPL + E and γ^μγ^νγ^ρPL⊗γ_μγ_νγ_ρPR = (4 − (%s)ε)γ^μPL⊗γ_μPR + E",
		s3.RatString(), s4.RatString(), o4.RatString(), o3.RatString(), aLL.RatString(), aLR.RatString())
}

// EvanescentPart is one evanescent remainder dropped by the reduction: Coef times the operator
// Def = S_n X ⊗ S_n Y − (its physical image), named Name (e.g. "E3(PL,PR)").
type EvanescentPart struct {
	Name string
	Coef expr.Expr
	Def  expr.Expr
}

// fourStructure recognises a product of two chains with all gamma matrices contracted between
// them; it returns the chains, the index names in order and the rest of the term.
type fourStructure struct {
	c1, c2 expr.Chain
	n      []string
	x1, x2 expr.NCOp // PL or PR (ProjectorBasis) or 0/G5 (ParityBasis: xOne, xG5 as NCG5 or -1)
	rest   expr.Term
}

func asFour(t expr.Term) (fourStructure, bool) {
	var chains []expr.Chain
	var rest []expr.AtomPow
	for _, a := range t.Atoms {
		if c, ok := a.A.(expr.Chain); ok && a.Pow > 0 {
			for range a.Pow {
				chains = append(chains, c)
			}
			continue
		}
		rest = append(rest, a)
	}
	if len(chains) != 2 {
		return fourStructure{}, false
	}
	var fs fourStructure
	fs.c1, fs.c2 = chains[0], chains[1]
	g1, x1, ok1 := gammaNames(fs.c1)
	g2, x2, ok2 := gammaNames(fs.c2)
	if !ok1 || !ok2 || len(g1) < 2 || !slices.Equal(g1, g2) {
		return fourStructure{}, false
	}
	for _, a := range rest {
		for _, i := range lorentzIndices(a.A) {
			if slices.Contains(g1, i) {
				return fourStructure{}, false
			}
		}
	}
	fs.n, fs.x1, fs.x2 = g1, x1, x2
	fs.rest = expr.Term{Coef: t.Coef, Atoms: rest, Loops: t.Loops}
	return fs, true
}

// gammaNames returns the gamma indices of a chain made of gamma matrices only (colour
// generators allowed) and its chirality element (NCPL, NCPR, NCG5, or −1 for none).
func gammaNames(c expr.Chain) ([]string, expr.NCOp, bool) {
	var g []string
	x := expr.NCOp(-1)
	for _, e := range c.Elems[1 : len(c.Elems)-1] {
		switch e.Op {
		case expr.NCGamma:
			if x != -1 {
				return nil, 0, false
			}
			g = append(g, e.Args[0])
		case expr.NCT:
		case expr.NCPL, expr.NCPR, expr.NCG5:
			x = e.Op
		default:
			return nil, 0, false
		}
	}
	return g, x, true
}

// withDirac returns the chain with its Dirac part replaced by gammas with the given indices
// and the chirality op (−1 for none); colour generators stay after the bar spinor.
func withDirac(c expr.Chain, idx []string, x expr.NCOp) expr.Chain {
	el := []expr.NC{c.Elems[0]}
	for _, e := range c.Elems[1 : len(c.Elems)-1] {
		if e.Op == expr.NCT {
			el = append(el, e)
		}
	}
	for _, i := range idx {
		el = append(el, expr.NC{Op: expr.NCGamma, Args: []string{i}})
	}
	if x != -1 {
		el = append(el, expr.NC{Op: x})
	}
	el = append(el, c.Elems[len(c.Elems)-1])
	return expr.NewChain(el)
}

// fkn returns f_nk(d) for k = 0…n.
func fkn(n int) []expr.RatFunc {
	f := []expr.RatFunc{rfOne}
	for m := 0; m < n; m++ {
		g := make([]expr.RatFunc, m+2)
		for k := range g {
			g[k] = expr.RFInt(0)
		}
		for k, c := range f {
			if c.IsZero() {
				continue
			}
			g[k+1] = g[k+1].Add(c)
			if k > 0 {
				// k (d − k + 1)
				w := rfD.Sub(expr.RFInt(int64(k - 1))).Mul(expr.RFInt(int64(k)))
				g[k-1] = g[k-1].Add(c.Mul(w))
			}
		}
		f = g
	}
	return f
}

// reduceFour projects every fully contracted product of two chains onto the physical basis.
func (s *simplifier) reduceFour(e expr.Expr) (expr.Expr, bool, error) {
	changed := false
	var parts []expr.Expr
	idx := map[string]int{}
	for _, t := range e.Terms() {
		fs, ok := asFour(t)
		if !ok {
			parts = append(parts, expr.FromTerm(t))
			continue
		}
		// chiralities in the projector basis
		type cx struct {
			c expr.RatFunc
			x expr.NCOp
		}
		split := func(x expr.NCOp) []cx {
			switch x {
			case expr.NCPL, expr.NCPR:
				return []cx{{rfOne, x}}
			case expr.NCG5:
				return []cx{{rfMinus1, expr.NCPL}, {rfOne, expr.NCPR}}
			}
			return []cx{{rfOne, expr.NCPL}, {rfOne, expr.NCPR}}
		}
		rest := expr.FromTerm(fs.rest)
		for _, a := range split(fs.x1) {
			for _, b := range split(fs.x2) {
				phys, ev, err := s.project(fs, a.x, b.x)
				if err != nil {
					return expr.Expr{}, false, err
				}
				w := rest.Scale(a.c.Mul(b.c))
				p, err := phys.Mul(w)
				if err != nil {
					return expr.Expr{}, false, err
				}
				parts = append(parts, p)
				if ev.Def.IsZero() {
					continue
				}
				changed = true
				key := ev.Def.String()
				if i, ok := idx[key]; ok {
					s.rep.Evanescent[i].Coef = s.rep.Evanescent[i].Coef.Add(w)
					continue
				}
				idx[key] = len(s.rep.Evanescent)
				ev.Coef = w
				s.rep.Evanescent = append(s.rep.Evanescent, ev)
			}
		}
	}
	if !changed {
		return e, false, nil
	}
	return expr.Sum(parts...), true, nil
}

// project returns the physical image of S_n X ⊗ S_n Y and the evanescent operator.
func (s *simplifier) project(fs fourStructure, x, y expr.NCOp) (expr.Expr, EvanescentPart, error) {
	n := len(fs.n)
	same := x == y
	sgn := int64(1)
	if !same {
		sgn = -1
	}
	s3, o3, s4, o4 := s.opt.Evanescent.get()
	b3, b4 := s3, s4
	if !same {
		b3, b4 = o3, o4
	}
	eps := expr.RFRat(big.NewRat(2, 1)).Sub(rfD.Mul(expr.RFRat(bigHalf))) // ε = (4 − d)/2
	if s.d4 {
		eps = expr.RFInt(0)
	}
	st := func(k int) (expr.Expr, error) {
		names := fs.n[:k]
		c1 := withDirac(fs.c1, names, x)
		c2 := withDirac(fs.c2, names, y)
		return expr.FromAtom(c1, 1).Mul(expr.FromAtom(c2, 1))
	}
	f := fkn(n)
	full, err := st(n)
	if err != nil {
		return expr.Expr{}, EvanescentPart{}, err
	}
	// coefficients of S_0⊗S_0, S_1⊗S_1, S_2⊗S_2 in the image
	c := [3]expr.RatFunc{expr.RFInt(0), expr.RFInt(0), expr.RFInt(0)}
	for k, fk := range f {
		if fk.IsZero() {
			continue
		}
		switch k {
		case 0:
			c[0] = c[0].Add(fk)
		case 1:
			c[1] = c[1].Add(fk)
		case 2:
			if same {
				c[2] = c[2].Add(fk)
				c[0] = c[0].Sub(fk.Mul(rfD))
			}
		case 3:
			c[1] = c[1].Add(fk.Mul(expr.RFInt(6 * sgn).Add(expr.RFInt(sgn).Mul(ratOf(b3)).Mul(eps))))
		case 4:
			c[0] = c[0].Add(fk.Mul(expr.RFInt(24 * sgn).Add(expr.RFInt(sgn).Mul(ratOf(b4)).Mul(eps))))
		}
	}
	phys := expr.Zero()
	for k := 0; k < 3 && k <= n; k++ {
		if c[k].IsZero() {
			continue
		}
		sk, err := st(k)
		if err != nil {
			return expr.Expr{}, EvanescentPart{}, err
		}
		phys = phys.Add(sk.Scale(c[k]))
	}
	def := full.Sub(phys)
	if n <= 1 || (n == 2 && same) {
		return full, EvanescentPart{}, nil
	}
	name := fmt.Sprintf("E%d(%s,%s)", n, expr.NC{Op: x}.Key(), expr.NC{Op: y}.Key())
	return phys, EvanescentPart{Name: name, Def: def}, nil
}
