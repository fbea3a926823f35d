package match

import (
	"fmt"
	"slices"
	"strings"

	"loopmatch/expr"
	"loopmatch/loops/vacuum"
)

// IsStructure reports whether an atom is part of the kinematic and spinor structure that
// distinguishes operators (chains, vectors, metrics, Levi-Civita symbols, scalar products,
// colour objects), as opposed to the coefficient (parameters, logarithms, constants).
func IsStructure(a expr.Atom) bool {
	switch a.(type) {
	case expr.Chain, expr.Vec, expr.Metric, expr.Levi, expr.Dot, expr.Colour:
		return true
	}
	return false
}

// Unspanned is a structure of the amplitude that the operator basis does not reproduce.
type Unspanned struct {
	Structure string    // the structure (atoms) as text
	Residual  expr.Expr // its coefficient left over after the projection
}

// ProjectionError lists the structures left over by a projection.
type ProjectionError struct {
	Left []Unspanned
}

func (e *ProjectionError) Error() string {
	var sb strings.Builder
	sb.WriteString("the amplitude has structures that the declared operators do not span:")
	for _, u := range e.Left {
		fmt.Fprintf(&sb, "\n  %s  ×  (%s)", u.Structure, u.Residual)
	}
	return sb.String()
}

// invertible reports whether e can be used as a pivot (a nonzero rational function or a single
// invertible term).
func invertible(e expr.Expr) (expr.Expr, bool) {
	if e.IsZero() {
		return expr.Expr{}, false
	}
	inv, err := e.Pow(-1)
	if err != nil {
		return expr.Expr{}, false
	}
	return inv, true
}

// Project solves amp = Σ_i c_i·basis_i for the coefficients c_i, structure by structure
// (structures: the atoms that IsStructure accepts). The structure coefficients of the basis must
// be rational functions or single terms; those of amp may be any expressions (logarithms,
// constants). If amp has a part that no combination of the basis reproduces, the error is a
// *ProjectionError listing it; if the basis is linearly dependent on the amplitude's structures,
// the error says which operator is redundant.
func Project(amp expr.Expr, basis []expr.Expr) ([]expr.Expr, error) {
	type row struct {
		key    string
		atoms  string
		coeffs []expr.Expr
		rhs    expr.Expr
	}
	rows := map[string]*row{}
	get := func(g expr.Group) *row {
		r, ok := rows[g.Key]
		if !ok {
			parts := make([]string, len(g.Atoms))
			for i, a := range g.Atoms {
				parts[i] = a.A.Key()
				if a.Pow != 1 {
					parts[i] = fmt.Sprintf("%s^%d", parts[i], a.Pow)
				}
			}
			text := strings.Join(parts, "*")
			if text == "" {
				text = "1"
			}
			r = &row{key: g.Key, atoms: text, coeffs: make([]expr.Expr, len(basis))}
			rows[g.Key] = r
		}
		return r
	}
	for i, b := range basis {
		for _, g := range b.Collect(IsStructure) {
			r := get(g)
			r.coeffs[i] = r.coeffs[i].Add(g.Coef)
		}
	}
	for _, g := range amp.Collect(IsStructure) {
		r := get(g)
		r.rhs = r.rhs.Add(g.Coef)
	}
	keys := make([]string, 0, len(rows))
	for k := range rows {
		keys = append(keys, k)
	}
	slices.Sort(keys)
	// Gaussian elimination with the rows in key order and the first invertible pivot.
	n := len(basis)
	var mat [][]expr.Expr
	var rhs []expr.Expr
	var names []string
	for _, k := range keys {
		r := rows[k]
		mat = append(mat, r.coeffs)
		rhs = append(rhs, r.rhs)
		names = append(names, r.atoms)
	}
	pivotRow := make([]int, n)
	used := make([]bool, len(mat))
	for col := 0; col < n; col++ {
		pivotRow[col] = -1
		for r := range mat {
			if used[r] {
				continue
			}
			inv, ok := invertible(mat[r][col])
			if !ok {
				continue
			}
			// Normalise the pivot row.
			for c := col; c < n; c++ {
				v, err := mat[r][c].Mul(inv)
				if err != nil {
					return nil, err
				}
				mat[r][c] = v
			}
			v, err := rhs[r].Mul(inv)
			if err != nil {
				return nil, err
			}
			rhs[r] = v
			used[r] = true
			pivotRow[col] = r
			// Eliminate the column from every other row.
			for o := range mat {
				if o == r || mat[o][col].IsZero() {
					continue
				}
				f := mat[o][col]
				for c := col; c < n; c++ {
					p, err := f.Mul(mat[r][c])
					if err != nil {
						return nil, err
					}
					mat[o][c] = mat[o][c].Sub(p)
				}
				p, err := f.Mul(rhs[r])
				if err != nil {
					return nil, err
				}
				rhs[o] = rhs[o].Sub(p)
			}
			break
		}
		if pivotRow[col] < 0 {
			return nil, fmt.Errorf("operator %d of the basis is not independent of the others on the amplitude's structures (or its matrix elements vanish)", col+1)
		}
	}
	var left []Unspanned
	for r := range mat {
		if !used[r] && !rhs[r].IsZero() {
			left = append(left, Unspanned{Structure: names[r], Residual: rhs[r]})
		}
	}
	if len(left) > 0 {
		return nil, &ProjectionError{Left: left}
	}
	out := make([]expr.Expr, n)
	for col := range out {
		out[col] = rhs[pivotRow[col]]
	}
	return out, nil
}

// EpsBasis expands the operators' canonical matrix elements in ε (d = 4 − 2ε) to O(ε^(depth−1)):
// the projector basis of four-fermion tensor structures, for one, depends on d.
func EpsBasis(basis []expr.Expr, depth int, positive func(string) bool) ([]expr.Series, error) {
	out := make([]expr.Series, len(basis))
	for i, b := range basis {
		s, err := vacuum.ExpandEps(b, depth, positive)
		if err != nil {
			return nil, err
		}
		out[i] = s
	}
	return out, nil
}

// ProjectSeries projects the ε-expansion s of an amplitude onto operators whose matrix elements
// basis(ε) may depend on d: the coefficients C(ε) solve s(ε) = Σ_i C_i(ε)·basis_i(ε) order by
// order, from the lowest pole of s up to ε^0. The O(ε) parts of the basis times the poles thus
// reach the finite coefficients, as MS-bar counterterms (pure poles times the d-dimensional
// operators) require; for a basis free of d this is Project order by order. The result maps
// each order to its coefficients; errs holds the orders that the basis does not span (they
// contribute nothing to the orders above them).
func ProjectSeries(s expr.Series, basis []expr.Series) (map[int][]expr.Expr, map[int]error) {
	cs, errs := map[int][]expr.Expr{}, map[int]error{}
	b0 := make([]expr.Expr, len(basis))
	for i, b := range basis {
		b0[i] = b.Coef(0)
	}
	lo := min(s.Lo, 0)
	for k := lo; k <= 0; k++ {
		rhs := s.Coef(k)
		for j := lo; j < k; j++ {
			for i, c := range cs[j] {
				if bij := basis[i].Coef(k - j); !c.IsZero() && !bij.IsZero() {
					rhs = rhs.Sub(c.MustMul(bij))
				}
			}
		}
		c, err := Project(rhs, b0)
		if err != nil {
			errs[k] = err
			continue
		}
		cs[k] = c
	}
	return cs, errs
}
