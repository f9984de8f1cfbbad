package ifc

import (
	"math"

	"gonum.org/v1/gonum/lapack"
	"gonum.org/v1/gonum/lapack/gonum"
)

// Eigen computes eigenvalues and eigenvectors of complex Hermitian matrices. The zero value is
// ready to use; it owns its workspace and reuses it across calls of the same n (no allocation
// after the first call). Not safe for concurrent use: give each worker its own Eigen.
//
// Method (Householder tridiagonalisation and the implicit symmetric QL/QR iteration, Golub &
// Van Loan, "Matrix Computations", ch. 8, from memory; the same steps as LAPACK's zheev):
//
//  1. Scaling: if the largest entry lies outside [2⁻⁴⁸⁴, 2⁴⁸⁴] (about 1e-146 to 1e146) the
//     matrix is scaled by a power of two into [0.5, 1) and the eigenvalues are scaled back.
//  2. Reduction: Hermitian Householder reflectors H_i = I − τ_i v_i v_iᴴ (τ_i real, v_i[0] = 1,
//     acting on rows and columns i+1..n−1) give K = Qᴴ A Q, Q = H_0 H_1 ⋯ H_{n−2}, with K
//     Hermitian tridiagonal, real diagonal and complex sub-diagonal β_i.
//  3. Phases: D = diag(δ_0, …, δ_{n−1}), δ_0 = 1, δ_{i+1} = δ_i β_i/|β_i| makes
//     T = Dᴴ K D real symmetric tridiagonal with sub-diagonal |β_i| ≥ 0.
//  4. Tridiagonal eigenproblem: gonum's Dsterf (values only) or Dsteqr (implicit QL/QR with
//     the rotations accumulated, T = Z Λ Zᵀ).
//  5. Back-transformation: V = Q D Z, applied reflector by reflector from H_{n−2} down to H_0.
//
// Only the lower triangle of the input (j ≤ i) is read, and of the diagonal only the real part.
type Eigen struct {
	n       int
	ok      bool // last Factorize succeeded
	vectors bool // last Factorize computed vectors

	w     []complex128 // n×n: lower triangle is the working matrix, row i above the diagonal holds v_i
	p     []complex128 // n: Householder work vector
	s     []complex128 // n: back-transformation work row
	phase []complex128 // n: δ_i
	tau   []float64    // n−1
	d     []float64    // n: diagonal of T, then the eigenvalues
	e     []float64    // n−1: sub-diagonal of T (overwritten by the QL/QR iteration)
	z     []float64    // n×n: eigenvectors of T, row-major
	work  []float64    // max(1, 2n−2): Dsteqr workspace
	vec   []complex128 // n×n: eigenvectors of A, row-major, column j for eigenvalue j
}

// Factorize computes the eigen-decomposition of the n×n Hermitian matrix a (row-major, len
// n*n). Only the lower triangle a[i*n+j], j ≤ i, is read, and only the real part of the diagonal;
// the strict upper triangle may hold anything. a is not modified. vectors says whether
// eigenvectors are wanted.
//
// Factorize returns false if the tridiagonal iteration failed to converge or if the lower
// triangle holds a NaN or an infinity; Values and Vectors then panic until a later Factorize
// succeeds. It panics if n < 0 or len(a) != n*n (caller bugs).
func (e *Eigen) Factorize(a []complex128, n int, vectors bool) bool {
	switch {
	case n < 0:
		panic("ifc: Eigen.Factorize: negative n")
	case len(a) != n*n:
		panic("ifc: Eigen.Factorize: len(a) != n*n")
	}
	e.ok = false
	e.vectors = vectors
	e.resize(n)
	if n == 0 {
		e.ok = true
		return true
	}

	// Copy the lower triangle and find max |Re|, |Im| (an estimate of max |a_ij| within √2).
	// chk becomes NaN if any entry is NaN or ±Inf.
	w := e.w
	var anrm, chk float64
	for i := 0; i < n; i++ {
		src := a[i*n : i*n+i+1]
		dst := w[i*n : i*n+i+1]
		for j, x := range src[:i] {
			dst[j] = x
			xr, xi := real(x), imag(x)
			anrm = max(anrm, math.Abs(xr), math.Abs(xi))
			chk += xr*0 + xi*0
		}
		x := real(src[i])
		dst[i] = complex(x, 0)
		anrm = max(anrm, math.Abs(x))
		chk += x * 0
	}
	if chk != 0 || math.IsNaN(anrm) {
		return false
	}
	// Scale by a power of two (exact) into [eigRmin, eigRmax] when needed, so that squares of
	// entries neither overflow nor underflow (the role of zheev's scaling).
	sigma := 1.0
	if anrm > 0 && (anrm < eigRmin || anrm > eigRmax) {
		_, exp := math.Frexp(anrm)
		sigma = math.Ldexp(1, -exp) // anrm·sigma in [0.5, 1)
		for i := 0; i < n; i++ {
			row := w[i*n : i*n+i+1]
			for j, x := range row {
				row[j] = complex(sigma*real(x), sigma*imag(x))
			}
		}
	}

	e.tridiagonalize()

	var impl gonum.Implementation
	if vectors {
		if !impl.Dsteqr(lapack.EVTridiag, n, e.d, e.e, e.z, n, e.work) {
			return false
		}
		e.backTransform()
	} else if !impl.Dsterf(n, e.d, e.e) {
		return false
	}
	if sigma != 1 {
		for i := range e.d {
			e.d[i] /= sigma
		}
	}
	e.ok = true
	return true
}

// Values copies the n ascending eigenvalues into dst (allocating when dst is nil) and returns
// it. It panics if the last Factorize did not succeed or if dst is not nil and len(dst) != n.
func (e *Eigen) Values(dst []float64) []float64 {
	if !e.ok {
		panic("ifc: Eigen.Values: no successful factorization")
	}
	if dst == nil {
		dst = make([]float64, e.n)
	} else if len(dst) != e.n {
		panic("ifc: Eigen.Values: len(dst) != n")
	}
	copy(dst, e.d)
	return dst
}

// Vectors copies the eigenvectors into dst, row-major n×n, column j the unit eigenvector of
// eigenvalue j (allocating when dst is nil), and returns it. The phase of each vector is
// arbitrary. It panics if the last Factorize did not succeed or did not compute vectors, or if
// dst is not nil and len(dst) != n*n.
func (e *Eigen) Vectors(dst []complex128) []complex128 {
	if !e.ok || !e.vectors {
		panic("ifc: Eigen.Vectors: eigenvectors not computed")
	}
	if dst == nil {
		dst = make([]complex128, e.n*e.n)
	} else if len(dst) != e.n*e.n {
		panic("ifc: Eigen.Vectors: len(dst) != n*n")
	}
	copy(dst, e.vec)
	return dst
}

// Scaling thresholds, powers of two close to zheev's √(safmin/ε) ≈ 2⁻⁴⁸⁴·⁵ and its
// reciprocal: squares of entries up to eigRmax stay 2⁵⁶ below overflow, squares down to
// eigRmin stay 2⁵⁴ above the smallest normal number.
const (
	eigRmin = 0x1p-484
	eigRmax = 0x1p484
)

// resize sets the workspace to size n, allocating only when the capacity is too small.
func (e *Eigen) resize(n int) {
	e.n = n
	e.w = growC(e.w, n*n)
	e.p = growC(e.p, n)
	e.s = growC(e.s, n)
	e.phase = growC(e.phase, n)
	e.tau = growF(e.tau, max(n-1, 0))
	e.d = growF(e.d, n)
	e.e = growF(e.e, max(n-1, 0))
	if e.vectors {
		e.z = growF(e.z, n*n)
		e.work = growF(e.work, max(1, 2*n-2))
		e.vec = growC(e.vec, n*n)
	}
}

func growC(s []complex128, n int) []complex128 {
	if cap(s) < n {
		return make([]complex128, n)
	}
	return s[:n]
}

func growF(s []float64, n int) []float64 {
	if cap(s) < n {
		return make([]float64, n)
	}
	return s[:n]
}

// tridiagonalize reduces the lower triangle held in e.w to T = Dᴴ Qᴴ A Q D, storing the
// diagonal in e.d, the sub-diagonal in e.e, τ_i in e.tau, v_i in row i of e.w right of the
// diagonal, and δ_i in e.phase.
func (e *Eigen) tridiagonalize() {
	n := e.n
	w := e.w
	p := e.p
	delta := complex(1, 0)
	e.phase[0] = delta
	for i := 0; i < n-1; i++ {
		o := i + 1 // first index of the trailing block
		m := n - o // its order
		// x = A[o:n, i] (column i below the diagonal), copied into row i right of the diagonal.
		v := w[i*n+o : i*n+n]
		for r := range v {
			v[r] = w[(o+r)*n+i]
		}
		alpha := v[0]
		tail := norm2C(v[1:])
		var beta complex128
		var tau float64
		if tail == 0 {
			// x is already a multiple of e_1: no reflection.
			beta = alpha
			v[0] = 1
		} else {
			aa := cabs(alpha)
			xn := math.Hypot(aa, tail)
			ph := complex(1, 0)
			if aa != 0 {
				ph = complex(real(alpha)/aa, imag(alpha)/aa)
			}
			// u = x − β e_1 with β = −ph·‖x‖ (no cancellation in u_0 = ph·(|α|+‖x‖));
			// v = u/u_0, τ = 2|u_0|²/(uᴴu) = (|α|+‖x‖)/‖x‖.
			beta = -ph * complex(xn, 0)
			den := aa + xn
			tau = den / xn
			inv := complex(real(ph)/den, -imag(ph)/den) // 1/u_0
			v[0] = 1
			for r := 1; r < m; r++ {
				v[r] *= inv
			}
			e.her2Update(o, v, p[:m], tau)
		}
		e.tau[i] = tau
		e.d[i] = real(w[i*n+i])
		b := cabs(beta)
		e.e[i] = b
		if b != 0 {
			delta *= complex(real(beta)/b, imag(beta)/b)
		}
		e.phase[o] = delta
	}
	e.d[n-1] = real(w[(n-1)*n+n-1])
}

// her2Update applies A22 ← H A22 H, H = I − τ v vᴴ, to the trailing m×m block starting at
// (o, o) of the lower triangle of e.w, using p (len m) as workspace:
// p = τ A22 v, w = p − ½τ(vᴴp) v, A22 ← A22 − v wᴴ − w vᴴ.
func (e *Eigen) her2Update(o int, v, p []complex128, tau float64) {
	n := e.n
	w := e.w
	m := len(v)
	// p = A22 v from the lower triangle: row r gives p_r += a_rc v_c and p_c += conj(a_rc) v_r.
	for r := 0; r < m; r++ {
		base := (o+r)*n + o
		row := w[base : base+r+1]
		vr := v[r]
		vrr, vri := real(vr), imag(vr)
		var sr, si float64
		pp := p[:r]
		vv := v[:r]
		for c, a := range row[:r] {
			ar, ai := real(a), imag(a)
			x := vv[c]
			xr, xi := real(x), imag(x)
			sr += ar*xr - ai*xi
			si += ar*xi + ai*xr
			// conj(a)·v_r
			q := pp[c]
			pp[c] = complex(real(q)+ar*vrr+ai*vri, imag(q)+ar*vri-ai*vrr)
		}
		dr := real(row[r])
		p[r] = complex(sr+dr*vrr, si+dr*vri)
	}
	// p ← τ p, then γ = ½ τ Re(vᴴ p) and w = p − γ v (stored in p).
	var vp float64
	for r, x := range p {
		x = complex(tau*real(x), tau*imag(x))
		p[r] = x
		y := v[r]
		vp += real(y)*real(x) + imag(y)*imag(x)
	}
	g := 0.5 * tau * vp
	for r, y := range v {
		p[r] -= complex(g*real(y), g*imag(y))
	}
	// A22 ← A22 − v wᴴ − w vᴴ on the lower triangle.
	for r := 0; r < m; r++ {
		base := (o+r)*n + o
		row := w[base : base+r+1]
		vr, wr := v[r], p[r]
		vrr, vri := real(vr), imag(vr)
		wrr, wri := real(wr), imag(wr)
		vv := v[:r+1]
		pp := p[:r+1]
		for c := range row {
			x, y := vv[c], pp[c]
			xr, xi := real(x), imag(x)
			yr, yi := real(y), imag(y)
			// v_r conj(w_c) + w_r conj(v_c)
			tr := vrr*yr + vri*yi + wrr*xr + wri*xi
			ti := vri*yr - vrr*yi + wri*xr - wrr*xi
			a := row[c]
			row[c] = complex(real(a)-tr, imag(a)-ti)
		}
		row[r] = complex(real(row[r]), 0)
	}
}

// backTransform forms V = Q D Z in e.vec from the eigenvectors Z of T.
func (e *Eigen) backTransform() {
	n := e.n
	vec := e.vec
	for r := 0; r < n; r++ {
		ph := e.phase[r]
		pr, pi := real(ph), imag(ph)
		zr := e.z[r*n : r*n+n]
		out := vec[r*n : r*n+n]
		for c, x := range zr {
			out[c] = complex(pr*x, pi*x)
		}
	}
	s := e.s
	for i := n - 2; i >= 0; i-- {
		tau := e.tau[i]
		if tau == 0 {
			continue
		}
		o := i + 1
		v := e.w[i*n+o : i*n+n]
		// s = vᴴ V[o:n, :]
		clear(s)
		for r, x := range v {
			xr, xi := real(x), imag(x)
			row := vec[(o+r)*n : (o+r)*n+n]
			ss := s[:len(row)]
			for c, y := range row {
				yr, yi := real(y), imag(y)
				q := ss[c]
				ss[c] = complex(real(q)+xr*yr+xi*yi, imag(q)+xr*yi-xi*yr)
			}
		}
		// V[o:n, :] −= τ v s
		for r, x := range v {
			fr, fi := tau*real(x), tau*imag(x)
			row := vec[(o+r)*n : (o+r)*n+n]
			ss := s[:len(row)]
			for c, y := range ss {
				yr, yi := real(y), imag(y)
				q := row[c]
				row[c] = complex(real(q)-(fr*yr-fi*yi), imag(q)-(fr*yi+fi*yr))
			}
		}
	}
}

// cabs is |x| without overflow or needless underflow.
func cabs(x complex128) float64 { return math.Hypot(real(x), imag(x)) }

// norm2C is the Euclidean norm of x, computed with a scale factor so that squares of tiny or
// huge entries neither underflow nor overflow.
func norm2C(x []complex128) float64 {
	var scale float64
	for _, y := range x {
		scale = max(scale, math.Abs(real(y)), math.Abs(imag(y)))
	}
	if scale == 0 {
		return 0
	}
	var ss float64
	for _, y := range x {
		a, b := real(y)/scale, imag(y)/scale
		ss += a*a + b*b
	}
	return scale * math.Sqrt(ss)
}
