package longrange

import (
	"fmt"
	"math"

	"lamina/grid"
)

// sheetScreening is the in-plane electronic screening of a sheet (Keldysh type; Cudazzo, Tokatly
// & Rubio, Phys. Rev. B 84, 085406 (2011); shared PHYSICS.md section 5):
//
//	ε∥(K) = ε_env + 2π|K| K̂·α∥·K̂ = ε_env + (K·r∥·K)/|K|,  r∥ = 2π α∥ = c (ε∥^cell − 1)/2,
//
// with ε∥^cell the in-plane 2×2 block of the simulation cell's dielectric tensor and c the cell
// height. It enters the in-plane (K·Z)(K·Z) part of the sheet kernel as the correction
//
//	ΔC = (2π k_e/A) Σ_G erfc(K/2Λ) (K·Z_κ)_α (K·Z_κ')_β [1/(K ε∥(K)) − 1/K] e^{iK·(τ_κ−τ_κ')},
//
// leading order only, so its result depends on Λ. It is off (exactly zero) when r∥ = 0 and
// ε_env = 1.
type sheetScreening struct {
	on   bool
	rpar [2][2]float64 // Å
	env  float64
	pref float64 // 2π k_e/A
}

// minInPlaneEps is the smallest eigenvalue of the in-plane block of ε^cell accepted: a value below
// 1 means a negative sheet polarizability; 1e-6 below 1 is tolerated as input noise (it cannot make
// ε∥(K) vanish at any K the kernel reaches).
const minInPlaneEps = 1 - 1e-6

func newSheetScreening(eps grid.Mat3, height, env, pref float64) (sheetScreening, error) {
	a, b, d := eps[0][0], (eps[0][1]+eps[1][0])/2, eps[1][1]
	lo := (a+d)/2 - math.Hypot((a-d)/2, b)
	if lo < minInPlaneEps {
		return sheetScreening{}, fmt.Errorf("longrange: in-plane epsilon of the cell has eigenvalue %.6g < 1 (negative sheet polarizability)", lo)
	}
	s := sheetScreening{env: env, pref: pref}
	s.rpar = [2][2]float64{{height * (a - 1) / 2, height * b / 2}, {height * b / 2, height * (d - 1) / 2}}
	s.on = env != 1 || s.rpar != [2][2]float64{}
	return s, nil
}

// correction returns the coefficient of (K·Z_κ)_α (K·Z_κ')_β e^{iK·(τ_κ−τ_κ')} in ΔC for the
// in-plane K ≠ 0 of length kk: (2π k_e/A) erfc(K/2Λ) (1/ε∥(K) − 1)/K.
func (s *sheetScreening) correction(kv grid.Vec3, kk, lambda float64) float64 {
	krk := kv[0]*(s.rpar[0][0]*kv[0]+s.rpar[0][1]*kv[1]) + kv[1]*(s.rpar[1][0]*kv[0]+s.rpar[1][1]*kv[1])
	epar := s.env + krk/kk
	return s.pref * math.Erfc(kk/(2*lambda)) * (1/epar - 1) / kk
}
