package formats

import (
	"bytes"
	"encoding/json"
	"io"
)

// posReader sits between the byte stream and a json.Decoder and keeps the bytes the decoder has
// read but not yet consumed, so that a byte offset reported on error can be turned into a line
// and column without holding the whole input. Before each read it drops the bytes before the
// decoder's current position (json.Decoder.InputOffset), counting their newlines: every later
// error lies at or after that position. The bytes kept are about the decoder's own buffer.
type posReader struct {
	r      io.Reader
	dec    *json.Decoder // set once the decoder exists
	base   int64         // stream offset of hist[0]
	lines  int           // newlines before base
	lastNL int64         // offset of the last newline before base, −1 if none
	hist   []byte
	total  int64 // bytes read so far
}

func newPosReader(r io.Reader) *posReader { return &posReader{r: r, lastNL: -1} }

func (p *posReader) Read(b []byte) (int, error) {
	if p.dec != nil {
		p.trim(p.dec.InputOffset())
	}
	n, err := p.r.Read(b)
	p.hist = append(p.hist, b[:n]...)
	p.total += int64(n)
	return n, err
}

// trim drops the kept bytes before stream offset off.
func (p *posReader) trim(off int64) {
	k := off - p.base
	if k <= 0 {
		return
	}
	k = min(k, int64(len(p.hist)))
	done := p.hist[:k]
	p.lines += bytes.Count(done, []byte{'\n'})
	if i := bytes.LastIndexByte(done, '\n'); i >= 0 {
		p.lastNL = p.base + int64(i)
	}
	n := copy(p.hist, p.hist[k:])
	p.hist = p.hist[:n]
	p.base += k
}

// where returns the 1-based line and column of stream offset off, or zeros when off is no
// longer (or not yet) kept.
func (p *posReader) where(off int64) (line, col int) {
	k := off - p.base
	if k < 0 || k > int64(len(p.hist)) {
		return 0, 0
	}
	seg := p.hist[:k]
	line = p.lines + bytes.Count(seg, []byte{'\n'}) + 1
	last := p.lastNL
	if i := bytes.LastIndexByte(seg, '\n'); i >= 0 {
		last = p.base + int64(i)
	}
	return line, int(off - last)
}

// syntaxOffset returns the stream offset of the byte a json.SyntaxError from dec points at.
// Errors found by the Decoder's token state machine carry the absolute offset, which equals
// InputOffset; errors of its value scanner carry a count that is not a stream offset, so the
// value is scanned again from the decoder's position (where the failed value starts) to find
// the first bad byte.
func (p *posReader) syntaxOffset(se *json.SyntaxError) int64 {
	at := p.dec.InputOffset()
	if se.Offset == at {
		return at
	}
	k := at - p.base
	if k < 0 || k > int64(len(p.hist)) {
		return at
	}
	var raw json.RawMessage
	if err := json.Unmarshal(p.hist[k:], &raw); err != nil {
		if again, ok := err.(*json.SyntaxError); ok && again.Offset > 0 {
			return at + again.Offset - 1 // the scanner counts the bad byte itself
		}
	}
	return at
}
