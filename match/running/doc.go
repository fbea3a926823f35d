// Package running evolves QCD quantities between scales: the strong coupling αs with 1- to
// 4-loop β functions and MS-bar decoupling at heavy-quark thresholds, running MS-bar quark
// masses with the 4-loop mass anomalous dimension, and Wilson coefficients with LO and NLO
// evolution matrices.
//
// Conventions (../shared/PHYSICS.md):
//
//   - a = αs/(4π); da/d ln μ² = −β0 a² − β1 a³ − β2 a⁴ − β3 a⁵.
//   - μ² dm/dμ² = −m (γm0 a + γm1 a² + γm2 a³ + γm3 a⁴).
//   - Wilson coefficients: μ dC/dμ = γ^T C with γ = a γ^{(0)} + a² γ^{(1)}; γ^{(k)} is stored
//     with row i, column j as the papers print it (row = operator that mixes, column = operator
//     it mixes into).
//
// Anomalous dimensions come from blocks of .lm files (BlockMatrices, FromBlock). The shipped
// tables (Tables, LookupTable) are such files, embedded in the program, each with its published
// source; they are the only copy of their numbers. docs/RUNNING.md describes both.
//
// All numbers are float64: this package is at the numeric edge of the program. Every function
// that a user can reach returns an error for an input it cannot honour (μ ≤ 0, a Landau pole,
// αs beyond the perturbative limit, degenerate eigenvalue differences), never NaN or a panic.
package running
