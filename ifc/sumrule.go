package ifc

import (
	"math"
	"strings"
)

// SumRule selects the acoustic sum-rule correction of Build (PHYSICS.md section 6).
type SumRule int

const (
	// SumRuleTranslational restores Σ_{κ',R} Φ_{κα,κ'β}(R) = 0 by the smallest q-independent
	// symmetric correction of C: C(0) is replaced by its projection Q·C(0)·Q off the three rigid
	// translations (Q = 1 − P, P the projector on uniform displacements), and the same correction
	// is added at every q. It keeps every C(q) Hermitian. This is the default (the zero value).
	SumRuleTranslational SumRule = iota
	// SumRuleNone leaves the force constants as the input gives them.
	SumRuleNone
)

var sumRuleNames = [...]string{SumRuleTranslational: "translational", SumRuleNone: "none"}

// String returns the flag spelling: "translational" or "none".
func (r SumRule) String() string { return enumName(sumRuleNames[:], int(r), "SumRule") }

// ParseSumRule parses "translational" or "none".
func ParseSumRule(s string) (SumRule, error) {
	i, err := parseEnum(sumRuleNames[:], s, "sum rule")
	return SumRule(i), err
}

// Set implements pflag.Value.
func (r *SumRule) Set(s string) error {
	v, err := ParseSumRule(s)
	if err != nil {
		return err
	}
	*r = v
	return nil
}

// Type implements pflag.Value.
func (r *SumRule) Type() string { return strings.Join(sumRuleNames[:], "|") }

// zeroQ returns C(0) = Σ_R Φ(R) as a dim×dim real matrix.
func zeroQ(phi [][]float64, dim int) []float64 {
	c0 := make([]float64, dim*dim)
	for _, p := range phi {
		for i, v := range p {
			c0[i] += v
		}
	}
	return c0
}

// sumRuleError returns max over κ, α, β of |Σ_{κ',R} Φ_{κα,κ'β}(R)|.
func sumRuleError(phi [][]float64, n, nq int) float64 {
	dim := 3 * n
	c0 := zeroQ(phi, dim)
	worst := 0.0
	for i := 0; i < dim; i++ {
		for b := 0; b < 3; b++ {
			s := 0.0
			for k2 := 0; k2 < n; k2++ {
				s += c0[i*dim+3*k2+b]
			}
			worst = math.Max(worst, math.Abs(s))
		}
	}
	return worst
}

// translationalCorrection returns the dim×dim real matrix Δ = Q·S·Q − C(0), with S the
// symmetric part of C(0) and Q the projector off rigid translations; adding Δ to every C(q)
// enforces the translational sum rule exactly and keeps C(q) Hermitian.
func translationalCorrection(phi [][]float64, n, nq int) []float64 {
	dim := 3 * n
	c0 := zeroQ(phi, dim)
	sym := make([]float64, dim*dim)
	for i := 0; i < dim; i++ {
		for j := 0; j < dim; j++ {
			sym[i*dim+j] = (c0[i*dim+j] + c0[j*dim+i]) / 2
		}
	}
	// (S·P)_{i,(κ'β)} = (1/N) Σ_κ'' S_{i,(κ''β)}: the row mean over atoms of each Cartesian column.
	rowMean := make([]float64, dim*3) // rowMean[i*3+β]
	for i := 0; i < dim; i++ {
		for b := 0; b < 3; b++ {
			s := 0.0
			for k := 0; k < n; k++ {
				s += sym[i*dim+3*k+b]
			}
			rowMean[i*3+b] = s / float64(n)
		}
	}
	// P·S·P block (α,β) = (1/N²) Σ_{κ,κ'} S_{κα,κ'β}.
	var all [3][3]float64
	for a := 0; a < 3; a++ {
		for b := 0; b < 3; b++ {
			s := 0.0
			for k := 0; k < n; k++ {
				s += rowMean[(3*k+a)*3+b]
			}
			all[a][b] = s / float64(n)
		}
	}
	d := make([]float64, dim*dim)
	for i := 0; i < dim; i++ {
		a := i % 3
		for j := 0; j < dim; j++ {
			b := j % 3
			// Q S Q = S − P S − S P + P S P, and P S = (S P)ᵀ for symmetric S.
			qsq := sym[i*dim+j] - rowMean[j*3+a] - rowMean[i*3+b] + all[a][b]
			d[i*dim+j] = qsq - c0[i*dim+j]
		}
	}
	return d
}
