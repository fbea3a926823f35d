package loops

import (
	"errors"
	"fmt"
)

var errIllConditioned = errors.New("ill-conditioned")

func isIllConditioned(err error) bool { return errors.Is(err, errIllConditioned) }

// c0BigFallback is replaced by the arbitrary-precision evaluation.
func c0BigFallback(t *tri) (complex128, error) {
	return 0, fmt.Errorf("%w: %w C0 (arbitrary-precision fallback not yet available)", ErrNotCovered, errIllConditioned)
}

func d0BigFallback(b *box) (complex128, error) {
	return 0, fmt.Errorf("%w: %w D0 (arbitrary-precision fallback not yet available)", ErrNotCovered, errIllConditioned)
}
