package emit

import (
	"fmt"
	"math/big"
	"strings"

	"loopmatch/expr"
)

// This file prints a Program as a LaTeX document (amsmath): the conventions, the operators,
// every coefficient as its couplings times named auxiliary functions F_i, and each F_i defined
// once, with factored numerators and denominators.

// LaTeX returns a complete LaTeX document.
func (p *Program) LaTeX() string {
	var sb strings.Builder
	fmt.Fprintf(&sb, "%% Written by loopmatch emit from %s (match %s).\n", latexComment(p.Spec.Source), latexComment(p.Spec.Title))
	sb.WriteString("\\documentclass{article}\n\\usepackage{amsmath}\n\\allowdisplaybreaks\n\\begin{document}\n\n")
	fmt.Fprintf(&sb, "\\section*{Wilson coefficients: %s}\n\n", latexText(p.Spec.Title))
	fmt.Fprintf(&sb, "From \\texttt{%s}.\n", latexText(p.Spec.Source))
	if len(p.Spec.Conventions) > 0 {
		sb.WriteString("\n\\paragraph{Conventions.}\n\\begin{itemize}\n")
		for _, c := range p.Spec.Conventions {
			fmt.Fprintf(&sb, "  \\item \\texttt{%s}\n", latexText(c))
		}
		sb.WriteString("\\end{itemize}\n")
	}
	sb.WriteString("\n\\paragraph{Operators.}\n\\begin{itemize}\n")
	for _, c := range p.Coeffs {
		fmt.Fprintf(&sb, "  \\item \\texttt{%s}\n", latexText(c.Operator))
	}
	sb.WriteString("\\end{itemize}\n\n")
	sb.WriteString(p.latexIntro())
	sb.WriteString("\\begin{align}\n")
	for i, c := range p.Coeffs {
		end := ", \\\\"
		if i == len(p.Coeffs)-1 {
			end = "."
			if len(p.namedParts()) > 0 {
				end = ","
			}
		}
		fmt.Fprintf(&sb, "  %s &= %s%s\n", latexLabel(c.Label), p.latexAssembly(c), end)
	}
	sb.WriteString("\\end{align}\n")
	if named := p.namedParts(); len(named) > 0 {
		sb.WriteString("where\n\\begin{align}\n")
		for i, part := range named {
			end := ", \\\\"
			if i == len(named)-1 {
				end = "."
			}
			fmt.Fprintf(&sb, "  %s &= %s%s\n", partLaTeX(part), exprLaTeX(part.Expr), end)
		}
		sb.WriteString("\\end{align}\n")
	}
	sb.WriteString("\n\\end{document}\n")
	return sb.String()
}

func (p *Program) latexIntro() string {
	var s []string
	if !p.Spec.Scale.IsZero() {
		s = append(s, fmt.Sprintf("at the matching scale $\\mu = %s$", p.Spec.Scale.LaTeX()))
	} else {
		s = append(s, "at the renormalisation scale $\\mu$")
	}
	var rs []string
	for _, par := range p.Spec.Params {
		if par.Kind == Ratio && par.Num != "" {
			rs = append(rs, fmt.Sprintf("$%s = %s^2/%s^2$", expr.LaTeXName(par.Name), expr.LaTeXName(par.Num), expr.LaTeXName(par.Den)))
		}
	}
	if len(rs) > 0 {
		s = append(s, "with "+strings.Join(rs, ", "))
	}
	return "The coefficients " + strings.Join(s, ", ") + ", are\n"
}

// namedParts are the auxiliary functions defined on their own.
func (p *Program) namedParts() []*Part {
	var out []*Part
	for _, part := range p.Parts {
		if !part.inline {
			out = append(out, part)
		}
	}
	return out
}

func partLaTeX(part *Part) string {
	var vs []string
	for _, v := range part.Vars {
		vs = append(vs, expr.LaTeXName(v))
	}
	return fmt.Sprintf("F_{%d}(%s)", part.Index, strings.Join(vs, ", "))
}

// latexLabel prints a label such as C_Q7 as C_{\mathrm{Q7}}.
func latexLabel(l string) string {
	base, sub, ok := strings.Cut(l, "_")
	if !ok {
		return `\mathrm{` + latexText(l) + `}`
	}
	return base + `_{\mathrm{` + latexText(sub) + `}}`
}

// latexAssembly prints Common·Σ Factor·F_i.
func (p *Program) latexAssembly(c *Coeff) string {
	if len(c.Terms) == 0 {
		return "0"
	}
	var sb strings.Builder
	for i, t := range c.Terms {
		f := exprLaTeX(t.Factor)
		var s string
		switch {
		case t.Part == nil:
			s = f
		case t.Part.inline:
			s = exprLaTeX(t.Part.Expr)
		case f == "1":
			s = partLaTeX(t.Part)
		case f == "-1":
			s = "-" + partLaTeX(t.Part)
		default:
			if t.Factor.Len() > 1 {
				f = `\left(` + f + `\right)`
			}
			s = f + `\, ` + partLaTeX(t.Part)
		}
		if i > 0 {
			if strings.HasPrefix(s, "-") {
				s = " - " + s[1:]
			} else {
				s = " + " + s
			}
		}
		sb.WriteString(s)
	}
	sum := sb.String()
	if c.Common.Equal(expr.Int(1)) {
		return sum
	}
	if len(c.Terms) > 1 {
		sum = `\left[` + sum + `\right]`
	}
	return exprLaTeX(c.Common) + `\, ` + sum
}

// exprLaTeX prints a sum term by term with factored coefficients.
func exprLaTeX(e expr.Expr) string {
	if e.IsZero() {
		return "0"
	}
	var sb strings.Builder
	for i, t := range e.Terms() {
		s := termLaTeX(t)
		if i > 0 {
			if strings.HasPrefix(s, "-") {
				s = " - " + s[1:]
			} else {
				s = " + " + s
			}
		}
		sb.WriteString(s)
	}
	return sb.String()
}

// termLaTeX prints c·N/D·atoms with N and D as products of square-free factors.
func termLaTeX(t expr.Term) string {
	cn, num := factorsLaTeX(t.Coef.Num())
	cd, den := factorsLaTeX(t.Coef.Den())
	c := new(big.Rat).Quo(cn, cd)
	sign := ""
	if c.Sign() < 0 {
		sign = "-"
		c.Neg(c)
	}
	for _, a := range t.Atoms {
		s := atomLaTeX(a.A, abs(a.Pow))
		if a.Pow > 0 {
			num = append(num, s)
		} else {
			den = append(den, s)
		}
	}
	if c.Num().Cmp(big.NewInt(1)) != 0 || len(num) == 0 {
		num = append([]string{c.Num().String()}, num...)
	}
	if c.Denom().Cmp(big.NewInt(1)) != 0 {
		den = append([]string{c.Denom().String()}, den...)
	}
	n := strings.Join(unwrap(num), " ")
	if len(den) == 0 {
		return sign + n
	}
	return sign + `\frac{` + n + `}{` + strings.Join(unwrap(den), " ") + `}`
}

// factorsLaTeX returns the rational content and the square-free factors of p.
func factorsLaTeX(p expr.Poly) (*big.Rat, []string) {
	c, fs := expr.SquareFree(p)
	var out []string
	for _, f := range fs {
		s := f.P.LaTeX()
		if f.P.Len() > 1 {
			s = `\left(` + s + `\right)`
		}
		if f.Pow > 1 {
			s = fmt.Sprintf("%s^{%d}", s, f.Pow)
		}
		out = append(out, s)
	}
	return c, out
}

// atomLaTeX prints a^n, writing log of a single symbol as \log x.
func atomLaTeX(a expr.Atom, n int) string {
	if f, ok := a.(expr.Fn); ok && f.Name == expr.FnLog && len(f.Args) == 1 {
		if r, ok := f.Args[0].AsRatFunc(); ok {
			if vs := r.Vars(); len(vs) == 1 && r.Equal(expr.RFVar(vs[0])) {
				if n == 1 {
					return `\log ` + expr.LaTeXName(vs[0])
				}
				return fmt.Sprintf(`\log^{%d} %s`, n, expr.LaTeXName(vs[0]))
			}
		}
	}
	return expr.FromAtom(a, n).LaTeX()
}

// latexText escapes text for LaTeX's text mode, mapping the Unicode the conventions use to
// math symbols.
func latexText(s string) string {
	var sb strings.Builder
	for _, r := range s {
		switch r {
		case '\\':
			sb.WriteString(`\textbackslash{}`)
		case '{', '}', '$', '&', '#', '_', '%':
			sb.WriteString(`\` + string(r))
		case '^':
			sb.WriteString(`\^{}`)
		case '~':
			sb.WriteString(`\~{}`)
		default:
			if m, ok := unicodeLaTeX[r]; ok {
				sb.WriteString(m)
			} else if r < 128 {
				sb.WriteRune(r)
			} else {
				sb.WriteString("?")
			}
		}
	}
	return sb.String()
}

var unicodeLaTeX = map[rune]string{
	'∫': `$\int$`, '…': `\ldots{}`, '·': `$\cdot$`, '−': `-`, '→': `$\to$`, '≤': `$\le$`,
	'≥': `$\ge$`, '×': `$\times$`, '±': `$\pm$`, '∑': `$\sum$`, '√': `$\surd$`, '²': `$^2$`,
	'α': `$\alpha$`, 'β': `$\beta$`, 'γ': `$\gamma$`, 'δ': `$\delta$`, 'ε': `$\epsilon$`,
	'μ': `$\mu$`, 'π': `$\pi$`, 'ξ': `$\xi$`, 'Λ': `$\Lambda$`, '–': `--`, '—': `---`,
}

// latexComment keeps a LaTeX comment on one line.
func latexComment(s string) string { return strings.ReplaceAll(s, "\n", " ") }

// unwrap drops the parentheses of a lone factor: \frac{(x - 1)}{…} reads as \frac{x - 1}{…}.
func unwrap(fs []string) []string {
	if len(fs) == 1 && strings.HasPrefix(fs[0], `\left(`) && strings.HasSuffix(fs[0], `\right)`) && strings.Count(fs[0], `\left(`) == 1 {
		return []string{strings.TrimSuffix(strings.TrimPrefix(fs[0], `\left(`), `\right)`)}
	}
	return fs
}
