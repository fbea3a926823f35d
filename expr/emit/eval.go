package emit

import (
	"fmt"
)

// Eval evaluates the coefficient in float64 with the same programs the emitted Go runs: args
// are in the order of c.Args; kinematic arguments must be real. Factors of couplings are
// evaluated by the expression evaluator of package expr.
func (c *Coeff) Eval(args []complex128) (complex128, error) {
	if len(args) != len(c.Args) {
		return 0, fmt.Errorf("%s takes %d arguments, got %d", c.Name, len(c.Args), len(args))
	}
	vals := make(map[string]complex128, len(args))
	for i, a := range c.Args {
		vals[a.Name] = args[i]
	}
	var sum complex128
	for _, t := range c.Terms {
		f, err := t.Factor.Eval(vals)
		if err != nil {
			return 0, err
		}
		if t.Part != nil {
			v, err := t.Part.Eval(vals)
			if err != nil {
				return 0, err
			}
			f *= complex(v, 0)
		}
		sum += f
	}
	common, err := c.Common.Eval(vals)
	if err != nil {
		return 0, err
	}
	return common * sum, nil
}

// Eval evaluates the auxiliary function at the given values of its variables.
func (part *Part) Eval(vals map[string]complex128) (float64, error) {
	var buf [8]float64
	args := buf[:0]
	for _, v := range part.Vars {
		z, ok := vals[v]
		if !ok {
			return 0, fmt.Errorf("no value for %s", v)
		}
		if imag(z) != 0 {
			return 0, fmt.Errorf("%s must be real, got %v", v, z)
		}
		args = append(args, real(z))
	}
	if part.fn != nil {
		return part.fn.eval(args), nil
	}
	return part.naive.eval(args), nil
}
