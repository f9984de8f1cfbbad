package main

import "github.com/spf13/cobra"

func newRootCmd() *cobra.Command {
	root := &cobra.Command{
		Use:   "lamina",
		Short: "Phonons of sheets and bulk crystals from a coarse grid of dynamical matrices",
		Long: `lamina reads dynamical matrices on a coarse Γ-centred q-grid (with Born effective
charges and the dielectric tensor), removes the analytic long-range dipole–dipole part
(a 2D kernel for sheets, 3D for bulk), Fourier-interpolates the short-range remainder and
adds the long-range part back at every new q-point.`,
		SilenceUsage:  true,
		SilenceErrors: true,
	}
	root.AddCommand(newEvalCmd(), newBandsCmd(), newInfoCmd(), newDemoCmd())
	return root
}
