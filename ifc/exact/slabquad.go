package exact

import (
	"math"

	"gonum.org/v1/gonum/integrate/quad"
)

// Slab transform of the smooth Coulomb part, by quadrature.
//
// Derived: 1/r = (2/√π) ∫_0^∞ exp(−r²t²) dt. The part t < η is erf(ηr)/r, whose in-plane Fourier
// transform at height z follows from ∫ d²ρ exp(−iK·ρ − (ρ² + z²)t²) = (π/t²) exp(−K²/4t² − z²t²):
//
//	ĝ(K, z)   = 2√π ∫_0^η t⁻² exp(−K²/4t² − z²t²) dt  = 2√π I₋₂
//	∂_z ĝ     = −4√π z ∫_0^η exp(…) dt                = −4√π z I₀
//	∂_z² ĝ    = 2√π ∫_0^η (4z²t² − 2) exp(…) dt       = 2√π (4z² I₂ − 2 I₀)
//
// (differentiated under the integral). The integrals are evaluated numerically on purpose,
// independently of any closed form. With t = η e^{−u} (dt = −t du) they become
// I_n = ∫_0^U t^{n+1} exp(−K²/4t² − z²t²) du, which resolves the layer near t ~ K/2 where the
// t⁻² integrand of a small K peaks: in u it is a smooth bump at u ≈ ln(2η/K), integrated by
// composite Gauss–Legendre on panels of fixed width. The upper limit U = ln(2η√slabCut/K) is
// where K²/4t² reaches slabCut (the integrands are below e^{−slabCut} beyond it). At K = 0 only
// I₀ and I₂ are needed (I₋₂ is multiplied by K_aK_b) and their integrands are entire in t, so a
// single Gauss–Legendre rule on [0, η] is exact to rounding.

const (
	// slabCut bounds K²/4t² in the integrals: exp(−42) ≈ 6e-19 is below double rounding of
	// the O(1) integrals. It also sets the in-plane G cutoff K ≤ 2η√slabCut.
	slabCut = 42.0
	// slabPanel is the panel width in u; slabNodes the Gauss–Legendre order per panel. The
	// integrands are analytic in a strip |Im u| < π/4 around the real axis (the factors
	// exp(−a e^{±2u})), which for these values gives a rule error below 1e-15 (measured in
	// slabquad_test.go against a rule with half the panel width and more nodes).
	slabPanel = 0.5
	slabNodes = 16
	// slabZeroNodes is the order of the rule on [0, η] used at K = 0.
	slabZeroNodes = 24
)

// slabRule holds the Gauss–Legendre rules of the slab quadrature; it is built once per model and
// only read afterwards.
type slabRule struct {
	eta    float64
	panel  float64
	x, w   []float64 // nodes and weights on [0, panel]
	zx, zw []float64 // nodes and weights on [0, η] for K = 0
}

func newSlabRule(eta, panel float64, nodes int) *slabRule {
	r := &slabRule{eta: eta, panel: panel}
	r.x = make([]float64, nodes)
	r.w = make([]float64, nodes)
	quad.Legendre{}.FixedLocations(r.x, r.w, 0, panel)
	r.zx = make([]float64, slabZeroNodes)
	r.zw = make([]float64, slabZeroNodes)
	quad.Legendre{}.FixedLocations(r.zx, r.zw, 0, eta)
	return r
}

// integrals returns I₋₂, I₀, I₂ for in-plane wave number k ≥ 0 and height difference z. At
// k = 0, I₋₂ is returned as 0 (it diverges, but only K_aK_b·I₋₂ enters, which vanishes).
func (r *slabRule) integrals(k, z float64) (im2, i0, i2 float64) {
	z2 := z * z
	if k == 0 {
		for i, t := range r.zx {
			e := r.zw[i] * math.Exp(-z2*t*t)
			i0 += e
			i2 += e * t * t
		}
		return 0, i0, i2
	}
	u := math.Log(2 * r.eta * math.Sqrt(slabCut) / k)
	if !(u > 0) {
		return 0, 0, 0
	}
	// At most ~1500 panels, for k near the smallest positive float64.
	np := int(math.Ceil(u / r.panel))
	k2 := k * k / 4
	for p := 0; p < np; p++ {
		u0 := float64(p) * r.panel
		for i, x := range r.x {
			t := r.eta * math.Exp(-(u0 + x))
			tt := t * t
			e := r.w[i] * t * math.Exp(-k2/tt-z2*tt)
			im2 += e / tt
			i0 += e
			i2 += e * tt
		}
	}
	return im2, i0, i2
}

// slab returns ĝ, ∂_zĝ, ∂_z²ĝ of the smooth part erf(ηr)/r at in-plane wave number k and height
// difference z (ĝ is returned as 0 at k = 0, see integrals).
func (r *slabRule) slab(k, z float64) (g, gz, gzz float64) {
	im2, i0, i2 := r.integrals(k, math.Abs(z))
	return slabFromIntegrals(im2, i0, i2, z)
}

// slabFromIntegrals forms ĝ, ∂_zĝ, ∂_z²ĝ from I₋₂, I₀, I₂ (taken at |z|) and the signed z.
func slabFromIntegrals(im2, i0, i2, z float64) (g, gz, gzz float64) {
	const c = 2 * math.SqrtPi
	return c * im2, -2 * c * z * i0, c * (4*z*z*i2 - 2*i0)
}
