package main

import (
	"encoding/json"
	"flag"
	"fmt"
	"io"
	"math"
	"math/big"
	"strings"

	"loopmatch/expr"
	"loopmatch/expr/notation"
	"loopmatch/expr/specfun"
	"loopmatch/loops"
)

var integralCmd = &command{
	name:    "integral",
	summary: "evaluate a one-loop scalar integral A0, B0, B0prime, C0 or D0",
	usage:   "'CALL' [--mu M] [--digits N] [--format text|json]",
	help: `integral evaluates one scalar integral written as in .lm files: invariants first, then the
internal masses (not squared), separated by ';', in the argument order of PHYSICS.md:

	A0(m)  B0(p2; m0, m1)  B0prime(p2; m0, m1)  C0(s1, s2, s3; m0, m1, m2)
	D0(s01, s12, s23, s30, s02, s13; m0, m1, m2, m3)

It prints the coefficients of 1/eps^2, 1/eps and eps^0 in the MS-bar normalisation (the common
factor i/(16 pi^2) not included) at the scale mu. With --digits above 15 the arbitrary-precision
path is used. Example:

	loopmatch integral 'C0(0, 0, -10; 80.4, 173, 80.4)' --format json`,
}

type integralOpts struct {
	mu     string
	digits int
	format *format
}

func integralFlags() (*flag.FlagSet, *integralOpts) {
	fs := flag.NewFlagSet("integral", flag.ContinueOnError)
	o := &integralOpts{format: newFormat("text", "json")}
	fs.StringVar(&o.mu, "mu", "1", "the MS-bar scale mu (not squared)")
	fs.IntVar(&o.digits, "digits", 15, "significant digits of the output (above 15: arbitrary precision)")
	fs.Var(o.format, "format", "output format: text or json")
	return fs, o
}

func init() {
	flagSets["integral"] = func() *flag.FlagSet { fs, _ := integralFlags(); return fs }
	integralCmd.run = runIntegral
}

// exactNumber returns the exact rational value of a constant expression.
func exactNumber(e expr.Expr) (*big.Rat, bool) {
	r, ok := e.AsRatFunc()
	if !ok {
		return nil, false
	}
	return r.ConstValue()
}

func runIntegral(args []string, out, errOut io.Writer) int {
	fs, o := integralFlags()
	// Arguments may start with "-": take every non-flag argument as part of the call.
	var callArgs, flagArgs []string
	for i := 0; i < len(args); i++ {
		a := args[i]
		name := strings.TrimLeft(a, "-")
		if strings.HasPrefix(a, "-") && (name == "mu" || name == "digits" || name == "format") {
			flagArgs = append(flagArgs, a)
			if i+1 < len(args) {
				flagArgs = append(flagArgs, args[i+1])
				i++
			}
			continue
		}
		if strings.HasPrefix(a, "-") && (strings.HasPrefix(name, "mu=") || strings.HasPrefix(name, "digits=") || strings.HasPrefix(name, "format=") || name == "h" || name == "help") {
			flagArgs = append(flagArgs, a)
			continue
		}
		callArgs = append(callArgs, a)
	}
	if _, ok := parseFlags(fs, flagArgs, errOut); !ok {
		return exitBadInput
	}
	fail := func(format string, a ...any) int {
		fmt.Fprintf(errOut, "loopmatch integral: "+format+"\n", a...)
		return exitBadInput
	}
	if len(callArgs) != 1 {
		return fail("expected one CALL argument (quote it), e.g. 'B0(1; 0.5, 2)'")
	}
	if o.digits < 1 || o.digits > 1000 {
		return fail("--digits must be between 1 and 1000, found %d", o.digits)
	}
	muE, err := notation.ParseFreeExpr(o.mu)
	if err != nil {
		return fail("--mu: %v", err)
	}
	prec := uint(float64(o.digits)*math.Log2(10)) + 32
	muC, err := muE.EvalBig(nil, prec)
	if err != nil || muC.Im.Sign() != 0 || muC.Re.Sign() <= 0 {
		return fail("--mu must be a positive number, found %s", o.mu)
	}
	mu2 := new(big.Float).SetPrec(prec).Mul(muC.Re, muC.Re)
	e, err := notation.ParseFreeExpr(callArgs[0])
	if err != nil {
		return fail("%v", err)
	}
	if e.Len() != 1 || len(e.Terms()[0].Atoms) != 1 || !e.Terms()[0].Coef.IsOne() {
		return fail("expected a single call A0(…), B0(…), B0prime(…), C0(…) or D0(…), found %s", e)
	}
	f, ok := e.Terms()[0].Atoms[0].A.(expr.Fn)
	if !ok || !loops.IsScalarAtom(f) || e.Terms()[0].Atoms[0].Pow != 1 {
		return fail("expected a single call A0(…), B0(…), B0prime(…), C0(…) or D0(…), found %s", e)
	}
	vals := make([]*big.Rat, len(f.Args))
	for i, a := range f.Args {
		v, ok := exactNumber(a)
		if !ok {
			return fail("argument %d of %s is not a number: %s", i+1, f.Name, a)
		}
		vals[i] = v
	}
	var res [3]specfun.Complex
	if o.digits <= 15 {
		fargs := make([]float64, len(vals))
		for i, v := range vals {
			fargs[i], _ = v.Float64()
		}
		m2, _ := mu2.Float64()
		if r, ok := exactNumber(muE); ok {
			m2, _ = new(big.Rat).Mul(r, r).Float64() // exact square, then one rounding
		}
		v, err := loops.Eval(f.Name, fargs, m2)
		if err != nil {
			return fail("%v", err)
		}
		for i, c := range []complex128{v.Pole2, v.Pole1, v.Finite} {
			res[i] = specfun.NewComplex(real(c), imag(c), 64)
		}
	} else {
		bargs := make([]*big.Float, len(vals))
		for i, v := range vals {
			bargs[i] = new(big.Float).SetPrec(prec).SetRat(v)
		}
		v, err := loops.EvalBig(f.Name, bargs, mu2, prec)
		if err != nil {
			return fail("%v", err)
		}
		res = [3]specfun.Complex{v.Pole2, v.Pole1, v.Finite}
	}
	num := func(x *big.Float) string {
		if x.Sign() == 0 {
			return "0"
		}
		return x.Text('g', o.digits)
	}
	if o.format.value == "json" {
		doc := map[string][2]json.Number{}
		for i, k := range []string{"pole2", "pole1", "finite"} {
			doc[k] = [2]json.Number{json.Number(num(res[i].Re)), json.Number(num(res[i].Im))}
		}
		enc := json.NewEncoder(out)
		_ = enc.Encode(doc)
		return exitOK
	}
	fmt.Fprintf(out, "%s at mu = %s (MS-bar, factor i/(16 pi^2) not included)\n", f.Key(), muE)
	for i, k := range []string{"1/eps^2", "1/eps", "finite"} {
		fmt.Fprintf(out, "  %-8s %s", k+":", num(res[i].Re))
		if res[i].Im.Sign() != 0 {
			sign := "+"
			im := new(big.Float).Set(res[i].Im)
			if im.Sign() < 0 {
				sign = "-"
				im.Neg(im)
			}
			fmt.Fprintf(out, " %s %s*I", sign, num(im))
		}
		fmt.Fprintln(out)
	}
	return exitOK
}
