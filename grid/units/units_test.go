package units

import (
	"math"
	"testing"
)

// The expected values are those printed in shared PHYSICS.md section 1 (CODATA 2018 derived);
// tolerances are one unit of their last printed digit (PHYSICS.md rounds some, truncates others).
func TestDerivedConstants(t *testing.T) {
	for _, c := range []struct {
		name      string
		got, want float64
		tol       float64
	}{
		{"k_e eV·Å", CoulombEVAngstrom, 14.39964548, 5e-9},
		{"THz per sqrt(eV/Å²/amu)", THzPerSqrtEig, 15.6333042, 5e-8},
		{"cm-1 per THz", CmPerTHz, 33.35641, 5e-6},
		{"meV per THz", MeVPerTHz, 4.135667696, 1e-9},
		{"k_B eV/K", BoltzmannEV, 8.617333262e-5, 5e-15},
		{"hbar eV·s", HbarEVs, 6.582119569e-16, 1e-25},
		{"Ry eV", RydbergEV, 13.605693122994, 5e-13},
	} {
		if math.Abs(c.got-c.want) > c.tol {
			t.Errorf("%s = %.12g, want %.12g ± %g", c.name, c.got, c.want, c.tol)
		}
	}
}

func TestFrequencyUnits(t *testing.T) {
	for _, s := range []string{"thz", "cm-1", "mev"} {
		u, err := ParseFrequency(s)
		if err != nil || u.String() != s {
			t.Errorf("ParseFrequency(%q) = %v, %v", s, u, err)
		}
	}
	if _, err := ParseFrequency("hz"); err == nil {
		t.Error("ParseFrequency(hz) accepted")
	}
	if got := FrequencyTHz(-4); got >= 0 {
		t.Errorf("FrequencyTHz(-4) = %g, want negative", got)
	}
}
