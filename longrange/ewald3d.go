package longrange

import (
	"math"

	"lamina/grid"
)

// gaussCut is the largest exponent K·ε·K/4Λ² (3D) or K²/4Λ² (2D) kept in the reciprocal sums:
// the first neglected term is below e^{−50} ≈ 2e-22 of the leading one.
const gaussCut = 50

// gaussWeight3D returns exp(−K·ε·K/4Λ²)/(K·ε·K), the reciprocal-space weight of the long-range
// part of the Coulomb potential in a medium ε (its Fourier transform is 4π/(K·ε·K) times this
// Gaussian), and false for K·ε·K = 0 or an exponent above cut.
func gaussWeight3D(k grid.Vec3, eps grid.Mat3, lambda, cut float64) (float64, bool) {
	kek := eps.Quad(k)
	x := kek / (4 * lambda * lambda)
	if !(kek > 0) || x > cut {
		return 0, false
	}
	return math.Exp(-x) / kek, true
}

// term3D adds the K term of the Gonze–Lee sum (Phys. Rev. B 55, 10355 (1997); PHYSICS.md §5),
//
//	(4π k_e/Ω) (K·Z_κ)_α (K·Z_κ')_β exp(−K·ε∞·K/4Λ²)/(K·ε∞·K) · exp(iK·(τ_κ − τ_κ')),
//
// to the upper triangle of buf. Derivation in brief: Φ_{κα,κ'β}(R) = −k_e Z_κᵀ [∂∂ φ](d) Z_κ',
// d = R + τ_κ' − τ_κ, with φ(r) = 1/(√det ε · √(r·ε⁻¹·r)) whose transform is 4π/(K·ε·K);
// Poisson summation of Σ_R h(R + x) e^{iq·R} gives (1/Ω) Σ_G ĥ(K) e^{−iK·x}, and each ∂ gives iK.
func (k *Kernel) term3D(buf []complex128, kv grid.Vec3) {
	w, ok := gaussWeight3D(kv, k.eps, k.lambda, gaussCut)
	if !ok {
		return
	}
	w *= k.pref
	for a := range k.tau {
		s, c := math.Sincos(kv.Dot(k.tau[a]))
		p := complex(c, s)
		kz := k.z[a].VecMul(kv)
		for al := 0; al < 3; al++ {
			k.x[3*a+al] = p * complex(kz[al], 0)
		}
	}
	addOuterUpper(buf, k.x, w)
}

// nonAnalytic3D adds the direction-dependent limit of the K = 0 term along dir,
// (4π k_e/Ω) (d̂·Z_κ)_α (d̂·Z_κ')_β / (d̂·ε∞·d̂), to the upper triangle of buf (Gonze & Lee 1997).
func (k *Kernel) nonAnalytic3D(buf []complex128, dir grid.Vec3) {
	d := dir.Scale(1 / dir.Norm())
	w := k.pref / k.eps.Quad(d)
	for a := range k.tau {
		dz := k.z[a].VecMul(d)
		for al := 0; al < 3; al++ {
			k.x[3*a+al] = complex(dz[al], 0)
		}
	}
	addOuterUpper(buf, k.x, w)
}

// addOuterUpper adds w·x_i·conj(x_j) to buf[i·n + j] for j ≥ i, n = len(x).
func addOuterUpper(buf, x []complex128, w float64) {
	n := len(x)
	cw := complex(w, 0)
	for i, xi := range x {
		wi := cw * xi
		row := buf[i*n : (i+1)*n]
		for j := i; j < n; j++ {
			xj := x[j]
			row[j] += wi * complex(real(xj), -imag(xj))
		}
	}
}

// ewaldPotential3D returns the electrostatic potential Σ_{(j,R) ≠ (site,0)} q_j / |R + τ_j − τ_site|
// (in units of charge/Å, k_e = 1) at atom site of a neutral 3D-periodic set of point charges, by
// the Ewald split 1/r = erfc(Λr)/r + erf(Λr)/r: the real-space sum of erfc(Λr)/r over
// |r| ≤ √cut/Λ, the reciprocal sum (4π/Ω) Σ_{G≠0} exp(−G²/4Λ²)/G² Σ_j q_j cos(G·(τ_j − τ_site))
// cut at G²/4Λ² ≤ cut with the kernel's own G-list and weight, and the self term −2Λq_site/√π.
// The G = 0 term vanishes for Σ q_j = 0, which the caller guarantees. It exists to check the
// kernel's Ewald machinery on Madelung constants.
func ewaldPotential3D(l grid.Lattice, pos []grid.Vec3, q []float64, site int, lambda, cut float64) float64 {
	geo := newGeometry(l, 3)
	id := grid.Identity()
	var recip float64
	for _, g := range reciprocalList(geo, id, lambda, cut, 0) {
		w, ok := gaussWeight3D(g, id, lambda, cut)
		if !ok {
			continue
		}
		var s float64
		for j, t := range pos {
			s += q[j] * math.Cos(g.Dot(t.Sub(pos[site])))
		}
		recip += w * s
	}
	recip *= 4 * math.Pi / l.Volume()
	return recip + realSpaceErfc(geo, pos, q, site, lambda, math.Sqrt(cut)/lambda) -
		2*lambda/math.SqrtPi*q[site]
}

// realSpaceErfc returns Σ_{(j,R) ≠ (site,0)} q_j erfc(Λr)/r, r = |R + τ_j − τ_site| ≤ rc, over
// the lattice points R of geo (in-plane only for a sheet).
func realSpaceErfc(geo geometry, pos []grid.Vec3, q []float64, site int, lambda, rc float64) float64 {
	sep := 0.0
	for _, t := range pos {
		sep = math.Max(sep, t.Sub(pos[site]).Norm())
	}
	var sum float64
	for _, r := range latticeBall(geo.a, geo.b, geo.dims, rc+sep, nil) {
		for j, t := range pos {
			d := r.Add(t).Sub(pos[site]).Norm()
			if d == 0 || d > rc {
				continue
			}
			sum += q[j] * math.Erfc(lambda*d) / d
		}
	}
	return sum
}
