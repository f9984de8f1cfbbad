package formats

import (
	"bytes"
	"flag"
	"fmt"
	"os"
	"path/filepath"
	"reflect"
	"strings"
	"testing"
)

var updateSeeds = flag.Bool("update-seeds", false, "rewrite the FuzzReadGrid seed corpus in testdata/fuzz/FuzzReadGrid")

// fuzzSeeds returns the seed inputs of FuzzReadGrid by name: small valid files and broken
// variants of them.
func fuzzSeeds(t testing.TB) map[string][]byte {
	t.Helper()
	base := baseDoc()
	small := base.without("born_charges").without("epsilon").with("grid", `[1, 1, 1]`).
		with("atoms", `[{"species": "A", "mass": 24, "position": [0, 0, 7]}]`).
		with("qpoints", `[{"q": [0, 0, 0], "re": [[1, 0, 0], [0, 1, 0], [0, 0, 0.5]], "im": [[0, 0.1, 0], [-0.1, 0, 0], [0, 0, 0]]}]`)
	seeds := map[string]string{
		"valid-sheet":        string(encode(t, sheetGrid(t), None)),
		"valid-heldout-bulk": string(encode(t, bulkHeldOut(t), None)),
		"valid-small":        small.String(),
		"valid-units":        small.with("units", `{"length": "bohr", "energy": "Ry"}`).String(),
		"valid-reordered":    small.first("qpoints").String(),
		"broken-truncated":   small.String()[:len(small.String())*2/3],
		"broken-unknown-key": small.with("epsilom", `[[1,0,0],[0,1,0],[0,0,1]]`).String(),
		"broken-duplicate":   strings.Replace(small.String(), "{\n", "{\n  \"grid\": [1, 1, 1],\n", 1),
		"broken-overflow":    strings.Replace(small.String(), "0.5]", "1e999]", 1),
		"broken-no-phase":    small.without("phase").String(),
		"broken-short-row":   strings.Replace(small.String(), "[0, 1, 0]", "[0, 1]", 1),
		"broken-syntax":      strings.Replace(small.String(), `"mass": 24,`, `"mass": 24,,`, 1),
		"broken-version":     small.with("version", "2").String(),
		"broken-f3":          strings.Replace(small.String(), `"q": [0, 0, 0]`, `"q": [0, 0, 0.25]`, 1),
	}
	out := make(map[string][]byte, len(seeds))
	for k, v := range seeds {
		out[k] = []byte(v)
	}
	return out
}

// corpusFile encodes one []byte input in the format of the go tool's fuzz corpus
// (testing/internal/fuzz, "go test fuzz v1").
func corpusFile(data []byte) []byte {
	return fmt.Appendf(nil, "go test fuzz v1\n[]byte(%q)\n", data)
}

// TestFuzzSeeds checks that the committed seed corpus is what fuzzSeeds generates; run
// `go test ./formats -run TestFuzzSeeds -update-seeds` to rewrite it.
func TestFuzzSeeds(t *testing.T) {
	dir := filepath.Join("testdata", "fuzz", "FuzzReadGrid")
	seeds := fuzzSeeds(t)
	if *updateSeeds {
		if err := os.MkdirAll(dir, 0o755); err != nil {
			t.Fatal(err)
		}
		for name, data := range seeds {
			if err := os.WriteFile(filepath.Join(dir, name), corpusFile(data), 0o644); err != nil {
				t.Fatal(err)
			}
		}
	}
	for name, data := range seeds {
		got, err := os.ReadFile(filepath.Join(dir, name))
		if err != nil {
			t.Errorf("seed %s: %v (run with -update-seeds)", name, err)
			continue
		}
		if !bytes.Equal(got, corpusFile(data)) {
			t.Errorf("seed %s is stale (run with -update-seeds)", name)
		}
		_, err = ReadGrid(bytes.NewReader(data), name)
		if valid := strings.HasPrefix(name, "valid-"); valid != (err == nil) {
			t.Errorf("seed %s: ReadGrid error = %v, want valid = %v", name, err, valid)
		}
	}
}

// FuzzReadGrid checks that ReadGrid never panics, that plain, gzip and zstd copies of the same
// bytes decode alike, and that what parses writes and parses back to the same Grid.
func FuzzReadGrid(f *testing.F) {
	opts := []ReadOption{WithMaxBytes(1 << 20), WithMaxAtoms(64), WithMaxQPoints(4096)}
	f.Fuzz(func(t *testing.T, data []byte) {
		g, err := ReadGrid(bytes.NewReader(data), "fuzz", opts...)
		// Input that itself starts with a magic is decompressed when plain but not when it is
		// wrapped once more, so the copies are not the same text there: only "no panic" holds.
		magic := bytes.HasPrefix(data, gzipMagic) || bytes.HasPrefix(data, zstdMagic)
		for _, c := range []Compression{Gzip, Zstd} {
			g2, err2 := ReadGrid(bytes.NewReader(compressBytes(t, data, c)), "fuzz", opts...)
			if magic {
				continue
			}
			if (err == nil) != (err2 == nil) || (err != nil && err.Error() != err2.Error()) {
				t.Fatalf("plain and %v copies disagree:\nplain: %v\n%v: %v", c, err, c, err2)
			}
			if err == nil && !reflect.DeepEqual(g, g2) {
				t.Fatalf("plain and %v copies decode to different grids", c)
			}
		}
		if err != nil {
			return
		}
		var buf bytes.Buffer
		if err := WriteGrid(&buf, g); err != nil {
			t.Fatalf("WriteGrid of a grid ReadGrid accepted: %v", err)
		}
		g3, err := ReadGrid(&buf, "rewritten")
		if err != nil {
			t.Fatalf("ReadGrid of WriteGrid output: %v", err)
		}
		g3.Units = g.Units // written in Å and eV whatever the input said
		if !reflect.DeepEqual(g, g3) {
			t.Fatalf("write and read back changed the grid")
		}
	})
}
