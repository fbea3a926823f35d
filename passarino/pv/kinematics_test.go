package pv

import (
	"errors"
	"math/big"
	"math/rand/v2"
	"slices"
	"strings"
	"sync"
	"testing"

	"loopmatch/expr"
)

func rats(xs ...int64) []expr.RatFunc {
	out := make([]expr.RatFunc, len(xs))
	for i, x := range xs {
		out[i] = expr.RFInt(x)
	}
	return out
}

// TestNewKinematicsErrors checks that malformed kinematics are refused with a clear error.
func TestNewKinematicsErrors(t *testing.T) {
	cases := []struct {
		name      string
		inv, m2   []expr.RatFunc
		wantError string
	}{
		{"no propagator", nil, nil, "0 propagators"},
		{"five propagators", rats(1, 2, 3, 4, 5, 6, 7, 8, 9, 10), rats(1, 1, 1, 1, 1), "5 propagators"},
		{"wrong count", rats(1, 2), rats(1, 1, 1), "takes 3 invariants, got 2"},
		{"d in an invariant", []expr.RatFunc{expr.RFVar("d")}, rats(1, 1), "contains the dimension d"},
		{"d in a mass", rats(1), []expr.RatFunc{expr.RFInt(1), expr.RFVar("d")}, "contains the dimension d"},
		{"negative mass", rats(1), rats(1, -2), "negative"},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			_, err := NewKinematics(tc.inv, tc.m2)
			if err == nil || !strings.Contains(err.Error(), tc.wantError) {
				t.Errorf("error %v, want one containing %q", err, tc.wantError)
			}
		})
	}
}

// TestIndexErrors checks that malformed coefficient indices are refused.
func TestIndexErrors(t *testing.T) {
	k, err := NewKinematics(rats(-1, -2, -3), rats(1, 2, 3))
	if err != nil {
		t.Fatal(err)
	}
	cases := []struct {
		idx       []int
		wantError string
	}{
		{[]int{0}, "odd number of 0s"},
		{[]int{0, 0, 0, 1}, "odd number of 0s"},
		{[]int{3}, "out of range"},
		{[]int{-1}, "out of range"},
		{[]int{1, 1, 1, 1, 1, 1, 1}, "exceeds the supported maximum"},
	}
	for _, tc := range cases {
		if _, err := Coefficient(k, tc.idx); err == nil || !strings.Contains(err.Error(), tc.wantError) {
			t.Errorf("%v: error %v, want one containing %q", tc.idx, err, tc.wantError)
		}
	}
	// A one-point function has no momenta: only pairs of 0.
	a, _ := NewKinematics(nil, rats(4))
	if _, err := Coefficient(a, []int{1}); err == nil {
		t.Error("A1 accepted")
	}
}

// TestNamesAndIndices checks the coefficient names and the enumeration of the coefficients (the
// counts are those of the symmetric structures: for N − 1 momenta and rank r, the multisets
// of size r − 2j over N − 1 indices, summed over j).
func TestNamesAndIndices(t *testing.T) {
	names := []struct {
		n    int
		idx  []int
		want string
	}{
		{1, nil, "A0"}, {1, []int{0, 0}, "A00"}, {2, []int{1}, "B1"}, {3, []int{2, 0, 1, 0}, "C0012"},
		{4, []int{3, 3, 1}, "D133"}, {4, nil, "D0"},
	}
	for _, tc := range names {
		if got := Name(tc.n, tc.idx); got != tc.want {
			t.Errorf("Name(%d, %v) = %s, want %s", tc.n, tc.idx, got, tc.want)
		}
	}
	counts := []struct{ n, r, want int }{
		{1, 0, 1}, {1, 1, 0}, {1, 4, 1}, {2, 2, 2}, {3, 2, 4}, {3, 3, 6}, {3, 4, 9}, {4, 1, 3}, {4, 2, 7}, {4, 3, 13}, {4, 4, 22},
	}
	for _, tc := range counts {
		if got := len(Indices(tc.n, tc.r)); got != tc.want {
			t.Errorf("len(Indices(%d, %d)) = %d, want %d", tc.n, tc.r, got, tc.want)
		}
	}
	if got := Indices(3, 2); !slices.EqualFunc(got, [][]int{{0, 0}, {1, 1}, {1, 2}, {2, 2}}, slices.Equal) {
		t.Errorf("Indices(3, 2) = %v", got)
	}
}

// TestGram checks the Gram determinant of a triangle against the Källén function:
// det(p_i·p_j) = p1² p2² − (p1·p2)² = −λ(p1², (p2−p1)², p2²)/4 (common practice, no source).
func TestGram(t *testing.T) {
	k := symbolicKinematics(t, 3)
	a, b, c := expr.RFVar("s01"), expr.RFVar("s12"), expr.RFVar("s02")
	lambda := a.Mul(a).Add(b.Mul(b)).Add(c.Mul(c)).Sub(a.Mul(b).Add(b.Mul(c)).Add(a.Mul(c)).Scale(bigTwo))
	want := lambda.Scale(ratC(-1, 4))
	if got := k.GramDet(); !got.Equal(want) {
		t.Errorf("Gram determinant %s, want %s", got, want)
	}
	if g := k.Gram(); !g[0][0].Equal(a) || !g[1][1].Equal(c) {
		t.Errorf("Gram diagonal %s, %s, want p1², p2²", g[0][0], g[1][1])
	}
}

// TestZeroGramErrors checks the degenerate configurations: the recursion refuses to divide by a
// vanishing Gram determinant and names the integral and its kinematics.
func TestZeroGramErrors(t *testing.T) {
	cases := []struct {
		name      string
		inv, m2   []expr.RatFunc
		ok        [][]int // coefficients that need no Gram inverse
		fail      []int
		wantError []string
	}{
		{
			// Euclidean P2 = 2 P1: λ(−1, −1, −4) = 0.
			name: "collinear triangle", inv: rats(-1, -1, -4), m2: rats(1, 2, 3),
			ok: [][]int{{}}, fail: []int{1},
			wantError: []string{"C1", "vanishing Gram determinant", "the 3-point function C0(p1² = -1, (p2−p1)² = -1, p2² = -4; m0² = 1, m1² = 2, m2² = 3)", "vacuum path"},
		},
		{
			name: "box at zero momenta", inv: rats(0, 0, 0, 0, 0, 0), m2: rats(1, 2, 3, 4),
			ok: [][]int{{}}, fail: []int{0, 0},
			wantError: []string{"D00", "vanishing Gram determinant", "the 4-point function D0("},
		},
		{
			// The sub-triangle of propagators 1, 2, 3 is collinear (λ(−1, −1, −4) = 0) while the
			// box's own Gram determinant is not zero (not realisable with real momenta, but a
			// valid algebraic test of the message).
			name: "collinear sub-triangle", inv: rats(-2, -1, -1, -5, -3, -4), m2: rats(1, 2, 3, 4),
			ok: [][]int{{}, {1}, {2}, {3}}, fail: []int{1, 1},
			wantError: []string{"D11", "the 3-point sub-integral C0 with propagators [1 2 3] of the 4-point function"},
		},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			k, err := NewKinematics(tc.inv, tc.m2)
			if err != nil {
				t.Fatal(err)
			}
			red := NewReducer(k)
			for _, idx := range tc.ok {
				if _, err := red.Coefficient(idx); err != nil {
					t.Errorf("%s: %v", Name(k.N(), idx), err)
				}
			}
			_, err = red.Coefficient(tc.fail)
			if !errors.Is(err, ErrZeroGram) {
				t.Fatalf("%s: error %v, want ErrZeroGram", Name(k.N(), tc.fail), err)
			}
			for _, w := range tc.wantError {
				if !strings.Contains(err.Error(), w) {
					t.Errorf("error %q does not contain %q", err, w)
				}
			}
		})
	}
}

// TestGrowthLimit checks that a reduction whose coefficients outgrow MaxCoefTerms fails with
// expr.ErrTooLarge instead of running on.
func TestGrowthLimit(t *testing.T) {
	old := MaxCoefTerms
	MaxCoefTerms = 200
	defer func() { MaxCoefTerms = old }()
	k := symbolicKinematics(t, 4)
	_, err := Coefficient(k, []int{1, 1})
	if !errors.Is(err, expr.ErrTooLarge) {
		t.Errorf("error %v, want expr.ErrTooLarge", err)
	}
}

// TestConcurrentUse runs several goroutines on one Reducer, asking for the coefficients in
// different orders, and compares with a serial reduction (run with -race to check the locking).
func TestConcurrentUse(t *testing.T) {
	_, k := euclideanPoint(rand.New(rand.NewPCG(5, 5)), 4)
	var idxs [][]int
	for r := 0; r <= 3; r++ {
		idxs = append(idxs, Indices(4, r)...)
	}
	serial := make([]expr.Expr, len(idxs))
	ref := NewReducer(k)
	for i, idx := range idxs {
		e, err := ref.Coefficient(idx)
		if err != nil {
			t.Fatal(err)
		}
		serial[i] = e
	}
	shared := NewReducer(k)
	var wg sync.WaitGroup
	for g := range 4 {
		wg.Go(func() {
			for n := range idxs {
				i := (n*(2*g+1) + g) % len(idxs) // a different order per goroutine
				e, err := shared.Coefficient(idxs[i])
				if err != nil {
					t.Error(err)
					return
				}
				if !e.Equal(serial[i]) {
					t.Errorf("%s differs between concurrent and serial use", Name(4, idxs[i]))
				}
			}
		})
	}
	wg.Wait()
}

// rat returns the rational constant a/b.
func rat(a, b int64) expr.RatFunc { return expr.RFRat(big.NewRat(a, b)) }
