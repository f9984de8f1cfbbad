package main

import (
	"errors"
	"fmt"
	"image/color"
	"io"
	"math"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"

	"lamina/grid"
	"lamina/grid/units"
)

// bandSeries is one dispersion to draw: frequencies (in Unit) at the points of a sampled path.
type bandSeries struct {
	Title  string // figure title (first series) or legend entry
	Points []grid.PathPoint
	Freqs  [][]float64
	Unit   units.Frequency
	Dashed bool
}

var seriesColors = []color.Color{
	color.RGBA{0, 0, 0, 255},
	color.RGBA{200, 30, 30, 255},
	color.RGBA{30, 90, 200, 255},
	color.RGBA{20, 150, 60, 255},
	color.RGBA{150, 60, 170, 255},
}

// bandsFigure draws one or more dispersions on the same axes: distance along the path (1/Å)
// against frequency, branches split where the path breaks or jumps at Γ, labelled vertices as
// ticks with vertical lines. A legend names the series when there is more than one.
func bandsFigure(series ...bandSeries) (*plot.Plot, error) {
	if len(series) == 0 || len(series[0].Points) == 0 {
		return nil, errors.New("figure: nothing to draw")
	}
	p := plot.New()
	p.Title.Text = series[0].Title
	p.X.Label.Text = "distance along path (1/Å)"
	p.Y.Label.Text = fmt.Sprintf("frequency (%s)", series[0].Unit.Label())
	ymin, ymax := math.Inf(1), math.Inf(-1)
	for si, s := range series {
		if len(s.Freqs) != len(s.Points) {
			return nil, fmt.Errorf("figure: series %d has %d rows for %d points", si, len(s.Freqs), len(s.Points))
		}
		col := seriesColors[si%len(seriesColors)]
		nb := len(s.Freqs[0])
		for b := 0; b < nb; b++ {
			start := 0
			for i := 1; i <= len(s.Points); i++ {
				if i < len(s.Points) && s.Points[i].Dist != s.Points[i-1].Dist {
					continue
				}
				if i-start >= 2 {
					xy := make(plotter.XYs, i-start)
					for j := start; j < i; j++ {
						f := s.Freqs[j][b]
						if math.IsNaN(f) || math.IsInf(f, 0) {
							return nil, fmt.Errorf("figure: series %d point %d branch %d is not finite", si, j, b)
						}
						xy[j-start] = plotter.XY{X: s.Points[j].Dist, Y: f}
						ymin, ymax = math.Min(ymin, f), math.Max(ymax, f)
					}
					l, err := plotter.NewLine(xy)
					if err != nil {
						return nil, fmt.Errorf("figure: %w", err)
					}
					l.Color = col
					l.Width = vg.Points(1.2)
					if si == 0 && len(series) > 1 {
						// The reference is drawn wide and light, so curves on top of it stay visible.
						l.Color = color.Gray{Y: 160}
						l.Width = vg.Points(3.5)
					}
					if s.Dashed {
						l.Dashes = []vg.Length{vg.Points(4), vg.Points(2)}
					}
					p.Add(l)
					if b == 0 && start == 0 && len(series) > 1 {
						p.Legend.Add(s.Title, l)
					}
				}
				start = i
			}
		}
	}
	if len(series) > 1 {
		p.Title.Text = ""
		p.Legend.Top = true
		p.Legend.XOffs, p.Legend.YOffs = -vg.Points(6), -vg.Points(4)
	}
	pad := 0.05 * (ymax - ymin)
	top := pad
	if len(series) > 1 {
		top += 0.07 * (ymax - ymin) * float64(len(series)) // room for the legend
	}
	p.Y.Min, p.Y.Max = math.Min(0, ymin-pad), ymax+top
	pts := series[0].Points
	p.X.Min, p.X.Max = pts[0].Dist, pts[len(pts)-1].Dist
	var ticks []plot.Tick
	for i, pt := range pts {
		if pt.Label == "" {
			continue
		}
		label := pt.Label
		if label == "G" {
			label = "Γ"
		}
		if n := len(ticks); n > 0 && ticks[n-1].Value == pt.Dist {
			if ticks[n-1].Label != label {
				ticks[n-1].Label += "|" + label
			}
			continue
		}
		ticks = append(ticks, plot.Tick{Value: pt.Dist, Label: label})
		if i > 0 && i < len(pts)-1 {
			v, err := plotter.NewLine(plotter.XYs{{X: pt.Dist, Y: p.Y.Min}, {X: pt.Dist, Y: p.Y.Max}})
			if err == nil {
				v.Color = color.Gray{Y: 170}
				v.Width = vg.Points(0.5)
				p.Add(v)
			}
		}
	}
	if len(ticks) > 0 {
		p.X.Tick.Marker = plot.ConstantTicks(ticks)
	}
	zero, err := plotter.NewLine(plotter.XYs{{X: p.X.Min, Y: 0}, {X: p.X.Max, Y: 0}})
	if err == nil {
		zero.Color = color.Gray{Y: 200}
		zero.Width = vg.Points(0.5)
		p.Add(zero)
	}
	p.Legend.TextStyle.Font.Size = vg.Points(9)
	return p, nil
}

// savePlot renders p to path (format svg, png or pdf) atomically.
func savePlot(stdout io.Writer, p *plot.Plot, path, format string) error {
	wt, err := p.WriterTo(7*vg.Inch, 5*vg.Inch, format)
	if err != nil {
		return err
	}
	return withOutput(stdout, path, func(w io.Writer) error {
		_, err := wt.WriteTo(w)
		return err
	})
}
