package pv

import (
	"math/big"
	"testing"

	"loopmatch/expr"
	"loopmatch/loops"
)

// fourDim returns the d → 4 limit of a reduced coefficient in the MS-bar form used by
// A. Denner, Fortschr. Phys. 41 (1993) 307, section 4: each coefficient c(d) of a scalar
// integral I becomes c(4)·I, and the O(ε) part of c(d) times the 1/ε pole of I adds a rational
// term (A0(M) has the pole M, B0 the pole 1, PHYSICS.md).
func fourDim(t *testing.T, e expr.Expr) expr.Expr {
	t.Helper()
	var out []expr.Expr
	for _, tm := range e.Terms() {
		f := tm.Atoms[0].A.(expr.Fn)
		s, err := expr.SeriesFromRatFunc(tm.Coef, 2)
		if err != nil || s.Lo < 0 {
			t.Fatalf("coefficient %s: %v (series from ε^%d)", tm.Coef, err, s.Lo)
		}
		c0, ok0 := s.Coef(0).AsRatFunc()
		c1, ok1 := s.Coef(1).AsRatFunc()
		if !ok0 || !ok1 {
			t.Fatalf("coefficient %s is not rational", tm.Coef)
		}
		out = append(out, expr.FromAtom(f, 1).Scale(c0))
		switch f.Name {
		case loops.TadName:
			m, _ := f.Args[0].AsRatFunc()
			out = append(out, expr.FromRF(c1.Mul(m)))
		case loops.BubName:
			out = append(out, expr.FromRF(c1))
		}
	}
	return expr.Sum(out...)
}

// TestDennerTwoPoint reproduces the closed forms of the two-point coefficients of A. Denner,
// Fortschr. Phys. 41 (1993) 307, eq. (4.18) (the equation number cited by PHYSICS.md for B1; the
// formulas for B00 and B11 as we remember them next to it — the paper was not reachable
// through the search tool, and our own derivation in the comment of TestDennerTwoPoint agrees),
// with f1 = p² − m1² + m0²:
//
//	B1  = [A0(m0) − A0(m1) − f1 B0] / (2p²)                                     (exact in d)
//	B00 = [A0(m1) + 2m0² B0 + f1 B1 + m0² + m1² − p²/3] / 6                    (d → 4, MS-bar)
//	B11 = [2A0(m1) − 2m0² B0 − 4f1 B1 − m0² − m1² + p²/3] / (6p²)              (d → 4, MS-bar)
//
// with B1 inserted, as exact symbolic equalities in p², m0², m1².
// (Derivation: the metric and momentum contractions of docs/PASSARINO.md give
// 2(d−1)B00 = A0(m1) + 2m0²B0 + f1B1 and 2p²B11 = A0(m1) − f1B1 − 2B00; 1/(d−1) = 1/3 + 2ε/9
// times the pole (3m0² + 3m1² − p²)/2 gives the rational terms.)
func TestDennerTwoPoint(t *testing.T) {
	p2, m0, m1 := expr.RFVar("p2"), expr.RFVar("M0"), expr.RFVar("M1")
	k, err := NewKinematics([]expr.RatFunc{p2}, []expr.RatFunc{m0, m1})
	if err != nil {
		t.Fatal(err)
	}
	a0, _ := loops.Atom(loops.TadName, nil, []expr.RatFunc{m0})
	a1, _ := loops.Atom(loops.TadName, nil, []expr.RatFunc{m1})
	b0, _ := loops.Atom(loops.BubName, []expr.RatFunc{p2}, []expr.RatFunc{m0, m1})
	f1 := p2.Sub(m1).Add(m0)
	inv2p2, _ := expr.RFInt(1).Div(p2.Scale(bigTwo))
	b1 := a0.Sub(a1).Sub(b0.Scale(f1)).Scale(inv2p2)

	b00 := expr.Sum(a1, b0.Scale(m0.Scale(bigTwo)), b1.Scale(f1), expr.FromRF(m0.Add(m1).Sub(p2.Scale(ratC(1, 3))))).Scale(rat(1, 6))
	inv6p2, _ := expr.RFInt(1).Div(p2.Scale(ratC(6, 1)))
	b11 := expr.Sum(a1.Scale(rat(2, 1)), b0.Scale(m0.Scale(ratC(-2, 1))), b1.Scale(f1.Scale(ratC(-4, 1))),
		expr.FromRF(m0.Neg().Sub(m1).Add(p2.Scale(ratC(1, 3))))).Scale(inv6p2)

	red := NewReducer(k)
	cases := []struct {
		idx   []int
		want  expr.Expr
		exact bool // equal in d, not only for d → 4
	}{
		{[]int{1}, b1, true},
		{[]int{0, 0}, b00, false},
		{[]int{1, 1}, b11, false},
	}
	for _, tc := range cases {
		got, err := red.Coefficient(tc.idx)
		if err != nil {
			t.Fatal(err)
		}
		if tc.exact {
			if !got.Equal(tc.want) {
				t.Errorf("%s = %s, want %s", Name(2, tc.idx), got, tc.want)
			}
			continue
		}
		if g := fourDim(t, got); !g.Equal(tc.want) {
			t.Errorf("%s (d → 4) = %s, want %s", Name(2, tc.idx), g, tc.want)
		}
	}
}

// ratC returns the constant a/b as a *big.Rat.
func ratC(a, b int64) *big.Rat { return big.NewRat(a, b) }
