package running

import (
	"io/fs"
	"testing"

	"loopmatch/expr/notation"
)

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

// Parsing and validating every shipped table file through the notation (what the first use of
// a table costs; later uses are cached).
func BenchmarkParseTables(b *testing.B) {
	files, _ := fs.Glob(tableFS, "tables/*.lm")
	for b.Loop() {
		for _, f := range files {
			src, _ := tableFS.ReadFile(f)
			if _, err := notation.Parse(f, src); err != nil {
				b.Fatal(err)
			}
		}
	}
}

// Exact evaluation of the 8×8 ΔF = 1 block at Nc = 3, nf = 5 into a gonum matrix (done once per
// flavour window of an evolution).
func BenchmarkBlockMatrices8x8(b *testing.B) {
	t, err := LookupTable("deltaf1_dipole_lo")
	if err != nil {
		b.Fatal(err)
	}
	for b.Loop() {
		if _, _, err := BlockMatrices(t.Block, 3, 5); err != nil {
			b.Fatal(err)
		}
	}
}

// One LO evolution of the 8×8 block from 160 GeV to 4.8 GeV as `loopmatch evolve` runs it:
// αs from M_Z (one loop), block evaluation, decomposition and U·C.
func BenchmarkEvolveBlock8x8(b *testing.B) {
	t, err := LookupTable("deltaf1_dipole_lo")
	if err != nil {
		b.Fatal(err)
	}
	c := Coupling{AlphaS0: 0.118, Mu0: 91.1876, Nf0: 5, Loops: 1,
		Thresholds: []Threshold{{Nf: 4, Mass: 1.27}, {Nf: 5, Mass: 4.18}, {Nf: 6, Mass: 162.5}}}
	c0 := []float64{0, 1, 0, 0, 0, 0, -0.18578056, -0.09426583}
	for b.Loop() {
		if _, err := Evolve(FromBlock(t.Block, 3), c, LO, ProductForm, 160, 4.8, c0); err != nil {
			b.Fatal(err)
		}
	}
}
