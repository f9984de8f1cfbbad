package ifc

import (
	"errors"
	"math"

	"lamina/grid"
	"lamina/grid/units"
)

// ErrNoConvergence is returned when the Hermitian eigensolver fails to converge.
var ErrNoConvergence = errors.New("ifc: eigensolver did not converge")

// Evaluator evaluates the interpolated C(q), D(q) and the phonon modes at any q-point. It owns
// its buffers: after the first call of a kind no call allocates. Not safe for concurrent use:
// give each goroutine its own (NewEvaluator).
type Evaluator struct {
	fc    *ForceConstants
	lr    LongRange
	phase []complex128
	axis  [3][]complex128 // exp(2πi f_a m) for m from cellMin[a]: the phases factorize by axis
	c     []complex128
	d     []complex128
	isqm  []float64 // 1/sqrt(M_κ) per matrix index
	vals  []float64
	eig   Eigen
}

// NewEvaluator returns an evaluator of fc with its own buffers and long-range part.
func (fc *ForceConstants) NewEvaluator() *Evaluator {
	n := fc.structure.N()
	dim := 3 * n
	e := &Evaluator{
		fc:    fc,
		phase: make([]complex128, len(fc.cells)),
		axis:  [3][]complex128{make([]complex128, fc.cellSpan[0]), make([]complex128, fc.cellSpan[1]), make([]complex128, fc.cellSpan[2])},
		c:     make([]complex128, dim*dim),
		d:     make([]complex128, dim*dim),
		isqm:  make([]float64, dim),
		vals:  make([]float64, dim),
	}
	if fc.newLR != nil {
		e.lr = fc.newLR()
	}
	for i := range e.isqm {
		e.isqm[i] = 1 / math.Sqrt(fc.structure.Atoms[i/3].Mass)
	}
	return e
}

// Dim returns 3N, the number of modes.
func (e *Evaluator) Dim() int { return len(e.isqm) }

// Matrix writes the interpolated C(q) (cell phase, eV/Å², mass-unweighted) into dst, allocating
// when dst is nil, and returns it. q is in reduced coordinates; dir is a Cartesian direction
// used only for the 3D long-range limit at q ≡ 0 (zero: the analytic part).
func (e *Evaluator) Matrix(dst []complex128, q, dir grid.Vec3) []complex128 {
	dim := e.Dim()
	if dst == nil {
		dst = make([]complex128, dim*dim)
	}
	if len(dst) != dim*dim {
		panic("ifc: Matrix dst has wrong length")
	}
	fc := e.fc
	for a := 0; a < 3; a++ {
		for m := range e.axis[a] {
			s, co := math.Sincos(2 * math.Pi * q[a] * float64(m+fc.cellMin[a]))
			e.axis[a][m] = complex(co, s)
		}
	}
	for v, c := range fc.cells {
		e.phase[v] = e.axis[0][c[0]-fc.cellMin[0]] * e.axis[1][c[1]-fc.cellMin[1]] * e.axis[2][c[2]-fc.cellMin[2]]
	}
	n := dim / 3
	for k := 0; k < n; k++ {
		for k2 := 0; k2 < n; k2++ {
			var acc [9]complex128
			for _, t := range fc.pairs[k*n+k2] {
				ph := e.phase[t.v]
				for i, b := range t.block {
					acc[i] += complex(b*real(ph), b*imag(ph))
				}
			}
			for a := 0; a < 3; a++ {
				row := (3*k+a)*dim + 3*k2
				dst[row], dst[row+1], dst[row+2] = acc[3*a], acc[3*a+1], acc[3*a+2]
			}
		}
	}
	if fc.asr != nil {
		for i, v := range fc.asr {
			dst[i] += complex(v, 0)
		}
	}
	if e.lr != nil {
		e.lr.Add(dst, fc.structure.Lattice.Cartesian(q), dir, 1)
	}
	return dst
}

// dynamical fills e.d with the mass-weighted D(q), made exactly Hermitian.
func (e *Evaluator) dynamical(q, dir grid.Vec3) {
	dim := e.Dim()
	e.Matrix(e.c, q, dir)
	for i := 0; i < dim; i++ {
		for j := i; j < dim; j++ {
			w := e.isqm[i] * e.isqm[j]
			a, b := e.c[i*dim+j], e.c[j*dim+i]
			h := complex((real(a)+real(b))/2*w, (imag(a)-imag(b))/2*w)
			e.d[i*dim+j] = h
			e.d[j*dim+i] = complex(real(h), -imag(h))
		}
	}
}

// Frequencies writes the 3N frequencies at reduced q in THz, ascending, into dst (allocating
// when nil) and returns it; imaginary modes are negative.
func (e *Evaluator) Frequencies(dst []float64, q, dir grid.Vec3) ([]float64, error) {
	dim := e.Dim()
	if dst == nil {
		dst = make([]float64, dim)
	}
	e.dynamical(q, dir)
	if !e.eig.Factorize(e.d, dim, false) {
		return dst, ErrNoConvergence
	}
	e.vals = e.eig.Values(e.vals)
	for i, l := range e.vals {
		dst[i] = units.FrequencyTHz(l)
	}
	return dst, nil
}

// Modes writes the 3N frequencies (THz, ascending) and the unit eigenvectors of D(q) (row-major
// 3N×3N, column ν the mode ν, index 3κ+α, cell phase) into freq and vec (allocating when nil).
func (e *Evaluator) Modes(freq []float64, vec []complex128, q, dir grid.Vec3) ([]float64, []complex128, error) {
	dim := e.Dim()
	if freq == nil {
		freq = make([]float64, dim)
	}
	e.dynamical(q, dir)
	if !e.eig.Factorize(e.d, dim, true) {
		return freq, vec, ErrNoConvergence
	}
	e.vals = e.eig.Values(e.vals)
	for i, l := range e.vals {
		freq[i] = units.FrequencyTHz(l)
	}
	return freq, e.eig.Vectors(vec), nil
}
