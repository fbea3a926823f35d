package match

import (
	"fmt"
	"math"
	"math/cmplx"
	"slices"
	"strings"

	"loopmatch/expr"
	"loopmatch/expr/notation"
	"loopmatch/loops/vacuum"
	"loopmatch/passarino"
)

// runExtended executes a match block on the general route or off shell (see extended).
func runExtended(p *notation.Program, mb *notation.MatchBlock, opt Options) (*Result, error) {
	wrap := func(err error) error { return fmt.Errorf("%s: %v", mb.Pos, err) }
	canon, err := blockCanon(p, mb, opt)
	if err != nil {
		return nil, wrap(err)
	}
	res := &Result{Block: mb, Kinematics: canon.Rules()}
	res.Conventions = []string{
		fmt.Sprintf("L_eff = N * sum_i C_i Q_i with N = %s; amplitudes are iM", mb.Norm.Pretty()),
		"metric (+,-,-,-), d = 4 - 2*eps, MS-bar: loop k {…} = mu^(2 eps) (e^gamma_E/(4 pi))^eps ∫ d^dk/(2 pi)^d",
		"gamma5: NDR (anticommuting), chains in the projector basis",
	}
	var rt route
	if mb.Route == "general" {
		dot, err := blockDot(p, mb)
		if err != nil {
			return nil, wrap(err)
		}
		rt = &generalRoute{p: p, canon: canon, dot: dot}
		res.Conventions = append(res.Conventions, "general route: Passarino–Veltman reduction at the kinematics of the block; full minus effective-theory amplitudes with the same infrared regulator; scalar integrals Bub, Tri, Box stand for their MS-bar finite parts")
		if len(mb.Regulators) > 0 {
			res.Conventions = append(res.Conventions, "infrared regulators "+strings.Join(mb.Regulators, ", ")+": coefficients at leading power as the regulators go to zero")
		}
	} else {
		if !mb.HasExpand {
			return nil, wrap(fmt.Errorf("the heavy-mass route needs an expand line (expand p, q to order N)"))
		}
		small := smallOf(p, mb)
		if mb.OffShell {
			small.OnShell = nil
		}
		canon.small, canon.truncate = small, true
		rt = &heavyRoute{p: p, small: small, canon: canon}
		res.Conventions = append(res.Conventions, fmt.Sprintf("heavy-mass route: Taylor expansion in %s to order %d", strings.Join(mb.Expand, ", "), mb.Order))
	}
	if mb.OffShell {
		res.Conventions = append(res.Conventions, "off shell: no mass-shell conditions and no Dirac equation at the external legs (amputated Green functions)")
	}
	if mb.ScaleSet {
		res.Conventions = append(res.Conventions, fmt.Sprintf("scale: mu = %s", mb.Scale))
	}
	sum := func(names []string) (expr.Expr, error) {
		e := expr.Zero()
		for _, n := range names {
			a, _ := p.Amplitude(n)
			e = e.Add(a.Body)
		}
		return resolveOnShell(p, e)
	}
	full, err := sum(mb.Amps)
	if err != nil {
		return nil, wrap(err)
	}
	eft, err := sum(mb.EFT)
	if err != nil {
		return nil, wrap(err)
	}
	// Loop and tree parts reduced separately: the loop part carries μ^{2ε}.
	split := func(e expr.Expr) (loop, tree expr.Expr) {
		for _, t := range e.Terms() {
			if len(t.Loops) > 0 {
				loop = loop.Add(expr.FromTerm(t))
			} else {
				tree = tree.Add(expr.FromTerm(t))
			}
		}
		return
	}
	var notes []string
	reduce := func(e expr.Expr) (expr.Series, error) {
		s, n, err := rt.reduce(e)
		for _, x := range n {
			if !slices.Contains(notes, x) {
				notes = append(notes, x)
			}
		}
		return s, err
	}
	fullLoop, fullTree := split(full)
	eftLoop, eftTree := split(eft)
	var ser [4]expr.Series // full loop, full tree, EFT loop, EFT tree
	for i, e := range []expr.Expr{fullLoop, fullTree, eftLoop, eftTree} {
		if maxLoops(e) > 1 {
			return nil, wrap(fmt.Errorf("the general route and off-shell matching are one-loop only"))
		}
		if ser[i], err = reduce(e); err != nil {
			return nil, wrap(err)
		}
	}
	diff := ser[0].Add(ser[1]).Sub(ser[2]).Sub(ser[3])
	if !diff.Coef(-2).IsZero() {
		return nil, wrap(fmt.Errorf("full minus effective theory has a 1/eps^2 pole (%s): the infrared regulators differ", diff.Coef(-2)))
	}
	finite0, pole := diff.Coef(0), diff.Coef(-1)
	finite := finite0
	if mb.ScaleSet {
		if finite, err = setScale(finite0, mb.Scale); err != nil {
			return nil, err
		}
	}
	basis, err := operatorBasis(p, mb, canon)
	if err != nil {
		return nil, err
	}
	numeric := rt.numericAtoms()
	// On the general route with small external momenta (off shell, or kinematics in terms of
	// the regulators) structures with them that the basis lacks are power corrections; they
	// are dropped here and their size is checked numerically below. Elsewhere they are errors.
	smallMomenta := mb.Route == "general" && (mb.OffShell || kinematicsUseRegulators(mb))
	leading := func(e expr.Expr) (expr.Expr, expr.Expr) {
		if !smallMomenta {
			return e, expr.Zero()
		}
		return dropPowerSuppressed(e, basis, momentaOf(p))
	}
	_, droppedFinite := leading(finite)
	finite0, _ = leading(finite0)
	pole, droppedPole := leading(pole)
	// C(ε) solves (full − EFT)(ε) = Σ_i C_i(ε) i N ⟨Q_i⟩(ε) order by order (ProjectSeries): the
	// canonical form of the operators may depend on d.
	bser, err := EpsBasis(basis, 2, p.Positive)
	if err != nil {
		return nil, err
	}
	for i, b := range bser {
		basis[i] = b.Coef(0)
	}
	lead := expr.Series{Lo: -1, C: []expr.Expr{pole, finite0}, Order: 1}
	proj, perrs := ProjectSeries(lead, bser)
	if err := perrs[0]; err != nil {
		return nil, withWard(p, mb, opt, err)
	}
	cs0 := proj[0]
	cs := cs0
	if mb.ScaleSet {
		cs = make([]expr.Expr, len(cs0))
		for i, c := range cs0 {
			if cs[i], err = setScale(c, mb.Scale); err != nil {
				return nil, err
			}
		}
	}
	poleC, perr := proj[-1], perrs[-1]
	// Leading power in the regulators (closed forms only; numerically it is a check).
	if !numeric && len(mb.Regulators) > 0 {
		ch := Check{Name: "regulator logarithms cancel in full minus effective theory (" + strings.Join(mb.Regulators, ", ") + " → 0)", Passed: true}
		var details []string
		for i := range cs {
			for _, reg := range mb.Regulators {
				lead, logs, err := leadingPower(cs[i], reg)
				if err != nil {
					return nil, wrap(fmt.Errorf("C_%s: %v", mb.Ops[i], err))
				}
				if !logs.IsZero() {
					ch.Passed = false
					details = append(details, fmt.Sprintf("C_%s keeps %s", mb.Ops[i], logs))
				}
				cs[i] = lead
				if cs0[i], _, err = leadingPower(cs0[i], reg); err != nil {
					return nil, wrap(err)
				}
			}
		}
		if ch.Passed {
			details = append(details, "the logarithms of the regulators cancel; the coefficients are taken at leading power")
		}
		ch.Detail = strings.Join(details, "; ")
		res.Checks = append(res.Checks, ch)
	}
	// Checks of the poles.
	uvCheck, err := uvPoleCheck(p, mb, canon, full)
	if err != nil {
		return nil, err
	}
	res.Checks = append(res.Checks, uvCheck)
	if len(mb.EFT) > 0 || mb.Route == "general" {
		res.Checks = append(res.Checks, irPoleCheck(p, mb, canon, eft, pole, basis, leading))
	}
	// Scale dependence: ∂C/∂ln μ = 2 × (the residue of the loop poles of full minus EFT).
	loopPole := ser[0].Coef(-1).Sub(ser[2].Coef(-1)).Scale(expr.RFInt(2))
	loopPole, _ = leading(loopPole)
	predicted, prErr := Project(loopPole, basis)
	var pt point
	var ptErr error
	if numeric {
		pt, ptErr = pointOf(p, mb)
	}
	for i := range cs {
		coef := Coefficient{Operator: mb.Ops[i], Value: cs[i], InRatios: cs[i]}
		for _, r := range mb.Ratios {
			if coef.InRatios, err = applyRatio(coef.InRatios, r); err != nil {
				return nil, err
			}
		}
		if perr == nil {
			coef.Pole = poleC[i]
		}
		res.Coeffs = append(res.Coeffs, coef)
		ch := Check{Name: fmt.Sprintf("scale dependence of C_%s follows from the poles (RGE)", mb.Ops[i])}
		switch {
		case prErr != nil:
			ch.Detail = "poles not spanned by the basis: " + prErr.Error()
		case numeric:
			ch.Passed, ch.Detail = numericScaleCheck(cs0[i], predicted[i], pt, ptErr)
		default:
			got, err := logMuCoefficient(cs0[i])
			if err != nil {
				ch.Detail = err.Error()
				break
			}
			ch.Passed = got.Sub(predicted[i]).IsZero()
			ch.Detail = fmt.Sprintf("dC/dln(mu) = %s; predicted by the poles: %s", got, predicted[i])
		}
		res.Checks = append(res.Checks, ch)
	}
	if numeric {
		if ptErr != nil {
			notes = append(notes, "numerical values not available: "+ptErr.Error())
		} else {
			res.Checks = append(res.Checks, numericChecks(p, mb, res, pt)...)
		}
	}
	if !droppedFinite.IsZero() || !droppedPole.IsZero() {
		res.Checks = append(res.Checks, powerCheck(p, mb, droppedFinite.Add(droppedPole), finite.Add(pole)))
	}
	if mb.OffShell && len(mb.EOM) > 0 {
		if err := applyEOM(p, mb, opt, res); err != nil {
			return nil, wrap(err)
		}
	}
	for _, op := range mb.ExpectOrder {
		got := cs[slices.Index(mb.Ops, op)] // off shell for an eom operator
		for _, c := range res.Coeffs {
			if c.Operator == op {
				got = c.Value
			}
		}
		diff := got.Sub(mb.Expect[op])
		ch := Check{Name: "C_" + op + " equals the expected " + mb.Expect[op].String(), Passed: diff.IsZero(), Detail: describe("difference", diff)}
		if numeric && !ch.Passed && ptErr == nil {
			ch.Passed, ch.Detail = numericEqual(got, mb.Expect[op], pt)
		}
		res.Expectations = append(res.Expectations, ch)
	}
	extra, err := symmetryChecks(p, mb, opt, res)
	if err != nil {
		return nil, err
	}
	res.Checks = append(res.Checks, extra...)
	res.Notes = append(append(notes, canon.Notes...), res.Notes...)
	return res, nil
}

// operatorBasis returns i·N·⟨Q_i⟩ of the block's operators in the canonical form.
func operatorBasis(p *notation.Program, mb *notation.MatchBlock, canon *Canon) ([]expr.Expr, error) {
	iN := mb.Norm.MustMul(expr.FromAtom(expr.I, 1))
	basis := make([]expr.Expr, len(mb.Ops))
	for i, name := range mb.Ops {
		me, err := p.MatrixElement(operatorByName(p, name))
		if err != nil {
			return nil, err
		}
		if me, err = canon.Apply(me); err != nil {
			return nil, fmt.Errorf("operator %s: %v", name, err)
		}
		if basis[i], err = me.Mul(iN); err != nil {
			return nil, err
		}
	}
	return basis, nil
}

// momentaOf lists the declared external momenta.
func momentaOf(p *notation.Program) []string { return p.NamesOf(notation.KindMomentum) }

// uvPoleCheck checks that the ultraviolet poles of the full amplitude are cancelled by its
// counterterms (the tree terms), as on the heavy-mass route.
func uvPoleCheck(p *notation.Program, mb *notation.MatchBlock, canon *Canon, full expr.Expr) (Check, error) {
	ch := Check{Name: "no ultraviolet pole survives the counterterms"}
	var onShell []passarino.OnShellMomentum
	if !mb.OffShell {
		onShell = smallOf(p, mb).OnShell
	}
	uv, err := passarino.UVPole(full, massSymbols(p), onShell)
	if err != nil {
		return ch, err
	}
	if uv, err = canon.Apply(uv); err != nil {
		return ch, err
	}
	if uv, err = uv.Subst(expr.DimSymbol, expr.RFInt(4)); err != nil {
		return ch, err
	}
	var tree expr.Expr
	for _, t := range full.Terms() {
		if len(t.Loops) == 0 {
			tree = tree.Add(expr.FromTerm(t))
		}
	}
	treeSer, err := vacuum.ExpandEps(tree, 1, positiveOf(p))
	if err != nil {
		return ch, err
	}
	ct, err := canon.Apply(treeSer.Coef(-1))
	if err != nil {
		return ch, err
	}
	total := uv.Add(ct)
	ch.Passed = total.IsZero()
	ch.Detail = describe("remaining UV pole coefficient of 1/eps", total)
	return ch, nil
}

// irPoleCheck checks that what remains of the 1/ε poles of full minus effective theory is
// ultraviolet: the effective theory's counterterms in the declared basis, the infrared poles
// having cancelled between the two sides (same regulator).
func irPoleCheck(p *notation.Program, mb *notation.MatchBlock, canon *Canon, eft, pole expr.Expr, basis []expr.Expr, leading func(expr.Expr) (expr.Expr, expr.Expr)) Check {
	ch := Check{Name: "infrared poles cancel between full and effective theory; the rest are EFT counterterms"}
	var onShell []passarino.OnShellMomentum
	if !mb.OffShell {
		onShell = smallOf(p, mb).OnShell
	}
	uvE, err := passarino.UVPole(eft, massSymbols(p), onShell)
	if err == nil {
		uvE, err = canon.Apply(uvE)
	}
	if err == nil {
		uvE, err = uvE.Subst(expr.DimSymbol, expr.RFInt(4))
	}
	if err != nil {
		ch.Detail = "EFT ultraviolet poles: " + err.Error()
		return ch
	}
	uvE, _ = leading(uvE)
	// full: its UV poles are cancelled by its counterterms (checked separately), so the pole of
	// full − EFT must be −(EFT UV pole) if the infrared poles cancel.
	ir := pole.Add(uvE)
	ch.Passed = ir.IsZero()
	if !ch.Passed {
		ch.Detail = describe("infrared pole left in full minus EFT (coefficient of 1/eps)", ir)
		return ch
	}
	cs, err := Project(uvE.Neg(), basis)
	if err != nil {
		ch.Detail = "the effective theory's ultraviolet poles are not spanned by the basis: " + err.Error()
		ch.Passed = false
		return ch
	}
	var parts []string
	for i, c := range cs {
		parts = append(parts, fmt.Sprintf("dC_%s = %s", mb.Ops[i], c))
	}
	ch.Detail = "EFT counterterms (coefficients of 1/eps): " + strings.Join(parts, "; ")
	return ch
}

// numericScaleCheck compares C(2μ) − C(μ) with 2 ln 2 × (the predicted ∂C/∂ln μ at one loop).
func numericScaleCheck(c, predicted expr.Expr, pt point, ptErr error) (bool, string) {
	if ptErr != nil {
		return false, "needs numerical values: " + ptErr.Error()
	}
	mu := pt["mu"]
	c1, err1 := EvalFinite(c, pt)
	c2, err2 := EvalFinite(c, pt.with(map[string]float64{"mu": 2 * mu}))
	pr, err3 := EvalFinite(predicted, pt)
	for _, err := range []error{err1, err2, err3} {
		if err != nil {
			return false, err.Error()
		}
	}
	got := c2 - c1
	want := pr * complex(math.Log(2), 0)
	ok := cmplx.Abs(got-want) <= 1e-9*(cmplx.Abs(c1)+cmplx.Abs(want)+1e-300)
	return ok, fmt.Sprintf("C(2 mu) - C(mu) = %s; predicted ln 2 × %s = %s (mu = %.6g)", fmtC(got), fmtC(pr), fmtC(want), mu)
}

// numericEqual compares two expressions numerically at pt to 1e-8 relative.
func numericEqual(a, b expr.Expr, pt point) (bool, string) {
	x, err1 := EvalFinite(a, pt)
	y, err2 := EvalFinite(b, pt)
	if err1 != nil || err2 != nil {
		return false, fmt.Sprintf("numerical comparison failed: %v %v", err1, err2)
	}
	ok := cmplx.Abs(x-y) <= 1e-8*cmplx.Abs(y)
	return ok, fmt.Sprintf("numerically %s against %s", fmtC(x), fmtC(y))
}

func fmtC(z complex128) string {
	if math.Abs(imag(z)) <= 1e-30*math.Abs(real(z)) { // rounding residue of the arbitrary-precision sum
		z = complex(real(z), 0)
	}
	if imag(z) == 0 {
		return fmt.Sprintf("%.12g", real(z))
	}
	return fmt.Sprintf("(%.12g %+.12gi)", real(z), imag(z))
}
