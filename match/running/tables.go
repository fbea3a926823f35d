package running

import (
	"embed"
	"fmt"
	"io/fs"
	"math/big"
	"path"
	"slices"
	"sync"

	"gonum.org/v1/gonum/mat"

	"loopmatch/expr/notation"
)

// The shipped anomalous-dimension tables are .lm files with the published source in each file
// (docs/RUNNING.md). They are the single source of the numbers: the functions below read them.
//
//go:embed tables/*.lm
var tableFS embed.FS

// Table is a shipped anomalous-dimension block and the file it comes from.
type Table struct {
	File  string // the path inside the program, e.g. "tables/deltaf2.lm"
	Block *notation.ADMBlock
}

var loadTables = sync.OnceValues(func() ([]Table, error) {
	files, err := fs.Glob(tableFS, "tables/*.lm")
	if err != nil {
		return nil, err
	}
	var out []Table
	for _, f := range files {
		src, err := tableFS.ReadFile(f)
		if err != nil {
			return nil, err
		}
		p, err := notation.Parse(f, src)
		if err != nil {
			return nil, fmt.Errorf("running: shipped table: %w", err)
		}
		for _, b := range p.ADMs() {
			if i := slices.IndexFunc(out, func(t Table) bool { return t.Block.Name == b.Name }); i >= 0 {
				return nil, fmt.Errorf("running: shipped table %s: block %s is also in %s", f, b.Name, out[i].File)
			}
			out = append(out, Table{File: f, Block: b})
		}
	}
	return out, nil
})

// Tables returns the shipped anomalous-dimension blocks, sorted by file and then in file order.
func Tables() ([]Table, error) {
	t, err := loadTables()
	return slices.Clone(t), err
}

// LookupTable returns the shipped block with the given name.
func LookupTable(name string) (Table, error) {
	ts, err := loadTables()
	if err != nil {
		return Table{}, err
	}
	for _, t := range ts {
		if t.Block.Name == name {
			return t, nil
		}
	}
	var names []string
	for _, t := range ts {
		names = append(names, t.Block.Name)
	}
	return Table{}, fmt.Errorf("running: no shipped table %q (known: %v)", name, names)
}

// TableSource returns the text of a shipped table file (as named by Table.File).
func TableSource(file string) ([]byte, error) {
	if path.Dir(file) != "tables" {
		return nil, fmt.Errorf("running: %s is not a shipped table", file)
	}
	return tableFS.ReadFile(file)
}

// BlockMatrices evaluates an anomalous-dimension block of a .lm file at nc colours and nf
// active flavours: γ^{(0)}, and γ^{(1)} if the block gives it (else nil).
func BlockMatrices(b *notation.ADMBlock, nc, nf int) (g0, g1 *mat.Dense, err error) {
	if nc < 2 {
		return nil, nil, fmt.Errorf("running: %d colours: want at least 2", nc)
	}
	if nf < 0 || nf > 6 {
		return nil, nil, fmt.Errorf("running: %d flavours: want 0 to 6", nf)
	}
	var out [2]*mat.Dense
	for order := range b.Orders() {
		r, err := b.At(order, nc, nf)
		if err != nil {
			return nil, nil, err
		}
		out[order] = ratMatrix(r)
	}
	return out[0], out[1], nil
}

// FromBlock makes an ADM of a block at nc colours, for Evolve.
func FromBlock(b *notation.ADMBlock, nc int) ADM {
	return func(nf int) (*mat.Dense, *mat.Dense, error) { return BlockMatrices(b, nc, nf) }
}

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

// tableMatrices evaluates a shipped table.
func tableMatrices(name string, nc, nf int) (g0, g1 *mat.Dense, err error) {
	t, err := LookupTable(name)
	if err != nil {
		return nil, nil, err
	}
	return BlockMatrices(t.Block, nc, nf)
}

// DeltaF1Names are the ΔF = 1 operators of the standard basis (G. Buchalla, A.J. Buras,
// M.E. Lautenbacher, Rev. Mod. Phys. 68 (1996) 1125), for b → s:
//
//	Q1 = (s̄_α c_β)(c̄_β b_α)_{V−A}          Q2 = (s̄ c)(c̄ b)_{V−A}
//	Q3 = (s̄ b)_{V−A} Σ_q (q̄ q)_{V−A}        Q4 = (s̄_α b_β)_{V−A} Σ_q (q̄_β q_α)_{V−A}
//	Q5 = (s̄ b)_{V−A} Σ_q (q̄ q)_{V+A}        Q6 = (s̄_α b_β)_{V−A} Σ_q (q̄_β q_α)_{V+A}
//	Q7 = e/(8π²) m_b s̄ σ^{μν}(1+γ5) b F_{μν}  Q8 = g/(8π²) m_b s̄ σ^{μν}(1+γ5) T^a b G^a_{μν}
//
// with H = −(G_F/√2) V_ts* V_tb Σ C_i Q_i.
var DeltaF1Names = []string{"Q1", "Q2", "Q3", "Q4", "Q5", "Q6", "Q7", "Q8"}

// DeltaF1FourQuarkLO is the LO anomalous-dimension matrix γ^{(0)} of Q1…Q6 for nc colours and
// nf active flavours (rows mix into columns): the shipped table deltaf1_lo (tables/deltaf1_lo.lm,
// from G. Buchalla, A.J. Buras, M.E. Lautenbacher, Rev. Mod. Phys. 68 (1996) 1125, section VI).
func DeltaF1FourQuarkLO(nc, nf int) (*mat.Dense, error) {
	g0, _, err := tableMatrices("deltaf1_lo", nc, nf)
	return g0, err
}

// DeltaF1DipoleLO is the 8×8 LO anomalous-dimension matrix of Q1…Q8 (DeltaF1Names) with the
// effective dipole mixing, for nf = 5 active flavours and three colours, the case the
// b → sγ literature prints: the shipped table deltaf1_dipole_lo (tables/deltaf1_lo.lm). Other
// nf are refused: the dipole rows depend on the numbers of up- and down-type flavours, which
// the table does not carry.
func DeltaF1DipoleLO(nf int) (*mat.Dense, error) {
	g0, _, err := tableMatrices("deltaf1_dipole_lo", 3, nf)
	return g0, err
}

// DeltaF1DipoleADM is DeltaF1DipoleLO as an ADM (LO only: γ^{(1)} is nil).
func DeltaF1DipoleADM(nf int) (*mat.Dense, *mat.Dense, error) {
	g0, err := DeltaF1DipoleLO(nf)
	return g0, nil, err
}

// DeltaF2 gives γ^{(0)} and γ^{(1)} (NDR-MS-bar) of the ΔF = 2 operator (s̄d)_{V−A}(s̄d)_{V−A}
// (and its b-quark analogues) for nc colours and nf flavours: the shipped table deltaf2
// (tables/deltaf2.lm; A.J. Buras, M. Jamin, P.H. Weisz, Nucl. Phys. B347 (1990) 491).
func DeltaF2(nc, nf int) (*mat.Dense, *mat.Dense, error) { return tableMatrices("deltaf2", nc, nf) }

// DeltaF2ADM is DeltaF2 at three colours, as an ADM.
func DeltaF2ADM(nf int) (*mat.Dense, *mat.Dense, error) { return DeltaF2(3, nf) }

// CurrentCurrent gives γ^{(0)} and γ^{(1)} (NDR-MS-bar) of the current-current operators
// (Q1, Q2) of DeltaF1Names for nc colours and nf flavours: the shipped table current_current
// (tables/current_current.lm; G. Buchalla, A.J. Buras, M.E. Lautenbacher, Rev. Mod. Phys. 68
// (1996) 1125, section VI).
func CurrentCurrent(nc, nf int) (*mat.Dense, *mat.Dense, error) {
	return tableMatrices("current_current", nc, nf)
}
