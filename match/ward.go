package match

import (
	"errors"
	"fmt"
	"math/cmplx"
	"strings"

	"loopmatch/expr"
	"loopmatch/expr/notation"
	"loopmatch/passarino"
)

// wardChecks checks the Ward identity for every external photon and gluon of the block's
// amplitudes: with the polarisation vector replaced by the boson's momentum, the full amplitude
// must vanish between on-shell states. On the heavy-mass route the replaced amplitude is expanded
// one order further than the match (the momentum is small), so that every term the match keeps
// is tested, and it must vanish exactly; on the general route it is evaluated numerically at the
// file's values and must vanish relative to the size of its parts. Off-shell blocks are not
// checked (the identity holds between on-shell states).
func wardChecks(p *notation.Program, mb *notation.MatchBlock, opt Options) ([]Check, error) {
	if mb.OffShell {
		return nil, nil
	}
	var out []Check
	for _, leg := range p.Legs {
		if (leg.Type != "photon" && leg.Type != "gluon") || leg.Pol == "" {
			continue
		}
		ch := Check{Name: fmt.Sprintf("Ward identity: the amplitude with %s → %s (leg %s) vanishes on shell", leg.Pol, leg.Mom, leg.Name)}
		var parts []expr.Expr
		for _, n := range mb.Amps {
			a, _ := p.Amplitude(n)
			e, err := resolveOnShell(p, a.Body)
			if err != nil {
				return nil, err
			}
			r, err := passarino.SubstMomentum(e, leg.Pol, leg.Mom)
			if err != nil {
				return nil, err
			}
			parts = append(parts, r)
		}
		var err error
		if mb.Route == "general" {
			ch.Passed, ch.Detail, err = wardGeneral(p, mb, opt, parts)
		} else {
			ch.Passed, ch.Detail, err = wardHeavy(p, mb, opt, parts)
		}
		if err != nil {
			ch.Detail = "could not be evaluated: " + err.Error()
			ch.Passed = false
		}
		out = append(out, ch)
	}
	return out, nil
}

// wardHeavy reduces the replaced amplitude on the heavy-mass route one order beyond the match.
func wardHeavy(p *notation.Program, mb *notation.MatchBlock, opt Options, parts []expr.Expr) (bool, string, error) {
	small := smallOf(p, mb)
	small.Order++
	ser, _, err := Reduce(p, expr.Sum(parts...), small, opt)
	if err != nil {
		return false, "", err
	}
	var left []string
	for k := -2; k <= 0; k++ {
		if c := ser.Coef(k); !c.IsZero() {
			left = append(left, fmt.Sprintf("[eps^%d] %s", k, c))
		}
	}
	if len(left) > 0 {
		return false, "the Ward identity fails (a diagram missing or a wrong Feynman rule?): remainder " + strings.Join(left, "; "), nil
	}
	return true, fmt.Sprintf("the replaced amplitude cancels exactly to order %d in %s", small.Order, strings.Join(mb.Expand, ", ")), nil
}

// wardGeneral evaluates the replaced amplitude on the general route at the file's values:
// every structure's coefficient must vanish relative to the largest contribution of a single
// amplitude to it.
func wardGeneral(p *notation.Program, mb *notation.MatchBlock, opt Options, parts []expr.Expr) (bool, string, error) {
	canon, err := blockCanon(p, mb, opt)
	if err != nil {
		return false, "", err
	}
	dot, err := blockDot(p, mb)
	if err != nil {
		return false, "", err
	}
	rt := &generalRoute{p: p, canon: canon, dot: dot}
	pt, err := pointOf(p, mb)
	if err != nil {
		return false, "", err
	}
	type acc struct {
		sum  complex128
		size float64
	}
	groups := map[string]*acc{}
	var order []string
	for _, e := range parts {
		ser, _, err := rt.reduce(e)
		if err != nil {
			return false, "", err
		}
		for k := -1; k <= 0; k++ {
			for _, g := range ser.Coef(k).Collect(IsStructure) {
				v, err := EvalFinite(g.Coef, pt)
				if err != nil {
					return false, "", err
				}
				key := fmt.Sprintf("[eps^%d] %s", k, structureText(g))
				a, ok := groups[key]
				if !ok {
					a = &acc{}
					groups[key] = a
					order = append(order, key)
				}
				a.sum += v
				a.size = max(a.size, cmplx.Abs(v))
			}
		}
	}
	var left []string
	for _, k := range order {
		a := groups[k]
		if cmplx.Abs(a.sum) > 1e-8*a.size {
			left = append(left, fmt.Sprintf("%s × %s (parts up to %.3g)", k, fmtC(a.sum), a.size))
		}
	}
	if len(left) > 0 {
		return false, "the Ward identity fails at " + pt.text(p) + ": " + strings.Join(left, "; "), nil
	}
	return true, fmt.Sprintf("the replaced amplitude vanishes at %s to 1e-8 of its parts (%d structures)", pt.text(p), len(order)), nil
}

// WardError is the error of a match whose amplitude has structures the operators do not span
// while the Ward identity of an external photon or gluon fails: the likely cause is a missing
// diagram or a wrong Feynman rule. It wraps the projection error.
type WardError struct {
	Failed []Check
	Err    error
}

func (e *WardError) Error() string {
	var sb strings.Builder
	for _, c := range e.Failed {
		fmt.Fprintf(&sb, "%s: FAILED\n  %s\n", c.Name, c.Detail)
	}
	sb.WriteString(e.Err.Error())
	return sb.String()
}

func (e *WardError) Unwrap() error { return e.Err }

// withWard adds the failed Ward checks to a projection error.
func withWard(p *notation.Program, mb *notation.MatchBlock, opt Options, err error) error {
	var pe *ProjectionError
	if !errors.As(err, &pe) {
		return err
	}
	checks, werr := wardChecks(p, mb, opt)
	if werr != nil {
		return err
	}
	var failed []Check
	for _, c := range checks {
		if !c.Passed {
			failed = append(failed, c)
		}
	}
	if len(failed) == 0 {
		return err
	}
	return &WardError{Failed: failed, Err: err}
}

// structureText prints the structure atoms of a group.
func structureText(g expr.Group) string {
	var parts []string
	for _, a := range g.Atoms {
		s := a.A.Key()
		if a.Pow != 1 {
			s = fmt.Sprintf("%s^%d", s, a.Pow)
		}
		parts = append(parts, s)
	}
	if len(parts) == 0 {
		return "1"
	}
	return strings.Join(parts, "*")
}
