package dirac

import (
	"testing"

	"loopmatch/expr"
)

// BenchmarkTrace12 is the trace of twelve gamma matrices with distinct free indices
// (10395 products of metric tensors).
func BenchmarkTrace12(b *testing.B) {
	s := el("g:m1 g:m2 g:m3 g:m4 g:m5 g:m6 g:m7 g:m8 g:m9 g:m10 g:m11 g:m12")
	for b.Loop() {
		out, _, err := Trace(s, expr.Int(1), Options{})
		if err != nil || out.Len() != 10395 {
			b.Fatalf("%d terms, %v", out.Len(), err)
		}
	}
}

// BenchmarkChain8 simplifies a chain of eight matrices with three contracted index pairs, one
// free index and one slashed momentum, in d dimensions.
func BenchmarkChain8(b *testing.B) {
	c := ch("ubar:a g:mu g:nu s:p g:rho g:mu g:sg g:nu g:rho PL u:b")
	for b.Loop() {
		if _, _, err := Simplify(c, Kinematics{}, Options{}); err != nil {
			b.Fatal(err)
		}
	}
}
