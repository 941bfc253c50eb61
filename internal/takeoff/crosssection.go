package takeoff

import (
	"cmp"
	"math"
	"slices"

	"github.com/dugout-estimating/dugout/internal/geom"
)

// A profiler measures cross-sections of the lined bowl. develop returns the
// developed (3-D) length of the liner along the line p(t) = o + t·u (u a unit
// vector), t in [t0, t1]: the length of the curve z = min(E(p(t)), rim) from
// the point where the line first enters the lined area (E < rim) to where it
// last leaves it. Ground crossed between two lobes is at the rim, so it
// counts its plan length. A line that misses the lined area has length 0.
type profiler interface {
	develop(o, u geom.Vec2, t0, t1 float64) float64
}

// rasterProfile samples a capped raster at a fixed step. Its crossings with
// the rim are resolved to one step, which is enough to rank sheet angles.
type rasterProfile struct {
	r    *raster
	step float64
}

func (p *rasterProfile) develop(o, u geom.Vec2, t0, t1 float64) float64 {
	r := p.r
	n := max(1, int(math.Ceil((t1-t0)/p.step)))
	dt := (t1 - t0) / float64(n)
	// Walk the line in grid units. Samples outside [lo, hi] are on the
	// flat capped ground (depth exactly 0), where nothing starts and
	// nothing is added to the best length, so the walk covers lo − 1 to
	// hi + 1 only.
	s := o.Add(u.Scale(t0))
	fx0, fy0 := (s.X-r.x0)/r.h, (s.Y-r.y0)/r.h
	dfx, dfy := u.X*dt/r.h, u.Y*dt/r.h
	lo, hi := r.activeSteps(fx0, fy0, dfx, dfy, n)
	if lo > hi {
		return 0
	}
	i0, i1 := max(lo-1, 0), min(hi+1, n)
	dt2 := dt * dt
	prev := r.depthGrid(fx0+float64(i0)*dfx, fy0+float64(i0)*dfy)
	started := prev < 0
	total, best := 0.0, 0.0
	// The loop body is depthGrid written out, the hottest code of the
	// sheet search.
	nx, ny := r.nx, r.ny
	if nx < 2 || ny < 2 {
		return 0
	}
	xmax, ymax := float64(nx-1), float64(ny-1)
	dd := r.d
	// Samples in [g0, g1] lie on the grid, the others off it (depth 0):
	// the test is monotone along the line, so its ends are found by
	// stepping from an estimate with the test itself.
	in := func(i int) bool {
		fx, fy := fx0+float64(i)*dfx, fy0+float64(i)*dfy
		return fx >= 0 && fy >= 0 && fx <= xmax && fy <= ymax
	}
	g0, g1 := i0+1, i1
	for g0 <= g1 && !in(g0) {
		g0++
	}
	for g1 >= g0 && !in(g1) {
		g1--
	}
	for i := i0 + 1; i <= i1; i++ {
		fx, fy := fx0+float64(i)*dfx, fy0+float64(i)*dfy
		d := 0.0
		if i >= g0 && i <= g1 {
			ci, cj := min(int(fx), nx-2), min(int(fy), ny-2)
			u, v := fx-float64(ci), fy-float64(cj)
			k := cj*nx + ci
			q := dd[k : k+nx+2 : k+nx+2]
			d = (1-v)*((1-u)*q[0]+u*q[1]) + v*((1-u)*q[nx]+u*q[nx+1])
		}
		if !started && d < 0 {
			started = true
		}
		if started {
			dz := d - prev
			total += math.Sqrt(dt2 + dz*dz)
			if d < 0 || prev < 0 {
				best = total
			}
		}
		prev = d
	}
	return best
}

// breakRing is a zone outline whose edges are breakpoints of the analytic
// cross-sections: a kink where a sloped wall meets its floor, a jump where a
// vertical wall stands.
type breakRing struct {
	ring     geom.Ring
	vertical bool
}

// Tolerances of the analytic cross-sections.
const (
	// wallProbeM is how far either side of a vertical wall the bowl is
	// sampled. The wall then counts as a chord of plan width 2·wallProbeM, so
	// each wall crossing shortens the length by at most 2·wallProbeM = 2e-7 m
	// (and the sloped ground beside it moves by wallProbeM/s), far inside
	// the 1 mm the sheet is promised to.
	wallProbeM = 1e-7
	// rootTolM ends the search for a rim crossing along a line: 0.1 nm.
	rootTolM = 1e-10
	// rootZTolM accepts a rim crossing when the bowl is within 0.1 nm of the
	// rim (a straight wall is found in one secant step to round-off).
	rootZTolM = 1e-10
	// flatTolM is how far the bowl may stray from the chord at an
	// interval's midpoint before the interval is split. A deviation δ over
	// an interval Δt shortens the developed length by about 8δ²/(3Δt):
	// 1.3e-5 m for δ = 0.5 mm over 5 cm, so a section bending all along is
	// short by a fraction of a millimetre.
	flatTolM = 5e-4
	// maxSplit bounds the splitting of one interval: 2⁻¹² of a coarse step.
	maxSplit = 12
)

// analyticProfile evaluates the analytic bowl along the line at a coarse
// step plus every crossing of a zone edge, and splits an interval in two
// while the bowl at its midpoint strays from the chord by more than
// flatTolM. Between breakpoints the bowl of a polygonal zone is linear in t
// along any straight line wherever the nearest feature is an edge (and
// smooth near a corner), so most intervals need no split. Rim crossings are
// found by the Illinois variant of regula falsi (Dowell & Jarratt, BIT 11,
// 1971) and kept as points of the profile. A dip narrower than the coarse
// step that no zone edge crosses (a line grazing a wall's outer edge) can
// be missed; the coarse step is kept below half the narrowest wall band.
// It keeps scratch buffers, so one value serves one goroutine (see clone).
type analyticProfile struct {
	bowl  Bowl
	rim   float64
	rings []breakRing
	step  float64
	ts    []float64
	zs    []float64
	bps   []float64
	pts   []sample
	o, u  geom.Vec2
}

// clone returns a profile on the same bowl with its own scratch buffers.
func (p *analyticProfile) clone() *analyticProfile {
	return &analyticProfile{bowl: p.bowl, rim: p.rim, rings: p.rings, step: p.step}
}

// sample is a point of a profile: the parameter along the line, the bowl
// there, and whether it is an exact rim crossing.
type sample struct {
	t, z float64
	rim  bool
}

func (s sample) inside(rim float64) bool { return s.z < rim || s.rim }

func (p *analyticProfile) at(t float64) float64 { return p.bowl.BowlAt(p.o.Add(p.u.Scale(t))) }

func (p *analyticProfile) develop(o, u geom.Vec2, t0, t1 float64) float64 {
	p.o, p.u = o, u
	p.bps = p.bps[:0]
	for _, br := range p.rings {
		r := br.ring
		for i := range r {
			a, b := r[i], r[(i+1)%len(r)]
			d := b.Sub(a)
			den := u.Cross(d)
			if den == 0 {
				continue
			}
			w := a.Sub(o)
			s := w.Cross(u) / den
			if s < 0 || s > 1 {
				continue
			}
			t := w.Cross(d) / den
			if t < t0 || t > t1 {
				continue
			}
			if br.vertical {
				p.bps = append(p.bps, t-wallProbeM, t+wallProbeM)
			} else {
				p.bps = append(p.bps, t)
			}
		}
	}
	slices.Sort(p.bps)
	n := max(1, int(math.Ceil((t1-t0)/p.step)))
	p.ts = p.ts[:0]
	k := 0
	for i := 0; i <= n; i++ {
		t := t0 + (t1-t0)*float64(i)/float64(n)
		for k < len(p.bps) && p.bps[k] < t {
			p.ts = append(p.ts, p.bps[k])
			k++
		}
		p.ts = append(p.ts, t)
	}
	p.ts = append(p.ts, p.bps[k:]...)

	// Evaluate the coarse points, then refine the intervals where the
	// profile bends: an interval is split only when the coarse point at
	// either end strays from the chord of its own neighbours (a kink or a
	// curve nearby) or when it straddles the rim. A kink strictly inside an
	// interval shows at both its ends.
	p.zs = p.zs[:0]
	for _, t := range p.ts {
		p.zs = append(p.zs, p.at(t))
	}
	bends := func(i int) bool {
		if i <= 0 || i+1 >= len(p.ts) {
			return true
		}
		ta, tb, tc := p.ts[i-1], p.ts[i], p.ts[i+1]
		if tc-ta <= 0 {
			return true
		}
		za, zb, zc := min(p.zs[i-1], p.rim), min(p.zs[i], p.rim), min(p.zs[i+1], p.rim)
		return math.Abs(zb-(za+(zc-za)*(tb-ta)/(tc-ta))) > flatTolM
	}
	p.pts = p.pts[:0]
	prev := sample{t: p.ts[0], z: p.zs[0]}
	p.pts = append(p.pts, prev)
	bPrev := bends(0)
	for i := 1; i < len(p.ts); i++ {
		cur := sample{t: p.ts[i], z: p.zs[i]}
		bCur := bends(i)
		if bPrev || bCur || prev.inside(p.rim) != cur.inside(p.rim) {
			p.refine(prev, cur, 0)
		}
		p.pts = append(p.pts, cur)
		prev, bPrev = cur, bCur
	}

	first, last := -1, -1
	for i, s := range p.pts {
		if s.inside(p.rim) {
			if first < 0 {
				first = i
			}
			last = i
		}
	}
	if first < 0 {
		return 0
	}
	// A profile that enters down a vertical wall starts at the outer probe.
	if first > 0 && !p.pts[first].rim {
		first--
	}
	if last+1 < len(p.pts) && !p.pts[last].rim {
		last++
	}
	var sum geom.Sum
	for i := first + 1; i <= last; i++ {
		a, b := p.pts[i-1], p.pts[i]
		sum.Add(math.Hypot(b.t-a.t, min(b.z, p.rim)-min(a.z, p.rim)))
	}
	return sum.Value()
}

// refine appends to p.pts the points needed between a and b (not a and b
// themselves): a rim crossing where one is inside and the other outside,
// and midpoints where the bowl is not straight enough.
func (p *analyticProfile) refine(a, b sample, depth int) {
	if b.t-a.t <= 3*wallProbeM {
		return // the two probes of a vertical wall
	}
	ain, bin := a.inside(p.rim), b.inside(p.rim)
	if ain != bin && !a.rim && !b.rim {
		c := sample{t: p.crossing(a, b), z: p.rim, rim: true}
		p.refine(a, c, depth)
		p.pts = append(p.pts, c)
		p.refine(c, b, depth)
		return
	}
	if !ain && !bin || depth >= maxSplit {
		return
	}
	m := sample{t: (a.t + b.t) / 2}
	m.z = p.at(m.t)
	za, zb := min(a.z, p.rim), min(b.z, p.rim)
	if m.z < p.rim && math.Abs(m.z-(za+zb)/2) <= flatTolM {
		return
	}
	p.refine(a, m, depth+1)
	p.pts = append(p.pts, m)
	p.refine(m, b, depth+1)
}

// crossing returns the parameter where the bowl crosses the rim between a
// and b (one inside, one outside).
func (p *analyticProfile) crossing(a, b sample) float64 {
	lo, hi := a.t, b.t
	flo, fhi := a.z-p.rim, b.z-p.rim
	side := 0
	c := (lo + hi) / 2
	for range 100 {
		if hi-lo <= rootTolM {
			break
		}
		c = (lo + hi) / 2
		if isFinite(flo) && isFinite(fhi) && fhi != flo {
			if x := (lo*fhi - hi*flo) / (fhi - flo); x > lo && x < hi {
				c = x
			}
		}
		fc := p.at(c) - p.rim
		if math.Abs(fc) <= rootZTolM || math.IsNaN(fc) {
			return c
		}
		if (fc < 0) == (flo < 0) {
			lo, flo = c, fc
			if side == -1 {
				fhi /= 2
			}
			side = -1
		} else {
			hi, fhi = c, fc
			if side == 1 {
				flo /= 2
			}
			side = 1
		}
	}
	return c
}

func isFinite(f float64) bool { return !math.IsNaN(f) && !math.IsInf(f, 0) }

// DevelopedLength returns the developed (3-D) length of the liner along the
// straight cross-section from a to b over the analytic bowl b capped at rim:
// from where the line first enters the lined area (bowl < rim) to where it
// last leaves it, flat ground between two lobes counted at its plan length.
// Zone rings are breakpoints: kinks for sloped walls, jumps for vertical
// walls (vertical[i] true), whose full height is counted. step is the
// sampling step along the line (m); it must be > 0. The segment must reach
// beyond the lined area at both ends for the result to include both rim
// crossings.
func DevelopedLength(b Bowl, rim float64, rings []geom.Ring, vertical []bool, p0, p1 geom.Vec2, step float64) (float64, error) {
	if b == nil {
		return 0, inputError("analytic bowl", 0, "given")
	}
	if !(step > 0) {
		return 0, optionError("section step", step, "> 0 m")
	}
	d := p1.Sub(p0)
	l := d.Norm()
	if l == 0 {
		return 0, nil
	}
	pr := &analyticProfile{bowl: b, rim: rim, step: step}
	for i, r := range rings {
		pr.rings = append(pr.rings, breakRing{ring: r, vertical: i < len(vertical) && vertical[i]})
	}
	return pr.develop(p0, d.Scale(1/l), 0, l), nil
}

// longestSection returns the longest developed length among cross-sections
// parallel to direction theta (radians): n lines evenly spaced across the
// hull's width (at the centres of n equal strips, so none runs along the
// hull's edge), then, when refine is set, a golden-section search for a
// longer line within one spacing of the best one. margin extends every line
// beyond the hull at both ends.
func longestSection(p profiler, hull []geom.Vec2, theta float64, n int, refine bool, margin float64) float64 {
	u := geom.Vec2{X: math.Cos(theta), Y: math.Sin(theta)}
	nv := geom.Vec2{X: -u.Y, Y: u.X}
	a0, a1 := extent(hull, u)
	b0, b1 := extent(hull, nv)
	t0, t1 := a0-margin, a1+margin
	w := b1 - b0
	f := func(b float64) float64 { return p.develop(nv.Scale(b), u, t0, t1) }
	if !(w > 0) {
		return f(b0)
	}
	sp := w / float64(n)
	best, bestB := -1.0, b0
	for k := range n {
		b := b0 + (float64(k)+0.5)*sp
		if l := f(b); l > best {
			best, bestB = l, b
		}
	}
	if !refine {
		return best
	}
	lo, hi := max(b0, bestB-sp), min(b1, bestB+sp)
	x1, x2 := hi-invPhi*(hi-lo), lo+invPhi*(hi-lo)
	f1, f2 := f(x1), f(x2)
	best = max(best, max(f1, f2))
	for range 14 {
		if f1 >= f2 {
			hi, x2, f2 = x2, x1, f1
			x1 = hi - invPhi*(hi-lo)
			f1 = f(x1)
			best = max(best, f1)
		} else {
			lo, x1, f1 = x1, x2, f2
			x2 = lo + invPhi*(hi-lo)
			f2 = f(x2)
			best = max(best, f2)
		}
	}
	return best
}

// longestGuided is [longestSection] for an expensive profiler: a cheap
// guide ranks the n lines, and they are measured by p in the guide's order,
// longest first, until the guide's length of the next line falls below the
// best measured length less slack. slack must bound how much the guide can
// understate a line; overstating only costs time. The best line's offset
// is then refined by successive parabolic interpolation through it and its
// neighbours (Brent, Algorithms for Minimization without Derivatives, 1973,
// ch. 5), which finds the top of a smooth maximum in a few measurements
// and leaves a flat one (a rectangle's floor) alone.
func longestGuided(p, guide profiler, hull []geom.Vec2, theta float64, n int, slack, margin float64) float64 {
	u := geom.Vec2{X: math.Cos(theta), Y: math.Sin(theta)}
	nv := geom.Vec2{X: -u.Y, Y: u.X}
	a0, a1 := extent(hull, u)
	b0, b1 := extent(hull, nv)
	t0, t1 := a0-margin, a1+margin
	w := b1 - b0
	f := func(b float64) float64 { return p.develop(nv.Scale(b), u, t0, t1) }
	if !(w > 0) {
		return f(b0)
	}
	sp := w / float64(n)
	type line struct {
		b, g float64
		k    int
	}
	lines := make([]line, n)
	for k := range lines {
		b := b0 + (float64(k)+0.5)*sp
		lines[k] = line{b, guide.develop(nv.Scale(b), u, t0, t1), k}
	}
	slices.SortStableFunc(lines, func(x, y line) int { return cmp.Compare(y.g, x.g) })
	measured := make(map[int]float64)
	best, bestK := -1.0, 0
	for _, l := range lines {
		if best >= 0 && l.g < best-slack {
			break
		}
		v := f(l.b)
		measured[l.k] = v
		if v > best || (v == best && l.k < bestK) {
			best, bestK = v, l.k
		}
	}
	at := func(k int) float64 {
		if v, ok := measured[k]; ok {
			return v
		}
		v := f(b0 + (float64(k)+0.5)*sp)
		measured[k] = v
		return v
	}
	if bestK == 0 || bestK == n-1 {
		return best
	}
	// Parabolic steps through (x−h, x, x+h), narrowing h each time.
	x, fx := b0+(float64(bestK)+0.5)*sp, best
	fl, fr := at(bestK-1), at(bestK+1)
	h := sp
	for range 3 {
		den := fl - 2*fx + fr
		if !(den < 0) { // not strictly concave: flat or a kink
			break
		}
		dx := h * (fl - fr) / (2 * den)
		if math.Abs(dx) >= h || math.Abs(dx) < 1e-3*h {
			break
		}
		nx := x + dx
		fn := f(nx)
		if fn <= fx {
			break
		}
		best = fn
		x, fx = nx, fn
		h = math.Abs(dx)
		fl, fr = f(x-h), f(x+h)
		best = max(best, max(fl, fr))
	}
	return best
}

// invPhi is 1/φ, the golden-section ratio.
var invPhi = (math.Sqrt(5) - 1) / 2
