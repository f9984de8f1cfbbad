package formats

import (
	"bufio"
	"errors"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"

	"lamina/grid"
)

// maxQPointLine is the longest line a q-point list may have.
const maxQPointLine = 64 << 10

// ReadQPoints reads a q-point list: one q-point per line, three reduced coordinates separated by
// spaces or tabs. A coordinate is a decimal number ("0.5", "-1e-3") or a fraction of two
// ("1/3", "-2/3", "0.5/2"). Blank lines are ignored, and so is everything from a '#' to the end
// of a line (so lines starting with '#' are comments). The list may be gzip- or zstd-compressed.
// Options: WithMaxBytes and WithMaxQPoints (WithMaxAtoms has no effect). An empty list is an
// error. Errors are *ParseError values with the name and line number, joined (up to
// MaxReportedProblems) so that every bad line is reported in one pass.
func ReadQPoints(r io.Reader, name string, opts ...ReadOption) ([]grid.Vec3, error) {
	o, err := buildReadOptions(opts)
	if err != nil {
		return nil, err
	}
	src, _, release, err := openInput(r, name, o.maxBytes)
	if err != nil {
		return nil, err
	}
	defer release()

	probs := problems{file: name}
	lineErr := func(line int, kind error, format string, args ...any) *ParseError {
		return &ParseError{File: name, Line: line, Offset: -1, Err: newProblem(kind, format, args...)}
	}
	sc := bufio.NewScanner(src)
	sc.Buffer(make([]byte, 0, 4096), maxQPointLine)
	var out []grid.Vec3
	line := 0
	for sc.Scan() {
		line++
		text := sc.Text()
		if i := strings.IndexByte(text, '#'); i >= 0 {
			text = text[:i]
		}
		fields := strings.Fields(text)
		if len(fields) == 0 {
			continue
		}
		if len(fields) != 3 {
			probs.add(lineErr(line, ErrSyntax, "%d fields, want 3 reduced coordinates (f1 f2 f3)", len(fields)))
			continue
		}
		var q grid.Vec3
		good := true
		for j, f := range fields {
			v, err := parseCoordinate(f)
			if err != nil {
				probs.add(lineErr(line, ErrSyntax, "coordinate %d: %w", j+1, err))
				good = false
				break
			}
			q[j] = v
		}
		if !good {
			continue
		}
		if len(out) >= o.maxQPoints {
			probs.list = append(probs.list, lineErr(line, ErrLimit, "more than %d q-points (raise the limit with WithMaxQPoints)", o.maxQPoints))
			return nil, probs.err()
		}
		out = append(out, q)
	}
	if err := sc.Err(); err != nil {
		var se *streamError
		switch {
		case errors.As(err, &se):
			err = streamProblem(se, o.maxBytes)
			if errors.Is(err, ErrCompression) { // garbage lines came from a corrupt stream
				return nil, &ParseError{File: name, Offset: -1, Err: err}
			}
		case errors.Is(err, bufio.ErrTooLong):
			err = newProblem(ErrLimit, "line longer than %d bytes", maxQPointLine)
		}
		probs.list = append(probs.list, &ParseError{File: name, Line: line + 1, Offset: -1, Err: err})
		return nil, probs.err()
	}
	if !probs.empty() {
		return nil, probs.err()
	}
	if len(out) == 0 {
		return nil, &ParseError{File: name, Offset: -1, Err: newProblem(ErrValue, "no q-points")}
	}
	return out, nil
}

// parseCoordinate parses a decimal number or a fraction num/den of two decimal numbers.
func parseCoordinate(s string) (float64, error) {
	num, den, isFrac := strings.Cut(s, "/")
	x, err := parseDecimal(num)
	if err != nil {
		return 0, err
	}
	if !isFrac {
		return x, nil
	}
	y, err := parseDecimal(den)
	if err != nil {
		return 0, err
	}
	if y == 0 {
		return 0, fmt.Errorf("%q divides by zero", s)
	}
	v := x / y
	if !finite(v) {
		return 0, fmt.Errorf("%q is out of the range of a float64", s)
	}
	return v, nil
}

// parseDecimal parses a finite decimal number: digits, sign, point and exponent only (no hex,
// no underscores, no inf or nan, which strconv.ParseFloat would accept).
func parseDecimal(s string) (float64, error) {
	if s == "" {
		return 0, errors.New("empty number")
	}
	for i := 0; i < len(s); i++ {
		c := s[i]
		if !('0' <= c && c <= '9' || c == '+' || c == '-' || c == '.' || c == 'e' || c == 'E') {
			return 0, fmt.Errorf("bad number %q", s)
		}
	}
	v, err := strconv.ParseFloat(s, 64)
	if err != nil {
		if isRangeErr(err) && !math.IsInf(v, 0) {
			return v, nil // underflow to zero or a subnormal
		}
		if isRangeErr(err) {
			return 0, fmt.Errorf("%q is out of the range of a float64", s)
		}
		return 0, fmt.Errorf("bad number %q", s)
	}
	return v, nil
}
