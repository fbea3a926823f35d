// Package notation reads the plain-text amplitude notation of loopmatch (.lm files): a
// participle grammar, its syntax tree, validation with positioned errors, and lowering of
// amplitudes to expr values. docs/NOTATION.md describes the language.
package notation

import (
	"github.com/alecthomas/participle/v2"
	"github.com/alecthomas/participle/v2/lexer"
)

// keywords start statements and match-block lines; they cannot be used as names. Other words
// of the grammar (in, out, momentum, mass, onto, to, order, …) are ordinary identifiers that are
// recognised only where they are expected.
var keywords = []string{
	"couplings", "complex", "masses", "light", "index", "momenta", "symbols", "gauge", "colour",
	"adjoint", "external", "amplitude", "define", "counterterm", "operator", "match", "loop",
	"normalization", "expand", "scheme", "scale", "expect", "route", "ratio", "anomalous", "row", "values",
	"for", "initial", "eft", "kinematics", "offshell", "regulator", "invariant", "eom",
}

func keywordPattern() string {
	s := `\b(`
	for i, k := range keywords {
		if i > 0 {
			s += "|"
		}
		s += k
	}
	return s + `)\b`
}

var lmLexer = lexer.MustSimple([]lexer.SimpleRule{
	{Name: "Comment", Pattern: `#[^\n]*`},
	{Name: "Whitespace", Pattern: `[ \t\r\n]+`},
	{Name: "Number", Pattern: `[0-9]+(\.[0-9]+)?([eE][-+]?[0-9]+)?`},
	{Name: "Keyword", Pattern: keywordPattern()},
	{Name: "Ident", Pattern: `[A-Za-z_][A-Za-z0-9_]*`},
	{Name: "Punct", Pattern: `[-+*/^().,;:{}\[\]=]`},
})

// File is a whole .lm file.
type File struct {
	Pos   lexer.Position
	Stmts []*Stmt `parser:"@@*"`
}

// Stmt is one top-level statement.
type Stmt struct {
	Pos         lexer.Position
	Decl        *DeclStmt      `parser:"  @@"`
	Values      *ValuesStmt    `parser:"| @@"`
	External    *ExternalStmt  `parser:"| @@"`
	Amplitude   *AmpStmt       `parser:"| @@"`
	Counterterm *CtStmt        `parser:"| @@"`
	Define      *DefineStmt    `parser:"| @@"`
	Operator    *OpStmt        `parser:"| @@"`
	Match       *MatchStmt     `parser:"| @@"`
	Anomalous   *AnomalousStmt `parser:"| @@"`
}

// DeclStmt declares names of one kind: couplings, complex couplings, heavy masses, light masses,
// Lorentz indices, momenta, other real symbols, the gauge parameter, colour indices.
type DeclStmt struct {
	Pos   lexer.Position
	Kind  string  `parser:"@(\"couplings\" | \"complex\" | \"masses\" | \"light\" | \"index\" | \"momenta\" | \"symbols\" | \"gauge\" | \"colour\" | \"adjoint\")"`
	Names []*Name `parser:"@@+"`
}

// Name is an identifier with its position.
type Name struct {
	Pos   lexer.Position
	Value string `parser:"@Ident"`
}

// ValuesStmt gives default numerical values: values mF = 1000, mS = 1500.
type ValuesStmt struct {
	Pos    lexer.Position
	Assign []*Assign `parser:"\"values\" @@ (\",\" @@)*"`
}

// Assign is NAME = EXPR.
type Assign struct {
	Pos   lexer.Position
	Name  string `parser:"@Ident \"=\""`
	Value *Expr  `parser:"@@"`
}

// ExternalStmt declares an external leg.
type ExternalStmt struct {
	Pos   lexer.Position
	Name  string     `parser:"\"external\" @Ident \":\""`
	Type  string     `parser:"@(\"fermion\" | \"antifermion\" | \"scalar\" | \"photon\" | \"gluon\" | \"vector\")"`
	Dir   string     `parser:"@(\"in\" | \"out\")"`
	Attrs []*LegAttr `parser:"@@*"`
}

// LegAttr is one attribute of an external leg.
type LegAttr struct {
	Pos      lexer.Position
	Momentum *MomExpr `parser:"  \"momentum\" @@"`
	Mass     *Name    `parser:"| \"mass\" ( @@"`
	Massless bool     `parser:"  | @\"0\" )"`
	Pol      *Name    `parser:"| \"polarization\" @@"`
	Colour   *Name    `parser:"| \"colour\" @@"`
}

// MomExpr is a linear combination of momenta: p - q, 2*p + k.
type MomExpr struct {
	Pos   lexer.Position
	Neg   bool       `parser:"@\"-\"?"`
	First *MomAtom   `parser:"@@"`
	Rest  []*MomRest `parser:"@@*"`
}

// MomRest is ± MomAtom.
type MomRest struct {
	Op   string   `parser:"@(\"+\" | \"-\")"`
	Atom *MomAtom `parser:"@@"`
}

// MomAtom is [NUMBER *] NAME.
type MomAtom struct {
	Pos   lexer.Position
	Coeff *string `parser:"(@Number \"*\")?"`
	Name  string  `parser:"@Ident"`
}

// AmpStmt is "amplitude NAME = EXPR": iM of one diagram or a sum of diagrams.
type AmpStmt struct {
	Pos  lexer.Position
	Name string `parser:"\"amplitude\" @Ident \"=\""`
	Body *Expr  `parser:"@@"`
}

// CtStmt is "counterterm NAME = EXPR": added on the full-theory side.
type CtStmt struct {
	Pos  lexer.Position
	Name string `parser:"\"counterterm\" @Ident \"=\""`
	Body *Expr  `parser:"@@"`
}

// DefineStmt is "define NAME(params) = EXPR", a reusable vertex or propagator.
type DefineStmt struct {
	Pos    lexer.Position
	Name   string  `parser:"\"define\" @Ident"`
	Params []*Name `parser:"( \"(\" @@ ( \",\" @@ )* \")\" )? \"=\""`
	Body   *Expr   `parser:"@@"`
}

// OpStmt is "operator NAME = field operator".
type OpStmt struct {
	Pos  lexer.Position
	Name string `parser:"\"operator\" @Ident \"=\""`
	Body *Expr  `parser:"@@"`
}

// MatchStmt is "match A, B onto Q1, Q2:" followed by its lines.
type MatchStmt struct {
	Pos   lexer.Position
	Amps  []*Name      `parser:"\"match\" @@ ( \",\" @@ )*"`
	Ops   []*Name      `parser:"\"onto\" @@ ( \",\" @@ )* \":\""`
	Lines []*MatchLine `parser:"@@*"`
}

// MatchLine is one line of a match block.
type MatchLine struct {
	Pos    lexer.Position
	Norm   *Expr       `parser:"  \"normalization\" @@"`
	Expand *ExpandLine `parser:"| @@"`
	Scheme []*Name     `parser:"| \"scheme\" @@+"`
	Scale  *Assign     `parser:"| \"scale\" @@"`
	Expect *Assign     `parser:"| \"expect\" @@"`
	Route  *Name       `parser:"| \"route\" @@"`
	Ratio  *Assign     `parser:"| \"ratio\" @@"`
	// Lines of the general route and of the checks (docs/GENERAL.md).
	EFT       []*Name `parser:"| \"eft\" @@ ( \",\" @@ )*"`
	KinLeft   *Expr   `parser:"| \"kinematics\" @@"`
	KinRight  *Expr   `parser:"  \"=\" @@"`
	OffShell  bool    `parser:"| @\"offshell\""`
	Report    bool    `parser:"  @\"report\"?"`
	Regulator []*Name `parser:"| \"regulator\" @@ ( \",\" @@ )*"`
	Invariant *Expr   `parser:"| \"invariant\" @@"`
	EOM       []*Name `parser:"| \"eom\" @@ ( \",\" @@ )*"`
}

// ExpandLine is "expand p, q, m1 to order 2", or "expand to order 0" when nothing is small
// (vacuum amplitudes).
type ExpandLine struct {
	Pos   lexer.Position
	Names []*Name `parser:"\"expand\" ( (?! \"to\" \"order\") @@ ( \",\" @@ )* )?"`
	Order string  `parser:"\"to\" \"order\" @Number"`
}

// AnomalousStmt is an anomalous-dimension block, "anomalous NAME onto Q1, Q2:" followed by
// its lines (docs/RUNNING.md); adm.go validates it.
type AnomalousStmt struct {
	Pos  lexer.Position
	Name string  `parser:"\"anomalous\" @Ident"`
	Ops  []*Name `parser:"\"onto\" @@ ( \",\" @@ )* \":\""`
	Rows []*Row  `parser:"@@*"`
}

// Row is one line of an anomalous-dimension block: "row ORDER NAME: e1, e2, …" (the row of
// operator NAME in γ^{(ORDER)}), "for Nc = 3, nf = 5" (the only colour and flavour numbers at
// which the block holds), "scheme NDR" (the scheme of γ^{(1)}) or "initial Q2 = 1, …" (the
// coefficients at the starting scale of an evolution).
type Row struct {
	Pos     lexer.Position
	Order   string    `parser:"(  \"row\" @Number"`
	Op      *Name     `parser:"   @@ \":\""`
	Entries []*Expr   `parser:"   @@ ( \",\" @@ )*"`
	For     []*Assign `parser:"| \"for\" @@ ( \",\" @@ )*"`
	Scheme  []*Name   `parser:"| \"scheme\" @@+"`
	Initial []*Assign `parser:"| \"initial\" @@ ( \",\" @@ )* )"`
}

// Expr is a sum of products with an optional leading minus.
type Expr struct {
	Pos    lexer.Position
	EndPos lexer.Position
	Neg    bool       `parser:"@\"-\"?"`
	First  *Product   `parser:"@@"`
	Rest   []*AddTerm `parser:"@@*"`
}

// AddTerm is ± Product.
type AddTerm struct {
	Pos  lexer.Position
	Op   string   `parser:"@(\"+\" | \"-\")"`
	Prod *Product `parser:"@@"`
}

// Product is a product of powers; juxtaposition is multiplication (ordered for Dirac objects).
type Product struct {
	Pos   lexer.Position
	First *Power     `parser:"@@"`
	Rest  []*MulTerm `parser:"@@*"`
}

// MulTerm is an optional * or / followed by a power.
type MulTerm struct {
	Pos    lexer.Position
	Op     string `parser:"@(\"*\" | \"/\")?"`
	Factor *Power `parser:"@@"`
}

// Power is Dotted [^ exponent].
type Power struct {
	Pos  lexer.Position
	Base *Dotted   `parser:"@@"`
	Exp  *Exponent `parser:"( \"^\" @@ )?"`
}

// Exponent is an integer, possibly negative, possibly in parentheses.
type Exponent struct {
	Pos    lexer.Position
	Neg    bool   `parser:"( @\"-\"?"`
	Value  string `parser:"  @Number"`
	PNeg   bool   `parser:"| \"(\" @\"-\"?"`
	PValue string `parser:"  @Number \")\" )"`
}

// Dotted is Primary [. Primary]: a scalar product when both sides are vectors.
type Dotted struct {
	Pos   lexer.Position
	Left  *Primary `parser:"@@"`
	Right *Primary `parser:"( \".\" @@ )?"`
}

// Primary is a number, a loop, a name (possibly called or indexed) or a parenthesised sum.
type Primary struct {
	Pos    lexer.Position
	Number *string  `parser:"  @Number"`
	Loop   *Loop    `parser:"| @@"`
	Ref    *NameRef `parser:"| @@"`
	Paren  *Expr    `parser:"| \"(\" @@ \")\""`
}

// NameRef is NAME, NAME(args) or NAME[index].
type NameRef struct {
	Pos   lexer.Position
	Name  string    `parser:"@Ident"`
	Call  *CallArgs `parser:"( \"(\" @@ \")\""`
	Index *Name     `parser:"| \"[\" @@ \"]\" )?"`
}

// CallArgs are argument groups separated by ";" (invariants; masses), each a comma list.
type CallArgs struct {
	Pos    lexer.Position
	Groups []*ArgGroup `parser:"@@ ( \";\" @@ )*"`
}

// ArgGroup is a comma-separated list of expressions.
type ArgGroup struct {
	Pos  lexer.Position
	Args []*Expr `parser:"@@ ( \",\" @@ )*"`
}

// Loop is "loop k { … }" or "loop k, l { … }".
type Loop struct {
	Pos   lexer.Position
	Moms  []*Name `parser:"\"loop\" @@ ( \",\" @@ )*"`
	Body  *Expr   `parser:"\"{\" @@ \"}\""`
	Close lexer.Position
}

var fileParser = participle.MustBuild[File](
	participle.Lexer(lmLexer),
	participle.Elide("Comment", "Whitespace"),
	participle.UseLookahead(4),
)

var exprParser = participle.MustBuild[Expr](
	participle.Lexer(lmLexer),
	participle.Elide("Comment", "Whitespace"),
	participle.UseLookahead(4),
)
