package formats

import (
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"slices"

	"lamina/grid"
	"lamina/ifc"
)

// This file holds the streaming walk of a lamina-grid file: a json.Decoder read token by token,
// strict about keys, with numeric leaves parsed by numbers.go. The cross-field checks that need
// the whole file run afterwards, in grid.go.

// sample is one q-point entry while the file is read. Its matrix stays as re and im rows until
// the atom count is known; then it is checked and packed into c.
type sample struct {
	q              grid.Vec3
	qOK            bool
	re, im         []float64
	reRows, imRows []int
	reOK, imOK     bool
	done           bool // shape checked, c built when good
	offPlane       bool // f3 ≠ 0 in a 2d file (already reported)
	c              []complex128
}

type gridParser struct {
	name  string
	opt   readOptions
	dec   *json.Decoder
	pos   *posReader
	probs problems

	seen uint32 // top-level keys present, bit k for topKeys[k]

	format                 string
	formatOK               bool // "format" is a string
	version                int
	versionOK              bool // "version" is an integer
	units                  Units
	lengthSize, energySize float64
	unitsOK                bool
	periodicity            grid.Periodicity
	periodicityOK          bool
	lattice                grid.Mat3
	latticeOK              bool
	atoms                  []grid.Atom
	atomsOK                bool // every atom well-formed
	atomsDone              bool // the atoms array was read to its end: the atom count is known
	born                   []grid.Mat3
	bornOK                 bool
	eps                    grid.Mat3
	epsOK                  bool
	mesh                   grid.Mesh
	meshOK                 bool
	phase                  ifc.Phase
	phaseOK                bool
	samples                []sample
	samplesOK              bool
}

func newGridParser(src io.Reader, name string, o readOptions) *gridParser {
	pos := newPosReader(src)
	dec := json.NewDecoder(pos)
	dec.UseNumber() // Token must not fail on a number that overflows a float64
	pos.dec = dec
	return &gridParser{
		name: name, opt: o, dec: dec, pos: pos, probs: problems{file: name},
		units:      Units{Length: "angstrom", Energy: "eV"},
		lengthSize: 1, energySize: 1, unitsOK: true,
		atomsOK: true, bornOK: true, samplesOK: true,
	}
}

func (p *gridParser) has(k int) bool { return p.seen&(1<<k) != 0 }

// streamErr turns an error of the decoder into a fatal *ParseError with the position known.
func (p *gridParser) streamErr(err error) error {
	e := &ParseError{File: p.name, Offset: -1}
	var se *streamError
	var syn *json.SyntaxError
	switch {
	case errors.As(err, &se):
		e.Err = streamProblem(se, p.opt.maxBytes)
	case err == io.EOF || errors.Is(err, io.ErrUnexpectedEOF):
		e.Offset = p.pos.total
		e.Line, e.Column = p.pos.where(e.Offset)
		if p.pos.total == 0 {
			e.Err = newProblem(ErrSyntax, "empty input")
		} else {
			e.Err = newProblem(ErrSyntax, "unexpected end of input (truncated file?)")
		}
	case errors.As(err, &syn):
		e.Offset = p.pos.syntaxOffset(syn)
		e.Line, e.Column = p.pos.where(e.Offset)
		e.Err = newProblem(ErrSyntax, "%s", syn.Error())
	default:
		e.Err = newProblem(ErrSyntax, "%w", err)
	}
	return e
}

func (p *gridParser) fatal(path string, kind error, format string, args ...any) error {
	return &ParseError{File: p.name, Path: path, Offset: -1, Err: newProblem(kind, format, args...)}
}

// at returns a ParseError for a cause at a JSON path.
func (p *gridParser) at(path string, cause error) *ParseError {
	return &ParseError{File: p.name, Path: path, Offset: -1, Err: cause}
}

func joinPath(parent, key string) string {
	if parent == "" {
		return key
	}
	return parent + "." + key
}

func indexPath(path string, i int) string { return fmt.Sprintf("%s[%d]", path, i) }

// walk reads the top-level object key by key. It returns only fatal errors (syntax, stream,
// limits); problems of single values are collected in p.probs.
func (p *gridParser) walk() error {
	tok, err := p.dec.Token()
	if err != nil {
		return p.streamErr(err)
	}
	if tok != json.Delim('{') {
		return p.fatal("", ErrUnknownFormat, "top-level value is %s, want a lamina-grid object", tokenKind(tok))
	}
	p.seen, err = p.members("", topKeys, p.topValue)
	if err != nil {
		return err
	}
	end := p.dec.InputOffset()
	if _, err := p.dec.Token(); err != io.EOF {
		if err != nil {
			return p.streamErr(err)
		}
		line, col := p.pos.where(end)
		return &ParseError{File: p.name, Line: line, Column: col, Offset: end,
			Err: newProblem(ErrSyntax, "unexpected data after the top-level object")}
	}
	return nil
}

// members reads the members of an object whose '{' has been read, through its '}'. Unknown and
// duplicate keys are recorded and their values skipped; fn must consume the value of key
// keys[k]. It returns the set of keys seen as a bit mask.
func (p *gridParser) members(path string, keys []string, fn func(k int, kpath string) error) (uint32, error) {
	var seen uint32
	for p.dec.More() {
		tok, err := p.dec.Token()
		if err != nil {
			return seen, p.streamErr(err)
		}
		key, ok := tok.(string)
		if !ok { // cannot happen after More in an object; keep the parser total
			return seen, p.fatal(path, ErrSyntax, "want an object key, got %s", tokenKind(tok))
		}
		k := slices.Index(keys, key)
		switch {
		case k < 0:
			p.probs.at(path, ErrUnknownKey, "unknown key %q%s", key, suggest(key, keys))
			err = p.skip()
		case seen&(1<<k) != 0:
			p.probs.at(joinPath(path, key), ErrDuplicateKey, "key appears more than once")
			err = p.skip()
		default:
			seen |= 1 << k
			err = fn(k, joinPath(path, key))
		}
		if err != nil {
			return seen, err
		}
	}
	return seen, p.closing('}')
}

func (p *gridParser) closing(d json.Delim) error {
	tok, err := p.dec.Token()
	if err != nil {
		return p.streamErr(err)
	}
	if tok != d { // the decoder's state machine makes this unreachable
		return p.fatal("", ErrSyntax, "want %q, got %v", d, tok)
	}
	return nil
}

// value reads the next value as raw, syntax-checked JSON.
func (p *gridParser) value() (json.RawMessage, error) {
	var raw json.RawMessage
	if err := p.dec.Decode(&raw); err != nil {
		return nil, p.streamErr(err)
	}
	return raw, nil
}

func (p *gridParser) skip() error {
	_, err := p.value()
	return err
}

// open reads the first token of a value that must be an array ('[') or an object ('{'). When
// it is something else it records a problem, skips the value and returns false.
func (p *gridParser) open(path string, d json.Delim, want string) (bool, error) {
	tok, err := p.dec.Token()
	if err != nil {
		return false, p.streamErr(err)
	}
	if tok == d {
		return true, nil
	}
	p.probs.at(path, ErrValue, "want %s, got %s", want, tokenKind(tok))
	return false, p.skipRest(tok)
}

// skipRest consumes the rest of a value whose first token was tok.
func (p *gridParser) skipRest(tok json.Token) error {
	if d, ok := tok.(json.Delim); !ok || (d != '[' && d != '{') {
		return nil
	}
	for depth := 1; depth > 0; {
		t, err := p.dec.Token()
		if err != nil {
			return p.streamErr(err)
		}
		if d, ok := t.(json.Delim); ok {
			if d == '[' || d == '{' {
				depth++
			} else {
				depth--
			}
		}
	}
	return nil
}

// missing records the required keys absent from seen.
func (p *gridParser) missing(path string, seen uint32, keys []string, required ...int) bool {
	ok := true
	for _, k := range required {
		if seen&(1<<k) == 0 {
			p.probs.at(path, ErrMissingKey, "missing key %q", keys[k])
			ok = false
		}
	}
	return ok
}

func (p *gridParser) numProblem(path string, e *numError) {
	p.probs.at(path+e.suffix(), e.kind, "%s", e.msg)
}

func (p *gridParser) str(path string, raw []byte) (string, bool) {
	c := cursor{b: raw}
	if k := c.peek(); k != '"' {
		p.probs.at(path, ErrValue, "want a string, got %s", jsonKind(k))
		return "", false
	}
	var s string
	if err := json.Unmarshal(raw, &s); err != nil {
		p.probs.add(p.at(path, libProblem(ErrValue, err)))
		return "", false
	}
	return s, true
}

func (p *gridParser) number(path string, raw []byte) (float64, bool) {
	c := cursor{b: raw}
	v, e := c.number()
	if e != nil {
		p.numProblem(path, e)
		return 0, false
	}
	return v, true
}

func (p *gridParser) vec3(path string, raw []byte) (grid.Vec3, bool) {
	v, e := parseVector(raw)
	if e != nil {
		p.numProblem(path, e)
		return grid.Vec3{}, false
	}
	if len(v) != 3 {
		p.probs.at(path, ErrShape, "%d values, want 3", len(v))
		return grid.Vec3{}, false
	}
	return grid.Vec3{v[0], v[1], v[2]}, true
}

func (p *gridParser) mat3(path string, raw []byte) (grid.Mat3, bool) {
	var m grid.Mat3
	vals, rows, e := parseMatrix(raw, 9)
	if e != nil {
		p.numProblem(path, e)
		return m, false
	}
	if len(rows) != 3 {
		p.probs.at(path, ErrShape, "%d rows, want 3", len(rows))
		return m, false
	}
	for r, n := range rows {
		if n != 3 {
			p.probs.at(path, ErrShape, "row %d has %d values, want 3", r, n)
			return m, false
		}
	}
	for i := range 3 {
		copy(m[i][:], vals[3*i:3*i+3])
	}
	return m, true
}

// topValue reads the value of top-level key topKeys[k].
func (p *gridParser) topValue(k int, path string) error {
	switch k {
	case kUnits:
		return p.readUnits(path)
	case kAtoms:
		return p.readAtoms(path)
	case kBorn:
		return p.readBorn(path)
	case kQPoints:
		return p.readSamples(path)
	}
	raw, err := p.value()
	if err != nil {
		return err
	}
	switch k {
	case kFormat: // judged by identity, after the walk
		if c := (cursor{b: raw}); c.peek() == '"' {
			p.formatOK = json.Unmarshal(raw, &p.format) == nil
		}
	case kVersion:
		p.version, p.versionOK = 0, false
		if n, e := parseInt(raw); e == nil {
			p.version, p.versionOK = n, true
		}
	case kPeriodicity:
		if s, ok := p.str(path, raw); ok {
			per, err := grid.ParsePeriodicity(s)
			if err != nil {
				p.probs.add(p.at(path, libProblem(ErrValue, err)))
				break
			}
			p.periodicity, p.periodicityOK = per, true
		}
	case kLattice:
		p.lattice, p.latticeOK = p.mat3(path, raw)
	case kEpsilon:
		p.eps, p.epsOK = p.mat3(path, raw)
	case kGrid:
		p.readMesh(path, raw)
	case kPhase:
		if s, ok := p.str(path, raw); ok {
			ph, err := ifc.ParsePhase(s)
			if err != nil {
				p.probs.add(p.at(path, libProblem(ErrValue, err)))
				break
			}
			p.phase, p.phaseOK = ph, true
		}
	}
	return nil
}

func (p *gridParser) readMesh(path string, raw []byte) {
	n, e := parseInts(raw)
	if e != nil {
		p.numProblem(path, e)
		return
	}
	if len(n) != 3 {
		p.probs.at(path, ErrShape, "%d values, want 3 (n1, n2, n3)", len(n))
		return
	}
	total := 1
	for i, v := range n {
		if v < 1 {
			p.probs.at(indexPath(path, i), ErrValue, "n%d = %d, want a positive integer", i+1, v)
			return
		}
		if v > p.opt.maxQPoints || total > p.opt.maxQPoints/v {
			p.probs.at(path, ErrLimit, "grid %v has more than %d points (raise the limit with WithMaxQPoints)", n, p.opt.maxQPoints)
			return
		}
		total *= v
	}
	p.mesh, p.meshOK = grid.Mesh{N: [3]int{n[0], n[1], n[2]}}, true
}

func (p *gridParser) readUnits(path string) error {
	ok, err := p.open(path, '{', `an object {"length": ..., "energy": ...}`)
	if !ok {
		p.unitsOK = false
		return err
	}
	_, err = p.members(path, unitKeys, func(k int, up string) error {
		raw, err := p.value()
		if err != nil {
			return err
		}
		s, ok := p.str(up, raw)
		if !ok {
			p.unitsOK = false
			return nil
		}
		defs := lengthUnits
		if k == 1 {
			defs = energyUnits
		}
		d, ok := lookupUnit(defs, s)
		if !ok {
			p.probs.at(up, ErrValue, "unknown unit %q (valid: %s)", s, unitNames(defs))
			p.unitsOK = false
			return nil
		}
		if k == 0 {
			p.units.Length, p.lengthSize = d.name, d.size
		} else {
			p.units.Energy, p.energySize = d.name, d.size
		}
		return nil
	})
	return err
}

func (p *gridParser) readAtoms(path string) error {
	ok, err := p.open(path, '[', "an array of atom objects")
	if !ok {
		p.atomsOK = false
		return err
	}
	for i := 0; p.dec.More(); i++ {
		if i >= p.opt.maxAtoms {
			return p.fatal(path, ErrLimit, "more than %d atoms (raise the limit with WithMaxAtoms)", p.opt.maxAtoms)
		}
		a, good, err := p.readAtom(indexPath(path, i))
		if err != nil {
			return err
		}
		p.atomsOK = p.atomsOK && good
		p.atoms = append(p.atoms, a)
	}
	if err := p.closing(']'); err != nil {
		return err
	}
	p.atomsDone = true
	return nil
}

func (p *gridParser) readAtom(path string) (grid.Atom, bool, error) {
	var a grid.Atom
	ok, err := p.open(path, '{', `an atom object {"species": ..., "mass": ..., "position": [...]}`)
	if !ok {
		return a, false, err
	}
	good := true
	seen, err := p.members(path, atomKeys, func(k int, fp string) error {
		raw, err := p.value()
		if err != nil {
			return err
		}
		var ok bool
		switch k {
		case 0:
			a.Species, ok = p.str(fp, raw)
			if ok && a.Species == "" {
				p.probs.at(fp, ErrValue, "empty species label")
				ok = false
			}
		case 1:
			a.Mass, ok = p.number(fp, raw)
		case 2:
			a.Position, ok = p.vec3(fp, raw)
		}
		good = good && ok
		return nil
	})
	if err != nil {
		return a, false, err
	}
	good = p.missing(path, seen, atomKeys, 0, 1, 2) && good
	return a, good, nil
}

func (p *gridParser) readBorn(path string) error {
	ok, err := p.open(path, '[', "an array of 3×3 tensors, one per atom")
	if !ok {
		p.bornOK = false
		return err
	}
	for i := 0; p.dec.More(); i++ {
		if i >= p.opt.maxAtoms {
			return p.fatal(path, ErrLimit, "more than %d Born charge tensors (raise the limit with WithMaxAtoms)", p.opt.maxAtoms)
		}
		raw, err := p.value()
		if err != nil {
			return err
		}
		z, ok := p.mat3(indexPath(path, i), raw)
		p.bornOK = p.bornOK && ok
		p.born = append(p.born, z)
	}
	return p.closing(']')
}

func (p *gridParser) readSamples(path string) error {
	ok, err := p.open(path, '[', "an array of q-point objects")
	if !ok {
		p.samplesOK = false
		return err
	}
	for i := 0; p.dec.More(); i++ {
		if i >= p.opt.maxQPoints {
			return p.fatal(path, ErrLimit, "more than %d q-points (raise the limit with WithMaxQPoints)", p.opt.maxQPoints)
		}
		sp := indexPath(path, i)
		s, err := p.readSample(sp)
		if err != nil {
			return err
		}
		if p.atomsDone {
			p.finishSample(sp, &s, len(p.atoms))
		}
		p.samples = append(p.samples, s)
	}
	return p.closing(']')
}

func (p *gridParser) readSample(path string) (sample, error) {
	var s sample
	ok, err := p.open(path, '{', `a q-point object {"q": [...], "re": [[...]], "im": [[...]]}`)
	if !ok {
		s.done = true // nothing to check later
		return s, err
	}
	seen, err := p.members(path, sampleKeys, func(k int, fp string) error {
		raw, err := p.value()
		if err != nil {
			return err
		}
		hint := 0
		if p.atomsDone {
			n3 := 3 * len(p.atoms)
			hint = min(n3*n3, len(raw)/2+1) // a number takes at least 2 bytes of text
		}
		switch k {
		case 0:
			s.q, s.qOK = p.vec3(fp, raw)
		case 1:
			s.re, s.reRows, s.reOK = p.matrix(fp, raw, hint)
		case 2:
			s.im, s.imRows, s.imOK = p.matrix(fp, raw, hint)
		}
		return nil
	})
	if err != nil {
		return s, err
	}
	p.missing(path, seen, sampleKeys, 0, 1)
	if seen&(1<<2) == 0 {
		p.probs.at(path, ErrMissingKey, `missing key "im" (the imaginary part is required; write zeros for a real matrix)`)
	}
	return s, nil
}

func (p *gridParser) matrix(path string, raw []byte, hint int) ([]float64, []int, bool) {
	vals, rows, e := parseMatrix(raw, hint)
	if e != nil {
		p.numProblem(path, e)
		return nil, nil, false
	}
	return vals, rows, true
}

// finishSample checks the shape of a sample against n atoms and packs its matrix.
func (p *gridParser) finishSample(path string, s *sample, n int) {
	if s.done {
		return
	}
	s.done = true
	want := 3 * n
	good := s.reOK && s.imOK
	if s.reOK && !p.checkRows(path+".re", s.reRows, want, n) {
		good = false
	}
	if s.imOK && !p.checkRows(path+".im", s.imRows, want, n) {
		good = false
	}
	if good {
		s.c = make([]complex128, want*want)
		for i := range s.c {
			s.c[i] = complex(s.re[i], s.im[i])
		}
	}
	s.re, s.im, s.reRows, s.imRows = nil, nil, nil, nil
}

func (p *gridParser) checkRows(path string, rows []int, want, n int) bool {
	if len(rows) != want {
		p.probs.at(path, ErrShape, "%d rows, want %d (3 × %d atoms)", len(rows), want, n)
		return false
	}
	bad, first := 0, -1
	for r, l := range rows {
		if l != want {
			if first < 0 {
				first = r
			}
			bad++
		}
	}
	switch {
	case bad == 1:
		p.probs.at(path, ErrShape, "row %d has %d values, want %d", first, rows[first], want)
	case bad > 1:
		p.probs.at(path, ErrShape, "row %d has %d values, want %d (and %d more rows of the wrong length)", first, rows[first], want, bad-1)
	}
	return bad == 0
}

// identityKnown reports whether the walk has seen enough to judge the format and version.
func (p *gridParser) identityKnown() bool {
	return (p.has(kFormat) && (!p.formatOK || p.format != FormatName)) ||
		(p.has(kVersion) && (!p.versionOK || p.version != FormatVersion))
}

// identity checks "format" and "version".
func (p *gridParser) identity() error {
	switch {
	case !p.has(kFormat):
		return p.fatal("", ErrUnknownFormat, `missing key "format" (want "format": %q)`, FormatName)
	case !p.formatOK:
		return p.fatal("format", ErrUnknownFormat, "not a string (want %q)", FormatName)
	case p.format != FormatName:
		return p.fatal("format", ErrUnknownFormat, "%q, want %q", p.format, FormatName)
	case !p.has(kVersion):
		return p.fatal("", ErrVersion, `missing key "version" (this reader reads version %d)`, FormatVersion)
	case !p.versionOK:
		return p.fatal("version", ErrVersion, "not an integer (this reader reads version %d)", FormatVersion)
	case p.version != FormatVersion:
		return p.fatal("version", ErrVersion, "%d is not supported (this reader reads version %d)", p.version, FormatVersion)
	}
	return nil
}
