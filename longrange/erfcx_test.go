package longrange

import (
	"math"
	"math/big"
	"testing"
)

// piDigits is π to 76 significant digits (a mathematical constant, from memory; a wrong digit
// would show in TestBigErfcxSelfCheck). Its 252 bits limit bigErfcx to x ≤ 10, where the series
// cancels about 1.44·x² = 144 bits.
const piDigits = "3.141592653589793238462643383279502884197169399375105820974944592307816406286"

// bigErfcx returns erfcx(x) from the series of Abramowitz & Stegun 7.1.6,
// e^{x²} erf(x) = (2/√π) Σ_{n≥0} 2ⁿ x^{2n+1}/(1·3···(2n+1)), as e^{x²} − (2/√π)·Σ, in binary
// floating point with enough bits to absorb the cancellation (about 1.44·x² bits are lost).
func bigErfcx(x float64) float64 {
	prec := uint(256 + 2*x*x)
	nf := func(v float64) *big.Float { return new(big.Float).SetPrec(prec).SetFloat64(v) }
	bx := nf(x)
	y := new(big.Float).SetPrec(prec).Mul(bx, bx)
	eps := new(big.Float).SetPrec(prec).SetMantExp(nf(1), -int(prec))

	// e^y by its Taylor series (y ≥ 0, all terms positive).
	expY := nf(1)
	term := nf(1)
	for k := 1; ; k++ {
		term.Mul(term, y)
		term.Quo(term, nf(float64(k)))
		expY.Add(expY, term)
		if float64(k) > x*x && term.Cmp(new(big.Float).Mul(expY, eps)) < 0 {
			break
		}
	}
	// Σ 2ⁿ x^{2n+1}/(2n+1)!!: t_0 = x, t_n = t_{n−1}·2y/(2n+1).
	sum := new(big.Float).SetPrec(prec).Set(bx)
	t := new(big.Float).SetPrec(prec).Set(bx)
	twoY := new(big.Float).SetPrec(prec).Mul(y, nf(2))
	for n := 1; ; n++ {
		t.Mul(t, twoY)
		t.Quo(t, nf(float64(2*n+1)))
		sum.Add(sum, t)
		at := new(big.Float).Abs(t)
		as := new(big.Float).Abs(sum)
		if float64(n) > x*x && at.Cmp(as.Mul(as, eps)) < 0 {
			break
		}
		if x == 0 {
			break
		}
	}
	pi, _, err := big.ParseFloat(piDigits, 10, prec, big.ToNearestEven)
	if err != nil {
		panic(err)
	}
	sqrtPi := new(big.Float).SetPrec(prec).Sqrt(pi)
	r := new(big.Float).SetPrec(prec).Quo(sum, sqrtPi)
	r.Mul(r, nf(2))
	r.Sub(expY, r)
	f, _ := r.Float64()
	return f
}

func TestBigErfcxSelfCheck(t *testing.T) {
	// erfcx(0) = 1 exactly; erfcx(1) = e·erfc(1), against float64 math to 2 ulp (both finite and
	// well conditioned at x = 1). A wrong digit of π or a broken series would show here.
	if got := bigErfcx(0); got != 1 {
		t.Errorf("bigErfcx(0) = %v, want 1", got)
	}
	want := math.E * math.Erfc(1)
	if got := bigErfcx(1); math.Abs(got-want) > 2*0x1p-53 {
		t.Errorf("bigErfcx(1) = %.17g, want %.17g (e·erfc(1) in float64, tol 2 ulp)", got, want)
	}
}

// TestErfcxReference compares Erfcx with the 256-bit-plus series over both branches of the
// implementation (product form below 6, continued fraction above) and for negative x.
func TestErfcxReference(t *testing.T) {
	xs := []float64{-5, -3, -1.5, -0.7, -1e-3, 0, 1e-8, 1e-3, 0.1, 0.3, 0.5, 0.84375, 1, 1.25, 2, 2.857, 3.5,
		4.7, 5.5, 5.999, 6, 6.001, 6.5, 7.5, 9, 10}
	for _, x := range xs {
		want := bigErfcx(x)
		got := Erfcx(x)
		// 4 ulp: math.Erfc and math.Exp are each within about 1 ulp, plus the product and the
		// bottom-up continued fraction.
		if rel := math.Abs(got-want) / math.Abs(want); rel > 9e-16 {
			t.Errorf("Erfcx(%v) = %.17g, want %.17g (rel %.2g > tol 9e-16)", x, got, want, rel)
		}
	}
}

// TestErfcxProduct compares with exp(x²)·erfc(x) in plain float64 wherever that product is
// finite and not underflowed (erfc normal, x < 26.5): the naive exp(x·x) carries the rounding
// error of x², relative x²·2⁻⁵³, which sets the tolerance.
func TestErfcxProduct(t *testing.T) {
	for x := -6.0; x < 26.5; x += 0.173 {
		want := math.Exp(x*x) * math.Erfc(x)
		got := Erfcx(x)
		tol := (4 + 2*x*x) * 0x1p-53
		if rel := math.Abs(got-want) / math.Abs(want); rel > tol {
			t.Errorf("Erfcx(%v) = %.17g, exp·erfc = %.17g (rel %.2g > tol %.2g)", x, got, want, rel, tol)
		}
	}
}

// TestErfcxAsymptotic compares with the asymptotic series (A&S 7.1.23)
// erfcx(x) ~ 1/(x√π) Σ_n (−1)ⁿ (2n−1)!!/(2x²)ⁿ, summed to its smallest term, whose size bounds
// the error (below 1e-20 for x ≥ 20 after 10 terms).
func TestErfcxAsymptotic(t *testing.T) {
	for _, x := range []float64{20, 27, 30, 50, 100, 1e3, 1e5, 1e8, 1e15, 1e150} {
		sum, term := 1.0, 1.0
		for n := 1; n <= 12; n++ {
			term *= -float64(2*n-1) / (2 * x * x)
			sum += term
		}
		want := sum / (x * math.SqrtPi)
		got := Erfcx(x)
		if rel := math.Abs(got-want) / math.Abs(want); rel > 4e-16 {
			t.Errorf("Erfcx(%v) = %.17g, asymptotic %.17g (rel %.2g > tol 4e-16, 2 ulp)", x, got, want, rel)
		}
	}
}

// TestErfcxNegative checks erfcx(−x) = 2 exp(x²) − erfcx(x) against the direct product for
// negative arguments (erfc(−x) ∈ (1, 2) there, so exp(x²)·erfc(−x) loses nothing but the
// rounding of x²), and the overflow to +Inf.
func TestErfcxNegative(t *testing.T) {
	for _, x := range []float64{0.01, 0.5, 1, 3, 8, 15, 26} {
		want := 2*math.Exp(x*x) - math.Exp(x*x)*math.Erfc(x)
		got := Erfcx(-x)
		tol := (4 + 2*x*x) * 0x1p-53
		if rel := math.Abs(got-want) / math.Abs(want); rel > tol {
			t.Errorf("Erfcx(%v) = %.17g, want %.17g (rel %.2g > tol %.2g)", -x, got, want, rel, tol)
		}
	}
	if got := Erfcx(-27); !math.IsInf(got, 1) {
		t.Errorf("Erfcx(-27) = %v, want +Inf (exp(729) overflows)", got)
	}
}

func TestErfcxSpecial(t *testing.T) {
	if got := Erfcx(math.Inf(1)); got != 0 {
		t.Errorf("Erfcx(+Inf) = %v, want 0", got)
	}
	if got := Erfcx(math.Inf(-1)); !math.IsInf(got, 1) {
		t.Errorf("Erfcx(-Inf) = %v, want +Inf", got)
	}
	if got := Erfcx(math.NaN()); !math.IsNaN(got) {
		t.Errorf("Erfcx(NaN) = %v, want NaN", got)
	}
	// Largest finite double: erfcx → 1/(x√π), about 3.1e-309, a subnormal but non-zero.
	if got := Erfcx(math.MaxFloat64); !(got > 0) {
		t.Errorf("Erfcx(MaxFloat64) = %v, want > 0", got)
	}
}

// TestErfcxDerivative checks the differential equation y' = 2x·y − 2/√π (from d erfc/dx =
// −(2/√π) e^{−x²}) by central differences: step 1e-5 leaves a truncation error h²/6·y‴ below
// 2e-7 of |y'| + |y| + 1 and a rounding error near 1e-11 of it, inside the 1e-8 tolerance.
func TestErfcxDerivative(t *testing.T) {
	const h = 1e-5
	for _, x := range []float64{-2, -0.5, 0.2, 1, 3, 5.9, 6.1, 10, 40} {
		d := (Erfcx(x+h) - Erfcx(x-h)) / (2 * h)
		want := 2*x*Erfcx(x) - 2/math.SqrtPi
		if diff := math.Abs(d - want); diff > 1e-8*(1+math.Abs(want)+Erfcx(x)) {
			t.Errorf("erfcx'(%v) = %.12g by differences, 2x·erfcx − 2/√π = %.12g", x, d, want)
		}
	}
}
