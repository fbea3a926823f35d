package notation

import (
	"errors"
	"fmt"
	"maps"
	"math/big"
	"slices"
	"strconv"
	"strings"

	"github.com/alecthomas/participle/v2/lexer"

	"loopmatch/expr"
	"loopmatch/expr/dirac"
)

// vkind tells scalars (expressions, possibly with Dirac strings) from vectors (linear
// combinations of momenta).
type vkind int

const (
	vScalar vkind = iota
	vVector
)

// value is a lowered sub-expression. idx counts the Lorentz indices that appear in it
// (syntactically; the maximum over the terms of a sum), to catch an index used three times.
type value struct {
	kind vkind
	e    expr.Expr
	mom  expr.Mom
	idx  map[string]int
}

func scalar(e expr.Expr) value { return value{kind: vScalar, e: e} }

// binding is what a define parameter stands for: another name (an index, a leg, a momentum)
// or a lowered value.
type binding struct {
	alias string
	val   *value
}

type lowerer struct {
	p     *Program
	loops []string
	env   []map[string]binding
	depth int
	// op is set while lowering an operator definition: leg names are fields and bar(…), F(…),
	// G(…), D(…) are allowed; pendingD holds derivative indices waiting for the next field.
	op       bool
	pendingD []string
}

// maxDefineDepth bounds nested define expansion (and catches recursive defines).
const maxDefineDepth = 50

// lowerScalar lowers an expression that must be a scalar; loops are allowed only in amplitudes.
func (p *Program) lowerScalar(e *Expr, allowLoops bool) (expr.Expr, error) {
	l := &lowerer{p: p}
	v, err := l.expr(e)
	if err != nil {
		return expr.Expr{}, err
	}
	if v.kind != vScalar {
		return expr.Expr{}, errorf(e.Pos, "expected a scalar expression, found the vector %s (write a scalar product p.q)", v.mom)
	}
	if !allowLoops && v.e.HasLoops() {
		return expr.Expr{}, errorf(e.Pos, "a loop integral is not allowed here")
	}
	for _, t := range v.e.Terms() {
		if len(t.NC) > 0 {
			return expr.Expr{}, errorf(e.Pos, "Dirac or colour matrices outside a spinor chain: every gamma, slash, sigma, PL, PR, G5 and T must stand between ubar(…)/vbar(…) and u(…)/v(…)")
		}
	}
	return v.e, nil
}

// ParseExpr parses and lowers an expression in the context of the program's declarations, for
// example a canonical text printed by expr (round trip) or an expression from the command line.
func (p *Program) ParseExpr(src string) (expr.Expr, error) {
	if err := checkNesting("<expr>", []byte(src)); err != nil {
		return expr.Expr{}, err
	}
	ast, err := exprParser.ParseString("<expr>", src)
	if err != nil {
		return expr.Expr{}, syntaxError("<expr>", err)
	}
	p.exprSrc = []byte(src)
	defer func() { p.exprSrc = nil }()
	return p.lowerScalar(ast, true)
}

// ParseFreeExpr parses an expression in which every undeclared name is a real symbol (for
// `loopmatch simplify`).
func ParseFreeExpr(src string) (expr.Expr, error) {
	if err := checkNesting("<expr>", []byte(src)); err != nil {
		return expr.Expr{}, err
	}
	ast, err := exprParser.ParseString("<expr>", src)
	if err != nil {
		return expr.Expr{}, syntaxError("<expr>", err)
	}
	p := &Program{File: "<expr>", Decls: map[string]*Decl{}, defines: map[string]*DefineStmt{}, loopSites: map[string]lexer.Position{}, exprSrc: []byte(src)}
	var declareAll func(e *Expr) error
	declareAll = func(e *Expr) error {
		var err error
		walkRefs(e, func(r *NameRef) {
			if err != nil {
				return
			}
			if r.Call != nil || r.Index != nil {
				return
			}
			if _, ok := builtins[r.Name]; ok {
				return
			}
			if _, ok := p.Decls[r.Name]; !ok {
				p.Decls[r.Name] = &Decl{Name: r.Name, Kind: KindSymbol, Pos: posOf(r.Pos)}
				p.DeclOrder = append(p.DeclOrder, r.Name)
			}
		})
		return err
	}
	if err := declareAll(ast); err != nil {
		return expr.Expr{}, err
	}
	if err := checkDepth(&File{Stmts: []*Stmt{{Amplitude: &AmpStmt{Body: ast}}}}); err != nil {
		return expr.Expr{}, err
	}
	return p.lowerScalar(ast, false)
}

// walkPrimaries calls f for every primary of e with its nesting depth (parentheses, loop bodies
// and call arguments each add one), parents before children, and stops at the first error.
func walkPrimaries(e *Expr, depth int, f func(pm *Primary, depth int) error) error {
	if e == nil {
		return nil
	}
	prods := []*Product{e.First}
	for _, r := range e.Rest {
		prods = append(prods, r.Prod)
	}
	for _, pr := range prods {
		pows := []*Power{pr.First}
		for _, m := range pr.Rest {
			pows = append(pows, m.Factor)
		}
		for _, pw := range pows {
			for _, pm := range []*Primary{pw.Base.Left, pw.Base.Right} {
				if pm == nil {
					continue
				}
				if err := f(pm, depth); err != nil {
					return err
				}
				var inner []*Expr
				switch {
				case pm.Paren != nil:
					inner = []*Expr{pm.Paren}
				case pm.Loop != nil:
					inner = []*Expr{pm.Loop.Body}
				case pm.Ref != nil && pm.Ref.Call != nil:
					for _, g := range pm.Ref.Call.Groups {
						inner = append(inner, g.Args...)
					}
				}
				for _, x := range inner {
					if err := walkPrimaries(x, depth+1, f); err != nil {
						return err
					}
				}
			}
		}
	}
	return nil
}

// walkRefs calls f for every name reference in e, including call arguments and loop bodies.
func walkRefs(e *Expr, f func(*NameRef)) {
	_ = walkPrimaries(e, 0, func(pm *Primary, _ int) error {
		if pm.Ref != nil {
			f(pm.Ref)
		}
		return nil
	})
}

func mergeMax(a, b map[string]int) map[string]int {
	if len(a) == 0 {
		return b
	}
	out := maps.Clone(a)
	for k, v := range b {
		out[k] = max(out[k], v)
	}
	return out
}

func mergeSum(a, b map[string]int) map[string]int {
	if len(a) == 0 {
		return b
	}
	out := maps.Clone(a)
	for k, v := range b {
		out[k] += v
	}
	return out
}

func freeSet(idx map[string]int) []string {
	var out []string
	for k, v := range idx {
		if v == 1 {
			out = append(out, k)
		}
	}
	slices.Sort(out)
	return out
}

func (l *lowerer) expr(e *Expr) (value, error) {
	v, err := l.product(e.First)
	if err != nil {
		return value{}, err
	}
	if e.Neg {
		v = negate(v)
	}
	for _, r := range e.Rest {
		w, err := l.product(r.Prod)
		if err != nil {
			return value{}, err
		}
		if r.Op == "-" {
			w = negate(w)
		}
		if v.kind != w.kind {
			return value{}, errorf(r.Pos, "cannot add a %s and a %s", kindWord(v.kind), kindWord(w.kind))
		}
		if fv, fw := freeSet(v.idx), freeSet(w.idx); !slices.Equal(fv, fw) {
			return value{}, errorf(r.Pos, "the terms of this sum have different free indices: {%s} and {%s}", strings.Join(fv, ", "), strings.Join(fw, ", "))
		}
		if v.kind == vVector {
			v = value{kind: vVector, mom: v.mom.Add(w.mom), idx: mergeMax(v.idx, w.idx)}
		} else {
			v = value{kind: vScalar, e: v.e.Add(w.e), idx: mergeMax(v.idx, w.idx)}
		}
	}
	return v, nil
}

func kindWord(k vkind) string {
	if k == vVector {
		return "vector"
	}
	return "scalar"
}

func negate(v value) value {
	if v.kind == vVector {
		v.mom = v.mom.Scale(big.NewRat(-1, 1))
		return v
	}
	v.e = v.e.Neg()
	return v
}

func (l *lowerer) product(p *Product) (value, error) {
	if l.op {
		return l.opProduct(p)
	}
	v, err := l.power(p.First)
	if err != nil {
		return value{}, err
	}
	for _, m := range p.Rest {
		if m.Op == "/" {
			inv, err := l.denominator(m.Factor)
			if err != nil {
				return value{}, err
			}
			v, err = l.mul(v, inv, m.Pos)
			if err != nil {
				return value{}, err
			}
			continue
		}
		w, err := l.power(m.Factor)
		if err != nil {
			return value{}, err
		}
		if v, err = l.mul(v, w, m.Pos); err != nil {
			return value{}, err
		}
	}
	return v, nil
}

func (l *lowerer) mul(a, b value, pos lexer.Position) (value, error) {
	idx := mergeSum(a.idx, b.idx)
	for _, k := range slices.Sorted(maps.Keys(idx)) {
		if idx[k] > 2 {
			return value{}, errorf(pos, "index %s is used %d times in one product (at most twice: once free, or twice contracted)", k, idx[k])
		}
	}
	switch {
	case a.kind == vScalar && b.kind == vScalar:
		e, err := a.e.Mul(b.e)
		if err != nil {
			return value{}, errorf(pos, "%v", err)
		}
		return value{kind: vScalar, e: e, idx: idx}, nil
	case a.kind == vVector && b.kind == vVector:
		return value{}, errorf(pos, "product of two vectors: write p.q for a scalar product")
	}
	vec, sc := a, b
	if b.kind == vVector {
		vec, sc = b, a
	}
	r, ok := sc.e.AsRatFunc()
	c, ok2 := r.ConstValue()
	if !ok || !ok2 {
		return value{}, errorf(pos, "a vector can only be multiplied by a number, found %s", sc.e)
	}
	return value{kind: vVector, mom: vec.mom.Scale(c), idx: idx}, nil
}

// denominator lowers a factor after "/" and returns its inverse. A parenthesised product is
// inverted factor by factor, so that products of propagators are recognised one by one.
func (l *lowerer) denominator(pw *Power) (value, error) {
	n := 1
	if pw.Exp != nil {
		var err error
		if n, err = exponent(pw.Exp); err != nil {
			return value{}, err
		}
	}
	if n < 0 {
		// 1/x^(−n) = x^n
		base := &Power{Pos: pw.Pos, Base: pw.Base}
		v, err := l.power(base)
		if err != nil {
			return value{}, err
		}
		return l.raise(v, -n, pw.Pos)
	}
	if !(pw.Base.Right == nil && pw.Base.Left.Paren != nil && len(pw.Base.Left.Paren.Rest) == 0 && !pw.Base.Left.Paren.Neg) {
		b, err := l.dotted(pw.Base)
		if err != nil {
			return value{}, err
		}
		if b.kind == vVector {
			if n != 2 {
				return value{}, errorf(pw.Pos, "a vector can only be squared (p^2 = p.p), found the power %d", n)
			}
			b, n = scalar(dotMoms(b.mom, b.mom)), 1
		}
		inv, err := l.invert(b, pw.Pos)
		if err != nil {
			return value{}, err
		}
		return l.raise(inv, n, pw.Pos)
	}
	// (f1 * f2 / f3 …)^n: invert each factor, then raise.
	pr := pw.Base.Left.Paren.First
	inv, err := l.denominator(pr.First)
	if err != nil {
		return value{}, err
	}
	for _, m := range pr.Rest {
		var w value
		if m.Op == "/" {
			w, err = l.power(m.Factor)
		} else {
			w, err = l.denominator(m.Factor)
		}
		if err != nil {
			return value{}, err
		}
		if inv, err = l.mul(inv, w, m.Pos); err != nil {
			return value{}, err
		}
	}
	return l.raise(inv, n, pw.Pos)
}

// invert returns 1/v for a scalar that is a rational function, a propagator (momentum squared
// minus a mass squared, up to a constant factor) or a single invertible term.
func (l *lowerer) invert(v value, pos lexer.Position) (value, error) {
	if v.kind == vVector {
		return value{}, errorf(pos, "cannot divide by the vector %s", v.mom)
	}
	if len(v.idx) > 0 {
		return value{}, errorf(pos, "cannot divide by an expression with Lorentz indices")
	}
	if r, ok := v.e.AsRatFunc(); ok {
		inv, err := r.Inv()
		if err != nil {
			return value{}, errorf(pos, "division by zero")
		}
		return scalar(expr.FromRF(inv)), nil
	}
	if s, prop, ok := asPropagator(v.e); ok {
		sinv, _ := s.Inv()
		return scalar(expr.FromAtom(prop, -1).Scale(sinv)), nil
	}
	if v.e.Len() == 1 && !l.dependsOnLoop(v.e) {
		t := v.e.Terms()[0]
		if len(t.NC) == 0 && len(t.Loops) == 0 {
			inv, err := v.e.Pow(-1)
			if err == nil {
				return scalar(inv), nil
			}
		}
	}
	return value{}, errorf(pos, "cannot divide by %s: a denominator must be a product of propagators (momentum squared minus a mass squared) and parameter expressions", v.e)
}

// dependsOnLoop reports whether e contains a loop momentum of the enclosing loops.
func (l *lowerer) dependsOnLoop(e expr.Expr) bool {
	for _, t := range e.Terms() {
		for _, a := range t.Atoms {
			switch x := a.A.(type) {
			case expr.Dot:
				if slices.Contains(l.loops, x.A) || slices.Contains(l.loops, x.B) {
					return true
				}
			case expr.Vec:
				if slices.Contains(l.loops, x.P) {
					return true
				}
			}
		}
	}
	return false
}

// asPropagator recognises s·(K² − M²) with K a combination of momenta and M² free of momenta.
func asPropagator(e expr.Expr) (expr.RatFunc, expr.Prop, bool) {
	type pair struct{ a, b string }
	q := map[pair]*big.Rat{}
	names := map[string]bool{}
	mass := expr.RFInt(0)
	for _, t := range e.Terms() {
		if len(t.NC) > 0 || len(t.Loops) > 0 {
			return expr.RatFunc{}, expr.Prop{}, false
		}
		if len(t.Atoms) == 0 {
			mass = mass.Add(t.Coef)
			continue
		}
		if len(t.Atoms) != 1 || t.Atoms[0].Pow != 1 {
			return expr.RatFunc{}, expr.Prop{}, false
		}
		d, ok := t.Atoms[0].A.(expr.Dot)
		if !ok {
			return expr.RatFunc{}, expr.Prop{}, false
		}
		c, ok := t.Coef.ConstValue()
		if !ok {
			return expr.RatFunc{}, expr.Prop{}, false
		}
		names[d.A], names[d.B] = true, true
		if d.A == d.B {
			q[pair{d.A, d.A}] = c
		} else {
			h := new(big.Rat).Quo(c, big.NewRat(2, 1))
			q[pair{d.A, d.B}], q[pair{d.B, d.A}] = h, h
		}
	}
	if len(names) == 0 {
		return expr.RatFunc{}, expr.Prop{}, false
	}
	ns := slices.Sorted(maps.Keys(names))
	get := func(a, b string) *big.Rat {
		if r, ok := q[pair{a, b}]; ok {
			return r
		}
		return new(big.Rat)
	}
	var first string
	for _, n := range ns {
		if get(n, n).Sign() != 0 {
			first = n
			break
		}
	}
	if first == "" {
		return expr.RatFunc{}, expr.Prop{}, false
	}
	s := get(first, first)
	var k []expr.MomTerm
	for _, n := range ns {
		k = append(k, expr.MomTerm{Name: n, Coef: new(big.Rat).Quo(get(first, n), s)})
	}
	K := expr.NewMom(k...)
	for _, a := range ns {
		for _, b := range ns {
			want := new(big.Rat).Mul(s, new(big.Rat).Mul(K.Coef(a), K.Coef(b)))
			if want.Cmp(get(a, b)) != 0 {
				return expr.RatFunc{}, expr.Prop{}, false
			}
		}
	}
	sr := expr.RFRat(s)
	m2, _ := mass.Neg().Div(sr)
	return sr, expr.NewProp(K, m2), true
}

func exponent(x *Exponent) (int, error) {
	v, neg := x.Value, x.Neg
	if v == "" {
		v, neg = x.PValue, x.PNeg
	}
	n, err := strconv.Atoi(v)
	if err != nil {
		return 0, errorf(x.Pos, "an exponent must be an integer, found %s", v)
	}
	if n > 64 {
		return 0, errorf(x.Pos, "exponent %d is larger than the limit 64", n)
	}
	if neg {
		n = -n
	}
	return n, nil
}

func (l *lowerer) power(pw *Power) (value, error) {
	v, err := l.dotted(pw.Base)
	if err != nil {
		return value{}, err
	}
	if pw.Exp == nil {
		return v, nil
	}
	n, err := exponent(pw.Exp)
	if err != nil {
		return value{}, err
	}
	if v.kind == vVector {
		if n != 2 {
			return value{}, errorf(pw.Exp.Pos, "a vector can only be squared (p^2 = p.p), found the power %d", n)
		}
		return scalar(dotMoms(v.mom, v.mom)), nil
	}
	if n < 0 {
		if v, err = l.invert(v, pw.Pos); err != nil {
			return value{}, err
		}
		n = -n
	}
	return l.raise(v, n, pw.Pos)
}

func (l *lowerer) raise(v value, n int, pos lexer.Position) (value, error) {
	if n == 1 {
		return v, nil
	}
	if v.kind == vVector {
		return value{}, errorf(pos, "cannot raise a vector to a power")
	}
	if len(freeSet(v.idx)) > 0 || len(v.idx) > 0 && n > 1 {
		return value{}, errorf(pos, "cannot raise an expression with Lorentz indices to a power")
	}
	e, err := v.e.Pow(n)
	if err != nil {
		return value{}, errorf(pos, "%v", err)
	}
	return value{kind: vScalar, e: e}, nil
}

func dotMoms(a, b expr.Mom) expr.Expr {
	res := expr.Zero()
	for _, x := range a {
		for _, y := range b {
			c := new(big.Rat).Mul(x.Coef, y.Coef)
			res = res.Add(expr.FromAtom(expr.NewDot(x.Name, y.Name), 1).Scale(expr.RFRat(c)))
		}
	}
	return res
}

func (l *lowerer) dotted(d *Dotted) (value, error) {
	a, err := l.primary(d.Left)
	if err != nil {
		return value{}, err
	}
	if d.Right == nil {
		return a, nil
	}
	b, err := l.primary(d.Right)
	if err != nil {
		return value{}, err
	}
	if a.kind != vVector || b.kind != vVector {
		return value{}, errorf(d.Pos, "the dot forms the scalar product of two vectors (p.q); found a %s and a %s", kindWord(a.kind), kindWord(b.kind))
	}
	return scalar(dotMoms(a.mom, b.mom)), nil
}

func (l *lowerer) primary(pm *Primary) (value, error) {
	switch {
	case pm.Number != nil:
		r, err := parseNumber(*pm.Number)
		if err != nil {
			return value{}, errorf(pm.Pos, "%v", err)
		}
		return scalar(expr.Num(r)), nil
	case pm.Paren != nil:
		return l.expr(pm.Paren)
	case pm.Loop != nil:
		return l.loop(pm.Loop)
	}
	return l.ref(pm.Ref)
}

// maxExp10 bounds the decimal exponent of a number literal (1e400 is fine, 1e999999999 is not).
const maxExp10 = 400

// parseNumber reads a decimal literal exactly.
func parseNumber(s string) (*big.Rat, error) {
	if i := strings.IndexAny(s, "eE"); i >= 0 {
		e, err := strconv.Atoi(s[i+1:])
		if err != nil || e > maxExp10 || e < -maxExp10 {
			return nil, fmt.Errorf("the exponent of %s is outside ±%d", s, maxExp10)
		}
	}
	if len(s) > 1000 {
		return nil, fmt.Errorf("number literal longer than 1000 characters")
	}
	r, ok := new(big.Rat).SetString(s)
	if !ok {
		return nil, fmt.Errorf("bad number %q", s)
	}
	return r, nil
}

func (l *lowerer) loop(lp *Loop) (value, error) {
	var moms []string
	for _, m := range lp.Moms {
		if slices.Contains(l.loops, m.Value) || slices.Contains(moms, m.Value) {
			return value{}, errorf(m.Pos, "loop momentum %s is already integrated over here", m.Value)
		}
		if d, ok := l.p.Decls[m.Value]; ok {
			return value{}, errorf(m.Pos, "loop momentum %s is already declared as a %s at %s", m.Value, d.Kind, d.Pos)
		}
		if _, ok := builtins[m.Value]; ok {
			return value{}, errorf(m.Pos, "%s is a built-in name and cannot be a loop momentum", m.Value)
		}
		moms = append(moms, m.Value)
	}
	saved := l.loops
	l.loops = append(append([]string{}, l.loops...), moms...)
	body, err := l.expr(lp.Body)
	l.loops = saved
	if err != nil {
		return value{}, err
	}
	if body.kind != vScalar {
		return value{}, errorf(lp.Pos, "the integrand of a loop must be a scalar")
	}
	e, err := expr.Integrate(body.e, moms...)
	if err != nil {
		return value{}, errorf(lp.Pos, "%v", err)
	}
	return value{kind: vScalar, e: e, idx: body.idx}, nil
}

// lookup resolves a name through the define-parameter bindings.
func (l *lowerer) lookup(name string) (binding, bool) {
	for i := len(l.env) - 1; i >= 0; i-- {
		if b, ok := l.env[i][name]; ok {
			return b, true
		}
	}
	return binding{}, false
}

// resolveName follows aliases to the name in the file's scope.
func (l *lowerer) resolveName(name string) string {
	if b, ok := l.lookup(name); ok && b.val == nil {
		return b.alias // bindings hold names of the file's scope
	}
	return name
}

// spacedCall reports whether a name is separated by whitespace from the "(" that follows it,
// as in "PR (slash(k) + m)", which then reads as a product rather than a call.
func (l *lowerer) spacedCall(r *NameRef) bool {
	src := l.p.src
	if r.Pos.Filename == "<expr>" {
		src = l.p.exprSrc
	}
	i := r.Pos.Offset + len(r.Name)
	return i < len(src) && src[i] != '('
}

// isFunctionName reports whether a call of name has a meaning as a function.
func (l *lowerer) isFunctionName(name string) bool {
	if _, ok := functionArity[name]; ok {
		return true
	}
	if _, ok := integralArity[name]; ok {
		return true
	}
	if _, ok := operatorOnly[name]; ok {
		return true
	}
	d, ok := l.p.Decls[name]
	return ok && d.Kind == KindDefine && len(l.p.defines[name].Params) > 0
}

func (l *lowerer) ref(r *NameRef) (value, error) {
	if r.Call != nil && !l.isFunctionName(r.Name) && l.spacedCall(r) {
		// NAME (x): juxtaposition of a value and a parenthesised factor.
		if len(r.Call.Groups) != 1 || len(r.Call.Groups[0].Args) != 1 {
			return value{}, errorf(r.Pos, "%s is not a function; a parenthesised factor after it must be a single expression", r.Name)
		}
		a, err := l.ref(&NameRef{Pos: r.Pos, Name: r.Name})
		if err != nil {
			return value{}, err
		}
		b, err := l.expr(r.Call.Groups[0].Args[0])
		if err != nil {
			return value{}, err
		}
		return l.mul(a, b, r.Call.Pos)
	}
	if b, ok := l.lookup(r.Name); ok && r.Call == nil {
		if b.val != nil {
			if r.Index != nil {
				if b.val.kind != vVector {
					return value{}, errorf(r.Pos, "%s stands for a scalar expression and cannot take an index", r.Name)
				}
				return l.momComponent(b.val.mom, r)
			}
			return *b.val, nil
		}
		// Aliases are resolved to names of the file's scope when bound; so is the index of K[mu]
		// (itself possibly a parameter) before the define's scope is left.
		idx := r.Index
		if idx != nil {
			idx = &Name{Pos: idx.Pos, Value: l.resolveName(idx.Value)}
		}
		saved := l.env
		l.env = nil
		v, err := l.ref(&NameRef{Pos: r.Pos, Name: b.alias, Index: idx})
		l.env = saved
		return v, err
	}
	if r.Call != nil {
		return l.call(r)
	}
	name := r.Name
	if r.Index != nil {
		return l.component(r)
	}
	switch name {
	case "pi":
		return scalar(expr.FromAtom(expr.Pi, 1)), nil
	case "I":
		return scalar(expr.FromAtom(expr.I, 1)), nil
	case "zeta3":
		return scalar(expr.FromAtom(expr.Zeta3, 1)), nil
	case "d", "mu", "Nc":
		return scalar(expr.Sym(name)), nil
	case "PL":
		return l.nc(expr.NC{Op: expr.NCPL}), nil
	case "PR":
		return l.nc(expr.NC{Op: expr.NCPR}), nil
	case "G5":
		return l.nc(expr.NC{Op: expr.NCG5}), nil
	case "i0":
		return value{}, errorf(r.Pos, "i0 may appear only as the last term of the argument of log or Li2, as in log(x - i0)")
	case "eps":
		return value{}, errorf(r.Pos, "eps cannot be written in a file: write expressions in d (= 4 - 2*eps); the tool expands in eps")
	}
	if slices.Contains(l.loops, name) {
		return value{kind: vVector, mom: expr.MomOf(name)}, nil
	}
	if site, ok := l.p.loopSites[name]; ok {
		if _, declared := l.p.Decls[name]; !declared {
			return value{}, errorf(r.Pos, "%s is the loop momentum of the loop at %d:%d and is used outside that loop's braces", name, site.Line, site.Column)
		}
	}
	d, ok := l.p.Decls[name]
	if !ok {
		return value{}, errorf(r.Pos, "undeclared name %s", name)
	}
	switch d.Kind {
	case KindCoupling, KindComplex, KindMass, KindLight, KindSymbol, KindGauge:
		return scalar(expr.Sym(name)), nil
	case KindMomentum, KindPolarization:
		return value{kind: vVector, mom: expr.MomOf(name)}, nil
	case KindAmplitude:
		a, _ := l.p.Amplitude(name)
		return scalar(a.Body), nil
	case KindDefine:
		return l.expand(r, nil)
	case KindIndex:
		return value{}, errorf(r.Pos, "%s is a Lorentz index; use it inside gamma(%s), p[%s], g(%s, nu), sigma(%s, nu)", name, name, name, name, name)
	case KindLeg:
		if l.op {
			leg, _ := l.p.Leg(name)
			return l.field(leg, false, r.Pos)
		}
		return value{}, errorf(r.Pos, "%s is an external leg; use its spinor (u(%s), ubar(%s), v(%s), vbar(%s)) or its momentum", name, name, name, name, name)
	}
	return value{}, errorf(r.Pos, "%s is a %s and cannot be used as a value here", name, d.Kind)
}

func (l *lowerer) nc(n expr.NC) value {
	idx := map[string]int{}
	if n.Op == expr.NCGamma || n.Op == expr.NCSigma {
		for _, a := range n.Args {
			idx[a]++
		}
	}
	return value{kind: vScalar, e: expr.FromNC(n), idx: idx}
}

// component lowers p[mu].
func (l *lowerer) component(r *NameRef) (value, error) {
	mu, err := l.indexName(r.Index.Value, r.Index.Pos, KindIndex)
	if err != nil {
		return value{}, err
	}
	name := l.resolveName(r.Name)
	if !l.isVectorName(name) {
		return value{}, errorf(r.Pos, "%s[%s]: %s is not a momentum or polarization vector", r.Name, mu, r.Name)
	}
	return value{kind: vScalar, e: expr.FromAtom(expr.Vec{P: name, Mu: mu}, 1), idx: map[string]int{mu: 1}}, nil
}

// momComponent lowers K[mu] for a define parameter K bound to a combination of momenta:
// (q − k)[mu] = q[mu] − k[mu].
func (l *lowerer) momComponent(m expr.Mom, r *NameRef) (value, error) {
	mu, err := l.indexName(r.Index.Value, r.Index.Pos, KindIndex)
	if err != nil {
		return value{}, err
	}
	e := expr.Zero()
	for _, t := range m {
		e = e.Add(expr.FromAtom(expr.Vec{P: t.Name, Mu: mu}, 1).Scale(expr.RFRat(t.Coef)))
	}
	if e.IsZero() {
		return scalar(e), nil
	}
	return value{kind: vScalar, e: e, idx: map[string]int{mu: 1}}, nil
}

func (l *lowerer) isVectorName(name string) bool {
	if slices.Contains(l.loops, name) {
		return true
	}
	d, ok := l.p.Decls[name]
	return ok && (d.Kind == KindMomentum || d.Kind == KindPolarization)
}

// indexName checks that name (after define aliases) is declared with kind k.
func (l *lowerer) indexName(name string, pos lexer.Position, k Kind) (string, error) {
	name = l.resolveName(name)
	d, ok := l.p.Decls[name]
	if !ok {
		return "", errorf(pos, "undeclared index %s (declare it under %s)", name, declWord(k))
	}
	if d.Kind != k {
		return "", errorf(pos, "%s is a %s, expected a %s", name, d.Kind, k)
	}
	return name, nil
}

func declWord(k Kind) string {
	for w, kk := range declKinds {
		if kk == k {
			return w
		}
	}
	return k.String()
}

// argNames returns the call's arguments as bare names (for index, leg and momentum slots).
func argName(a *Expr) (string, lexer.Position, bool) {
	if a.Neg || len(a.Rest) > 0 || len(a.First.Rest) > 0 {
		return "", a.Pos, false
	}
	pw := a.First.First
	if pw.Exp != nil || pw.Base.Right != nil || pw.Base.Left.Ref == nil {
		return "", a.Pos, false
	}
	ref := pw.Base.Left.Ref
	if ref.Call != nil || ref.Index != nil {
		return "", a.Pos, false
	}
	return ref.Name, ref.Pos, true
}

// OnShellFn is the function name of on-shell mass counterterms, onshell(A).
const OnShellFn = "onshell"

// integralArity gives the argument groups of the scalar-integral calls (invariants; masses).
var integralArity = map[string][]int{
	"A0": {1}, "B0": {1, 2}, "B0prime": {1, 2}, "C0": {3, 3}, "D0": {6, 4},
}

var functionArity = map[string]int{
	"gamma": 1, "slash": 1, "sigma": 2, "ubar": 1, "vbar": 1, "u": 1, "v": 1, "g": 2, "levi": 4,
	"T": 1, "f": 3, "delta": 2, "log": 1, "Li2": 1, "Cl2": 1, "sqrt": 1, "conj": 1,
	"tr": 1, "ctr": 1, "onshell": 1,
}

// operatorOnly are the functions that exist only in operator definitions.
var operatorOnly = map[string]string{
	"bar": "a Dirac-conjugate field", "F": "the photon field strength",
	"G": "the gluon field strength", "D": "the covariant derivative",
}

func (l *lowerer) call(r *NameRef) (value, error) {
	name := r.Name
	groups := r.Call.Groups
	if d, ok := l.p.Decls[name]; ok && d.Kind == KindDefine {
		return l.expand(r, groups)
	}
	if want, ok := integralArity[name]; ok {
		return l.integralCall(r, want)
	}
	if why, ok := operatorOnly[name]; ok {
		if !l.op {
			return value{}, errorf(r.Pos, "%s(…) is %s; it may appear only in an operator definition", name, why)
		}
		switch name {
		case "bar":
			if len(groups) != 1 || len(groups[0].Args) != 1 {
				return value{}, errorf(r.Pos, "bar takes one fermion leg")
			}
			n, pos, ok := argName(groups[0].Args[0])
			if !ok {
				return value{}, errorf(r.Pos, "bar takes one fermion leg")
			}
			leg, ok := l.p.Leg(l.resolveName(n))
			if !ok {
				return value{}, errorf(pos, "bar(%s): %s is not an external leg", n, n)
			}
			return l.field(leg, true, pos)
		case "F", "G":
			return l.fieldStrength(r)
		}
		return value{}, errorf(r.Pos, "D(…) must stand directly before the field it differentiates")
	}
	n, ok := functionArity[name]
	if ok {
		v, err := l.builtinCall(r, name, n)
		if err != nil {
			if d, declared := l.p.Decls[name]; declared {
				err.Msg += fmt.Sprintf(" (%s is also declared as a %s; to multiply write %s*(…))", name, d.Kind, name)
			}
			return value{}, err
		}
		return v, nil
	}
	{
		if d, ok := l.p.Decls[name]; ok {
			return value{}, errorf(r.Pos, "%s is a %s, not a function; write %s*(…) to multiply", name, d.Kind, name)
		}
		return value{}, errorf(r.Pos, "unknown function %s", name)
	}
}

// builtinCall lowers the built-in functions of functionArity.
func (l *lowerer) builtinCall(r *NameRef, name string, n int) (value, *Error) {
	v, err := l.builtinCallErr(r, name, n)
	if err != nil {
		var e *Error
		if errors.As(err, &e) {
			return value{}, e
		}
		return value{}, errorf(r.Pos, "%v", err)
	}
	return v, nil
}

func (l *lowerer) builtinCallErr(r *NameRef, name string, n int) (value, error) {
	groups := r.Call.Groups
	if len(groups) != 1 || len(groups[0].Args) != n {
		return value{}, errorf(r.Pos, "%s takes %d argument%s separated by commas", name, n, plural(n))
	}
	args := groups[0].Args
	switch name {
	case "log", "Li2":
		arg, i0 := stripI0(args[0])
		v, err := l.scalarArg(arg)
		if err != nil {
			return value{}, err
		}
		var e expr.Expr
		if name == "log" {
			e, err = expr.LogSplit(v, i0, l.p.Positive)
		} else {
			e, err = expr.Apply(name, i0, v)
		}
		if err != nil {
			return value{}, errorf(r.Pos, "%v", err)
		}
		return scalar(e), nil
	case "Cl2", "sqrt":
		v, err := l.scalarArg(args[0])
		if err != nil {
			return value{}, err
		}
		e, err := expr.Apply(name, 1, v)
		if err != nil {
			return value{}, errorf(r.Pos, "%v", err)
		}
		return scalar(e), nil
	case "conj":
		return l.conj(args[0])
	case "tr", "ctr":
		return l.trace(name, args[0])
	case "onshell":
		// onshell(A): the on-shell mass counterterm δm of the fermion whose self-energy sandwich
		// ubar(…) (−iΣ) u(…) is the amplitude A; package match evaluates it.
		n, pos, ok := argName(args[0])
		if !ok {
			return value{}, errorf(args[0].Pos, "onshell takes the name of an amplitude")
		}
		if d, ok := l.p.Decls[n]; !ok || d.Kind != KindAmplitude {
			return value{}, errorf(pos, "onshell(%s): %s is not an amplitude defined before this point", n, n)
		}
		return scalar(expr.FromAtom(expr.NewFn(OnShellFn, 1, expr.Sym(n)), 1)), nil
	case "gamma", "sigma", "g":
		var idx []string
		for _, a := range args {
			n, pos, ok := argName(a)
			if !ok {
				return value{}, errorf(a.Pos, "%s takes Lorentz indices as arguments", name)
			}
			mu, err := l.indexName(n, pos, KindIndex)
			if err != nil {
				return value{}, err
			}
			idx = append(idx, mu)
		}
		switch name {
		case "gamma":
			return l.nc(expr.NC{Op: expr.NCGamma, Args: idx}), nil
		case "sigma":
			if idx[0] == idx[1] {
				return value{kind: vScalar, e: expr.Zero()}, nil
			}
			return l.nc(expr.NC{Op: expr.NCSigma, Args: idx}), nil
		default:
			cnt := map[string]int{}
			for _, i := range idx {
				cnt[i]++
			}
			return value{kind: vScalar, e: expr.FromAtom(expr.NewMetric(idx[0], idx[1]), 1), idx: cnt}, nil
		}
	case "slash":
		v, err := l.expr(args[0])
		if err != nil {
			return value{}, err
		}
		if v.kind != vVector {
			return value{}, errorf(args[0].Pos, "slash takes a momentum, found a scalar")
		}
		res := expr.Zero()
		for _, t := range v.mom {
			res = res.Add(expr.FromNC(expr.NC{Op: expr.NCSlash, Args: []string{t.Name}}).Scale(expr.RFRat(t.Coef)))
		}
		return scalar(res), nil
	case "ubar", "vbar", "u", "v":
		n, pos, ok := argName(args[0])
		if !ok {
			return value{}, errorf(args[0].Pos, "%s takes an external leg", name)
		}
		return l.spinor(name, l.resolveName(n), pos)
	case "levi":
		var s [4]expr.Slot
		cnt := map[string]int{}
		for i, a := range args {
			n, pos, ok := argName(a)
			if !ok {
				return value{}, errorf(a.Pos, "levi takes Lorentz indices or momenta")
			}
			n = l.resolveName(n)
			switch {
			case l.isVectorName(n):
				s[i] = expr.Slot{Name: n}
			default:
				mu, err := l.indexName(n, pos, KindIndex)
				if err != nil {
					return value{}, err
				}
				s[i] = expr.Slot{Name: mu, Index: true}
				cnt[mu]++
			}
		}
		lv, sign := expr.NewLevi(s)
		if sign == 0 {
			return value{kind: vScalar, e: expr.Zero(), idx: cnt}, nil
		}
		return value{kind: vScalar, e: expr.FromAtom(lv, 1).Scale(expr.RFInt(int64(sign))), idx: cnt}, nil
	case "T":
		n, pos, ok := argName(args[0])
		if !ok {
			return value{}, errorf(args[0].Pos, "T takes an adjoint colour index")
		}
		a, err := l.indexName(n, pos, KindAdjoint)
		if err != nil {
			return value{}, err
		}
		return l.nc(expr.NC{Op: expr.NCT, Args: []string{a}}), nil
	case "f":
		var s []string
		for _, a := range args {
			n, pos, ok := argName(a)
			if !ok {
				return value{}, errorf(a.Pos, "f takes adjoint colour indices")
			}
			x, err := l.indexName(n, pos, KindAdjoint)
			if err != nil {
				return value{}, err
			}
			s = append(s, x)
		}
		c, sign := expr.NewStructureF(s[0], s[1], s[2])
		if sign == 0 {
			return scalar(expr.Zero()), nil
		}
		return scalar(expr.FromAtom(c, 1).Scale(expr.RFInt(int64(sign)))), nil
	case "delta":
		var s []string
		var kinds []Kind
		for _, a := range args {
			n, pos, ok := argName(a)
			if !ok {
				return value{}, errorf(a.Pos, "delta takes two colour indices")
			}
			n = l.resolveName(n)
			d, ok := l.p.Decls[n]
			if !ok || (d.Kind != KindColour && d.Kind != KindAdjoint) {
				return value{}, errorf(pos, "delta: %s is not a colour index", n)
			}
			s = append(s, n)
			kinds = append(kinds, d.Kind)
		}
		if kinds[0] != kinds[1] {
			return value{}, errorf(r.Pos, "delta(%s, %s) mixes a fundamental and an adjoint index", s[0], s[1])
		}
		if s[0] == s[1] {
			// delta(i, i) = Nc (fundamental) or Nc^2 − 1 (adjoint)
			nc := expr.RFVar("Nc")
			if kinds[0] == KindAdjoint {
				nc = nc.Mul(nc).Sub(expr.RFInt(1))
			}
			return scalar(expr.FromRF(nc)), nil
		}
		return scalar(expr.FromAtom(expr.NewDelta(s[0], s[1]), 1)), nil
	}
	return value{}, errorf(r.Pos, "unknown function %s", name)
}

// trace lowers tr(X), the Dirac trace of a string of Dirac matrices, and ctr(X), the colour
// trace (fundamental representation) of a string of generators T(a), evaluated at once.
func (l *lowerer) trace(name string, a *Expr) (value, error) {
	v, err := l.expr(a)
	if err != nil {
		return value{}, err
	}
	if v.kind != vScalar {
		return value{}, errorf(a.Pos, "%s takes a string of matrices, found a vector", name)
	}
	res := expr.Zero()
	for _, t := range v.e.Terms() {
		for _, at := range t.Atoms {
			if _, ok := at.A.(expr.Chain); ok {
				return value{}, errorf(a.Pos, "%s: spinors cannot stand inside a trace", name)
			}
		}
		for _, n := range t.NC {
			colour := n.Op == expr.NCT
			if n.IsBar() || n.IsSpinor() {
				return value{}, errorf(a.Pos, "%s: spinors cannot stand inside a trace", name)
			}
			if colour != (name == "ctr") {
				if colour {
					return value{}, errorf(a.Pos, "tr is the Dirac trace: take colour traces with ctr(T(a) …)")
				}
				return value{}, errorf(a.Pos, "ctr is the colour trace: take Dirac traces with tr(…)")
			}
		}
		rest := t
		rest.NC = nil
		var f expr.Expr
		if name == "tr" {
			f = expr.FromAtom(expr.NewTrace(append([]expr.NC{}, t.NC...)), 1)
		} else {
			adj := make([]string, len(t.NC))
			for i, n := range t.NC {
				adj[i] = n.Args[0]
			}
			c, err := dirac.ColourTrace(adj, dirac.Options{})
			if err != nil {
				return value{}, errorf(a.Pos, "ctr: %v", err)
			}
			f = c
		}
		x, err := expr.FromTerm(rest).Mul(f)
		if err != nil {
			return value{}, errorf(a.Pos, "%v", err)
		}
		res = res.Add(x)
	}
	// The indices inside the trace count like those of the string.
	return value{kind: vScalar, e: res, idx: v.idx}, nil
}

func plural(n int) string {
	if n == 1 {
		return ""
	}
	return "s"
}

// stripI0 removes a trailing "± i0" from a function argument and returns its sign (+1 by
// default).
func stripI0(a *Expr) (*Expr, int) {
	if len(a.Rest) == 0 {
		return a, 1
	}
	last := a.Rest[len(a.Rest)-1]
	pr := last.Prod
	if len(pr.Rest) > 0 || pr.First.Exp != nil || pr.First.Base.Right != nil {
		return a, 1
	}
	ref := pr.First.Base.Left.Ref
	if ref == nil || ref.Name != "i0" || ref.Call != nil || ref.Index != nil {
		return a, 1
	}
	cp := *a
	cp.Rest = a.Rest[:len(a.Rest)-1]
	if last.Op == "-" {
		return &cp, -1
	}
	return &cp, 1
}

func (l *lowerer) scalarArg(a *Expr) (expr.Expr, error) {
	v, err := l.expr(a)
	if err != nil {
		return expr.Expr{}, err
	}
	if v.kind != vScalar {
		return expr.Expr{}, errorf(a.Pos, "expected a scalar argument, found the vector %s", v.mom)
	}
	if v.e.HasLoops() || len(v.idx) > 0 {
		return expr.Expr{}, errorf(a.Pos, "a function argument cannot contain loops or Lorentz indices")
	}
	for _, t := range v.e.Terms() {
		if len(t.NC) > 0 {
			return expr.Expr{}, errorf(a.Pos, "a function argument cannot contain Dirac matrices")
		}
	}
	return v.e, nil
}

func (l *lowerer) conj(a *Expr) (value, error) {
	if n, pos, ok := argName(a); ok {
		n = l.resolveName(n)
		d, ok := l.p.Decls[n]
		switch {
		case ok && d.Kind == KindComplex:
			return scalar(expr.Sym("conj(" + n + ")")), nil
		case ok && isParameter(d.Kind):
			return scalar(expr.Sym(n)), nil // real parameters are their own conjugates
		case !ok:
			return value{}, errorf(pos, "undeclared name %s", n)
		}
		return value{}, errorf(pos, "conj takes a coupling, found the %s %s", d.Kind, n)
	}
	v, err := l.scalarArg(a)
	if err != nil {
		return value{}, err
	}
	if r, ok := v.AsRatFunc(); ok && r.IsConst() {
		return scalar(v), nil
	}
	return value{}, errorf(a.Pos, "conj takes the name of a coupling or a number")
}

func (l *lowerer) spinor(fn, leg string, pos lexer.Position) (value, error) {
	lg, ok := l.p.Leg(leg)
	if !ok {
		return value{}, errorf(pos, "%s(%s): %s is not an external leg", fn, leg, leg)
	}
	var want string
	switch {
	case lg.Type == "fermion" && lg.In:
		want = "u"
	case lg.Type == "fermion":
		want = "ubar"
	case lg.Type == "antifermion" && lg.In:
		want = "vbar"
	case lg.Type == "antifermion":
		want = "v"
	default:
		return value{}, errorf(pos, "%s(%s): %s is a %s, not a fermion", fn, leg, leg, lg.Type)
	}
	if fn != want {
		dir := "outgoing"
		if lg.In {
			dir = "incoming"
		}
		return value{}, errorf(pos, "%s(%s): %s is an %s %s, whose spinor is %s(%s)", fn, leg, leg, dir, lg.Type, want, leg)
	}
	op := map[string]expr.NCOp{"u": expr.NCU, "ubar": expr.NCUBar, "v": expr.NCV, "vbar": expr.NCVBar}[fn]
	return l.nc(expr.NC{Op: op, Args: []string{leg}}), nil
}

// integralCall lowers A0(m), B0(p2; m0, m1), B0prime(p2; m0, m1), C0(s1, s2, s3; m0, m1, m2) and
// D0(s01, s12, s23, s30, s02, s13; m0, m1, m2, m3): invariants first, then masses (not squared).
func (l *lowerer) integralCall(r *NameRef, want []int) (value, error) {
	groups := r.Call.Groups
	shape := func() string {
		if len(want) == 1 {
			return fmt.Sprintf("%d mass", want[0])
		}
		return fmt.Sprintf("%d invariant%s; %d masses", want[0], plural(want[0]), want[1])
	}
	if len(groups) != len(want) {
		return value{}, errorf(r.Pos, "%s takes (%s): invariants and masses are separated by ';'", r.Name, shape())
	}
	var args []expr.Expr
	for i, g := range groups {
		if len(g.Args) != want[i] {
			return value{}, errorf(g.Pos, "%s takes (%s), found %d argument%s in group %d", r.Name, shape(), len(g.Args), plural(len(g.Args)), i+1)
		}
		for _, a := range g.Args {
			v, err := l.scalarArg(a)
			if err != nil {
				return value{}, err
			}
			args = append(args, v)
		}
	}
	split := 0
	if len(want) > 1 {
		split = want[0]
	}
	return scalar(expr.FromAtom(expr.NewFnSplit(r.Name, 1, split, args...), 1)), nil
}

// expand lowers a use of a define, binding its parameters.
func (l *lowerer) expand(r *NameRef, groups []*ArgGroup) (value, error) {
	d := l.p.defines[r.Name]
	var args []*Expr
	if len(groups) > 1 {
		return value{}, errorf(r.Pos, "%s takes its arguments separated by commas", r.Name)
	}
	if len(groups) == 1 {
		args = groups[0].Args
	}
	if len(args) != len(d.Params) {
		return value{}, errorf(r.Pos, "%s takes %d argument%s, found %d", r.Name, len(d.Params), plural(len(d.Params)), len(args))
	}
	if l.depth >= maxDefineDepth {
		return value{}, errorf(r.Pos, "definitions nest more than %d levels deep (is %s recursive?)", maxDefineDepth, r.Name)
	}
	env := map[string]binding{}
	for i, prm := range d.Params {
		a := args[i]
		if n, _, ok := argName(a); ok {
			// Resolve the name in the caller's scope now: a parameter of the caller stands for
			// a name or a value there.
			if b, ok := l.lookup(n); ok {
				env[prm.Value] = b
				continue
			}
			env[prm.Value] = binding{alias: n}
			continue
		}
		v, err := l.expr(a)
		if err != nil {
			return value{}, err
		}
		env[prm.Value] = binding{val: &v}
	}
	saved := l.env
	l.env = []map[string]binding{env}
	l.depth++
	v, err := l.expr(d.Body)
	l.depth--
	l.env = saved
	if err != nil {
		return value{}, err
	}
	return v, nil
}

// checkOperator validates the names in an operator definition (its matrix elements are derived
// by package match).
func (p *Program) checkOperator(e *Expr) error {
	var err error
	walkRefs(e, func(r *NameRef) {
		if err != nil {
			return
		}
		name := r.Name
		if r.Call != nil {
			if _, ok := operatorOnly[name]; ok {
				return
			}
			if _, ok := functionArity[name]; ok {
				return
			}
			if _, ok := integralArity[name]; ok {
				return
			}
			if d, ok := p.Decls[name]; ok && d.Kind == KindDefine {
				return
			}
			err = errorf(r.Pos, "unknown function %s in an operator", name)
			return
		}
		if _, ok := builtins[name]; ok {
			return
		}
		if _, ok := p.Decls[name]; !ok {
			err = errorf(r.Pos, "undeclared name %s in an operator", name)
		}
	})
	return err
}
