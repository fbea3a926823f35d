// Package dirac simplifies Dirac chains, traces and SU(N) colour factors of loopmatch
// expressions to one canonical form in d = 4 − 2ε dimensions with an anticommuting γ5 (NDR):
// Simplify brings every spinor chain of an expression to the canonical basis (contractions,
// sorted strings, chirality at the right end, Dirac equation through the legs' momenta,
// on-shell scalar products, reduced colour, canonical dummy names) and reduces fully contracted
// four-fermion products to the physical basis with a stated evanescent definition; Trace and
// ColourTrace evaluate traces; Fierz and Chisholm are four-dimensional rewritings done only on
// request. Conventions, the canonical form and the γ5 policy are described in docs/DIRAC.md.
package dirac
