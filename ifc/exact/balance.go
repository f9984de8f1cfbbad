package exact

import (
	"errors"
	"fmt"
	"math"

	"gonum.org/v1/gonum/mat"

	"lamina/grid"
)

// Balancing couplings for point dipoles with non-symmetric charges.
//
// Central forces (springs, rigid ions) give force constants that are even in the bond vector,
// and two first-order conditions hold by themselves: (1) the off-site sum S_κ = Σ_{(κ',R)≠(κ,0)}
// Φ_{κκ'}(R) is symmetric, so the on-site block −S_κ of the acoustic sum rule keeps Φ Hermitian;
// (2) the first moment T_{αβγ} = Σ_{κκ'R} Φ_{κα,κ'β}(R) x_γ, x = R + τ_κ' − τ_κ, vanishes. Point
// dipoles with general Z_κ break both: Z_κᵀ H Z_κ' is not symmetric. T is antisymmetric in αβ
// (Hermiticity), and in the mass-weighted matrix it is the whole first-order term of the
// acoustic block, (i q_γ/Σ_κ M_κ) T_{αβγ}: with T ≠ 0 the acoustic branches start as ω² ≈ ±c|q|
// and one is imaginary near Γ. (T = 0 follows from rotational invariance: Born & Huang (1954),
// the conditions on the first moments of Φ.)
//
// The model therefore holds, on its spring bonds b (A in cell 0 to B in cell R, bond vector
// x_b), antisymmetric couplings W_b = [w_b]× (W v = w × v): Φ_{AB}(R) += W_b, Φ_{BA}(−R) += W_bᵀ.
// Their axial vectors w_b are the minimal-norm solution of the linear conditions
//
//	Σ_{b: A=κ} w_b − Σ_{b: B=κ} w_b = −a_κ      (a_κ the axial vector of the antisymmetric part of S_κ)
//	2 Σ_b w_b x_{b,γ} = −t_γ                    (t_γ the axial vector of T_{··γ}; γ in-plane for a sheet)
//
// after which S_κ is symmetric and T = 0 (both checked in balance_test.go). T of the Coulomb
// part is measured as ∂_γ Im Σ_{κκ'} C^atom(q) at q = 0 by central differences with Richardson
// extrapolation; the couplings are then part of the model, exact by definition. For rigid ions
// and springs a = t = 0 and no coupling is added.

// balanceStep is the finite-difference step in 1/Å (Richardson: h and h/2, error O(h⁴)).
const balanceStep = 2e-3

// balance returns the balancing couplings of model m (whose Coulomb caches and springs are
// built), or nil when none are needed.
func (m *Model) balance() ([]springTerm, error) {
	s := m.Structure
	n := s.N()
	sums, scale := m.offSiteSums()
	anti := make([]grid.Vec3, n)
	for k, sk := range sums {
		anti[k] = axial(sk)
	}
	dims := s.Lattice.Periodic()
	t := make([]grid.Vec3, dims)
	for g := 0; g < dims; g++ {
		var e grid.Vec3
		e[g] = 1
		d1 := m.momentDiff(e, balanceStep)
		d2 := m.momentDiff(e, balanceStep/2)
		t[g] = axial(d2.Scale(4.0 / 3).Add(d1.Scale(-1.0 / 3)))
	}
	// Right-hand side; rows 0..3(N−1)−1 are the per-atom conditions (the last atom's follow from
	// the others since Σ_κ a_κ = 0), then 3 rows per direction γ.
	rows := 3*(n-1) + 3*dims
	rhs := make([]float64, rows)
	big := 0.0
	for k := 0; k < n-1; k++ {
		for r := 0; r < 3; r++ {
			rhs[3*k+r] = -anti[k][r]
			big = math.Max(big, math.Abs(anti[k][r]))
		}
	}
	for g := 0; g < dims; g++ {
		for r := 0; r < 3; r++ {
			rhs[3*(n-1)+3*g+r] = -t[g][r]
			big = math.Max(big, math.Abs(t[g][r]))
		}
	}
	// Rigid ions: a and t vanish to rounding (and to the O(h⁴) error of t).
	if big <= 1e-9*math.Max(scale, 1) {
		return nil, nil
	}
	nb := len(m.springs)
	if nb == 0 {
		return nil, errors.New("non-symmetric Born charges need springs to carry the balancing couplings")
	}
	a := mat.NewDense(rows, 3*nb, nil)
	for i, sp := range m.springs {
		x := s.Lattice.Point(sp.cell).Add(s.Atoms[sp.b].Position).Sub(s.Atoms[sp.a].Position)
		for r := 0; r < 3; r++ {
			if sp.a < n-1 {
				a.Set(3*sp.a+r, 3*i+r, a.At(3*sp.a+r, 3*i+r)+1)
			}
			if sp.b < n-1 {
				a.Set(3*sp.b+r, 3*i+r, a.At(3*sp.b+r, 3*i+r)-1)
			}
			for g := 0; g < dims; g++ {
				a.Set(3*(n-1)+3*g+r, 3*i+r, 2*x[g])
			}
		}
	}
	var w mat.VecDense
	b := mat.NewVecDense(rows, rhs)
	if err := w.SolveVec(a, b); err != nil {
		return nil, fmt.Errorf("balancing couplings: %w", err)
	}
	var res mat.VecDense
	res.MulVec(a, &w)
	res.SubVec(&res, b)
	if r := mat.Norm(&res, math.Inf(1)); r > 1e-10*big {
		return nil, fmt.Errorf("the spring bonds cannot balance the non-symmetric Born charges (residual %.3g of %.3g): add bonds in more directions", r, big)
	}
	out := make([]springTerm, nb)
	for i, sp := range m.springs {
		wv := grid.Vec3{w.AtVec(3 * i), w.AtVec(3*i + 1), w.AtVec(3*i + 2)}
		// addSprings adds −k, so store −W.
		out[i] = springTerm{a: sp.a, b: sp.b, cell: sp.cell, k: cross(wv).Scale(-1)}
	}
	return out, nil
}

// momentDiff returns [Im M(h e) − Im M(−h e)]/2h for the Cartesian direction e, with
// M(q) = Σ_{κκ'} C^atom_{κκ'}(q) of the Coulomb part and springs (no fixed blocks).
func (m *Model) momentDiff(e grid.Vec3, h float64) grid.Mat3 {
	plus := m.atomSum(e.Scale(h))
	minus := m.atomSum(e.Scale(-h))
	return plus.Add(minus.Scale(-1)).Scale(1 / (2 * h))
}

// atomSum returns Im Σ_{κκ'} C_{κκ'}(q) e^{iq·(τ_κ' − τ_κ)} for Cartesian q.
func (m *Model) atomSum(q grid.Vec3) grid.Mat3 {
	s := m.Structure
	n := s.N()
	n3 := 3 * n
	c := make([]complex128, 9*n*n)
	m.addOffSite(c, m.reduced(q))
	var out grid.Mat3
	for k := 0; k < n; k++ {
		for kp := 0; kp < n; kp++ {
			ph := cexp(q.Dot(s.Atoms[kp].Position.Sub(s.Atoms[k].Position)))
			for a := 0; a < 3; a++ {
				for b := 0; b < 3; b++ {
					out[a][b] += imag(c[(3*k+a)*n3+3*kp+b] * ph)
				}
			}
		}
	}
	return out
}

// reduced returns the reduced coordinates of a Cartesian q (in-plane for a sheet).
func (m *Model) reduced(q grid.Vec3) grid.Vec3 {
	l := m.Structure.Lattice
	if l.Periodicity == grid.Sheet {
		return grid.Vec3{q.Dot(l.A(0)) / (2 * math.Pi), q.Dot(l.A(1)) / (2 * math.Pi), 0}
	}
	return l.Reduced(q)
}

// axial returns the axial vector w of the antisymmetric part X of m: X v = w × v.
func axial(m grid.Mat3) grid.Vec3 {
	return grid.Vec3{(m[2][1] - m[1][2]) / 2, (m[0][2] - m[2][0]) / 2, (m[1][0] - m[0][1]) / 2}
}

// cross returns [w]×, the matrix of v ↦ w × v.
func cross(w grid.Vec3) grid.Mat3 {
	return grid.Mat3{{0, -w[2], w[1]}, {w[2], 0, -w[0]}, {-w[1], w[0], 0}}
}
