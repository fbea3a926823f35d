// Package emit turns Wilson coefficients into numerical programs and documents: Go source with
// numerically stable branches, a float64 evaluator of the same programs, LaTeX with named
// auxiliary functions, and JSON.
//
// A coefficient is split into factors that do not involve its main variable (couplings,
// logarithms of the scale) times auxiliary functions of the main variable (a mass ratio). Each
// auxiliary function is written as its closed form, evaluated with factored denominators, plus
// series branches where the closed form loses digits: around removable singularities inside the
// domain (x → 1 in the Inami–Lim functions), and at the ends x → 0 and x → ∞ when needed. The
// branches are found from a forward rounding-error bound of the closed form, evaluated in high
// precision on a grid, and the number of series terms from the exact Taylor coefficients'
// tail; docs/OUTPUT.md describes the method.
package emit
