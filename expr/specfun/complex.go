package specfun

import (
	"fmt"
	"math"
	"math/big"
)

// Complex is an arbitrary-precision complex number Re + i·Im. Arithmetic methods return new
// values (the operands are not modified) rounded to the larger precision of the operands.
// The zero value is not usable; build values with NewComplex or ComplexOf.
type Complex struct {
	Re, Im *big.Float
}

// NewComplex returns re + i·im with the given precision in bits.
func NewComplex(re, im float64, prec uint) Complex {
	return Complex{new(big.Float).SetPrec(prec).SetFloat64(re), new(big.Float).SetPrec(prec).SetFloat64(im)}
}

// ComplexOf returns re + i·im as a new value (copies of re and im, same precisions).
// A nil part counts as zero.
func ComplexOf(re, im *big.Float) Complex {
	p := uint(0)
	if re != nil {
		p = re.Prec()
	}
	if im != nil && im.Prec() > p {
		p = im.Prec()
	}
	if p == 0 {
		p = 64
	}
	z := Complex{new(big.Float).SetPrec(p), new(big.Float).SetPrec(p)}
	if re != nil {
		z.Re.Set(re)
	}
	if im != nil {
		z.Im.Set(im)
	}
	return z
}

// RealComplex returns x + 0i at precision prec.
func RealComplex(x *big.Float, prec uint) Complex {
	return Complex{new(big.Float).SetPrec(prec).Set(x), new(big.Float).SetPrec(prec)}
}

// Prec returns the larger of the precisions of the two parts.
func (z Complex) Prec() uint {
	p := z.Re.Prec()
	if q := z.Im.Prec(); q > p {
		p = q
	}
	return p
}

// SetPrec returns z rounded to prec bits (a new value).
func (z Complex) SetPrec(prec uint) Complex {
	return Complex{new(big.Float).SetPrec(prec).Set(z.Re), new(big.Float).SetPrec(prec).Set(z.Im)}
}

// Complex128 returns the nearest complex128.
func (z Complex) Complex128() complex128 {
	re, _ := z.Re.Float64()
	im, _ := z.Im.Float64()
	return complex(re, im)
}

// String formats z with 20 significant digits.
func (z Complex) String() string { return z.Text(20) }

// Text formats z as "(re ± im i)" with the given number of significant decimal digits.
func (z Complex) Text(digits int) string {
	sign := "+"
	im := new(big.Float).Copy(z.Im)
	if im.Signbit() {
		sign = "-"
		im.Neg(im)
	}
	return fmt.Sprintf("(%s %s %si)", z.Re.Text('g', digits), sign, im.Text('g', digits))
}

func maxPrec(a, b Complex) uint {
	p := a.Prec()
	if q := b.Prec(); q > p {
		p = q
	}
	return p
}

func newFloat(prec uint) *big.Float { return new(big.Float).SetPrec(prec) }

// Add returns z + w.
func (z Complex) Add(w Complex) Complex {
	p := maxPrec(z, w)
	return Complex{newFloat(p).Add(z.Re, w.Re), newFloat(p).Add(z.Im, w.Im)}
}

// Sub returns z − w.
func (z Complex) Sub(w Complex) Complex {
	p := maxPrec(z, w)
	return Complex{newFloat(p).Sub(z.Re, w.Re), newFloat(p).Sub(z.Im, w.Im)}
}

// Neg returns −z.
func (z Complex) Neg() Complex {
	p := z.Prec()
	return Complex{newFloat(p).Neg(z.Re), newFloat(p).Neg(z.Im)}
}

// Conj returns the complex conjugate of z.
func (z Complex) Conj() Complex {
	p := z.Prec()
	return Complex{newFloat(p).Set(z.Re), newFloat(p).Neg(z.Im)}
}

// Mul returns z·w.
func (z Complex) Mul(w Complex) Complex {
	p := maxPrec(z, w)
	q := p + 16
	ac := newFloat(q).Mul(z.Re, w.Re)
	bd := newFloat(q).Mul(z.Im, w.Im)
	ad := newFloat(q).Mul(z.Re, w.Im)
	bc := newFloat(q).Mul(z.Im, w.Re)
	return Complex{newFloat(p).Sub(ac, bd), newFloat(p).Add(ad, bc)}
}

// Scale returns z·s for a real s.
func (z Complex) Scale(s *big.Float) Complex {
	p := z.Prec()
	return Complex{newFloat(p).Mul(z.Re, s), newFloat(p).Mul(z.Im, s)}
}

// Quo returns z/w. Division by zero gives infinite or NaN-free parts as math/big does (a big.Float
// cannot hold NaN, so 0/0 panics in math/big); callers check w first.
func (z Complex) Quo(w Complex) Complex {
	p := maxPrec(z, w)
	q := p + 16
	d := newFloat(q).Mul(w.Re, w.Re)
	d.Add(d, newFloat(q).Mul(w.Im, w.Im))
	// (a+ib)(c−id)/d
	re := newFloat(q).Mul(z.Re, w.Re)
	re.Add(re, newFloat(q).Mul(z.Im, w.Im))
	im := newFloat(q).Mul(z.Im, w.Re)
	im.Sub(im, newFloat(q).Mul(z.Re, w.Im))
	return Complex{newFloat(p).Quo(re, d), newFloat(p).Quo(im, d)}
}

// Inv returns 1/z.
func (z Complex) Inv() Complex {
	p := z.Prec()
	return NewComplex(1, 0, p).Quo(z)
}

// IsZero reports whether z = 0.
func (z Complex) IsZero() bool { return z.Re.Sign() == 0 && z.Im.Sign() == 0 }

// Abs returns |z|.
func (z Complex) Abs() *big.Float {
	p := z.Prec()
	s := newFloat(2*p+16).Mul(z.Re, z.Re)
	s.Add(s, newFloat(2*p+16).Mul(z.Im, z.Im))
	return newFloat(p).Sqrt(s)
}

// absFloat64 is |z| as a float64 estimate (for term-size tests).
func (z Complex) absFloat64() float64 {
	re, _ := z.Re.Float64()
	im, _ := z.Im.Float64()
	return math.Hypot(re, im)
}

// exponent returns the binary exponent of the larger part (MantExp convention), or a very
// negative number for zero.
func (z Complex) exponent() int {
	e := math.MinInt32
	if z.Re.Sign() != 0 {
		e = z.Re.MantExp(nil)
	}
	if z.Im.Sign() != 0 {
		if f := z.Im.MantExp(nil); f > e {
			e = f
		}
	}
	return e
}
