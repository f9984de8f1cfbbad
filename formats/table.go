package formats

import (
	"bufio"
	"fmt"
	"io"
	"strconv"
	"strings"
)

// Table writes a tab-separated table row by row through a bufio.Writer: comment lines starting
// with "# ", then data rows of text fields followed by numbers. Numbers are formatted by
// FormatFloat. Nothing reaches the underlying writer before Flush or a full buffer, and a row
// with a bad value is refused whole, before any of it is written. A Table is not safe for
// concurrent use.
type Table struct {
	w    *bufio.Writer
	buf  []byte
	rows int
}

// NewTable returns a Table writing to w.
func NewTable(w io.Writer) *Table { return &Table{w: bufio.NewWriter(w)} }

// TableError is a value a Table refused: Row is the 0-based index of the data row (comments not
// counted), Column the 0-based index of the field in the row (text fields first). It unwraps to
// ErrNonFinite for a NaN or ±Inf, ErrValue for a text field holding a tab or newline.
type TableError struct {
	Row, Column int
	Err         error
}

// Error returns "formats: table row r, column c: cause".
func (e *TableError) Error() string {
	return fmt.Sprintf("formats: table row %d, column %d: %v", e.Row, e.Column, e.Err)
}

// Unwrap returns the cause.
func (e *TableError) Unwrap() error { return e.Err }

// Comment writes "# " + line; a line holding newlines becomes several comment lines. An empty
// line writes "#".
func (t *Table) Comment(line string) error {
	for _, l := range strings.Split(line, "\n") {
		l = strings.TrimSuffix(l, "\r")
		t.buf = append(t.buf[:0], '#')
		if l != "" {
			t.buf = append(t.buf, ' ')
			t.buf = append(t.buf, l...)
		}
		t.buf = append(t.buf, '\n')
		if _, err := t.w.Write(t.buf); err != nil {
			return err
		}
	}
	return nil
}

// Row writes one data row: the text fields, then the values formatted by FormatFloat, joined by
// tabs. It refuses a NaN or ±Inf value, or a text field holding a tab, CR or LF, with a
// *TableError naming the row and column, and then writes nothing of the row.
func (t *Table) Row(text []string, values []float64) error {
	if len(text)+len(values) == 0 {
		return &TableError{Row: t.rows, Err: newProblem(ErrValue, "empty row")}
	}
	for j, s := range text {
		if strings.ContainsAny(s, "\t\r\n") {
			return &TableError{Row: t.rows, Column: j, Err: newProblem(ErrValue, "text field %q holds a tab or line break", s)}
		}
	}
	for j, v := range values {
		if !finite(v) {
			return &TableError{Row: t.rows, Column: len(text) + j, Err: newProblem(ErrNonFinite, "value %v is not finite", v)}
		}
	}
	b := t.buf[:0]
	for j, s := range text {
		if j > 0 {
			b = append(b, '\t')
		}
		b = append(b, s...)
	}
	for j, v := range values {
		if j > 0 || len(text) > 0 {
			b = append(b, '\t')
		}
		b = appendTableFloat(b, v)
	}
	b = append(b, '\n')
	t.buf = b
	if _, err := t.w.Write(b); err != nil {
		return err
	}
	t.rows++
	return nil
}

// Rows returns the number of data rows written.
func (t *Table) Rows() int { return t.rows }

// Flush writes any buffered data to the underlying writer and returns its error.
func (t *Table) Flush() error { return t.w.Flush() }

// FormatFloat formats x as a Table does: strconv 'g' with 10 significant digits (so at least 8
// are always kept), and 0 for negative zero.
func FormatFloat(x float64) string { return string(appendTableFloat(nil, x)) }

func appendTableFloat(b []byte, x float64) []byte {
	if x == 0 {
		return append(b, '0') // also for −0: "-0" in a table only confuses
	}
	return strconv.AppendFloat(b, x, 'g', 10, 64)
}
