package exact

import (
	"math"

	"lamina/grid"
	"lamina/grid/units"
)

// Ewald split shared by the bulk and sheet lattice sums.
//
// The pair sum S_{κκ'}(q) = Σ_R' ∂_γ∂_δ φ(R + τ_κ' − τ_κ) e^{iq·R} (R = 0 left out for κ = κ')
// is split with 1/d = erfc(ηd)/d + erf(ηd)/d: the first part is summed over R in real space
// (cached once per model, since only the phase depends on q), the second over K = q + G in
// reciprocal space (Poisson summation: Σ_R f(R + x) e^{iq·R} = (1/Ω) Σ_K f̂(K) e^{−iK·x}, so
// derivatives along x bring −iK and the phase is e^{iK·(τ_κ − τ_κ')}), and the R = 0 value of the
// smooth part is removed for κ = κ'. The contribution to C is −k_e Z_κᵀ S_{κκ'} Z_κ'. The bulk
// and sheet cases differ only in the reciprocal kernel (recipKernel).

const (
	// realCut is η·d at which the real-space sum stops: erfc(6.5) ≈ 4e-20, and the
	// accompanying Gaussian e^{−42} ≈ 6e-19, both below rounding of the nearest-neighbour terms.
	realCut = 6.5
	// recipCut bounds K·ε·K/4η² in the bulk reciprocal sum, e^{−42} ≈ 6e-19 (the sheet uses
	// slabCut, the same value, in the t-integral).
	recipCut = 42.0
)

// realTerm is one cached real-space term: the contracted tensor −k_e Z_κᵀ H Z_κ' of the pair
// (k, kp) in cell cells[cell], to be multiplied by exp(i q·R).
type realTerm struct {
	k, kp, cell int
	f           [3][3]float64
}

// recipKernel adds the reciprocal-space terms of one K = q + G to dst (3N×3N). gamma reports
// that K is exactly zero (q ≡ 0 modulo G and G = −q).
type recipKernel interface {
	add(dst []complex128, k grid.Vec3, gamma bool)
	// kmax is the largest |K| the kernel can need; a G-vector beyond it is skipped.
	kmax() float64
}

// ewald holds the parts of a Coulomb lattice sum that do not depend on q.
type ewald struct {
	n        int
	periodic int       // 3 for bulk, 2 for a sheet
	recip    grid.Mat3 // reciprocal vectors as rows (in-plane ones for a sheet)
	lat      grid.Mat3
	cells    [][3]int
	terms    []realTerm
	kernel   recipKernel
}

// newEwaldReal builds the real-space cache: every pair (κ, κ') and cell R with
// d(R + τ_κ' − τ_κ) ≤ realCut/η, plus the self term of each κ, in the metric g = ε⁻¹ with
// prefactor 1/√det ε (g = 1, prefactor 1 for a sheet).
func newEwaldReal(s grid.Structure, z []grid.Mat3, recip grid.Mat3, periodic int, g grid.Mat3, pref, lmax, eta float64) ewald {
	n := s.N()
	lat := s.Lattice.Vectors
	e := ewald{n: n, periodic: periodic, recip: recip, lat: lat}
	index := map[[3]int]int{}
	cellIndex := func(c [3]int) int {
		i, ok := index[c]
		if !ok {
			i = len(e.cells)
			index[c] = i
			e.cells = append(e.cells, c)
		}
		return i
	}
	ke := units.CoulombEVAngstrom
	// |r|² ≤ λmax(ε)·d², so |r| ≤ dmax·√lmax with lmax = λmax(ε) bounds the search.
	dmax := realCut / eta
	for k := 0; k < n; k++ {
		for kp := 0; kp < n; kp++ {
			delta := s.Atoms[kp].Position.Sub(s.Atoms[k].Position)
			for _, c := range latticeCells(lat, recip, periodic, delta, dmax*math.Sqrt(lmax)) {
				if k == kp && c == [3]int{} {
					continue
				}
				r := lat.VecMul(grid.Vec3{float64(c[0]), float64(c[1]), float64(c[2])}).Add(delta)
				if math.Sqrt(r.Dot(g.MulVec(r))) > dmax {
					continue
				}
				h := erfcHessian(r, g, eta).Scale(pref)
				e.terms = append(e.terms, realTerm{k: k, kp: kp, cell: cellIndex(c), f: contract(z[k], h, z[kp], -ke)})
			}
		}
		// Self term: S_κκ loses the R = 0 value of the smooth part that the reciprocal sum holds.
		h := selfHessian(g, eta).Scale(-pref)
		e.terms = append(e.terms, realTerm{k: k, kp: k, cell: cellIndex([3]int{}), f: contract(z[k], h, z[k], -ke)})
	}
	return e
}

// contract returns s·Zaᵀ H Zb, that is s Σ_γδ Za[γ][α] H[γ][δ] Zb[δ][β] at [α][β].
func contract(za, h, zb grid.Mat3, s float64) [3][3]float64 {
	return za.T().Mul(h).Mul(zb).Scale(s)
}

// addPairs adds the Coulomb pair sums −k_e Z_κᵀ S_{κκ'}(q) Z_κ' for reduced q to dst.
func (e *ewald) addPairs(dst []complex128, f grid.Vec3) {
	if e.periodic == 2 {
		f[2] = 0
	}
	n3 := 3 * e.n
	ph := make([]complex128, len(e.cells))
	for i, c := range e.cells {
		ph[i] = phase(f, c)
	}
	for _, t := range e.terms {
		p := ph[t.cell]
		row := 3 * t.k
		col := 3 * t.kp
		for a := 0; a < 3; a++ {
			for b := 0; b < 3; b++ {
				dst[(row+a)*n3+col+b] += p * complex(t.f[a][b], 0)
			}
		}
	}
	e.addRecip(dst, f)
}

// addRecip runs the kernel over every K = q + G with |K| ≤ kmax.
func (e *ewald) addRecip(dst []complex128, f grid.Vec3) {
	kmax := e.kernel.kmax()
	var lo, hi [3]int
	for i := 0; i < e.periodic; i++ {
		// m_i = K·a_i/2π, so |m_i| ≤ kmax |a_i|/2π.
		b := kmax*grid.Vec3(e.lat[i]).Norm()/(2*math.Pi) + 1e-9
		lo[i] = int(math.Ceil(-b - f[i]))
		hi[i] = int(math.Floor(b - f[i]))
	}
	for n0 := lo[0]; n0 <= hi[0]; n0++ {
		for n1 := lo[1]; n1 <= hi[1]; n1++ {
			for n2 := lo[2]; n2 <= hi[2]; n2++ {
				m := grid.Vec3{f[0] + float64(n0), f[1] + float64(n1), f[2] + float64(n2)}
				gamma := m == grid.Vec3{}
				k := e.recip.VecMul(m)
				if k.Norm() > kmax {
					continue
				}
				e.kernel.add(dst, k, gamma)
			}
		}
	}
}

// cexp returns exp(i x).
func cexp(x float64) complex128 {
	s, c := math.Sincos(x)
	return complex(c, s)
}
