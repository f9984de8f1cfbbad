package formats

import (
	"bytes"
	"errors"
	"math"
	"testing"
)

func TestFormatFloat(t *testing.T) {
	// Expected strings follow C's %.10g (ISO C11 7.21.6.1: style e when the exponent is < −4 or
	// ≥ the precision, trailing zeros removed), which Go's 'g' format implements.
	cases := []struct {
		x    float64
		want string
	}{
		{0.1, "0.1"},
		{1.0 / 3, "0.3333333333"},
		{-2.5e-7, "-2.5e-07"},
		{1234567.891, "1234567.891"},
		{123456789012, "1.23456789e+11"},
		{15.6333042, "15.6333042"},
		{1e-4, "0.0001"},
		{math.Copysign(0, -1), "0"},
		{0, "0"},
		{-1, "-1"},
	}
	for _, tc := range cases {
		if got := FormatFloat(tc.x); got != tc.want {
			t.Errorf("FormatFloat(%v) = %q, want %q", tc.x, got, tc.want)
		}
	}
}

func TestTable(t *testing.T) {
	var buf bytes.Buffer
	tab := NewTable(&buf)
	if err := tab.Comment("lamina bands\nunits: THz"); err != nil {
		t.Fatal(err)
	}
	if err := tab.Comment(""); err != nil {
		t.Fatal(err)
	}
	if err := tab.Row([]string{"G"}, []float64{0, 0, 0, 1.5}); err != nil {
		t.Fatal(err)
	}
	if err := tab.Row(nil, []float64{0.5, -0.25}); err != nil {
		t.Fatal(err)
	}
	if err := tab.Row([]string{"a", "b"}, nil); err != nil {
		t.Fatal(err)
	}
	if buf.Len() != 0 {
		t.Errorf("Table wrote %d bytes before Flush", buf.Len())
	}
	// A NaN in row 3 (0-based, comments not counted), column 1 + 2 = 3: refused, nothing of it written.
	err := tab.Row([]string{"K"}, []float64{1, 2, math.NaN()})
	var te *TableError
	if !errors.As(err, &te) || !errors.Is(err, ErrNonFinite) || te.Row != 3 || te.Column != 3 {
		t.Errorf("NaN row: %v, want TableError{Row: 3, Column: 3} wrapping ErrNonFinite", err)
	}
	err = tab.Row(nil, []float64{math.Inf(-1)})
	if !errors.As(err, &te) || te.Row != 3 || te.Column != 0 {
		t.Errorf("-Inf row: %v, want row 3, column 0", err)
	}
	if err := tab.Row([]string{"x\ty"}, []float64{1}); !errors.Is(err, ErrValue) {
		t.Errorf("text with a tab: %v, want ErrValue", err)
	}
	if err := tab.Row(nil, nil); !errors.Is(err, ErrValue) {
		t.Errorf("empty row: %v, want ErrValue", err)
	}
	if err := tab.Flush(); err != nil {
		t.Fatal(err)
	}
	want := "# lamina bands\n# units: THz\n#\nG\t0\t0\t0\t1.5\n0.5\t-0.25\na\tb\n"
	if got := buf.String(); got != want {
		t.Errorf("table:\ngot  %q\nwant %q", got, want)
	}
	if tab.Rows() != 3 {
		t.Errorf("Rows() = %d, want 3", tab.Rows())
	}
}

func TestTableFlushError(t *testing.T) {
	tab := NewTable(&failWriter{after: 0})
	if err := tab.Row(nil, []float64{1}); err != nil {
		t.Fatal(err) // buffered: the failure shows at Flush
	}
	if err := tab.Flush(); err == nil {
		t.Error("Flush to a failing writer returned nil")
	}
}

func BenchmarkTableRow(b *testing.B) {
	tab := NewTable(discard{})
	vals := []float64{0.1, 0.2, 0, 1.234567, 2.345678, 3.456789, 4.567891, 5.678912, 6.789123}
	b.ReportAllocs()
	for b.Loop() {
		if err := tab.Row(nil, vals); err != nil {
			b.Fatal(err)
		}
	}
}

type discard struct{}

func (discard) Write(p []byte) (int, error) { return len(p), nil }
