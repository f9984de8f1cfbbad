// Package units holds the physical constants and unit conversions of lamina, derived once from
// the CODATA 2018 defining and recommended values (shared PHYSICS.md section 1). It is a leaf
// package: every other lamina package may import it, it imports nothing of lamina.
//
// Internal units: length Å, mass amu (Da), energy eV, force constant eV/Å², charge e.
package units

import (
	"fmt"
	"math"
	"strings"
)

// CODATA 2018 values. The SI-defining constants are exact.
const (
	ElementaryCharge   = 1.602176634e-19   // C, exact (SI 2019)
	Planck             = 6.62607015e-34    // J·s, exact (SI 2019)
	Boltzmann          = 1.380649e-23      // J/K, exact (SI 2019)
	VacuumPermittivity = 8.8541878128e-12  // F/m, CODATA 2018
	AtomicMassUnit     = 1.66053906660e-27 // kg, CODATA 2018
	BohrRadius         = 0.529177210903    // Å, CODATA 2018
	HartreeEV          = 27.211386245988   // eV, CODATA 2018
	Angstrom           = 1e-10             // m
)

// Derived constants.
var (
	// RydbergEV is one rydberg in eV (half a hartree).
	RydbergEV = HartreeEV / 2
	// CoulombEVAngstrom is k_e = e²/(4πε₀) in eV·Å (14.39964548).
	CoulombEVAngstrom = ElementaryCharge / (4 * math.Pi * VacuumPermittivity * Angstrom)
	// THzPerSqrtEig converts sqrt(λ), λ in eV/(Å²·amu), to a frequency in THz (15.6333042):
	// f = sqrt(λ)/(2π) with λ in SI units s⁻².
	THzPerSqrtEig = math.Sqrt(ElementaryCharge/(Angstrom*Angstrom*AtomicMassUnit)) / (2 * math.Pi) / 1e12
	// CmPerTHz converts THz to cm⁻¹ (33.35641): 1e12/(c·100) with c = 299792458 m/s exact.
	CmPerTHz = 1e12 / (299792458.0 * 100)
	// MeVPerTHz converts THz to meV (4.135667696): h·1e12 Hz in meV.
	MeVPerTHz = Planck * 1e12 / ElementaryCharge * 1e3
	// BoltzmannEV is k_B in eV/K (8.617333262e-5).
	BoltzmannEV = Boltzmann / ElementaryCharge
	// HbarEVs is ħ in eV·s (6.582119569e-16).
	HbarEVs = Planck / (2 * math.Pi) / ElementaryCharge
)

// Frequency is a unit for printed phonon frequencies. Its zero value is THz.
// It implements pflag's Value interface (String, Set, Type).
type Frequency int

const (
	THz Frequency = iota
	InverseCm
	MeV
)

var frequencyNames = [...]string{THz: "thz", InverseCm: "cm-1", MeV: "mev"}

// String returns the flag spelling of the unit ("thz", "cm-1" or "mev").
func (u Frequency) String() string {
	if u < 0 || int(u) >= len(frequencyNames) {
		return fmt.Sprintf("Frequency(%d)", int(u))
	}
	return frequencyNames[u]
}

// Label returns the unit as printed beside numbers ("THz", "cm-1", "meV").
func (u Frequency) Label() string {
	switch u {
	case InverseCm:
		return "cm-1"
	case MeV:
		return "meV"
	}
	return "THz"
}

// FromTHz converts a frequency in THz to the unit u.
func (u Frequency) FromTHz(f float64) float64 {
	switch u {
	case InverseCm:
		return f * CmPerTHz
	case MeV:
		return f * MeVPerTHz
	}
	return f
}

// ParseFrequency parses "thz", "cm-1" or "mev" (case-insensitive; "cm^-1" and "1/cm" too).
func ParseFrequency(s string) (Frequency, error) {
	switch strings.ToLower(strings.TrimSpace(s)) {
	case "thz":
		return THz, nil
	case "cm-1", "cm^-1", "1/cm":
		return InverseCm, nil
	case "mev":
		return MeV, nil
	}
	return 0, fmt.Errorf("unknown frequency unit %q (valid: thz, cm-1, mev)", s)
}

// Set implements pflag.Value.
func (u *Frequency) Set(s string) error {
	v, err := ParseFrequency(s)
	if err != nil {
		return err
	}
	*u = v
	return nil
}

// Type implements pflag.Value.
func (u *Frequency) Type() string { return "thz|cm-1|mev" }

// FrequencyTHz converts an eigenvalue λ of the mass-weighted dynamical matrix, in eV/(Å²·amu),
// to a frequency in THz; a negative λ gives a negative frequency (an imaginary mode).
func FrequencyTHz(lambda float64) float64 {
	if lambda < 0 {
		return -math.Sqrt(-lambda) * THzPerSqrtEig
	}
	return math.Sqrt(lambda) * THzPerSqrtEig
}
