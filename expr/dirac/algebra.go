package dirac

import (
	"fmt"
	"math/big"
	"slices"
	"strings"

	"loopmatch/expr"
)

// This file holds the algebra of one Dirac string: a product of gamma matrices and slashed
// momenta followed by one chirality factor (1, γ5, PL or PR), with a coefficient and scalar
// factors produced on the way (metric tensors, vector components, scalar products).

// slot is one Dirac matrix of a string: gamma(name) for an index, slash(name) for a momentum.
// The names pseudoL and pseudoR stand for the slashed momentum of the leg at the left and the
// right end of a chain (see basis.go); they are not identifiers, so they can never be confused
// with a user's momentum.
type slot struct {
	mom  bool
	name string
}

const (
	pseudoL = "<left>"
	pseudoR = "<right>"
)

func (s slot) isPseudo() bool { return s.mom && (s.name == pseudoL || s.name == pseudoR) }

func (s slot) String() string {
	if s.mom {
		return "slash(" + s.name + ")"
	}
	return "gamma(" + s.name + ")"
}

// pair is the scalar a·b of two slots: g(mu, nu), p[mu] or p.q.
type pair [2]slot

func newPair(a, b slot) pair {
	if slotLess(b, a) {
		a, b = b, a
	}
	return pair{a, b}
}

func slotLess(a, b slot) bool {
	if a.mom != b.mom {
		return !a.mom
	}
	return a.name < b.name
}

// chir is the chirality factor at the right end of a string.
type chir uint8

const (
	xOne chir = iota
	xG5
	xL
	xR
)

// chirMul returns a·b as (chirality, sign); sign 0 means the product vanishes.
func chirMul(a, b chir) (chir, int) {
	switch {
	case a == xOne:
		return b, 1
	case b == xOne:
		return a, 1
	case a == xG5 && b == xG5:
		return xOne, 1
	case a == xG5: // γ5 PL = −PL, γ5 PR = PR
		if b == xL {
			return xL, -1
		}
		return xR, 1
	case b == xG5:
		if a == xL {
			return xL, -1
		}
		return xR, 1
	case a == b:
		return a, 1
	}
	return xOne, 0 // PL PR = PR PL = 0
}

// chirFlip returns x' and the sign with x·γ = sign·γ·x' (equivalently γ·x = sign·x'·γ):
// PL γ = γ PR, γ5 γ = −γ γ5.
func chirFlip(x chir) (chir, int) {
	switch x {
	case xG5:
		return xG5, -1
	case xL:
		return xR, 1
	case xR:
		return xL, 1
	}
	return xOne, 1
}

// dterm is c·(i)·Π pairs · g[0]…g[n−1] · x.
type dterm struct {
	c expr.RatFunc
	i bool
	f []pair
	g []slot
	x chir
}

func (t dterm) key() string {
	var sb strings.Builder
	if t.i {
		sb.WriteString("i|")
	}
	for _, p := range t.f {
		fmt.Fprintf(&sb, "%v.%v;", p[0], p[1])
	}
	sb.WriteString("|")
	for _, s := range t.g {
		sb.WriteString(s.String())
		sb.WriteString(" ")
	}
	fmt.Fprintf(&sb, "|%d", t.x)
	return sb.String()
}

// withPair returns a copy of t with the factor p added (kept sorted).
func (t dterm) withPair(p pair) []pair {
	f := make([]pair, 0, len(t.f)+1)
	f = append(f, t.f...)
	f = append(f, p)
	slices.SortFunc(f, func(a, b pair) int {
		switch {
		case slotLess(a[0], b[0]):
			return -1
		case slotLess(b[0], a[0]):
			return 1
		case slotLess(a[1], b[1]):
			return -1
		case slotLess(b[1], a[1]):
			return 1
		}
		return 0
	})
	return f
}

// termSet collects dterms, merging equal structures.
type termSet struct {
	idx   map[string]int
	terms []dterm
	limit int
}

func newTermSet(limit int) *termSet { return &termSet{idx: map[string]int{}, limit: limit} }

func (s *termSet) add(t dterm) error {
	if t.c.IsZero() {
		return nil
	}
	k := t.key()
	if i, ok := s.idx[k]; ok {
		s.terms[i].c = s.terms[i].c.Add(t.c)
		return nil
	}
	s.idx[k] = len(s.terms)
	s.terms = append(s.terms, t)
	if len(s.terms) > s.limit {
		return fmt.Errorf("%w: a Dirac string expands into more than %d terms", expr.ErrTooLarge, s.limit)
	}
	return nil
}

func (s *termSet) list() []dterm {
	out := s.terms[:0]
	for _, t := range s.terms {
		if !t.c.IsZero() {
			out = append(out, t)
		}
	}
	return out
}

var (
	rfOne    = expr.RFInt(1)
	rfTwo    = expr.RFInt(2)
	rfMinus1 = expr.RFInt(-1)
	rfD      = expr.RFVar(expr.DimSymbol)
)

// contractInside removes every index that occurs twice in the string, using
// γ^μ S a γ_μ = −(γ^μ S γ_μ) a + 2 a S and γ^μ γ_μ = d, valid in d dimensions for any slots
// (G. 't Hooft, M. Veltman, Nucl. Phys. B44 (1972) 189; the recursion is the anticommutation
// relation applied once).
func contractInside(in []dterm, limit int) ([]dterm, error) {
	out := newTermSet(limit)
	work := in
	for len(work) > 0 {
		t := work[len(work)-1]
		work = work[:len(work)-1]
		i, j := innerPair(t.g)
		if i < 0 {
			if err := out.add(t); err != nil {
				return nil, err
			}
			continue
		}
		s := t.g[i+1 : j]
		n := len(s)
		head, tail := t.g[:i], t.g[j+1:]
		build := func(c expr.RatFunc, mid []slot) dterm {
			g := make([]slot, 0, len(head)+len(mid)+len(tail))
			g = append(append(append(g, head...), mid...), tail...)
			return dterm{c: t.c.Mul(c), i: t.i, f: t.f, g: g, x: t.x}
		}
		// (−1)^n d S
		c0 := rfD
		if n%2 == 1 {
			c0 = c0.Neg()
		}
		work = append(work, build(c0, s))
		// Σ_k 2(−1)^{n−k} a_k a_1 … â_k … a_n
		for k := 1; k <= n; k++ {
			mid := make([]slot, 0, n)
			mid = append(mid, s[k-1])
			mid = append(mid, s[:k-1]...)
			mid = append(mid, s[k:]...)
			c := rfTwo
			if (n-k)%2 == 1 {
				c = c.Neg()
			}
			work = append(work, build(c, mid))
		}
		if len(work)+len(out.terms) > limit {
			return nil, fmt.Errorf("%w: contracting indices inside a Dirac string gives more than %d terms", expr.ErrTooLarge, limit)
		}
	}
	return out.list(), nil
}

// innerPair finds an index occurring twice in g and returns the positions of the pair with the
// fewest slots between them; (−1, −1) if there is none.
func innerPair(g []slot) (int, int) {
	bi, bj := -1, -1
	last := map[string]int{}
	for j, s := range g {
		if s.mom {
			continue
		}
		if i, ok := last[s.name]; ok {
			if bi < 0 || j-i < bj-bi {
				bi, bj = i, j
			}
		}
		last[s.name] = j
	}
	return bi, bj
}

// rankFn orders slots for the canonical form; equal ranks mean equal slots.
type rankFn func(slot) (int, string)

func rankLess(r rankFn, a, b slot) int {
	ca, na := r(a)
	cb, nb := r(b)
	if ca != cb {
		return ca - cb
	}
	return strings.Compare(na, nb)
}

// sortStrings brings every string to increasing rank with {a, b} = 2 a·b and a a = a·a.
// It inserts the slots one by one from the right into an already sorted suffix, so each
// insertion creates at most one term per slot it passes.
func sortStrings(in []dterm, r rankFn, limit int) ([]dterm, error) {
	out := newTermSet(limit)
	for _, t := range in {
		cur := []dterm{{c: t.c, i: t.i, f: t.f, g: nil, x: t.x}}
		for k := len(t.g) - 1; k >= 0; k-- {
			next := newTermSet(limit)
			for _, u := range cur {
				if err := insertSlot(t.g[k], u, r, next); err != nil {
					return nil, err
				}
			}
			cur = next.list()
		}
		for _, u := range cur {
			if err := out.add(u); err != nil {
				return nil, err
			}
		}
	}
	return out.list(), nil
}

// insertSlot adds s·u (u sorted) to the set, sorted.
func insertSlot(s slot, u dterm, r rankFn, set *termSet) error {
	var pre []slot
	c := u.c
	f := u.f
	rest := u.g
	for {
		if len(rest) == 0 || rankLess(r, s, rest[0]) < 0 {
			g := make([]slot, 0, len(pre)+1+len(rest))
			g = append(append(append(g, pre...), s), rest...)
			return set.add(dterm{c: c, i: u.i, f: f, g: g, x: u.x})
		}
		if rankLess(r, s, rest[0]) == 0 {
			// s s = s·s
			g := append(append([]slot{}, pre...), rest[1:]...)
			return set.add(dterm{c: c, i: u.i, f: dterm{f: f}.withPair(newPair(s, s)), g: g, x: u.x})
		}
		// s a = −a s + 2 s·a
		g := append(append([]slot{}, pre...), rest[1:]...)
		if err := set.add(dterm{c: c.Mul(rfTwo), i: u.i, f: dterm{f: f}.withPair(newPair(s, rest[0])), g: g, x: u.x}); err != nil {
			return err
		}
		c = c.Neg()
		pre = append(append([]slot{}, pre...), rest[0])
		rest = rest[1:]
	}
}

// ratOf returns the rational function of a big.Rat.
func ratOf(r *big.Rat) expr.RatFunc { return expr.RFRat(r) }
