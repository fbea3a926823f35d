package vacuum

import (
	"testing"
	"time"

	"loopmatch/expr"
)

func TestScratch(t *testing.T) {
	z := expr.RFInt(0)
	for _, ms := range [][3]expr.RatFunc{{sq("m"), z, z}, {sq("m"), sq("m"), z}, {sq("a"), sq("b"), sq("c")}, {sq("m"), sq("m"), sq("m")}, {sq("a"), sq("b"), z}} {
		for _, p := range [][3]int{{1, 1, 1}, {2, 1, 1}, {1, 1, 2}, {2, 2, 2}} {
			t0 := time.Now()
			e, info, err := TwoLoop(p, ms, Numerator{})
			t.Logf("%v %v: %v  (%d scaleless, %v) err=%v", ms, p, e, len(info.Scaleless), time.Since(t0), err)
		}
	}
}
