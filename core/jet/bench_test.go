package jet

import (
	"fmt"
	"testing"
)

// morseTape evaluates V = De(1 − e^{−a(r−re)})² − De on the tape.
func morseTape(tp *Tape, rs []float64) Jet {
	const De, a, re = 4.6, 1.87, 1.27
	r := tp.Var(rs)
	e := tp.Exp(tp.Affine(r, -a, a*re))
	return tp.AddConst(tp.Scale(tp.Square(tp.AddConst(tp.Neg(e), 1)), De), -De)
}

func points(m int) []float64 {
	rs := make([]float64, m)
	for i := range rs {
		rs[i] = 0.9 + 2*float64(i)/float64(m)
	}
	return rs
}

// BenchmarkMorseTape is a Morse written on the tape, orders 0–n at m points
// per call; ns/point is the time per evaluation point.
func BenchmarkMorseTape(b *testing.B) {
	for _, c := range []struct{ order, m int }{{4, 1}, {4, 256}, {20, 1}, {20, 256}} {
		b.Run(fmt.Sprintf("order%d/points%d", c.order, c.m), func(b *testing.B) {
			rs := points(c.m)
			tp := NewTape(c.order, c.m)
			b.ReportAllocs()
			for b.Loop() {
				tp.Reset(c.order, c.m)
				morseTape(tp, rs)
			}
			b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N*c.m), "ns/point")
		})
	}
}

// BenchmarkLayout times single low-level operations at 256 points.
func BenchmarkLayout(b *testing.B) {
	const m = 256
	for _, order := range []int{4, 12} {
		l := Layout{Order: order, Points: m}
		x := make([]float64, l.Len())
		l.Var(x, points(m))
		dst := make([]float64, l.Len())
		work := make([]float64, 2*l.Len())
		ops := []struct {
			name string
			f    func()
		}{
			{"Mul", func() { l.Mul(dst, x, x) }},
			{"Square", func() { l.Square(dst, x) }},
			{"Div", func() { l.Div(dst, x, x) }},
			{"Exp", func() { l.Exp(dst, x) }},
			{"Log", func() { l.Log(dst, x) }},
			{"Sqrt", func() { l.Sqrt(dst, x) }},
			{"Pow", func() { l.Pow(dst, x, 1.5) }},
			{"PowInt-12", func() { l.PowInt(dst, x, -12, work) }},
			{"Sin", func() { l.Sin(dst, x, work) }},
			{"Tanh", func() { l.Tanh(dst, x, work) }},
			{"Erf", func() { l.Erf(dst, x, work) }},
		}
		for _, op := range ops {
			b.Run(fmt.Sprintf("%s/order%d", op.name, order), func(b *testing.B) {
				for b.Loop() {
					op.f()
				}
				b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N*m), "ns/point")
			})
		}
	}
}
