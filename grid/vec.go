package grid

import "math"

// Vec3 is a Cartesian or reduced 3-vector.
type Vec3 [3]float64

// Mat3 is a 3×3 matrix, indexed [row][column].
type Mat3 [3][3]float64

// Add returns v + w.
func (v Vec3) Add(w Vec3) Vec3 { return Vec3{v[0] + w[0], v[1] + w[1], v[2] + w[2]} }

// Sub returns v − w.
func (v Vec3) Sub(w Vec3) Vec3 { return Vec3{v[0] - w[0], v[1] - w[1], v[2] - w[2]} }

// Scale returns s·v.
func (v Vec3) Scale(s float64) Vec3 { return Vec3{s * v[0], s * v[1], s * v[2]} }

// Dot returns v·w.
func (v Vec3) Dot(w Vec3) float64 { return v[0]*w[0] + v[1]*w[1] + v[2]*w[2] }

// Cross returns v × w.
func (v Vec3) Cross(w Vec3) Vec3 {
	return Vec3{v[1]*w[2] - v[2]*w[1], v[2]*w[0] - v[0]*w[2], v[0]*w[1] - v[1]*w[0]}
}

// Norm returns |v|.
func (v Vec3) Norm() float64 { return math.Sqrt(v.Dot(v)) }

// Identity returns the 3×3 unit matrix.
func Identity() Mat3 { return Mat3{{1, 0, 0}, {0, 1, 0}, {0, 0, 1}} }

// MulVec returns m·v.
func (m Mat3) MulVec(v Vec3) Vec3 {
	return Vec3{
		m[0][0]*v[0] + m[0][1]*v[1] + m[0][2]*v[2],
		m[1][0]*v[0] + m[1][1]*v[1] + m[1][2]*v[2],
		m[2][0]*v[0] + m[2][1]*v[1] + m[2][2]*v[2],
	}
}

// VecMul returns vᵀ·m, that is (vᵀm)_j = Σ_i v_i m_ij.
func (m Mat3) VecMul(v Vec3) Vec3 {
	var r Vec3
	for j := 0; j < 3; j++ {
		r[j] = v[0]*m[0][j] + v[1]*m[1][j] + v[2]*m[2][j]
	}
	return r
}

// Mul returns m·n.
func (m Mat3) Mul(n Mat3) Mat3 {
	var r Mat3
	for i := 0; i < 3; i++ {
		for j := 0; j < 3; j++ {
			r[i][j] = m[i][0]*n[0][j] + m[i][1]*n[1][j] + m[i][2]*n[2][j]
		}
	}
	return r
}

// T returns the transpose of m.
func (m Mat3) T() Mat3 {
	var r Mat3
	for i := 0; i < 3; i++ {
		for j := 0; j < 3; j++ {
			r[i][j] = m[j][i]
		}
	}
	return r
}

// Det returns the determinant of m.
func (m Mat3) Det() float64 {
	return m[0][0]*(m[1][1]*m[2][2]-m[1][2]*m[2][1]) -
		m[0][1]*(m[1][0]*m[2][2]-m[1][2]*m[2][0]) +
		m[0][2]*(m[1][0]*m[2][1]-m[1][1]*m[2][0])
}

// Inv returns the inverse of m. The result is not finite when m is singular; callers check
// Det first where the matrix comes from data.
func (m Mat3) Inv() Mat3 {
	d := m.Det()
	var r Mat3
	r[0][0] = (m[1][1]*m[2][2] - m[1][2]*m[2][1]) / d
	r[0][1] = (m[0][2]*m[2][1] - m[0][1]*m[2][2]) / d
	r[0][2] = (m[0][1]*m[1][2] - m[0][2]*m[1][1]) / d
	r[1][0] = (m[1][2]*m[2][0] - m[1][0]*m[2][2]) / d
	r[1][1] = (m[0][0]*m[2][2] - m[0][2]*m[2][0]) / d
	r[1][2] = (m[0][2]*m[1][0] - m[0][0]*m[1][2]) / d
	r[2][0] = (m[1][0]*m[2][1] - m[1][1]*m[2][0]) / d
	r[2][1] = (m[0][1]*m[2][0] - m[0][0]*m[2][1]) / d
	r[2][2] = (m[0][0]*m[1][1] - m[0][1]*m[1][0]) / d
	return r
}

// Add returns m + n.
func (m Mat3) Add(n Mat3) Mat3 {
	var r Mat3
	for i := 0; i < 3; i++ {
		for j := 0; j < 3; j++ {
			r[i][j] = m[i][j] + n[i][j]
		}
	}
	return r
}

// Scale returns s·m.
func (m Mat3) Scale(s float64) Mat3 {
	var r Mat3
	for i := 0; i < 3; i++ {
		for j := 0; j < 3; j++ {
			r[i][j] = s * m[i][j]
		}
	}
	return r
}

// Quad returns the quadratic form vᵀ·m·v.
func (m Mat3) Quad(v Vec3) float64 { return v.Dot(m.MulVec(v)) }
