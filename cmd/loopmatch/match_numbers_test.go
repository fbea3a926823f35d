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
