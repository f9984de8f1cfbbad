package formats

import (
	"fmt"
	"io"
	"math"

	"lamina/grid"
	"lamina/grid/units"
	"lamina/ifc"
	"lamina/longrange"
)

// Grid is the content of a lamina-grid file, in internal units.
type Grid struct {
	Structure grid.Structure     // Å, amu
	Charges   *longrange.Charges // nil when the file has none
	Mesh      *grid.Mesh         // nil for a held-out set (no "grid" key)
	Phase     ifc.Phase
	Samples   []ifc.Sample // in file order; C in eV/Å², still in the file's phase convention
	Units     Units        // as read: {Length, Energy string}
}

// Units are the units a file was written in, by their canonical spelling: Length "angstrom" or
// "bohr", Energy "eV", "Ry" or "Ha". ReadGrid fills in the defaults ("angstrom", "eV") for
// what the file leaves out; the values in a Grid are always in Å and eV whatever Units says.
type Units struct {
	Length string
	Energy string
}

// FormatName and FormatVersion are the values of the "format" and "version" keys this package
// reads and writes.
const (
	FormatName    = "lamina-grid"
	FormatVersion = 1
)

// Default limits of the readers.
const (
	DefaultMaxBytes   int64 = 2 << 30 // decompressed bytes
	DefaultMaxAtoms         = 10_000
	DefaultMaxQPoints       = 1_000_000
)

// Tolerances of the cross-field checks.
const (
	// sheetQTol is the largest |f3| of a q-point of a 2d file.
	sheetQTol = 1e-9
	// meshTol is the largest distance, in grid steps (|f_i·n_i − m_i|), between a q-point of a
	// grid file and its grid point: loose enough for coordinates written with 6 significant
	// digits (1/3 as 0.333333 is 1e-6 steps off on a 3-point axis), far below half a step.
	meshTol = ifc.DefaultMatchTol
)

type readOptions struct {
	maxBytes   int64
	maxAtoms   int
	maxQPoints int
	err        error
}

func defaultReadOptions() readOptions {
	return readOptions{maxBytes: DefaultMaxBytes, maxAtoms: DefaultMaxAtoms, maxQPoints: DefaultMaxQPoints}
}

// ReadOption sets a limit of ReadGrid or ReadQPoints. A bad value (not positive) makes the read
// fail before it starts.
type ReadOption func(*readOptions)

// WithMaxBytes caps the decompressed size of the input (default DefaultMaxBytes, 2 GiB). An
// input beyond it fails with ErrLimit. The memory ReadGrid allocates is bounded by about four
// times this cap (a number needs at least two bytes of text and eight of memory).
func WithMaxBytes(n int64) ReadOption {
	return func(o *readOptions) {
		if n <= 0 {
			o.err = fmt.Errorf("formats: WithMaxBytes(%d): want a positive size", n)
			return
		}
		o.maxBytes = n
	}
}

// WithMaxAtoms caps the number of atoms (and of Born charge tensors) a grid file may hold
// (default DefaultMaxAtoms, 10000); checked before each one is stored.
func WithMaxAtoms(n int) ReadOption {
	return func(o *readOptions) {
		if n <= 0 {
			o.err = fmt.Errorf("formats: WithMaxAtoms(%d): want a positive count", n)
			return
		}
		o.maxAtoms = n
	}
}

// WithMaxQPoints caps the number of q-points of a grid file or q-point list, and the size
// n1·n2·n3 of a grid (default DefaultMaxQPoints, 1000000); checked before each one is stored.
func WithMaxQPoints(n int) ReadOption {
	return func(o *readOptions) {
		if n <= 0 {
			o.err = fmt.Errorf("formats: WithMaxQPoints(%d): want a positive count", n)
			return
		}
		o.maxQPoints = n
	}
}

func buildReadOptions(opts []ReadOption) (readOptions, error) {
	o := defaultReadOptions()
	for _, opt := range opts {
		opt(&o)
	}
	return o, o.err
}

// Keys of the objects of the format, in the order WriteGrid writes them.
var (
	topKeys    = []string{"format", "version", "units", "periodicity", "lattice", "atoms", "born_charges", "epsilon", "grid", "phase", "qpoints"}
	unitKeys   = []string{"length", "energy"}
	atomKeys   = []string{"species", "mass", "position"}
	sampleKeys = []string{"q", "re", "im"}
)

const (
	kFormat = iota
	kVersion
	kUnits
	kPeriodicity
	kLattice
	kAtoms
	kBorn
	kEpsilon
	kGrid
	kPhase
	kQPoints
)

// Length and energy units a file may use: canonical name and size in Å or eV.
var (
	lengthUnits = []unitDef{{"angstrom", 1}, {"bohr", units.BohrRadius}}
	energyUnits = []unitDef{{"eV", 1}, {"Ry", units.RydbergEV}, {"Ha", units.HartreeEV}}
)

type unitDef struct {
	name string
	size float64
}

// lookupUnit finds s (case-insensitively) among defs.
func lookupUnit(defs []unitDef, s string) (unitDef, bool) {
	for _, d := range defs {
		if equalFold(d.name, s) {
			return d, true
		}
	}
	return unitDef{}, false
}

func unitNames(defs []unitDef) string {
	s := ""
	for i, d := range defs {
		if i > 0 {
			s += ", "
		}
		s += d.name
	}
	return s
}

func equalFold(a, b string) bool {
	if len(a) != len(b) {
		return false
	}
	for i := 0; i < len(a); i++ {
		x, y := a[i], b[i]
		if 'A' <= x && x <= 'Z' {
			x += 'a' - 'A'
		}
		if 'A' <= y && y <= 'Z' {
			y += 'a' - 'A'
		}
		if x != y {
			return false
		}
	}
	return true
}

// ReadGrid reads a lamina-grid file (plain, gzip or zstd, detected by magic bytes) from r;
// name is used in error messages only. Lengths and matrices are converted once to Å and eV/Å²;
// the Born charges are returned as read (not neutralized). On failure it returns nil and an
// error joining up to MaxReportedProblems *ParseError values, each naming the file and the JSON
// path or position, each wrapping one of the package sentinels.
func ReadGrid(r io.Reader, name string, opts ...ReadOption) (*Grid, error) {
	o, err := buildReadOptions(opts)
	if err != nil {
		return nil, err
	}
	src, comp, release, err := openInput(r, name, o.maxBytes)
	if err != nil {
		return nil, err
	}
	defer release()
	src = skipBOM(src)
	p := newGridParser(src, name, o)
	if err := p.walk(); err != nil {
		if comp != None {
			// Corrupt compressed data decodes to garbage that fails as JSON long before the
			// checksum at the end is read: read on, and blame the stream if it is at fault.
			if cerr := corruptStream(src, o.maxBytes); cerr != nil {
				return nil, &ParseError{File: name, Offset: -1, Err: cerr}
			}
		}
		if id := p.identity(); id != nil && p.identityKnown() {
			return nil, id // not a file of ours: the other problems are noise
		}
		p.probs.list = append(p.probs.list, err) // the fatal error is always shown
		return nil, p.probs.err()
	}
	return p.finish()
}

// finish runs the cross-field checks after the walk and builds the Grid.
func (p *gridParser) finish() (*Grid, error) {
	if err := p.identity(); err != nil {
		return nil, err
	}
	p.missing("", p.seen, topKeys, kPeriodicity, kLattice, kAtoms, kQPoints)
	if !p.has(kPhase) {
		p.probs.at("", ErrMissingKey, `missing key "phase": say "cell" or "atom"; it cannot be inferred, `+
			`since a matrix in the other convention (transposed, or with the opposite Fourier sign) is really C(−q)`)
	}
	if p.has(kBorn) != p.has(kEpsilon) {
		if p.has(kBorn) {
			p.probs.at("born_charges", ErrMissingKey, `given without "epsilon": the long-range part needs both`)
		} else {
			p.probs.at("epsilon", ErrMissingKey, `given without "born_charges": the long-range part needs both`)
		}
	}

	ls := p.lengthSize
	ms := p.energySize / (ls * ls) // energy/length² → eV/Å²
	n := len(p.atoms)
	if p.atomsDone && p.atomsOK && n == 0 {
		// Every shape check would fail against N = 0: report the cause alone.
		one := problems{file: p.probs.file}
		one.at("atoms", ErrValue, "no atoms")
		return nil, one.err()
	}

	var lat grid.Lattice
	latOK := false
	if p.latticeOK && p.periodicityOK {
		l, err := grid.NewLattice(p.lattice.Scale(ls), p.periodicity)
		if err != nil {
			p.probs.add(p.at("lattice", libProblem(ErrValue, err)))
		} else {
			lat, latOK = l, true
		}
	}
	atoms := make([]grid.Atom, n)
	for i, a := range p.atoms {
		a.Position = a.Position.Scale(ls)
		atoms[i] = a
	}
	st := grid.Structure{Lattice: lat, Atoms: atoms}
	if latOK && p.atomsOK && p.atomsDone {
		if err := st.Validate(); err != nil {
			p.probs.add(p.at("atoms", libProblem(ErrValue, err)))
		}
	}

	var charges *longrange.Charges
	if p.has(kBorn) && p.has(kEpsilon) && p.bornOK && p.epsOK {
		c := longrange.Charges{Z: p.born, Epsilon: p.eps}
		switch {
		case p.atomsDone && len(p.born) != n:
			p.probs.at("born_charges", ErrShape, "%d tensors for %d atoms", len(p.born), n)
		case (longrange.Charges{Epsilon: p.eps}).Validate(0) != nil:
			p.probs.add(p.at("epsilon", libProblem(ErrValue, (longrange.Charges{Epsilon: p.eps}).Validate(0))))
		case p.atomsDone:
			if err := c.Validate(n); err != nil {
				p.probs.add(p.at("born_charges", libProblem(ErrValue, err)))
			}
		}
		charges = &c
	}

	var mesh *grid.Mesh
	if p.has(kGrid) && p.meshOK && p.periodicityOK {
		if err := p.mesh.Validate(p.periodicity); err != nil {
			p.probs.add(p.at("grid", libProblem(ErrValue, err)))
		} else {
			m := p.mesh
			mesh = &m
		}
	}

	if p.has(kQPoints) && p.samplesOK && len(p.samples) == 0 {
		p.probs.at("qpoints", ErrValue, "no q-points")
	}
	allQ := p.samplesOK
	for i := range p.samples {
		s := &p.samples[i]
		sp := indexPath("qpoints", i)
		if p.atomsDone && n > 0 {
			p.finishSample(sp, s, n)
		}
		allQ = allQ && s.qOK
		if s.qOK && p.periodicityOK && p.periodicity == grid.Sheet && math.Abs(s.q[2]) > sheetQTol {
			p.probs.at(sp+".q", ErrValue, "f3 = %g, want 0 in a 2d file (a sheet has only in-plane q)", s.q[2])
			s.offPlane = true
		}
		if s.c != nil && ms != 1 {
			for j, v := range s.c {
				s.c[j] = complex(real(v)*ms, imag(v)*ms)
				if !finite(real(s.c[j])) || !finite(imag(s.c[j])) {
					p.probs.at(sp, ErrNonFinite, "element %d is not finite after conversion to eV/Å²", j)
					s.c = nil
					break
				}
			}
		}
	}
	if mesh != nil && allQ && len(p.samples) > 0 {
		p.checkCoverage(*mesh)
	}

	if !p.probs.empty() {
		return nil, p.probs.err()
	}
	g := &Grid{Structure: st, Charges: charges, Mesh: mesh, Phase: p.phase, Units: p.units}
	g.Samples = make([]ifc.Sample, len(p.samples))
	for i, s := range p.samples {
		g.Samples[i] = ifc.Sample{Q: s.q, C: s.c}
	}
	return g, nil
}

// checkCoverage checks that no two samples name the same grid point and that each lies on the
// mesh, naming the JSON path of the culprit. Missing points are listed by ifc.Build, which
// matches with the same tolerance.
func (p *gridParser) checkCoverage(m grid.Mesh) {
	n := m.N
	owner := make([]int32, m.Len())
	for i := range owner {
		owner[i] = -1
	}
	for i, s := range p.samples {
		idx, ok := m.Match(s.q, meshTol)
		switch {
		case s.offPlane:
		case !ok:
			p.probs.at(indexPath("qpoints", i)+".q", ErrValue, "(%g, %g, %g) is not a point of the %d×%d×%d grid",
				s.q[0], s.q[1], s.q[2], n[0], n[1], n[2])
		case owner[idx] >= 0:
			p.probs.at(indexPath("qpoints", i)+".q", ErrValue, "same grid point as qpoints[%d]", owner[idx])
		default:
			owner[idx] = int32(i)
		}
	}
}
