package match

import (
	"errors"
	"fmt"
	"maps"
	"slices"
	"strings"

	"loopmatch/expr"
	"loopmatch/expr/dirac"
	"loopmatch/expr/notation"
	"loopmatch/loops/vacuum"
	"loopmatch/passarino"
)

// Coefficient is one Wilson coefficient of a match block.
type Coefficient struct {
	Operator string
	Value    expr.Expr // C_i(μ), finite, MS-bar
	InRatios expr.Expr // Value with the ratios of the match block substituted (equal to Value without ratios)
	Pole     expr.Expr // the 1/ε part removed by the MS-bar counterterms of the EFT (infrared poles of the full theory)
}

// Check is one built-in consistency check.
type Check struct {
	Name   string
	Passed bool
	Detail string // what was compared; on failure the offending expression
}

// Result is the outcome of one match block.
type Result struct {
	Block        *notation.MatchBlock
	Coeffs       []Coefficient
	Checks       []Check
	Conventions  []string // conventions and scheme the result depends on
	Kinematics   []string // on-shell substitutions used
	Notes        []string // scaleless integrals set to zero, evanescent remainders, …
	Expectations []Check  // comparisons with `expect` lines
}

// Failed reports whether any check or expectation failed.
func (r *Result) Failed() bool {
	for _, c := range append(slices.Clone(r.Checks), r.Expectations...) {
		if !c.Passed {
			return true
		}
	}
	return false
}

// Options tune a match.
type Options struct {
	Dirac dirac.Options
}

// massSymbols lists the declared heavy and light masses.
func massSymbols(p *notation.Program) []string {
	return append(p.NamesOf(notation.KindMass), p.NamesOf(notation.KindLight)...)
}

// smallOf builds the expansion of a match block.
func smallOf(p *notation.Program, mb *notation.MatchBlock) passarino.Small {
	s := passarino.Small{Order: mb.Order}
	for _, l := range p.Legs {
		m2 := expr.RFInt(0)
		if l.Mass != "" {
			m2 = expr.RFVar(l.Mass).Mul(expr.RFVar(l.Mass))
		}
		s.OnShell = append(s.OnShell, passarino.OnShellMomentum{Mom: l.Mom, M2: m2})
	}
	for _, n := range mb.Expand {
		if p.Decls[n].Kind == notation.KindLight {
			s.Masses = append(s.Masses, n)
		} else {
			s.Momenta = append(s.Momenta, n)
		}
	}
	return s
}

// Canon brings expressions to the form in which they are projected: fermion-loop traces
// evaluated, the Dirac and colour algebra applied (NDR, on-shell external legs, declared indices
// as names of contracted pairs), the on-shell scalar products substituted and, on the heavy-mass
// route, the expansion truncated.
type Canon struct {
	kin      *Kinematics
	dkin     dirac.Kinematics
	small    passarino.Small
	truncate bool
	opt      dirac.Options
	Notes    []string // evanescent remainders dropped, …
}

// NewCanon prepares the canonical form for the legs of p; with truncate, parts beyond the
// order of small are dropped.
func NewCanon(p *notation.Program, small passarino.Small, truncate bool, opt Options) (*Canon, error) {
	kin, err := NewKinematics(p.Legs)
	if err != nil {
		return nil, err
	}
	c := &Canon{kin: kin, small: small, truncate: truncate, opt: opt.Dirac}
	if c.opt.Dummies == nil {
		c.opt.Dummies = p.NamesOf(notation.KindIndex)
		c.opt.ColourDummies = p.NamesOf(notation.KindAdjoint)
	}
	for _, l := range p.Legs {
		m := expr.RFInt(0) // dirac.Leg takes the mass, not its square
		if l.Mass != "" {
			m = expr.RFVar(l.Mass)
		}
		c.dkin.Legs = append(c.dkin.Legs, dirac.Leg{Name: l.Name, Mom: l.Mom, Mass: m, Coloured: l.Colour != ""})
	}
	return c, nil
}

// Apply brings e to the canonical form.
func (c *Canon) Apply(e expr.Expr) (expr.Expr, error) {
	e, err := dirac.EvalTraces(e, c.opt)
	if err != nil {
		return expr.Expr{}, err
	}
	s, rep, err := dirac.Simplify(e, c.dkin, c.opt)
	if err != nil {
		return expr.Expr{}, err
	}
	for _, ev := range rep.Evanescent {
		c.Notes = append(c.Notes, fmt.Sprintf("evanescent remainder dropped: %v", ev))
	}
	if s, err = c.kin.Apply(s); err != nil {
		return expr.Expr{}, err
	}
	if c.truncate {
		s, _, err = c.small.Truncate(s)
	}
	return s, err
}

// Rules lists the on-shell substitutions of scalar products.
func (c *Canon) Rules() []string { return c.kin.Rules() }

// Reduce expands e on the heavy-mass route (small quantities and order of small), reduces its
// loop integrals exactly in d, brings it to the canonical form and expands it in ε up to the
// finite part. It returns the series and notes on what was set to zero or dropped.
func Reduce(p *notation.Program, e expr.Expr, small passarino.Small, opt Options) (expr.Series, []string, error) {
	c, err := NewCanon(p, small, true, opt)
	if err != nil {
		return expr.Series{}, nil, err
	}
	if e, err = resolveOnShell(p, e); err != nil {
		return expr.Series{}, nil, err
	}
	red, info, err := passarino.Heavy(e, small)
	if err != nil {
		return expr.Series{}, nil, err
	}
	var notes []string
	for _, s := range info.Scaleless {
		notes = append(notes, "scaleless integral set to zero (infrared poles become EFT ultraviolet poles here): "+s)
	}
	if red, err = c.Apply(red); err != nil {
		return expr.Series{}, nil, err
	}
	ser, err := vacuum.ExpandEps(red, 1, p.Positive)
	return ser, append(notes, c.Notes...), err
}

// Run executes one match block of p (heavy-mass route).
func Run(p *notation.Program, mb *notation.MatchBlock, opt Options) (*Result, error) {
	// The general route and off-shell matching run in match/extended.go.
	if extended(mb) {
		return runExtended(p, mb, opt)
	}
	if mb.Route != "heavy" {
		return nil, fmt.Errorf("%s: route %s is not available yet", mb.Pos, mb.Route)
	}
	if !mb.HasExpand {
		return nil, fmt.Errorf("%s: the heavy-mass route needs an expand line (expand p, q to order N)", mb.Pos)
	}
	small := smallOf(p, mb)
	pl, err := NewCanon(p, small, true, opt)
	if err != nil {
		return nil, fmt.Errorf("%s: %v", mb.Pos, err)
	}
	res := &Result{Block: mb, Kinematics: pl.Rules()}
	res.Conventions = []string{
		fmt.Sprintf("L_eff = N * sum_i C_i Q_i with N = %s; amplitudes are iM", mb.Norm.Pretty()),
		"metric (+,-,-,-), d = 4 - 2*eps, MS-bar: loop k {…} = mu^(2 eps) (e^gamma_E/(4 pi))^eps ∫ d^dk/(2 pi)^d",
		"gamma5: NDR (anticommuting), chains in the projector basis",
	}
	if len(mb.Expand) == 0 {
		res.Conventions = append(res.Conventions, "heavy-mass route: nothing is expanded (vacuum amplitudes)")
	} else {
		res.Conventions = append(res.Conventions, fmt.Sprintf("heavy-mass route: Taylor expansion in %s to order %d; loops in the effective theory are scaleless", strings.Join(mb.Expand, ", "), mb.Order))
	}
	if mb.ScaleSet {
		res.Conventions = append(res.Conventions, fmt.Sprintf("scale: mu = %s", mb.Scale))
	}
	// Full-theory amplitude, reduced loop order by loop order: the L-loop part carries μ^{2Lε},
	// which the scale check needs.
	full := expr.Zero()
	for _, n := range mb.Amps {
		a, _ := p.Amplitude(n)
		full = full.Add(a.Body)
	}
	parts := byLoopOrder(p, full)
	var ser expr.Series
	var notes []string
	serL := make(map[int]expr.Series)
	maxL := 0
	for _, L := range slices.Sorted(maps.Keys(parts)) {
		s, n, err := Reduce(p, parts[L], small, opt)
		if err != nil {
			return nil, fmt.Errorf("%s: %v", mb.Pos, err)
		}
		if len(serL) == 0 {
			ser = s
		} else {
			ser = ser.Add(s)
		}
		serL[L], maxL = s, L
		for _, x := range n {
			if !slices.Contains(notes, x) {
				notes = append(notes, x)
			}
		}
	}
	if maxL > 2 {
		return nil, fmt.Errorf("%s: the amplitudes reach %d loops; matching goes up to two loops", mb.Pos, maxL)
	}
	if maxL < 2 && !ser.Coef(-2).IsZero() {
		return nil, fmt.Errorf("%s: the amplitude has a 1/eps^2 pole (%s); one-loop matching expects at most 1/eps", mb.Pos, ser.Coef(-2))
	}
	if maxL == 2 {
		res.Conventions = append(res.Conventions, "two loops: the loop measure carries mu^(2 eps) per loop; counterterms are the ones written in the file")
	}
	// Operators: i·N·⟨Q_i⟩, in canonical form and expanded in ε (their canonical form may
	// depend on d).
	iN := mb.Norm.MustMul(expr.FromAtom(expr.I, 1))
	basis := make([]expr.Expr, len(mb.Ops))
	for i, name := range mb.Ops {
		op := operatorByName(p, name)
		me, err := p.MatrixElement(op)
		if err != nil {
			return nil, err
		}
		if me, err = pl.Apply(me); err != nil {
			return nil, fmt.Errorf("operator %s: %v", name, err)
		}
		if basis[i], err = me.Mul(iN); err != nil {
			return nil, err
		}
	}
	bser, err := EpsBasis(basis, 1-min(ser.Lo, 0), p.Positive)
	if err != nil {
		return nil, err
	}
	b0 := make([]expr.Expr, len(basis))
	for i, b := range bser {
		b0[i] = b.Coef(0)
	}
	// Checks of the poles; at one loop the ultraviolet part uvTotal must vanish, the rest are
	// EFT counterterms.
	uvTotal := expr.Zero()
	if maxL < 2 {
		if uvTotal, err = poles1Loop(p, pl, res, full, ser.Coef(-1), small, b0); err != nil {
			return nil, err
		}
	} else {
		twoLoopPoles(pl, res, ser, bser)
	}
	// Coefficients: C(ε) solves A(ε) − uvTotal/ε = Σ_i C_i(ε) i N ⟨Q_i⟩(ε); C(0) is the MS-bar
	// coefficient (finite0 keeps the symbolic μ), C(−1) the EFT counterterm.
	uvSer := expr.Series{Lo: -1, C: make([]expr.Expr, ser.Order+1), Order: ser.Order}
	uvSer.C[0] = uvTotal
	serIR := ser.Sub(uvSer)
	proj, perrs := ProjectSeries(serIR, bser)
	if err := perrs[0]; err != nil {
		return nil, withWard(p, mb, opt, err) // a failed Ward identity is reported with the projection error
	}
	cs0 := proj[0]
	cs := cs0
	if mb.ScaleSet {
		cs = make([]expr.Expr, len(cs0))
		for i, c := range cs0 {
			if cs[i], err = setScale(c, mb.Scale); err != nil {
				return nil, err
			}
		}
	}
	irC := proj[-1] // nil when the poles are not spanned by the basis
	// Scale dependence: ∂C/∂ln μ = Σ_L 2L × (1/ε part of the projected L-loop part), since that
	// part carries μ^{2Lε} (at one loop: twice the residue of the loop poles).
	predicted := make([]expr.Expr, len(basis))
	var perr error
	for L, s := range serL {
		ps, errs := ProjectSeries(s, bser)
		if errs[-1] != nil || errs[-2] != nil {
			perr = errors.Join(errs[-2], errs[-1])
			break
		}
		for i := range predicted {
			if ps[-1] != nil {
				predicted[i] = predicted[i].Add(ps[-1][i].Scale(expr.RFInt(int64(2 * L))))
			}
		}
	}
	for i, c := range cs {
		coef := Coefficient{Operator: mb.Ops[i], Value: c, InRatios: c}
		for _, r := range mb.Ratios {
			if coef.InRatios, err = applyRatio(coef.InRatios, r); err != nil {
				return nil, err
			}
		}
		if irC != nil {
			coef.Pole = irC[i]
		}
		res.Coeffs = append(res.Coeffs, coef)
		ch := Check{Name: fmt.Sprintf("scale dependence of C_%s follows from the poles (RGE)", mb.Ops[i])}
		if mb.ScaleSet {
			ch.Detail = "the scale is set to " + mb.Scale.String() + "; the check uses the symbolic mu before that"
		}
		got, err := logMuCoefficient(cs0[i])
		switch {
		case err != nil:
			ch.Detail = err.Error()
		case perr != nil:
			ch.Detail = "poles not spanned by the basis: " + perr.Error()
		default:
			want := predicted[i]
			ch.Passed = got.Sub(want).IsZero()
			ch.Detail = fmt.Sprintf("dC/dln(mu) = %s; predicted by the poles: %s", got, want)
		}
		res.Checks = append(res.Checks, ch)
	}
	for _, op := range mb.ExpectOrder {
		i := slices.Index(mb.Ops, op)
		diff := cs[i].Sub(mb.Expect[op])
		res.Expectations = append(res.Expectations, Check{
			Name:   "C_" + op + " equals the expected " + mb.Expect[op].String(),
			Passed: diff.IsZero(),
			Detail: describe("difference", diff),
		})
	}
	// Ward identity and gauge-parameter checks (match/ward.go, match/gauge.go).
	extra, err := symmetryChecks(p, mb, opt, res)
	if err != nil {
		return nil, err
	}
	res.Checks = append(res.Checks, extra...)
	res.Notes = append(notes, pl.Notes...)
	return res, nil
}

// poles1Loop checks that the ultraviolet poles of the full amplitude (large-momentum expansion
// of the loop terms) are cancelled by the counterterms written as tree terms, and that the
// remaining infrared poles are EFT counterterms in the basis (b0: the operators at d = 4); it
// appends both checks to res and returns what is left of the ultraviolet pole.
func poles1Loop(p *notation.Program, pl *Canon, res *Result, full, pole expr.Expr, small passarino.Small, b0 []expr.Expr) (expr.Expr, error) {
	uv, err := passarino.UVPole(full, massSymbols(p), small.OnShell)
	if err != nil {
		return expr.Expr{}, err
	}
	if uv, err = pl.Apply(uv); err != nil {
		return expr.Expr{}, err
	}
	if uv, err = uv.Subst(expr.DimSymbol, expr.RFInt(4)); err != nil { // residue at d = 4
		return expr.Expr{}, err
	}
	var tree expr.Expr
	for _, t := range full.Terms() {
		if len(t.Loops) == 0 {
			tree = tree.Add(expr.FromTerm(t))
		}
	}
	treeSer, err := vacuum.ExpandEps(tree, 1, p.Positive)
	if err != nil {
		return expr.Expr{}, err
	}
	ctPole, err := pl.Apply(treeSer.Coef(-1))
	if err != nil {
		return expr.Expr{}, err
	}
	uvTotal := uv.Add(ctPole)
	res.Checks = append(res.Checks, Check{
		Name:   "no ultraviolet pole survives the counterterms",
		Passed: uvTotal.IsZero(),
		Detail: describe("remaining UV pole coefficient of 1/eps", uvTotal),
	})
	ir := pole.Sub(uvTotal)
	irC, irErr := Project(ir, b0)
	res.Checks = append(res.Checks, poleCheck("infrared poles of the full theory are EFT counterterms in the declared basis", res.Block.Ops, 1, ir, irC, irErr, "no infrared poles (no EFT counterterm at this order)"))
	return uvTotal, nil
}

// twoLoopPoles checks the poles of a two-loop amplitude whose counterterms are written in the
// file: what remains of 1/ε² and 1/ε must be EFT counterterms in the declared basis, projected
// order by order (ProjectSeries). The split of the poles into ultraviolet and infrared ones is
// not made at two loops.
func twoLoopPoles(pl *Canon, res *Result, ser expr.Series, bser []expr.Series) {
	proj, errs := ProjectSeries(ser, bser)
	for _, k := range []int{-2, -1} {
		name := fmt.Sprintf("1/eps^%d poles after the counterterms of the file are EFT counterterms in the declared basis (two loops: no UV/IR split)", -k)
		pole, err := pl.Apply(ser.Coef(k))
		if err != nil {
			res.Checks = append(res.Checks, Check{Name: name, Detail: err.Error()})
			continue
		}
		res.Checks = append(res.Checks, poleCheck(name, res.Block.Ops, -k, pole, proj[k], errs[k], "the poles cancel"))
	}
}

// poleCheck reports whether a pole of order n is spanned by the basis, listing the EFT
// counterterms it implies.
func poleCheck(name string, ops []string, n int, pole expr.Expr, cs []expr.Expr, err error, none string) Check {
	ch := Check{Name: name, Passed: err == nil}
	switch {
	case err != nil:
		ch.Detail = err.Error()
	case pole.IsZero():
		ch.Detail = none
	default:
		var parts []string
		for i, c := range cs {
			parts = append(parts, fmt.Sprintf("dC_%s = %s", ops[i], c))
		}
		power := "1/eps"
		if n > 1 {
			power = fmt.Sprintf("1/eps^%d", n)
		}
		ch.Detail = fmt.Sprintf("EFT counterterms (coefficients of %s): %s", power, strings.Join(parts, "; "))
	}
	return ch
}

// byLoopOrder splits e by loop order: the loop momenta of a term plus those of the self-energies
// inside its on-shell counterterms onshell(A).
func byLoopOrder(p *notation.Program, e expr.Expr) map[int]expr.Expr {
	out := make(map[int]expr.Expr)
	for _, t := range e.Terms() {
		L := len(t.Loops)
		for _, ap := range t.Atoms {
			if f, ok := ap.A.(expr.Fn); ok && f.Name == notation.OnShellFn {
				if a, ok := p.Amplitude(f.Args[0].String()); ok {
					L += ap.Pow * maxLoops(a.Body)
				}
			}
		}
		out[L] = out[L].Add(expr.FromTerm(t))
	}
	return out
}

func maxLoops(e expr.Expr) int {
	n := 0
	for _, t := range e.Terms() {
		n = max(n, len(t.Loops))
	}
	return n
}

// logMuCoefficient returns ∂e/∂ln μ, which must be free of μ at one loop.
func logMuCoefficient(e expr.Expr) (expr.Expr, error) {
	d, err := e.Derivative("mu")
	if err != nil {
		return expr.Expr{}, err
	}
	return d.MustMul(expr.Sym("mu")), nil
}

// setScale substitutes μ = scale (a positive parameter expression) in the finite part,
// re-splitting the logarithms of μ.
func setScale(e expr.Expr, scale expr.Expr) (expr.Expr, error) {
	r, ok := scale.AsRatFunc()
	if !ok {
		return expr.Expr{}, fmt.Errorf("scale %s is not a parameter expression", scale)
	}
	return e.MapAtoms(func(a expr.Atom) (expr.Expr, bool) {
		f, ok := a.(expr.Fn)
		if !ok || f.Name != expr.FnLog || len(f.Args) != 1 || !f.Args[0].Equal(expr.Sym("mu")) {
			return expr.Expr{}, false
		}
		l, err := expr.LogSplit(expr.FromRF(r), 1, func(string) bool { return true })
		if err != nil {
			return expr.Expr{}, false
		}
		return l, true
	})
}

func operatorByName(p *notation.Program, name string) *notation.Operator {
	for _, o := range p.Operators {
		if o.Name == name {
			return o
		}
	}
	return nil
}

func describe(what string, e expr.Expr) string {
	if e.IsZero() {
		return what + ": 0"
	}
	return what + ": " + e.String()
}
