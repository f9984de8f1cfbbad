package ifc

import (
	"errors"
	"fmt"
	"strings"

	"lamina/grid"
	"lamina/longrange"
)

// LongRangeMode selects the long-range treatment of NewModel.
type LongRangeMode int

const (
	// LongRangeAuto uses the kernel of the structure's periodicity when Born charges are present,
	// and none otherwise. It is the zero value.
	LongRangeAuto LongRangeMode = iota
	// LongRangeOff interpolates the full matrices with no long-range part.
	LongRangeOff
	// LongRange2D forces the 2D sheet kernel (sheets only).
	LongRange2D
	// LongRange3D forces the 3D kernel; on a sheet it gives a spurious constant splitting at Γ.
	LongRange3D
)

var longRangeNames = [...]string{LongRangeAuto: "auto", LongRangeOff: "off", LongRange2D: "2d", LongRange3D: "3d"}

// String returns the flag spelling: auto, off, 2d or 3d.
func (m LongRangeMode) String() string { return enumName(longRangeNames[:], int(m), "LongRangeMode") }

// ParseLongRangeMode parses auto, off, 2d or 3d.
func ParseLongRangeMode(s string) (LongRangeMode, error) {
	i, err := parseEnum(longRangeNames[:], s, "long-range mode")
	return LongRangeMode(i), err
}

// Set implements pflag.Value.
func (m *LongRangeMode) Set(s string) error {
	v, err := ParseLongRangeMode(s)
	if err != nil {
		return err
	}
	*m = v
	return nil
}

// Type implements pflag.Value.
func (m *LongRangeMode) Type() string { return strings.Join(longRangeNames[:], "|") }

// Input is a coarse grid of dynamical matrices with its structure and optional dielectric data.
type Input struct {
	Structure grid.Structure
	Charges   *longrange.Charges // nil: no Born charges
	Mesh      grid.Mesh
	Phase     Phase
	Samples   []Sample
}

// ModelOptions configures NewModel. The zero value is the default treatment: long range auto,
// default Λ, translational sum rule, charge neutrality restored.
type ModelOptions struct {
	LongRange LongRangeMode
	// Lambda is the range-separation parameter in 1/Å; zero chooses longrange.DefaultLambda.
	Lambda  float64
	SumRule SumRule
	// KeepCharges leaves the Born charges as given instead of removing their mean.
	KeepCharges bool
}

// Report says how NewModel treated the input.
type Report struct {
	// Kernel is the long-range kernel used ("2d", "3d"), or "none".
	Kernel string
	// Lambda is the range-separation parameter used, 1/Å (zero with no kernel).
	Lambda float64
	// ChargeRemoved is the largest component of Σ_κ Z_κ removed to restore neutrality (e).
	ChargeRemoved float64
	// Charges are the Born charges as used (after neutrality was restored); nil when none.
	Charges *longrange.Charges
	// Screening is the in-plane screening tensor 2πα∥ of a sheet (Å; r∥ for an isotropic sheet)
	// and EpsEnv the dielectric constant of its environment; zero without the 2D kernel.
	Screening [2][2]float64
	EpsEnv    float64
	// Warnings are conditions worth telling the user, one sentence each.
	Warnings []string
}

// NewModel builds the interpolation model of in: it restores charge neutrality, chooses and
// builds the long-range kernel, and calls Build.
func NewModel(in Input, opt ModelOptions) (*ForceConstants, Report, error) {
	rep := Report{Kernel: "none"}
	s := in.Structure
	if err := s.Validate(); err != nil {
		return nil, rep, err
	}
	kind, use, err := chooseKernel(s.Lattice.Periodicity, in.Charges != nil, opt.LongRange)
	if err != nil {
		return nil, rep, err
	}
	var build Options
	build.SumRule = opt.SumRule
	if in.Charges != nil {
		if err := in.Charges.Validate(s.N()); err != nil {
			return nil, rep, err
		}
		ch := *in.Charges
		if !opt.KeepCharges {
			ch, rep.ChargeRemoved = ch.Neutralize()
		}
		rep.Charges = &ch
	}
	if use {
		var lopts []longrange.Option
		if opt.Lambda != 0 {
			lopts = append(lopts, longrange.WithLambda(opt.Lambda))
		}
		k, err := longrange.New(s, *rep.Charges, in.Mesh, kind, lopts...)
		if err != nil {
			return nil, rep, err
		}
		rep.Kernel, rep.Lambda = kind.String(), k.Lambda()
		if kind == longrange.Kernel2D {
			rep.Screening, rep.EpsEnv = k.Screening()
		}
		ch, lambda := *rep.Charges, k.Lambda()
		build.NewLongRange = func() LongRange {
			// Each caller gets its own kernel (kernels keep per-call buffers); the inputs were
			// validated by the New call above, so a failure here is a lamina bug.
			c, err := longrange.New(s, ch, in.Mesh, kind, longrange.WithLambda(lambda))
			if err != nil {
				panic("ifc: long-range kernel failed to rebuild with validated inputs: " + err.Error())
			}
			return c
		}
		if kind == longrange.Kernel3D && s.Lattice.Periodicity == grid.Sheet {
			rep.Warnings = append(rep.Warnings, "the 3D kernel on a sheet gives a spurious constant LO–TO splitting at Γ (for comparison only)")
		}
	}
	if in.Charges != nil && !opt.KeepCharges && rep.ChargeRemoved > 1e-3 {
		rep.Warnings = append(rep.Warnings, fmt.Sprintf("Born charges summed to %.3g e (largest component); the mean was removed", rep.ChargeRemoved))
	}
	if use && opt.Lambda != 0 {
		def := longrange.DefaultLambda(s, rep.Charges.Epsilon, in.Mesh, kind)
		if opt.Lambda < minLambdaFraction*def {
			rep.Warnings = append(rep.Warnings, fmt.Sprintf("lambda = %.4g 1/Å is below %.2g of the default %.4g 1/Å: the real-space remainder no longer dies inside the grid's supercell and the results depend on lambda", opt.Lambda, minLambdaFraction, def))
		}
	}
	fc, err := Build(s, in.Mesh, in.Phase, in.Samples, build)
	if err != nil {
		return nil, rep, err
	}
	d := fc.Diagnostics()
	for _, c := range []struct {
		what string
		size float64
	}{
		{"non-Hermitian part of the input matrices", d.Hermiticity},
		{"violation of C(-q) = C(q)* in the input", d.TimeReversal},
		{"imaginary part of the real-space force constants", d.ImagPhi},
	} {
		if c.size > noiseWarning*d.Scale {
			rep.Warnings = append(rep.Warnings, fmt.Sprintf("%s is %.3g eV/Å² (%.2g of the largest element): the input is inconsistent or noisy (see 'lamina info')", c.what, c.size, c.size/d.Scale))
		}
	}
	return fc, rep, nil
}

// Thresholds of NewModel's warnings.
const (
	// minLambdaFraction: an explicit Λ below this fraction of the default is reported.
	minLambdaFraction = 0.8
	// noiseWarning: removed non-Hermitian or time-reversal-odd parts, or Im Φ, larger than this
	// fraction of the largest input element are reported.
	noiseWarning = 1e-3
)

// chooseKernel maps a mode to a kernel kind; use is false for no long-range part.
func chooseKernel(p grid.Periodicity, charges bool, m LongRangeMode) (longrange.Kind, bool, error) {
	switch m {
	case LongRangeOff:
		return 0, false, nil
	case LongRangeAuto:
		if !charges {
			return 0, false, nil
		}
		if p == grid.Sheet {
			return longrange.Kernel2D, true, nil
		}
		return longrange.Kernel3D, true, nil
	case LongRange2D, LongRange3D:
		if !charges {
			return 0, false, fmt.Errorf("ifc: long-range mode %s needs Born charges and epsilon, and the input has none", m)
		}
		if m == LongRange2D {
			if p != grid.Sheet {
				return 0, false, errors.New("ifc: the 2d long-range kernel applies to sheets only (periodicity 2d)")
			}
			return longrange.Kernel2D, true, nil
		}
		return longrange.Kernel3D, true, nil
	}
	return 0, false, fmt.Errorf("ifc: unknown long-range mode %d", m)
}
