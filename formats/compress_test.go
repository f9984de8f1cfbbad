package formats

import (
	"bytes"
	"errors"
	"io"
	"testing"
)

func TestParseCompression(t *testing.T) {
	for s, want := range map[string]Compression{"": None, "none": None, "GZIP": Gzip, "gz": Gzip, "zstd": Zstd, " zst ": Zstd} {
		got, err := ParseCompression(s)
		if err != nil || got != want {
			t.Errorf("ParseCompression(%q) = %v, %v; want %v", s, got, err, want)
		}
	}
	if _, err := ParseCompression("bzip2"); err == nil {
		t.Error("ParseCompression(bzip2) succeeded")
	}
	var c Compression
	if err := c.Set("zstd"); err != nil || c != Zstd || c.String() != "zstd" {
		t.Errorf("Set(zstd): %v, %v", c, err)
	}
	for name, want := range map[string]Compression{"a.json": None, "a.json.gz": Gzip, "A.JSON.GZ": Gzip, "a.json.zst": Zstd, "a.zstd": Zstd, "gz": None} {
		if got := CompressionFromName(name); got != want {
			t.Errorf("CompressionFromName(%q) = %v, want %v", name, got, want)
		}
	}
	if _, err := NewCompressedWriter(io.Discard, Compression(7)); err == nil {
		t.Error("NewCompressedWriter(7) succeeded")
	}
}

func TestCapReader(t *testing.T) {
	data := bytes.Repeat([]byte("x"), 100)
	for _, tc := range []struct {
		max  int64
		fail bool
	}{{99, true}, {100, false}, {101, false}, {1, true}} {
		r := &capReader{r: bytes.NewReader(data), max: tc.max}
		got, err := io.ReadAll(r)
		var se *streamError
		failed := errors.As(err, &se) && se.op == opLimit
		if failed != tc.fail || (err != nil && !failed) {
			t.Errorf("cap %d on 100 bytes: err %v, want failure %v", tc.max, err, tc.fail)
		}
		if int64(len(got)) > tc.max {
			t.Errorf("cap %d: passed %d bytes", tc.max, len(got))
		}
	}
}

// rawZstdFrame builds a zstd frame by hand (RFC 8878 sections 3.1.1.1 and 3.1.1.2): magic, a
// frame header descriptor of 0 (no single segment, no checksum, no content size), a window
// descriptor for 2^windowLog bytes (exponent windowLog − 10, mantissa 0), and content as one
// last raw block.
func rawZstdFrame(windowLog int, content []byte) []byte {
	out := append([]byte(nil), zstdMagic...)
	out = append(out, 0, byte((windowLog-10)<<3))
	h := len(content)<<3 | 1 // block size, type raw (0), last block
	out = append(out, byte(h), byte(h>>8), byte(h>>16))
	return append(out, content...)
}

// TestZstdWindowCap checks that a zstd frame declaring a window above zstdMaxWindow is refused
// even though its content is tiny: the window is what the decoder would allocate. (The
// encoder shrinks the window to small content, so the frame is made by hand.)
func TestZstdWindowCap(t *testing.T) {
	doc := []byte(baseDoc().String())
	if _, err := ReadGrid(bytes.NewReader(rawZstdFrame(20, doc)), "1MiB-window.json.zst"); err != nil {
		t.Fatalf("hand-made frame with a 1 MiB window: %v", err)
	}
	if _, err := ReadGrid(bytes.NewReader(rawZstdFrame(26, doc)), "64MiB-window.json.zst"); !errors.Is(err, ErrCompression) {
		t.Errorf("64 MiB zstd window: %v, want ErrCompression", err)
	}
}

// TestGzipMultistream checks that concatenated gzip members read as one stream (as gunzip does).
func TestGzipMultistream(t *testing.T) {
	doc := []byte(baseDoc().String())
	half := len(doc) / 2
	in := append(compressBytes(t, doc[:half], Gzip), compressBytes(t, doc[half:], Gzip)...)
	if _, err := ReadGrid(bytes.NewReader(in), "two-members.json.gz"); err != nil {
		t.Errorf("two gzip members: %v", err)
	}
}
