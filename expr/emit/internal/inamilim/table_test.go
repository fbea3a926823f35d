package inamilim

import (
	"bufio"
	"math"
	"os"
	"strconv"
	"strings"
	"testing"
)

// TestReferenceTable compares the emitted Inami–Lim functions with
// testdata/reference/inami-lim.tsv (computed outside the project with mpmath, 20 digits; x from
// 0.01 to 100, including 1 ± 1e-4 where the textbook formulas lose digits).
func TestReferenceTable(t *testing.T) {
	f, err := os.Open("../../../../testdata/reference/inami-lim.tsv")
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	fns := map[string]func(float64) float64{"B0": IL_B0, "C0": IL_C0, "D0": IL_D0, "Dp0": IL_Dp0, "Ep0": IL_Ep0, "S0": IL_S0}
	var header []string
	n := 0
	sc := bufio.NewScanner(f)
	for sc.Scan() {
		line := sc.Text()
		if strings.HasPrefix(line, "#") {
			header = strings.Fields(strings.TrimPrefix(line, "#"))
			continue
		}
		cols := strings.Split(line, "\t")
		x, err := strconv.ParseFloat(cols[0], 64)
		if err != nil {
			t.Fatal(err)
		}
		for i, h := range header {
			fn, ok := fns[h]
			if !ok || i >= len(cols) {
				continue
			}
			want, err := strconv.ParseFloat(cols[i], 64)
			if err != nil {
				t.Fatal(err)
			}
			if got := fn(x); !(math.Abs(got-want) <= 1e-13*math.Abs(want)) {
				t.Errorf("%s(%v) = %.17g, table %.17g (relative difference %.2g)", h, x, got, want, math.Abs(got/want-1))
			}
			n++
		}
	}
	if n != 6*15 {
		t.Errorf("compared %d values, want 90", n)
	}
}
