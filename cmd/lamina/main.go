// Command lamina interpolates phonons of sheets and bulk crystals from a coarse grid of
// dynamical matrices, with the long-range dipole–dipole part treated analytically.
package main

import (
	"context"
	"errors"
	"fmt"
	"os"
	"os/signal"
)

func main() {
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt)
	err := newRootCmd().ExecuteContext(ctx)
	stop()
	if err != nil {
		if errors.Is(err, context.Canceled) {
			fmt.Fprintln(os.Stderr, "lamina: interrupted (files named by -o are written only on success)")
		} else {
			fmt.Fprintf(os.Stderr, "lamina: %v\n", err)
		}
		os.Exit(1)
	}
}
