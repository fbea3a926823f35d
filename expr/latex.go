package expr

import (
	"fmt"
	"math/big"
	"strings"
	"unicode"
)

// This file prints expressions as LaTeX (amsmath): fractions with \frac, symbols with
// subscripts (mF → m_{F}), Greek names as letters, functions upright.

var greek = map[string]bool{
	"alpha": true, "beta": true, "gamma": true, "delta": true, "epsilon": true, "zeta": true,
	"eta": true, "theta": true, "iota": true, "kappa": true, "lambda": true, "mu": true, "nu": true,
	"xi": true, "rho": true, "sigma": true, "tau": true, "phi": true, "chi": true, "psi": true,
	"omega": true, "Gamma": true, "Delta": true, "Theta": true, "Lambda": true, "Xi": true,
	"Sigma": true, "Phi": true, "Psi": true, "Omega": true,
}

// LaTeXName renders a symbol name: "mF" → "m_{F}", "m1" → "m_{1}", "xi" → "\xi",
// "conj(yL)" → "y_{L}^{*}".
func LaTeXName(name string) string {
	if inner, ok := strings.CutPrefix(name, "conj("); ok {
		return LaTeXName(strings.TrimSuffix(inner, ")")) + "^{*}"
	}
	if greek[name] {
		return `\` + name
	}
	for g := range greek {
		if rest, ok := strings.CutPrefix(name, g); ok && rest != "" && !unicode.IsLower(rune(rest[0])) {
			return `\` + g + "_{" + rest + "}"
		}
	}
	if len(name) == 1 {
		return name
	}
	// base letter followed by a subscript of digits or capitals: mF, m1, yL, eQF, Nc
	if len(name) <= 4 && unicode.IsLetter(rune(name[0])) {
		return name[:1] + "_{" + strings.ReplaceAll(name[1:], "_", `\_`) + "}"
	}
	return `\mathrm{` + strings.ReplaceAll(name, "_", `\_`) + "}"
}

func latexMono(sb *strings.Builder, m Mono) {
	for i, vp := range m {
		if i > 0 {
			sb.WriteString(" ")
		}
		n := LaTeXName(vp.Var)
		if vp.Exp != 1 {
			if strings.Contains(n, "^") {
				n = "(" + n + ")"
			}
			fmt.Fprintf(sb, "%s^{%d}", n, vp.Exp)
		} else {
			sb.WriteString(n)
		}
	}
}

func latexRat(r *big.Rat) string {
	if r.IsInt() {
		return r.Num().String()
	}
	return `\frac{` + r.Num().String() + "}{" + r.Denom().String() + "}"
}

// LaTeX prints p: "a^{2} + a b + b^{2}", "\frac{1}{2} x".
func (p Poly) LaTeX() string {
	if p.IsZero() {
		return "0"
	}
	var sb strings.Builder
	for i, t := range p.terms {
		neg := t.Coef.Sign() < 0
		abs := new(big.Rat).Abs(t.Coef)
		writeSign(&sb, i == 0, neg)
		if len(t.Mono) == 0 {
			sb.WriteString(latexRat(abs))
			continue
		}
		if abs.Cmp(ratOne) != 0 {
			sb.WriteString(latexRat(abs))
			sb.WriteString(" ")
		}
		latexMono(&sb, t.Mono)
	}
	return sb.String()
}

// LaTeX prints r as a fraction when it has a denominator.
func (r RatFunc) LaTeX() string {
	d := r.Den()
	if d.IsOne() {
		return r.num.LaTeX()
	}
	c, np := r.num.PrimitiveZ()
	sign := ""
	if c.Sign() < 0 {
		sign = "-"
		c = new(big.Rat).Neg(c)
	}
	num := scaledLaTeX(c.Num(), np)
	den := scaledLaTeX(c.Denom(), d)
	return sign + `\frac{` + num + "}{" + den + "}"
}

func scaledLaTeX(k *big.Int, p Poly) string {
	one := k.IsInt64() && k.Int64() == 1
	switch {
	case p.IsOne():
		return k.String()
	case one:
		return p.LaTeX()
	case p.Len() == 1:
		return k.String() + " " + p.LaTeX()
	}
	return k.String() + `\left(` + p.LaTeX() + `\right)`
}

// LaTeX prints e.
func (e Expr) LaTeX() string { return e.joinTerms(Term.LaTeX) }

// LaTeX prints one term; loop integrals as \int_{k} of the integrand.
func (t Term) LaTeX() string {
	var num, den []string
	for _, a := range t.Atoms {
		if a.Pow > 0 {
			num = append(num, atomLaTeX(a.A, a.Pow))
		} else {
			den = append(den, atomLaTeX(a.A, -a.Pow))
		}
	}
	for _, n := range t.NC {
		num = append(num, ncLaTeX(n))
	}
	var body string
	if len(num) == 0 && len(den) == 0 {
		body = t.Coef.LaTeX()
	} else {
		c := t.Coef
		sign := ""
		if lc := c.num.LeadCoef(); lc.Sign() < 0 {
			sign, c = "-", c.Neg()
		}
		cn, cd := c.num, c.Den()
		k, np := cn.PrimitiveZ()
		numParts := []string{}
		if !(np.IsOne() && k.Num().IsInt64() && k.Num().Int64() == 1) {
			s := scaledLaTeX(k.Num(), np)
			if np.Len() > 1 && k.Num().Cmp(big.NewInt(1)) == 0 {
				s = `\left(` + s + `\right)`
			}
			numParts = append(numParts, s)
		}
		numParts = append(numParts, num...)
		denParts := []string{}
		if !(cd.IsOne() && k.Denom().IsInt64() && k.Denom().Int64() == 1) {
			s := scaledLaTeX(k.Denom(), cd)
			if cd.Len() > 1 && k.Denom().Cmp(big.NewInt(1)) == 0 && len(den) > 0 {
				s = `\left(` + s + `\right)`
			}
			denParts = append(denParts, s)
		}
		denParts = append(denParts, den...)
		n := strings.Join(numParts, " ")
		if n == "" {
			n = "1"
		}
		if len(denParts) == 0 {
			body = sign + n
		} else {
			body = sign + `\frac{` + n + "}{" + strings.Join(denParts, " ") + "}"
		}
	}
	if len(t.Loops) > 0 {
		return `\int_{` + strings.Join(t.Loops, ",") + `}\left[` + body + `\right]`
	}
	return body
}

func atomLaTeX(a Atom, n int) string {
	s := atomLaTeX1(a)
	if n == 1 {
		return s
	}
	switch a.(type) {
	case Const:
		return fmt.Sprintf("%s^{%d}", s, n)
	}
	return fmt.Sprintf(`\left(%s\right)^{%d}`, s, n)
}

func atomLaTeX1(a Atom) string {
	switch x := a.(type) {
	case Const:
		switch {
		case x == Pi:
			return `\pi`
		case x == I:
			return "i"
		case strings.HasPrefix(x.Name, "zeta"):
			return `\zeta_{` + strings.TrimPrefix(x.Name, "zeta") + "}"
		}
		return `\mathrm{` + x.Name + "}"
	case Fn:
		args := make([]string, len(x.Args))
		for i, arg := range x.Args {
			args[i] = arg.LaTeX()
		}
		inner := ""
		for i, s := range args {
			switch {
			case i > 0 && i == x.Split:
				inner += "; "
			case i > 0:
				inner += ", "
			}
			inner += s
		}
		if x.I0 < 0 {
			inner += ` - i0`
		}
		switch x.Name {
		case FnLog:
			return `\log\left(` + inner + `\right)`
		case FnLi2:
			return `\mathrm{Li}_2\left(` + inner + `\right)`
		case FnCl2:
			return `\mathrm{Cl}_2\left(` + inner + `\right)`
		case FnSqrt:
			return `\sqrt{` + inner + "}"
		}
		name := x.Name
		if len(name) == 2 && unicode.IsUpper(rune(name[0])) && unicode.IsDigit(rune(name[1])) {
			name = name[:1] + "_" + name[1:]
		} else {
			name = `\mathrm{` + name + "}"
		}
		return name + `\left(` + inner + `\right)`
	case Dot:
		if x.A == x.B {
			return LaTeXName(x.A) + "^2"
		}
		return LaTeXName(x.A) + `\cdot ` + LaTeXName(x.B)
	case Vec:
		return LaTeXName(x.P) + "^{" + LaTeXName(x.Mu) + "}"
	case Metric:
		return "g^{" + LaTeXName(x.Mu) + LaTeXName(x.Nu) + "}"
	case Levi:
		var s []string
		for _, sl := range x.S {
			s = append(s, LaTeXName(sl.Name))
		}
		return `\epsilon^{` + strings.Join(s, " ") + "}"
	case Prop:
		k := x.K.String()
		if !x.K.isSingle() {
			k = "(" + k + ")"
		}
		s := k + "^2"
		if !x.M2.IsZero() {
			s += " - " + x.M2.LaTeX()
			if x.M2.num.Len() > 1 || !x.M2.IsPoly() {
				s = k + `^2 - \left(` + x.M2.LaTeX() + `\right)`
			}
		}
		return `\left(` + s + `\right)`
	case Chain:
		var parts []string
		for _, e := range x.Elems {
			parts = append(parts, ncLaTeX(e))
		}
		return `\left[` + strings.Join(parts, " ") + `\right]`
	case Colour:
		var s []string
		for _, arg := range x.Args {
			s = append(s, LaTeXName(arg))
		}
		if x.Name == "delta" {
			return `\delta_{` + strings.Join(s, "") + "}"
		}
		return "f^{" + strings.Join(s, "") + "}"
	}
	return `\mathrm{` + a.Key() + "}"
}

func ncLaTeX(n NC) string {
	arg := func(i int) string { return LaTeXName(n.Args[i]) }
	switch n.Op {
	case NCGamma:
		return `\gamma^{` + arg(0) + "}"
	case NCSlash:
		return `\not{` + arg(0) + "}"
	case NCG5:
		return `\gamma_5`
	case NCPL:
		return "P_L"
	case NCPR:
		return "P_R"
	case NCSigma:
		return `\sigma^{` + arg(0) + arg(1) + "}"
	case NCUBar:
		return `\bar u(` + arg(0) + ")"
	case NCVBar:
		return `\bar v(` + arg(0) + ")"
	case NCU:
		return "u(" + arg(0) + ")"
	case NCV:
		return "v(" + arg(0) + ")"
	case NCT:
		return "T^{" + arg(0) + "}"
	}
	return n.Key()
}
