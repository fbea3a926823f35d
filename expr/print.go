package expr

import (
	"strings"
)

// String prints e in canonical text form, which the notation's parser reads back to the same
// expression.
func (e Expr) String() string { return e.joinTerms(Term.String) }

// joinTerms writes the terms of e with text, joined by " + " and " - " (a term text's leading
// minus becomes the operator); "0" for no terms.
func (e Expr) joinTerms(text func(Term) string) string {
	if len(e.terms) == 0 {
		return "0"
	}
	var sb strings.Builder
	for i, t := range e.terms {
		s := text(t)
		switch {
		case i == 0:
			sb.WriteString(s)
		case strings.HasPrefix(s, "-"):
			sb.WriteString(" - ")
			sb.WriteString(s[1:])
		default:
			sb.WriteString(" + ")
			sb.WriteString(s)
		}
	}
	return sb.String()
}

// String prints one term: [coefficient*]atoms[/denominator atoms], inside "loop k { … }" when
// the term is integrated.
func (t Term) String() string {
	inner := t.productText()
	if len(t.Loops) > 0 {
		return "loop " + strings.Join(t.Loops, ", ") + " { " + inner + " }"
	}
	return inner
}

func (t Term) productText() string {
	var num, den []string
	for _, a := range t.Atoms {
		if a.Pow > 0 {
			num = append(num, atomText(a.A, a.Pow))
		} else {
			den = append(den, atomText(a.A, -a.Pow))
		}
	}
	if len(t.NC) > 0 {
		parts := make([]string, len(t.NC))
		for i, n := range t.NC {
			parts[i] = n.Key()
		}
		num = append(num, "("+strings.Join(parts, " ")+")")
	}
	if len(num) == 0 && len(den) == 0 {
		return t.Coef.String()
	}
	sign, coef := coefPrefix(t.Coef)
	var sb strings.Builder
	sb.WriteString(sign)
	switch {
	case len(num) == 0:
		if coef == "" {
			sb.WriteString("1")
		} else {
			sb.WriteString(strings.TrimSuffix(coef, "*"))
		}
	default:
		sb.WriteString(coef)
		sb.WriteString(strings.Join(num, "*"))
	}
	if len(den) > 0 {
		sb.WriteString("/")
		if len(den) == 1 {
			sb.WriteString(den[0])
		} else {
			sb.WriteString("(" + strings.Join(den, "*") + ")")
		}
	}
	return sb.String()
}

// coefPrefix splits a coefficient into a sign and a factor text ending in "*" (empty for ±1).
func coefPrefix(c RatFunc) (sign, text string) {
	if c.IsPoly() && c.num.Len() == 1 {
		t := c.num.terms[0]
		if t.Coef.Sign() < 0 {
			sign = "-"
		}
		abs := c.num.Scale(ratOne)
		if sign == "-" {
			abs = c.num.Neg()
		}
		if abs.IsOne() {
			return sign, ""
		}
		s := abs.String()
		if strings.Contains(s, "/") && len(t.Mono) > 0 {
			// "x/2" followed by "*atom" reads correctly; keep it bare.
			return sign, s + "*"
		}
		return sign, s + "*"
	}
	if c.IsPoly() {
		if c.num.LeadCoef().Sign() < 0 {
			return "-", "(" + c.num.Neg().String() + ")*"
		}
		return "", "(" + c.num.String() + ")*"
	}
	s := c.String()
	if strings.HasPrefix(s, "-") {
		return "-", s[1:] + "*"
	}
	return "", s + "*"
}

// writeSign writes the sign that joins a term of a sum: "-" before a negative first term,
// " - " or " + " between terms.
func writeSign(sb *strings.Builder, first, neg bool) {
	switch {
	case first && neg:
		sb.WriteString("-")
	case neg:
		sb.WriteString(" - ")
	case !first:
		sb.WriteString(" + ")
	}
}
