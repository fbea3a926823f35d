// Package specfun holds the numeric special functions of loopmatch in one place: the
// dilogarithm Li2 and the Clausen function Cl2 in float64/complex128, and arbitrary-precision
// versions built on math/big with github.com/ALTree/bigfloat (Pi, EulerGamma, Zeta, complex
// Log, Sqrt and Exp, Atan2, Li2Big, Cl2Big).
//
// Branch conventions. Li2(z) = −∫₀^z ln(1−t)/t dt with the principal logarithm; its cut runs
// along the real axis from 1 to +∞. A real argument x > 1 given with a zero imaginary part
// (of either sign) is taken as x − i0, which is the value continuous from below and the one
// the principal ln(1−x) = ln(x−1) + iπ gives: Li2(x) = π²/3 − ½ln²x − Li2(1/x) − iπ ln x.
// Li2Side and Li2BigSide select x + i0 or x − i0 explicitly. The complex logarithm and square
// root are principal, with the cut on the negative real axis, and a negative real argument
// with a zero imaginary part gets the value from above (Im ln = +π), as math/cmplx does.
//
// Sources: L. Lewin, Polylogarithms and Associated Functions (North-Holland, 1981), ch. 1
// and 4 (reflection, inversion and duplication identities, the Bernoulli series of Li2 in
// −ln(1−z), the series of Cl2); R.P. Brent, E.M. McMillan, Math. Comp. 34 (1980) 305 (Euler's
// constant); P. Borwein, "An efficient algorithm for the Riemann zeta function", CMS Conf.
// Proc. 27 (2000) 29 (ζ(n)); R.P. Brent, D. Harvey, "Fast computation of Bernoulli, tangent
// and secant numbers" (2011), arXiv:1108.0286 (tangent numbers, hence Bernoulli numbers).
package specfun
