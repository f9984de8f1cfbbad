package grid

import (
	"math"
	"math/rand/v2"
	"strings"
	"testing"
)

// planeReciprocal returns the in-plane reciprocal vectors of a1, a2 (b_i·a_j = 2π δ_ij, b_i ⟂ ẑ),
// written out independently of the code under test.
func planeReciprocal(a1, a2 Vec3) (Vec3, Vec3) {
	z := Vec3{0, 0, 1}
	u, v := a2.Cross(z), z.Cross(a1)
	return u.Scale(2 * math.Pi / a1.Dot(u)), v.Scale(2 * math.Pi / a2.Dot(v))
}

// cartesianOf returns the Cartesian q of reduced coordinates f: Σ f_i b_i in 3D, and for a sheet
// the in-plane f1 b1 + f2 b2 (the metric in which sheet paths are measured).
func cartesianOf(l Lattice, f Vec3) Vec3 {
	if l.Periodicity == Sheet {
		b1, b2 := planeReciprocal(l.A(0), l.A(1))
		return b1.Scale(f[0]).Add(b2.Scale(f[1]))
	}
	return l.Cartesian(f)
}

// reciprocalVectors returns the reciprocal lattice vectors Σ n_i b_i, |n_i| ≤ 4, n ≠ 0, of the
// (nearly reduced) catalogue cell of c: enough to find every zone face around Γ.
func reciprocalVectors(c latticeCase) []Vec3 {
	l, _ := NewLattice(c.cell, c.p)
	var b [3]Vec3
	if c.p == Sheet {
		b[0], b[1] = planeReciprocal(l.A(0), l.A(1))
	} else {
		r := l.Reciprocal()
		b = [3]Vec3{Vec3(r[0]), Vec3(r[1]), Vec3(r[2])}
	}
	kmax := 4
	if c.p == Sheet {
		kmax = 0
	}
	var out []Vec3
	for i := -4; i <= 4; i++ {
		for j := -4; j <= 4; j++ {
			for k := -kmax; k <= kmax; k++ {
				if i != 0 || j != 0 || k != 0 {
					out = append(out, b[0].Scale(float64(i)).Add(b[1].Scale(float64(j))).Add(b[2].Scale(float64(k))))
				}
			}
		}
	}
	return out
}

// onZoneSurface reports whether q is as far from Γ as from its nearest non-zero reciprocal
// lattice vector G, with no G closer: the definition of the Brillouin-zone surface (common
// practice). The relative tolerance 1e-9 is far above the ~1e-15 rounding of the construction
// and far below any geometric slip (a point off a face by 1e-9 of |q|).
func onZoneSurface(q Vec3, gs []Vec3) (bool, float64, float64) {
	d0, dmin := q.Norm(), math.Inf(1)
	for _, g := range gs {
		dmin = math.Min(dmin, q.Sub(g).Norm())
	}
	return math.Abs(dmin-d0) <= 1e-9*d0, d0, dmin
}

// knownDistances gives |q| of the special points in terms of the conventional lengths
// (derived: half a reciprocal lattice vector for a face centre, or the sums of orthogonal
// components given; common practice for the textbook points).
func knownDistances(c latticeCase) map[string]float64 {
	pi, a, b, cc := math.Pi, c.a, c.b, c.c
	s2, s3 := math.Sqrt2, math.Sqrt(3)
	hyp := math.Hypot
	switch c.kind {
	case Rectangular:
		return map[string]float64{"X": pi / a, "Y": pi / b, "S": hyp(pi/a, pi/b)}
	case CentredRectangular:
		// Reciprocal lattice: (2πh/a, 2πk/b) with h+k even; for a < b the obtuse superbase is
		// (±2π/a, 2π/b) and (0, −4π/b), so Y = (0, 2π/b) and X = (−π/a, π/b). K = (k, 2π/b)
		// is as far from (−2π/a, 2π/b) as from 0: k = π(a/b² − 1/a). K1 = (−k1, 0) is as far
		// from (−2π/a, ±2π/b) as from 0: k1 = π(1/a + a/b²). Both come out π(1/a + a/b²) from Γ
		// (the Delaunay triangles of the zone's vertices are congruent).
		return map[string]float64{"Y": 2 * pi / b, "X": hyp(pi/a, pi/b), "K": hyp(pi*(a/(b*b)-1/a), 2*pi/b), "K1": pi * (1/a + a/(b*b))}
	case Square:
		return map[string]float64{"X": pi / a, "M": s2 * pi / a}
	case Hexagonal2D:
		return map[string]float64{"M": 2 * pi / (s3 * a), "K": 4 * pi / (3 * a)}
	case CubicP:
		return map[string]float64{"X": pi / a, "M": s2 * pi / a, "R": s3 * pi / a}
	case CubicF:
		// (2π/a)·(0,1,0), (½,½,½), (½,1,0), (¾,¾,0), (¼,1,¼)
		return map[string]float64{"X": 2 * pi / a, "L": s3 * pi / a, "W": math.Sqrt(5) * pi / a,
			"K": 3 * s2 * pi / (2 * a), "U": 3 * s2 * pi / (2 * a)}
	case CubicI:
		return map[string]float64{"H": 2 * pi / a, "N": s2 * pi / a, "P": s3 * pi / a}
	case Hexagonal3D:
		m, k, z := 2*pi/(s3*a), 4*pi/(3*a), pi/cc
		return map[string]float64{"M": m, "K": k, "A": z, "L": hyp(m, z), "H": hyp(k, z)}
	case TetragonalP:
		x, z := pi/a, pi/cc
		return map[string]float64{"X": x, "M": s2 * x, "Z": z, "R": hyp(x, z), "A": hyp(s2*x, z)}
	case OrthorhombicP:
		x, y, z := pi/a, pi/b, pi/cc
		return map[string]float64{"X": x, "Y": y, "Z": z, "S": hyp(x, y), "U": hyp(x, z), "T": hyp(y, z),
			"R": math.Sqrt(x*x + y*y + z*z)}
	}
	return nil
}

// The routes of the brief (common practice) and, for oblique and centred rectangular sheets,
// the ones documented in bzone.go.
var wantRoutes = map[Bravais]string{
	Oblique:            "G X H1 S H2 Y G",
	Rectangular:        "G X S Y G S",
	CentredRectangular: "G Y K X K1 G",
	Square:             "G X M G",
	Hexagonal2D:        "G M K G",
	CubicP:             "G X M G R X | M R",
	CubicF:             "G X W K G L U W L K | U X",
	CubicI:             "G H N G P H | P N",
	Hexagonal3D:        "G M K G A L H A | L M | K H",
	TetragonalP:        "G X M G Z R A Z | X R | M A",
	OrthorhombicP:      "G X S Y G Z U R T Z | Y T | U X | S R",
}

func route(p Path) string {
	var pieces []string
	for _, piece := range p {
		var ls []string
		for _, v := range piece {
			ls = append(ls, v.Label)
		}
		pieces = append(pieces, strings.Join(ls, " "))
	}
	return strings.Join(pieces, " | ")
}

func isGammaRef(f Vec3) bool {
	for _, x := range f {
		if math.Abs(x-math.Round(x)) > 1e-9 {
			return false
		}
	}
	return true
}

// checkZone checks one automatic path: its route, Γ at the G vertices, every other vertex on the
// zone surface at its known distance, and every segment not touching Γ running on the surface
// (its quarter, half and three-quarter points on a face).
func checkZone(t *testing.T, name string, c latticeCase, l Lattice, p Path, gs []Vec3) {
	t.Helper()
	if got := route(p); got != wantRoutes[c.kind] {
		t.Errorf("%s: route %q, want %q", name, got, wantRoutes[c.kind])
	}
	known := knownDistances(c)
	for _, piece := range p {
		for j, v := range piece {
			if l.Periodicity == Sheet && v.Q[2] != 0 {
				t.Errorf("%s: %s has f3 = %g on a sheet", name, v.Label, v.Q[2])
			}
			q := cartesianOf(l, v.Q)
			if v.Label == "G" {
				if !isGammaRef(v.Q) {
					t.Errorf("%s: G at %v, not Γ", name, v.Q)
				}
				continue
			}
			if ok, d0, dmin := onZoneSurface(q, gs); !ok {
				t.Errorf("%s: %s at %v: |q| = %.12g but nearest G at %.12g: not on the zone surface", name, v.Label, v.Q, d0, dmin)
			}
			if want, ok := known[v.Label]; ok && math.Abs(q.Norm()-want) > 1e-9*want {
				t.Errorf("%s: |%s| = %.12g 1/Å, want %.12g", name, v.Label, q.Norm(), want)
			}
			if j == 0 || piece[j-1].Label == "G" {
				continue
			}
			prev := cartesianOf(l, piece[j-1].Q)
			for _, s := range []float64{0.25, 0.5, 0.75} {
				x := prev.Add(q.Sub(prev).Scale(s))
				if ok, d0, dmin := onZoneSurface(x, gs); !ok {
					t.Errorf("%s: segment %s–%s leaves the zone surface at %g: |q| = %.12g, nearest G at %.12g", name, piece[j-1].Label, v.Label, s, d0, dmin)
				}
			}
		}
	}
}

func cartesianVertices(l Lattice, p Path) []Vec3 {
	var out []Vec3
	for _, piece := range p {
		for _, v := range piece {
			out = append(out, cartesianOf(l, v.Q))
		}
	}
	return out
}

func TestAutoPathZoneGeometry(t *testing.T) {
	rng := rand.New(rand.NewPCG(4, 1))
	for _, c := range catalogue() {
		gs := reciprocalVectors(c)
		base := mustLattice(t, c.cell, c.p)
		p0, kind, err := AutoPath(base)
		if err != nil || kind != c.kind {
			t.Errorf("AutoPath(%s) = %v, %v; want %v", c.name, kind, err, c.kind)
			continue
		}
		checkZone(t, c.name, c, base, p0, gs)
		q0 := cartesianVertices(base, p0)
		scale := 0.0
		for _, q := range q0 {
			scale = math.Max(scale, q.Dot(q))
		}
		for _, v := range variants(c, rng) {
			l := mustLattice(t, v.cell, c.p)
			p, kind, err := AutoPath(l)
			name := c.name + ", " + v.name
			if err != nil || kind != c.kind {
				t.Errorf("AutoPath(%s) = %v, %v; want %v", name, kind, err, c.kind)
				continue
			}
			// The zone of a rotated cell is the rotated zone.
			gv := make([]Vec3, len(gs))
			for k, g := range gs {
				gv[k] = v.rot.MulVec(g)
			}
			checkZone(t, name, c, l, p, gv)
			// Same points up to one orthogonal map (a rotation and a lattice symmetry): equal Gram
			// matrices of the vertex lists. Tolerance: rounding, far below any change of point.
			q := cartesianVertices(l, p)
			if len(q) != len(q0) {
				continue
			}
			for i := range q {
				for j := range q {
					if d := q[i].Dot(q[j]) - q0[i].Dot(q0[j]); math.Abs(d) > 1e-9*scale {
						t.Errorf("%s: q%d·q%d differs from the base setting by %g", name, i, j, d)
					}
				}
			}
		}
	}
}

// Cells in the textbook setting get the textbook reduced coordinates (from memory: the
// standard tables of fcc and hexagonal zone points).
func TestAutoPathTextbookSetting(t *testing.T) {
	cases := []struct {
		name string
		cell Mat3
		p    Periodicity
		want map[string]Vec3
	}{
		{"fcc", Mat3{{0, 2.1, 2.1}, {2.1, 0, 2.1}, {2.1, 2.1, 0}}, Bulk, map[string]Vec3{
			"X": {0.5, 0, 0.5}, "L": {0.5, 0.5, 0.5}, "W": {0.5, 0.25, 0.75}, "K": {0.375, 0.375, 0.75}, "U": {0.625, 0.25, 0.625}}},
		{"hexagonal", Mat3{{2.9, 0, 0}, {-1.45, 1.45 * math.Sqrt(3), 0}, {0, 0, 4.7}}, Bulk, map[string]Vec3{
			"M": {0.5, 0, 0}, "K": {1. / 3, 1. / 3, 0}, "A": {0, 0, 0.5}, "L": {0.5, 0, 0.5}, "H": {1. / 3, 1. / 3, 0.5}}},
		{"hexagonal sheet", Mat3{{2.5, 0, 0}, {-1.25, 1.25 * math.Sqrt(3), 0}, {0, 0, 15}}, Sheet, map[string]Vec3{
			"M": {0.5, 0, 0}, "K": {1. / 3, 1. / 3, 0}}},
		{"cube", Mat3{{3.1, 0, 0}, {0, 3.1, 0}, {0, 0, 3.1}}, Bulk, map[string]Vec3{
			"X": {0, 0.5, 0}, "M": {0.5, 0.5, 0}, "R": {0.5, 0.5, 0.5}}},
	}
	for _, c := range cases {
		p, _, err := AutoPath(mustLattice(t, c.cell, c.p))
		if err != nil {
			t.Errorf("AutoPath(%s): %v", c.name, err)
			continue
		}
		for _, piece := range p {
			for _, v := range piece {
				if w, ok := c.want[v.Label]; ok && v.Q.Sub(w).Norm() > 1e-12 {
					t.Errorf("AutoPath(%s): %s = %v, want %v", c.name, v.Label, v.Q, w)
				}
			}
		}
	}
}

func TestParsePath(t *testing.T) {
	p, err := ParsePath("G 0 0 0, M 1/2 0 0, K 1/3 1/3 0, Γ 0 0 0 | A 0 0 0.5,  gamma -1/4 2.5e-1 1")
	if err != nil {
		t.Fatal(err)
	}
	want := Path{
		{{"G", Vec3{}}, {"M", Vec3{0.5, 0, 0}}, {"K", Vec3{1.0 / 3, 1.0 / 3, 0}}, {"G", Vec3{}}},
		{{"A", Vec3{0, 0, 0.5}}, {"G", Vec3{-0.25, 0.25, 1}}},
	}
	if !equalPaths(p, want) {
		t.Errorf("ParsePath = %v, want %v", p, want)
	}
	if s := want.String(); s != "G 0 0 0, M 0.5 0 0, K 1/3 1/3 0, G 0 0 0 | A 0 0 0.5, G -0.25 0.25 1" {
		t.Errorf("String() = %q", s)
	}
	// What String writes reads back exactly, also for automatic paths with irrational points.
	for _, c := range catalogue() {
		ap, _, err := AutoPath(mustLattice(t, c.cell, c.p))
		if err != nil {
			t.Fatal(err)
		}
		back, err := ParsePath(ap.String())
		if err != nil || !equalPaths(back, ap) {
			t.Errorf("%s: ParsePath(%q) = %v, %v; want %v", c.name, ap.String(), back, err, ap)
		}
	}
}

func equalPaths(p, q Path) bool {
	if len(p) != len(q) {
		return false
	}
	for i := range p {
		if len(p[i]) != len(q[i]) {
			return false
		}
		for j := range p[i] {
			if p[i][j] != q[i][j] {
				return false
			}
		}
	}
	return true
}

func TestParsePathErrors(t *testing.T) {
	cases := []struct{ in, want string }{
		{"", "empty path"},
		{"  ", "empty path"},
		{"G 0 0", `vertex 1 ("G 0 0"): want a label and three`},
		{"G 0 0 0, X 0.5 0", `vertex 2 ("X 0.5 0")`},
		{"G 0 0 0, X 1/0 0 0", `vertex 2 ("X 1/0 0 0"): coordinate 1: "1/0" divides by zero`},
		{"G 0 0 0, X a 0 0", `vertex 2 ("X a 0 0"): coordinate 1: "a" is not a number`},
		{"G 0 0 0, X 0 1/2/3 0", `vertex 2 ("X 0 1/2/3 0"): coordinate 2`},
		{"G 0 0 0, X 0 0 NaN", `vertex 2 ("X 0 0 NaN"): coordinate 3: "NaN" is not finite`},
		{"G 0 0 0, 0.5 0 0 0", `vertex 2 ("0.5 0 0 0"): label "0.5" is a number`},
		{"G 0 0 0,, X 1 0 0", `vertex 2 (""): empty vertex`},
		{"G 0 0 0, X 0.5 0 0 |", `vertex 3 (""): empty vertex`},
		{"G 0 0 0 | X 0.5 0 0, M 0.5 0.5 0", `piece 1 ("G 0 0 0") has one vertex`},
	}
	for _, c := range cases {
		p, err := ParsePath(c.in)
		if err == nil || !strings.Contains(err.Error(), c.want) || !strings.HasPrefix(err.Error(), "grid: ") {
			t.Errorf("ParsePath(%q) = %v, %v; want an error containing %q", c.in, p, err, c.want)
		}
	}
}

func FuzzParsePath(f *testing.F) {
	for _, s := range []string{
		"G 0 0 0, M 1/2 0 0, K 1/3 1/3 0, G 0 0 0",
		"G 0 0 0, X 0.5 0 0 | Y 0 0.5 0, Γ 0 0 0",
		"gamma -1/4 2.5e-1 1e-300, K' 0.1 0.2 0.3",
		"A 1/3e-320 0 0, B 0 0 0",
		"G 0 0 0,, X",
	} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		p, err := ParsePath(s)
		if err != nil {
			return
		}
		for _, piece := range p {
			if len(piece) < 2 {
				t.Fatalf("ParsePath(%q) gave a piece of %d vertices", s, len(piece))
			}
		}
		back, err := ParsePath(p.String())
		if err != nil || !equalPaths(back, p) {
			t.Fatalf("ParsePath(%q).String() = %q reads back as %v, %v; want %v", s, p.String(), back, err, p)
		}
	})
}

// checkSample verifies a sampled path against the rules of Sample, recomputing every distance and
// direction independently: the vertex sequence (each once, Γ twice where two segments meet,
// both sides of a break), exact vertex coordinates, cumulative Cartesian distances, directions,
// interior points on their segment, and (spread > 0) every segment's spacing within spread of
// the path's mean spacing.
func checkSample(t *testing.T, name string, l Lattice, p Path, n int, pts []PathPoint, spread float64) {
	t.Helper()
	if len(pts) != n {
		t.Fatalf("%s: %d points, want %d", name, len(pts), n)
	}
	total, intervals := 0.0, 0
	type seg struct {
		length float64
		m      int
	}
	var segs []seg
	i, dist := 0, 0.0
	near := func(x, y float64) bool { return math.Abs(x-y) <= 1e-12*math.Max(1, math.Abs(y)) }
	sameDir := func(u, v Vec3) bool { return u.Sub(v).Norm() <= 1e-12 }
	expectVertex := func(v Vertex, d float64, dir Vec3) {
		t.Helper()
		if i >= len(pts) {
			t.Fatalf("%s: ran out of points before vertex %s", name, v.Label)
		}
		pt := pts[i]
		if pt.Label != v.Label || pt.Q != v.Q || !near(pt.Dist, d) || !sameDir(pt.Dir, dir) {
			t.Errorf("%s: point %d = %+v, want vertex %s at %v, distance %.15g, direction %v", name, i, pt, v.Label, v.Q, d, dir)
		}
		i++
	}
	for _, piece := range p {
		for j := 1; j < len(piece); j++ {
			from, to := piece[j-1], piece[j]
			d := cartesianOf(l, to.Q).Sub(cartesianOf(l, from.Q))
			length := d.Norm()
			dir := d.Scale(1 / length)
			if j == 1 || isGammaRef(from.Q) {
				expectVertex(from, dist, dir)
			}
			start := i
			for i < len(pts) && pts[i].Label == "" {
				pt := pts[i]
				s := (pt.Dist - dist) / length
				want := from.Q.Add(to.Q.Sub(from.Q).Scale(s))
				if !(s > 0 && s < 1) || pt.Q.Sub(want).Norm() > 1e-12 || !sameDir(pt.Dir, dir) || (i > 0 && !(pt.Dist > pts[i-1].Dist)) {
					t.Errorf("%s: point %d = %+v is not on segment %s–%s (s = %g)", name, i, pt, from.Label, to.Label, s)
				}
				i++
			}
			m := i - start + 1
			expectVertex(to, dist+length, dir)
			segs = append(segs, seg{length, m})
			total += length
			intervals += m
			dist += length
		}
	}
	if i != len(pts) {
		t.Errorf("%s: %d points left over after the last vertex", name, len(pts)-i)
	}
	if spread > 0 {
		mean := total / float64(intervals)
		for k, s := range segs {
			if h := s.length / float64(s.m); math.Abs(h-mean) > spread*mean {
				t.Errorf("%s: segment %d spacing %.4g 1/Å, mean %.4g (tolerance %g)", name, k, h, mean, spread)
			}
		}
	}
}

func TestSampleAutoPaths(t *testing.T) {
	for _, c := range catalogue() {
		l := mustLattice(t, c.cell, c.p)
		p, _, err := AutoPath(l)
		if err != nil {
			t.Fatal(err)
		}
		for _, n := range []int{40, 301} {
			pts, err := p.Sample(l, n)
			if err != nil {
				t.Errorf("%s: Sample(%d): %v", c.name, n, err)
				continue
			}
			// With 301 points every segment has ≥ 10 intervals, so rounding to whole intervals moves
			// a spacing by at most about 1/10 of the mean: 0.15 allows for that.
			spread := 0.0
			if n == 301 {
				spread = 0.15
			}
			checkSample(t, c.name, l, p, n, pts, spread)
		}
	}
}

// Γ in the middle of a piece appears twice at one distance, each copy with its own segment's
// direction; the end of a piece and the start of the next share a distance.
func TestSampleGammaAndBreak(t *testing.T) {
	l := mustLattice(t, Mat3{{3, 0, 0}, {0, 3.5, 0}, {0, 0, 4}}, Bulk)
	p, err := ParsePath("X 1/2 0 0, G 0 0 0, Z 0 0 1/2 | Y 0 1/2 0, G 1 0 0, X 1/2 0 0")
	if err != nil {
		t.Fatal(err)
	}
	const n = 30
	pts, err := p.Sample(l, n)
	if err != nil {
		t.Fatal(err)
	}
	checkSample(t, "two pieces", l, p, n, pts, 0)
	var gs, ends []PathPoint
	for k, pt := range pts {
		if pt.Label == "G" {
			gs = append(gs, pt)
		}
		if pt.Label == "Z" || (pt.Label == "Y" && k > 0) {
			ends = append(ends, pt)
		}
	}
	// derived: |XΓ| = π/3, |ΓZ| = π/4 and, Γ at (1, 0, 0) being Γ of the next zone,
	// Y → Γ' = b1 − b2/2 = (2π/3, −π/3.5, 0), all 1/Å
	dX, dZ, dY := math.Pi/3, math.Pi/4, math.Hypot(2*math.Pi/3, math.Pi/3.5)
	if len(gs) != 4 {
		t.Fatalf("%d Γ points, want 4 (two per Γ joint)", len(gs))
	}
	for k, want := range []struct {
		d   float64
		dir Vec3
	}{{dX, Vec3{-1, 0, 0}}, {dX, Vec3{0, 0, 1}}, {dX + dZ + dY, Vec3{2 * math.Pi / 3, -math.Pi / 3.5, 0}}, {dX + dZ + dY, Vec3{-1 / 3.0, 0, 0}}} {
		dir := want.dir.Scale(1 / want.dir.Norm())
		if math.Abs(gs[k].Dist-want.d) > 1e-12 || gs[k].Dir.Sub(dir).Norm() > 1e-12 {
			t.Errorf("Γ copy %d: distance %.15g, direction %v; want %.15g, %v", k, gs[k].Dist, gs[k].Dir, want.d, dir)
		}
	}
	if len(ends) != 2 || ends[0].Dist != ends[1].Dist || ends[0].Q == ends[1].Q {
		t.Errorf("break: end of piece 1 and start of piece 2 = %+v, want two points at one distance", ends)
	}
}

// A sheet is measured in its plane, whatever the tilt of a3.
func TestSampleSheetInPlane(t *testing.T) {
	a := 3.2
	l := mustLattice(t, Mat3{{a, 0, 0}, {0, a, 0}, {1.1, -0.7, 14}}, Sheet)
	p, _, err := AutoPath(l)
	if err != nil {
		t.Fatal(err)
	}
	pts, err := p.Sample(l, 50)
	if err != nil {
		t.Fatal(err)
	}
	checkSample(t, "tilted square sheet", l, p, 50, pts, 0)
	// derived: G–X–M–G of the square zone is π/a + π/a + √2 π/a long
	want := (2 + math.Sqrt2) * math.Pi / a
	if got := pts[len(pts)-1].Dist; math.Abs(got-want) > 1e-12*want {
		t.Errorf("path length %.15g 1/Å, want %.15g", got, want)
	}
	for _, pt := range pts {
		if pt.Dir[2] != 0 {
			t.Errorf("direction %v leaves the plane", pt.Dir)
		}
	}
}

func TestSampleErrors(t *testing.T) {
	bulk := mustLattice(t, Mat3{{3, 0, 0}, {0, 3, 0}, {0, 0, 3}}, Bulk)
	sheet := mustLattice(t, Mat3{{3, 0, 0}, {0, 3, 0}, {0, 0, 15}}, Sheet)
	parse := func(s string) Path {
		p, err := ParsePath(s)
		if err != nil {
			t.Fatal(err)
		}
		return p
	}
	// The fcc route G X W K G L U W L K | U X needs 13 vertex points: 10 + 2 vertices, and Γ
	// once more where it joins K–G and G–L.
	fccLattice := mustLattice(t, Mat3{{0, 2, 2}, {2, 0, 2}, {2, 2, 0}}, Bulk)
	fcc, _, err := AutoPath(fccLattice)
	if err != nil {
		t.Fatal(err)
	}
	if pts, err := fcc.Sample(fccLattice, 13); err != nil || len(pts) != 13 {
		t.Errorf("fcc Sample(13) = %d points, %v; want the 13 vertex points", len(pts), err)
	}
	cases := []struct {
		name string
		l    Lattice
		p    Path
		n    int
		want string
	}{
		{"too few points", fccLattice, fcc, 12, "too few"},
		{"zero-length segment", bulk, parse("G 0 0 0, X 0.5 0 0, X 1/2 0 0, M 0.5 0.5 0"), 20, "X → X (vertices 2 and 3) has zero length"},
		{"out of plane on a sheet", sheet, parse("G 0 0 0, X 0.5 0 0, Z 0 0 0.5"), 20, "vertex 3 (Z) has f3 = 0.5"},
		{"single vertex piece", bulk, Path{{{"G", Vec3{}}, {"X", Vec3{0.5, 0, 0}}}, {{"M", Vec3{0.5, 0.5, 0}}}}, 20, "piece 2 has 1 vertices"},
		{"empty path", bulk, Path{}, 20, "empty path"},
		{"not finite", bulk, Path{{{"G", Vec3{}}, {"X", Vec3{math.NaN(), 0, 0}}}}, 20, "not finite"},
	}
	for _, c := range cases {
		pts, err := c.p.Sample(c.l, c.n)
		if err == nil || !strings.Contains(err.Error(), c.want) || !strings.HasPrefix(err.Error(), "grid: ") {
			t.Errorf("%s: Sample = %d points, %v; want an error containing %q", c.name, len(pts), err, c.want)
		}
	}
}

func BenchmarkAutoPathSample(b *testing.B) {
	l := mustLattice(b, Mat3{{0, 2.1, 2.1}, {2.1, 0, 2.1}, {2.1, 2.1, 0}}, Bulk)
	b.ReportAllocs()
	for b.Loop() {
		p, _, err := AutoPath(l)
		if err != nil {
			b.Fatal(err)
		}
		if _, err := p.Sample(l, 300); err != nil {
			b.Fatal(err)
		}
	}
}
