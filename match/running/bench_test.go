package running

import "testing"

// One 8×8 NLO evolution: the shipped LO ΔF = 1 matrix with the effective dipole mixing and the
// deterministic stand-in syntheticG1(8) for γ^{(1)} (no published 8×8 γ^{(1)} is shipped), from
// αs(160 GeV) = 0.108 to αs(4.8 GeV) = 0.215: eigen-decomposition, H, and U(μ, μ0) C0.
func BenchmarkNLO8x8(b *testing.B) {
	g0, _ := DeltaF1DipoleLO(5)
	e := Evolution{G0: g0, G1: syntheticG1(8), Nf: 5}
	c0 := []float64{0, 1, 0, 0, 0, 0, -0.18578056, -0.09426583}
	for b.Loop() {
		ev, err := e.Prepare()
		if err != nil {
			b.Fatal(err)
		}
		if _, err := ev.Apply(NLO, 0.215, 0.108, c0); err != nil {
			b.Fatal(err)
		}
	}
}

// The same evolution with the eigen-decomposition prepared once (many scale pairs).
func BenchmarkNLO8x8Prepared(b *testing.B) {
	g0, _ := DeltaF1DipoleLO(5)
	ev, err := Evolution{G0: g0, G1: syntheticG1(8), Nf: 5}.Prepare()
	if err != nil {
		b.Fatal(err)
	}
	c0 := []float64{0, 1, 0, 0, 0, 0, -0.18578056, -0.09426583}
	for b.Loop() {
		if _, err := ev.Apply(NLO, 0.215, 0.108, c0); err != nil {
			b.Fatal(err)
		}
	}
}

// The direct numerical integration of the same 8×8 NLO system (the cross-check).
func BenchmarkNLO8x8Numeric(b *testing.B) {
	g0, _ := DeltaF1DipoleLO(5)
	e := Evolution{G0: g0, G1: syntheticG1(8), Nf: 5}
	c0 := []float64{0, 1, 0, 0, 0, 0, -0.18578056, -0.09426583}
	for b.Loop() {
		if _, _, err := e.Numeric(NLO, 0.108, 160, 4.8, c0); err != nil {
			b.Fatal(err)
		}
	}
}

// Four-loop αs from MZ to 4.8 GeV by numerical integration.
func BenchmarkAlphaS4Loop(b *testing.B) {
	beta := Beta{Nf: 5, Loops: 4}
	for b.Loop() {
		if _, err := beta.AlphaS(0.118, 91.1876, 4.8); err != nil {
			b.Fatal(err)
		}
	}
}
