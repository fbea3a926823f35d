package loops

import "fmt"

// c0BigFallback is replaced by the arbitrary-precision evaluation.
func c0BigFallback(t *tri) (complex128, error) {
	return 0, fmt.Errorf("%w: ill-conditioned C0 (arbitrary-precision fallback not yet available)", ErrNotCovered)
}
