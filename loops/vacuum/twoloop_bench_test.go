package vacuum

import (
	"testing"

	"loopmatch/expr"
)

// benchReduceAll reduces every J(a1, a2, a3) with a_i ≥ 1 and a1 + a2 + a3 ≤ 8 from an empty cache.
func benchReduceAll(b *testing.B, ms [3]expr.RatFunc) {
	for b.Loop() {
		resetTwoLoopCache()
		for _, p := range powersUpTo(8) {
			if _, _, err := TwoLoop(p, ms, Numerator{}); err != nil {
				b.Fatal(err)
			}
		}
	}
}

// BenchmarkTwoLoopReduction: three different symbolic masses (the benchmark).
func BenchmarkTwoLoopReduction(b *testing.B) {
	benchReduceAll(b, [3]expr.RatFunc{sq("m1"), sq("m2"), sq("m3")})
}

// BenchmarkTwoLoopReductionNumeric: three different numerical masses.
func BenchmarkTwoLoopReductionNumeric(b *testing.B) {
	benchReduceAll(b, [3]expr.RatFunc{expr.RFInt(1), expr.RFInt(3), expr.RFInt(7)})
}

// BenchmarkTwoLoopReductionMassless: masses (m1, m2, 0).
func BenchmarkTwoLoopReductionMassless(b *testing.B) {
	benchReduceAll(b, [3]expr.RatFunc{sq("m1"), sq("m2"), expr.RFInt(0)})
}

// BenchmarkTwoLoopReductionThreshold: masses (m, 2m, 3m), where the sunset reduces to tadpoles.
func BenchmarkTwoLoopReductionThreshold(b *testing.B) {
	m := sq("m")
	benchReduceAll(b, [3]expr.RatFunc{m, m.Mul(expr.RFInt(4)), m.Mul(expr.RFInt(9))})
}

// BenchmarkSunSeries: the master's ε-expansion to O(ε^0) for three different symbolic masses.
func BenchmarkSunSeries(b *testing.B) {
	e := Sun(sq("m1"), sq("m2"), sq("m3"))
	for b.Loop() {
		if _, err := ExpandEps(e, 1, PositiveMasses); err != nil {
			b.Fatal(err)
		}
	}
}
