package match

import (
	"fmt"
	"math/cmplx"
	"slices"
	"strings"

	"loopmatch/expr"
	"loopmatch/expr/notation"
)

// symmetryChecks returns the checks that both routes add to a result: the Ward identity for
// external photons and gluons, and the cancellation of the gauge parameters in the declared
// gauge-independent combinations.
func symmetryChecks(p *notation.Program, mb *notation.MatchBlock, opt Options, res *Result) ([]Check, error) {
	ward, err := wardChecks(p, mb, opt)
	if err != nil {
		return nil, err
	}
	return append(ward, gaugeChecks(p, mb, res)...), nil
}

// gaugeChecks checks every invariant line of the block: the combination of coefficients must
// not depend on any declared gauge parameter. Closed forms are differentiated exactly; with
// scalar integrals that have no closed form the combination is compared numerically at two
// values of each gauge parameter.
func gaugeChecks(p *notation.Program, mb *notation.MatchBlock, res *Result) []Check {
	gauges := p.NamesOf(notation.KindGauge)
	var out []Check
	for _, inv := range mb.Invariants {
		ch := Check{Name: "gauge parameter cancels in " + inv.Text}
		if len(gauges) == 0 {
			ch.Detail = "no gauge parameter is declared (gauge xi)"
			out = append(out, ch)
			continue
		}
		comb, err := combination(inv, res)
		if err != nil {
			ch.Detail = err.Error()
			out = append(out, ch)
			continue
		}
		ch.Passed = true
		var det []string
		for _, xi := range gauges {
			d, err := comb.Derivative(xi)
			if err != nil { // scalar integrals without closed form: numerically
				ok, s := gaugeNumeric(p, mb, comb, xi)
				ch.Passed = ch.Passed && ok
				det = append(det, s)
				continue
			}
			if d.IsZero() {
				det = append(det, fmt.Sprintf("d/d%s (%s) = 0", xi, inv.Text))
				continue
			}
			ch.Passed = false
			det = append(det, fmt.Sprintf("%s-dependent remainder: d/d%s (%s) = %s", xi, xi, inv.Text, d))
		}
		ch.Detail = strings.Join(det, "; ")
		out = append(out, ch)
	}
	return out
}

// combination evaluates an invariant line with the coefficients of the result.
func combination(inv notation.Invariant, res *Result) (expr.Expr, error) {
	r, ok := inv.Combination.AsRatFunc()
	if !ok {
		return expr.Expr{}, fmt.Errorf("invariant %s is not a rational combination", inv.Text)
	}
	have := map[string]bool{}
	for _, c := range res.Coeffs {
		have["C_"+c.Operator] = true
	}
	var ops []string
	if res.Block != nil {
		ops = res.Block.Ops
	}
	for _, v := range r.Vars() {
		if op, ok := strings.CutPrefix(v, "C_"); ok && slices.Contains(ops, op) && !have[v] {
			return expr.Expr{}, fmt.Errorf("invariant %s uses %s, which is not a coefficient of the result (an eom operator is removed on shell)", inv.Text, v)
		}
	}
	out := expr.Zero()
	for _, c := range res.Coeffs {
		w := r.Derivative("C_" + c.Operator)
		if w.IsZero() {
			continue
		}
		out = out.Add(c.Value.Scale(w))
	}
	return out, nil
}

// gaugeNumeric compares the combination at the file's value of xi (or 1) and at 1.5 times it.
func gaugeNumeric(p *notation.Program, mb *notation.MatchBlock, comb expr.Expr, xi string) (bool, string) {
	pt, err := pointOf(p, mb)
	if err != nil {
		return false, fmt.Sprintf("%s: needs numerical values: %v", xi, err)
	}
	x0, ok := pt[xi]
	if !ok {
		x0 = 1
	}
	a, err1 := EvalFinite(comb, pt.with(map[string]float64{xi: x0}))
	b, err2 := EvalFinite(comb, pt.with(map[string]float64{xi: 1.5 * x0}))
	if err1 != nil || err2 != nil {
		return false, fmt.Sprintf("%s: numerical evaluation failed: %v %v", xi, err1, err2)
	}
	ok = cmplx.Abs(a-b) <= 1e-9*(cmplx.Abs(a)+cmplx.Abs(b)+1e-300)
	return ok, fmt.Sprintf("%s = %g: %s; %s = %g: %s (%s-dependent remainder %s)", xi, x0, fmtC(a), xi, 1.5*x0, fmtC(b), xi, fmtC(b-a))
}
