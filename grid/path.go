package grid

import (
	"errors"
	"fmt"
	"math"
	"strconv"
	"strings"
)

// Vertex is a labelled corner of a band path. Q is in reduced coordinates of the lattice the
// path was made for. Γ is labelled "G".
type Vertex struct {
	Label string
	Q     Vec3
}

// Path is a band path: continuous pieces of at least two vertices each, with a break between
// consecutive pieces.
type Path [][]Vertex

// PathPoint is one sampled point of a path.
type PathPoint struct {
	Q     Vec3    // reduced coordinates (input cell)
	Dir   Vec3    // Cartesian unit vector along the segment (direction of travel)
	Dist  float64 // cumulative distance along the path, 1/Å
	Label string  // vertex label at path vertices, "" elsewhere
}

// gammaTol is the distance in reduced units within which a vertex counts as Γ (q ≡ 0 modulo
// reciprocal lattice vectors).
const gammaTol = 1e-9

func isGamma(f Vec3) bool {
	for _, x := range f {
		if math.Abs(x-math.Round(x)) > gammaTol {
			return false
		}
	}
	return true
}

// ParsePath parses a path written as comma-separated vertices "LABEL f1 f2 f3", each coordinate
// a decimal number or a fraction p/q, with '|' between continuous pieces:
//
//	G 0 0 0, M 1/2 0 0, K 1/3 1/3 0, G 0 0 0 | A 0 0 1/2, L 1/2 0 1/2
//
// The labels "G", "Γ" and "Gamma" (any case) mean Γ and are stored as "G"; other labels are
// kept as written. A label must not itself be a number. Each piece needs at least two vertices.
// The coordinates are reduced coordinates of the cell the path will be sampled on.
func ParsePath(s string) (Path, error) {
	if strings.TrimSpace(s) == "" {
		return nil, errors.New("grid: empty path")
	}
	var p Path
	k := 0
	for i, text := range strings.Split(s, "|") {
		var piece []Vertex
		for _, item := range strings.Split(text, ",") {
			k++
			v, err := parseVertex(item)
			if err != nil {
				return nil, fmt.Errorf("grid: path vertex %d (%q): %w", k, strings.TrimSpace(item), err)
			}
			piece = append(piece, v)
		}
		if len(piece) < 2 {
			return nil, fmt.Errorf("grid: path piece %d (%q) has one vertex; a piece needs at least two", i+1, strings.TrimSpace(text))
		}
		p = append(p, piece)
	}
	return p, nil
}

func parseVertex(item string) (Vertex, error) {
	f := strings.Fields(item)
	switch {
	case len(f) == 0:
		return Vertex{}, errors.New("empty vertex")
	case len(f) != 4:
		return Vertex{}, fmt.Errorf("want a label and three reduced coordinates, got %d fields", len(f))
	}
	if _, err := parseCoordinate(f[0]); err == nil {
		return Vertex{}, fmt.Errorf("label %q is a number (missing label?)", f[0])
	}
	v := Vertex{Label: f[0]}
	if f[0] == "Γ" || strings.EqualFold(f[0], "G") || strings.EqualFold(f[0], "gamma") {
		v.Label = "G"
	}
	for i := 0; i < 3; i++ {
		x, err := parseCoordinate(f[i+1])
		if err != nil {
			return Vertex{}, fmt.Errorf("coordinate %d: %w", i+1, err)
		}
		v.Q[i] = x
	}
	return v, nil
}

// parseCoordinate parses a finite decimal number or a fraction p/q of two of them.
func parseCoordinate(s string) (float64, error) {
	num, den, frac := strings.Cut(s, "/")
	x, err := strconv.ParseFloat(num, 64)
	if err != nil {
		return 0, fmt.Errorf("%q is not a number or fraction", s)
	}
	if frac {
		d, err := strconv.ParseFloat(den, 64)
		if err != nil {
			return 0, fmt.Errorf("%q is not a number or fraction", s)
		}
		if d == 0 {
			return 0, fmt.Errorf("%q divides by zero", s)
		}
		x /= d
	}
	if math.IsNaN(x) || math.IsInf(x, 0) {
		return 0, fmt.Errorf("%q is not finite", s)
	}
	return x, nil
}

// String writes p in the syntax of ParsePath, so that ParsePath(p.String()) gives p back
// exactly. Coordinates are written in the shortest decimal that reads back exactly, or, when that
// is long and the value is exactly a fraction with denominator 2–6, 8, 12, 16, 24 or 48, as the
// fraction ("1/3").
func (p Path) String() string {
	var b strings.Builder
	for i, piece := range p {
		if i > 0 {
			b.WriteString(" | ")
		}
		for j, v := range piece {
			if j > 0 {
				b.WriteString(", ")
			}
			b.WriteString(v.Label)
			for _, x := range v.Q {
				b.WriteByte(' ')
				b.WriteString(formatCoordinate(x))
			}
		}
	}
	return b.String()
}

func formatCoordinate(x float64) string {
	s := strconv.FormatFloat(x, 'g', -1, 64)
	if len(s) > 6 && math.Abs(x) < 1e6 {
		for _, d := range []float64{2, 3, 4, 5, 6, 8, 12, 16, 24, 48} {
			if n := math.Round(x * d); n/d == x {
				g := gcdInt(absInt(int(n)), int(d))
				return strconv.Itoa(int(n)/g) + "/" + strconv.Itoa(int(d)/g)
			}
		}
	}
	return s
}

// snapTol is the distance within which AutoPath rounds a reduced coordinate to a multiple of
// 1/48 (all tabulated points have such coordinates in the usual cells); it only removes rounding
// noise and moves a point by far less than any tolerance downstream.
const snapTol = 1e-10

// AutoPath classifies l (see Classify) and returns the default path of its type, in reduced
// coordinates of l itself, with the type. Routes (Γ written G, "|" a break):
//
//	oblique              G–X–H1–S–H2–Y–G
//	rectangular          G–X–S–Y–G–S
//	centred rectangular  G–Y–K–X–K1–G
//	square               G–X–M–G
//	hexagonal (2d)       G–M–K–G
//	cubic P              G–X–M–G–R–X | M–R
//	cubic F              G–X–W–K–G–L–U–W–L–K | U–X
//	cubic I              G–H–N–G–P–H | P–N
//	hexagonal (3d)       G–M–K–G–A–L–H–A | L–M | K–H
//	tetragonal P         G–X–M–G–Z–R–A–Z | X–R | M–A
//	orthorhombic P       G–X–S–Y–G–Z–U–R–T–Z | Y–T | U–X | S–R
//
// The points are placed from the zone's geometry on a conventional cell found from the
// lattice's symmetry (bzone.go documents each label) and converted to l's reduced coordinates
// through Cartesian coordinates, f_i = q·a_i/2π (f3 = 0 for a sheet), so they do not depend on
// the choice of input cell. Where the lattice has several equivalent choices (which cube axis is
// x, which of the mirror-related edges is X) one is taken; the Cartesian points of two settings
// of one lattice differ by a lattice symmetry only. A bulk lattice of another type gives an
// *UnsupportedLatticeError asking for an explicit path.
func AutoPath(l Lattice) (Path, Bravais, error) {
	c, err := classify(l)
	if err != nil {
		return nil, c.kind, err
	}
	var p Path
	for _, piece := range c.zonePath(l) {
		var vs []Vertex
		for _, z := range piece {
			f := l.Reduced(z.q)
			if l.Periodicity == Sheet {
				f[2] = 0
			}
			for i, x := range f {
				if s := math.Round(x*48) / 48; math.Abs(x-s) <= snapTol {
					f[i] = s
				}
			}
			vs = append(vs, Vertex{z.label, f})
		}
		p = append(p, vs)
	}
	return p, c.kind, nil
}

// segment is one straight piece of a path between two vertices.
type segment struct {
	from, to Vertex
	length   float64 // 1/Å
	dir      Vec3    // Cartesian unit vector from → to
	first    bool    // first segment of its piece
}

// Sample returns n points along p on lattice l. The points are shared among the segments in
// proportion to their Cartesian length (every segment keeps at least its two ends), and Dist is
// the cumulative Cartesian distance in 1/Å, for a sheet measured in the plane. Vertex points
// carry the vertex label and its exact coordinates. Where two segments of a piece meet, the
// vertex is emitted once (with the direction of the segment that ends there), except at Γ (q ≡ 0
// modulo reciprocal lattice vectors, within 1e-9 in reduced units): Γ is emitted twice at the same
// distance, as the end of the incoming segment with its direction and as the start of the
// outgoing one with its own, for the direction-dependent limit of a bulk polar crystal. At a
// break both sides are emitted and the distance does not advance.
//
// Errors: a piece of fewer than two vertices, a non-finite coordinate, a vertex with f3 ≠ 0 on a
// sheet, a segment of zero length, or n smaller than the number of vertex points the path needs.
func (p Path) Sample(l Lattice, n int) ([]PathPoint, error) {
	if len(p) == 0 {
		return nil, errors.New("grid: empty path")
	}
	b := l.Reciprocal()
	scale := math.Max(math.Max(row(b, 0).Norm(), row(b, 1).Norm()), row(b, 2).Norm())
	cart := func(f Vec3) Vec3 {
		q := l.Cartesian(f)
		if l.Periodicity == Sheet {
			q[2] = 0 // the in-plane reciprocal vectors of a1, a2 are the projections of b1, b2
		}
		return q
	}
	var segs []segment
	need := 0 // vertex points
	k := 0
	for i, piece := range p {
		if len(piece) < 2 {
			return nil, fmt.Errorf("grid: path piece %d has %d vertices; a piece needs at least two", i+1, len(piece))
		}
		for j, v := range piece {
			k++
			for _, x := range v.Q {
				if math.IsNaN(x) || math.IsInf(x, 0) {
					return nil, fmt.Errorf("grid: path vertex %d (%s): coordinates %v not finite", k, v.Label, v.Q)
				}
			}
			if l.Periodicity == Sheet && math.Abs(v.Q[2]) > gammaTol {
				return nil, fmt.Errorf("grid: path vertex %d (%s) has f3 = %g, but a 2d lattice has only in-plane q (f3 = 0)", k, v.Label, v.Q[2])
			}
			need++
			if j > 0 && j < len(piece)-1 && isGamma(v.Q) {
				need++
			}
			if j == 0 {
				continue
			}
			d := cart(v.Q).Sub(cart(piece[j-1].Q))
			length := d.Norm()
			if length <= 1e-12*scale {
				return nil, fmt.Errorf("grid: path segment %s → %s (vertices %d and %d) has zero length", piece[j-1].Label, v.Label, k-1, k)
			}
			segs = append(segs, segment{piece[j-1], v, length, d.Scale(1 / length), j == 1})
		}
	}
	if n < need {
		return nil, fmt.Errorf("grid: %d points are too few for a path of %d segments: it needs at least %d (each vertex once, Γ twice where two segments meet)", n, len(segs), need)
	}
	lengths := make([]float64, len(segs))
	for i, s := range segs {
		lengths[i] = s.length
	}
	intervals := shareIntervals(lengths, n-need+len(segs))

	out := make([]PathPoint, 0, n)
	dist := 0.0
	for i, s := range segs {
		m := intervals[i]
		for j := 0; j <= m; j++ {
			if j == 0 && !s.first && !isGamma(s.from.Q) {
				continue // emitted as the end of the previous segment
			}
			pt := PathPoint{Dir: s.dir}
			switch j {
			case 0:
				pt.Q, pt.Dist, pt.Label = s.from.Q, dist, s.from.Label
			case m:
				pt.Q, pt.Dist, pt.Label = s.to.Q, dist+s.length, s.to.Label
			default:
				t := float64(j) / float64(m)
				pt.Q = s.from.Q.Add(s.to.Q.Sub(s.from.Q).Scale(t))
				pt.Dist = dist + t*s.length
			}
			out = append(out, pt)
		}
		dist += s.length
	}
	if len(out) != n {
		panic(fmt.Sprintf("grid: Sample emitted %d points, want %d (interval bookkeeping broken)", len(out), n))
	}
	return out, nil
}

// shareIntervals splits total intervals among segments of the given lengths, at least one each,
// as evenly spaced as possible: start from the proportional share rounded down, then add an
// interval where the spacing is largest, or take one away where it would stay smallest. total
// must be at least len(lengths).
func shareIntervals(lengths []float64, total int) []int {
	sum := 0.0
	for _, x := range lengths {
		sum += x
	}
	k := make([]int, len(lengths))
	have := 0
	for i, x := range lengths {
		k[i] = max(1, int(math.Floor(float64(total)*x/sum)))
		have += k[i]
	}
	for ; have < total; have++ {
		best := 0
		for i := range k {
			if lengths[i]/float64(k[i]) > lengths[best]/float64(k[best]) {
				best = i
			}
		}
		k[best]++
	}
	for ; have > total; have-- {
		best := -1
		for i := range k {
			if k[i] > 1 && (best < 0 || lengths[i]/float64(k[i]-1) < lengths[best]/float64(k[best]-1)) {
				best = i
			}
		}
		k[best]--
	}
	return k
}
