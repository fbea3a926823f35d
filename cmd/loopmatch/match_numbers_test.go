package main

import (
	"math"
	"math/big"
	"regexp"
	"strconv"
	"testing"

	"loopmatch/expr"
	"loopmatch/expr/notation"
	"loopmatch/match"
)

// TestMatchNumbersNearEqualMasses checks the numbers `match --set` prints where the closed form
// cancels strongly (mF close to mS, and mF = mS exactly) against the Taylor series of the same
// coefficient around x = mF²/mS² = 1 (expr.TaylorAt, 30 terms), an independent way to the value.
// Plain complex128 evaluation of the closed form was 17 % off at x ≈ 1.01.
func TestMatchNumbersNearEqualMasses(t *testing.T) {
	p, err := notation.ParseFile("../../testdata/dipole_vlf.lm")
	if err != nil {
		t.Fatal(err)
	}
	r, err := match.Run(p, p.Matches[0], match.Options{})
	if err != nil {
		t.Fatal(err)
	}
	ser, err := expr.TaylorAt(r.Coeffs[0].InRatios, "x", big.NewRat(1, 1), 30)
	if err != nil {
		t.Fatal(err)
	}
	couplings := map[string]complex128{"eQF": 0.1, "eQS": -0.2, "y": 1} // the file's values
	num := regexp.MustCompile(`C_QR = (\S+)`)
	for _, mF := range []string{"1507.4812", "1500.0003", "1500"} {
		out, errOut, code := runCLI("match", "../../testdata/dipole_vlf.lm", "--set", "mF="+mF+",mS=1500")
		if code != 0 {
			t.Fatalf("mF = %s: exit %d: %s", mF, code, errOut)
		}
		m := num.FindStringSubmatch(out)
		if m == nil {
			t.Fatalf("mF = %s: no C_QR number in\n%s", mF, out)
		}
		got, _ := strconv.ParseFloat(m[1], 64)
		f, _ := strconv.ParseFloat(mF, 64)
		h := f*f/(1500*1500) - 1
		want := 0.0
		for k := len(ser.Coef) - 1; k >= 0; k-- {
			c, err := ser.Coef[k].Eval(couplings)
			if err != nil {
				t.Fatal(err)
			}
			want = want*h + real(c)
		}
		if ser.Low != 0 {
			t.Fatalf("the series starts at (x - 1)^%d", ser.Low)
		}
		if math.Abs(got-want) > 1e-11*math.Abs(want) {
			t.Errorf("mF = %s: C_QR = %.12g, series %.15g", mF, got, want)
		}
	}
}

// TestMatchGeneralRouteNumbers checks that `match --set` evaluates the general route's
// coefficients (scalar integrals as MS-bar finite parts) at the values given on the command line:
// with off-shell momenta of size P ≪ mS they agree with the heavy-mass route of the same file up
// to power corrections of order (P²/mS²) ln(mS²/P²) (Beneke–Smirnov: the hard region is the
// expansion; from memory), and differ from it at all.
func TestMatchGeneralRouteNumbers(t *testing.T) {
	num := regexp.MustCompile(`(?m)^  C_QT = (\S+)$`)
	for _, P := range []string{"0.01", "0.1"} {
		out, errOut, code := runCLI("match", "../../testdata/general_offshell.lm", "--set", "P="+P)
		if code != 0 {
			t.Fatalf("P = %s: exit %d: %s", P, code, errOut)
		}
		m := num.FindAllStringSubmatch(out, -1)
		if len(m) != 2 {
			t.Fatalf("P = %s: expected C_QT for both blocks in\n%s", P, out)
		}
		general, _ := strconv.ParseFloat(m[0][1], 64)
		heavy, _ := strconv.ParseFloat(m[1][1], 64)
		p, _ := strconv.ParseFloat(P, 64)
		if tol := 50 * p * p / 1e6; math.Abs(general-heavy) > tol*math.Abs(heavy) || general == heavy {
			t.Errorf("P = %s: general %.12g, heavy %.12g", P, general, heavy)
		}
	}
}
