package expr

import (
	"fmt"
	"math/big"
	"strings"
)

// This file prints real expressions as Go float64 expressions. Exact rational coefficients
// become constant expressions such as (1.0 / 3), which the Go compiler evaluates exactly. The
// functions log, sqrt map to package math; Li2 and Cl2 map to the identifiers li2 and cl2,
// which the caller must provide (the code emitter does).

// GoExpr returns e as a Go float64 expression, or an error for parts that have no real
// float64 form (the imaginary unit, complex couplings, Lorentz and Dirac objects, loops).
func GoExpr(e Expr) (string, error) {
	if e.IsZero() {
		return "0", nil
	}
	var parts []string
	for _, t := range e.terms {
		s, err := goTerm(t)
		if err != nil {
			return "", err
		}
		parts = append(parts, s)
	}
	return strings.Join(parts, " + "), nil
}

func goTerm(t Term) (string, error) {
	if len(t.Loops) > 0 || len(t.NC) > 0 {
		return "", fmt.Errorf("a loop integral or Dirac string has no Go form: %s", t)
	}
	c, err := goRatFunc(t.Coef)
	if err != nil {
		return "", err
	}
	var factors []string
	if c != "1" || len(t.Atoms) == 0 {
		factors = append(factors, c)
	}
	var den []string
	for _, a := range t.Atoms {
		s, err := goAtom(a.A)
		if err != nil {
			return "", err
		}
		n := a.Pow
		if n < 0 {
			den = append(den, goPow(s, -n))
			continue
		}
		factors = append(factors, goPow(s, n))
	}
	out := strings.Join(factors, " * ")
	if len(factors) == 0 {
		out = "1"
	}
	if len(den) > 0 {
		out = "(" + out + ") / (" + strings.Join(den, " * ") + ")"
	}
	return out, nil
}

func goPow(s string, n int) string {
	switch {
	case n == 1:
		return s
	case n <= 4:
		return "(" + strings.Repeat(s+"*", n-1) + s + ")"
	}
	return fmt.Sprintf("math.Pow(%s, %d)", s, n)
}

func goRat(r *big.Rat) string {
	if r.IsInt() {
		return r.Num().String()
	}
	return "(" + r.Num().String() + ".0 / " + r.Denom().String() + ")"
}

func goPoly(p Poly) (string, error) {
	if p.IsZero() {
		return "0", nil
	}
	var sb strings.Builder
	for i, t := range p.terms {
		neg := t.Coef.Sign() < 0
		abs := new(big.Rat).Abs(t.Coef)
		writeSign(&sb, i == 0, neg)
		var f []string
		if abs.Cmp(ratOne) != 0 || len(t.Mono) == 0 {
			f = append(f, goRat(abs))
		}
		for _, vp := range t.Mono {
			if !isGoIdent(vp.Var) {
				return "", fmt.Errorf("the symbol %s has no real float64 form", vp.Var)
			}
			f = append(f, goPow(vp.Var, vp.Exp))
		}
		sb.WriteString(strings.Join(f, "*"))
	}
	if len(p.terms) == 1 && p.terms[0].Coef.Sign() > 0 {
		return sb.String(), nil
	}
	return "(" + sb.String() + ")", nil
}

func goRatFunc(r RatFunc) (string, error) {
	n, err := goPoly(r.num)
	if err != nil {
		return "", err
	}
	if r.IsPoly() {
		return n, nil
	}
	d, err := goPoly(r.den)
	if err != nil {
		return "", err
	}
	return "(" + n + " / " + d + ")", nil
}

func isGoIdent(s string) bool {
	for i, c := range s {
		if !(c == '_' || c >= 'a' && c <= 'z' || c >= 'A' && c <= 'Z' || i > 0 && c >= '0' && c <= '9') {
			return false
		}
	}
	return s != ""
}

// zetaLiterals are ζ(n) to 40 digits (A. Abramowitz, I.A. Stegun, Table 23.3).
var zetaLiterals = map[string]string{
	"zeta3": "1.202056903159594285399738161511449990765",
	"zeta5": "1.036927755143369926331365486457034168057",
	"zeta7": "1.008349277381922826839797549849796759600",
}

func goAtom(a Atom) (string, error) {
	switch x := a.(type) {
	case Const:
		if x == Pi {
			return "math.Pi", nil
		}
		if s, ok := zetaLiterals[x.Name]; ok {
			return s, nil
		}
		return "", fmt.Errorf("%s has no real float64 form", x.Name)
	case Fn:
		var args []string
		for _, arg := range x.Args {
			s, err := GoExpr(arg)
			if err != nil {
				return "", err
			}
			args = append(args, s)
		}
		switch x.Name {
		case FnLog:
			return "math.Log(" + args[0] + ")", nil
		case FnSqrt:
			return "math.Sqrt(" + args[0] + ")", nil
		case FnLi2:
			return "li2(" + args[0] + ")", nil
		case FnCl2:
			return "cl2(" + args[0] + ")", nil
		}
	}
	return "", fmt.Errorf("%s has no Go form", a.Key())
}
