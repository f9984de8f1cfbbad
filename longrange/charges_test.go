package longrange

import (
	"math"
	"strings"
	"testing"

	"lamina/grid"
)

func TestChargesValidate(t *testing.T) {
	good := Charges{Z: []grid.Mat3{isoZ(1), isoZ(-1)}, Epsilon: grid.Mat3{{2, 0.1, 0}, {0.1, 3, 0}, {0, 0, 4}}}
	if err := good.Validate(2); err != nil {
		t.Fatalf("Validate(good) = %v", err)
	}
	nanZ := Charges{Z: []grid.Mat3{isoZ(1), {{math.NaN()}}}, Epsilon: good.Epsilon}
	for _, tc := range []struct {
		name string
		c    Charges
		n    int
		want string
	}{
		{"count", good, 3, "2 Born charge tensors for 3 atoms"},
		{"NaN charge", nanZ, 2, "atom 1"},
		{"asymmetric epsilon", Charges{Z: good.Z, Epsilon: grid.Mat3{{2, 0.5, 0}, {0.1, 3, 0}, {0, 0, 4}}}, 2, "not symmetric"},
		{"indefinite epsilon", Charges{Z: good.Z, Epsilon: grid.Mat3{{1, 0, 0}, {0, -2, 0}, {0, 0, 1}}}, 2, "positive definite"},
	} {
		err := tc.c.Validate(tc.n)
		if err == nil || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("Validate(%s) = %v, want an error containing %q", tc.name, err, tc.want)
		}
	}
}

func TestChargesNeutralize(t *testing.T) {
	c := Charges{Z: []grid.Mat3{isoZ(1.1), isoZ(-0.95), generalZ}, Epsilon: grid.Identity()}
	out, removed := c.Neutralize()
	var sum grid.Mat3
	for _, z := range out.Z {
		sum = sum.Add(z)
	}
	for i := 0; i < 3; i++ {
		for j := 0; j < 3; j++ {
			if math.Abs(sum[i][j]) > 1e-15 {
				t.Errorf("Σ Z after Neutralize [%d][%d] = %g", i, j, sum[i][j])
			}
		}
	}
	// Largest component of the total 1.1·1 − 0.95·1 + generalZ: 0.15 + 2.3 on [1][1].
	if math.Abs(removed-2.45) > 1e-15 {
		t.Errorf("removed = %v, want 2.45", removed)
	}
	if c.Z[0] != isoZ(1.1) {
		t.Error("Neutralize modified its receiver")
	}
}
