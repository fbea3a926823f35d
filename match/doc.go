// Package match runs the match blocks of a .lm file: it expands and reduces the full-theory
// amplitudes (package passarino), applies the on-shell kinematics and the Dirac algebra,
// expands in ε (loops/vacuum), derives the operators' tree-level matrix elements
// (expr/notation), projects the finite part onto the operators by exact linear algebra and
// reports the Wilson coefficients with the built-in checks (pole cancellation, scale
// dependence). RG running lives in match/running.
package match
