// Package pv reduces one-loop tensor integrals with N ≤ 4 distinct propagators to the scalar
// integrals A0, B0, C0 and D0 by the Passarino–Veltman recursions, exactly in the dimension d.
//
// Conventions follow A. Denner, Fortschr. Phys. 41 (1993) 307 (arXiv:0709.1075): the
// denominators are N0 = q² − m0² and Ni = (q + P_i)² − m_i² with P_0 = 0, and the tensor
// integral of rank P is decomposed as
//
//	T^{μ1…μP} = Σ {g…g P…P}^{μ1…μP}_{i…} T_{0…0 i…},
//
// the sum running over the totally symmetric structures built from metric tensors (a pair of
// indices 0 per metric) and the momenta P_1 … P_{N−1} (indices 1 … N−1): C^μ = Σ P_i^μ C_i,
// C^{μν} = g^{μν} C00 + Σ P_i^μ P_j^ν C_ij, and so on. Every coefficient is returned as an
// expr.Expr linear in the scalar-integral atoms of loops.Atom (Tad, Bub, Tri, Box with squared
// masses) with coefficients rational in d, the invariants and the squared masses; the common
// factor and normalisation are those of the scalar integrals (loops, MS-bar).
//
// The recursions, their derivation and the degenerate cases are described in docs/PASSARINO.md.
package pv
