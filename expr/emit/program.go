package emit

import (
	"errors"
	"fmt"
	"math/big"
	"runtime"
	"slices"
	"strings"
	"sync"
	"unicode"

	"loopmatch/expr"
)

// Kind classifies a parameter of the emitted functions.
type Kind uint8

// The kinds of parameters.
const (
	Ratio   Kind = iota // a ratio of squared masses, positive: the main variable of a function
	Mass                // a mass, positive
	Scale               // the renormalisation scale μ, positive
	Real                // a real coupling or parameter
	Complex             // a complex coupling y; the symbol conj(y) is its conjugate
)

func (k Kind) String() string {
	return [...]string{"ratio", "mass", "scale", "real", "complex"}[k]
}

// Param is a symbol the coefficients may depend on.
type Param struct {
	Name     string
	Kind     Kind
	Num, Den string // a Ratio's masses: Name = Num^2/Den^2
}

// Doc describes the parameter in plain text: "xt = mt^2/mW^2" for a ratio, else its name.
func (p Param) Doc() string {
	if p.Kind == Ratio && p.Num != "" {
		return fmt.Sprintf("%s = %s^2/%s^2", p.Name, p.Num, p.Den)
	}
	return p.Name
}

// Coefficient is one Wilson coefficient to emit.
type Coefficient struct {
	Name     string // exported Go name, e.g. "CQ7"
	Label    string // the name in documents, e.g. "C_Q7"
	Operator string // the operator's definition as written, e.g. "Q7 = bar(s) sigma(al, be) PR b * F(al, be)"
	Expr     expr.Expr
}

// Spec is what to emit: the coefficients of one match block with their parameters.
type Spec struct {
	Package     string
	Source      string    // the input file, named in the output
	Title       string    // e.g. "vertex, leg_b, leg_s onto Q7"
	Conventions []string  // scheme, normalisation, …: one line each
	Scale       expr.Expr // the matching scale μ, or zero when μ stays a free parameter
	Params      []Param   // every symbol that may occur, in the order of the functions' arguments
	Coeffs      []Coefficient
	// Values are argument values for the emitted tests and benchmarks (the file's values);
	// parameters without one get a default.
	Values map[string]complex128
}

// Program is a built Spec: every coefficient split into factors and auxiliary functions, each
// function analysed for its stable evaluation.
type Program struct {
	Spec   Spec
	Coeffs []*Coeff
	Parts  []*Part
	Notes  []string // warnings for the user: poles, points without a stable branch, …
}

// Coeff is one coefficient as C = Common · Σ_i Terms[i].Factor · Terms[i].Part.
type Coeff struct {
	Coefficient
	Args    []Param // the parameters it depends on, in Spec order
	Common  expr.Expr
	Terms   []Term
	Complex bool // an argument is complex
	Real    bool // the value is real for every argument (the result type is float64)
}

// Term is a factor free of the part's variables times an auxiliary function (Part nil: 1).
type Term struct {
	Factor expr.Expr
	Part   *Part
}

// Part is an auxiliary function of the kinematic variables.
type Part struct {
	Index  int      // 1, 2, …: F_1, F_2 in documents; 0 for a part written inside its coefficient
	Vars   []string // its arguments (one: the main variable; several: no stable branches)
	Expr   expr.Expr
	fn     *function // stable program (one variable)
	naive  *body     // closed form (several variables)
	inline bool
}

// ErrUnsupported reports a coefficient that has no float64 program (loop integrals, opaque
// functions, complex kinematic values).
var ErrUnsupported = errors.New("no numerical program")

// Build splits and analyses every coefficient of the spec.
func Build(spec Spec) (*Program, error) {
	p := &Program{Spec: spec}
	kinds := map[string]Kind{}
	for _, par := range spec.Params {
		kinds[par.Name] = par.Kind
	}
	for _, c := range spec.Coeffs {
		co, err := p.split(c, kinds)
		if err != nil {
			return nil, fmt.Errorf("%s: %w", c.Label, err)
		}
		p.Coeffs = append(p.Coeffs, co)
	}
	p.number()
	// The parts are analysed in parallel; notes and errors are collected in order.
	notes := make([][]string, len(p.Parts))
	errs := make([]error, len(p.Parts))
	var wg sync.WaitGroup
	sem := make(chan struct{}, runtime.GOMAXPROCS(0))
	for i, part := range p.Parts {
		wg.Add(1)
		go func() {
			defer wg.Done()
			sem <- struct{}{}
			defer func() { <-sem }()
			notes[i], errs[i] = p.analyse(part)
		}()
	}
	wg.Wait()
	for i := range p.Parts {
		if errs[i] != nil {
			return nil, errs[i]
		}
		p.Notes = append(p.Notes, notes[i]...)
	}
	return p, nil
}

// analyse builds the float64 program of a part: stable branches for a function of one variable,
// the closed form otherwise.
func (p *Program) analyse(part *Part) ([]string, error) {
	name := p.partLabel(part)
	var notes []string
	if len(part.Vars) == 1 {
		fn, err := stabilise(part.Expr, part.Vars[0])
		if err != nil {
			return nil, fmt.Errorf("%s: %w", name, err)
		}
		part.fn = fn
		for _, n := range fn.notes {
			notes = append(notes, fmt.Sprintf("%s: %s", name, n))
		}
		return notes, nil
	}
	b, err := closedForm(part.Expr, part.Vars, 256)
	if err != nil {
		return nil, fmt.Errorf("%s: %w: %v", name, ErrUnsupported, err)
	}
	part.naive = b
	notes = append(notes, fmt.Sprintf("%s depends on %s: it is written as its closed form, without series branches (write the result in one mass ratio with a ratio line to get them)", name, strings.Join(part.Vars, ", ")))
	return notes, nil
}

// number decides which auxiliary functions are written inside their coefficient (a coefficient
// that is one function of its own arguments, used nowhere else) and numbers the others F_1, F_2,
// … in order of appearance.
func (p *Program) number() {
	uses := map[*Part]int{}
	for _, c := range p.Coeffs {
		for _, t := range c.Terms {
			if t.Part != nil {
				uses[t.Part]++
			}
		}
	}
	k := 0
	for _, part := range p.Parts {
		part.Index = 0
	}
	for _, c := range p.Coeffs {
		for _, t := range c.Terms {
			part := t.Part
			switch {
			case part == nil || part.Index != 0 || part.inline:
			case uses[part] == 1 && c.single():
				part.inline = true
			default:
				k++
				part.Index = k
			}
		}
	}
}

// single reports whether the coefficient is one auxiliary function of its own arguments.
func (c *Coeff) single() bool {
	if len(c.Terms) != 1 || c.Terms[0].Part == nil || !c.Common.Equal(expr.Int(1)) || !c.Terms[0].Factor.Equal(expr.Int(1)) {
		return false
	}
	part := c.Terms[0].Part
	if len(c.Args) != len(part.Vars) {
		return false
	}
	for i, a := range c.Args {
		if a.Name != part.Vars[i] {
			return false
		}
	}
	return true
}

// partLabel names a part in messages: F_i(vars), or the coefficient it is written in.
func (p *Program) partLabel(part *Part) string {
	if part.inline {
		for _, c := range p.Coeffs {
			if len(c.Terms) == 1 && c.Terms[0].Part == part {
				return c.Label
			}
		}
	}
	return fmt.Sprintf("F%d(%s)", part.Index, strings.Join(part.Vars, ", "))
}

// baseName strips conj( ) from a symbol.
func baseName(v string) string {
	if in, ok := strings.CutPrefix(v, "conj("); ok {
		return strings.TrimSuffix(in, ")")
	}
	return v
}

// split writes one coefficient as factors times parts.
func (p *Program) split(c Coefficient, kinds map[string]Kind) (*Coeff, error) {
	co := &Coeff{Coefficient: c, Common: expr.Int(1)}
	used := map[string]bool{}
	for _, v := range c.Expr.Vars() {
		b := baseName(v)
		if _, ok := kinds[b]; !ok {
			return nil, fmt.Errorf("%w: the symbol %s is not a parameter", ErrUnsupported, v)
		}
		if b != v && kinds[b] != Complex {
			return nil, fmt.Errorf("%w: %s is the conjugate of a parameter that is not complex", ErrUnsupported, v)
		}
		used[b] = true
	}
	for _, par := range p.Spec.Params {
		if used[par.Name] {
			co.Args = append(co.Args, par)
			if par.Kind == Complex {
				co.Complex = true
			}
		}
	}
	for _, t := range c.Expr.Terms() {
		if len(t.Loops) > 0 || len(t.NC) > 0 {
			return nil, fmt.Errorf("%w: the coefficient contains %s", ErrUnsupported, t)
		}
	}
	co.Real = isReal(c.Expr, co.Args)
	if c.Expr.IsZero() {
		return co, nil
	}
	// The part's variables: the one ratio if there is exactly one, else all kinematic ones.
	var kin, ratios []string
	for _, par := range co.Args {
		switch par.Kind {
		case Ratio:
			ratios = append(ratios, par.Name)
			kin = append(kin, par.Name)
		case Mass, Scale:
			kin = append(kin, par.Name)
		}
	}
	vars := kin
	if len(ratios) == 1 {
		vars = ratios
	}
	groups, err := splitTerms(c.Expr, vars)
	if err != nil && len(vars) < len(kin) {
		vars = kin
		groups, err = splitTerms(c.Expr, vars)
	}
	if err != nil {
		return nil, err
	}
	// Common monomial of the factors.
	var monos []expr.Poly
	for _, g := range groups {
		if r, ok := g.factor.AsRatFunc(); ok {
			monos = append(monos, r.Num())
		} else {
			monos = nil
			break
		}
	}
	if len(monos) > 1 {
		common := monoGCD(monos)
		if !common.IsOne() {
			co.Common = expr.FromRF(expr.RF(common))
			for i := range groups {
				r, _ := groups[i].factor.AsRatFunc()
				q, _ := r.Num().DivExact(common)
				nr, _ := expr.NewRatFunc(q, r.Den())
				groups[i].factor = expr.FromRF(nr)
			}
		}
	}
	for _, g := range groups {
		co.Terms = append(co.Terms, p.term(g, vars))
	}
	return co, nil
}

// group is the part of a coefficient that multiplies one factor.
type group struct {
	factor expr.Expr
	part   expr.Expr
}

// splitTerms groups the terms of e by their factors free of vars.
func splitTerms(e expr.Expr, vars []string) ([]group, error) {
	in := func(v string) bool { return slices.Contains(vars, v) }
	var keys []string
	byKey := map[string]*group{}
	for _, t := range e.Terms() {
		// denominator = c · (factors of vars) · (factors of the rest)
		c, fs := expr.SquareFree(t.Coef.Den())
		denV, denO := expr.PolyConst(c), expr.PolyInt(1)
		for _, f := range fs {
			vs := f.P.Vars()
			switch {
			case allIn(vs, in):
				denV = denV.Mul(f.P.Pow(f.Pow))
			case noneIn(vs, in):
				denO = denO.Mul(f.P.Pow(f.Pow))
			default:
				return nil, fmt.Errorf("the denominator factor %s mixes %s with other symbols", f.P, strings.Join(vars, ", "))
			}
		}
		var atomsV, atomsO []expr.AtomPow
		for _, a := range t.Atoms {
			vs := atomVars(a.A)
			switch {
			case len(vs) == 0 || noneIn(vs, in):
				atomsO = append(atomsO, a)
			case allIn(vs, in):
				atomsV = append(atomsV, a)
			default:
				return nil, fmt.Errorf("%s mixes %s with other symbols", a.A.Key(), strings.Join(vars, ", "))
			}
		}
		// numerator = Σ m_o · N_{m_o}(vars)
		byMono := map[string][]expr.PolyTerm{}
		var monoKeys []string
		monoOf := map[string]expr.Mono{}
		for _, pt := range t.Coef.Num().Terms() {
			var mv, mo expr.Mono
			for _, vp := range pt.Mono {
				if in(vp.Var) {
					mv = append(mv, vp)
				} else {
					mo = append(mo, vp)
				}
			}
			k := expr.PolyMono(big.NewRat(1, 1), mo).String()
			if _, ok := byMono[k]; !ok {
				monoKeys = append(monoKeys, k)
				monoOf[k] = mo
			}
			byMono[k] = append(byMono[k], expr.PolyTerm{Mono: mv, Coef: pt.Coef})
		}
		for _, mk := range monoKeys {
			num := expr.Poly{}
			for _, pt := range byMono[mk] {
				num = num.Add(expr.PolyMono(pt.Coef, pt.Mono))
			}
			partCoef, err := expr.NewRatFunc(num, denV)
			if err != nil {
				return nil, err
			}
			factorCoef, err := expr.NewRatFunc(expr.PolyMono(big.NewRat(1, 1), monoOf[mk]), denO)
			if err != nil {
				return nil, err
			}
			factor := expr.FromTerm(expr.Term{Coef: factorCoef, Atoms: atomsO})
			part := expr.FromTerm(expr.Term{Coef: partCoef, Atoms: atomsV})
			key := factor.String()
			g, ok := byKey[key]
			if !ok {
				g = &group{factor: factor}
				byKey[key] = g
				keys = append(keys, key)
			}
			g.part = g.part.Add(part)
		}
	}
	var out []group
	for _, k := range keys {
		if !byKey[k].part.IsZero() {
			out = append(out, *byKey[k])
		}
	}
	return out, nil
}

func allIn(vs []string, in func(string) bool) bool {
	for _, v := range vs {
		if !in(v) {
			return false
		}
	}
	return true
}

func noneIn(vs []string, in func(string) bool) bool {
	for _, v := range vs {
		if in(v) {
			return false
		}
	}
	return true
}

func atomVars(a expr.Atom) []string {
	f, ok := a.(expr.Fn)
	if !ok {
		return nil
	}
	var out []string
	for _, arg := range f.Args {
		out = append(out, arg.Vars()...)
	}
	return out
}

// monoGCD is the largest monomial dividing every term of every polynomial.
func monoGCD(ps []expr.Poly) expr.Poly {
	var m expr.Mono
	first := true
	for _, p := range ps {
		for _, t := range p.Terms() {
			if first {
				m = append(expr.Mono(nil), t.Mono...)
				first = false
				continue
			}
			var out expr.Mono
			for _, vp := range m {
				if e := t.Mono.Exp(vp.Var); e > 0 {
					out = append(out, expr.VarPow{Var: vp.Var, Exp: min(e, vp.Exp)})
				}
			}
			m = out
		}
	}
	return expr.PolyMono(big.NewRat(1, 1), m)
}

// term registers the part of a group (sharing equal parts, and parts equal up to sign).
func (p *Program) term(g group, vars []string) Term {
	var used []string
	for _, v := range vars {
		if slices.Contains(g.part.Vars(), v) {
			used = append(used, v)
		}
	}
	if len(used) == 0 { // a constant: it joins the factor
		return Term{Factor: g.factor.MustMul(g.part)}
	}
	for _, q := range p.Parts {
		if !slices.Equal(q.Vars, used) {
			continue
		}
		if q.Expr.Equal(g.part) {
			return Term{Factor: g.factor, Part: q}
		}
		if q.Expr.Equal(g.part.Neg()) {
			return Term{Factor: g.factor.Neg(), Part: q}
		}
	}
	q := &Part{Vars: used, Expr: g.part}
	p.Parts = append(p.Parts, q)
	return Term{Factor: g.factor, Part: q}
}

// isReal reports whether e is real for real values of its real parameters and any values of the
// complex ones: e must not change when every y is exchanged with conj(y), and must not contain
// the imaginary unit.
func isReal(e expr.Expr, args []Param) bool {
	swapped := e
	for _, a := range args {
		if a.Kind != Complex {
			continue
		}
		tmp := "·swap"
		var err error
		for _, st := range [][2]string{{a.Name, tmp}, {"conj(" + a.Name + ")", a.Name}, {tmp, "conj(" + a.Name + ")"}} {
			if swapped, err = swapped.Subst(st[0], expr.RFVar(st[1])); err != nil {
				return false
			}
		}
	}
	if !swapped.Equal(e) {
		return false
	}
	for _, t := range e.Terms() {
		for _, a := range t.Atoms {
			if c, ok := a.A.(expr.Const); ok && c == expr.I {
				return false
			}
		}
	}
	return true
}

// goIdent turns a symbol into a Go identifier that is not reserved.
func goIdent(s string) string {
	var sb strings.Builder
	for i, r := range s {
		switch {
		case r == '_' || unicode.IsLetter(r) && r < 128 || i > 0 && unicode.IsDigit(r) && r < 128:
			sb.WriteRune(r)
		default:
			sb.WriteRune('_')
		}
	}
	out := sb.String()
	if out == "" || unicode.IsDigit(rune(out[0])) {
		out = "v" + out
	}
	if goReserved[out] {
		out += "_"
	}
	return out
}
