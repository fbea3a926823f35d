package notation

import (
	"errors"
	"fmt"
	"math/big"
	"os"
	"slices"
	"strconv"
	"strings"

	"github.com/alecthomas/participle/v2"
	"github.com/alecthomas/participle/v2/lexer"

	"loopmatch/expr"
)

// Kind classifies a declared name.
type Kind int

// The kinds of names a file can declare or introduce.
const (
	KindCoupling     Kind = iota // real parameter (couplings)
	KindComplex                  // complex parameter (complex); conj(y) is its conjugate
	KindMass                     // heavy mass (masses), positive
	KindLight                    // light mass (light), positive, expanded or kept as regulator
	KindIndex                    // Lorentz index (index)
	KindMomentum                 // external momentum (momenta)
	KindSymbol                   // other real parameter (symbols)
	KindGauge                    // gauge parameter (gauge)
	KindColour                   // fundamental colour index (colour)
	KindAdjoint                  // adjoint colour index (adjoint)
	KindLeg                      // external leg
	KindPolarization             // polarisation vector of a leg
	KindLoop                     // loop momentum of a loop
	KindDefine                   // define
	KindAmplitude                // amplitude or counterterm
	KindOperator                 // operator
)

var kindNames = map[Kind]string{
	KindCoupling: "coupling", KindComplex: "complex coupling", KindMass: "heavy mass",
	KindLight: "light mass", KindIndex: "Lorentz index", KindMomentum: "momentum",
	KindSymbol: "symbol", KindGauge: "gauge parameter", KindColour: "colour index",
	KindAdjoint: "adjoint colour index", KindLeg: "external leg",
	KindPolarization: "polarization vector", KindLoop: "loop momentum", KindDefine: "definition",
	KindAmplitude: "amplitude", KindOperator: "operator",
}

func (k Kind) String() string { return kindNames[k] }

var declKinds = map[string]Kind{
	"couplings": KindCoupling, "complex": KindComplex, "masses": KindMass, "light": KindLight,
	"index": KindIndex, "momenta": KindMomentum, "symbols": KindSymbol, "gauge": KindGauge,
	"colour": KindColour, "adjoint": KindAdjoint,
}

// Builtin names that cannot be declared.
var builtins = map[string]string{
	"pi": "the constant π", "I": "the imaginary unit", "zeta3": "ζ(3)", "d": "the dimension d = 4 − 2ε",
	"mu": "the MS-bar scale μ", "Nc": "the number of colours", "i0": "the +i0 of a prescription",
	"eps": "ε (write expressions in d; the tool expands in ε)", "PL": "the projector P_L",
	"PR": "the projector P_R", "G5": "γ5",
}

// Pos is a position in a source file.
type Pos struct {
	File      string
	Line, Col int
}

func (p Pos) String() string { return fmt.Sprintf("%s:%d:%d", p.File, p.Line, p.Col) }

func posOf(p lexer.Position) Pos { return Pos{p.Filename, p.Line, p.Column} }

// Error is a positioned error in a .lm file.
type Error struct {
	Pos Pos
	Msg string
}

func (e *Error) Error() string { return e.Pos.String() + ": " + e.Msg }

func errorf(p lexer.Position, format string, args ...any) *Error {
	return &Error{Pos: posOf(p), Msg: fmt.Sprintf(format, args...)}
}

// Decl is a declared name.
type Decl struct {
	Name string
	Kind Kind
	Pos  Pos
}

// Leg is an external leg.
type Leg struct {
	Name   string
	Type   string // fermion, antifermion, scalar, photon, gluon, vector
	In     bool
	Mom    expr.Mom
	Mass   string // "" when massless
	Pol    string // polarisation vector name (vector bosons)
	Colour string // colour index of the leg, if any
	Pos    Pos
}

// Amplitude is a lowered amplitude or counterterm (iM).
type Amplitude struct {
	Name        string
	Counterterm bool
	Body        expr.Expr
	Pos         Pos
}

// Operator is an operator of the effective theory, kept as its syntax tree; package match
// derives its tree-level matrix elements.
type Operator struct {
	Name string
	Body *Expr
	Text string // the definition as written
	Pos  Pos
}

// MatchBlock is a validated match request.
type MatchBlock struct {
	Amps        []string
	Ops         []string
	Norm        expr.Expr
	Expand      []string
	Order       int
	HasExpand   bool
	Scheme      []string
	ScaleSet    bool
	Scale       expr.Expr
	Expect      map[string]expr.Expr
	ExpectOrder []string
	Route       string
	Ratios      []Ratio
	Pos         Pos

	// The general route and the checks (docs/GENERAL.md).
	EFT            []string    // amplitudes of the effective theory, subtracted on the general route
	Kinematics     []KinRule   // values of scalar products of external momenta
	OffShell       bool        // the legs are off shell: no mass-shell conditions, no Dirac equation
	ReportOffShell bool        // also report the coefficients in the off-shell basis
	Regulators     []string    // infrared regulators: light masses or symbols of mass dimension 1
	Invariants     []Invariant // combinations of coefficients declared independent of the gauge parameters
	EOM            []string    // operators of the basis that vanish or reduce by the equations of motion
}

// KinRule is a line "kinematics p.q = value": a scalar product of external momenta and its
// value, a parameter expression.
type KinRule struct {
	Dot   expr.Dot
	Value expr.RatFunc
	Pos   Pos
}

// Invariant is a line "invariant C_Q1 - 4*C_Q2": a combination of the block's coefficients
// (each C_NAME stands for the coefficient of operator NAME) that must not depend on the gauge
// parameters.
type Invariant struct {
	Combination expr.Expr // linear in the symbols C_NAME
	Text        string
	Pos         Pos
}

// Ratio is "ratio x = M1^2/M2^2": results are also written with M1² = x·M2².
type Ratio struct {
	Name, Num, Den string
}

// Program is a parsed and validated .lm file.
type Program struct {
	File       string
	Decls      map[string]*Decl
	DeclOrder  []string
	Legs       []*Leg
	Amplitudes []*Amplitude
	Operators  []*Operator
	Matches    []*MatchBlock
	Values     map[string]expr.Expr
	ValueOrder []string
	adms       []*ADMBlock // anomalous-dimension blocks in file order (adm.go)
	defines    map[string]*DefineStmt
	src        []byte                    // the file's source
	exprSrc    []byte                    // the source of an expression being parsed by ParseExpr
	loopSites  map[string]lexer.Position // every loop momentum name and where it was opened
}

// Amplitude returns the amplitude with the given name.
func (p *Program) Amplitude(name string) (*Amplitude, bool) {
	for _, a := range p.Amplitudes {
		if a.Name == name {
			return a, true
		}
	}
	return nil, false
}

// Leg returns the leg with the given name.
func (p *Program) Leg(name string) (*Leg, bool) {
	for _, l := range p.Legs {
		if l.Name == name {
			return l, true
		}
	}
	return nil, false
}

// Positive reports whether a symbol is known to be positive: heavy and light masses and the
// MS-bar scale mu.
func (p *Program) Positive(name string) bool {
	if name == "mu" {
		return true
	}
	d, ok := p.Decls[name]
	return ok && (d.Kind == KindMass || d.Kind == KindLight)
}

// NamesOf lists declared names of a kind in declaration order.
func (p *Program) NamesOf(k Kind) []string {
	var out []string
	for _, n := range p.DeclOrder {
		if p.Decls[n].Kind == k {
			out = append(out, n)
		}
	}
	return out
}

// ParseFile reads and validates a .lm file.
func ParseFile(path string) (*Program, error) {
	src, err := os.ReadFile(path)
	if err != nil {
		return nil, err
	}
	return Parse(path, src)
}

// MaxSourceBytes bounds the size of a file the parser accepts.
const MaxSourceBytes = 4 << 20

// Parse parses and validates the source of a .lm file named file.
func Parse(file string, src []byte) (*Program, error) {
	if len(src) > MaxSourceBytes {
		return nil, &Error{Pos: Pos{file, 1, 1}, Msg: fmt.Sprintf("file is larger than %d bytes", MaxSourceBytes)}
	}
	if err := checkNesting(file, src); err != nil {
		return nil, err
	}
	ast, err := fileParser.ParseBytes(file, src)
	if err != nil {
		return nil, syntaxError(file, err)
	}
	if err := checkDepth(ast); err != nil {
		return nil, err
	}
	p := &Program{
		src:  src,
		File: file, Decls: map[string]*Decl{}, Values: map[string]expr.Expr{},
		defines: map[string]*DefineStmt{}, loopSites: map[string]lexer.Position{},
	}
	collectLoops(ast, p.loopSites)
	for _, st := range ast.Stmts {
		if err := p.statement(st); err != nil {
			return nil, err
		}
	}
	if err := p.checkConservation(); err != nil {
		return nil, err
	}
	return p, nil
}

// syntaxError turns a participle error into "file:line:col: expected …, found …".
func syntaxError(file string, err error) error {
	var ute *participle.UnexpectedTokenError
	if errors.As(err, &ute) {
		found := describeToken(ute.Unexpected)
		exp := ute.Expect
		if msg := ute.Message(); exp == "" {
			if i := strings.LastIndex(msg, "(expected "); i >= 0 {
				exp = strings.TrimSuffix(msg[i+len("(expected "):], ")")
			}
		}
		exp = expectedWords(exp)
		e := errorf(ute.Unexpected.Pos, "expected %s, found %s", exp, found)
		if e.Pos.File == "" {
			e.Pos.File = file
		}
		return e
	}
	var pe participle.Error
	if errors.As(err, &pe) {
		pos := posOf(pe.Position())
		if pos.File == "" {
			pos.File = file
		}
		msg := pe.Message()
		if rest, ok := strings.CutPrefix(msg, "lexer: invalid input text "); ok {
			msg = "unexpected character: " + rest
		}
		return &Error{Pos: pos, Msg: msg}
	}
	return err
}

// expectedWords turns participle's description of what it expected (a literal or a grammar
// node name) into words for the user.
func expectedWords(exp string) string {
	exp = strings.TrimSpace(exp)
	if exp == "" {
		return "a different token"
	}
	first := exp
	if strings.HasPrefix(first, "\"") {
		if i := strings.Index(first[1:], "\""); i >= 0 {
			return first[:i+2]
		}
	}
	if i := strings.IndexAny(first, " |"); i > 0 {
		first = first[:i]
	}
	first = strings.TrimRight(first, "+*?")
	switch first {
	case "Expr", "Product", "Power", "Dotted", "Primary", "AddTerm", "MulTerm":
		return "an expression"
	case "Name", "<ident>", "Ident", "NameRef":
		return "a name"
	case "<number>", "Number", "Exponent":
		return "a number"
	case "MomExpr", "MomAtom":
		return "a momentum"
	case "Stmt":
		return "a statement (a declaration, values, external, define, amplitude, counterterm, operator, match or anomalous)"
	case "LegAttr":
		return "a leg attribute (momentum, mass, polarization, colour)"
	case "MatchLine":
		return "a match line (normalization, expand, scheme, scale, expect, ratio, route, eft, kinematics, offshell, regulator, invariant, eom)"
	case "Assign":
		return "NAME = value"
	case "CallArgs", "ArgGroup":
		return "function arguments"
	}
	return exp
}

func describeToken(t lexer.Token) string {
	if t.EOF() {
		return "the end of the file"
	}
	if slices.Contains(keywords, t.Value) {
		return fmt.Sprintf("the keyword %q", t.Value)
	}
	return strconv.Quote(t.Value)
}

// checkNesting rejects brackets nested deeper than maxDepth before the recursive-descent parser
// sees them (comments are skipped).
func checkNesting(file string, src []byte) error {
	depth, line, col := 0, 1, 0
	comment := false
	for _, c := range string(src) {
		col++
		switch {
		case c == '\n':
			line, col, comment = line+1, 0, false
		case comment:
		case c == '#':
			comment = true
		case c == '(' || c == '[' || c == '{':
			depth++
			if depth > maxDepth {
				return &Error{Pos: Pos{file, line, col}, Msg: fmt.Sprintf("brackets nested more than %d levels deep", maxDepth)}
			}
		case c == ')' || c == ']' || c == '}':
			depth--
		}
	}
	return nil
}

// maxDepth bounds the nesting of expressions (parentheses, loops, calls).
const maxDepth = 200

func checkDepth(f *File) error {
	for _, st := range f.Stmts {
		for _, e := range stmtExprs(st) {
			err := walkPrimaries(e, 0, func(pm *Primary, d int) error {
				if d > maxDepth {
					return errorf(pm.Pos, "expression nested more than %d levels deep", maxDepth)
				}
				return nil
			})
			if err != nil {
				return err
			}
		}
	}
	return nil
}

func stmtExprs(st *Stmt) []*Expr {
	switch {
	case st.Amplitude != nil:
		return []*Expr{st.Amplitude.Body}
	case st.Counterterm != nil:
		return []*Expr{st.Counterterm.Body}
	case st.Define != nil:
		return []*Expr{st.Define.Body}
	case st.Operator != nil:
		return []*Expr{st.Operator.Body}
	case st.Values != nil:
		var out []*Expr
		for _, a := range st.Values.Assign {
			out = append(out, a.Value)
		}
		return out
	case st.Match != nil:
		var out []*Expr
		for _, l := range st.Match.Lines {
			switch {
			case l.Norm != nil:
				out = append(out, l.Norm)
			case l.Scale != nil:
				out = append(out, l.Scale.Value)
			case l.Expect != nil:
				out = append(out, l.Expect.Value)
			}
		}
		return out
	case st.Anomalous != nil:
		var out []*Expr
		for _, r := range st.Anomalous.Rows {
			out = append(out, r.Entries...)
		}
		return out
	}
	return nil
}

// collectLoops records every loop momentum name with the position of its loop, so that a use
// outside the braces gets a precise message.
func collectLoops(f *File, sites map[string]lexer.Position) {
	for _, st := range f.Stmts {
		for _, e := range stmtExprs(st) {
			_ = walkPrimaries(e, 0, func(pm *Primary, _ int) error {
				if pm.Loop != nil {
					for _, m := range pm.Loop.Moms {
						if _, ok := sites[m.Value]; !ok {
							sites[m.Value] = pm.Loop.Pos
						}
					}
				}
				return nil
			})
		}
	}
}

func (p *Program) declare(name string, k Kind, pos lexer.Position) error {
	if why, ok := builtins[name]; ok {
		return errorf(pos, "%s is a built-in name (%s) and cannot be declared; choose another name", name, why)
	}
	if d, ok := p.Decls[name]; ok {
		return errorf(pos, "%s is already declared as a %s at %s", name, d.Kind, d.Pos)
	}
	if site, ok := p.loopSites[name]; ok && k != KindLoop {
		return errorf(pos, "%s is used as the loop momentum of the loop at %d:%d and cannot also be declared as a %s", name, site.Line, site.Column, k)
	}
	p.Decls[name] = &Decl{Name: name, Kind: k, Pos: posOf(pos)}
	p.DeclOrder = append(p.DeclOrder, name)
	return nil
}

func (p *Program) statement(st *Stmt) error {
	switch {
	case st.Decl != nil:
		k := declKinds[st.Decl.Kind]
		for _, n := range st.Decl.Names {
			if err := p.declare(n.Value, k, n.Pos); err != nil {
				return err
			}
		}
	case st.Values != nil:
		for _, a := range st.Values.Assign {
			d, ok := p.Decls[a.Name]
			if !ok && a.Name != "mu" {
				return errorf(a.Pos, "values: %s is not declared", a.Name)
			}
			if ok && !isParameter(d.Kind) {
				return errorf(a.Pos, "values: %s is a %s, not a parameter that takes a number", a.Name, d.Kind)
			}
			v, err := p.lowerScalar(a.Value, false)
			if err != nil {
				return err
			}
			if _, ok := v.AsRatFunc(); !ok {
				return errorf(a.Value.Pos, "values: the value of %s must be a number or an expression in parameters, found %s", a.Name, v)
			}
			if _, dup := p.Values[a.Name]; !dup {
				p.ValueOrder = append(p.ValueOrder, a.Name)
			}
			p.Values[a.Name] = v
		}
	case st.External != nil:
		return p.external(st.External)
	case st.Define != nil:
		d := st.Define
		if err := p.declare(d.Name, KindDefine, d.Pos); err != nil {
			return err
		}
		seen := map[string]bool{}
		for _, prm := range d.Params {
			if seen[prm.Value] {
				return errorf(prm.Pos, "parameter %s of %s appears twice", prm.Value, d.Name)
			}
			seen[prm.Value] = true
		}
		p.defines[d.Name] = d
	case st.Amplitude != nil:
		return p.amplitude(st.Amplitude.Name, st.Amplitude.Body, st.Amplitude.Pos, false)
	case st.Counterterm != nil:
		return p.amplitude(st.Counterterm.Name, st.Counterterm.Body, st.Counterterm.Pos, true)
	case st.Operator != nil:
		o := st.Operator
		if err := p.declare(o.Name, KindOperator, o.Pos); err != nil {
			return err
		}
		if err := p.checkOperator(o.Body); err != nil {
			return err
		}
		p.Operators = append(p.Operators, &Operator{Name: o.Name, Body: o.Body, Text: p.sourceText(o.Body), Pos: posOf(o.Pos)})
	case st.Match != nil:
		return p.match(st.Match)
	case st.Anomalous != nil:
		return p.anomalous(st.Anomalous)
	}
	return nil
}

// sourceText returns the source of an expression with its whitespace collapsed.
func (p *Program) sourceText(e *Expr) string {
	a, b := e.Pos.Offset, e.EndPos.Offset
	if a < 0 || b > len(p.src) || a >= b {
		return ""
	}
	return strings.Join(strings.Fields(string(p.src[a:b])), " ")
}

func isParameter(k Kind) bool {
	switch k {
	case KindCoupling, KindComplex, KindMass, KindLight, KindSymbol, KindGauge:
		return true
	}
	return false
}

func (p *Program) amplitude(name string, body *Expr, pos lexer.Position, ct bool) error {
	v, err := p.lowerScalar(body, true)
	if err != nil {
		return err
	}
	if err := p.declare(name, KindAmplitude, pos); err != nil {
		return err
	}
	p.Amplitudes = append(p.Amplitudes, &Amplitude{Name: name, Counterterm: ct, Body: v, Pos: posOf(pos)})
	return nil
}

var legTypes = map[string]bool{"fermion": true, "antifermion": true, "scalar": true, "photon": true, "gluon": true, "vector": true}

func (p *Program) external(x *ExternalStmt) error {
	if err := p.declare(x.Name, KindLeg, x.Pos); err != nil {
		return err
	}
	leg := &Leg{Name: x.Name, Type: x.Type, In: x.Dir == "in", Pos: posOf(x.Pos)}
	seen := map[string]bool{}
	for _, a := range x.Attrs {
		var what string
		switch {
		case a.Momentum != nil:
			what = "momentum"
			m, err := p.lowerMom(a.Momentum)
			if err != nil {
				return err
			}
			leg.Mom = m
		case a.Mass != nil:
			what = "mass"
			d, ok := p.Decls[a.Mass.Value]
			if !ok {
				return errorf(a.Mass.Pos, "mass %s of leg %s is not declared (declare it under masses or light)", a.Mass.Value, x.Name)
			}
			if d.Kind != KindMass && d.Kind != KindLight {
				return errorf(a.Mass.Pos, "mass of leg %s: %s is a %s, not a mass", x.Name, a.Mass.Value, d.Kind)
			}
			leg.Mass = a.Mass.Value
		case a.Massless:
			what = "mass"
		case a.Pol != nil:
			what = "polarization"
			if x.Type != "photon" && x.Type != "gluon" && x.Type != "vector" {
				return errorf(a.Pol.Pos, "leg %s is a %s; only vector bosons have a polarization", x.Name, x.Type)
			}
			if err := p.declare(a.Pol.Value, KindPolarization, a.Pol.Pos); err != nil {
				return err
			}
			leg.Pol = a.Pol.Value
		case a.Colour != nil:
			what = "colour"
			d, ok := p.Decls[a.Colour.Value]
			want := KindColour
			if x.Type == "gluon" {
				want = KindAdjoint
			}
			if !ok || d.Kind != want {
				return errorf(a.Colour.Pos, "colour %s of leg %s must be declared as a %s", a.Colour.Value, x.Name, want)
			}
			leg.Colour = a.Colour.Value
		}
		if seen[what] {
			return errorf(a.Pos, "leg %s has two %s attributes", x.Name, what)
		}
		seen[what] = true
	}
	if !seen["momentum"] {
		return errorf(x.Pos, "leg %s needs a momentum (external NAME : TYPE in|out momentum P …)", x.Name)
	}
	p.Legs = append(p.Legs, leg)
	return nil
}

func (p *Program) lowerMom(m *MomExpr) (expr.Mom, error) {
	atom := func(a *MomAtom, sign int64) (expr.Mom, error) {
		d, ok := p.Decls[a.Name]
		if !ok {
			return nil, errorf(a.Pos, "momentum %s is not declared (declare it under momenta)", a.Name)
		}
		if d.Kind != KindMomentum {
			return nil, errorf(a.Pos, "%s is a %s, not a momentum", a.Name, d.Kind)
		}
		c := big.NewRat(sign, 1)
		if a.Coeff != nil {
			r, err := parseNumber(*a.Coeff)
			if err != nil {
				return nil, errorf(a.Pos, "%v", err)
			}
			c.Mul(c, r)
		}
		return expr.NewMom(expr.MomTerm{Name: a.Name, Coef: c}), nil
	}
	sign := int64(1)
	if m.Neg {
		sign = -1
	}
	out, err := atom(m.First, sign)
	if err != nil {
		return nil, err
	}
	for _, r := range m.Rest {
		s := int64(1)
		if r.Op == "-" {
			s = -1
		}
		x, err := atom(r.Atom, s)
		if err != nil {
			return nil, err
		}
		out = out.Add(x)
	}
	return out, nil
}

// checkConservation requires Σ incoming momenta = Σ outgoing momenta.
func (p *Program) checkConservation() error {
	if len(p.Legs) == 0 {
		return nil
	}
	var in, out expr.Mom
	for _, l := range p.Legs {
		if l.In {
			in = in.Add(l.Mom)
		} else {
			out = out.Add(l.Mom)
		}
	}
	if diff := in.Sub(out); !diff.IsZero() {
		last := p.Legs[len(p.Legs)-1]
		return &Error{Pos: last.Pos, Msg: fmt.Sprintf("momentum is not conserved at the external legs: incoming %s, outgoing %s (difference %s)", in, out, diff)}
	}
	return nil
}

func (p *Program) match(m *MatchStmt) error {
	// kinRule validates "kinematics p.q = value" (also p^2 = value).
	kinRule := func(left, right *Expr) (KinRule, error) {
		l, err := p.lowerScalar(left, false)
		if err != nil {
			return KinRule{}, err
		}
		bad := errorf(left.Pos, "kinematics: expected a scalar product of two external momenta (p.q or p^2), found %s", l)
		if l.Len() != 1 {
			return KinRule{}, bad
		}
		t := l.Terms()[0]
		if len(t.Atoms) != 1 || t.Atoms[0].Pow != 1 || !t.Coef.IsOne() || len(t.NC) > 0 {
			return KinRule{}, bad
		}
		d, ok := t.Atoms[0].A.(expr.Dot)
		if !ok {
			return KinRule{}, bad
		}
		for _, n := range []string{d.A, d.B} {
			if decl, ok := p.Decls[n]; !ok || decl.Kind != KindMomentum {
				return KinRule{}, bad
			}
		}
		v, err := p.lowerScalar(right, false)
		if err != nil {
			return KinRule{}, err
		}
		r, ok := v.AsRatFunc()
		if !ok {
			return KinRule{}, errorf(right.Pos, "kinematics: the value of %s must be a parameter expression, found %s", d.Key(), v)
		}
		return KinRule{Dot: d, Value: r, Pos: posOf(left.Pos)}, nil
	}
	// invariant validates "invariant C_Q1 - 4*C_Q2": a combination, linear in the
	// coefficients of the block's operators, with parameter-dependent weights.
	invariant := func(e *Expr, ops []string) (Invariant, error) {
		var added []string
		for _, o := range ops {
			n := "C_" + o
			if d, ok := p.Decls[n]; ok {
				return Invariant{}, errorf(e.Pos, "invariant: %s names the coefficient of %s here, but it is also declared as a %s at %s", n, o, d.Kind, d.Pos)
			}
			p.Decls[n] = &Decl{Name: n, Kind: KindSymbol, Pos: posOf(e.Pos)}
			added = append(added, n)
		}
		v, err := p.lowerScalar(e, false)
		for _, n := range added {
			delete(p.Decls, n)
		}
		if err != nil {
			return Invariant{}, err
		}
		r, ok := v.AsRatFunc()
		if !ok || v.IsZero() {
			return Invariant{}, errorf(e.Pos, "invariant: expected a combination of coefficients C_NAME (NAME one of %s), found %s", strings.Join(ops, ", "), v)
		}
		for _, pt := range r.Num().Terms() {
			k := 0
			for _, vp := range pt.Mono {
				if slices.Contains(added, vp.Var) {
					k += vp.Exp
				}
			}
			if k != 1 {
				return Invariant{}, errorf(e.Pos, "invariant: the combination must be linear in the coefficients C_NAME, found %s", v)
			}
		}
		for _, n := range added {
			if r.Den().Has(n) {
				return Invariant{}, errorf(e.Pos, "invariant: the combination must be linear in the coefficients C_NAME, found %s", v)
			}
		}
		return Invariant{Combination: v, Text: p.sourceText(e), Pos: posOf(e.Pos)}, nil
	}
	mb := &MatchBlock{Pos: posOf(m.Pos), Expect: map[string]expr.Expr{}, Route: "heavy", Norm: expr.Int(1)}
	for _, a := range m.Amps {
		d, ok := p.Decls[a.Value]
		if !ok || d.Kind != KindAmplitude {
			return errorf(a.Pos, "match: %s is not an amplitude of this file", a.Value)
		}
		mb.Amps = append(mb.Amps, a.Value)
	}
	for _, o := range m.Ops {
		d, ok := p.Decls[o.Value]
		if !ok || d.Kind != KindOperator {
			return errorf(o.Pos, "match: %s is not an operator of this file", o.Value)
		}
		if slices.Contains(mb.Ops, o.Value) {
			return errorf(o.Pos, "match: operator %s is listed twice", o.Value)
		}
		mb.Ops = append(mb.Ops, o.Value)
	}
	seen := map[string]lexer.Position{}
	for _, l := range m.Lines {
		var what string
		switch {
		case l.Norm != nil:
			what = "normalization"
			v, err := p.lowerScalar(l.Norm, false)
			if err != nil {
				return err
			}
			if v.IsZero() {
				return errorf(l.Norm.Pos, "normalization must not be zero")
			}
			mb.Norm = v
		case l.Expand != nil:
			what = "expand"
			for _, n := range l.Expand.Names {
				d, ok := p.Decls[n.Value]
				if !ok {
					return errorf(n.Pos, "expand: %s is not declared", n.Value)
				}
				if d.Kind != KindMomentum && d.Kind != KindLight {
					return errorf(n.Pos, "expand: %s is a %s; only momenta and light masses are expanded", n.Value, d.Kind)
				}
				mb.Expand = append(mb.Expand, n.Value)
			}
			o, err := strconv.Atoi(l.Expand.Order)
			if err != nil || o < 0 || o > 12 {
				return errorf(l.Expand.Pos, "expand: the order must be an integer from 0 to 12, found %s", l.Expand.Order)
			}
			mb.Order, mb.HasExpand = o, true
		case l.Scheme != nil:
			what = "scheme"
			for _, s := range l.Scheme {
				if !slices.Contains([]string{"MSbar", "NDR"}, s.Value) {
					return errorf(s.Pos, "scheme: unknown word %s (known: MSbar, NDR)", s.Value)
				}
				mb.Scheme = append(mb.Scheme, s.Value)
			}
		case l.Scale != nil:
			what = "scale"
			if l.Scale.Name != "mu" {
				return errorf(l.Scale.Pos, "scale: expected mu = EXPR, found %s = …", l.Scale.Name)
			}
			v, err := p.lowerScalar(l.Scale.Value, false)
			if err != nil {
				return err
			}
			if _, ok := v.AsRatFunc(); !ok {
				return errorf(l.Scale.Value.Pos, "scale: mu must be a parameter expression, found %s", v)
			}
			mb.Scale, mb.ScaleSet = v, true
		case l.Expect != nil:
			what = "expect " + l.Expect.Name
			op, ok := strings.CutPrefix(l.Expect.Name, "C_")
			if !ok || !slices.Contains(mb.Ops, op) {
				return errorf(l.Expect.Pos, "expect: %s does not name the coefficient of an operator of this match (write C_NAME with NAME one of %s)", l.Expect.Name, strings.Join(mb.Ops, ", "))
			}
			v, err := p.lowerScalar(l.Expect.Value, false)
			if err != nil {
				return err
			}
			mb.Expect[op] = v
			mb.ExpectOrder = append(mb.ExpectOrder, op)
		case l.Ratio != nil:
			what = "ratio " + l.Ratio.Name
			r, err := p.ratio(l.Ratio)
			if err != nil {
				return err
			}
			mb.Ratios = append(mb.Ratios, r)
		case l.Route != nil:
			what = "route"
			if l.Route.Value != "heavy" && l.Route.Value != "general" {
				return errorf(l.Route.Pos, "route: expected heavy or general, found %s", l.Route.Value)
			}
			mb.Route = l.Route.Value
		case l.EFT != nil:
			what = "eft"
			for _, a := range l.EFT {
				d, ok := p.Decls[a.Value]
				if !ok || d.Kind != KindAmplitude {
					return errorf(a.Pos, "eft: %s is not an amplitude of this file", a.Value)
				}
				if slices.Contains(mb.Amps, a.Value) || slices.Contains(mb.EFT, a.Value) {
					return errorf(a.Pos, "eft: %s is listed twice (full-theory amplitudes after match, effective-theory ones here)", a.Value)
				}
				mb.EFT = append(mb.EFT, a.Value)
			}
		case l.KinLeft != nil:
			r, err := kinRule(l.KinLeft, l.KinRight)
			if err != nil {
				return err
			}
			what = "kinematics " + r.Dot.Key()
			mb.Kinematics = append(mb.Kinematics, r)
		case l.OffShell:
			what = "offshell"
			mb.OffShell, mb.ReportOffShell = true, l.Report
		case l.Regulator != nil:
			what = "regulator"
			for _, n := range l.Regulator {
				d, ok := p.Decls[n.Value]
				if !ok || (d.Kind != KindLight && d.Kind != KindSymbol) {
					return errorf(n.Pos, "regulator: %s must be a declared light mass or symbol (a quantity of mass dimension 1 that goes to zero)", n.Value)
				}
				mb.Regulators = append(mb.Regulators, n.Value)
			}
		case l.Invariant != nil:
			inv, err := invariant(l.Invariant, mb.Ops)
			if err != nil {
				return err
			}
			what = "invariant " + inv.Text
			mb.Invariants = append(mb.Invariants, inv)
		case l.EOM != nil:
			what = "eom"
			for _, n := range l.EOM {
				if !slices.Contains(mb.Ops, n.Value) {
					return errorf(n.Pos, "eom: %s is not an operator of this match (one of %s)", n.Value, strings.Join(mb.Ops, ", "))
				}
				mb.EOM = append(mb.EOM, n.Value)
			}
		}
		if prev, dup := seen[what]; dup {
			return errorf(l.Pos, "match: a second %s line (the first is at %d:%d)", what, prev.Line, prev.Column)
		}
		seen[what] = l.Pos
	}
	switch {
	case len(mb.EFT) > 0 && mb.Route != "general":
		return errorf(m.Pos, "match: eft amplitudes are subtracted on the general route only (add: route general)")
	case len(mb.EOM) > 0 && !mb.OffShell:
		return errorf(m.Pos, "match: eom operators need an off-shell match (add: offshell)")
	case len(mb.EOM) == len(mb.Ops) && len(mb.EOM) > 0:
		return errorf(m.Pos, "match: every operator is marked eom; at least one must remain on shell")
	}
	p.Matches = append(p.Matches, mb)
	return nil
}

// ratio validates "ratio x = M1^2/M2^2" with two declared masses and a new name.
func (p *Program) ratio(a *Assign) (Ratio, error) {
	if _, ok := p.Decls[a.Name]; ok {
		return Ratio{}, errorf(a.Pos, "ratio: %s is already declared; choose a new name", a.Name)
	}
	if _, ok := builtins[a.Name]; ok {
		return Ratio{}, errorf(a.Pos, "ratio: %s is a built-in name", a.Name)
	}
	v, err := p.lowerScalar(a.Value, false)
	if err != nil {
		return Ratio{}, err
	}
	r, ok := v.AsRatFunc()
	bad := errorf(a.Value.Pos, "ratio: expected the ratio of two squared masses, e.g. mF^2/mS^2, found %s", v)
	if !ok || r.Num().Len() != 1 || r.Den().Len() != 1 {
		return Ratio{}, bad
	}
	nt, dt := r.Num().Terms()[0], r.Den().Terms()[0]
	if nt.Coef.Cmp(big.NewRat(1, 1)) != 0 || len(nt.Mono) != 1 || len(dt.Mono) != 1 || nt.Mono[0].Exp != 2 || dt.Mono[0].Exp != 2 {
		return Ratio{}, bad
	}
	for _, m := range []string{nt.Mono[0].Var, dt.Mono[0].Var} {
		if d, ok := p.Decls[m]; !ok || (d.Kind != KindMass && d.Kind != KindLight) {
			return Ratio{}, bad
		}
	}
	return Ratio{Name: a.Name, Num: nt.Mono[0].Var, Den: dt.Mono[0].Var}, nil
}

// anomalous validates an anomalous-dimension block (adm.go) and keeps it. Block names have
// their own name space: they are not declarations and cannot be used in expressions.
func (p *Program) anomalous(a *AnomalousStmt) error {
	for _, b := range p.adms {
		if b.Name == a.Name {
			return errorf(a.Pos, "anomalous: a second block named %s (the first is at %s)", a.Name, b.Pos)
		}
	}
	b, err := p.admBlock(a)
	if err != nil {
		return err
	}
	p.adms = append(p.adms, b)
	return nil
}
