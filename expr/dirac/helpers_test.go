package dirac

import (
	"math"
	"math/big"
	"math/rand/v2"
	"strings"
	"testing"

	"loopmatch/expr"
)

// el parses a compact element list for tests: "ubar:q2 g:mu s:p G5 PL PR sig:mu:nu T:a u:q1".
func el(src string) []expr.NC {
	var out []expr.NC
	ops := map[string]expr.NCOp{"g": expr.NCGamma, "s": expr.NCSlash, "G5": expr.NCG5, "PL": expr.NCPL, "PR": expr.NCPR,
		"sig": expr.NCSigma, "T": expr.NCT, "ubar": expr.NCUBar, "vbar": expr.NCVBar, "u": expr.NCU, "v": expr.NCV}
	for _, f := range strings.Fields(src) {
		parts := strings.Split(f, ":")
		op, ok := ops[parts[0]]
		if !ok {
			panic("unknown element " + f)
		}
		out = append(out, expr.NC{Op: op, Args: parts[1:]})
	}
	return out
}

// ch is the chain (or product of chains) written in el's syntax; the expression engine closes
// the chains and contracts indices.
func ch(src string) expr.Expr {
	return expr.FromTerm(expr.Term{Coef: expr.RFInt(1), NC: el(src)})
}

func mul(xs ...expr.Expr) expr.Expr {
	out := expr.Int(1)
	for _, x := range xs {
		out = out.MustMul(x)
	}
	return out
}

func vec(p, mu string) expr.Expr { return expr.FromAtom(expr.Vec{P: p, Mu: mu}, 1) }
func gmn(mu, nu string) expr.Expr {
	if mu == nu {
		return expr.Sym("d")
	}
	return expr.FromAtom(expr.NewMetric(mu, nu), 1)
}
func dotp(p, q string) expr.Expr { return expr.FromAtom(expr.NewDot(p, q), 1) }
func num(n int64) expr.Expr      { return expr.Int(n) }
func frac(a, b int64) expr.Expr  { return expr.Num(big.NewRat(a, b)) }
func sym(s string) expr.Expr     { return expr.Sym(s) }
func iunit() expr.Expr           { return expr.FromAtom(expr.I, 1) }
func rf(s string) expr.RatFunc   { return expr.RFVar(s) }

func levi(a, b, c, e string, index [4]bool) expr.Expr {
	l, s := expr.NewLevi([4]expr.Slot{{Name: a, Index: index[0]}, {Name: b, Index: index[1]}, {Name: c, Index: index[2]}, {Name: e, Index: index[3]}})
	if s == 0 {
		return expr.Zero()
	}
	return expr.FromAtom(l, 1).Scale(expr.RFInt(int64(s)))
}

func mustSimplify(t *testing.T, e expr.Expr, kin Kinematics, opt Options) (expr.Expr, Report) {
	t.Helper()
	out, rep, err := Simplify(e, kin, opt)
	if err != nil {
		t.Fatalf("Simplify(%s): %v", e, err)
	}
	return out, rep
}

// spectators returns legs for chains whose ends need no Dirac equation (algebra-only tests):
// the harness still needs spinors for them, built from arbitrary massive momenta.
func spectators(rng *rand.Rand, names ...string) (Kinematics, map[string][4]float64, map[string]complex128) {
	var kin Kinematics
	mom := map[string][4]float64{}
	vals := map[string]complex128{}
	for _, n := range names {
		m := 0.5 + rng.Float64()
		pn := "P" + n
		mom[pn] = onShell(rng, m)
		vals["M"+n] = complex(m, 0)
		kin.Legs = append(kin.Legs, Leg{Name: n, Mom: expr.MomOf(pn), Mass: rf("M" + n)})
	}
	return kin, mom, vals
}

// randMoms adds random (off-shell) vectors for the given names.
func randMoms(rng *rand.Rand, mom map[string][4]float64, names ...string) {
	for _, n := range names {
		mom[n] = randVec(rng)
	}
}

var _ = math.Sqrt
