package formats

import (
	"encoding/json"
	"fmt"
	"math"
	"strconv"
)

// This file parses the numeric leaves of a grid file (vectors, matrices, integers) from a
// json.RawMessage that the json.Decoder has already checked for syntax. Decoding into Go
// float slices with encoding/json would turn null into 0, accept arrays of any length into
// fixed-size arrays, and not say which element overflowed; parsing the checked text directly is
// strict, names the element, and is fast.

// numError locates a problem inside a raw value: idx are the array indices from the value's
// root ([row, column] for a matrix).
type numError struct {
	idx  []int
	kind error
	msg  string
}

// suffix returns the indices as a JSON path suffix, "[3][4]".
func (e *numError) suffix() string {
	s := ""
	for _, i := range e.idx {
		s += fmt.Sprintf("[%d]", i)
	}
	return s
}

// jsonKind names the JSON type of a value from its first byte.
func jsonKind(c byte) string {
	switch c {
	case '"':
		return "a string"
	case '[':
		return "an array"
	case '{':
		return "an object"
	case 't', 'f':
		return "a boolean"
	case 'n':
		return "null"
	case 0:
		return "nothing"
	}
	return "a number"
}

// tokenKind names the JSON type of a token from json.Decoder.Token (with UseNumber).
func tokenKind(t json.Token) string {
	switch v := t.(type) {
	case json.Delim:
		if v == '[' {
			return "an array"
		}
		return "an object"
	case string:
		return "a string"
	case json.Number:
		return "a number"
	case bool:
		return "a boolean"
	case nil:
		return "null"
	}
	return fmt.Sprintf("%T", t)
}

type cursor struct {
	b []byte
	i int
}

func (c *cursor) ws() {
	for c.i < len(c.b) {
		switch c.b[c.i] {
		case ' ', '\t', '\n', '\r':
			c.i++
		default:
			return
		}
	}
}

func (c *cursor) peek() byte {
	c.ws()
	if c.i >= len(c.b) {
		return 0
	}
	return c.b[c.i]
}

// literal returns the number literal at the cursor (the text is known to be valid JSON).
func (c *cursor) literal() []byte {
	start := c.i
	for c.i < len(c.b) {
		switch c.b[c.i] {
		case ',', ']', '}', ' ', '\t', '\n', '\r':
			return c.b[start:c.i]
		}
		c.i++
	}
	return c.b[start:c.i]
}

// number parses the number at the cursor. Errors carry no indices: callers add them.
func (c *cursor) number() (float64, *numError) {
	if k := c.peek(); jsonKind(k) != "a number" {
		return 0, &numError{kind: ErrValue, msg: "want a number, got " + jsonKind(k)}
	}
	lit := c.literal()
	v, err := strconv.ParseFloat(string(lit), 64)
	if math.IsInf(v, 0) {
		return 0, &numError{kind: ErrNonFinite, msg: fmt.Sprintf("%s is out of the range of a float64", lit)}
	}
	if err != nil && !isRangeErr(err) {
		return 0, &numError{kind: ErrValue, msg: fmt.Sprintf("bad number %s", lit)}
	}
	return v, nil // underflow to zero or a subnormal is accepted
}

func isRangeErr(err error) bool {
	ne, ok := err.(*strconv.NumError)
	return ok && ne.Err == strconv.ErrRange
}

// numbers parses an array of numbers at the cursor, appending to dst; idx locates the array.
func (c *cursor) numbers(dst []float64, idx []int) ([]float64, *numError) {
	if k := c.peek(); k != '[' {
		return dst, &numError{idx: idx, kind: ErrValue, msg: "want an array of numbers, got " + jsonKind(k)}
	}
	c.i++
	if c.peek() == ']' {
		c.i++
		return dst, nil
	}
	for j := 0; ; j++ {
		v, e := c.number()
		if e != nil {
			e.idx = append(append([]int(nil), idx...), j)
			return dst, e
		}
		dst = append(dst, v)
		if c.peek() == ',' {
			c.i++
			continue
		}
		c.i++ // ']'
		return dst, nil
	}
}

// parseVector parses raw as an array of numbers.
func parseVector(raw []byte) ([]float64, *numError) {
	c := cursor{b: raw}
	return c.numbers(nil, nil)
}

// parseMatrix parses raw as an array of arrays of numbers, returning the numbers row after row
// and the length of each row.
func parseMatrix(raw []byte, sizeHint int) (vals []float64, rows []int, e *numError) {
	c := cursor{b: raw}
	if k := c.peek(); k != '[' {
		return nil, nil, &numError{kind: ErrValue, msg: "want an array of rows, got " + jsonKind(k)}
	}
	c.i++
	if c.peek() == ']' {
		return nil, nil, nil
	}
	if sizeHint > 0 {
		vals = make([]float64, 0, sizeHint)
	}
	for r := 0; ; r++ {
		if k := c.peek(); k != '[' {
			return vals, rows, &numError{idx: []int{r}, kind: ErrValue, msg: "want a row (an array of numbers), got " + jsonKind(k)}
		}
		n0 := len(vals)
		vals, e = c.numbers(vals, nil)
		if e != nil {
			e.idx = append([]int{r}, e.idx...)
			return vals, rows, e
		}
		rows = append(rows, len(vals)-n0)
		if c.peek() == ',' {
			c.i++
			continue
		}
		return vals, rows, nil
	}
}

// parseInt parses raw as an integer literal (no fraction, no exponent).
func parseInt(raw []byte) (int, *numError) {
	c := cursor{b: raw}
	if k := c.peek(); jsonKind(k) != "a number" {
		return 0, &numError{kind: ErrValue, msg: "want an integer, got " + jsonKind(k)}
	}
	lit := c.literal()
	n, err := strconv.Atoi(string(lit))
	if err != nil {
		if isRangeErr(err) {
			return 0, &numError{kind: ErrValue, msg: fmt.Sprintf("integer %s is too large", lit)}
		}
		return 0, &numError{kind: ErrValue, msg: fmt.Sprintf("want an integer, got %s", lit)}
	}
	return n, nil
}

// parseInts parses raw as an array of integer literals.
func parseInts(raw []byte) ([]int, *numError) {
	c := cursor{b: raw}
	if k := c.peek(); k != '[' {
		return nil, &numError{kind: ErrValue, msg: "want an array of integers, got " + jsonKind(k)}
	}
	c.i++
	var out []int
	if c.peek() == ']' {
		return out, nil
	}
	for j := 0; ; j++ {
		start := c.i
		if k := c.peek(); jsonKind(k) != "a number" {
			return out, &numError{idx: []int{j}, kind: ErrValue, msg: "want an integer, got " + jsonKind(k)}
		}
		c.literal()
		n, e := parseInt(c.b[start:c.i])
		if e != nil {
			e.idx = []int{j}
			return out, e
		}
		out = append(out, n)
		if c.peek() == ',' {
			c.i++
			continue
		}
		return out, nil
	}
}
