package loops

import "fmt"

// d0Divergent recognises the infrared-divergent boxes: a massless line whose two neighbours in the
// loop are on-shell (soft), or two adjacent massless lines with a light-like leg between them
// (collinear). ok reports a divergent box.
func d0Divergent(b *box, mu2 float64) (Value, bool, error) {
	sc := b.scale()
	soft, coll := irStructure(b, sc)
	if len(soft) == 0 && len(coll) == 0 {
		return Value{}, false, nil
	}
	return Value{}, true, fmt.Errorf("%w: infrared-divergent D0 (soft lines %v, collinear pairs %v)", ErrNotCovered, soft, coll)
}

// irStructure lists the soft lines (massless, both loop neighbours on-shell) and the collinear
// pairs (adjacent massless lines with a light-like leg between them) of a box.
func irStructure(b *box, sc float64) (soft []int, coll [][2]int) {
	for a := 0; a < 4; a++ {
		if b.m2[a] != 0 {
			continue
		}
		p, n := (a+3)%4, (a+1)%4
		if same(b.s[a][p], b.m2[p], sc) && same(b.s[a][n], b.m2[n], sc) {
			soft = append(soft, a)
		}
		if b.m2[n] == 0 && same(b.s[a][n], 0, sc) {
			coll = append(coll, [2]int{a, n})
		}
	}
	return soft, coll
}
