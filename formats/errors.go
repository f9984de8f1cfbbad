package formats

import (
	"errors"
	"fmt"
	"strings"
)

// Sentinel errors. Every error returned by the readers of this package wraps one of them (test
// with errors.Is); a file with several problems returns them joined (errors.Join), each a
// *ParseError.
var (
	// ErrUnknownFormat: the input is not a lamina-grid file (no "format" key, another format
	// name, or a top-level value that is not an object).
	ErrUnknownFormat = errors.New("formats: not a lamina-grid file")
	// ErrVersion: the file is a lamina-grid file of a version this reader does not know.
	ErrVersion = errors.New("formats: unsupported lamina-grid version")
	// ErrSyntax: the input is not well-formed (JSON syntax, truncation, a bad q-point line).
	ErrSyntax = errors.New("formats: malformed input")
	// ErrUnknownKey: an object holds a key the format does not define.
	ErrUnknownKey = errors.New("formats: unknown key")
	// ErrDuplicateKey: an object holds the same key twice.
	ErrDuplicateKey = errors.New("formats: duplicate key")
	// ErrMissingKey: a required key is absent, or one of a pair of keys that go together.
	ErrMissingKey = errors.New("formats: missing key")
	// ErrValue: a value has the wrong JSON type or an invalid content.
	ErrValue = errors.New("formats: invalid value")
	// ErrShape: an array has the wrong number of elements.
	ErrShape = errors.New("formats: wrong shape")
	// ErrNonFinite: a number is not finite (it overflows a float64, or is NaN or ±Inf in
	// memory when writing).
	ErrNonFinite = errors.New("formats: value not finite")
	// ErrLimit: the input exceeds a configured limit (decompressed size, atom or q-point count).
	ErrLimit = errors.New("formats: limit exceeded")
	// ErrCompression: a gzip or zstd stream is corrupt or truncated.
	ErrCompression = errors.New("formats: corrupt compressed stream")
)

// MaxReportedProblems is the largest number of problems a reader reports for one file; the
// rest are counted in a final line.
const MaxReportedProblems = 20

// ParseError is a problem at a known place of an input. It unwraps to its cause, which wraps one
// of the package sentinels.
type ParseError struct {
	// File is the name given to the reader.
	File string
	// Path is the JSON path of the offending value, e.g. "qpoints[12].re[3]"; empty for
	// problems of the whole file and for q-point lists.
	Path string
	// Line and Column (1-based, in bytes) locate the problem in the decompressed text; zero when
	// unknown.
	Line, Column int
	// Offset is the 0-based byte offset in the decompressed text, or −1 when unknown.
	Offset int64
	// Err is the cause.
	Err error
}

// Error formats the error as "file:line:col (byte n): path: cause", leaving out the parts
// that are unknown.
func (e *ParseError) Error() string {
	var b strings.Builder
	name := e.File
	if name == "" {
		name = "<input>"
	}
	b.WriteString(name)
	if e.Line > 0 {
		fmt.Fprintf(&b, ":%d", e.Line)
		if e.Column > 0 {
			fmt.Fprintf(&b, ":%d", e.Column)
		}
	}
	if e.Offset >= 0 {
		fmt.Fprintf(&b, " (byte %d)", e.Offset)
	}
	if e.Path != "" {
		b.WriteString(": ")
		b.WriteString(e.Path)
	}
	b.WriteString(": ")
	if e.Err != nil {
		b.WriteString(e.Err.Error())
	} else {
		b.WriteString("unknown error")
	}
	return b.String()
}

// Unwrap returns the cause.
func (e *ParseError) Unwrap() error { return e.Err }

// problem is a cause with a sentinel kind. Its message is the detail only: the kind classifies
// it for errors.Is without repeating its text.
type problem struct {
	kind error // a sentinel, or nil
	err  error // the detail, possibly wrapping a lower-level error
}

func (p *problem) Error() string { return p.err.Error() }

func (p *problem) Unwrap() []error {
	if p.kind == nil {
		return []error{p.err}
	}
	return []error{p.kind, p.err}
}

// newProblem returns a problem of the given kind; format and args follow fmt.Errorf (%w allowed).
func newProblem(kind error, format string, args ...any) error {
	return &problem{kind: kind, err: fmt.Errorf(format, args...)}
}

// problems collects the problems of one input, up to MaxReportedProblems.
type problems struct {
	file string
	list []error
	more int
}

func (ps *problems) add(err error) {
	if len(ps.list) < MaxReportedProblems {
		ps.list = append(ps.list, err)
		return
	}
	ps.more++
}

// at records a problem of the given kind at a JSON path.
func (ps *problems) at(path string, kind error, format string, args ...any) {
	ps.add(&ParseError{File: ps.file, Path: path, Offset: -1, Err: newProblem(kind, format, args...)})
}

func (ps *problems) empty() bool { return len(ps.list) == 0 }

// err returns nil, the single problem, or all problems joined (with a count of those left out).
func (ps *problems) err() error {
	switch {
	case len(ps.list) == 0:
		return nil
	case len(ps.list) == 1 && ps.more == 0:
		return ps.list[0]
	}
	list := ps.list
	if ps.more > 0 {
		list = append(list[:len(list):len(list)], fmt.Errorf("%s: and %d more problems not shown", ps.fileName(), ps.more))
	}
	return errors.Join(list...)
}

func (ps *problems) fileName() string {
	if ps.file == "" {
		return "<input>"
	}
	return ps.file
}

// suggest returns ` (did you mean "x"?)` for the valid key closest to key, or "" when none is
// close: equal ignoring case, or within edit distance 1 (keys up to 4 letters) or 2 (longer).
func suggest(key string, valid []string) string {
	lk := strings.ToLower(key)
	best, bestD := "", 1<<30
	for _, v := range valid {
		d := editDistance(lk, strings.ToLower(v))
		if d < bestD {
			best, bestD = v, d
		}
	}
	limit := 2
	if len(key) <= 4 {
		limit = 1
	}
	if best == "" || bestD > limit {
		return ""
	}
	return fmt.Sprintf(" (did you mean %q?)", best)
}

// editDistance is the Levenshtein distance between a and b, counted in bytes.
func editDistance(a, b string) int {
	if len(a) > 64 || len(b) > 64 {
		return 1 << 30 // far from every key; avoids quadratic work on hostile keys
	}
	prev := make([]int, len(b)+1)
	cur := make([]int, len(b)+1)
	for j := range prev {
		prev[j] = j
	}
	for i := 1; i <= len(a); i++ {
		cur[0] = i
		for j := 1; j <= len(b); j++ {
			cost := 1
			if a[i-1] == b[j-1] {
				cost = 0
			}
			cur[j] = min(prev[j]+1, cur[j-1]+1, prev[j-1]+cost)
		}
		prev, cur = cur, prev
	}
	return prev[len(b)]
}

// libError shows an error of another lamina package without its package prefix (the path in
// the ParseError already says where), keeping it in the chain for errors.Is and errors.As.
type libError struct{ err error }

func (e libError) Error() string {
	msg := e.err.Error()
	for _, prefix := range []string{"grid: ", "longrange: ", "ifc: "} {
		if len(msg) > len(prefix) && msg[:len(prefix)] == prefix {
			return msg[len(prefix):]
		}
	}
	return msg
}

func (e libError) Unwrap() error { return e.err }

// libProblem returns a problem of the given kind for an error of another lamina package.
func libProblem(kind error, err error) error { return &problem{kind: kind, err: libError{err}} }
