package grid

import (
	"math"

	"github.com/dugout-estimating/dugout/internal/geom"
)

// PositivePart returns the integral of max(0, f) and the area of {f > 0}
// over a triangle of plan area area (m²) on which f is linear with the
// corner values f0, f1, f2. Both are exact up to round-off: with the values
// sorted a ≥ b ≥ c,
//
//  1. c ≥ 0: integral = area·(a+b+c)/3, support = area (0 when a = 0);
//  2. a ≤ 0: both 0;
//  3. a > 0 ≥ b: the positive part is a corner triangle of relative size
//     a²/((a−b)(a−c)), integral = area·a³/(3(a−b)(a−c));
//  4. b > 0 > c: the whole triangle minus the negative corner triangle,
//     integral = area·((a+b+c)/3 + (−c)³/(3(a−c)(b−c))).
//
// The quotients in 3 and 4 are bounded by a and −c, so nothing overflows.
// Non-finite values give NaN.
func PositivePart(area, f0, f1, f2 float64) (integral, support float64) {
	a, b, c := sort3(f0, f1, f2)
	switch {
	case c >= 0:
		if a == 0 {
			return 0, 0
		}
		return area * (a + b + c) / 3, area
	case a <= 0:
		return 0, 0
	case b <= 0:
		r := a / (a - b) * (a / (a - c))
		return area * r * a / 3, area * r
	default:
		r := c / (a - c) * (c / (b - c))
		return area * ((a+b+c)/3 - r*c/3), area * (1 - r)
	}
}

// Parts returns both signed parts of the linear f over a triangle of plan
// area area: pos = ∬ max(0, f), neg = ∬ max(0, −f), and the areas where
// f > 0 and f < 0, by the formulas of [PositivePart] applied to f and −f
// after one sort.
func Parts(area, f0, f1, f2 float64) (pos, neg, posArea, negArea float64) {
	a, b, c := sort3(f0, f1, f2)
	switch {
	case c >= 0:
		if a == 0 {
			return 0, 0, 0, 0
		}
		return area * (a + b + c) / 3, 0, area, 0
	case a <= 0:
		return 0, -area * (a + b + c) / 3, 0, area
	case b <= 0: // one corner positive
		r := a / (a - b) * (a / (a - c))
		// −f has two non-negative corners (−c ≥ −b ≥ 0 > −a); the formula
		// of case 4 is continuous at b = 0, where it meets case 3.
		return area * r * a / 3, area * (r*a/3 - (a+b+c)/3), area * r, area * (1 - r)
	default: // two corners positive, c < 0
		r := c / (a - c) * (c / (b - c))
		return area * ((a+b+c)/3 - r*c/3), -area * r * c / 3, area * (1 - r), area * r
	}
}

func sort3(x, y, z float64) (a, b, c float64) {
	if x < y {
		x, y = y, x
	}
	if y < z {
		y, z = z, y
	}
	if x < y {
		x, y = y, x
	}
	return x, y, z
}

// DiffVolumes integrates (a − b)⁺ and (b − a)⁺ over the lattice, exactly for
// the piecewise-linear interpolants of a and b on the cell triangles (see
// the package comment). Cells with a NaN among their eight corner values
// are skipped. With a the existing ground and b the finished grade, pos is
// the cut and neg the fill, in m³ when the values are elevations in m.
// Sums are compensated and taken cell by cell in row order, so the result
// depends on nothing but the inputs. It panics if a or b is
// shorter than l.Len() (a programming error).
func DiffVolumes(l Lattice, a, b []float64) (pos, neg float64) {
	n := l.Len()
	_, _ = a[n-1], b[n-1]
	half := l.CellArea() / 2
	var sp, sn geom.Sum
	for j := 0; j+1 < l.NY; j++ {
		for i := 0; i+1 < l.NX; i++ {
			k := l.Index(i, j)
			d00 := a[k] - b[k]
			d10 := a[k+1] - b[k+1]
			d01 := a[k+l.NX] - b[k+l.NX]
			d11 := a[k+l.NX+1] - b[k+l.NX+1]
			if math.IsNaN(d00 + d10 + d01 + d11) {
				continue
			}
			p1, n1, _, _ := Parts(half, d00, d10, d11)
			p2, n2, _, _ := Parts(half, d00, d11, d01)
			sp.Add(p1 + p2)
			sn.Add(n1 + n2)
		}
	}
	return sp.Value(), sn.Value()
}
