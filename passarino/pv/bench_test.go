package pv

import (
	"testing"

	"loopmatch/expr"
)

// boxRank3 is a box with four different masses at a Euclidean point (exact rationals):
// p1² = −17/4, (p2−p1)² = −15/2, (p3−p2)² = −3, p3² = −3/4, p2² = −5/4, (p3−p1)² = −13/2,
// masses² 7/4, 7/2, 1, 11/4.
func boxRank3(b *testing.B, symbolicMasses bool) *Kinematics {
	inv := []expr.RatFunc{rat(-17, 4), rat(-15, 2), rat(-3, 1), rat(-3, 4), rat(-5, 4), rat(-13, 2)}
	m2 := []expr.RatFunc{rat(7, 4), rat(7, 2), rat(1, 1), rat(11, 4)}
	if symbolicMasses {
		m2 = []expr.RatFunc{expr.RFVar("M0"), expr.RFVar("M1"), expr.RFVar("M2"), expr.RFVar("M3")}
	}
	k, err := NewKinematics(inv, m2)
	if err != nil {
		b.Fatal(err)
	}
	return k
}

func benchmarkBox(b *testing.B, symbolicMasses bool) {
	k := boxRank3(b, symbolicMasses)
	var idxs [][]int
	for r := 0; r <= 3; r++ {
		idxs = append(idxs, Indices(4, r)...)
	}
	b.ResetTimer()
	for b.Loop() {
		red := NewReducer(k)
		for _, idx := range idxs {
			if _, err := red.Coefficient(idx); err != nil {
				b.Fatal(err)
			}
		}
	}
}

// BenchmarkBoxRank3Numeric reduces all 24 coefficients of rank ≤ 3 of a box with four different
// masses, numeric invariants and masses (exact rationals; the coefficients stay rational in d).
func BenchmarkBoxRank3Numeric(b *testing.B) { benchmarkBox(b, false) }

// BenchmarkBoxRank3SymbolicMasses is the same box with the four squared masses symbolic.
func BenchmarkBoxRank3SymbolicMasses(b *testing.B) { benchmarkBox(b, true) }

// BenchmarkTriangleRank3Symbolic reduces all 16 coefficients of rank ≤ 3 of a triangle with
// symbolic invariants and squared masses (six symbols and d).
func BenchmarkTriangleRank3Symbolic(b *testing.B) {
	var inv, m2 []expr.RatFunc
	for _, v := range []string{"s01", "s12", "s02"} {
		inv = append(inv, expr.RFVar(v))
	}
	for _, v := range []string{"M0", "M1", "M2"} {
		m2 = append(m2, expr.RFVar(v))
	}
	k, err := NewKinematics(inv, m2)
	if err != nil {
		b.Fatal(err)
	}
	var idxs [][]int
	for r := 0; r <= 3; r++ {
		idxs = append(idxs, Indices(3, r)...)
	}
	for b.Loop() {
		red := NewReducer(k)
		for _, idx := range idxs {
			if _, err := red.Coefficient(idx); err != nil {
				b.Fatal(err)
			}
		}
	}
}
