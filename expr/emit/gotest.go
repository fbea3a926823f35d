package emit

import (
	"bytes"
	"fmt"
	"go/format"
	"math"
	"math/big"
	"math/cmplx"
	"slices"
	"sort"
	"strings"

	"loopmatch/expr"
	"loopmatch/expr/specfun"
)

// This file writes the test that accompanies the emitted Go: for every coefficient a table of
// arguments with reference values computed from the exact expression in arbitrary precision
// (independently of the float64 programs), and the tolerance of each row.

// RefPoint is one reference value of a coefficient.
type RefPoint struct {
	Args []complex128 // in the order of the coefficient's Args
	Want complex128
	Tol  float64
}

// defaultValue is the test value of a parameter without a value in the spec.
func defaultValue(k Kind, i int) complex128 {
	switch k {
	case Complex:
		return complex(0.6, 0.8)
	case Real:
		return complex([]float64{0.7, -0.3, 1.3, -1.1, 0.45}[i%5], 0)
	}
	return 1
}

// mainVar returns the coefficient's main variable ("" when its parts have several variables).
func (c *Coeff) mainVar() string {
	v := ""
	for _, t := range c.Terms {
		if t.Part == nil {
			continue
		}
		if len(t.Part.Vars) != 1 || v != "" && v != t.Part.Vars[0] {
			return ""
		}
		v = t.Part.Vars[0]
	}
	return v
}

// maxPole is the highest multiplicity of a denominator factor of e.
func maxPole(e expr.Expr) int {
	k := 1
	for _, t := range e.Terms() {
		_, fs := expr.SquareFree(t.Coef.Den())
		for _, f := range fs {
			k = max(k, f.Pow)
		}
	}
	return k
}

// RefPoints returns the reference points of a coefficient: eight per decade of its main
// variable over the domain, approaches to every removable singularity from 1e-1 to 1e-12 and the
// point itself, both sides of every branch boundary, and its zeros (with the neighbouring
// floats). A coefficient of several kinematic variables gets a small grid around the spec's
// values.
func (p *Program) RefPoints(c *Coeff) ([]RefPoint, error) {
	base := make([]complex128, len(c.Args))
	for i, a := range c.Args {
		v, ok := p.Spec.Values[a.Name]
		if !ok {
			v = defaultValue(a.Kind, i)
		}
		base[i] = v
	}
	x := c.mainVar()
	xi := slices.IndexFunc(c.Args, func(a Param) bool { return a.Name == x })
	var xs []float64
	var special []*big.Rat
	if xi >= 0 {
		for k := math.Log10(Domain.Lo) * 8; k <= math.Log10(Domain.Hi)*8+1e-9; k++ {
			xs = append(xs, math.Pow(10, k/8))
		}
		for _, t := range c.Terms {
			if t.Part == nil || t.Part.fn == nil {
				continue
			}
			for _, s := range t.Part.fn.special {
				special = append(special, s)
				x0, _ := s.Float64()
				xs = append(xs, x0)
				for k := 1; k <= 12; k++ {
					d := math.Pow(10, -float64(k))
					xs = append(xs, x0*(1+d), x0*(1-d))
				}
			}
			for _, b := range t.Part.fn.branches {
				for _, e := range []float64{b.lo, b.hi} {
					if e > 0 && !math.IsInf(e, 0) {
						xs = append(xs, math.Nextafter(e, 0), e, math.Nextafter(e, math.Inf(1)))
					}
				}
			}
		}
	}
	var rows [][]complex128
	switch {
	case xi >= 0:
		for _, xv := range xs {
			r := slices.Clone(base)
			r[xi] = complex(xv, 0)
			rows = append(rows, r)
		}
	case len(c.Args) == 0:
		rows = append(rows, base)
	default:
		rows = append(rows, base)
		for i, a := range c.Args {
			if a.Kind == Real || a.Kind == Complex {
				continue
			}
			for _, f := range []float64{0.3, 0.7, 1.5, 3} {
				r := slices.Clone(base)
				r[i] *= complex(f, 0)
				rows = append(rows, r)
			}
		}
	}
	prec := uint(200 + 160*maxPole(c.Expr))
	eval := func(args []complex128) (complex128, error) {
		return p.refValue(c, args, special, xi, prec)
	}
	pts := make([]RefPoint, 0, len(rows))
	for _, r := range rows {
		w, err := eval(r)
		if err != nil {
			return nil, err
		}
		pts = append(pts, RefPoint{Args: r, Want: w})
	}
	// Zeros of the coefficient along its main variable.
	if xi >= 0 && len(pts) > 1 {
		zs, err := p.refZeros(c, pts, xi, eval)
		if err != nil {
			return nil, err
		}
		for _, z := range zs {
			for _, zz := range []float64{math.Nextafter(z, 0), z, math.Nextafter(z, math.Inf(1))} {
				r := slices.Clone(base)
				r[xi] = complex(zz, 0)
				w, err := eval(r)
				if err != nil {
					return nil, err
				}
				pts = append(pts, RefPoint{Args: r, Want: w})
			}
		}
		sort.SliceStable(pts, func(i, j int) bool { return real(pts[i].Args[xi]) < real(pts[j].Args[xi]) })
		pts = slices.CompactFunc(pts, func(a, b RefPoint) bool { return slices.Equal(a.Args, b.Args) })
	}
	// Tolerances: M is the largest |want| within a factor 10 of the main variable.
	for i := range pts {
		m := cmplx.Abs(pts[i].Want)
		if xi >= 0 {
			xv := real(pts[i].Args[xi])
			for _, q := range pts {
				if xq := real(q.Args[xi]); xq >= xv/10 && xq <= xv*10 {
					m = math.Max(m, cmplx.Abs(q.Want))
				}
			}
		}
		pts[i].Tol = Tolerance.Rel*cmplx.Abs(pts[i].Want) + Tolerance.Abs*m
	}
	return pts, nil
}

// refValue evaluates the coefficient's exact expression at the arguments with prec bits; at a
// removable singularity it takes the mean of the values at x0 ± 2^-150, whose error is of
// order 2^-300.
func (p *Program) refValue(c *Coeff, args []complex128, special []*big.Rat, xi int, prec uint) (complex128, error) {
	vals := map[string]specfun.Complex{}
	for i, a := range c.Args {
		vals[a.Name] = specfun.NewComplex(real(args[i]), imag(args[i]), prec)
	}
	if xi >= 0 {
		xr := new(big.Rat).SetFloat64(real(args[xi]))
		for _, s := range special {
			if xr.Cmp(s) != 0 {
				continue
			}
			var sum specfun.Complex
			for k, sign := range []int{1, -1} {
				d := new(big.Float).SetPrec(4*prec).SetMantExp(big.NewFloat(float64(sign)), -150)
				xv := new(big.Float).SetPrec(4 * prec).SetRat(s)
				vals[c.Args[xi].Name] = specfun.RealComplex(xv.Add(xv, d), 4*prec)
				v, err := c.Expr.EvalBig(vals, 4*prec)
				if err != nil {
					return 0, err
				}
				if k == 0 {
					sum = v
				} else {
					sum = sum.Add(v)
				}
			}
			re, _ := sum.Re.Float64()
			im, _ := sum.Im.Float64()
			return complex(re/2, im/2), nil
		}
	}
	v, err := c.Expr.EvalBig(vals, prec)
	if err != nil {
		return 0, err
	}
	re, _ := v.Re.Float64()
	im, _ := v.Im.Float64()
	return complex(re, im), nil
}

// refZeros finds sign changes of the real part between reference points (and on a finer grid)
// and refines them by bisection on the exact values.
func (p *Program) refZeros(c *Coeff, pts []RefPoint, xi int, eval func([]complex128) (complex128, error)) ([]float64, error) {
	var zs []float64
	fine := []float64{}
	for k := math.Log10(Domain.Lo) * 40; k <= math.Log10(Domain.Hi)*40; k++ {
		fine = append(fine, math.Pow(10, k/40))
	}
	args := slices.Clone(pts[0].Args)
	at := func(xv float64) complex128 {
		args[xi] = complex(xv, 0)
		v, err := c.Eval(args)
		if err != nil {
			return complex(math.NaN(), 0)
		}
		return v
	}
	for i := 1; i < len(fine); i++ {
		a, b := real(at(fine[i-1])), real(at(fine[i]))
		if a == 0 || b == 0 || math.IsNaN(a) || math.IsNaN(b) || (a < 0) == (b < 0) {
			continue
		}
		lo, hi := fine[i-1], fine[i]
		sa := a < 0
		for k := 0; k < 200 && math.Nextafter(lo, hi) < hi; k++ {
			mid := lo + (hi-lo)/2
			r := slices.Clone(args)
			r[xi] = complex(mid, 0)
			v, err := eval(r)
			if err != nil {
				return nil, err
			}
			if (real(v) < 0) == sa {
				lo = mid
			} else {
				hi = mid
			}
		}
		zs = append(zs, lo)
	}
	return zs, nil
}

// GoTest returns the _test.go file for the program's Go source: the reference tables, a test per
// coefficient and a benchmark per coefficient.
func (p *Program) GoTest() ([]byte, error) {
	n := p.names()
	var body bytes.Buffer
	usesCmplx := false
	for _, c := range p.Coeffs {
		pts, err := p.RefPoints(c)
		if err != nil {
			return nil, fmt.Errorf("%s: reference values: %w", c.Label, err)
		}
		fields := make([]string, len(c.Args))
		for i, a := range c.Args {
			fields[i] = n.params[a.Name]
			if fields[i] == "want" || fields[i] == "tol" {
				fields[i] += "Arg"
			}
		}
		wantType := c.resultType()
		table := "ref" + c.Name
		fmt.Fprintf(&body, "// %s holds %d reference values of %s.\nvar %s = []struct {\n", table, len(pts), c.Name, table)
		for i, a := range c.Args {
			fmt.Fprintf(&body, "\t%s %s\n", fields[i], goType(a))
		}
		fmt.Fprintf(&body, "\twant %s\n\ttol float64\n}{\n", wantType)
		for _, pt := range pts {
			var vs []string
			for i, a := range c.Args {
				vs = append(vs, goValue(pt.Args[i], a.Kind == Complex))
			}
			vs = append(vs, goValue(pt.Want, wantType == "complex128"), fmt.Sprintf("%.3g", pt.Tol))
			fmt.Fprintf(&body, "\t{%s},\n", strings.Join(vs, ", "))
		}
		body.WriteString("}\n\n")
		var callArgs []string
		for _, f := range fields {
			callArgs = append(callArgs, "r."+f)
		}
		diff := "math.Abs(got - r.want)"
		if wantType == "complex128" {
			diff = "cmplx.Abs(got - r.want)"
			usesCmplx = true
		}
		fmt.Fprintf(&body, `func Test%[1]s(t *testing.T) {
	for _, r := range %[2]s {
		got := %[1]s(%[3]s)
		if !(%[4]s <= r.tol) {
			t.Errorf("%[1]s(%%v) = %%v, want %%v within %%.2g", []any{%[3]s}, got, r.want, r.tol)
		}
	}
}

`, c.Name, table, strings.Join(callArgs, ", "), diff, wantType)
		if len(c.Args) == 0 {
			fmt.Fprintf(&body, "func Benchmark%[1]s(b *testing.B) {\n\tvar sum %[2]s\n\tfor b.Loop() {\n\t\tsum += %[1]s()\n\t}\n\t%[4]sBenchSink = %[3]s\n}\n\n", c.Name, wantType, sinkExpr(wantType), n.prefix)
			continue
		}
		fmt.Fprintf(&body, `// Benchmark%[1]s calls %[1]s at the reference points in turn.
func Benchmark%[1]s(b *testing.B) {
	var sum %[4]s
	for i := 0; b.Loop(); i++ {
		r := &%[2]s[i%%len(%[2]s)]
		sum += %[1]s(%[3]s)
	}
	%[6]sBenchSink = %[5]s
}

`, c.Name, table, strings.Join(callArgs, ", "), wantType, sinkExpr(wantType), n.prefix)
	}
	var out bytes.Buffer
	fmt.Fprintf(&out, "// Code generated by loopmatch emit from %s; DO NOT EDIT.\n\n", p.Spec.Source)
	fmt.Fprintf(&out, "package %s\n\n", p.Spec.Package)
	imports := []string{`"math"`, `"testing"`}
	if usesCmplx {
		imports = append(imports, `"math/cmplx"`)
	}
	if !strings.Contains(body.String(), "math.") {
		imports = imports[1:]
	}
	fmt.Fprintf(&out, "import (\n\t%s\n)\n\n", strings.Join(imports, "\n\t"))
	fmt.Fprintf(&out, "// The reference values come from the exact coefficients evaluated in arbitrary precision by\n// loopmatch, independently of the float64 programs; tol is %g·|want| + %g·max|want|, the\n// maximum taken over the rows within a factor 10 of the main variable.\n\n", Tolerance.Rel, Tolerance.Abs)
	fmt.Fprintf(&out, "var %sBenchSink complex128\n\n", n.prefix)
	out.Write(body.Bytes())
	formatted, err := format.Source(out.Bytes())
	if err != nil {
		return nil, fmt.Errorf("emitted test does not parse (a bug): %v", err)
	}
	return formatted, nil
}

func goValue(z complex128, isComplex bool) string {
	if isComplex {
		return fmt.Sprintf("complex(%s, %s)", floatLit(real(z)), floatLit(imag(z)))
	}
	return floatLit(real(z))
}

func sinkExpr(t string) string {
	if t == "complex128" {
		return "sum"
	}
	return "complex(sum, 0)"
}
