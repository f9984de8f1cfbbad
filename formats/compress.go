package formats

import (
	"bufio"
	"bytes"
	"errors"
	"fmt"
	"io"
	"path/filepath"
	"strings"

	"github.com/klauspost/compress/gzip"
	"github.com/klauspost/compress/zstd"
)

// Compression is the compression of a stream. Its zero value is None. It implements pflag's
// Value interface (String, Set, Type).
type Compression int

const (
	// None is an uncompressed stream.
	None Compression = iota
	// Gzip is a gzip (RFC 1952) stream, possibly of several members.
	Gzip
	// Zstd is a Zstandard (RFC 8878) stream, possibly of several frames.
	Zstd
)

var compressionNames = [...]string{None: "none", Gzip: "gzip", Zstd: "zstd"}

// String returns "none", "gzip" or "zstd".
func (c Compression) String() string {
	if c < 0 || int(c) >= len(compressionNames) {
		return fmt.Sprintf("Compression(%d)", int(c))
	}
	return compressionNames[c]
}

// ParseCompression parses "none" (or ""), "gzip" (or "gz") and "zstd" (or "zst"),
// case-insensitively.
func ParseCompression(s string) (Compression, error) {
	switch strings.ToLower(strings.TrimSpace(s)) {
	case "", "none":
		return None, nil
	case "gzip", "gz":
		return Gzip, nil
	case "zstd", "zst":
		return Zstd, nil
	}
	return 0, fmt.Errorf("formats: unknown compression %q (valid: none, gzip, zstd)", s)
}

// Set implements pflag.Value.
func (c *Compression) Set(s string) error {
	v, err := ParseCompression(s)
	if err != nil {
		return err
	}
	*c = v
	return nil
}

// Type implements pflag.Value.
func (c *Compression) Type() string { return "none|gzip|zstd" }

// CompressionFromName returns the compression a file name asks for by its extension: Gzip for
// ".gz", Zstd for ".zst" or ".zstd" (case-insensitive), None otherwise. Readers do not need it:
// they detect compression by magic bytes.
func CompressionFromName(name string) Compression {
	switch strings.ToLower(filepath.Ext(name)) {
	case ".gz":
		return Gzip
	case ".zst", ".zstd":
		return Zstd
	}
	return None
}

// NewCompressedWriter returns a writer that compresses into w. Close finishes the stream (it
// must be called, and its error checked) but does not close w. For None, writes go straight to w
// and Close does nothing. Gzip uses the default level, Zstd the default level with a single
// encoder goroutine.
func NewCompressedWriter(w io.Writer, c Compression) (io.WriteCloser, error) {
	switch c {
	case None:
		return nopWriteCloser{w}, nil
	case Gzip:
		return gzip.NewWriter(w), nil
	case Zstd:
		enc, err := zstd.NewWriter(w, zstd.WithEncoderConcurrency(1))
		if err != nil {
			return nil, fmt.Errorf("formats: zstd writer: %w", err)
		}
		return enc, nil
	}
	return nil, fmt.Errorf("formats: unknown compression %v", c)
}

type nopWriteCloser struct{ io.Writer }

func (nopWriteCloser) Close() error { return nil }

// Magic bytes: RFC 1952 section 2.3.1 (ID1 ID2) and RFC 8878 section 3.1.1 (0xFD2FB528, little
// endian).
var (
	gzipMagic = []byte{0x1f, 0x8b}
	zstdMagic = []byte{0x28, 0xb5, 0x2f, 0xfd}
)

// zstdMaxWindow is the largest zstd window the readers accept (32 MiB: every zstd level up to 19
// uses at most 8 MiB, --ultra -20 uses 32 MiB). The window is memory the decoder may allocate
// however small the content, so it is capped separately from the decompressed size.
const zstdMaxWindow = 32 << 20

// Operations a streamError names.
const (
	opRead  = "read"
	opLimit = "limit"
	opGzip  = "gzip"
	opZstd  = "zstd"
)

// streamError tags an error of the byte stream below the parser, so that the parser can tell a
// truncated compressed stream from truncated JSON (both end in io.ErrUnexpectedEOF).
type streamError struct {
	op  string
	err error
}

func (e *streamError) Error() string { return e.op + ": " + e.err.Error() }
func (e *streamError) Unwrap() error { return e.err }

// tagReader wraps every error but io.EOF of r in a streamError.
type tagReader struct {
	r  io.Reader
	op string
}

func (t tagReader) Read(p []byte) (int, error) {
	n, err := t.r.Read(p)
	if err != nil && err != io.EOF {
		err = &streamError{op: t.op, err: err}
	}
	return n, err
}

// errTooLarge is the cause of a capReader failure.
var errTooLarge = errors.New("input too large")

// capReader passes at most max bytes of r and fails, instead of ending, when r holds more: an
// io.LimitReader would make an oversized file look truncated.
type capReader struct {
	r    io.Reader
	max  int64
	read int64
}

func (c *capReader) Read(p []byte) (int, error) {
	if c.read > c.max {
		return 0, &streamError{op: opLimit, err: errTooLarge}
	}
	if left := c.max - c.read + 1; int64(len(p)) > left {
		p = p[:left] // one byte beyond max tells "more" from "exactly max"
	}
	n, err := c.r.Read(p)
	c.read += int64(n)
	if c.read > c.max {
		return n - int(c.read-c.max), &streamError{op: opLimit, err: errTooLarge}
	}
	return n, err
}

// openStream detects the compression of r by its magic bytes and returns a reader of the
// decompressed bytes, capped at maxBytes, with the compression found and a function that
// releases the decoder. Errors are *streamError.
func openStream(r io.Reader, maxBytes int64) (io.Reader, Compression, func(), error) {
	br := bufio.NewReaderSize(r, 16<<10)
	head, err := br.Peek(len(zstdMagic))
	if err != nil && err != io.EOF && err != bufio.ErrBufferFull {
		return nil, None, nil, &streamError{op: opRead, err: err}
	}
	switch {
	case bytes.HasPrefix(head, gzipMagic):
		zr, err := gzip.NewReader(tagReader{br, opRead})
		if err != nil {
			return nil, Gzip, nil, &streamError{op: opGzip, err: err}
		}
		return &capReader{r: tagReader{zr, opGzip}, max: maxBytes}, Gzip, func() { zr.Close() }, nil
	case bytes.HasPrefix(head, zstdMagic):
		zr, err := zstd.NewReader(tagReader{br, opRead},
			zstd.WithDecoderConcurrency(1), // synchronous: no goroutines, no read-ahead
			zstd.WithDecoderLowmem(true),
			zstd.WithDecoderMaxWindow(zstdMaxWindow),
			zstd.WithDecoderMaxMemory(zstdMaxWindow), // when streaming this bounds the window
		)
		if err != nil {
			return nil, Zstd, nil, &streamError{op: opZstd, err: err}
		}
		return &capReader{r: tagReader{zr, opZstd}, max: maxBytes}, Zstd, zr.Close, nil
	}
	return &capReader{r: tagReader{br, opRead}, max: maxBytes}, None, func() {}, nil
}

// streamProblem turns an error of openStream's reader into a problem with a sentinel kind.
func streamProblem(se *streamError, maxBytes int64) error {
	switch se.op {
	case opLimit:
		return newProblem(ErrLimit, "decompressed input exceeds %d bytes (raise the limit with WithMaxBytes)", maxBytes)
	case opGzip, opZstd:
		cause := se.err
		if inner, ok := cause.(*streamError); ok && inner.op == opRead {
			return newProblem(nil, "read: %w", inner.err) // the source failed, not the decoder
		}
		if errors.Is(cause, io.ErrUnexpectedEOF) {
			return newProblem(ErrCompression, "%s stream ends early (truncated file?): %w", se.op, cause)
		}
		return newProblem(ErrCompression, "%s stream: %w", se.op, cause)
	}
	return newProblem(nil, "read: %w", se.err)
}

// corruptStream reads the rest of a decompressing reader from openStream and returns the
// problem if the compressed stream turns out corrupt or truncated, nil otherwise (also when it
// ends at the size cap or the source fails).
func corruptStream(src io.Reader, maxBytes int64) error {
	_, err := io.Copy(io.Discard, src)
	var se *streamError
	if errors.As(err, &se) && (se.op == opGzip || se.op == opZstd) {
		if inner, ok := se.err.(*streamError); ok && inner.op == opRead {
			return nil
		}
		return streamProblem(se, maxBytes)
	}
	return nil
}

// utf8BOM is the byte-order mark some editors put at the start of a UTF-8 text file.
var utf8BOM = []byte{0xEF, 0xBB, 0xBF}

// skipBOM returns r without a leading UTF-8 byte-order mark, which JSON does not allow but
// which carries no meaning.
func skipBOM(r io.Reader) io.Reader {
	br := bufio.NewReader(r)
	if head, _ := br.Peek(len(utf8BOM)); bytes.Equal(head, utf8BOM) {
		br.Discard(len(utf8BOM))
	}
	return br
}

// openInput is openStream for a named input: stream errors come back as a *ParseError of name.
func openInput(r io.Reader, name string, maxBytes int64) (io.Reader, Compression, func(), error) {
	src, comp, release, err := openStream(r, maxBytes)
	if err != nil {
		var se *streamError
		if errors.As(err, &se) {
			err = streamProblem(se, maxBytes)
		}
		return nil, comp, nil, &ParseError{File: name, Offset: -1, Err: err}
	}
	return src, comp, release, nil
}
