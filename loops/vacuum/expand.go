package vacuum

import (
	"fmt"
	"math/big"

	"loopmatch/expr"
	"loopmatch/loops"
)

// Master describes a master integral atom: how deep its ε poles go and how it expands.
type Master struct {
	// Poles is the highest pole order, 1 for the one-loop tadpole, 2 at two loops.
	Poles int
	// Series expands the master with the given arguments up to O(ε^order); positive tells which
	// symbols are positive (masses, μ) so that logarithms of masses split.
	Series func(args []expr.Expr, order int, positive func(string) bool) (expr.Series, error)
}

var masters = map[string]Master{}

// Register makes a master atom known to ExpandEps.
func Register(name string, m Master) { masters[name] = m }

func init() {
	Register(TadName, Master{Poles: 1, Series: tadSeries})
	// The notation's A0(m) takes the mass, not its square.
	Register("A0", Master{Poles: 1, Series: func(args []expr.Expr, order int, positive func(string) bool) (expr.Series, error) {
		if len(args) != 1 {
			return expr.Series{}, fmt.Errorf("A0 takes one argument")
		}
		m2, err := args[0].Mul(args[0])
		if err != nil {
			return expr.Series{}, err
		}
		return tadSeries([]expr.Expr{m2}, order, positive)
	}})
}

// tadSeries is Tad(M²) = −M² e^{γ_E ε} Γ(−1+ε) (M²/μ²)^{−ε} up to O(ε^order).
func tadSeries(args []expr.Expr, order int, positive func(string) bool) (expr.Series, error) {
	if len(args) != 1 {
		return expr.Series{}, fmt.Errorf("Tad takes one argument")
	}
	m2, ok := args[0].AsRatFunc()
	if !ok {
		return expr.Series{}, fmt.Errorf("Tad(%s): the argument must be a rational expression in the parameters", args[0])
	}
	if m2.IsZero() {
		return expr.SeriesConst(expr.Zero(), order), nil
	}
	g, err := expr.ExpGamma(-1, big.NewRat(1, 1), order)
	if err != nil {
		return expr.Series{}, err
	}
	ratio, err := m2.Div(expr.RFVar("mu").Mul(expr.RFVar("mu")))
	if err != nil {
		return expr.Series{}, err
	}
	L, err := expr.LogSplit(expr.FromRF(ratio), 1, positive)
	if err != nil {
		return expr.Series{}, err
	}
	pw, err := expr.ExpEpsLog(big.NewRat(-1, 1), L, order+1)
	if err != nil {
		return expr.Series{}, err
	}
	s, err := g.Mul(pw)
	if err != nil {
		return expr.Series{}, err
	}
	return s.Scale(m2.Neg()), nil
}

// PositiveMasses treats every symbol as positive (for callers whose only symbols are masses
// and μ).
func PositiveMasses(string) bool { return true }

// ExpandEps expands e, whose coefficients may depend on d = 4 − 2ε and whose terms may contain
// registered master atoms, up to O(ε^order). Other atoms (logarithms, kinematics, chains) are
// ε-independent and stay in the coefficients.
func ExpandEps(e expr.Expr, order int, positive func(string) bool) (expr.Series, error) {
	total := expr.SeriesConst(expr.Zero(), order)
	for _, t := range e.Terms() {
		if len(t.Loops) > 0 {
			return expr.Series{}, fmt.Errorf("ExpandEps: %s is still a loop integral; reduce it first", t)
		}
		// Split the term into its coefficient, its masters and the rest.
		type factor struct {
			series func(int) (expr.Series, error)
			lo     int
		}
		var fs []factor
		rest := expr.Term{Coef: expr.RFInt(1), NC: t.NC}
		for _, a := range t.Atoms {
			f, ok := a.A.(expr.Fn)
			m, isMaster := masters[f.Name]
			if !ok || !isMaster {
				if loops.IsScalarAtom(a.A) {
					return expr.Series{}, fmt.Errorf("%s is not a vacuum integral: its ε-expansion is not known symbolically (evaluate it numerically)", a.A.Key())
				}
				rest.Atoms = append(rest.Atoms, a)
				continue
			}
			if a.Pow < 0 {
				return expr.Series{}, fmt.Errorf("ExpandEps: master %s appears in a denominator", f.Key())
			}
			for range a.Pow {
				fs = append(fs, factor{lo: -m.Poles, series: func(o int) (expr.Series, error) {
					return m.Series(f.Args, o, positive)
				}})
			}
		}
		coef := t.Coef
		probe, err := expr.SeriesFromRatFunc(coef, 1)
		if err != nil {
			return expr.Series{}, err
		}
		fs = append(fs, factor{lo: probe.Lo, series: func(o int) (expr.Series, error) {
			return expr.SeriesFromRatFunc(coef, o)
		}})
		// Factor f must be known to order − Σ_{g≠f} lo_g for the product to be known to order.
		sumLo := 0
		for _, f := range fs {
			sumLo += f.lo
		}
		prod := expr.SeriesConst(expr.FromTerm(rest), order-sumLo+1)
		for _, f := range fs {
			s, err := f.series(order - (sumLo - f.lo))
			if err != nil {
				return expr.Series{}, err
			}
			if prod, err = prod.Mul(s); err != nil {
				return expr.Series{}, err
			}
		}
		total = total.Add(prod.Truncate(order))
	}
	return total, nil
}
