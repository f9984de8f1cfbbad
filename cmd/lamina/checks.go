package main

import (
	"fmt"
	"math"

	"lamina/grid"
)

// Limits on flags whose absurd values would exhaust memory or time instead of failing.
const (
	maxPoints  = 1_000_000 // band-path points
	maxWorkers = 1024
	maxReduced = 1000 // |f_i| beyond this leaves no precision in exp(2πi f·R)
)

func checkWorkers(n int) error {
	if n < 1 || n > maxWorkers {
		return fmt.Errorf("--workers %d: want 1 to %d", n, maxWorkers)
	}
	return nil
}

func checkPoints(n int) error {
	if n < 2 || n > maxPoints {
		return fmt.Errorf("--points %d: want 2 to %d", n, maxPoints)
	}
	return nil
}

// checkReduced refuses reduced coordinates so large that the phases lose all precision.
func checkReduced(q grid.Vec3) error {
	for i, f := range q {
		if math.Abs(f) > maxReduced {
			return fmt.Errorf("f%d = %g: reduced coordinates beyond ±%d lose all precision; fold the point into the first zone", i+1, f, maxReduced)
		}
	}
	return nil
}
