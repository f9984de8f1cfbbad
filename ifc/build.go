package ifc

import (
	"errors"
	"fmt"
	"math"
	"math/cmplx"
	"sort"
	"strings"

	"lamina/grid"
)

// LongRange is the analytic long-range part of C(q) that Build subtracts from the grid
// matrices and the Evaluator adds back: Add adds alpha·C^LR(q) into dst (3N×3N, row-major, cell
// phase), for a Cartesian q in 1/Å and, at Γ in 3D, a Cartesian direction of approach (zero for
// the analytic part). *longrange.Kernel satisfies it.
type LongRange interface {
	Add(dst []complex128, q, dir grid.Vec3, alpha float64)
}

// Options configures Build.
type Options struct {
	// NewLongRange returns an independent long-range evaluator (Build calls it once, and every
	// Evaluator once, since such values keep per-call buffers). Nil means no long-range part.
	NewLongRange func() LongRange
	// SumRule selects the acoustic sum-rule correction. The zero value is SumRuleTranslational.
	SumRule SumRule
	// MatchTol is the largest |n_i f_i − round(n_i f_i)| accepted when matching an input q-point
	// to a grid point; zero means DefaultMatchTol.
	MatchTol float64
}

// DefaultMatchTol is the default q-point matching tolerance, in units of the grid spacing.
const DefaultMatchTol = 1e-4

// Sentinel errors of Build; the returned errors wrap them.
var (
	ErrShape      = errors.New("ifc: matrix shape")
	ErrOffGrid    = errors.New("ifc: q-point not on the grid")
	ErrDuplicate  = errors.New("ifc: grid point given twice")
	ErrIncomplete = errors.New("ifc: grid incomplete")
)

// term is one weighted real 3×3 block Φ(R)·w of an atom pair at lattice vector index v.
type term struct {
	v     int
	block [9]float64
}

// ForceConstants holds the short-range real-space force constants folded onto Wigner–Seitz
// images, the long-range part and the sum-rule correction. It is read-only after Build.
type ForceConstants struct {
	structure grid.Structure
	mesh      grid.Mesh
	cells     [][3]int  // distinct image lattice vectors, integer coordinates
	cellMin   [3]int    // smallest coordinate of cells along each axis
	cellSpan  [3]int    // number of coordinate values along each axis
	pairs     [][]term  // pairs[κ·N+κ'] terms
	asr       []float64 // 9N² real correction added to every C(q); nil when none
	newLR     func() LongRange
	diag      Diagnostics
}

// Build checks that samples cover the full grid exactly once, converts them to the cell phase,
// makes them Hermitian and consistent with C(−q) = C(q)*, subtracts the long-range part,
// transforms to real space, folds onto Wigner–Seitz images and applies the sum rule.
func Build(s grid.Structure, mesh grid.Mesh, phase Phase, samples []Sample, opt Options) (*ForceConstants, error) {
	n := s.N()
	dim := 3 * n
	switch {
	case n == 0:
		return nil, errors.New("ifc: structure has no atoms")
	case mesh.Validate(s.Lattice.Periodicity) != nil:
		return nil, fmt.Errorf("ifc: %w", mesh.Validate(s.Lattice.Periodicity))
	case opt.SumRule != SumRuleTranslational && opt.SumRule != SumRuleNone:
		return nil, fmt.Errorf("ifc: unknown sum rule %d", opt.SumRule)
	}
	tol := opt.MatchTol
	if tol <= 0 {
		tol = DefaultMatchTol
	}
	nq := mesh.Len()
	if nq > len(samples) {
		// Refuse before allocating per grid point: a huge grid with few matrices is a typo.
		if nq > 2*len(samples)+64 {
			return nil, fmt.Errorf("%w: the %d×%d×%d grid has %d points but only %d matrices are given", ErrIncomplete, mesh.N[0], mesh.N[1], mesh.N[2], nq, len(samples))
		}
	}
	mats := make([][]complex128, nq)
	from := make([]int, nq)
	var errs []error
	for i, smp := range samples {
		if len(smp.C) != dim*dim {
			errs = append(errs, fmt.Errorf("%w: qpoints[%d] has %d elements, want %d×%d", ErrShape, i, len(smp.C), dim, dim))
			continue
		}
		g, ok := mesh.Match(smp.Q, tol)
		if !ok {
			errs = append(errs, fmt.Errorf("%w: qpoints[%d] q = %v is not a point of the %d×%d×%d grid", ErrOffGrid, i, smp.Q, mesh.N[0], mesh.N[1], mesh.N[2]))
			continue
		}
		if mats[g] != nil {
			errs = append(errs, fmt.Errorf("%w: qpoints[%d] (q = %v) and qpoints[%d] name the same grid point %v", ErrDuplicate, from[g], samples[from[g]].Q, i, mesh.Point(g)))
			continue
		}
		c := make([]complex128, dim*dim)
		copy(c, smp.C)
		if phase == AtomPhase {
			toCellPhase(c, s, s.Lattice.Cartesian(smp.Q))
		}
		mats[g], from[g] = c, i
	}
	var missing []string
	for g, m := range mats {
		if m == nil {
			missing = append(missing, fmt.Sprintf("%v", mesh.Point(g)))
		}
	}
	if len(missing) > 0 {
		const show = 20
		list := missing
		if len(list) > show {
			list = append(list[:show:show], fmt.Sprintf("... (%d more)", len(missing)-show))
		}
		errs = append(errs, fmt.Errorf("%w: %d of %d grid points missing: %s", ErrIncomplete, len(missing), nq, strings.Join(list, ", ")))
	}
	if len(errs) > 0 {
		return nil, errors.Join(errs...)
	}

	fc := &ForceConstants{structure: s, mesh: mesh, newLR: opt.NewLongRange, pairs: make([][]term, n*n)}
	fc.diag.Scale = maxAbs(mats)
	fc.diag.Hermiticity, fc.diag.HermiticityQ = hermitize(mats, mesh)
	fc.diag.TimeReversal, fc.diag.TimeReversalQ = timeReverse(mats, mesh)

	if fc.newLR != nil {
		lr := fc.newLR()
		var zero grid.Vec3
		for g, m := range mats {
			lr.Add(m, s.Lattice.Cartesian(mesh.Point(g)), zero, -1)
		}
	}
	phi := transform(mats, mesh, dim, &fc.diag)
	fc.fold(phi)
	fc.diag.SumRule = sumRuleError(phi, n, nq)
	if opt.SumRule == SumRuleTranslational {
		fc.asr = translationalCorrection(phi, n, nq)
	}
	return fc, nil
}

// toCellPhase converts an "atom"-phase matrix in place: C = C^atom · exp(−i q·(τ_κ' − τ_κ)).
func toCellPhase(c []complex128, s grid.Structure, q grid.Vec3) {
	n := s.N()
	dim := 3 * n
	for k := 0; k < n; k++ {
		for k2 := 0; k2 < n; k2++ {
			ph := cmplx.Exp(complex(0, -q.Dot(s.Atoms[k2].Position.Sub(s.Atoms[k].Position))))
			for a := 0; a < 3; a++ {
				row := (3*k + a) * dim
				for b := 0; b < 3; b++ {
					c[row+3*k2+b] *= ph
				}
			}
		}
	}
}

func maxAbs(mats [][]complex128) float64 {
	m := 0.0
	for _, c := range mats {
		for _, v := range c {
			m = math.Max(m, cmplx.Abs(v))
		}
	}
	return m
}

// hermitize replaces every matrix by ½(C + C†) and returns the largest element removed and the
// grid index where it was.
func hermitize(mats [][]complex128, mesh grid.Mesh) (float64, int) {
	worst, at := 0.0, 0
	for g, c := range mats {
		dim := int(math.Sqrt(float64(len(c))))
		for i := 0; i < dim; i++ {
			for j := i; j < dim; j++ {
				a, b := c[i*dim+j], cmplx.Conj(c[j*dim+i])
				if d := cmplx.Abs(a-b) / 2; d > worst {
					worst, at = d, g
				}
				h := (a + b) / 2
				c[i*dim+j], c[j*dim+i] = h, cmplx.Conj(h)
			}
		}
	}
	return worst, at
}

// timeReverse makes C(−q) = C(q)* on the grid (C real where q ≡ −q) and returns the largest
// element removed and the grid index where it was.
func timeReverse(mats [][]complex128, mesh grid.Mesh) (float64, int) {
	worst, at := 0.0, 0
	for g := range mats {
		c := mesh.Coord(g)
		var mc [3]int
		for i := 0; i < 3; i++ {
			mc[i] = (mesh.N[i] - c[i]) % mesh.N[i]
		}
		h := mesh.Index(mc)
		if h < g {
			continue
		}
		a, b := mats[g], mats[h]
		for i := range a {
			avg := (a[i] + cmplx.Conj(b[i])) / 2
			if d := cmplx.Abs(a[i] - avg); d > worst {
				worst, at = d, g
			}
			a[i], b[i] = avg, cmplx.Conj(avg)
		}
	}
	return worst, at
}

// transform returns Φ(R) = (1/N_q) Σ_q C(q) exp(−i q·R) for every supercell vector R (flat mesh
// index), keeping the real part and recording the largest imaginary part in d. The sum is done
// one mesh axis at a time (exp(−2πi f·R) factorizes), in N_q·(n1+n2+n3)·dim² operations; mats
// is overwritten.
func transform(mats [][]complex128, mesh grid.Mesh, dim int, d *Diagnostics) [][]float64 {
	nq := mesh.Len()
	size := dim * dim
	for axis := 0; axis < 3; axis++ {
		n := mesh.N[axis]
		if n == 1 {
			continue
		}
		tw := make([]complex128, n)
		for k := range tw {
			s, c := math.Sincos(-2 * math.Pi * float64(k) / float64(n))
			tw[k] = complex(c, s)
		}
		out := make([]complex128, n*size)
		idx := make([]int, n)
		for g := 0; g < nq; g++ {
			c := mesh.Coord(g)
			if c[axis] != 0 {
				continue // each line once, from its first point
			}
			for m := 0; m < n; m++ {
				c[axis] = m
				idx[m] = mesh.Index(c)
			}
			for i := range out {
				out[i] = 0
			}
			for m := 0; m < n; m++ {
				src := mats[idx[m]]
				for r := 0; r < n; r++ {
					ph := tw[(m*r)%n]
					dst := out[r*size : (r+1)*size]
					for i, v := range src {
						dst[i] += v * ph
					}
				}
			}
			for r := 0; r < n; r++ {
				copy(mats[idx[r]], out[r*size:(r+1)*size])
			}
		}
	}
	phi := make([][]float64, nq)
	for r, c := range mats {
		p := make([]float64, size)
		for i, v := range c {
			v /= complex(float64(nq), 0)
			p[i] = real(v)
			if im := math.Abs(imag(v)); im > d.ImagPhi {
				d.ImagPhi = im
				d.ImagPhiAt = Location{Atom: i / dim / 3, Atom2: i % dim / 3, Cell: mesh.Coord(r)}
			}
		}
		phi[r] = p
	}
	return phi
}

// fold distributes Φ(R) over the Wigner–Seitz images of each (κ, κ', R).
func (fc *ForceConstants) fold(phi [][]float64) {
	s := fc.structure
	n := s.N()
	dim := 3 * n
	basis := superBasis(s.Lattice, fc.mesh)
	index := map[[3]int]int{}
	var imgs []wsImage
	for k := 0; k < n; k++ {
		for k2 := 0; k2 < n; k2++ {
			var list []term
			for r, p := range phi {
				imgs = foldImages(s.Lattice, basis, fc.mesh.Coord(r), s.Atoms[k].Position, s.Atoms[k2].Position, imgs)
				for _, im := range imgs {
					v, ok := index[im.cell]
					if !ok {
						v = len(fc.cells)
						index[im.cell] = v
						fc.cells = append(fc.cells, im.cell)
					}
					t := term{v: v}
					for a := 0; a < 3; a++ {
						for b := 0; b < 3; b++ {
							t.block[3*a+b] = im.weight * p[(3*k+a)*dim+3*k2+b]
						}
					}
					list = append(list, t)
				}
			}
			sort.Slice(list, func(i, j int) bool { return list[i].v < list[j].v })
			fc.pairs[k*n+k2] = list
		}
	}
	for a := 0; a < 3; a++ {
		lo, hi := 0, 0
		for _, c := range fc.cells {
			lo, hi = min(lo, c[a]), max(hi, c[a])
		}
		fc.cellMin[a], fc.cellSpan[a] = lo, hi-lo+1
	}
}

// Structure returns the crystal structure the force constants belong to.
func (fc *ForceConstants) Structure() grid.Structure { return fc.structure }

// Mesh returns the grid the force constants were built from.
func (fc *ForceConstants) Mesh() grid.Mesh { return fc.mesh }

// Diagnostics returns the measures of input quality recorded by Build.
func (fc *ForceConstants) Diagnostics() Diagnostics { return fc.diag }
