package exact

import (
	"math"

	"lamina/grid"
)

// erfcHessian returns ∂_γ∂_δ h(d) for h(d) = erfc(η d)/d and the metric distance
// d = √(r·g·r), g symmetric positive definite (g = ε⁻¹ in a medium, the unit matrix in vacuum).
//
// Derived: ∂_γ d = (g r)_γ/d, so ∂_γ∂_δ h = h′(d)/d · g_γδ + (h″ − h′/d)/d² · (g r)_γ (g r)_δ, with
// h′(d)/d = −[erfc(ηd)/d³ + (2η/√π) e^{−η²d²}/d²] and
// (h″ − h′/d)/d² = [3 erfc(ηd)/d³ + (2η/√π) e^{−η²d²} (3/d² + 2η²)]/d².
// At η = 0 this is the point-charge tensor (3 r̂r̂ − 1)/r³ of the vacuum case.
func erfcHessian(r grid.Vec3, g grid.Mat3, eta float64) grid.Mat3 {
	gr := g.MulVec(r)
	d2 := r.Dot(gr)
	d := math.Sqrt(d2)
	x := eta * d
	ec := math.Erfc(x)
	ga := 2 * eta / math.SqrtPi * math.Exp(-x*x)
	b := ec/(d2*d) + ga/d2
	c := (3*ec/(d2*d) + ga*(3/d2+2*eta*eta)) / d2
	var h grid.Mat3
	for i := 0; i < 3; i++ {
		for j := 0; j < 3; j++ {
			h[i][j] = -b*g[i][j] + c*gr[i]*gr[j]
		}
	}
	return h
}

// selfHessian returns ∂_γ∂_δ [erf(η d)/d] at r = 0, the R = 0 term of the smooth part that the
// reciprocal sum holds and the lattice sum over R ≠ 0 must not: erf(ηd)/d = (2η/√π)(1 − η²d²/3
// + …), and ∂∂ d² = 2g, so the value is −(4η³/(3√π)) g.
func selfHessian(g grid.Mat3, eta float64) grid.Mat3 {
	return g.Scale(-4 * eta * eta * eta / (3 * math.SqrtPi))
}

// latticeCells returns the integer cells n (n[2] = 0 when periodic == 2) of every lattice vector
// R = Σ n_i a_i with |R + delta| ≤ rmax. recip holds the reciprocal vectors as rows (b_i·a_j =
// 2π δ_ij; for a sheet the in-plane ones).
func latticeCells(lat grid.Mat3, recip grid.Mat3, periodic int, delta grid.Vec3, rmax float64) [][3]int {
	var lim [3]int
	for i := 0; i < periodic; i++ {
		// n_i = R·b_i/2π and |R| ≤ rmax + |delta|.
		lim[i] = int(math.Ceil((rmax+delta.Norm())*grid.Vec3(recip[i]).Norm()/(2*math.Pi))) + 1
	}
	var out [][3]int
	for n0 := -lim[0]; n0 <= lim[0]; n0++ {
		for n1 := -lim[1]; n1 <= lim[1]; n1++ {
			for n2 := -lim[2]; n2 <= lim[2]; n2++ {
				r := lat.VecMul(grid.Vec3{float64(n0), float64(n1), float64(n2)}).Add(delta)
				if r.Norm() <= rmax {
					out = append(out, [3]int{n0, n1, n2})
				}
			}
		}
	}
	return out
}

// phase returns exp(i 2π f·n), the factor exp(i q·R) of the cell R = Σ n_i a_i for reduced q.
func phase(f grid.Vec3, n [3]int) complex128 {
	x := f[0]*float64(n[0]) + f[1]*float64(n[1]) + f[2]*float64(n[2])
	// Reduce first so that C(q + G) = C(q) holds to rounding of the fractional part.
	x -= math.Round(x)
	s, c := math.Sincos(2 * math.Pi * x)
	return complex(c, s)
}
