package exact

import (
	"math"
	"testing"
)

// slabCases spans the in-plane wave numbers (from deep inside the first zone to the cutoff
// region) and height differences (flat, buckled, multi-layer) the kernels meet.
var (
	slabKs = []float64{0, 1e-10, 1e-6, 1e-3, 3e-3, 0.01, 0.05, 0.2, 0.7, 1.5, 2.5, 4}
	slabZs = []float64{0, 0.15, 0.3, 0.9, 1.1, 2.0, 3.5}
)

// TestSlabPoisson checks the quadrature against the Poisson equation of the smooth part.
// Derived: erf(ηr)/r is the potential of the unit Gaussian charge (η³/π^{3/2}) e^{−η²r²}, so
// ∇²[erf(ηr)/r] = −(4η³/√π) e^{−η²r²}; its in-plane transform at height z gives
// ∂_z²ĝ − K²ĝ = −4√π η exp(−K²/4η² − η²z²). This ties I₋₂ to I₀ and I₂ at every K and z.
func TestSlabPoisson(t *testing.T) {
	for _, eta := range []float64{0.4, 0.6, 1.0} {
		r := newSlabRule(eta, slabPanel, slabNodes)
		for _, k := range slabKs {
			for _, z := range slabZs {
				g, _, gzz := r.slab(k, z)
				got := gzz - k*k*g
				want := -4 * math.SqrtPi * eta * math.Exp(-k*k/(4*eta*eta)-eta*eta*z*z)
				// Scale: the size of the two terms and of the K = 0 value 4√πη, against
				// which the kernel's entries are measured; 1e-13 is 50× the rounding seen.
				scale := math.Abs(gzz) + k*k*math.Abs(g) + 4*math.SqrtPi*eta
				if d := math.Abs(got - want); d > 1e-13*scale {
					t.Errorf("eta=%g K=%g z=%g: ∂z²ĝ − K²ĝ = %.16g, want %.16g (diff %.2g > 1e-13·%.3g)", eta, k, z, got, want, d, scale)
				}
			}
		}
	}
}

// TestSlabFlat checks ĝ at z = 0 against its closed form. Derived: with s = K/2t,
// ∫_0^η t⁻² e^{−K²/4t²} dt = (2/K) ∫_{K/2η}^∞ e^{−s²} ds, so ĝ(K, 0) = (2π/K) erfc(K/2η).
// Relative tolerance 1e-13: the values run from 6e10 to 1e-3 and the rule is good to ~1e-15.
func TestSlabFlat(t *testing.T) {
	eta := 0.6
	r := newSlabRule(eta, slabPanel, slabNodes)
	for _, k := range slabKs[1:] {
		if k > 2.5 {
			continue // below 1e-3 of the K = 0 scale: only its absolute error matters (Poisson test)
		}
		g, gz, _ := r.slab(k, 0)
		want := 2 * math.Pi / k * math.Erfc(k/(2*eta))
		if math.Abs(g-want) > 1e-13*want {
			t.Errorf("ĝ(K=%g, z=0) = %.16g, want %.16g (rel %.2g)", k, g, want, math.Abs(g-want)/want)
		}
		if gz != 0 {
			t.Errorf("∂zĝ(K=%g, z=0) = %g, want 0 (odd in z)", k, gz)
		}
	}
}

// TestSlabZeroK checks the K = 0 rule against elementary integrals (derived):
// I₀ = ∫_0^η e^{−z²t²} dt = √π erf(ηz)/(2z), and, integrating by parts,
// ∂_z²ĝ(0, z) = 2√π ∫_0^η (4z²t² − 2) e^{−z²t²} dt = −4√π η e^{−η²z²}.
func TestSlabZeroK(t *testing.T) {
	eta := 0.7
	r := newSlabRule(eta, slabPanel, slabNodes)
	for _, z := range slabZs {
		_, i0, _ := r.integrals(0, z)
		want := eta
		if z > 0 {
			want = math.SqrtPi * math.Erf(eta*z) / (2 * z)
		}
		if math.Abs(i0-want) > 1e-15*math.Max(want, 1) {
			t.Errorf("I0(0, z=%g) = %.16g, want %.16g", z, i0, want)
		}
		_, _, gzz := r.slab(0, z)
		wzz := -4 * math.SqrtPi * eta * math.Exp(-eta*eta*z*z)
		// Against the z = 0 value 4√πη: at large ηz the result is a cancellation of two terms.
		if math.Abs(gzz-wzz) > 1e-14*4*math.SqrtPi*eta {
			t.Errorf("∂z²ĝ(0, z=%g) = %.16g, want %.16g", z, gzz, wzz)
		}
	}
}

// TestSlabDerivatives checks that ∂_zĝ and ∂_z²ĝ (differentiated under the integral) are the z
// derivatives of ĝ and ∂_zĝ, by central differences with Richardson extrapolation (error
// O(h⁴) ≈ 1e-11 at h = 1e-3 Å, rounding ≈ 1e-16·|ĝ|/h). Tolerance 1e-9 of the scale.
func TestSlabDerivatives(t *testing.T) {
	eta := 0.6
	r := newSlabRule(eta, slabPanel, slabNodes)
	const h = 1e-3
	diff := func(f func(z float64) float64, z float64) float64 {
		d1 := (f(z+h) - f(z-h)) / (2 * h)
		d2 := (f(z+h/2) - f(z-h/2)) / h
		return (4*d2 - d1) / 3
	}
	for _, k := range []float64{1e-3, 0.05, 0.7, 2.5} {
		for _, z := range []float64{0.15, 0.9, 2.0} {
			g := func(z float64) float64 { v, _, _ := r.slab(k, z); return v }
			gz := func(z float64) float64 { _, v, _ := r.slab(k, z); return v }
			_, wantZ, wantZZ := r.slab(k, z)
			scale := math.Abs(g(z)) + 4*math.SqrtPi*eta
			if got := diff(g, z); math.Abs(got-wantZ) > 1e-9*scale {
				t.Errorf("K=%g z=%g: d/dz ĝ = %.12g, ∂zĝ = %.12g", k, z, got, wantZ)
			}
			if got := diff(gz, z); math.Abs(got-wantZZ) > 1e-9*scale {
				t.Errorf("K=%g z=%g: d/dz ∂zĝ = %.12g, ∂z²ĝ = %.12g", k, z, got, wantZZ)
			}
		}
	}
}

// TestSlabRefinement compares the production rule with one of a quarter of the panel width and
// 30 nodes per panel. Absolute differences are measured against the K = 0 scale 4√πη (the
// entries of the kernel); 1e-13 leaves a margin over the ~5e-15 observed.
func TestSlabRefinement(t *testing.T) {
	eta := 0.6
	r := newSlabRule(eta, slabPanel, slabNodes)
	fine := newSlabRule(eta, slabPanel/4, 30)
	for _, k := range slabKs {
		for _, z := range slabZs {
			g, gz, gzz := r.slab(k, z)
			fg, fgz, fgzz := fine.slab(k, z)
			d := (math.Abs(g-fg)*k*k + math.Abs(gz-fgz)*k + math.Abs(gzz-fgzz)) / (4 * math.SqrtPi * eta)
			if d > 1e-13 {
				t.Errorf("K=%g z=%g: rule differs from the refined rule by %.2g (> 1e-13)", k, z, d)
			}
		}
	}
}
