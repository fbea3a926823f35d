package dirac

import (
	"fmt"
	"slices"
	"strings"

	"loopmatch/expr"
)

// This file reduces SU(N) colour structures with N symbolic (the symbol Nc). Fundamental
// generators T^a sit on colour lines: the open line of each chain (from the colour index of its
// bar spinor to that of its spinor) and closed lines (traces). The rules, with
// tr(T^a T^b) = δ^{ab}/2 (common practice, no source needed beyond the normalisation), are
//
//	T^a_{ij} T^a_{kl} = ½ (δ_il δ_kj − δ_ij δ_kl / N)            (completeness, Fierz)
//	f^{abc} T^c = −i [T^a, T^b]
//	f^{acd} f^{bcd} = N δ^{ab},  f^{abc} f^{abc} = N (N² − 1)
//	δ^{aa} = N² − 1,  tr 1 = N,  tr T^a = 0
//
// from which T^a T^a = C_F = (N² − 1)/(2N) and T^b T^a T^b = −T^a/(2N) follow. The reduced basis
// of a product of chains: every line carries generators with distinct free indices, and two
// lines may share one contracted index c at their right ends (the octet T^c ⊗ T^c); crossed
// lines are resolved with δ_il δ_kj = 2 T^c_ij T^c_kl + δ_ij δ_kl / N.

// cline is a colour line: open from the bar spinor of chain start to the spinor of chain end, or
// closed (a trace) when start < 0.
type cline struct {
	start, end int
	idx        []string
}

func (l cline) closed() bool { return l.start < 0 }

// cstate is one term of a colour reduction.
type cstate struct {
	c     expr.RatFunc
	i     bool
	lines []cline
	f     [][3]string // sorted arguments; the permutation sign is in c
	delta [][2]string // adjoint deltas
	keep  []expr.AtomPow
}

// colourResult is one term of a reduced colour structure.
type colourResult struct {
	c     expr.RatFunc
	i     bool
	lines [][]string // the generators of each chain, in chain order
	atoms []expr.AtomPow
}

// factor is the commuting colour factor of a result.
func (r colourResult) factor() expr.Expr {
	atoms := append([]expr.AtomPow{}, r.atoms...)
	if r.i {
		atoms = append(atoms, expr.AtomPow{A: expr.I, Pow: 1})
	}
	return expr.FromTerm(expr.Term{Coef: r.c, Atoms: atoms})
}

var (
	rfN  = expr.RFVar("Nc")
	rfCA = rfN
	// rfNN1 is N² − 1, the dimension of the adjoint representation.
	rfNN1 = rfN.Mul(rfN).Sub(rfOne)
)

func rfInvN() expr.RatFunc {
	r, _ := rfN.Inv()
	return r
}

func (st cstate) clone() cstate {
	n := st
	n.lines = make([]cline, len(st.lines))
	for i, l := range st.lines {
		n.lines[i] = cline{l.start, l.end, append([]string{}, l.idx...)}
	}
	n.f = append([][3]string{}, st.f...)
	n.delta = append([][2]string{}, st.delta...)
	n.keep = append([]expr.AtomPow{}, st.keep...)
	return n
}

func (st cstate) key() string {
	var sb strings.Builder
	if st.i {
		sb.WriteString("i")
	}
	for _, l := range st.lines {
		fmt.Fprintf(&sb, "|%d>%d:%s", l.start, l.end, strings.Join(l.idx, ","))
	}
	for _, f := range st.f {
		fmt.Fprintf(&sb, "|f%v", f)
	}
	for _, d := range st.delta {
		fmt.Fprintf(&sb, "|d%v", d)
	}
	return sb.String()
}

// colour reduces the colour structure of a term: the generators of its chains and its colour
// atoms.
func (s *simplifier) colour(chains []parsed, atoms []expr.AtomPow) ([]colourResult, error) {
	st := cstate{c: rfOne}
	adj := map[string]bool{}
	for k, p := range chains {
		st.lines = append(st.lines, cline{k, k, append([]string{}, p.colour...)})
		for _, a := range p.colour {
			adj[a] = true
		}
	}
	for _, a := range atoms {
		c := a.A.(expr.Colour)
		if c.Name == "f" {
			for _, x := range c.Args {
				adj[x] = true
			}
			for range a.Pow {
				st.f = append(st.f, [3]string{c.Args[0], c.Args[1], c.Args[2]})
			}
		}
	}
	for _, a := range atoms {
		c := a.A.(expr.Colour)
		switch {
		case c.Name == "delta" && (adj[c.Args[0]] || adj[c.Args[1]]):
			for range a.Pow {
				st.delta = append(st.delta, [2]string{c.Args[0], c.Args[1]})
			}
		case c.Name != "f":
			st.keep = append(st.keep, a)
		}
	}
	trivial := len(st.f) == 0 && len(st.delta) == 0
	for _, l := range st.lines {
		trivial = trivial && len(l.idx) == 0
	}
	if trivial {
		lines := make([][]string, len(chains))
		return []colourResult{{c: rfOne, lines: lines, atoms: st.keep}}, nil
	}
	return s.reduceColour(st, len(chains))
}

// reduceColour applies the colour rules until none applies and collects the results.
func (s *simplifier) reduceColour(st cstate, nchains int) ([]colourResult, error) {
	done := map[string]int{}
	var final []cstate
	work := []cstate{st}
	steps := 0
	for len(work) > 0 {
		if steps++; steps > s.limit {
			return nil, fmt.Errorf("%w: the colour reduction needs more than %d steps", expr.ErrTooLarge, s.limit)
		}
		cur := work[len(work)-1]
		work = work[:len(work)-1]
		if cur.c.IsZero() {
			continue
		}
		next, applied, err := s.colourStep(cur)
		if err != nil {
			return nil, err
		}
		if applied {
			work = append(work, next...)
			continue
		}
		k := cur.key()
		if i, ok := done[k]; ok {
			final[i].c = final[i].c.Add(cur.c)
			continue
		}
		done[k] = len(final)
		final = append(final, cur)
	}
	var out []colourResult
	for _, f := range final {
		if f.c.IsZero() {
			continue
		}
		r := colourResult{c: f.c, i: f.i, lines: make([][]string, nchains), atoms: append([]expr.AtomPow{}, f.keep...)}
		for _, l := range f.lines {
			if l.closed() {
				return nil, fmt.Errorf("a colour trace of %d generators with distinct free indices (%s) remains; it needs the symmetric d^{abc}, which the colour algebra does not provide", len(l.idx), strings.Join(l.idx, ", "))
			}
			if l.start != l.end {
				return nil, fmt.Errorf("a colour structure connecting three or more chains crosswise is not reduced")
			}
			r.lines[l.start] = l.idx
		}
		for _, x := range f.f {
			c, sign := expr.NewStructureF(x[0], x[1], x[2])
			if sign == 0 {
				r.c = expr.RFInt(0)
				break
			}
			if sign < 0 {
				r.c = r.c.Neg()
			}
			r.atoms = append(r.atoms, expr.AtomPow{A: c, Pow: 1})
		}
		for _, d := range f.delta {
			r.atoms = append(r.atoms, expr.AtomPow{A: expr.NewDelta(d[0], d[1]), Pow: 1})
		}
		if !r.c.IsZero() {
			out = append(out, r)
		}
	}
	if len(out) == 0 {
		return nil, nil
	}
	return out, nil
}

// colourStep applies the first rule that applies; applied is false for a reduced state.
func (s *simplifier) colourStep(st cstate) ([]cstate, bool, error) {
	// δ^{ab}: δ^{aa} = N² − 1; otherwise rename b (or a) where it occurs elsewhere.
	for i, d := range st.delta {
		if d[0] == d[1] {
			n := st.clone()
			n.delta = slices.Delete(n.delta, i, i+1)
			n.c = n.c.Mul(rfNN1)
			return []cstate{n}, true, nil
		}
		for _, pair := range [][2]string{{d[1], d[0]}, {d[0], d[1]}} {
			old, nu := pair[0], pair[1]
			n := st.clone()
			n.delta = slices.Delete(n.delta, i, i+1)
			if n.renameColour(old, nu) {
				return []cstate{n}, true, nil
			}
		}
	}
	// f with two equal indices vanishes; f f with two or three common indices.
	for i, f := range st.f {
		if f[0] == f[1] || f[1] == f[2] || f[0] == f[2] {
			return nil, true, nil
		}
		for j := i + 1; j < len(st.f); j++ {
			g := st.f[j]
			var common []string
			for _, x := range f {
				if slices.Contains(g[:], x) {
					common = append(common, x)
				}
			}
			if len(common) < 2 {
				continue
			}
			n := st.clone()
			n.f = slices.Delete(n.f, j, j+1)
			n.f = slices.Delete(n.f, i, i+1)
			if len(common) == 3 {
				sf, sg := permSign(f), permSign(g)
				n.c = n.c.Mul(rfCA).Mul(rfNN1).Mul(expr.RFInt(int64(sf * sg)))
				return []cstate{n}, true, nil
			}
			u, ku := odd(f, common)
			v, kv := odd(g, common)
			// f = (−1)^{ku} f^{u c d} with c < d; the same for g
			sign := 1
			if (ku+kv)%2 == 1 {
				sign = -1
			}
			sign *= permSign(f) * permSign(g)
			n.c = n.c.Mul(rfCA).Mul(expr.RFInt(int64(sign)))
			n.delta = append(n.delta, [2]string{u, v})
			return []cstate{n}, true, nil
		}
	}
	// f^{abc} T^c = −i [T^a, T^b]
	for i, f := range st.f {
		for li, l := range st.lines {
			for pos, a := range l.idx {
				k := slices.Index(f[:], a)
				if k < 0 {
					continue
				}
				// cyclic rotation (even) bringing the contracted index last
				x, y := f[(k+1)%3], f[(k+2)%3]
				sign := permSign(f)
				mk := func(first, second string, im int) cstate {
					n := st.clone()
					n.f = slices.Delete(n.f, i, i+1)
					idx := append([]string{}, l.idx[:pos]...)
					idx = append(idx, first, second)
					idx = append(idx, l.idx[pos+1:]...)
					n.lines[li].idx = idx
					c := expr.RFInt(int64(im * sign))
					if n.i {
						c = c.Neg()
					}
					n.i = !n.i
					n.c = n.c.Mul(c)
					return n
				}
				return []cstate{mk(x, y, -1), mk(y, x, 1)}, true, nil
			}
		}
	}
	// a repeated index on one line, the pair with the fewest generators between first
	for li, l := range st.lines {
		bi, bj := -1, -1
		last := map[string]int{}
		for j, a := range l.idx {
			if i, ok := last[a]; ok && (bi < 0 || j-i < bj-bi) {
				bi, bj = i, j
			}
			last[a] = j
		}
		if bi < 0 {
			continue
		}
		L, X, R := l.idx[:bi], l.idx[bi+1:bj], l.idx[bj+1:]
		a := st.clone()
		b := st.clone()
		if l.closed() {
			// tr(L T X T R) = ½ tr(X) tr(R L) − tr(X R L)/(2N)
			a.lines[li].idx = concat(R, L)
			a.lines = append(a.lines, cline{-1, -1, append([]string{}, X...)})
			b.lines[li].idx = concat(X, R, L)
		} else {
			a.lines[li].idx = concat(L, R)
			a.lines = append(a.lines, cline{-1, -1, append([]string{}, X...)})
			b.lines[li].idx = concat(L, X, R)
		}
		a.c = a.c.Mul(expr.RFRat(bigHalf))
		b.c = b.c.Mul(rfInvN()).Mul(expr.RFRat(bigHalf)).Neg()
		return []cstate{a, b}, true, nil
	}
	// short traces
	for li, l := range st.lines {
		if !l.closed() || len(l.idx) > 2 {
			continue
		}
		n := st.clone()
		n.lines = slices.Delete(n.lines, li, li+1)
		switch len(l.idx) {
		case 0:
			n.c = n.c.Mul(rfN)
		case 1:
			return nil, true, nil
		case 2:
			n.c = n.c.Mul(expr.RFRat(bigHalf))
			n.delta = append(n.delta, [2]string{l.idx[0], l.idx[1]})
		}
		return []cstate{n}, true, nil
	}
	// an index shared by two lines: completeness
	for p := range st.lines {
		for q := p + 1; q < len(st.lines); q++ {
			lp, lq := st.lines[p], st.lines[q]
			shared := sharedIndices(lp.idx, lq.idx)
			if len(shared) == 0 || st.octet(p, q, shared) {
				continue
			}
			a := shared[0]
			i, j := slices.Index(lp.idx, a), slices.Index(lq.idx, a)
			L1, R1 := lp.idx[:i], lp.idx[i+1:]
			L2, R2 := lq.idx[:j], lq.idx[j+1:]
			x := st.clone()
			y := st.clone()
			half := expr.RFRat(bigHalf)
			x.c = x.c.Mul(half)
			y.c = y.c.Mul(half).Mul(rfInvN()).Neg()
			switch {
			case !lp.closed() && !lq.closed():
				x.lines[p] = cline{lp.start, lq.end, concat(L1, R2)}
				x.lines[q] = cline{lq.start, lp.end, concat(L2, R1)}
				y.lines[p].idx = concat(L1, R1)
				y.lines[q].idx = concat(L2, R2)
			case lp.closed() && lq.closed():
				// tr(T X) tr(T Y) = ½ [tr(X Y) − tr X tr Y / N]
				X, Y := concat(R1, L1), concat(R2, L2)
				x.lines[p].idx = concat(X, Y)
				x.lines = slices.Delete(x.lines, q, q+1)
				y.lines[p].idx = X
				y.lines[q].idx = Y
			default:
				o, c := p, q
				Lo, Ro, Lc, Rc := L1, R1, L2, R2
				if lp.closed() {
					o, c = q, p
					Lo, Ro, Lc, Rc = L2, R2, L1, R1
				}
				Z := concat(Rc, Lc)
				x.lines[o].idx = concat(Lo, Z, Ro)
				x.lines = slices.Delete(x.lines, c, c+1)
				y.lines[o].idx = concat(Lo, Ro)
				y.lines[c].idx = Z
			}
			return []cstate{x, y}, true, nil
		}
	}
	// crossed open lines
	var crossed []int
	for i, l := range st.lines {
		if !l.closed() && l.start != l.end {
			crossed = append(crossed, i)
		}
	}
	if len(crossed) == 2 {
		p, q := crossed[0], crossed[1]
		lp, lq := st.lines[p], st.lines[q]
		if lp.end == lq.start && lq.end == lp.start {
			c, err := s.freshColour(st)
			if err != nil {
				return nil, false, err
			}
			// X_{i l} Y_{k j} = 2 (X T^c)_{ij} (Y T^c)_{kl} + X_{ij} Y_{kl} / N
			x := st.clone()
			y := st.clone()
			x.lines[p] = cline{lp.start, lp.start, concat(lp.idx, []string{c})}
			x.lines[q] = cline{lq.start, lq.start, concat(lq.idx, []string{c})}
			x.c = x.c.Mul(rfTwo)
			y.lines[p] = cline{lp.start, lp.start, lp.idx}
			y.lines[q] = cline{lq.start, lq.start, lq.idx}
			y.c = y.c.Mul(rfInvN())
			return []cstate{x, y}, true, nil
		}
	}
	return nil, false, nil
}

// octet reports whether lines p and q are two uncrossed open lines whose only shared index is
// the last generator of both: the reduced octet structure.
func (st cstate) octet(p, q int, shared []string) bool {
	lp, lq := st.lines[p], st.lines[q]
	if lp.closed() || lq.closed() || lp.start != lp.end || lq.start != lq.end || len(shared) != 1 {
		return false
	}
	a := shared[0]
	return lp.idx[len(lp.idx)-1] == a && lq.idx[len(lq.idx)-1] == a
}

// renameColour replaces old by nu in one other place where old occurs; false if it occurs
// nowhere else.
func (st *cstate) renameColour(old, nu string) bool {
	for i := range st.lines {
		for j, a := range st.lines[i].idx {
			if a == old {
				st.lines[i].idx[j] = nu
				return true
			}
		}
	}
	for i := range st.f {
		for j, a := range st.f[i] {
			if a == old {
				st.f[i][j] = nu
				// keep the arguments sorted, the permutation sign to the coefficient
				c, sign := expr.NewStructureF(st.f[i][0], st.f[i][1], st.f[i][2])
				if sign == 0 {
					st.c = expr.RFInt(0)
					return true
				}
				st.f[i] = [3]string{c.Args[0], c.Args[1], c.Args[2]}
				if sign < 0 {
					st.c = st.c.Neg()
				}
				return true
			}
		}
	}
	for i := range st.delta {
		for j, a := range st.delta[i] {
			if a == old {
				st.delta[i][j] = nu
				return true
			}
		}
	}
	return false
}

// freshColour picks a contracted-index name not used in the state.
func (s *simplifier) freshColour(st cstate) (string, error) {
	used := map[string]bool{}
	for _, l := range st.lines {
		for _, a := range l.idx {
			used[a] = true
		}
	}
	for _, f := range st.f {
		for _, a := range f {
			used[a] = true
		}
	}
	for _, d := range st.delta {
		used[d[0]], used[d[1]] = true, true
	}
	for _, n := range s.cpool {
		if !used[n] {
			return n, nil
		}
	}
	return "", fmt.Errorf("the colour reduction needs a contracted adjoint index and none is free; pass declared adjoint index names in Options.ColourDummies")
}

// permSign is the sign of the permutation sorting three distinct names.
func permSign(f [3]string) int {
	s := 1
	for i := 0; i < 3; i++ {
		for j := i + 1; j < 3; j++ {
			if f[i] > f[j] {
				s = -s
			}
		}
	}
	return s
}

// odd returns the index of f not in common and the number of transpositions that move it to
// the front keeping the other two in sorted order (f itself is taken sorted: the caller folds
// in permSign(f)).
func odd(f [3]string, common []string) (string, int) {
	s := f
	slices.Sort(s[:])
	for k, x := range s {
		if !slices.Contains(common, x) {
			return x, k
		}
	}
	return "", 0
}

func sharedIndices(a, b []string) []string {
	var out []string
	for _, x := range a {
		if slices.Contains(b, x) && !slices.Contains(out, x) {
			out = append(out, x)
		}
	}
	slices.Sort(out)
	return out
}

func concat(parts ...[]string) []string {
	var out []string
	for _, p := range parts {
		out = append(out, p...)
	}
	return out
}
