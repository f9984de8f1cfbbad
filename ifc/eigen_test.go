package ifc_test

import (
	"fmt"
	"math"
	"math/cmplx"
	"math/rand/v2"
	"slices"
	"sort"
	"testing"

	"lamina/ifc"
)

// eigEps is the unit roundoff of float64 as LAPACK's tests use it (2⁻⁵², the spacing at 1).
const eigEps = 0x1p-52

// Tolerances of the shared suite, all in units of the first-order error scale: n·ε·‖A‖_F for
// eigenvalues and residuals, n·ε for orthonormality, n·ε·‖A‖_F/gap for subspaces.
const (
	// A backward-stable Hermitian eigensolver (Householder reduction + QL/QR) has a backward
	// error of order n·ε·‖A‖ (Golub & Van Loan, Matrix Computations, ch. 5 and 8; from
	// memory). LAPACK's eigensolver test drivers flag such ratios above a threshold of about
	// 20–50 (from memory); 50 is used for residual and orthonormality.
	eigResTol  = 50
	eigOrthTol = 50
	// Weyl's inequality moves each eigenvalue by at most the backward error ‖E‖₂; two solvers
	// (or one solver and the rounding made while building A from its spectrum) can each
	// contribute, hence twice the residual bound.
	eigValTol = 100
	// Davis–Kahan sin Θ theorem: an invariant subspace moves by at most ‖E‖/gap (Davis & Kahan,
	// SIAM J. Numer. Anal. 7, 1 (1970); from memory); again two contributions.
	eigSubTol = 100
)

// hermSolver is one path through a Hermitian eigensolver: it returns the ascending eigenvalues
// of the n×n row-major Hermitian a, and the eigenvectors (row-major, column j for value j) or
// nil when the path computes values only.
type hermSolver func(a []complex128, n int) (vals []float64, vecs []complex128, ok bool)

// hermCase is one matrix of the shared catalogue.
type hermCase struct {
	name  string
	n     int
	a     []complex128 // exactly Hermitian, row-major
	exact []float64    // ascending eigenvalues from a closed form, or nil
	basis []complex128 // n×n unitary, column j an exact eigenvector of exact[j], or nil
	src   string       // where exact comes from
	normA float64      // ‖A‖_F
	ref   embedResult  // the embedding reference, with vectors
}

// eigStats collects the largest ratios a suite run saw (each in the units of its tolerance).
type eigStats struct {
	res, orth, val, sub float64
}

// checkHermitianSolve runs solve on every case and checks: success; a unchanged; n ascending
// values; values against the embedding reference and against closed forms; and, when the path
// returns vectors, residuals ‖A v_j − λ_j v_j‖, orthonormality ‖VᴴV − I‖, and the invariant
// subspace of every eigenvalue cluster against the reference's and the exact basis.
func checkHermitianSolve(t *testing.T, name string, cases []hermCase, solve hermSolver) eigStats {
	t.Helper()
	var st eigStats
	for _, c := range cases {
		label := name + "/" + c.name
		n := c.n
		ain := slices.Clone(c.a)
		vals, vecs, ok := solve(c.a, n)
		if !ok {
			t.Errorf("%s: solver reported failure", label)
			continue
		}
		if !slices.Equal(ain, c.a) {
			t.Errorf("%s: input matrix modified", label)
		}
		if len(vals) != n {
			t.Errorf("%s: %d eigenvalues, want %d", label, len(vals), n)
			continue
		}
		for i := 1; i < n; i++ {
			if !(vals[i-1] <= vals[i]) {
				t.Errorf("%s: eigenvalues not ascending at %d: %g, %g", label, i, vals[i-1], vals[i])
			}
		}
		scale := c.normA
		if scale == 0 {
			scale = 1 // zero matrix: every error must then be of order ε in absolute terms
		}
		unit := float64(n) * eigEps * scale
		st.val = max(st.val, eigCompareValues(t, label+" vs embedding", vals, c.ref.vals, unit))
		if c.exact != nil {
			st.val = max(st.val, eigCompareValues(t, label+" vs "+c.src, vals, c.exact, unit))
		}
		if vecs == nil {
			continue
		}
		if len(vecs) != n*n {
			t.Errorf("%s: %d vector entries, want %d", label, len(vecs), n*n)
			continue
		}
		// Residuals, column by column; the worst column is reported.
		col := make([]complex128, n)
		r := make([]complex128, n)
		worstRes, worstCol := 0.0, 0
		for j := 0; j < n; j++ {
			for i := range col {
				col[i] = vecs[i*n+j]
			}
			for i := 0; i < n; i++ {
				var s complex128
				for k := 0; k < n; k++ {
					s += c.a[i*n+k] * col[k]
				}
				r[i] = s - complex(vals[j], 0)*col[i]
			}
			if ratio := eigNorm2(r) / unit; !(ratio <= worstRes) {
				worstRes, worstCol = ratio, j
			}
		}
		st.res = max(st.res, worstRes)
		if !(worstRes <= eigResTol) {
			t.Errorf("%s: ‖A v − λ v‖/(nε‖A‖) = %.3g for λ_%d = %g, want ≤ %d", label, worstRes, worstCol, vals[worstCol], eigResTol)
		}
		// Orthonormality.
		var worst float64
		for i := 0; i < n; i++ {
			for j := 0; j < n; j++ {
				var s complex128
				for k := 0; k < n; k++ {
					s += cmplx.Conj(vecs[k*n+i]) * vecs[k*n+j]
				}
				if i == j {
					s--
				}
				worst = max(worst, cmplx.Abs(s))
			}
		}
		ratio := worst / (float64(n) * eigEps)
		st.orth = max(st.orth, ratio)
		if !(ratio <= eigOrthTol) {
			t.Errorf("%s: max|VᴴV − I|/(nε) = %.3g, want ≤ %d", label, ratio, eigOrthTol)
		}
		// Invariant subspaces.
		st.sub = max(st.sub, eigCompareSubspaces(t, label+" vs embedding", vecs, c.ref.vecs, n, c.ref.clusters, c.ref.vals, unit))
		if c.basis != nil {
			cl := eigClusters(c.exact, 300*unit)
			st.sub = max(st.sub, eigCompareSubspaces(t, label+" vs "+c.src, vecs, c.basis, n, cl, c.exact, unit))
		}
	}
	return st
}

// eigCompareValues checks |got_i − want_i| ≤ eigValTol·unit, reports the worst index and
// returns the largest ratio.
func eigCompareValues(t *testing.T, label string, got, want []float64, unit float64) float64 {
	t.Helper()
	worst, at := 0.0, 0
	for i := range want {
		if ratio := math.Abs(got[i]-want[i]) / unit; !(ratio <= worst) {
			worst, at = ratio, i
		}
	}
	if !(worst <= eigValTol) {
		t.Errorf("%s: λ_%d = %.17g, want %.17g (|diff|/(nε‖A‖) = %.3g > %d)", label, at, got[at], want[at], worst, eigValTol)
	}
	return worst
}

// eigCompareSubspaces checks, for every cluster [lo, hi) with a neighbour, that the columns
// lo..hi−1 of got lie in the span of the same columns of want: ‖(I − X Xᴴ) V‖_F·gap/unit ≤
// eigSubTol, gap the distance to the nearest value outside the cluster. It reports the worst
// cluster and returns the largest ratio.
func eigCompareSubspaces(t *testing.T, label string, got, want []complex128, n int, clusters [][2]int, vals []float64, unit float64) float64 {
	t.Helper()
	worst, at := 0.0, [2]int{}
	v := make([]complex128, n)
	for _, c := range clusters {
		lo, hi := c[0], c[1]
		gap := math.Inf(1)
		if lo > 0 {
			gap = vals[lo] - vals[lo-1]
		}
		if hi < n {
			gap = min(gap, vals[hi]-vals[hi-1])
		}
		if math.IsInf(gap, 1) {
			continue // one cluster spans everything: any orthonormal basis is right
		}
		var off float64 // ‖(I − X Xᴴ) V‖_F²
		for j := lo; j < hi; j++ {
			for i := range v {
				v[i] = got[i*n+j]
			}
			for pass := 0; pass < 2; pass++ {
				for k := lo; k < hi; k++ {
					var s complex128
					for i := 0; i < n; i++ {
						s += cmplx.Conj(want[i*n+k]) * v[i]
					}
					for i := 0; i < n; i++ {
						v[i] -= s * want[i*n+k]
					}
				}
			}
			nv := eigNorm2(v)
			off += nv * nv
		}
		if ratio := math.Sqrt(off) * gap / unit; !(ratio <= worst) {
			worst, at = ratio, c
		}
	}
	if !(worst <= eigSubTol) {
		t.Errorf("%s: cluster [%d,%d) at λ = %g: ‖sin Θ‖_F·gap/(nε‖A‖) = %.3g, want ≤ %d", label, at[0], at[1], vals[at[0]], worst, eigSubTol)
	}
	return worst
}

// eigCatalogue builds the shared matrices (fixed seed) with their embedding references.
func eigCatalogue(t *testing.T) []hermCase {
	t.Helper()
	rnd := rand.New(rand.NewPCG(1, 1))
	var cases []hermCase
	add := func(c hermCase) {
		c.normA = eigNormF(c.a)
		ref, err := embedSolve(c.a, c.n, true)
		if err != nil {
			t.Fatalf("%s: reference: %v", c.name, err)
		}
		c.ref = ref
		cases = append(cases, c)
	}
	for _, n := range []int{1, 2, 3, 6, 24, 96} {
		add(hermCase{name: fmt.Sprintf("random/n=%d", n), n: n, a: eigRandHermitian(rnd, n)})
	}
	for _, n := range []int{6, 24} {
		a := eigRandHermitian(rnd, n)
		for i := range a {
			a[i] = complex(real(a[i]), 0)
		}
		add(hermCase{name: fmt.Sprintf("real-symmetric/n=%d", n), n: n, a: a})
	}
	add(hermCase{name: "one-by-one", n: 1, a: []complex128{2.5},
		exact: []float64{2.5}, basis: []complex128{1}, src: "the entry itself"})
	add(hermCase{name: "zero/n=1", n: 1, a: []complex128{0},
		exact: []float64{0}, src: "zero matrix"})
	add(hermCase{name: "zero/n=6", n: 6, a: make([]complex128, 36),
		exact: make([]float64, 6), src: "zero matrix"})
	{
		// Diagonal with a repeated and a negative entry: the eigenvalues are the sorted
		// diagonal, the eigenvectors unit vectors.
		diag := []float64{3, -1.5, 0.25, 3, 7, -4}
		add(eigFromBasis("diagonal/n=6", eigIdentity(len(diag)), diag, "sorted diagonal"))
	}
	{
		// Exactly degenerate spectra, A = U diag(λ) Uᴴ with a random unitary U.
		add(eigFromBasis("degenerate/n=6", eigRandUnitary(rnd, 6), []float64{2, -1, 2, 5, -1, 2}, "U diag(λ) Uᴴ"))
		lam24 := make([]float64, 24)
		for i := range lam24 {
			lam24[i] = float64(i%5) - 1.5 // five values, multiplicities 5,5,5,5,4
		}
		add(eigFromBasis("degenerate/n=24", eigRandUnitary(rnd, 24), lam24, "U diag(λ) Uᴴ"))
		lam96 := make([]float64, 96)
		for i := range lam96 {
			lam96[i] = []float64{0, 1, 3}[i%3] // three values, multiplicity 32 each
		}
		add(eigFromBasis("degenerate/n=96", eigRandUnitary(rnd, 96), lam96, "U diag(λ) Uᴴ"))
	}
	for _, n := range []int{6, 24, 96} {
		add(eigCirculant(rnd, fmt.Sprintf("circulant/n=%d", n), n, 1))
	}
	// Huge and tiny scales: zheev-style scaling must keep squares finite and normal.
	add(eigCirculant(rnd, "circulant-huge/n=24", 24, 1e150))
	add(eigCirculant(rnd, "circulant-tiny/n=24", 24, 1e-150))
	for _, s := range []float64{1e150, 1e-150} {
		a := eigRandHermitian(rnd, 24)
		for i := range a {
			a[i] *= complex(s, 0)
		}
		add(hermCase{name: fmt.Sprintf("random-scale=%g/n=24", s), n: 24, a: a})
	}
	{
		// Hermitian tridiagonal Toeplitz: diagonal α, super-diagonal b, sub-diagonal b̄. A
		// diagonal phase makes it real with off-diagonal |b|, so λ_k = α + 2|b| cos(kπ/(n+1)),
		// k = 1..n (tridiagonal Toeplitz eigenvalues, standard linear algebra, common practice).
		// Every reflector of the reduction is trivial (the column tails are already zero).
		const n = 24
		alpha, b := 0.3, complex(0.6, -0.8)
		a := make([]complex128, n*n)
		exact := make([]float64, n)
		for i := 0; i < n; i++ {
			a[i*n+i] = complex(alpha, 0)
			if i+1 < n {
				a[i*n+i+1] = b
				a[(i+1)*n+i] = cmplx.Conj(b)
			}
			exact[i] = alpha + 2*cmplx.Abs(b)*math.Cos(float64(i+1)*math.Pi/(n+1))
		}
		sort.Float64s(exact)
		add(hermCase{name: "tridiagonal-toeplitz/n=24", n: n, a: a, exact: exact, src: "α + 2|b|cos(kπ/(n+1))"})
	}
	{
		// Zero first sub-diagonal: each column's reflector starts from α = 0 (phase of α
		// undefined).
		const n = 6
		a := eigRandHermitian(rnd, n)
		for i := 0; i+1 < n; i++ {
			a[(i+1)*n+i], a[i*n+i+1] = 0, 0
		}
		add(hermCase{name: "zero-subdiagonal/n=6", n: n, a: a})
	}
	{
		// Block diagonal: the reduction yields an exactly zero off-diagonal that splits T.
		const n = 6
		a := make([]complex128, n*n)
		for _, off := range []int{0, 3} {
			blk := eigRandHermitian(rnd, 3)
			for i := 0; i < 3; i++ {
				for j := 0; j < 3; j++ {
					a[(off+i)*n+off+j] = blk[i*3+j]
				}
			}
		}
		add(hermCase{name: "block-diagonal/n=6", n: n, a: a})
	}
	return cases
}

// eigFromBasis builds A = U diag(lam) Uᴴ (exactly Hermitian) with exact values sorted lam and
// basis the columns of U in the same order.
func eigFromBasis(name string, u []complex128, lam []float64, src string) hermCase {
	n := len(lam)
	idx := make([]int, n)
	for i := range idx {
		idx[i] = i
	}
	sort.SliceStable(idx, func(p, q int) bool { return lam[idx[p]] < lam[idx[q]] })
	exact := make([]float64, n)
	basis := make([]complex128, n*n)
	for j, k := range idx {
		exact[j] = lam[k]
		for i := 0; i < n; i++ {
			basis[i*n+j] = u[i*n+k]
		}
	}
	a := make([]complex128, n*n)
	for i := 0; i < n; i++ {
		for j := 0; j <= i; j++ {
			var s complex128
			for k := 0; k < n; k++ {
				s += u[i*n+k] * complex(lam[k], 0) * cmplx.Conj(u[j*n+k])
			}
			if i == j {
				s = complex(real(s), 0)
			}
			a[i*n+j] = s
			a[j*n+i] = cmplx.Conj(s)
		}
	}
	return hermCase{name: name, n: n, a: a, exact: exact, basis: basis, src: src}
}

// eigCirculant builds a Hermitian circulant C_jk = c_{(k−j) mod n} with c_{n−k} = conj(c_k),
// random c times s. Its eigenvalues are λ_m = Σ_k c_k ω^{mk}, ω = exp(2πi/n), with
// eigenvectors f_m[k] = ω^{mk}/√n (circulant matrix eigenvalues, standard linear algebra,
// common practice).
func eigCirculant(rnd *rand.Rand, name string, n int, s float64) hermCase {
	c := make([]complex128, n)
	c[0] = complex(s*rnd.NormFloat64(), 0)
	for k := 1; 2*k <= n; k++ {
		if 2*k == n {
			c[k] = complex(s*rnd.NormFloat64(), 0)
			continue
		}
		c[k] = complex(s*rnd.NormFloat64(), s*rnd.NormFloat64())
		c[n-k] = cmplx.Conj(c[k])
	}
	a := make([]complex128, n*n)
	for j := 0; j < n; j++ {
		for k := 0; k < n; k++ {
			a[j*n+k] = c[((k-j)%n+n)%n]
		}
	}
	lam := make([]float64, n)
	u := make([]complex128, n*n)
	for m := 0; m < n; m++ {
		var sum complex128
		for k := 0; k < n; k++ {
			w := cmplx.Exp(complex(0, 2*math.Pi*float64(m*k%n)/float64(n)))
			sum += c[k] * w
			u[k*n+m] = w / complex(math.Sqrt(float64(n)), 0)
		}
		lam[m] = real(sum)
	}
	h := eigFromBasis(name, u, lam, "circulant Σ c_k ω^{mk}")
	h.a = a // keep the exact circulant, not the rebuilt product
	return h
}

// eigRandHermitian returns a random Hermitian matrix with N(0,1) real and imaginary parts.
func eigRandHermitian(rnd *rand.Rand, n int) []complex128 {
	a := make([]complex128, n*n)
	for i := 0; i < n; i++ {
		a[i*n+i] = complex(rnd.NormFloat64(), 0)
		for j := 0; j < i; j++ {
			x := complex(rnd.NormFloat64(), rnd.NormFloat64())
			a[i*n+j] = x
			a[j*n+i] = cmplx.Conj(x)
		}
	}
	return a
}

// eigRandUnitary orthonormalises the columns of a complex Gaussian matrix (modified
// Gram–Schmidt, applied twice).
func eigRandUnitary(rnd *rand.Rand, n int) []complex128 {
	cols := make([][]complex128, n)
	for j := range cols {
		x := make([]complex128, n)
		for i := range x {
			x[i] = complex(rnd.NormFloat64(), rnd.NormFloat64())
		}
		for pass := 0; pass < 2; pass++ {
			for _, y := range cols[:j] {
				eigAxpy(-eigDot(y, x), y, x)
			}
		}
		nrm := eigNorm2(x)
		for i := range x {
			x[i] /= complex(nrm, 0)
		}
		cols[j] = x
	}
	u := make([]complex128, n*n)
	for j, x := range cols {
		for i := range x {
			u[i*n+j] = x[i]
		}
	}
	return u
}

func eigIdentity(n int) []complex128 {
	u := make([]complex128, n*n)
	for i := 0; i < n; i++ {
		u[i*n+i] = 1
	}
	return u
}

// TestEigenSuite runs the shared suite on every path through ifc.Eigen, and on the
// embedding reference itself (so that the suite is seen to accept an independent solver).
func TestEigenSuite(t *testing.T) {
	cases := eigCatalogue(t)
	decoys := rand.New(rand.NewPCG(2, 2))
	var shared ifc.Eigen
	fill := func(n int) []float64 {
		d := make([]float64, n)
		for i := range d {
			d[i] = math.NaN()
		}
		return d
	}
	paths := []struct {
		name  string
		solve hermSolver
	}{
		{"vectors", func(a []complex128, n int) ([]float64, []complex128, bool) {
			var e ifc.Eigen
			if !e.Factorize(a, n, true) {
				return nil, nil, false
			}
			return e.Values(nil), e.Vectors(nil), true
		}},
		{"values", func(a []complex128, n int) ([]float64, []complex128, bool) {
			var e ifc.Eigen
			if !e.Factorize(a, n, false) {
				return nil, nil, false
			}
			return e.Values(fill(n)), nil, true
		}},
		{"shared", func(a []complex128, n int) ([]float64, []complex128, bool) {
			// One Eigen through all cases: workspace reused across changing n.
			if !shared.Factorize(a, n, true) {
				return nil, nil, false
			}
			vecs := make([]complex128, n*n)
			for i := range vecs {
				vecs[i] = cmplx.NaN()
			}
			return shared.Values(fill(n)), shared.Vectors(vecs), true
		}},
		{"shared-decoy-then-values", func(a []complex128, n int) ([]float64, []complex128, bool) {
			// Same n reused: a different matrix with vectors first leaves stale workspace.
			if !shared.Factorize(eigRandHermitian(decoys, n), n, true) {
				return nil, nil, false
			}
			if !shared.Factorize(a, n, false) {
				return nil, nil, false
			}
			return shared.Values(nil), nil, true
		}},
		{"shared-decoy-then-vectors", func(a []complex128, n int) ([]float64, []complex128, bool) {
			if !shared.Factorize(eigRandHermitian(decoys, n), n, false) {
				return nil, nil, false
			}
			if !shared.Factorize(a, n, true) {
				return nil, nil, false
			}
			return shared.Values(nil), shared.Vectors(nil), true
		}},
		{"nan-upper", func(a []complex128, n int) ([]float64, []complex128, bool) {
			// Only the lower triangle and the real part of the diagonal may be read.
			b := slices.Clone(a)
			for i := 0; i < n; i++ {
				b[i*n+i] = complex(real(b[i*n+i]), math.NaN())
				for j := i + 1; j < n; j++ {
					b[i*n+j] = cmplx.NaN()
				}
			}
			var e ifc.Eigen
			if !e.Factorize(b, n, true) {
				return nil, nil, false
			}
			return e.Values(nil), e.Vectors(nil), true
		}},
		{"embedding-reference", func(a []complex128, n int) ([]float64, []complex128, bool) {
			res, err := embedSolve(a, n, true)
			if err != nil {
				t.Log(err)
				return nil, nil, false
			}
			return res.vals, res.vecs, true
		}},
	}
	for _, p := range paths {
		st := checkHermitianSolve(t, p.name, cases, p.solve)
		t.Logf("%-26s max ratios: residual %.3g, orthonormality %.3g, values %.3g, subspace %.3g",
			p.name, st.res, st.orth, st.val, st.sub)
	}
}

// TestEigenRepeatable checks that a reused Eigen returns the same bits as a fresh one: the
// same input read in the same order through the same operations must give identical output,
// so exact comparison is the property tested, not a tolerance.
func TestEigenRepeatable(t *testing.T) {
	rnd := rand.New(rand.NewPCG(3, 3))
	const n = 24
	a := eigRandHermitian(rnd, n)
	var fresh, reused ifc.Eigen
	fresh.Factorize(a, n, true)
	reused.Factorize(eigRandHermitian(rnd, 7), 7, true)
	reused.Factorize(a, n, true)
	reused.Factorize(a, n, true)
	if !slices.Equal(fresh.Values(nil), reused.Values(nil)) {
		t.Error("reused Eigen: eigenvalues differ from a fresh one")
	}
	if !slices.Equal(fresh.Vectors(nil), reused.Vectors(nil)) {
		t.Error("reused Eigen: eigenvectors differ from a fresh one")
	}
}

// TestEigenNonFinite checks that NaN or ±Inf in the lower triangle makes Factorize report
// failure, after which Values panics.
func TestEigenNonFinite(t *testing.T) {
	for _, bad := range []complex128{cmplx.NaN(), complex(math.Inf(1), 0), complex(0, math.Inf(-1))} {
		for _, vectors := range []bool{false, true} {
			a := eigRandHermitian(rand.New(rand.NewPCG(4, 4)), 4)
			a[3*4+1] = bad
			var e ifc.Eigen
			if e.Factorize(a, 4, vectors) {
				t.Errorf("Factorize with a[3][1] = %v, vectors=%t: ok, want failure", bad, vectors)
			}
			if !eigPanics(func() { e.Values(nil) }) {
				t.Errorf("Values after failed Factorize (a[3][1] = %v) did not panic", bad)
			}
		}
	}
}

// TestEigenPanics checks the documented caller-bug panics.
func TestEigenPanics(t *testing.T) {
	a := eigRandHermitian(rand.New(rand.NewPCG(5, 5)), 3)
	valuesOnly := func() *ifc.Eigen {
		var e ifc.Eigen
		e.Factorize(a, 3, false)
		return &e
	}
	withVectors := func() *ifc.Eigen {
		var e ifc.Eigen
		e.Factorize(a, 3, true)
		return &e
	}
	for _, tc := range []struct {
		name string
		f    func()
	}{
		{"Values before Factorize", func() { var e ifc.Eigen; e.Values(nil) }},
		{"Vectors before Factorize", func() { var e ifc.Eigen; e.Vectors(nil) }},
		{"Vectors after values-only Factorize", func() { valuesOnly().Vectors(nil) }},
		{"Values with short dst", func() { withVectors().Values(make([]float64, 2)) }},
		{"Vectors with long dst", func() { withVectors().Vectors(make([]complex128, 10)) }},
		{"Factorize with len(a) != n*n", func() { var e ifc.Eigen; e.Factorize(a, 2, true) }},
		{"Factorize with n < 0", func() { var e ifc.Eigen; e.Factorize(nil, -1, true) }},
	} {
		if !eigPanics(tc.f) {
			t.Errorf("%s: no panic", tc.name)
		}
	}
	// The empty matrix is not a bug.
	var e ifc.Eigen
	if !e.Factorize(nil, 0, true) || len(e.Values(nil)) != 0 || len(e.Vectors(nil)) != 0 {
		t.Error("Factorize of the 0×0 matrix: want success and empty results")
	}
}

func eigPanics(f func()) (panicked bool) {
	defer func() { panicked = recover() != nil }()
	f()
	return false
}

// TestEigenAllocs pins zero allocations per Factorize + Values(dst) + Vectors(dst) at fixed n
// after warm-up.
func TestEigenAllocs(t *testing.T) {
	rnd := rand.New(rand.NewPCG(6, 6))
	for _, n := range []int{6, 24} {
		a := eigRandHermitian(rnd, n)
		vals := make([]float64, n)
		vecs := make([]complex128, n*n)
		var e ifc.Eigen
		e.Factorize(a, n, true) // warm-up
		for _, vectors := range []bool{true, false} {
			got := testing.AllocsPerRun(20, func() {
				e.Factorize(a, n, vectors)
				e.Values(vals)
				if vectors {
					e.Vectors(vecs)
				}
			})
			if got != 0 {
				t.Errorf("n=%d vectors=%t: %v allocations per run, want 0", n, vectors, got)
			}
		}
	}
}

// ExampleEigen diagonalises [[2, i], [−i, 2]], whose eigenvalues are 2 ∓ 1 with eigenvectors
// (1, ±i)/√2 up to a phase (derived by hand: 2 + i·x = λ for v = (1, x)).
func ExampleEigen() {
	a := []complex128{
		2, 1i,
		-1i, 2,
	}
	var e ifc.Eigen
	if !e.Factorize(a, 2, true) {
		fmt.Println("no convergence")
		return
	}
	v := e.Vectors(nil)
	// r4 rounds to 4 decimals and turns −0 into 0 so the output does not depend on rounding noise.
	r4 := func(x float64) float64 { return math.Round(x*1e4)/1e4 + 0 }
	for j, l := range e.Values(nil) {
		// Fix the arbitrary phase: make the first component real and positive.
		ph := cmplx.Conj(v[j]) / complex(cmplx.Abs(v[j]), 0)
		v1, v2 := v[j]*ph, v[2+j]*ph
		fmt.Printf("λ=%.4f v=(%.4f%+.4fi, %.4f%+.4fi)\n", l, r4(real(v1)), r4(imag(v1)), r4(real(v2)), r4(imag(v2)))
	}
	// Output:
	// λ=1.0000 v=(0.7071+0.0000i, 0.0000+0.7071i)
	// λ=3.0000 v=(0.7071+0.0000i, 0.0000-0.7071i)
}
