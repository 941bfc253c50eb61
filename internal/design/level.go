package design

import (
	"fmt"
	"math"

	"github.com/dugout-estimating/dugout/internal/geom"
	"github.com/dugout-estimating/dugout/internal/grid"
)

// rimCells is the number of lattice cells across the rim set used to
// trace the rim line for LevelAuto.
const rimCells = 256

// autoLevel returns the water level whose rim sits at the lowest existing
// ground along the rim line {e = freeboard}, which does not depend on W.
// The rim line is found where it crosses the lines of a lattice of about
// rimCells cells across the rim set (crossings interpolated between the
// exact node values), and along the outlines of vertical-walled zones
// sampled at the same spacing; the ground is read at those points. For
// smooth ground the minimum is then found to within |∇G|·h²/(2r) on a rim
// arc of radius r and exactly on straight runs; on a TIN, to within
// |∇G|·h where the minimum falls on a TIN edge.
func (b *builder) autoLevel() (float64, error) {
	if b.autoW != nil {
		return *b.autoW, nil
	}
	zs := b.zs
	box := zs.rimBox()
	h := math.Exp2(math.Floor(math.Log2(max(box.Width(), box.Height()) / rimCells)))
	lat, err := grid.NewLattice(box.Expand(2*h), h)
	if err != nil {
		return 0, err
	}
	var fd *field
	if zs.hasSloped {
		fd = newRimField(zs, lat)
	}
	f := zs.freeboard
	lowest := math.Inf(1)
	off := geom.EmptyBox()
	visit := func(p geom.Vec2) {
		z, ok := b.g.Elevation(p.X, p.Y)
		if !ok || math.IsNaN(z) {
			off = off.Extend(p)
			return
		}
		lowest = min(lowest, z)
	}
	vertical := func(k int) bool {
		o := fd.own[k]
		return o >= 0 && zs.z[o].kind == kindVertical
	}
	edge := func(k, m int) {
		a, c := fd.e[k]-f, fd.e[m]-f
		if math.IsNaN(a) || math.IsNaN(c) || (a <= 0) == (c <= 0) || math.IsInf(a, 0) || math.IsInf(c, 0) || vertical(k) || vertical(m) {
			return
		}
		t := a / (a - c)
		p := lat.Node(k%lat.NX, k/lat.NX).Lerp(lat.Node(m%lat.NX, m/lat.NX), t)
		visit(p)
	}
	for j := 0; fd != nil && j < lat.NY; j++ {
		for i := 0; i < lat.NX; i++ {
			k := lat.Index(i, j)
			if math.IsNaN(fd.e[k]) {
				continue
			}
			if i+1 < lat.NX {
				edge(k, k+1)
			}
			if j+1 < lat.NY {
				edge(k, k+lat.NX)
			}
		}
	}
	for v := range zs.z {
		z := &zs.z[v]
		if z.kind != kindVertical {
			continue
		}
		n := len(z.floor.pts)
		for k := range z.floor.pts {
			a, c := z.floor.pts[k], z.floor.pts[(k+1)%n]
			steps := max(1, int(math.Ceil(a.Distance(c)/h)))
			for s := range steps {
				p := a.Lerp(c, float64(s)/float64(steps))
				if zs.relEx(p, v, -1) > f {
					visit(p)
				}
			}
		}
	}
	if !off.IsEmpty() {
		return 0, fmt.Errorf("%w: auto water level: the rim line leaves the surveyed surface within x %.2f to %.2f m, y %.2f to %.2f m (local frame); survey farther out or move the pond",
			ErrOffSurvey, off.Min.X, off.Max.X, off.Min.Y, off.Max.Y)
	}
	if math.IsInf(lowest, 1) {
		return 0, fmt.Errorf("%w: auto water level: no rim line found", ErrParams)
	}
	w := lowest - f
	b.autoW = &w
	return w, nil
}

// balanceTol is the water-level tolerance of the balance search, 0.01 mm:
// far below survey accuracy, and cut and fill change by only the water
// area times it.
const balanceTol = 1e-5

// balance finds, on a lattice of cell h, the water level at which
// FillPerCut × cut equals fill. k·cut − fill decreases as W rises (every
// node's finished grade rises with W), so a sign change brackets a single
// root, which Brent's method finds. The first lattice searches from the
// auto level (rim at the lowest existing ground on the rim line, where
// there is no berm) upward to the level that puts the deepest floor at the
// highest ground of the work area (no cut is left there). A finer lattice
// starts from the coarser one's root, which is already close: a Newton
// step with the slope the volumes give (below) and a little more lands
// just past the root, so the bracket is barely wider than the step. The
// bound on the slope then usually proves the far end within the tolerance
// of the root (see closeEnd); otherwise Brent's method closes the bracket
// in two or three more evaluations.
//
// The slope: where the finished grade moves with W it moves one for one,
// so d(cut)/dW = −(cut area) and d(fill)/dW = fill area, except in cells
// touching ground the design leaves alone; −(k·cut area + fill area) is
// then the slope of k·cut − fill or a little steeper, and a step with it
// falls short of the root by a few per cent of the step.
func (b *builder) balance(h float64, prev *level) (*level, error) {
	k := b.p.FillPerCut
	var lv *level
	// seen holds the volumes of the levels evaluated on lv's lattice, so
	// that the root, once found, needs only its finished grade again.
	var seen map[float64]volumes
	var seenOn *level
	eval := func(w float64) (f, slope float64, err error) {
		lv, err = b.evalAt(lv, h, w)
		if err != nil {
			return 0, 0, fmt.Errorf("%w: at water level %.3f m: %w", ErrNoBalance, w, err)
		}
		if seenOn != lv {
			seen, seenOn = map[float64]volumes{}, lv
		}
		seen[w] = lv.v
		return k*lv.v.cut - lv.v.fill, -(k*lv.v.cutArea + lv.v.fillArea), nil
	}
	var lo, hi, flo, fhi float64
	if prev == nil {
		w0, err := b.autoLevel()
		if err != nil {
			return nil, fmt.Errorf("%w: the search starts at the auto level: %w", ErrNoBalance, err)
		}
		if flo, _, err = eval(w0); err != nil {
			return nil, err
		}
		if flo <= 0 {
			if lv.v.cut == 0 {
				return nil, fmt.Errorf("%w: the design digs nothing even with the rim at the lowest ground on its rim line (%.3f m)", ErrNoBalance, w0+b.zs.freeboard)
			}
			return nil, fmt.Errorf("%w: with the rim at the lowest ground on its rim line (%.3f m) the fill, %.3f m³, already exceeds the reused cut, %.3f m³ × %g; the ground inside the pond is too low for a balanced design",
				ErrNoBalance, w0+b.zs.freeboard, lv.v.fill, lv.v.cut, k)
		}
		lo = w0
		top := lv.gmax + b.zs.maxDepth
		step := max(0.05, b.zs.maxDepth/4)
		for {
			hi = min(lo+step, top)
			if fhi, _, err = eval(hi); err != nil {
				return nil, err
			}
			if fhi < 0 {
				break
			}
			if hi >= top {
				return nil, fmt.Errorf("%w: even with the deepest floor at the highest ground (water level %.3f m) the reused cut is not below the fill", ErrNoBalance, hi)
			}
			lo, flo = hi, fhi
			step *= 2
			top = max(top, lv.gmax+b.zs.maxDepth)
		}
	} else {
		var err error
		if lo, hi, flo, fhi, err = b.bracketNear(prev.w, eval); err != nil {
			return nil, err
		}
	}
	w, done := 0.0, false
	if vlo, ok := seen[lo]; ok && prev != nil {
		if vhi, ok := seen[hi]; ok {
			w, done = closeEnd(lo, hi, flo, fhi, k*vlo.cutArea+vhi.fillArea, balanceTol)
		}
	}
	if !done {
		var ferr error
		w = brent(func(w float64) float64 {
			v, _, err := eval(w)
			if err != nil && ferr == nil {
				ferr = err
			}
			return v
		}, lo, hi, flo, fhi, balanceTol)
		if ferr != nil {
			return nil, ferr
		}
	}
	if v, ok := seen[w]; ok && seenOn == lv {
		if lv.w != w {
			lv.fd.grade(w, lv.g, lv.d, b.berm)
			lv.v, lv.w = v, w
		}
	} else if _, _, err := eval(w); err != nil {
		return nil, err
	}
	return lv, nil
}

// closeEnd returns an end of the bracket [lo, hi] of the root of the
// decreasing f = k·cut − fill (f(lo) = flo ≥ 0 ≥ f(hi) = fhi) that lies
// within tol of the root, if the slope bound proves one does; slope is
// k × (cut area at lo) + (fill area at hi).
//
// The bound: raising W raises the finished grade at every node, so the
// cut region only shrinks and the fill region only grows between lo and
// hi, and each integral changes at most by its region's area per metre
// of W (see balance). |f′| ≤ S = k·cut area(lo) + fill area(hi) on the
// bracket, so the root r satisfies lo + flo/S ≤ r ≤ hi + fhi/S (S is
// taken a millionth larger for the round-off of the area sums). An end
// closer than tol to the far side of that interval is within tol of r.
func closeEnd(lo, hi, flo, fhi, slope, tol float64) (float64, bool) {
	s := slope * (1 + 1e-6)
	if !(s > 0) {
		return 0, false
	}
	rLo, rHi := lo+flo/s, hi+fhi/s
	switch {
	case flo == 0:
		return lo, true
	case fhi == 0:
		return hi, true
	case hi-rLo <= tol:
		return hi, true
	case rHi-lo <= tol:
		return lo, true
	}
	return 0, false
}

// bracketNear returns levels lo < hi with f(lo) ≥ 0 ≥ f(hi) near w0, the
// root found on a coarser lattice, for a decreasing f that also returns
// an estimate of its slope (see [builder.balance]). It takes a Newton
// step from w0, lengthened so that it crosses the root (the slope
// overstates), and doubles the step while the sign stays.
func (b *builder) bracketNear(w0 float64, f func(float64) (float64, float64, error)) (lo, hi, flo, fhi float64, err error) {
	f0, s0, err := f(w0)
	if err != nil {
		return 0, 0, 0, 0, err
	}
	if f0 == 0 {
		return w0, w0, 0, 0, nil
	}
	dir := 1.0 // towards the root: f decreases, so up where f > 0
	if f0 < 0 {
		dir = -1
	}
	step := balanceTol
	if s0 < 0 {
		// The slope is a few per cent steep (see balance), so the Newton
		// step is lengthened by 5 % and by a twentieth of the tolerance,
		// so that it lands just past the root, close to it.
		step = max(step, 1.05*math.Abs(f0/s0)+balanceTol/20)
	}
	for {
		w1 := w0 + dir*step
		f1, _, err := f(w1)
		if err != nil {
			return 0, 0, 0, 0, err
		}
		if (f1 > 0) != (f0 > 0) || f1 == 0 {
			if dir > 0 {
				return w0, w1, f0, f1, nil
			}
			return w1, w0, f1, f0, nil
		}
		if step > 100 {
			return 0, 0, 0, 0, fmt.Errorf("%w: lost the bracket near %.3f m", ErrNoBalance, w0)
		}
		w0, f0 = w1, f1
		step *= 2
	}
}

// brent returns a zero of f in [a, b], where f(a) = fa and f(b) = fb have
// opposite signs, to within tol, by Brent's method (R. P. Brent,
// Algorithms for Minimization without Derivatives, 1973, ch. 4, procedure
// zero): inverse quadratic or secant steps, falling back to bisection.
func brent(f func(float64) float64, a, b, fa, fb, tol float64) float64 {
	if fa == 0 {
		return a
	}
	if fb == 0 {
		return b
	}
	c, fc := a, fa
	d := b - a
	e := d
	for range 200 {
		if (fb > 0) == (fc > 0) {
			c, fc = a, fa
			d = b - a
			e = d
		}
		if math.Abs(fc) < math.Abs(fb) {
			a, b, c = b, c, b
			fa, fb, fc = fb, fc, fb
		}
		t := 2*0x1p-52*math.Abs(b) + tol/2
		m := (c - b) / 2
		if math.Abs(m) <= t || fb == 0 {
			return b
		}
		if math.Abs(e) >= t && math.Abs(fa) > math.Abs(fb) {
			s := fb / fa
			var p, q float64
			if a == c {
				p, q = 2*m*s, 1-s
			} else {
				q0, r := fa/fc, fb/fc
				p = s * (2*m*q0*(q0-r) - (b-a)*(r-1))
				q = (q0 - 1) * (r - 1) * (s - 1)
			}
			if p > 0 {
				q = -q
			} else {
				p = -p
			}
			if 2*p < 3*m*q-math.Abs(t*q) && p < math.Abs(e*q/2) {
				e, d = d, p/q
			} else {
				d, e = m, m
			}
		} else {
			d, e = m, m
		}
		a, fa = b, fb
		if math.Abs(d) > t {
			b += d
		} else if m > 0 {
			b += t
		} else {
			b -= t
		}
		fb = f(b)
	}
	return b
}
