package geom

import "math"

// Sum is a compensated (Kahan–Babuška–Neumaier) accumulator. The zero value
// is an empty sum. Volumes and areas are summed with it in a fixed order so
// that results do not depend on how large the terms are relative to the
// running total (Neumaier, "Rundungsfehleranalyse einiger Verfahren zur
// Summation endlicher Summen", ZAMM 54, 1974).
type Sum struct{ s, c float64 }

// Add adds x to the sum.
func (k *Sum) Add(x float64) {
	t := k.s + x
	if math.Abs(k.s) >= math.Abs(x) {
		k.c += (k.s - t) + x
	} else {
		k.c += (x - t) + k.s
	}
	k.s = t
}

// AddSum adds the value of another accumulator.
func (k *Sum) AddSum(o Sum) {
	k.Add(o.s)
	k.Add(o.c)
}

// Value returns the compensated total.
func (k Sum) Value() float64 { return k.s + k.c }
