package exact

import (
	"math"

	"lamina/grid"
	"lamina/grid/units"
)

// Bulk reciprocal kernel. Derived: the 3D Fourier transform of erf(ηd)/(√det ε · d),
// d = √(r·ε⁻¹·r), is 4π/(K·ε·K) · exp(−K·ε·K/4η²) (substitute r = ε^{1/2}s in the isotropic
// transform 4π/k² e^{−k²/4η²}). Two derivatives bring −K_γK_δ, so the term of K in
// −k_e Z_κᵀ S Z_κ' is
//
//	(4π k_e/Ω) (K·Z_κ)_α (K·Z_κ')_β / (K·ε·K) · exp(−K·ε·K/4η²) · e^{iK·(τ_κ − τ_κ')}.
//
// K = 0 is left out (the analytic part); its direction-dependent limit is nonAnalytic.
type bulkKernel struct {
	z    []grid.Mat3
	tau  []grid.Vec3
	eps  grid.Mat3
	eta  float64
	pref float64 // 4π k_e/Ω
	kcut float64
}

func newBulkKernel(s grid.Structure, z []grid.Mat3, eps grid.Mat3, lmin, eta float64) *bulkKernel {
	tau := make([]grid.Vec3, s.N())
	for i, a := range s.Atoms {
		tau[i] = a.Position
	}
	return &bulkKernel{
		z: z, tau: tau, eps: eps, eta: eta,
		pref: 4 * math.Pi * units.CoulombEVAngstrom / s.Lattice.Volume(),
		// K·ε·K ≥ λmin |K|².
		kcut: math.Sqrt(4 * eta * eta * recipCut / lmin),
	}
}

func (b *bulkKernel) kmax() float64 { return b.kcut }

func (b *bulkKernel) add(dst []complex128, k grid.Vec3, gamma bool) {
	if gamma {
		return
	}
	kek := b.eps.Quad(k)
	x := kek / (4 * b.eta * b.eta)
	if x > recipCut {
		return
	}
	c := b.pref * math.Exp(-x) / kek
	n := len(b.z)
	var vbuf [8]grid.Vec3
	var pbuf [8]complex128
	v, p := vbuf[:0], pbuf[:0]
	for i := 0; i < n; i++ {
		v = append(v, b.z[i].VecMul(k))
		p = append(p, cexp(k.Dot(b.tau[i])))
	}
	addOuter(dst, n, v, v, p, c)
}

// addOuter adds c · p_κ p*_κ' · u_κα w_κ'β to dst for every κ, κ', α, β.
func addOuter(dst []complex128, n int, u, w []grid.Vec3, p []complex128, c float64) {
	n3 := 3 * n
	for k := 0; k < n; k++ {
		for kp := 0; kp < n; kp++ {
			ph := p[k] * complex(real(p[kp]), -imag(p[kp])) * complex(c, 0)
			for a := 0; a < 3; a++ {
				row := dst[(3*k+a)*n3+3*kp:]
				for bb := 0; bb < 3; bb++ {
					row[bb] += ph * complex(u[k][a]*w[kp][bb], 0)
				}
			}
		}
	}
}

// addNonAnalytic adds the K → 0 limit along the Cartesian direction d (any length, not zero):
// (4π k_e/Ω) (d̂·Z_κ)_α (d̂·Z_κ')_β / (d̂·ε·d̂), the same for every pair (no phase at K = 0).
func (b *bulkKernel) addNonAnalytic(dst []complex128, d grid.Vec3) {
	n := len(b.z)
	v := make([]grid.Vec3, n)
	p := make([]complex128, n)
	for i := range v {
		v[i] = b.z[i].VecMul(d)
		p[i] = 1
	}
	addOuter(dst, n, v, v, p, b.pref/b.eps.Quad(d))
}

// sitePotentials returns the Coulomb potential Σ_{(κ',R)≠(κ,0)} q_κ'/|R + τ_κ' − τ_κ| at every
// site κ of a neutral bulk crystal of point charges q (in e/Å; multiply by k_e for eV), by the
// scalar Ewald sum: real-space erfc(ηr)/r, reciprocal (4π/Ω) Σ_{G≠0} e^{−G²/4η²}/G² |ρ(G)|
// terms, and the self term −2η/√π q_κ (the r → 0 value of erf(ηr)/r). The G = 0 term
// −π/(Ωη²) Σ q vanishes for a neutral cell. It serves the Madelung checks beside the
// force-constant sums.
func sitePotentials(s grid.Structure, q []float64, eta float64) []float64 {
	lat := s.Lattice.Vectors
	recip := s.Lattice.Reciprocal()
	omega := s.Lattice.Volume()
	n := s.N()
	out := make([]float64, n)
	for k := 0; k < n; k++ {
		for kp := 0; kp < n; kp++ {
			delta := s.Atoms[kp].Position.Sub(s.Atoms[k].Position)
			for _, c := range latticeCells(lat, recip, 3, delta, realCut/eta) {
				if k == kp && c == [3]int{} {
					continue
				}
				r := lat.VecMul(grid.Vec3{float64(c[0]), float64(c[1]), float64(c[2])}).Add(delta).Norm()
				out[k] += q[kp] * math.Erfc(eta*r) / r
			}
		}
		out[k] -= 2 * eta / math.SqrtPi * q[k]
	}
	gmax := math.Sqrt(4 * eta * eta * recipCut)
	var lim [3]int
	for i := 0; i < 3; i++ {
		lim[i] = int(gmax*grid.Vec3(lat[i]).Norm()/(2*math.Pi)) + 1
	}
	for n0 := -lim[0]; n0 <= lim[0]; n0++ {
		for n1 := -lim[1]; n1 <= lim[1]; n1++ {
			for n2 := -lim[2]; n2 <= lim[2]; n2++ {
				if n0 == 0 && n1 == 0 && n2 == 0 {
					continue
				}
				g := recip.VecMul(grid.Vec3{float64(n0), float64(n1), float64(n2)})
				g2 := g.Dot(g)
				if g2/(4*eta*eta) > recipCut {
					continue
				}
				w := 4 * math.Pi / omega * math.Exp(-g2/(4*eta*eta)) / g2
				for k := 0; k < n; k++ {
					// Σ_κ' q_κ' cos(G·(τ_κ' − τ_κ)): the potential is real.
					for kp := 0; kp < n; kp++ {
						out[k] += w * q[kp] * math.Cos(g.Dot(s.Atoms[kp].Position.Sub(s.Atoms[k].Position)))
					}
				}
			}
		}
	}
	return out
}
