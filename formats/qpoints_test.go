package formats

import (
	"bytes"
	"errors"
	"reflect"
	"strings"
	"testing"

	"lamina/grid"
)

func TestReadQPoints(t *testing.T) {
	in := "# band path A-B\n" +
		"0 0 0\n" +
		"\n" +
		"1/3 1/3 0   # corner\n" +
		"  0.5\t-1e-1  0\r\n" +
		"-2/3 0.5/2 +1.5E0\n" +
		"#0 0 0 commented out\n"
	// Expected values: 1/3 and -2/3 are the correctly rounded IEEE quotients, as Go's constant
	// arithmetic gives them; the decimals are exact literals.
	want := []grid.Vec3{{0, 0, 0}, {1.0 / 3, 1.0 / 3, 0}, {0.5, -0.1, 0}, {-2.0 / 3, 0.25, 1.5}}
	for _, c := range []Compression{None, Gzip, Zstd} {
		data := compressBytes(t, []byte(in), c)
		got, err := ReadQPoints(bytes.NewReader(data), "path.txt")
		if err != nil {
			t.Fatalf("%v: ReadQPoints: %v", c, err)
		}
		if !reflect.DeepEqual(got, want) {
			t.Errorf("%v: ReadQPoints = %v, want %v", c, got, want)
		}
	}
}

func TestReadQPointsErrors(t *testing.T) {
	in := "0 0 0\n" + // 1
		"1 2\n" + // 2: two fields
		"0 0 0 0\n" + // 3: four fields
		"a b c\n" + // 4: not numbers
		"1/0 0 0\n" + // 5: division by zero
		"inf 0 0\n" + // 6: ParseFloat would accept
		"0x1p2 0 0\n" + // 7: hex, ParseFloat would accept
		"1e999 0 0\n" + // 8: overflow
		"1/ 0 0\n" + // 9: empty denominator
		"0.25 0.25 0\n" // 10: fine
	_, err := ReadQPoints(strings.NewReader(in), "path.txt")
	var lines []int
	for _, p := range problemsOf(err) {
		if p.File != "path.txt" || !errors.Is(p, ErrSyntax) {
			t.Errorf("problem %v: want file path.txt and ErrSyntax", p)
		}
		lines = append(lines, p.Line)
	}
	if want := []int{2, 3, 4, 5, 6, 7, 8, 9}; !reflect.DeepEqual(lines, want) {
		t.Errorf("bad lines reported %v, want %v\n%v", lines, want, err)
	}
	if got, want := problemsOf(err)[0].Error(), "path.txt:2: 2 fields, want 3 reduced coordinates (f1 f2 f3)"; got != want {
		t.Errorf("message:\ngot  %s\nwant %s", got, want)
	}

	if _, err := ReadQPoints(strings.NewReader("# nothing\n\n"), "empty.txt"); !errors.Is(err, ErrValue) {
		t.Errorf("empty list: %v, want ErrValue", err)
	}
	if _, err := ReadQPoints(strings.NewReader("0 0 0\n0 0 0\n0 0 0\n"), "q.txt", WithMaxQPoints(2)); !errors.Is(err, ErrLimit) {
		t.Errorf("3 q-points with WithMaxQPoints(2): %v, want ErrLimit", err)
	}
	long := "0 0 " + strings.Repeat("0", maxQPointLine) + "\n"
	if _, err := ReadQPoints(strings.NewReader(long), "q.txt"); !errors.Is(err, ErrLimit) {
		t.Errorf("over-long line: %v, want ErrLimit", err)
	}
	if _, err := ReadQPoints(strings.NewReader("0 0 0\n"), "q.txt", WithMaxBytes(3)); !errors.Is(err, ErrLimit) {
		t.Errorf("WithMaxBytes(3) on 6 bytes: %v, want ErrLimit", err)
	}
	gz := compressBytes(t, []byte("0 0 0\n0.5 0 0\n"), Gzip)
	if _, err := ReadQPoints(bytes.NewReader(gz[:len(gz)-4]), "q.txt.gz"); !errors.Is(err, ErrCompression) {
		t.Errorf("truncated gzip list: %v, want ErrCompression", err)
	}
}
