package running

import (
	"fmt"
	"math/big"

	"gonum.org/v1/gonum/mat"
)

// ratMatrix turns rows of exact rationals into a float matrix.
func ratMatrix(rows [][]*big.Rat) *mat.Dense {
	m := mat.NewDense(len(rows), len(rows[0]), nil)
	for i, r := range rows {
		for j, x := range r {
			f, _ := x.Float64()
			m.Set(i, j, f)
		}
	}
	return m
}

func q(a, b int64) *big.Rat { return big.NewRat(a, b) }

// ΔF = 1 operators of the standard basis (G. Buchalla, A.J. Buras, M.E. Lautenbacher,
// Rev. Mod. Phys. 68 (1996) 1125), for b → s:
//
//	Q1 = (s̄_α c_β)(c̄_β b_α)_{V−A}          Q2 = (s̄ c)(c̄ b)_{V−A}
//	Q3 = (s̄ b)_{V−A} Σ_q (q̄ q)_{V−A}        Q4 = (s̄_α b_β)_{V−A} Σ_q (q̄_β q_α)_{V−A}
//	Q5 = (s̄ b)_{V−A} Σ_q (q̄ q)_{V+A}        Q6 = (s̄_α b_β)_{V−A} Σ_q (q̄_β q_α)_{V+A}
//	Q7 = e/(8π²) m_b s̄ σ^{μν}(1+γ5) b F_{μν}  Q8 = g/(8π²) m_b s̄ σ^{μν}(1+γ5) T^a b G^a_{μν}
//
// with H = −(G_F/√2) V_ts* V_tb Σ C_i Q_i.
var DeltaF1Names = []string{"Q1", "Q2", "Q3", "Q4", "Q5", "Q6", "Q7", "Q8"}

// DeltaF1FourQuarkLO is the LO anomalous-dimension matrix γ^{(0)} of Q1…Q6 for nc colours and
// nf active flavours (rows mix into columns). Source: G. Buchalla, A.J. Buras,
// M.E. Lautenbacher, Rev. Mod. Phys. 68 (1996) 1125, section VI (from memory, as in
// PHYSICS.md; independently confirmed by TestBasisChange, which maps the Chetyrkin–Misiak–Münz
// matrix onto it at nc = 3, nf = 5, and by the magic numbers).
func DeltaF1FourQuarkLO(nc, nf int) (*mat.Dense, error) {
	if nc < 2 {
		return nil, fmt.Errorf("running: %d colours: want at least 2", nc)
	}
	if nf < 0 || nf > 6 {
		return nil, fmt.Errorf("running: %d flavours: want 0 to 6", nf)
	}
	rows := deltaF1FourQuarkRat(nc, nf)
	return ratMatrix(rows), nil
}

func deltaF1FourQuarkRat(nc, nf int) [][]*big.Rat {
	N, f := int64(nc), int64(nf)
	z := q(0, 1)
	add := func(a, b *big.Rat) *big.Rat { return new(big.Rat).Add(a, b) }
	return [][]*big.Rat{
		{q(-6, N), q(6, 1), z, z, z, z},
		{q(6, 1), q(-6, N), q(-2, 3*N), q(2, 3), q(-2, 3*N), q(2, 3)},
		{z, z, q(-22, 3*N), q(22, 3), q(-4, 3*N), q(4, 3)},
		{z, z, add(q(6, 1), q(-2*f, 3*N)), add(q(-6, N), q(2*f, 3)), q(-2*f, 3*N), q(2*f, 3)},
		{z, z, z, z, q(6, N), q(-6, 1)},
		{z, z, q(-2*f, 3*N), q(2*f, 3), q(-2*f, 3*N), add(q(-6*(N*N-1), N), q(2*f, 3))},
	}
}

// deltaF1DipoleRat is the 8×8 LO matrix of the standard basis with the effective dipole mixing
// γ^{(0)eff}_{i7}, γ^{(0)eff}_{i8} (the scheme-independent combination entering
// C7^eff = C7 − C5/3 − C6, C8^eff = C8 + C5 in NDR; from memory), for nc = 3 and nf = 5 (u = 2 up-type and
// d = 3 down-type flavours). Derived exactly (TestBasisChange) from the Chetyrkin–Misiak–Münz
// table cmmDipoleRat by the 4-dimensional change of basis; the 6×6 block is
// DeltaF1FourQuarkLO(3, 5). Of the dipole entries, γ17 = 0, γ27 = 416/81, γ37 = −464/81,
// γ18 = 3, γ28 = 70/27, γ38 = 140/27 + 3f, γ48 = 6 + 70f/27 and γ68 = −4 − 119f/27 agree with
// the values remembered from A.J. Buras, M. Misiak, M. Münz, S. Pokorski, Nucl. Phys. B424
// (1994) 374; γ47, γ57, γ58, γ67 rest on the derivation alone. The magic numbers of that
// paper are reproduced (TestMagicNumbers).
func deltaF1DipoleRat() [][]*big.Rat {
	rows := deltaF1FourQuarkRat(3, 5)
	g7 := []*big.Rat{q(0, 1), q(416, 81), q(-464, 81), q(136, 81), q(32, 9), q(-296, 81)}
	g8 := []*big.Rat{q(3, 1), q(70, 27), q(545, 27), q(512, 27), q(-59, 3), q(-703, 27)}
	out := make([][]*big.Rat, 8)
	for i := 0; i < 6; i++ {
		out[i] = append(append([]*big.Rat{}, rows[i]...), g7[i], g8[i])
	}
	out[6] = []*big.Rat{q(0, 1), q(0, 1), q(0, 1), q(0, 1), q(0, 1), q(0, 1), q(32, 3), q(0, 1)}
	out[7] = []*big.Rat{q(0, 1), q(0, 1), q(0, 1), q(0, 1), q(0, 1), q(0, 1), q(-32, 9), q(28, 3)}
	return out
}

// DeltaF1DipoleLO is the 8×8 LO anomalous-dimension matrix of Q1…Q8 (DeltaF1Names) with the
// effective dipole mixing, for nf = 5 active flavours and three colours, the case the
// b → sγ literature prints. Other nf are refused: the dipole rows depend on the numbers of
// up- and down-type flavours, which this table does not carry.
func DeltaF1DipoleLO(nf int) (*mat.Dense, error) {
	if nf != 5 {
		return nil, fmt.Errorf("running: the ΔF=1 dipole table is given for 5 flavours only, not %d", nf)
	}
	return ratMatrix(deltaF1DipoleRat()), nil
}

// DeltaF1DipoleADM is DeltaF1DipoleLO as an ADM (LO only: γ^{(1)} is nil).
func DeltaF1DipoleADM(nf int) (*mat.Dense, *mat.Dense, error) {
	g0, err := DeltaF1DipoleLO(nf)
	return g0, nil, err
}

// cmmDipoleRat is the LO effective anomalous-dimension matrix in the basis of
// K.G. Chetyrkin, M. Misiak, M. Münz, Phys. Lett. B400 (1997) 206 (hep-ph/9612313),
// operators P1…P6 = (s̄_L γ_μ T^a c_L)(c̄_L γ^μ T^a b_L), (s̄_L γ_μ c_L)(c̄_L γ^μ b_L),
// (s̄_L γ_μ b_L)Σ(q̄γ^μ q), (s̄_L γ_μ T^a b_L)Σ(q̄γ^μ T^a q), (s̄_L γ_μ1μ2μ3 b_L)Σ(q̄γ^μ1μ2μ3 q),
// (s̄_L γ_μ1μ2μ3 T^a b_L)Σ(q̄γ^μ1μ2μ3 T^a q), P7 = e/(16π²) m_b s̄_L σ^{μν} b_R F_{μν},
// P8 = g/(16π²) m_b s̄_L σ^{μν} T^a b_R G^a_{μν}, with H = −(4G_F/√2) V_ts* V_tb Σ C_i P_i;
// nf = 5, three colours. From memory; it reproduces the magic numbers of Buras, Misiak, Münz,
// Pokorski to all printed digits (TestMagicNumbers).
func cmmDipoleRat() [][]*big.Rat {
	z := q(0, 1)
	return [][]*big.Rat{
		{q(-4, 1), q(8, 3), z, q(-2, 9), z, z, q(-208, 243), q(173, 162)},
		{q(12, 1), z, z, q(4, 3), z, z, q(416, 81), q(70, 27)},
		{z, z, z, q(-52, 3), z, q(2, 1), q(-176, 81), q(14, 27)},
		{z, z, q(-40, 9), q(-100, 9), q(4, 9), q(5, 6), q(-152, 243), q(-587, 162)},
		{z, z, z, q(-256, 3), z, q(20, 1), q(-6272, 81), q(6596, 27)},
		{z, z, q(-256, 9), q(56, 9), q(40, 9), q(-2, 3), q(4624, 243), q(4772, 81)},
		{z, z, z, z, z, z, q(32, 3), z},
		{z, z, z, z, z, z, q(-32, 9), q(28, 3)},
	}
}

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

// DeltaF2 gives γ^{(0)} and γ^{(1)} (NDR-MS-bar) of the ΔF = 2 operator (s̄d)_{V−A}(s̄d)_{V−A}
// (and its b-quark analogues) for nc colours and nf flavours: γ^{(0)} = 6 − 6/N,
// γ^{(1)} = (N−1)/(2N) (−21 + 57/N − 19N/3 + 4nf/3). A.J. Buras, M. Jamin, P.H. Weisz,
// Nucl. Phys. B347 (1990) 491; A.J. Buras, hep-ph/9806471, section on ΔF = 2 (γ^{(1)} = −7 + 4nf/9
// at N = 3). From memory; TestDeltaF2 checks the published J_nf of the RG-invariant bag
// parameter.
func DeltaF2(nc, nf int) (*mat.Dense, *mat.Dense, error) {
	if nc < 2 {
		return nil, nil, fmt.Errorf("running: %d colours: want at least 2", nc)
	}
	if nf < 0 || nf > 6 {
		return nil, nil, fmt.Errorf("running: %d flavours: want 0 to 6", nf)
	}
	N, f := float64(nc), float64(nf)
	g0 := mat.NewDense(1, 1, []float64{6 - 6/N})
	g1 := mat.NewDense(1, 1, []float64{(N - 1) / (2 * N) * (-21 + 57/N - 19*N/3 + 4*f/3)})
	return g0, g1, nil
}

// DeltaF2ADM is DeltaF2 at three colours, as an ADM.
func DeltaF2ADM(nf int) (*mat.Dense, *mat.Dense, error) { return DeltaF2(3, nf) }

// CurrentCurrent gives γ^{(0)} and γ^{(1)} (NDR-MS-bar) of the current-current operators
// (Q1, Q2) of DeltaF1Names for nc colours and nf flavours, from the diagonal operators
// Q± = (Q2 ± Q1)/2: γ±^{(0)} = ±6(N∓1)/N, γ±^{(1)} = (N∓1)/(2N) (−21 ± 57/N ∓ 19N/3 ± 4nf/3).
// G. Buchalla, A.J. Buras, M.E. Lautenbacher, Rev. Mod. Phys. 68 (1996) 1125, section VI
// (from memory; γ+ is the ΔF = 2 result, see DeltaF2).
func CurrentCurrent(nc, nf int) (*mat.Dense, *mat.Dense, error) {
	if nc < 2 {
		return nil, nil, fmt.Errorf("running: %d colours: want at least 2", nc)
	}
	if nf < 0 || nf > 6 {
		return nil, nil, fmt.Errorf("running: %d flavours: want 0 to 6", nf)
	}
	N, f := float64(nc), float64(nf)
	gp0, gm0 := 6*(N-1)/N, -6*(N+1)/N
	gp1 := (N - 1) / (2 * N) * (-21 + 57/N - 19*N/3 + 4*f/3)
	gm1 := (N + 1) / (2 * N) * (-21 - 57/N + 19*N/3 - 4*f/3)
	// C± = C2 ± C1 and γ diagonal in (Q+, Q−) give, in (Q1, Q2),
	// γ11 = γ22 = (γ+ + γ−)/2, γ12 = γ21 = (γ+ − γ−)/2.
	sym := func(p, m float64) *mat.Dense {
		return mat.NewDense(2, 2, []float64{(p + m) / 2, (p - m) / 2, (p - m) / 2, (p + m) / 2})
	}
	return sym(gp0, gm0), sym(gp1, gm1), nil
}
