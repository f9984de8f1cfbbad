package exact

import (
	"errors"
	"fmt"
	"math"

	"gonum.org/v1/gonum/mat"

	"lamina/grid"
)

// Model is an exactly solvable model crystal: point charges or point dipoles (Born charges Z,
// in a medium of dielectric tensor Epsilon for bulk) coupled by the Coulomb law to every other
// ion, plus springs. Build one with New or a catalogue constructor; its fields are for reading
// (see the package documentation on concurrency).
type Model struct {
	// Name labels the model, e.g. "sheet-AB".
	Name string
	// Structure is the crystal. For a sheet the lattice has Periodicity grid.Sheet and
	// a3 = (0, 0, c), c a simulation-cell height that enters nothing but Ω = A·c.
	Structure grid.Structure
	// Z holds the Born charges, Z[κ][α][β] = dipole α per displacement β (e); nil for a
	// springs-only model.
	Z []grid.Mat3
	// Epsilon is the dielectric tensor ε∞ of the medium (bulk); the unit matrix for rigid ions
	// in vacuum and for sheets.
	Epsilon grid.Mat3
	// Springs are the short-range bonds.
	Springs []Spring

	eta     float64
	coul    *ewald
	bulk    *bulkKernel // nil for a sheet or without charges
	springs []springTerm
	// balancing holds the antisymmetric bond couplings of non-symmetric charges (balance.go).
	balancing []springTerm
	// fixed holds the on-site blocks from the acoustic sum rule.
	fixed []float64
}

// New validates the data and builds a model, computing its Ewald caches and its on-site
// blocks. z may be nil (springs only). eps must be symmetric positive definite, and the unit
// matrix for a sheet (only sheets in vacuum are modelled). The charges must be neutral.
func New(name string, s grid.Structure, z []grid.Mat3, eps grid.Mat3, springs []Spring) (*Model, error) {
	return newModel(name, s, z, eps, springs, 0)
}

// newModel is New with an explicit Ewald parameter η (1/Å); eta ≤ 0 picks the default.
func newModel(name string, s grid.Structure, z []grid.Mat3, eps grid.Mat3, springs []Spring, eta float64) (*Model, error) {
	if err := s.Validate(); err != nil {
		return nil, fmt.Errorf("exact: %s: %w", name, err)
	}
	n := s.N()
	sheet := s.Lattice.Periodicity == grid.Sheet
	var errs []error
	if z != nil && len(z) != n {
		errs = append(errs, fmt.Errorf("%d Born charge tensors for %d atoms", len(z), n))
	}
	var total grid.Mat3
	scale := 0.0
	for _, zk := range z {
		total = total.Add(zk)
		for a := 0; a < 3; a++ {
			for b := 0; b < 3; b++ {
				if !finite(zk[a][b]) {
					errs = append(errs, errors.New("born charges are not finite"))
				}
				scale = math.Max(scale, math.Abs(zk[a][b]))
			}
		}
	}
	for a := 0; a < 3; a++ {
		for b := 0; b < 3; b++ {
			if math.Abs(total[a][b]) > 1e-12*math.Max(scale, 1) {
				errs = append(errs, fmt.Errorf("born charges are not neutral (sum[%d][%d] = %g)", a, b, total[a][b]))
			}
		}
	}
	lmin, lmax, err := symEigenRange(eps)
	if err != nil {
		errs = append(errs, err)
	} else if !(lmin > 0) {
		errs = append(errs, fmt.Errorf("epsilon is not positive definite (min eigenvalue %.4g)", lmin))
	}
	if sheet && eps != grid.Identity() {
		errs = append(errs, errors.New("epsilon of a sheet must be the unit matrix (sheets are modelled in vacuum)"))
	}
	for i, sp := range springs {
		switch {
		case sp.A < 0 || sp.A >= n || sp.B < 0 || sp.B >= n:
			errs = append(errs, fmt.Errorf("spring %d joins atoms %d and %d of %d", i, sp.A, sp.B, n))
		case sheet && sp.Cell[2] != 0:
			errs = append(errs, fmt.Errorf("spring %d of a sheet has cell %v with a3 component", i, sp.Cell))
		case !finite(sp.Longitudinal) || !finite(sp.Transverse):
			errs = append(errs, fmt.Errorf("spring %d has non-finite force constants", i))
		case bondVector(s, sp).Norm() < 1e-6:
			errs = append(errs, fmt.Errorf("spring %d has zero length", i))
		}
	}
	if len(errs) > 0 {
		return nil, fmt.Errorf("exact: %s: %w", name, errors.Join(errs...))
	}

	m := &Model{Name: name, Structure: s, Epsilon: eps}
	if z != nil {
		m.Z = append([]grid.Mat3(nil), z...)
	}
	m.Springs = append([]Spring(nil), springs...)
	for _, sp := range springs {
		m.springs = append(m.springs, springTerm{a: sp.A, b: sp.B, cell: sp.Cell,
			k: springBlock(bondVector(s, sp), sp.Longitudinal, sp.Transverse)})
	}
	if m.Z != nil {
		m.eta = eta
		if !(m.eta > 0) {
			m.eta = defaultEta(s, sheet)
		}
		if sheet {
			recip := inPlaneReciprocal(s.Lattice)
			e := newEwaldReal(s, m.Z, recip, 2, grid.Identity(), 1, 1, m.eta)
			e.kernel = newSheetKernel(s, m.Z, m.eta)
			m.coul = &e
		} else {
			g := eps.Inv()
			e := newEwaldReal(s, m.Z, s.Lattice.Reciprocal(), 3, g, 1/math.Sqrt(eps.Det()), lmax, m.eta)
			m.bulk = newBulkKernel(s, m.Z, eps, lmin, m.eta)
			e.kernel = m.bulk
			m.coul = &e
		}
		bal, err := m.balance()
		if err != nil {
			return nil, fmt.Errorf("exact: %s: %w", name, err)
		}
		m.balancing = bal
	}
	m.fixed = make([]float64, 9*n*n)
	m.sumRule()
	return m, nil
}

// defaultEta balances the real-space and reciprocal sums: √π/ℓ with ℓ = Ω^{1/3} (bulk) or √A
// (sheet). The real-space part is cached, so the choice mainly sets the per-q cost.
func defaultEta(s grid.Structure, sheet bool) float64 {
	if sheet {
		return math.SqrtPi / math.Sqrt(s.Lattice.Area())
	}
	return math.SqrtPi / math.Cbrt(s.Lattice.Volume())
}

// inPlaneReciprocal returns b1, b2 in the xy plane with b_i·a_j = 2π δ_ij for the in-plane
// vectors of a sheet (b3 = 0).
func inPlaneReciprocal(l grid.Lattice) grid.Mat3 {
	a1, a2 := l.A(0), l.A(1)
	det := a1[0]*a2[1] - a1[1]*a2[0]
	var b grid.Mat3
	b[0] = [3]float64{2 * math.Pi * a2[1] / det, -2 * math.Pi * a2[0] / det, 0}
	b[1] = [3]float64{-2 * math.Pi * a1[1] / det, 2 * math.Pi * a1[0] / det, 0}
	return b
}

// sumRule fills m.fixed with the on-site blocks −S_κ, S_κ = Σ_κ' P_κκ' the sum of the off-site
// blocks P at q = 0 (symmetric once the balancing couplings are in; symmetrized against rounding).
func (m *Model) sumRule() {
	n3 := 3 * m.Structure.N()
	sums, _ := m.offSiteSums()
	for k, sk := range sums {
		for a := 0; a < 3; a++ {
			for b := 0; b < 3; b++ {
				m.fixed[(3*k+a)*n3+3*k+b] = -(sk[a][b] + sk[b][a]) / 2
			}
		}
	}
}

// offSiteSums returns S_κ = Σ_κ' P_κκ'(q = 0), the real row sums of the off-site blocks, and
// the largest |entry| of those blocks.
func (m *Model) offSiteSums() ([]grid.Mat3, float64) {
	n := m.Structure.N()
	n3 := 3 * n
	p := make([]complex128, 9*n*n)
	m.addOffSite(p, grid.Vec3{})
	sums := make([]grid.Mat3, n)
	scale := 0.0
	for k := range sums {
		for kp := 0; kp < n; kp++ {
			for a := 0; a < 3; a++ {
				for b := 0; b < 3; b++ {
					v := real(p[(3*k+a)*n3+3*kp+b])
					sums[k][a][b] += v
					scale = math.Max(scale, math.Abs(v))
				}
			}
		}
	}
	return sums, scale
}

// addOffSite adds everything but the on-site blocks: Coulomb pair sums, springs and balancing
// couplings.
func (m *Model) addOffSite(dst []complex128, f grid.Vec3) {
	if m.coul != nil {
		m.coul.addPairs(dst, f)
	}
	addSprings(dst, m.Structure.N(), m.springs, f)
	addSprings(dst, m.Structure.N(), m.balancing, f)
}

// Matrix writes C(q) for reduced q into dst (length 9N², allocated when nil) and returns it, in
// eV/Å², "cell" phase, index 3κ+α (package documentation). dir is a Cartesian direction used
// only for bulk at q ≡ 0 modulo G: zero gives the analytic part, non-zero adds the
// non-analytic limit along dir. For a sheet q[2] and dir are ignored. It panics if dst has the
// wrong length.
func (m *Model) Matrix(dst []complex128, q grid.Vec3, dir grid.Vec3) []complex128 {
	n := m.Structure.N()
	if dst == nil {
		dst = make([]complex128, 9*n*n)
	} else if len(dst) != 9*n*n {
		panic(fmt.Sprintf("exact: Matrix dst has length %d, want %d", len(dst), 9*n*n))
	}
	for i, v := range m.fixed {
		dst[i] = complex(v, 0)
	}
	m.addOffSite(dst, q)
	if m.bulk != nil && dir != (grid.Vec3{}) && isGamma(q) {
		m.bulk.addNonAnalytic(dst, dir)
	}
	return dst
}

// isGamma reports whether every reduced component of q is an integer.
func isGamma(q grid.Vec3) bool {
	for _, x := range q {
		if x != math.Round(x) {
			return false
		}
	}
	return true
}

// Born returns copies of the Born charges (nil for a springs-only model) and of ε∞.
func (m *Model) Born() ([]grid.Mat3, grid.Mat3) {
	if m.Z == nil {
		return nil, m.Epsilon
	}
	return append([]grid.Mat3(nil), m.Z...), m.Epsilon
}

// symEigenRange returns the smallest and largest eigenvalue of the symmetric matrix e, or an
// error if e is not finite or not symmetric.
func symEigenRange(e grid.Mat3) (lmin, lmax float64, err error) {
	sc := 0.0
	for a := 0; a < 3; a++ {
		for b := 0; b < 3; b++ {
			if !finite(e[a][b]) {
				return 0, 0, errors.New("epsilon is not finite")
			}
			sc = math.Max(sc, math.Abs(e[a][b]))
		}
	}
	for a := 0; a < 3; a++ {
		for b := a + 1; b < 3; b++ {
			if math.Abs(e[a][b]-e[b][a]) > 1e-12*sc {
				return 0, 0, fmt.Errorf("epsilon is not symmetric ([%d][%d] = %g, [%d][%d] = %g)", a, b, e[a][b], b, a, e[b][a])
			}
		}
	}
	sym := mat.NewSymDense(3, []float64{e[0][0], e[0][1], e[0][2], e[0][1], e[1][1], e[1][2], e[0][2], e[1][2], e[2][2]})
	var es mat.EigenSym
	if !es.Factorize(sym, false) {
		return 0, 0, errors.New("epsilon: eigenvalue decomposition failed")
	}
	v := es.Values(nil)
	return v[0], v[2], nil
}
