package loops

import (
	"bufio"
	"math"
	"math/big"
	"os"
	"strconv"
	"strings"
	"testing"
)

// readTable reads a tab-separated reference table from ../testdata/reference, skipping the
// comment lines, and returns its rows as numbers.
func readTable(t *testing.T, name string) [][]float64 {
	t.Helper()
	rows, _ := readTableText(t, name)
	return rows
}

// readTableText returns the rows both as float64 and as the decimal strings of the file.
func readTableText(t *testing.T, name string) ([][]float64, [][]string) {
	t.Helper()
	f, err := os.Open("../testdata/reference/" + name)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	var rows [][]float64
	var texts [][]string
	sc := bufio.NewScanner(f)
	for sc.Scan() {
		line := strings.TrimSpace(sc.Text())
		if line == "" || strings.HasPrefix(line, "#") {
			continue
		}
		var row []float64
		var text []string
		for _, field := range strings.Split(line, "\t") {
			field = strings.TrimSpace(field)
			v, err := strconv.ParseFloat(field, 64)
			if err != nil {
				t.Fatalf("%s: %q: %v", name, line, err)
			}
			row = append(row, v)
			text = append(text, field)
		}
		rows = append(rows, row)
		texts = append(texts, text)
	}
	if err := sc.Err(); err != nil {
		t.Fatal(err)
	}
	if len(rows) == 0 {
		t.Fatalf("%s: no rows", name)
	}
	return rows, texts
}

// roundingError returns |decimal − float64(decimal)| for a decimal string (exact, via big.Rat).
func roundingError(s string) float64 {
	r, ok := new(big.Rat).SetString(s)
	if !ok {
		return 0
	}
	f, _ := r.Float64()
	d := new(big.Rat).Sub(r, new(big.Rat).SetFloat64(f))
	e, _ := d.Float64()
	return math.Abs(e)
}

// inputRoundingTol estimates how far the exact function value at the table's decimal inputs can
// lie from its value at the float64-rounded inputs: Σ_j |∂f/∂x_j| |x_j − float64(x_j)|, with the
// derivatives from central differences of f itself (first order; the rounding errors are ~1e-16).
// The float64 tests allow this on top of the stated tolerance; the big-precision tests use the
// exact decimals and need no such allowance.
func inputRoundingTol(f func(x []float64) complex128, x []float64, text []string) (re, im float64) {
	for j := range x {
		dj := roundingError(text[j])
		if dj == 0 {
			continue
		}
		h := 1e-7 * math.Max(math.Abs(x[j]), 1e-3)
		xp := append([]float64(nil), x...)
		xm := append([]float64(nil), x...)
		xp[j] += h
		xm[j] -= h
		d := (f(xp) - f(xm)) / complex(2*h, 0)
		re += math.Abs(real(d)) * dj * 2
		im += math.Abs(imag(d)) * dj * 2
	}
	return re, im
}

// closeTo applies the tolerance of testdata/reference/README.md: relative tol, or absolute tol
// where the reference value is below 1e-6 in magnitude.
// extra is added to the allowed difference (see inputRoundingTol).
func closeTo(got, want, tol, extra float64) bool {
	if math.Abs(want) < 1e-6 {
		return math.Abs(got-want) <= tol+extra
	}
	return math.Abs(got-want) <= tol*math.Abs(want)+extra
}

func TestB0ReferenceTable(t *testing.T) {
	// testdata/reference/one-loop-B0.tsv (mpmath, closed form and quadrature): p2 m0 m1 mu2 Re Im,
	// finite part; tolerance 1e-12 (README.md there).
	rows, texts := readTableText(t, "one-loop-B0.tsv")
	for i, r := range rows {
		f := func(x []float64) complex128 {
			v, _ := B0(x[0], x[1]*x[1], x[2]*x[2], x[3])
			return v.Finite
		}
		dre, dim := inputRoundingTol(f, r[:4], texts[i][:4])
		v, err := B0(r[0], r[1]*r[1], r[2]*r[2], r[3])
		if err != nil {
			t.Errorf("B0%v: %v", r[:4], err)
			continue
		}
		if real(v.Pole1) != 1 || v.Pole2 != 0 {
			t.Errorf("B0%v poles = %v, %v; want 0, 1", r[:4], v.Pole2, v.Pole1)
		}
		if !closeTo(real(v.Finite), r[4], 1e-12, dre) || !closeTo(imag(v.Finite), r[5], 1e-12, dim) {
			t.Errorf("B0%v = %.17g, want %.17g + %.17gi", r[:4], v.Finite, r[4], r[5])
		}
	}
}

func TestC0ReferenceTable(t *testing.T) {
	// testdata/reference/one-loop-C0.tsv (mpmath Feynman-parameter quadrature): s1 s2 s3 m0 m1 m2
	// Re Im; tolerance 1e-12 (README.md there).
	rows, texts := readTableText(t, "one-loop-C0.tsv")
	for i, r := range rows {
		f := func(x []float64) complex128 {
			v, _ := C0(x[0], x[1], x[2], x[3]*x[3], x[4]*x[4], x[5]*x[5], 1)
			return v.Finite
		}
		dre, dim := inputRoundingTol(f, r[:6], texts[i][:6])
		v, err := C0(r[0], r[1], r[2], r[3]*r[3], r[4]*r[4], r[5]*r[5], 1)
		if err != nil {
			t.Errorf("C0%v: %v", r[:6], err)
			continue
		}
		if v.Pole1 != 0 || v.Pole2 != 0 {
			t.Errorf("C0%v has poles %v", r[:6], v)
		}
		if !closeTo(real(v.Finite), r[6], 1e-12, dre) || !closeTo(imag(v.Finite), r[7], 1e-12, dim) {
			t.Errorf("C0%v = %.17g, want %.17g + %.17gi", r[:6], v.Finite, r[6], r[7])
		}
	}
}

func TestD0ReferenceTable(t *testing.T) {
	// testdata/reference/one-loop-D0.tsv (mpmath Feynman-parameter quadrature, about 14
	// significant digits): s01 s12 s23 s03 s02 s13 m0 m1 m2 m3 Re Im; tolerance 1e-12.
	rows, texts := readTableText(t, "one-loop-D0.tsv")
	for i, r := range rows {
		f := func(x []float64) complex128 {
			v, _ := D0(x[0], x[1], x[2], x[3], x[4], x[5], x[6]*x[6], x[7]*x[7], x[8]*x[8], x[9]*x[9], 1)
			return v.Finite
		}
		dre, dim := inputRoundingTol(f, r[:10], texts[i][:10])
		v, err := D0(r[0], r[1], r[2], r[3], r[4], r[5], r[6]*r[6], r[7]*r[7], r[8]*r[8], r[9]*r[9], 1)
		if err != nil {
			t.Errorf("D0%v: %v", r[:10], err)
			continue
		}
		if !closeTo(real(v.Finite), r[10], 1e-12, dre) || !closeTo(imag(v.Finite), r[11], 1e-12, dim) {
			t.Errorf("D0%v = %.17g, want %.17g + %.17gi", r[:10], v.Finite, r[10], r[11])
		}
	}
}
