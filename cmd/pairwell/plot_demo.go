package main

import (
	"fmt"
	"io"
	"os"
	"path/filepath"
	"runtime"
	"sync"

	"github.com/spf13/cobra"

	"github.com/pairwell/pairwell/core/figure"
	"github.com/pairwell/pairwell/core/motion"
	"github.com/pairwell/pairwell/core/report"
)

// defaultDemoOut is the folder the demo writes its pictures into.
const defaultDemoOut = "pairwell-demo"

// demoMotionAmplitude is the stretch (Å) of the demo's motion picture:
// about half the depth of the demo bond, where the period is already 40 %
// longer than the harmonic one.
const demoMotionAmplitude = 0.5

// demoPictures are the demo's picture flags and the pictures it writes.
type demoPictures struct {
	dir  string
	skip bool
}

func (d *demoPictures) register(cmd *cobra.Command) {
	cmd.Flags().StringVar(&d.dir, "out", defaultDemoOut, "folder for the demo's pictures (created if missing)")
	cmd.Flags().BoolVar(&d.skip, "no-pictures", false, "write no pictures")
}

// demoPicture is one picture of the demo: its file name and what it shows.
type demoPicture struct {
	file, what string
	draw       func() (*figure.Figure, error)
}

// write draws the demo's pictures of the forms matched to the demo bond
// into the folder and says where: on stdout after the text, or on stderr
// when stdout holds JSON.
func (d *demoPictures) write(e *env) error {
	if d.skip {
		return nil
	}
	inputs := demoInputs(e.registry)
	var curves []figure.Curve
	var morse *report.CompareInput
	for i, in := range inputs {
		if in.Err != nil {
			continue
		}
		curves = append(curves, figure.Curve{Name: in.Name, Potential: in.Instance.Potential})
		if in.Model == demoPeriodModel {
			morse = &inputs[i]
		}
	}
	if morse == nil {
		return failErr(fmt.Errorf("demo pictures: %s could not be matched to the demo bond", demoPeriodModel))
	}
	p, name, mu := morse.Instance.Potential, morse.Name, demoBond.mu
	pictures := []demoPicture{
		{"taylor.png", fmt.Sprintf("%s and its Taylor truncations of order 0–4", name), func() (*figure.Figure, error) {
			return figure.Taylor(p, figure.TaylorOptions{Name: name})
		}},
		{"period.png", fmt.Sprintf("%s period against amplitude at the table's amplitudes, measured by dopri", name), func() (*figure.Figure, error) {
			return figure.Period(p, figure.PeriodOptions{Name: name, Mu: mu, Amplitudes: demoAmplitudes, Measure: true, Method: motion.DormandPrince})
		}},
		{"compare.png", "the four matched forms, energy above the minimum", func() (*figure.Figure, error) {
			return figure.Compare(curves, figure.CompareOptions{FromMinimum: true})
		}},
		{"motion.png", fmt.Sprintf("%s released at %g Å against the harmonic motion", name, demoMotionAmplitude), func() (*figure.Figure, error) {
			return figure.Motion(p, figure.MotionOptions{Name: name, Mu: mu, Amplitude: demoMotionAmplitude})
		}},
		{"fit.png", "the four forms fitted to the invented scan, with their residuals", func() (*figure.Figure, error) {
			run, err := demoFitRun(e)
			if err != nil {
				return nil, err
			}
			return fitFigure(run)
		}},
	}
	pictures = append(pictures, demoTemperaturePictures(e, morse.Instance, name)...)
	if err := os.MkdirAll(d.dir, 0o755); err != nil {
		return failErr(fmt.Errorf("demo pictures: --out: %w", err))
	}
	// Draw and write the pictures on all cores; report them in order.
	errs := make([]error, len(pictures))
	var wg sync.WaitGroup
	sem := make(chan struct{}, max(1, runtime.GOMAXPROCS(0)))
	for i, pic := range pictures {
		wg.Add(1)
		go func() {
			defer wg.Done()
			sem <- struct{}{}
			defer func() { <-sem }()
			f, err := pic.draw()
			if err != nil {
				errs[i] = computeErr(fmt.Errorf("demo picture %s: %w", pic.file, err))
				return
			}
			path := filepath.Join(d.dir, pic.file)
			errs[i] = e.writeOutput("demo picture", path, func(w io.Writer) error { return f.Render(w, figure.PNG) })
		}()
	}
	wg.Wait()
	for _, err := range errs {
		if err != nil {
			return err
		}
	}
	w := e.stdout
	if e.format == "json" {
		w = e.stderr
	}
	fmt.Fprintf(w, "\n== Pictures, written to %s\n", d.dir+string(filepath.Separator))
	for _, pic := range pictures {
		if _, err := fmt.Fprintf(w, "  %-12s %s\n", pic.file, pic.what); err != nil {
			return failErr(fmt.Errorf("writing output: %w", err))
		}
	}
	return nil
}
