package inamilim

import (
	"math"
	"math/big"
	"testing"

	"loopmatch/expr"
	"loopmatch/expr/notation"
	"loopmatch/expr/specfun"
)

// The Inami–Lim functions as written in A.J. Buras, hep-ph/9806471 (PHYSICS.md): as exact
// expressions for the expr evaluator and the arbitrary-precision reference, and written
// naively into float64 Go, as one would type them from the paper.
var textbook = []struct {
	name    string
	formula string
	emitted func(float64) float64
	naive   func(float64) float64
}{
	{"B0", "1/4*(x/(1 - x) + x*log(x)/(x - 1)^2)", IL_B0,
		func(x float64) float64 { return 0.25 * (x/(1-x) + x*math.Log(x)/math.Pow(x-1, 2)) }},
	{"C0", "x/8*((x - 6)/(x - 1) + (3*x + 2)*log(x)/(x - 1)^2)", IL_C0,
		func(x float64) float64 { return x / 8 * ((x-6)/(x-1) + (3*x+2)*math.Log(x)/math.Pow(x-1, 2)) }},
	{"D0", "-4/9*log(x) + (-19*x^3 + 25*x^2)/(36*(x - 1)^3) + x^2*(5*x^2 - 2*x - 6)*log(x)/(18*(x - 1)^4)", IL_D0,
		func(x float64) float64 {
			return -4.0/9*math.Log(x) + (-19*x*x*x+25*x*x)/(36*math.Pow(x-1, 3)) + x*x*(5*x*x-2*x-6)*math.Log(x)/(18*math.Pow(x-1, 4))
		}},
	{"Dp0", "-(8*x^3 + 5*x^2 - 7*x)/(12*(1 - x)^3) + x^2*(2 - 3*x)*log(x)/(2*(1 - x)^4)", IL_Dp0,
		func(x float64) float64 {
			return -(8*x*x*x+5*x*x-7*x)/(12*math.Pow(1-x, 3)) + x*x*(2-3*x)*math.Log(x)/(2*math.Pow(1-x, 4))
		}},
	{"Ep0", "-(x^3 - 5*x^2 - 2*x)/(4*(1 - x)^3) + 3*x^2*log(x)/(2*(1 - x)^4)", IL_Ep0,
		func(x float64) float64 {
			return -(x*x*x-5*x*x-2*x)/(4*math.Pow(1-x, 3)) + 3*x*x*math.Log(x)/(2*math.Pow(1-x, 4))
		}},
	{"S0", "(4*x - 11*x^2 + x^3)/(4*(1 - x)^2) - 3*x^3*log(x)/(2*(1 - x)^3)", IL_S0,
		func(x float64) float64 {
			return (4*x-11*x*x+x*x*x)/(4*math.Pow(1-x, 2)) - 3*x*x*x*math.Log(x)/(2*math.Pow(1-x, 3))
		}},
}

// benchPoints are 64 points evenly in log x from 0.01 to 100 (a quarter of them inside the
// series branches around x = 1).
func benchPoints() []float64 {
	xs := make([]float64, 64)
	for i := range xs {
		xs[i] = math.Pow(10, -2+4*float64(i)/63)
	}
	return xs
}

var sink float64

// BenchmarkEmitted is the cost of one call of an emitted function, averaged over benchPoints.
func BenchmarkEmitted(b *testing.B) {
	xs := benchPoints()
	for _, f := range textbook {
		b.Run(f.name, func(b *testing.B) {
			s := 0.0
			for i := 0; b.Loop(); i++ {
				s += f.emitted(xs[i&63])
			}
			sink = s
		})
	}
}

// BenchmarkExprEval is the same evaluation through the expression evaluator of package expr
// (complex128, a map of values); its ratio to BenchmarkEmitted is the speed-up of emitting.
func BenchmarkExprEval(b *testing.B) {
	xs := benchPoints()
	for _, f := range textbook {
		e, err := notation.ParseFreeExpr(f.formula)
		if err != nil {
			b.Fatal(err)
		}
		b.Run(f.name, func(b *testing.B) {
			vals := map[string]complex128{}
			s := 0.0
			for i := 0; b.Loop(); i++ {
				vals["x"] = complex(xs[i&63], 0)
				v, err := e.Eval(vals)
				if err != nil {
					b.Fatal(err)
				}
				s += real(v)
			}
			sink = s
		})
	}
}

// BenchmarkNaive is the textbook formula typed into float64 Go, for the cost of the stable
// branches.
func BenchmarkNaive(b *testing.B) {
	xs := benchPoints()
	for _, f := range textbook {
		b.Run(f.name, func(b *testing.B) {
			s := 0.0
			for i := 0; b.Loop(); i++ {
				s += f.naive(xs[i&63])
			}
			sink = s
		})
	}
}

// digits returns the number of correct decimal digits −log10(max relative error) of f at the
// points (0 when the error is as large as the value), against the closed form evaluated with 600
// bits.
func digits(b *testing.B, formula string, f func(float64) float64, xs []float64) float64 {
	e, err := notation.ParseFreeExpr(formula)
	if err != nil {
		b.Fatal(err)
	}
	worst := 0.0
	for _, x := range xs {
		want := exact(b, e, x)
		worst = math.Max(worst, math.Abs(f(x)-want)/math.Abs(want))
	}
	if worst == 0 {
		return 17
	}
	return math.Max(0, math.Min(17, -math.Log10(worst)))
}

func exact(b *testing.B, e expr.Expr, x float64) float64 {
	const prec = 600
	v, err := e.EvalBig(map[string]specfun.Complex{"x": specfun.RealComplex(new(big.Float).SetPrec(prec).SetFloat64(x), prec)}, prec)
	if err != nil {
		b.Fatal(err)
	}
	f, _ := v.Re.Float64()
	return f
}

// BenchmarkDigitsNearOne reports the digits kept at x = 1 ± 10^-k, k = 1 … 8, by the emitted
// functions (digits-emitted) and by the textbook formulas in float64 (digits-naive), the worst
// over the points; the time is that of evaluating the emitted function at the 16 points.
func BenchmarkDigitsNearOne(b *testing.B) {
	var xs []float64
	for k := 1; k <= 8; k++ {
		d := math.Pow(10, -float64(k))
		xs = append(xs, 1+d, 1-d)
	}
	for _, f := range textbook {
		b.Run(f.name, func(b *testing.B) {
			de := digits(b, f.formula, f.emitted, xs)
			dn := digits(b, f.formula, f.naive, xs)
			s := 0.0
			for b.Loop() {
				for _, x := range xs {
					s += f.emitted(x)
				}
			}
			sink = s
			b.ReportMetric(de, "digits-emitted")
			b.ReportMetric(dn, "digits-naive")
		})
	}
}
