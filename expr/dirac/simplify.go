package dirac

import (
	"errors"
	"fmt"
	"math/big"
	"slices"
	"strings"

	"loopmatch/expr"
)

// ChiralBasis selects how the chirality at the right end of a canonical chain is written.
type ChiralBasis int

const (
	// ProjectorBasis writes every chain with PL or PR before its right spinor (1 = PL + PR,
	// γ5 = PR − PL). It is the default.
	ProjectorBasis ChiralBasis = iota
	// ParityBasis writes every chain with nothing or G5 before its right spinor
	// (PL = (1 − G5)/2, PR = (1 + G5)/2).
	ParityBasis
)

// Options tune Simplify and Trace. The zero value is the default: NDR, projector basis,
// four-fermion structures reduced with the default evanescent definition, no reading point.
type Options struct {
	Chirality ChiralBasis
	// ReadingPoint, when k ≥ 1, reads γ5-odd traces from their k-th element (the trace is
	// rotated to start there and is not rotated again); 0 means no prescription, and a γ5-odd
	// trace whose Levi-Civita terms survive is refused.
	ReadingPoint int
	// KeepD keeps products of two chains as they are in d dimensions instead of reducing them
	// to the physical basis.
	KeepD bool
	// Evanescent is the definition of the evanescent four-fermion operators.
	Evanescent Evanescent
	// Dummies and ColourDummies are extra names (declared Lorentz and adjoint indices) that the
	// canonical renaming of contracted indices may use, besides the contracted names of the
	// input. Fierz needs them when the input has too few contracted names.
	Dummies, ColourDummies []string
}

// Report records what a result depends on.
type Report struct {
	// Scheme states the γ5 scheme, the chirality basis and the evanescent definition.
	Scheme string
	// Dots are the on-shell substitutions applied to scalar products of external momenta.
	Dots []DotRule
	// Pivots says, per chain, which slashed momenta were rewritten through the legs' momenta
	// so that the Dirac equation could act.
	Pivots []string
	// Evanescent lists the evanescent remainders dropped by the four-fermion reduction.
	Evanescent []EvanescentPart
}

// MaxStringTerms bounds the number of terms one Dirac string may expand into.
var MaxStringTerms = 200000

// maxPasses bounds the simplification passes; canonical forms are reached in two or three.
const maxPasses = 12

// ErrNotCanonical reports that simplification did not reach a fixed point (a defect).
var ErrNotCanonical = errors.New("the Dirac simplification did not reach a canonical form")

type simplifier struct {
	kin    Kinematics
	opt    Options
	limit  int
	dots   []DotRule
	pool   []string // Lorentz names for contracted indices, sorted
	cpool  []string // adjoint colour names for contracted indices, sorted
	pivots map[string]bool
	rep    *Report
	d4     bool // d = 4 (Fierz): the four-fermion images are exact
}

// Simplify brings every spinor chain of every term of e to the canonical form described in
// docs/DIRAC.md: NDR γ5, d-dimensional contractions inside a chain and between chains, the
// Dirac equation at both ends with the legs of kin, on-shell scalar products, sorted strings,
// colour reduced to the basis of the colour algebra, dummy indices renamed canonically, and
// products of two fully contracted chains reduced to the physical basis with the evanescent
// remainder in the report.
func Simplify(e expr.Expr, kin Kinematics, opt Options) (expr.Expr, Report, error) {
	s, err := newSimplifier(e, kin, opt)
	if err != nil {
		return expr.Expr{}, Report{}, err
	}
	out, err := s.run(e)
	if err != nil {
		return expr.Expr{}, Report{}, err
	}
	return out, *s.rep, nil
}

func newSimplifier(e expr.Expr, kin Kinematics, opt Options) (*simplifier, error) {
	if err := opt.Evanescent.check(); err != nil {
		return nil, err
	}
	dots, err := onShellRules(kin)
	if err != nil {
		return nil, err
	}
	s := &simplifier{kin: kin, opt: opt, limit: MaxStringTerms, dots: dots, pivots: map[string]bool{}}
	s.rep = &Report{Scheme: opt.scheme(), Dots: dots}
	s.pool, s.cpool = namePools(e, opt)
	return s, nil
}

func (s *simplifier) run(e expr.Expr) (expr.Expr, error) {
	cur, err := s.fix(e)
	if err != nil {
		return expr.Expr{}, err
	}
	if s.opt.KeepD {
		return cur, nil
	}
	red, changed, err := s.reduceFour(cur)
	if err != nil || !changed {
		return red, err
	}
	return s.fix(red)
}

// fix repeats passes until the expression no longer changes.
func (s *simplifier) fix(e expr.Expr) (expr.Expr, error) {
	cur := e
	for range maxPasses {
		next, err := s.pass(cur)
		if err != nil {
			return expr.Expr{}, err
		}
		if next.Equal(cur) {
			return next, nil
		}
		cur = next
	}
	return expr.Expr{}, ErrNotCanonical
}

func (s *simplifier) pass(e expr.Expr) (expr.Expr, error) {
	parts := make([]expr.Expr, 0, e.Len())
	n := 0
	for _, t := range e.Terms() {
		x, err := s.term(t)
		if err != nil {
			return expr.Expr{}, err
		}
		parts = append(parts, x)
		if n += x.Len(); n > expr.MaxTerms {
			return expr.Expr{}, fmt.Errorf("%w: Dirac simplification gives more than %d terms", expr.ErrTooLarge, expr.MaxTerms)
		}
	}
	out := expr.Sum(parts...)
	out, err := substDots(out, s.dots)
	if err != nil {
		return expr.Expr{}, err
	}
	return s.rename(out)
}

// term simplifies one term.
func (s *simplifier) term(t expr.Term) (expr.Expr, error) {
	if len(t.NC) > 0 {
		return expr.Expr{}, fmt.Errorf("Dirac or colour matrices outside a spinor chain in %s", t)
	}
	var chains []expr.Chain
	var colAtoms, rest []expr.AtomPow
	for _, a := range t.Atoms {
		switch x := a.A.(type) {
		case expr.Chain:
			if a.Pow < 0 {
				return expr.Expr{}, fmt.Errorf("a spinor chain cannot stand in a denominator: %s", t)
			}
			for range a.Pow {
				chains = append(chains, x)
			}
		case expr.Colour:
			if a.Pow < 0 {
				return expr.Expr{}, fmt.Errorf("a colour factor cannot stand in a denominator: %s", t)
			}
			colAtoms = append(colAtoms, a)
		default:
			rest = append(rest, a)
		}
	}
	if len(chains) == 0 && len(colAtoms) == 0 {
		return expr.FromTerm(t), nil
	}
	// Lorentz indices of the whole term, to tell indices contracted with other factors.
	count := map[string]int{}
	for _, c := range chains {
		for _, i := range chainIndices(c) {
			count[i]++
		}
	}
	for _, a := range rest {
		for _, i := range lorentzIndices(a.A) {
			count[i] += max(a.Pow, 1)
		}
	}
	ps := make([]parsed, len(chains))
	for k, c := range chains {
		p, err := parseChain(c)
		if err != nil {
			return expr.Expr{}, err
		}
		if p.dirac == nil {
			return expr.Zero(), nil
		}
		ps[k] = p
	}
	cols, err := s.colour(ps, colAtoms)
	if err != nil {
		return expr.Expr{}, err
	}
	type canon struct {
		terms []dterm
		e     *ends
	}
	cs := make([]canon, len(ps))
	for k, p := range ps {
		own := map[string]int{}
		for _, i := range chainIndices(chains[k]) {
			own[i]++
		}
		outside := map[string]bool{}
		for i, n := range own {
			if count[i] > n {
				outside[i] = true
			}
		}
		terms, e, err := s.canonDirac(p, outside)
		if err != nil {
			return expr.Expr{}, err
		}
		if e.note != "" && !s.pivots[e.note] {
			s.pivots[e.note] = true
			s.rep.Pivots = append(s.rep.Pivots, e.note)
		}
		cs[k] = canon{terms, e}
	}
	base := expr.FromTerm(expr.Term{Coef: t.Coef, Atoms: rest, Loops: t.Loops})
	out := expr.Zero()
	for _, cr := range cols {
		x, err := base.Mul(cr.factor())
		if err != nil {
			return expr.Expr{}, err
		}
		for k := range ps {
			ce, err := s.chainExprs(ps[k], cs[k].terms, cs[k].e, cr.lines[k])
			if err != nil {
				return expr.Expr{}, err
			}
			if x, err = x.Mul(ce); err != nil {
				return expr.Expr{}, err
			}
		}
		out = out.Add(x)
	}
	return out, nil
}

func chainIndices(c expr.Chain) []string {
	var out []string
	for _, e := range c.Elems {
		if e.Op == expr.NCGamma || e.Op == expr.NCSigma {
			out = append(out, e.Args...)
		}
	}
	return out
}

func lorentzIndices(a expr.Atom) []string {
	switch x := a.(type) {
	case expr.Vec:
		return []string{x.Mu}
	case expr.Metric:
		return []string{x.Mu, x.Nu}
	case expr.Levi:
		var out []string
		for _, s := range x.S {
			if s.Index {
				out = append(out, s.Name)
			}
		}
		return out
	case expr.Chain:
		return chainIndices(x)
	}
	return nil
}

// substDots applies the on-shell rules to scalar products (positive powers, and negative
// powers where the value is a single term).
func substDots(e expr.Expr, rules []DotRule) (expr.Expr, error) {
	if len(rules) == 0 {
		return e, nil
	}
	val := map[expr.Dot]expr.Expr{}
	for _, r := range rules {
		val[r.Dot] = r.Value
	}
	hit := false
	for _, t := range e.Terms() {
		for _, a := range t.Atoms {
			if d, ok := a.A.(expr.Dot); ok {
				if _, ok := val[d]; ok {
					hit = true
				}
			}
		}
	}
	if !hit {
		return e, nil
	}
	return e.MapAtoms(func(a expr.Atom) (expr.Expr, bool) {
		d, ok := a.(expr.Dot)
		if !ok {
			return expr.Expr{}, false
		}
		v, ok := val[d]
		return v, ok && v.Len() <= 1
	})
}

// scheme states the conventions of a result.
func (o Options) scheme() string {
	var sb strings.Builder
	sb.WriteString("NDR: γ5 anticommuting in d = 4 − 2ε dimensions, γ5 = iγ⁰γ¹γ²γ³, ε^{0123} = −1; ")
	if o.ReadingPoint > 0 {
		fmt.Fprintf(&sb, "γ5-odd traces read from element %d; ", o.ReadingPoint)
	} else {
		sb.WriteString("γ5-odd traces with surviving Levi-Civita terms refused; ")
	}
	if o.Chirality == ParityBasis {
		sb.WriteString("chains end in 1 or G5; ")
	} else {
		sb.WriteString("chains end in PL or PR; ")
	}
	if o.KeepD {
		sb.WriteString("four-fermion structures kept in d dimensions")
	} else {
		sb.WriteString("four-fermion structures reduced with " + o.Evanescent.String())
	}
	return sb.String()
}

// namePools collects the names available for contracted indices: every Lorentz (adjoint) name
// that is contracted in some term of e, plus the options' extra names, minus names that are
// free somewhere.
func namePools(e expr.Expr, opt Options) (lorentz, colour []string) {
	free := map[string]bool{}
	dummy := map[string]bool{}
	cfree := map[string]bool{}
	cdummy := map[string]bool{}
	for _, t := range e.Terms() {
		cnt, ccnt := termIndexCounts(t)
		for n, c := range cnt {
			if c == 1 {
				free[n] = true
			} else {
				dummy[n] = true
			}
		}
		for n, c := range ccnt {
			if c == 1 {
				cfree[n] = true
			} else {
				cdummy[n] = true
			}
		}
	}
	for _, n := range opt.Dummies {
		dummy[n] = true
	}
	for _, n := range opt.ColourDummies {
		cdummy[n] = true
	}
	for n := range dummy {
		if !free[n] {
			lorentz = append(lorentz, n)
		}
	}
	for n := range cdummy {
		if !cfree[n] {
			colour = append(colour, n)
		}
	}
	slices.Sort(lorentz)
	slices.Sort(colour)
	return lorentz, colour
}

// termIndexCounts counts the Lorentz indices and the adjoint colour indices of a term.
func termIndexCounts(t expr.Term) (lorentz, colour map[string]int) {
	lorentz, colour = map[string]int{}, map[string]int{}
	for _, a := range t.Atoms {
		p := max(a.Pow, 1)
		for _, i := range lorentzIndices(a.A) {
			lorentz[i] += p
		}
		for _, i := range adjointIndices(a.A) {
			colour[i] += p
		}
	}
	return lorentz, colour
}

// adjointIndices lists the adjoint colour indices of an atom: those of T generators and of the
// structure constants. A delta's indices count as adjoint when the delta is adjoint, which the
// caller decides from the other atoms; here both are listed with the marker of the delta.
func adjointIndices(a expr.Atom) []string {
	switch x := a.(type) {
	case expr.Chain:
		var out []string
		for _, e := range x.Elems {
			if e.Op == expr.NCT {
				out = append(out, e.Args[0])
			}
		}
		return out
	case expr.Colour:
		if x.Name == "f" {
			return x.Args
		}
	}
	return nil
}

var bigHalf = big.NewRat(1, 2)
