package notation

import (
	"fmt"
	"math/big"
	"slices"
	"strconv"
	"strings"

	"loopmatch/expr"
)

// An anomalous-dimension block gives γ^{(0)} and optionally γ^{(1)} of a set of operators in
// the convention μ dC/dμ = γ^T C, γ = a γ^{(0)} + a² γ^{(1)}, a = αs/(4π): row i, column j
// is how Q_i mixes into Q_j, as the papers print it (docs/RUNNING.md).
//
//	anomalous NAME onto Q1, Q2:
//	  for     Nc = 3, nf = 5     # optional: the block holds only there
//	  scheme  NDR                # optional: the scheme of γ^{(1)}
//	  initial Q2 = 1             # optional: coefficients at the starting scale
//	  row 0 Q1: -6/Nc, 6
//	  row 0 Q2: 6, -6/Nc
//
// Entries are exact rational functions of Nc (the number of colours) and nf (the number of
// active quark flavours, a name that exists only inside the block's rows).

// ADMBlock is a validated anomalous-dimension block.
type ADMBlock struct {
	Name string
	// Ops are the operators in the order of the rows and columns: operators of the file or,
	// for names the file does not declare, labels of operators it does not spell out.
	Ops []string
	// Gamma[n][i][j] is γ^{(n)}_{ij} in Nc and nf; len(Gamma) is 1 (LO) or 2 (with γ^{(1)}).
	Gamma [][][]expr.RatFunc
	// Fixed holds the values of "Nc" and "nf" given by a for line: the block holds only there.
	Fixed map[string]int
	// Scheme is the scheme of γ^{(1)} as stated by a scheme line (empty if none).
	Scheme []string
	// Initial holds the coefficients at the starting scale given by initial lines, in the
	// order written (InitialOrder); operators not named start at zero.
	Initial      map[string]expr.Expr
	InitialOrder []string
	Pos          Pos
	entryPos     [][][]Pos
}

// admSchemes are the words a scheme line of an anomalous block accepts.
var admSchemes = []string{"MSbar", "NDR", "HV"}

// admFixable are the names a for line may fix, with their allowed ranges.
var admFixable = map[string][2]int{"Nc": {2, 100}, "nf": {0, 6}}

// ADMs returns the anomalous-dimension blocks of the file in file order.
func (p *Program) ADMs() []*ADMBlock { return slices.Clone(p.adms) }

// ADM returns the anomalous-dimension block with the given name.
func (p *Program) ADM(name string) (*ADMBlock, bool) {
	for _, b := range p.adms {
		if b.Name == name {
			return b, true
		}
	}
	return nil, false
}

// Index returns the position of an operator in the block, or −1.
func (b *ADMBlock) Index(op string) int { return slices.Index(b.Ops, op) }

// Orders returns the number of loop orders the block gives: 1 (γ^{(0)}) or 2 (γ^{(0)}, γ^{(1)}).
func (b *ADMBlock) Orders() int { return len(b.Gamma) }

// At returns γ^{(order)} exactly at nc colours and nf active flavours, or an error if the
// block does not hold there (a for line), lacks the order, or an entry is singular.
func (b *ADMBlock) At(order, nc, nf int) ([][]*big.Rat, error) {
	if order < 0 || order >= len(b.Gamma) {
		return nil, &Error{Pos: b.Pos, Msg: fmt.Sprintf("anomalous block %s has no rows of order %d (it gives orders 0 to %d)", b.Name, order, len(b.Gamma)-1)}
	}
	at := map[string]int{"Nc": nc, "nf": nf}
	for _, name := range []string{"Nc", "nf"} {
		if v, ok := b.Fixed[name]; ok && v != at[name] {
			return nil, &Error{Pos: b.Pos, Msg: fmt.Sprintf("anomalous block %s holds for %s = %d only, not %s = %d", b.Name, name, v, name, at[name])}
		}
	}
	out := make([][]*big.Rat, len(b.Ops))
	for i, row := range b.Gamma[order] {
		out[i] = make([]*big.Rat, len(row))
		for j, r := range row {
			v, err := evalAt(r, nc, nf)
			if err != nil {
				return nil, &Error{Pos: b.entryPos[order][i][j], Msg: fmt.Sprintf("anomalous: γ^(%d) entry (%s, %s) of block %s is singular at Nc = %d, nf = %d", order, b.Ops[i], b.Ops[j], b.Name, nc, nf)}
			}
			out[i][j] = v
		}
	}
	return out, nil
}

// evalAt evaluates r exactly at Nc = nc, nf = nf: numerator and denominator term by term
// (cheaper than substituting into the normalised rational function).
func evalAt(r expr.RatFunc, nc, nf int) (*big.Rat, error) {
	at := map[string]*big.Rat{"Nc": big.NewRat(int64(nc), 1), "nf": big.NewRat(int64(nf), 1)}
	poly := func(p expr.Poly) (*big.Rat, error) {
		sum := new(big.Rat)
		for _, t := range p.Terms() {
			term := new(big.Rat).Set(t.Coef)
			for _, vp := range t.Mono {
				x, ok := at[vp.Var]
				if !ok {
					return nil, fmt.Errorf("unexpected variable %s", vp.Var)
				}
				for range vp.Exp {
					term.Mul(term, x)
				}
			}
			sum.Add(sum, term)
		}
		return sum, nil
	}
	num, err := poly(r.Num())
	if err != nil {
		return nil, err
	}
	den, err := poly(r.Den())
	if err != nil {
		return nil, err
	}
	if den.Sign() == 0 {
		return nil, fmt.Errorf("the denominator %s vanishes", r.Den())
	}
	return num.Quo(num, den), nil
}

// admBlock validates an anomalous statement.
func (p *Program) admBlock(a *AnomalousStmt) (*ADMBlock, error) {
	b := &ADMBlock{Name: a.Name, Pos: posOf(a.Pos), Fixed: map[string]int{}, Initial: map[string]expr.Expr{}}
	for _, o := range a.Ops {
		if err := p.admOperator(o); err != nil {
			return nil, err
		}
		if slices.Contains(b.Ops, o.Value) {
			return nil, errorf(o.Pos, "anomalous: operator %s is listed twice in block %s", o.Value, a.Name)
		}
		b.Ops = append(b.Ops, o.Value)
	}
	n := len(b.Ops)
	// rowAt[order][i] is the position of the row of operator i at that order, once seen.
	rowAt := [2][]*Pos{make([]*Pos, n), make([]*Pos, n)}
	entries := [2][][]expr.RatFunc{make([][]expr.RatFunc, n), make([][]expr.RatFunc, n)}
	positions := [2][][]Pos{make([][]Pos, n), make([][]Pos, n)}
	var schemeAt, forAt *Pos
	for _, r := range a.Rows {
		switch {
		case r.Op != nil:
			order, err := strconv.Atoi(r.Order)
			if err != nil || order < 0 || order > 1 {
				return nil, errorf(r.Pos, "anomalous: expected row 0 (γ^(0)) or row 1 (γ^(1)), found row %s", r.Order)
			}
			i := b.Index(r.Op.Value)
			if i < 0 {
				return nil, errorf(r.Op.Pos, "anomalous: %s is not an operator of block %s (onto %s)", r.Op.Value, a.Name, strings.Join(b.Ops, ", "))
			}
			if prev := rowAt[order][i]; prev != nil {
				return nil, errorf(r.Pos, "anomalous: a second row %d for %s in block %s (the first is at %d:%d)", order, r.Op.Value, a.Name, prev.Line, prev.Col)
			}
			if len(r.Entries) != n {
				return nil, errorf(r.Pos, "anomalous: row %d %s has %d entries, block %s has %d operators", order, r.Op.Value, len(r.Entries), a.Name, n)
			}
			for _, e := range r.Entries {
				v, err := p.admEntry(e)
				if err != nil {
					return nil, err
				}
				entries[order][i] = append(entries[order][i], v)
				positions[order][i] = append(positions[order][i], posOf(e.Pos))
			}
			pos := posOf(r.Pos)
			rowAt[order][i] = &pos
		case r.For != nil:
			if forAt != nil {
				return nil, errorf(r.Pos, "anomalous: a second for line in block %s (the first is at %d:%d)", a.Name, forAt.Line, forAt.Col)
			}
			pos := posOf(r.Pos)
			forAt = &pos
			for _, as := range r.For {
				rng, ok := admFixable[as.Name]
				if !ok {
					return nil, errorf(as.Pos, "anomalous: for fixes Nc or nf, found %s", as.Name)
				}
				if _, dup := b.Fixed[as.Name]; dup {
					return nil, errorf(as.Pos, "anomalous: %s is fixed twice", as.Name)
				}
				v, err := p.lowerScalar(as.Value, false)
				if err != nil {
					return nil, err
				}
				k, ok := smallInt(v)
				if !ok || k < rng[0] || k > rng[1] {
					return nil, errorf(as.Value.Pos, "anomalous: %s must be an integer from %d to %d, found %s", as.Name, rng[0], rng[1], v)
				}
				b.Fixed[as.Name] = k
			}
		case r.Scheme != nil:
			if schemeAt != nil {
				return nil, errorf(r.Pos, "anomalous: a second scheme line in block %s (the first is at %d:%d)", a.Name, schemeAt.Line, schemeAt.Col)
			}
			pos := posOf(r.Pos)
			schemeAt = &pos
			for _, s := range r.Scheme {
				if !slices.Contains(admSchemes, s.Value) {
					return nil, errorf(s.Pos, "anomalous: scheme: unknown word %s (known: %s)", s.Value, strings.Join(admSchemes, ", "))
				}
				b.Scheme = append(b.Scheme, s.Value)
			}
		case r.Initial != nil:
			for _, as := range r.Initial {
				if b.Index(as.Name) < 0 {
					return nil, errorf(as.Pos, "anomalous: initial: %s is not an operator of block %s (onto %s)", as.Name, a.Name, strings.Join(b.Ops, ", "))
				}
				if _, dup := b.Initial[as.Name]; dup {
					return nil, errorf(as.Pos, "anomalous: initial: a second value for %s", as.Name)
				}
				v, err := p.lowerScalar(as.Value, false)
				if err != nil {
					return nil, err
				}
				b.Initial[as.Name] = v
				b.InitialOrder = append(b.InitialOrder, as.Name)
			}
		}
	}
	orders := 1
	if slices.ContainsFunc(rowAt[1], func(p *Pos) bool { return p != nil }) {
		orders = 2
	}
	for order := range orders {
		for i, at := range rowAt[order] {
			if at == nil {
				return nil, errorf(a.Pos, "anomalous: block %s has no row %d for %s (every operator needs one row of γ^(%d)%s)", a.Name, order, b.Ops[i], order, orderNote(order))
			}
		}
		b.Gamma = append(b.Gamma, entries[order])
		b.entryPos = append(b.entryPos, positions[order])
	}
	// With both numbers fixed the block is usable only there: check every entry now.
	if nc, ok := b.Fixed["Nc"]; ok {
		if nf, ok := b.Fixed["nf"]; ok {
			for order := range b.Gamma {
				if _, err := b.At(order, nc, nf); err != nil {
					return nil, err
				}
			}
		}
	}
	return b, nil
}

func orderNote(order int) string {
	if order == 1 {
		return ", since the block gives rows 1"
	}
	return ""
}

// admOperator checks a name after onto: an operator of the file, or a label for one the file
// does not spell out (then it must not name anything else).
func (p *Program) admOperator(o *Name) error {
	if why, ok := builtins[o.Value]; ok {
		return errorf(o.Pos, "anomalous: %s is a built-in name (%s), not an operator", o.Value, why)
	}
	if o.Value == "nf" {
		return errorf(o.Pos, "anomalous: nf is the number of active flavours in an anomalous block, not an operator")
	}
	if d, ok := p.Decls[o.Value]; ok && d.Kind != KindOperator {
		return errorf(o.Pos, "anomalous: %s is a %s (declared at %s), not an operator", o.Value, d.Kind, d.Pos)
	}
	return nil
}

// admEntry lowers an entry of a row: a rational function of Nc and nf, with nf bound to the
// number of active flavours.
func (p *Program) admEntry(e *Expr) (expr.RatFunc, error) {
	nf := scalar(expr.Sym("nf"))
	l := &lowerer{p: p, env: []map[string]binding{{"nf": {val: &nf}}}}
	v, err := l.expr(e)
	if err != nil {
		return expr.RatFunc{}, err
	}
	bad := func() error {
		return errorf(e.Pos, "anomalous: an entry must be a rational number or a rational function of Nc and nf, found %s", p.sourceOrValue(e, v))
	}
	if v.kind != vScalar {
		return expr.RatFunc{}, bad()
	}
	r, ok := v.e.AsRatFunc()
	if !ok {
		return expr.RatFunc{}, bad()
	}
	for _, x := range r.Vars() {
		if x != "Nc" && x != "nf" {
			return expr.RatFunc{}, errorf(e.Pos, "anomalous: an entry may depend on Nc and nf only, found %s in %s", x, p.sourceOrValue(e, v))
		}
	}
	return r, nil
}

// sourceOrValue shows an entry as written, or its lowered value when the source is not at hand.
func (p *Program) sourceOrValue(e *Expr, v value) string {
	if s := p.sourceText(e); s != "" {
		return s
	}
	if v.kind == vVector {
		return v.mom.String()
	}
	return v.e.String()
}

// smallInt returns the value of an exact integer constant.
func smallInt(e expr.Expr) (int, bool) {
	r, ok := e.AsRatFunc()
	if !ok {
		return 0, false
	}
	c, ok := r.ConstValue()
	if !ok || !c.IsInt() || !c.Num().IsInt64() {
		return 0, false
	}
	k := c.Num().Int64()
	if k < -1<<30 || k > 1<<30 {
		return 0, false
	}
	return int(k), true
}
