package exact

import (
	"math"

	"lamina/grid"
	"lamina/grid/units"
)

// Sheet reciprocal kernel. Poisson summation over the 2D lattice turns the smooth part into
// (1/A) Σ_K ĝ(K, z) e^{−iK·x∥} with x = R + τ_κ' − τ_κ and z = z_κ' − z_κ, ĝ the in-plane transform
// at height z (slabquad.go). In-plane derivatives bring −iK_a, the z derivatives act on ĝ, so
// with v_κ = K·Z_κ (in-plane rows, (K·Z)_β = Σ_a K_a Z_{aβ}) and w_κ = Z_{κ,z·} the term of K in
// −k_e Z_κᵀ S Z_κ' is
//
//	(k_e/A) e^{iK·(τ_κ−τ_κ')} [ ĝ v_κα v_κ'β + i ∂_zĝ (v_κα w_κ'β + w_κα v_κ'β) − ∂_z²ĝ w_κα w_κ'β ].
//
// At K = 0 only the last term survives and is finite; it is kept at q = 0 too, since the 2D sum
// is continuous at Γ.
type sheetKernel struct {
	z    []grid.Mat3
	tau  []grid.Vec3
	rule *slabRule
	pref float64   // k_e/A
	hz   []float64 // distinct |z_κ' − z_κ|
	pair []int     // index into hz of the pair (κ, κ'), row-major
	kcut float64
}

func newSheetKernel(s grid.Structure, z []grid.Mat3, eta float64) *sheetKernel {
	n := s.N()
	sk := &sheetKernel{
		z:    z,
		tau:  make([]grid.Vec3, n),
		rule: newSlabRule(eta, slabPanel, slabNodes),
		pref: units.CoulombEVAngstrom / s.Lattice.Area(),
		pair: make([]int, n*n),
		kcut: 2 * eta * math.Sqrt(slabCut),
	}
	for i, a := range s.Atoms {
		sk.tau[i] = a.Position
	}
	for k := 0; k < n; k++ {
		for kp := 0; kp < n; kp++ {
			h := math.Abs(sk.tau[kp][2] - sk.tau[k][2])
			idx := -1
			for i, x := range sk.hz {
				if math.Abs(x-h) <= 1e-14*(1+h) {
					idx = i
					break
				}
			}
			if idx < 0 {
				idx = len(sk.hz)
				sk.hz = append(sk.hz, h)
			}
			sk.pair[k*n+kp] = idx
		}
	}
	return sk
}

func (s *sheetKernel) kmax() float64 { return s.kcut }

func (s *sheetKernel) add(dst []complex128, k grid.Vec3, _ bool) {
	kn := math.Hypot(k[0], k[1])
	if kn > s.kcut {
		return
	}
	n := len(s.z)
	var ibuf [16][3]float64
	ints := ibuf[:0]
	for _, h := range s.hz {
		a, b, c := s.rule.integrals(kn, h)
		ints = append(ints, [3]float64{a, b, c})
	}
	var vbuf, wbuf [8]grid.Vec3
	var pbuf [8]complex128
	v, w, p := vbuf[:0], wbuf[:0], pbuf[:0]
	for i := 0; i < n; i++ {
		v = append(v, s.z[i].VecMul(grid.Vec3{k[0], k[1], 0}))
		w = append(w, grid.Vec3(s.z[i][2]))
		p = append(p, cexp(k[0]*s.tau[i][0]+k[1]*s.tau[i][1]))
	}
	n3 := 3 * n
	for a := 0; a < n; a++ {
		for b := 0; b < n; b++ {
			in := ints[s.pair[a*n+b]]
			z := s.tau[b][2] - s.tau[a][2]
			g, gz, gzz := slabFromIntegrals(in[0], in[1], in[2], z)
			ph := p[a] * complex(real(p[b]), -imag(p[b])) * complex(s.pref, 0)
			for al := 0; al < 3; al++ {
				row := dst[(3*a+al)*n3+3*b:]
				for be := 0; be < 3; be++ {
					re := g*v[a][al]*v[b][be] - gzz*w[a][al]*w[b][be]
					im := gz * (v[a][al]*w[b][be] + w[a][al]*v[b][be])
					row[be] += ph * complex(re, im)
				}
			}
		}
	}
}
