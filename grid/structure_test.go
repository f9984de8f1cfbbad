package grid

import (
	"strings"
	"testing"
)

func TestStructureSeparations(t *testing.T) {
	sheet, err := NewLattice(Mat3{{3, 0, 0}, {1.5, 2.6, 0}, {0, 0, 20}}, Sheet)
	if err != nil {
		t.Fatal(err)
	}
	bulk, err := NewLattice(Mat3{{0, 2.5, 2.5}, {2.5, 0, 2.5}, {2.5, 2.5, 0}}, Bulk)
	if err != nil {
		t.Fatal(err)
	}
	flat, err := NewLattice(Mat3{{3.2, 0, 0}, {3.2, 1e-5, 0}, {0, 0, 20}}, Sheet)
	if err != nil {
		t.Fatal(err)
	}
	a := func(x, y, z float64) Atom { return Atom{Species: "A", Mass: 10, Position: Vec3{x, y, z}} }
	for _, c := range []struct {
		name string
		s    Structure
		want string // "" for valid
	}{
		{"sheet ok", Structure{sheet, []Atom{a(0, 0, 0), a(1.5, 0.87, 0.3)}}, ""},
		{"duplicate", Structure{sheet, []Atom{a(0, 0, 0), a(0.01, 0, 0)}}, "apart"},
		{"off by a1+a2", Structure{sheet, []Atom{a(0, 0, 0), a(4.5, 2.6, 0.02)}}, "apart"},
		// Along z a sheet has no periodicity: atoms 20 Å apart in z are distinct.
		{"sheet z is not periodic", Structure{sheet, []Atom{a(0, 0, 0), a(0, 0, 5)}}, ""},
		{"bulk off by a3", Structure{bulk, []Atom{a(0, 0, 0), a(2.5, 2.5, 0.0)}}, "apart"},
		{"bulk ok", Structure{bulk, []Atom{a(0, 0, 0), a(2.5, 0, 0)}}, ""},
		{"degenerate cell", Structure{flat, []Atom{a(0, 0, 0)}}, "degenerate"},
	} {
		err := c.s.Validate()
		switch {
		case c.want == "" && err != nil:
			t.Errorf("%s: %v", c.name, err)
		case c.want != "" && (err == nil || !strings.Contains(err.Error(), c.want)):
			t.Errorf("%s: err = %v, want one mentioning %q", c.name, err, c.want)
		}
	}
}
