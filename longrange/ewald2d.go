package longrange

import (
	"math"

	"lamina/grid"
)

// Sheet kernel (shared PHYSICS.md section 5), signs derived here.
//
// Point dipoles p_κ = Z_κ·u_κ interact through E = −k_e p_κᵀ [∂∂(1/r)](d) p_κ', so
// Φ_{κα,κ'β}(R) = −k_e Σ_{γδ} Z_{κ,γα} ∂_γ∂_δ(1/r)|_d Z_{κ',δβ}, d = R + τ_κ' − τ_κ, with height
// z = d_z = z_κ' − z_κ. Split 1/r = erf(Λr)/r + erfc(Λr)/r and write the long-range part by its
// in-plane transform, erf(Λr)/r = ∫ d²k/(2π)² ĝ(k, z) e^{ik·ρ}. Poisson summation over the
// in-plane lattice gives, for any h(ρ, z),
//
//	Σ_R h(R + d∥, z) e^{iq·R} = (1/A) Σ_G h̃(−K, z) e^{iK·(τ_κ − τ_κ')},  K = q + G,
//
// and for h = ∂_γ∂_δ f an in-plane ∂_a becomes ik_a while ∂_z stays, so at k = −K
//
//	h̃ = −K_a K_b ĝ (in-plane pair),  −iK_a ∂_zĝ (one in-plane, one z),  ∂_z²ĝ (z, z).
//
// Multiplied by −k_e Z_κᵀ … Z_κ' this is
//
//	C_{κα,κ'β} = (k_e/A) Σ_G e^{iK·(τ_κ−τ_κ')} [ (K·Z_κ)_α (K·Z_κ')_β ĝ − Z_{κ,zα} Z_{κ',zβ} ∂_z²ĝ
//	             + i ∂_zĝ ((K·Z_κ)_α Z_{κ',zβ} + Z_{κ,zα} (K·Z_κ')_β) ],
//
// with (K·Z)_β = Σ_{a=x,y} K_a Z_{aβ}. ĝ is even in z and ∂_zĝ odd, so the matrix is Hermitian.
// The transform of erf(Λr)/r at height z is
//
//	ĝ = (π/K)(P + M),  P = e^{Kz} erfc(K/2Λ + Λz),  M = e^{−Kz} erfc(K/2Λ − Λz),
//	∂_zĝ = π(P − M),   ∂_z²ĝ = π[K(P + M) − (4Λ/√π) e^{−K²/4Λ² − Λ²z²}],
//
// which tends to (2π/K)e^{−K|z|} as Λ → ∞. At K = 0 the in-plane and cross terms vanish (they
// carry K² ĝ ~ 2πK and K ∂_zĝ) and −∂_z²ĝ → 4√π Λ e^{−Λ²z²}: the zz term stays, also at q = 0.
//
// Truncation: with x± = K/2Λ ± Λz, P and M are bounded by e^{−K²/4Λ²}·erfcx(x±)·e^{−Λ²z²} ≤
// e^{−K²/4Λ²} when x± ≥ 0, and by 2e^{∓Kz} < 2e^{−K²/2Λ²} when x± < 0, so every term decays at
// least like the Gaussian e^{−K²/4Λ²}: the sum is cut at K²/4Λ² ≤ gaussCut = 50, which leaves out
// terms below 1e-20 of the leading ones (far under the 1e-12 aimed at).

// slab returns ĝ(K, z), ∂_zĝ and ∂_z²ĝ for K > 0, without overflow for any K|z|: P is
// E·erfcx(x₊) for x₊ ≥ 0 and 2e^{Kz} − E·erfcx(−x₊) otherwise (x₊ < 0 means Kz < 0, so no
// overflow), E = e^{−K²/4Λ² − Λ²z²}; M likewise with z → −z. P(−z) = M(z) holds exactly.
func slab(k, z, lambda float64) (g, dg, d2g float64) {
	a := k / (2 * lambda)
	b := lambda * z
	e := math.Exp(-a*a - b*b)
	p := slabHalf(a+b, k*z, e)
	m := slabHalf(a-b, -k*z, e)
	g = math.Pi / k * (p + m)
	dg = math.Pi * (p - m)
	d2g = math.Pi * (k*(p+m) - 4*lambda/math.SqrtPi*e)
	return g, dg, d2g
}

// slabHalf returns e^{kz} erfc(x) given x, kz and e = e^{kz − x²}.
func slabHalf(x, kz, e float64) float64 {
	if x >= 0 {
		return e * Erfcx(x)
	}
	return 2*math.Exp(kz) - e*Erfcx(-x)
}

// slabZeroD2 returns −∂_z²ĝ(K → 0, z) = 4√π Λ e^{−Λ²z²}.
func slabZeroD2(z, lambda float64) float64 {
	return 4 * math.SqrtPi * lambda * math.Exp(-lambda*lambda*z*z)
}

// slabZeroCharge returns lim_{K→0} [ĝ(K, z) − 2π/K] = −2πz·erf(Λz) − (2√π/Λ) e^{−Λ²z²}, the
// K = 0 term of the slab Ewald sum for a neutral set of charges (the 2π/K parts cancel).
func slabZeroCharge(z, lambda float64) float64 {
	return -2*math.Pi*z*math.Erf(lambda*z) - 2*math.SqrtPi/lambda*math.Exp(-lambda*lambda*z*z)
}

// term2D adds the K term of the sheet kernel (see the derivation above), and the screening
// correction when it is on, to the upper triangle of buf. kv is in-plane.
func (k *Kernel) term2D(buf []complex128, kv grid.Vec3) {
	k2 := kv[0]*kv[0] + kv[1]*kv[1]
	if k2 == 0 {
		k.zeroTerm2D(buf)
		return
	}
	if k2/(4*k.lambda*k.lambda) > gaussCut {
		return
	}
	kk := math.Sqrt(k2)
	for i, dz := range k.dz {
		g, dg, d2g := slab(kk, dz, k.lambda)
		k.sg[i], k.sdg[i], k.sd2g[i] = k.pref*g, k.pref*dg, k.pref*d2g
	}
	var s float64
	if k.screen.on {
		s = k.screen.correction(kv, kk, k.lambda)
	}
	for a := range k.tau {
		sn, cs := math.Sincos(kv[0]*k.tau[a][0] + kv[1]*k.tau[a][1])
		p := complex(cs, sn)
		kz := k.z[a].VecMul(kv) // kv[2] = 0: the in-plane (K·Z)
		for al := 0; al < 3; al++ {
			k.x[3*a+al] = p * complex(kz[al], 0)
			k.y[3*a+al] = p * complex(k.z[a][2][al], 0)
		}
	}
	n := 3 * len(k.tau)
	for _, pr := range k.pairs {
		cg := k.sg[pr.iz] + s
		cd := pr.sign * k.sdg[pr.iz]
		c2 := k.sd2g[pr.iz]
		for al := 0; al < 3; al++ {
			i := 3*pr.a + al
			xi, yi := k.x[i], k.y[i]
			// (K·Z_κ)_α ĝ and Z_{κ,zα}(−∂_z²ĝ) paired with conj(x_j) and conj(y_j), plus the
			// cross terms i∂_zĝ (x_i ȳ_j + y_i x̄_j).
			ux := complex(cg, 0)*xi + complex(0, cd)*yi
			uy := complex(-c2, 0)*yi + complex(0, cd)*xi
			be0 := 0
			if pr.a == pr.b {
				be0 = al
			}
			row := buf[i*n : (i+1)*n]
			for be := be0; be < 3; be++ {
				j := 3*pr.b + be
				xj, yj := k.x[j], k.y[j]
				row[j] += ux*complex(real(xj), -imag(xj)) + uy*complex(real(yj), -imag(yj))
			}
		}
	}
}

// zeroTerm2D adds the K = 0 term, (k_e/A) Z_{κ,zα} Z_{κ',zβ} 4√πΛ e^{−Λ²z²}.
func (k *Kernel) zeroTerm2D(buf []complex128) {
	n := 3 * len(k.tau)
	for _, pr := range k.pairs {
		c := k.pref * slabZeroD2(k.dz[pr.iz], k.lambda)
		for al := 0; al < 3; al++ {
			i := 3*pr.a + al
			be0 := 0
			if pr.a == pr.b {
				be0 = al
			}
			for be := be0; be < 3; be++ {
				buf[i*n+3*pr.b+be] += complex(c*k.z[pr.a][2][al]*k.z[pr.b][2][be], 0)
			}
		}
	}
}

// atomPair is an atom pair κ ≤ κ' of the sheet kernel with the index of |z_κ' − z_κ| in
// Kernel.dz and the sign of z_κ' − z_κ (∂_zĝ is odd in z).
type atomPair struct {
	a, b int
	iz   int
	sign float64
}

// sheetPairs returns the pairs κ ≤ κ' and the distinct values of |z_κ' − z_κ| (exact equality).
func sheetPairs(tau []grid.Vec3) ([]atomPair, []float64) {
	var pairs []atomPair
	var dz []float64
	for a := range tau {
		for b := a; b < len(tau); b++ {
			z := tau[b][2] - tau[a][2]
			sign := 1.0
			if z < 0 {
				sign = -1
			}
			az := math.Abs(z)
			iz := -1
			for i, v := range dz {
				if v == az {
					iz = i
					break
				}
			}
			if iz < 0 {
				iz = len(dz)
				dz = append(dz, az)
			}
			pairs = append(pairs, atomPair{a: a, b: b, iz: iz, sign: sign})
		}
	}
	return pairs, dz
}

// slabPotential returns the electrostatic potential Σ_{(j,R) ≠ (site,0)} q_j / |R + τ_j − τ_site|
// (k_e = 1) at atom site of a neutral set of point charges periodic in the plane only (R runs
// over the in-plane lattice of l; the charges may sit at any heights), by the slab Ewald split:
// the real-space sum of erfc(Λr)/r over r ≤ √cut/Λ, the reciprocal sum
// (1/A) Σ_{G≠0} Σ_j q_j ĝ(G, z_j − z_site) cos(G·(τ_j − τ_site)) with the kernel's ĝ and G-list cut
// at G²/4Λ² ≤ cut, the K = 0 term (1/A) Σ_j q_j slabZeroCharge(z_j − z_site), and the self term
// −2Λq_site/√π. It exists to check ĝ on Madelung constants.
func slabPotential(l grid.Lattice, pos []grid.Vec3, q []float64, site int, lambda, cut float64) float64 {
	geo := newGeometry(l, 2)
	var recip float64
	for _, g := range reciprocalList(geo, grid.Identity(), lambda, cut, 0) {
		k2 := g.Dot(g)
		if k2 == 0 || k2/(4*lambda*lambda) > cut {
			continue
		}
		kk := math.Sqrt(k2)
		for j, t := range pos {
			d := t.Sub(pos[site])
			gh, _, _ := slab(kk, d[2], lambda)
			recip += q[j] * gh * math.Cos(g[0]*d[0]+g[1]*d[1])
		}
	}
	for j, t := range pos {
		recip += q[j] * slabZeroCharge(t[2]-pos[site][2], lambda)
	}
	recip /= l.Area()
	return recip + realSpaceErfc(geo, pos, q, site, lambda, math.Sqrt(cut)/lambda) -
		2*lambda/math.SqrtPi*q[site]
}
