package running

import (
	"math"
	"math/big"
	"regexp"
	"strings"
	"testing"
)

// exactTable evaluates a shipped table exactly.
func exactTable(t *testing.T, name string, order, nc, nf int) [][]*big.Rat {
	t.Helper()
	tb, err := LookupTable(name)
	if err != nil {
		t.Fatal(err)
	}
	r, err := tb.Block.At(order, nc, nf)
	if err != nil {
		t.Fatal(err)
	}
	return r
}

func q(a, b int64) *big.Rat { return big.NewRat(a, b) }

// stdFromCMM is R of Q_i = 4 Σ_j R_ij P_j (i ≤ 6; Q7 = 4 P7, Q8 = 4 P8), derived in four
// dimensions from the colour identity δ_il δ_kj = 2 T^a_ij T^a_kl + δ_ij δ_kl/N and the Dirac
// identities γ_μγ_νγ_ρ P_L ⊗ γ^μγ^νγ^ρ P_L = 16 γ_μ P_L ⊗ γ^μ P_L,
// γ_μγ_νγ_ρ P_L ⊗ γ^μγ^νγ^ρ P_R = 4 γ_μ P_L ⊗ γ^μ P_R. With the overall factor 4 absorbed by the
// two Hamiltonian normalisations, C_P = R^T C_Q and γ_Q = R γ_P R⁻¹.
func stdFromCMM() [][]*big.Rat {
	z := q(0, 1)
	return [][]*big.Rat{
		{q(2, 1), q(1, 3), z, z, z, z, z, z},
		{z, q(1, 1), z, z, z, z, z, z},
		{z, z, q(-1, 3), z, q(1, 12), z, z, z},
		{z, z, q(-1, 9), q(-2, 3), q(1, 36), q(1, 6), z, z},
		{z, z, q(4, 3), z, q(-1, 12), z, z, z},
		{z, z, q(4, 9), q(8, 3), q(-1, 36), q(-1, 6), z, z},
		{z, z, z, z, z, z, q(1, 1), z},
		{z, z, z, z, z, z, z, q(1, 1)},
	}
}

// TestShippedTables: every shipped file parses, names a published source (a journal reference or
// an arXiv number) and gives the blocks the package reads.
func TestShippedTables(t *testing.T) {
	ts, err := Tables()
	if err != nil {
		t.Fatal(err)
	}
	want := map[string]struct {
		file      string
		ops, ords int
	}{
		"deltaf1_lo":        {"tables/deltaf1_lo.lm", 6, 1},
		"deltaf1_dipole_lo": {"tables/deltaf1_lo.lm", 8, 1},
		"deltaf1_cmm_lo":    {"tables/deltaf1_cmm_lo.lm", 8, 1},
		"current_current":   {"tables/current_current.lm", 2, 2},
		"deltaf2":           {"tables/deltaf2.lm", 1, 2},
	}
	if len(ts) != len(want) {
		t.Errorf("%d shipped blocks, want %d", len(ts), len(want))
	}
	source := regexp.MustCompile(`(Phys\.|Rev\. Mod\. Phys\.|Nucl\. Phys\.) [A-Z]?[0-9]+ \([0-9]{4}\) [0-9]+|hep-ph/[0-9]{7}`)
	for _, tb := range ts {
		w, ok := want[tb.Block.Name]
		if !ok {
			t.Errorf("unexpected block %s in %s", tb.Block.Name, tb.File)
			continue
		}
		if tb.File != w.file || len(tb.Block.Ops) != w.ops || tb.Block.Orders() != w.ords {
			t.Errorf("%s: file %s, %d operators, %d orders; want %+v", tb.Block.Name, tb.File, len(tb.Block.Ops), tb.Block.Orders(), w)
		}
		src, err := TableSource(tb.File)
		if err != nil {
			t.Fatal(err)
		}
		if !source.Match(src) {
			t.Errorf("%s names no published source", tb.File)
		}
		if tb.Block.Orders() == 2 && strings.Join(tb.Block.Scheme, " ") != "MSbar NDR" {
			t.Errorf("%s: scheme of γ^(1) is %v, want MSbar NDR", tb.Block.Name, tb.Block.Scheme)
		}
	}
	if _, err := LookupTable("nosuch"); err == nil {
		t.Error("unknown table: no error")
	}
	if _, err := TableSource("../tables.go"); err == nil {
		t.Error("TableSource outside tables/: no error")
	}
}

// TestCurrentCurrentTable compares the shipped current-current table, written as a matrix in
// (Q1, Q2), with the diagonal form it was copied from: in Q± = (Q2 ± Q1)/2,
// γ±^{(0)} = ±6(N∓1)/N, γ±^{(1)} = (N∓1)/(2N)(−21 ± 57/N ∓ 19N/3 ± 4nf/3) (G. Buchalla,
// A.J. Buras, M.E. Lautenbacher, Rev. Mod. Phys. 68 (1996) 1125, section VI; from memory), so
// γ11 = γ22 = (γ+ + γ−)/2 and γ12 = γ21 = (γ+ − γ−)/2; and γ+ with the shipped ΔF = 2 table
// (the same operator structure, A.J. Buras, M. Jamin, P.H. Weisz, Nucl. Phys. B347 (1990) 491).
func TestCurrentCurrentTable(t *testing.T) {
	for nc := 2; nc <= 5; nc++ {
		for nf := 0; nf <= 6; nf++ {
			N, f := float64(nc), float64(nf)
			gp := [2]float64{6 * (N - 1) / N, (N - 1) / (2 * N) * (-21 + 57/N - 19*N/3 + 4*f/3)}
			gm := [2]float64{-6 * (N + 1) / N, (N + 1) / (2 * N) * (-21 - 57/N + 19*N/3 - 4*f/3)}
			g0, g1, err := CurrentCurrent(nc, nf)
			if err != nil {
				t.Fatal(err)
			}
			d0, d1, err := DeltaF2(nc, nf)
			if err != nil {
				t.Fatal(err)
			}
			for k, g := range []interface{ At(int, int) float64 }{g0, g1} {
				diag, off := (gp[k]+gm[k])/2, (gp[k]-gm[k])/2
				for i := range 2 {
					for j := range 2 {
						want := off
						if i == j {
							want = diag
						}
						if math.Abs(g.At(i, j)-want) > 1e-12 {
							t.Errorf("Nc=%d nf=%d γ^(%d)[%d][%d] = %.15g, want %.15g", nc, nf, k, i, j, g.At(i, j), want)
						}
					}
				}
			}
			if math.Abs(d0.At(0, 0)-gp[0]) > 1e-12 || math.Abs(d1.At(0, 0)-gp[1]) > 1e-12 {
				t.Errorf("Nc=%d nf=%d: ΔF=2 table (%g, %g), γ+ = (%g, %g)", nc, nf, d0.At(0, 0), d1.At(0, 0), gp[0], gp[1])
			}
		}
	}
}

// The shipped tables refuse what they do not hold: the 8×8 table is for nf = 5 and three colours.
func TestTableRanges(t *testing.T) {
	if _, err := DeltaF1DipoleLO(4); err == nil || !strings.Contains(err.Error(), "holds for nf = 5 only") {
		t.Errorf("dipole table at nf = 4: %v", err)
	}
	if _, err := DeltaF1FourQuarkLO(1, 5); err == nil {
		t.Error("one colour: no error")
	}
	if _, _, err := DeltaF2(3, 7); err == nil {
		t.Error("seven flavours: no error")
	}
	// The general 6×6 table at Nc = 3, nf = 4 still works (it holds for any Nc, nf).
	g, err := DeltaF1FourQuarkLO(3, 4)
	if err != nil {
		t.Fatal(err)
	}
	if got, want := g.At(5, 5), -16.0+8.0/3; math.Abs(got-want) > 1e-14 { // −6(N²−1)/N + 2f/3
		t.Errorf("γ66 at nf = 4: %g, want %g", got, want)
	}
}
