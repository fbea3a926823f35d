package notation

import (
	"fmt"
	"math/big"

	"github.com/alecthomas/participle/v2/lexer"

	"loopmatch/expr"
)

// This file derives the tree-level matrix element of an operator between the external states
// of the file. Fields are named by their legs:
//
//	q      the field ψ of fermion leg q: u(q) for an incoming fermion, v(q) for an outgoing antifermion
//	bar(q) the conjugate field ψ̄: ubar(q) for an outgoing fermion, vbar(q) for an incoming antifermion
//	F(al, be)     the field strength of the (single) photon leg A with momentum k and polarisation e:
//	              ∂_al A_be − ∂_be A_al → i(k[al] e[be] − k[be] e[al]) for an outgoing photon (e
//	              stands for ε*), −i(k[al] e[be] − k[be] e[al]) for an incoming one
//	G(a, al, be)  the same for a gluon leg, times delta(a, colour of the leg)
//	D(al) f       the derivative of the next field f: −i p[al] for an incoming particle of momentum
//	              p, +i p[al] for an outgoing one (the gauge-field part of the covariant
//	              derivative contributes only with an extra gauge boson, which is not included)
//
// The plane-wave factors e^{∓ipx} give these signs: an annihilated incoming particle brings
// e^{−ipx}, a created outgoing one e^{+ipx}.

// MatrixElement returns the tree-level matrix element ⟨out| O |in⟩ of the operator (without the
// factor i of the vertex and without the normalisation of the match block).
func (p *Program) MatrixElement(o *Operator) (expr.Expr, error) {
	l := &lowerer{p: p, op: true}
	v, err := l.expr(o.Body)
	if err != nil {
		return expr.Expr{}, err
	}
	if v.kind != vScalar {
		return expr.Expr{}, errorf(o.Body.Pos, "operator %s is a vector, not a scalar", o.Name)
	}
	if len(l.pendingD) > 0 {
		return expr.Expr{}, errorf(o.Body.Pos, "operator %s: D(%s) is not followed by a field", o.Name, l.pendingD[0])
	}
	for _, t := range v.e.Terms() {
		if len(t.NC) > 0 {
			return expr.Expr{}, errorf(o.Body.Pos, "operator %s: Dirac or colour matrices outside a bilinear bar(a) … b", o.Name)
		}
	}
	return v.e, nil
}

// opProduct lowers a product inside an operator, where D(al) marks the next field.
func (l *lowerer) opProduct(p *Product) (value, error) {
	factors := append([]*MulTerm{{Pos: p.Pos, Factor: p.First}}, p.Rest...)
	v := scalar(expr.Int(1))
	for _, m := range factors {
		if idx, ok := derivMarker(m.Factor); ok {
			if m.Op == "/" {
				return value{}, errorf(m.Pos, "D(…) cannot divide")
			}
			mu, err := l.indexName(idx.Value, idx.Pos, KindIndex)
			if err != nil {
				return value{}, err
			}
			l.pendingD = append(l.pendingD, mu)
			continue
		}
		var w value
		var err error
		if m.Op == "/" {
			w, err = l.denominator(m.Factor)
		} else {
			w, err = l.power(m.Factor)
		}
		if err != nil {
			return value{}, err
		}
		if v, err = l.mul(v, w, m.Pos); err != nil {
			return value{}, err
		}
	}
	return v, nil
}

// derivMarker recognises a factor D(al).
func derivMarker(pw *Power) (*Name, bool) {
	if pw.Exp != nil || pw.Base.Right != nil || pw.Base.Left.Ref == nil {
		return nil, false
	}
	r := pw.Base.Left.Ref
	if r.Name != "D" || r.Call == nil || len(r.Call.Groups) != 1 || len(r.Call.Groups[0].Args) != 1 {
		return nil, false
	}
	n, pos, ok := argName(r.Call.Groups[0].Args[0])
	if !ok {
		return nil, false
	}
	return &Name{Pos: pos, Value: n}, true
}

// field lowers the field of a fermion leg (bar: the conjugate field) with any pending
// derivatives.
func (l *lowerer) field(leg *Leg, bar bool, pos lexer.Position) (value, error) {
	at := posOf(pos)
	if leg.Type != "fermion" && leg.Type != "antifermion" {
		return value{}, &Error{Pos: at, Msg: fmt.Sprintf("%s is a %s leg; only fermion legs are fields here (use F(…) or G(…) for gauge bosons)", leg.Name, leg.Type)}
	}
	var op expr.NCOp
	switch {
	case !bar && leg.Type == "fermion" && leg.In:
		op = expr.NCU
	case !bar && leg.Type == "antifermion" && !leg.In:
		op = expr.NCV
	case bar && leg.Type == "fermion" && !leg.In:
		op = expr.NCUBar
	case bar && leg.Type == "antifermion" && leg.In:
		op = expr.NCVBar
	default:
		dir := "outgoing"
		if leg.In {
			dir = "incoming"
		}
		want := "bar(" + leg.Name + ")"
		if bar {
			want = leg.Name
		}
		return value{}, &Error{Pos: at, Msg: fmt.Sprintf("leg %s is an %s %s: its field in the operator is %s", leg.Name, dir, leg.Type, want)}
	}
	v := l.nc(expr.NC{Op: op, Args: []string{leg.Name}})
	for _, mu := range l.pendingD {
		d, err := planeWave(leg.Mom, leg.In, mu)
		if err != nil {
			return value{}, err
		}
		if v, err = l.mul(v, d, pos); err != nil {
			return value{}, err
		}
	}
	l.pendingD = nil
	return v, nil
}

// planeWave returns ∓i p[mu] for an incoming/outgoing particle of momentum p.
func planeWave(p expr.Mom, in bool, mu string) (value, error) {
	s := int64(1)
	if in {
		s = -1
	}
	e := expr.Zero()
	for _, t := range p {
		e = e.Add(expr.FromAtom(expr.Vec{P: t.Name, Mu: mu}, 1).Scale(expr.RFRat(new(big.Rat).Mul(t.Coef, big.NewRat(s, 1)))))
	}
	e = e.MustMul(expr.FromAtom(expr.I, 1))
	return value{kind: vScalar, e: e, idx: map[string]int{mu: 1}}, nil
}

// fieldStrength lowers F(al, be) or G(a, al, be) for the single photon or gluon leg.
func (l *lowerer) fieldStrength(r *NameRef) (value, error) {
	args := r.Call.Groups[0].Args
	want, legType := 2, "photon"
	if r.Name == "G" {
		want, legType = 3, "gluon"
	}
	if len(r.Call.Groups) != 1 || len(args) != want {
		return value{}, errorf(r.Pos, "%s takes %d arguments", r.Name, want)
	}
	var names []string
	for _, a := range args {
		n, pos, ok := argName(a)
		if !ok {
			return value{}, errorf(a.Pos, "%s takes indices as arguments", r.Name)
		}
		kind := KindIndex
		if r.Name == "G" && len(names) == 0 {
			kind = KindAdjoint
		}
		x, err := l.indexName(n, pos, kind)
		if err != nil {
			return value{}, err
		}
		names = append(names, x)
	}
	var leg *Leg
	for _, lg := range l.p.Legs {
		if lg.Type == legType || (legType == "photon" && lg.Type == "vector") {
			if leg != nil {
				return value{}, errorf(r.Pos, "%s(…) is ambiguous: the file has more than one %s leg", r.Name, legType)
			}
			leg = lg
		}
	}
	if leg == nil {
		return value{}, errorf(r.Pos, "%s(…) needs a %s leg among the external legs", r.Name, legType)
	}
	if leg.Pol == "" {
		return value{}, errorf(r.Pos, "%s(…): leg %s has no polarization vector", r.Name, leg.Name)
	}
	al, be := names[len(names)-2], names[len(names)-1]
	// i(k[al] e[be] − k[be] e[al]) for an outgoing boson, −i(…) for an incoming one.
	sign := int64(1)
	if leg.In {
		sign = -1
	}
	e := expr.Zero()
	for _, t := range leg.Mom {
		c := expr.RFRat(new(big.Rat).Mul(t.Coef, big.NewRat(sign, 1)))
		a := expr.FromAtom(expr.Vec{P: t.Name, Mu: al}, 1).MustMul(expr.FromAtom(expr.Vec{P: leg.Pol, Mu: be}, 1))
		b := expr.FromAtom(expr.Vec{P: t.Name, Mu: be}, 1).MustMul(expr.FromAtom(expr.Vec{P: leg.Pol, Mu: al}, 1))
		e = e.Add(a.Sub(b).Scale(c))
	}
	e = e.MustMul(expr.FromAtom(expr.I, 1))
	if r.Name == "G" {
		if leg.Colour == "" {
			return value{}, errorf(r.Pos, "G(…): gluon leg %s has no colour index", leg.Name)
		}
		e = e.MustMul(expr.FromAtom(expr.NewDelta(names[0], leg.Colour), 1))
	}
	return value{kind: vScalar, e: e, idx: map[string]int{al: 1, be: 1}}, nil
}
