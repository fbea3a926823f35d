// Package loops evaluates the one-loop scalar integrals A0, B0, B0′ (= ∂B0/∂p²), C0 and D0
// numerically, in float64 (fast) and in arbitrary precision (reference), for real kinematics
// and real non-negative internal masses, with complex results from the +i0 prescription and
// the ultraviolet and infrared poles of dimensional regularisation given analytically.
//
// Conventions (docs/INTEGRALS.md and ../shared/PHYSICS.md): d = 4 − 2ε, metric (+,−,−,−),
// propagators 1/(q² − m² + i0). Every integral is
//
//	μ^{2ε} (e^{γ_E}/4π)^ε ∫ d^dq/(2π)^d 1/(N0 N1 …) = i/(16π²) · F,
//
// and the functions here return F as a Value: the coefficients of 1/ε², 1/ε and ε⁰, with the
// common factor i/(16π²) not included. Denominators and argument order follow A. Denner,
// Fortschr. Phys. 41 (1993) 307 (arXiv:0709.1075): N0 = q² − m0², Ni = (q + p_i)² − m_i²,
//
//	B0(p1²; m0, m1), C0(p1², (p2−p1)², p2²; m0, m1, m2),
//	D0(p1², (p2−p1)², (p3−p2)², p3², p2², (p3−p1)²; m0, m1, m2, m3).
//
// The Go functions take the invariants and the masses SQUARED (m2 = m², mu2 = μ²); Eval takes
// the notation's arguments (invariants, then masses not squared) and squares the masses.
package loops
