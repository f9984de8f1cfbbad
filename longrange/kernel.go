package longrange

import (
	"errors"
	"fmt"
	"math"
	"strings"

	"lamina/grid"
	"lamina/grid/units"
)

// Kind selects the long-range kernel.
type Kind int

const (
	// Kernel3D is the Gonze–Lee dipole–dipole Ewald sum of a bulk crystal.
	Kernel3D Kind = iota
	// Kernel2D is the height-aware point-dipole kernel of a sheet, with its in-plane screening
	// correction.
	Kernel2D
)

// String returns "3d" or "2d".
func (k Kind) String() string {
	switch k {
	case Kernel3D:
		return "3d"
	case Kernel2D:
		return "2d"
	}
	return fmt.Sprintf("Kind(%d)", int(k))
}

// ParseKind parses "3d" or "2d" (any case).
func ParseKind(s string) (Kind, error) {
	switch strings.ToLower(s) {
	case "3d":
		return Kernel3D, nil
	case "2d":
		return Kernel2D, nil
	}
	return 0, fmt.Errorf("longrange: unknown kernel kind %q (valid: 2d, 3d)", s)
}

func (k Kind) dims() int {
	if k == Kernel2D {
		return 2
	}
	return 3
}

// maxReciprocal caps the number of reciprocal vectors a kernel may precompute, so that an absurd Λ
// is an error rather than an exhausted memory.
const maxReciprocal = 1 << 20

type options struct {
	lambda float64 // 0: DefaultLambda
	env    float64
}

// Option configures New. Options validate their values; New returns their errors.
type Option func(*options) error

// WithLambda sets the range-separation parameter Λ in 1/Å (default DefaultLambda). It must be
// positive and finite. Larger Λ costs more reciprocal vectors (their number grows as Λ³ in 3D and
// Λ² in 2D); smaller Λ leaves more of the dipole interaction to the real-space remainder.
func WithLambda(lambda float64) Option {
	return func(o *options) error {
		if !(lambda > 0) || math.IsInf(lambda, 1) {
			return fmt.Errorf("longrange: lambda %g 1/Å is not positive and finite", lambda)
		}
		o.lambda = lambda
		return nil
	}
}

// WithEnvironment sets ε_env = (ε_above + ε_below)/2 of the media around a sheet (default 1,
// free-standing). It must be positive and finite (physical media have ε_env ≥ 1). It enters only
// the in-plane screening correction of Kernel2D; for Kernel3D any value other than 1 is an error.
func WithEnvironment(epsEnv float64) Option {
	return func(o *options) error {
		if !(epsEnv > 0) || math.IsInf(epsEnv, 1) {
			return fmt.Errorf("longrange: environment permittivity %g is not positive and finite", epsEnv)
		}
		o.env = epsEnv
		return nil
	}
}

// Kernel evaluates the analytic long-range part C^LR(q) of the dynamical matrix (shared PHYSICS.md
// section 5). It owns its work buffers: not safe for concurrent use, give each worker its own (New
// is cheap).
type Kernel struct {
	kind   Kind
	lambda float64
	geo    geometry
	gs     []grid.Vec3 // reciprocal vectors (in-plane for Kernel2D)
	tau    []grid.Vec3
	z      []grid.Mat3
	eps    grid.Mat3
	pref   float64   // 4π k_e/Ω (3D) or k_e/A (2D)
	asr    []float64 // 3N×3N real symmetric constant subtracted from every C^LR(q)

	buf  []complex128 // raw sum, upper triangle
	x, y []complex128 // per-atom vectors of the current K (y: Kernel2D only)

	// Kernel2D only.
	pairs         []atomPair
	dz            []float64 // distinct |z_κ' − z_κ|
	sg, sdg, sd2g []float64 // per dz, scaled by pref: ĝ, ∂_zĝ, ∂_z²ĝ at the current K
	screen        sheetScreening
}

// New returns the long-range kernel of kind k for the structure s with Born charges and dielectric
// tensor c, choosing Λ = DefaultLambda(s, c.Epsilon, mesh, k) unless WithLambda says otherwise.
//
// It checks, and reports together: s (Structure.Validate), c (one finite tensor per atom, ε
// symmetric positive definite), the mesh, the kind (Kernel2D needs a Sheet lattice) and the
// options (Kernel3D takes no environment); then, for Kernel2D, that the in-plane block of ε^cell
// has no eigenvalue below 1, and that Λ does not need more than about 10⁶ reciprocal vectors. The charges need not sum to zero, but a non-neutral set breaks the physics
// of both kernels (a uniform translation then creates a dipole); callers should apply
// Charges.Neutralize first and report what it removed.
//
// New precomputes the reciprocal vectors (enough for any q once folded, see Add) and the constant
// acoustic-sum-rule matrix: with T_κ = Σ_κ' C^raw_{κκ'}(q = 0) (3×3 blocks, real), the kernel
// subtracts from every C^raw(q) the real symmetric matrix D with D_κκ = (T_κ + T_κᵀ)/2 and
// D_κκ' = (A_κ − A_κ')/N for κ ≠ κ', A_κ = (T_κ − T_κᵀ)/2. Its block row sums are T_κ, so
// Σ_κ' C^LR_{κκ'}(0) = 0, and it keeps C^LR Hermitian. When every T_κ is symmetric (any
// neutral two-atom cell, or by site symmetry) this is the Gonze–Lee term "minus, for κ = κ', the
// same sum at q = 0 over κ″" exactly; a non-symmetric T_κ (three or more atoms with general Z)
// would make that literal term non-Hermitian, and its antisymmetric part is moved to the
// off-diagonal blocks instead. Any q-independent real symmetric constant is harmless for the
// interpolation, which subtracts and adds back the same C^LR.
func New(s grid.Structure, c Charges, mesh grid.Mesh, k Kind, opts ...Option) (*Kernel, error) {
	o := options{env: 1}
	var errs []error
	if k != Kernel3D && k != Kernel2D {
		errs = append(errs, fmt.Errorf("longrange: unknown kernel kind %d", int(k)))
	}
	if err := s.Validate(); err != nil {
		errs = append(errs, fmt.Errorf("longrange: %w", err))
	}
	if err := c.Validate(s.N()); err != nil {
		errs = append(errs, err)
	}
	if err := mesh.Validate(s.Lattice.Periodicity); err != nil {
		errs = append(errs, fmt.Errorf("longrange: %w", err))
	}
	if k == Kernel2D && s.Lattice.Periodicity != grid.Sheet {
		errs = append(errs, fmt.Errorf("longrange: the 2d kernel needs a sheet lattice, got periodicity %v", s.Lattice.Periodicity))
	}
	for _, opt := range opts {
		if opt == nil {
			continue
		}
		if err := opt(&o); err != nil {
			errs = append(errs, err)
		}
	}
	if k == Kernel3D && o.env != 1 {
		errs = append(errs, fmt.Errorf("longrange: environment permittivity %g applies to the 2d kernel only", o.env))
	}
	if len(errs) > 0 {
		return nil, errors.Join(errs...)
	}

	kn := &Kernel{kind: k, lambda: o.lambda, eps: c.Epsilon, geo: newGeometry(s.Lattice, k.dims())}
	if kn.lambda == 0 {
		kn.lambda = DefaultLambda(s, c.Epsilon, mesh, k)
	}
	n := s.N()
	kn.tau = make([]grid.Vec3, n)
	for i, a := range s.Atoms {
		kn.tau[i] = a.Position
	}
	kn.z = append([]grid.Mat3(nil), c.Z...)
	metric := c.Epsilon
	ke := units.CoulombEVAngstrom
	if k == Kernel2D {
		metric = grid.Identity()
		area := s.Lattice.Area()
		kn.pref = ke / area
		scr, err := newSheetScreening(c.Epsilon, s.Lattice.Height(), o.env, 2*math.Pi*ke/area)
		if err != nil {
			return nil, err
		}
		kn.screen = scr
		kn.pairs, kn.dz = sheetPairs(kn.tau)
		kn.sg = make([]float64, len(kn.dz))
		kn.sdg = make([]float64, len(kn.dz))
		kn.sd2g = make([]float64, len(kn.dz))
		kn.y = make([]complex128, 3*n)
	} else {
		kn.pref = 4 * math.Pi * ke / s.Lattice.Volume()
	}
	if est := reciprocalCount(kn.geo, s.Lattice, metric, kn.lambda); est > maxReciprocal {
		return nil, fmt.Errorf("longrange: lambda %g 1/Å needs about %.3g reciprocal vectors (limit %d): choose a smaller lambda", kn.lambda, est, maxReciprocal)
	}
	kn.gs = reciprocalList(kn.geo, metric, kn.lambda, gaussCut, kn.geo.qZone)
	kn.x = make([]complex128, 3*n)
	kn.buf = make([]complex128, 9*n*n)
	kn.raw(grid.Vec3{}, true, grid.Vec3{})
	kn.asr = asrMatrix(kn.buf, n)
	return kn, nil
}

// reciprocalCount estimates how many vectors reciprocalList will return: the ε-ball volume over
// the reciprocal cell volume.
func reciprocalCount(geo geometry, l grid.Lattice, metric grid.Mat3, lambda float64) float64 {
	r := 2*lambda*math.Sqrt(gaussCut) + math.Sqrt(maxEigenSym3(metric))*geo.qZone
	if geo.dims == 2 {
		return math.Pi * r * r * l.Area() / (4 * math.Pi * math.Pi)
	}
	return 4 * math.Pi / 3 * r * r * r / math.Sqrt(math.Abs(metric.Det())) * l.Volume() / (8 * math.Pi * math.Pi * math.Pi)
}

// asrMatrix builds the constant D described at New from the raw q = 0 sum in the upper triangle of
// buf.
func asrMatrix(buf []complex128, n int) []float64 {
	m := 3 * n
	full := func(i, j int) float64 {
		if j < i {
			i, j = j, i
		}
		return real(buf[i*m+j])
	}
	t := make([]grid.Mat3, n)
	for a := 0; a < n; a++ {
		for al := 0; al < 3; al++ {
			for b := 0; b < n; b++ {
				for be := 0; be < 3; be++ {
					t[a][al][be] += full(3*a+al, 3*b+be)
				}
			}
		}
	}
	d := make([]float64, m*m)
	anti := make([]grid.Mat3, n)
	for a := 0; a < n; a++ {
		for al := 0; al < 3; al++ {
			for be := 0; be < 3; be++ {
				d[(3*a+al)*m+3*a+be] = (t[a][al][be] + t[a][be][al]) / 2
				anti[a][al][be] = (t[a][al][be] - t[a][be][al]) / 2
			}
		}
	}
	for a := 0; a < n; a++ {
		for b := 0; b < n; b++ {
			if a == b {
				continue
			}
			for al := 0; al < 3; al++ {
				for be := 0; be < 3; be++ {
					d[(3*a+al)*m+3*b+be] = (anti[a][al][be] - anti[b][al][be]) / float64(n)
				}
			}
		}
	}
	return d
}

// Lambda returns the range-separation parameter Λ in 1/Å.
func (k *Kernel) Lambda() float64 { return k.lambda }

// Kind returns the kernel's kind.
func (k *Kernel) Kind() Kind { return k.kind }

// Screening returns the in-plane screening length tensor r∥ = 2π α∥ = c (ε∥^cell − 1)/2 in Å (a
// 2×2 block, r∥·1 for an isotropic sheet) and ε_env of a Kernel2D; zero values for Kernel3D.
func (k *Kernel) Screening() (rpar [2][2]float64, epsEnv float64) {
	if k.kind != Kernel2D {
		return rpar, 0
	}
	return k.screen.rpar, k.screen.env
}

// Add adds alpha·C^LR(q) to dst: 3N×3N, row-major, index 3κ+α, in eV/Å², in the "cell" phase
// convention with exp(+iK·(τ_κ − τ_κ')), K = q + G. q is Cartesian in 1/Å and must be finite; it
// is folded into the parallelepiped of reduced coordinates in [−½, ½] first (C^LR is periodic in
// the reciprocal lattice). For Kernel2D only the in-plane part of q is used (its z component is
// dropped, which is also what a q from Lattice.Cartesian of a cell with tilted a3 needs).
//
// Kernel3D:
//
//	C^LR = (4π k_e/Ω) Σ_{K≠0} (K·Z_κ)_α (K·Z_κ')_β exp(−K·ε∞·K/4Λ²)/(K·ε∞·K) e^{iK·(τ_κ−τ_κ')} − D
//
// (Gonze & Lee, Phys. Rev. B 55, 10355 (1997)), cut at K·ε∞·K/4Λ² ≤ 50, D the acoustic-sum-rule
// constant of New. At Γ (every reduced coordinate of q within 1e-9 of an integer) the K = 0 term is
// left out when dir is zero (the analytic part, as first-principles codes give Γ); a non-zero
// Cartesian dir adds its limit along dir, (4π k_e/Ω)(d̂·Z_κ)_α(d̂·Z_κ')_β/(d̂·ε∞·d̂) (the
// non-analytic term for LO–TO splitting). Elsewhere dir is ignored.
//
// Kernel2D: the height-aware point-dipole sum over in-plane K (see ewald2d.go and PHYSICS.md §5),
// z = z_κ' − z_κ, including the K = 0 zz term 4√π Λ e^{−Λ²z²}(k_e/A) Z_{κ,zα} Z_{κ',zβ} (the 2D
// limit is continuous, dir is ignored), plus the screening correction when r∥ ≠ 0 or ε_env ≠ 1,
// minus D.
//
// The added matrix is exactly Hermitian (the upper triangle is computed and mirrored). Add panics
// if len(dst) ≠ 9N², and does not allocate.
func (k *Kernel) Add(dst []complex128, q, dir grid.Vec3, alpha float64) {
	m := 3 * len(k.tau)
	if len(dst) != m*m {
		panic(fmt.Sprintf("longrange: Add: len(dst) = %d, want %d for %d atoms", len(dst), m*m, len(k.tau)))
	}
	qf, gamma := k.geo.fold(q)
	k.raw(qf, gamma, dir)
	for i := 0; i < m; i++ {
		row := k.buf[i*m : (i+1)*m]
		drow := k.asr[i*m : (i+1)*m]
		v := real(row[i]) - drow[i]
		dst[i*m+i] += complex(alpha*v, 0)
		for j := i + 1; j < m; j++ {
			re, im := alpha*(real(row[j])-drow[j]), alpha*imag(row[j])
			dst[i*m+j] += complex(re, im)
			dst[j*m+i] += complex(re, -im)
		}
	}
}

// raw fills the upper triangle of k.buf with the uncorrected sum at the folded qf: the G-sum
// driver shared by both kinds, which differ only in the per-K term.
func (k *Kernel) raw(qf grid.Vec3, gamma bool, dir grid.Vec3) {
	clear(k.buf)
	for _, g := range k.gs {
		kv := qf.Add(g)
		switch k.kind {
		case Kernel3D:
			k.term3D(k.buf, kv)
		case Kernel2D:
			k.term2D(k.buf, kv)
		}
	}
	if k.kind == Kernel3D && gamma && dir != (grid.Vec3{}) {
		k.nonAnalytic3D(k.buf, dir)
	}
}
