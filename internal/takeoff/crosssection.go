package takeoff

import (
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
	cap := p.r.cap
	n := max(1, int(math.Ceil((t1-t0)/p.step)))
	dt := (t1 - t0) / float64(n)
	prevZ := p.r.at(o.Add(u.Scale(t0)))
	started := prevZ < cap
	total, best := 0.0, 0.0
	for i := 1; i <= n; i++ {
		t := t0 + float64(i)*dt
		z := p.r.at(o.Add(u.Scale(t)))
		if !started && z < cap {
			started = true
		}
		if started {
			total += math.Hypot(dt, z-prevZ)
			if z < cap || prevZ < cap {
				best = total
			}
		}
		prevZ = z
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
)

// analyticProfile evaluates the analytic bowl along the line at a regular
// step plus every crossing of a zone edge. Between breakpoints the bowl of a
// polygonal zone is linear in t along any straight line wherever the nearest
// feature is an edge (and smooth near a corner), so chords are exact there;
// rim crossings are found by the Illinois variant of regula falsi (Dowell &
// Jarratt, BIT 11, 1971). It keeps scratch buffers, so one value serves one
// goroutine.
type analyticProfile struct {
	bowl  Bowl
	rim   float64
	rings []breakRing
	step  float64
	ts    []float64
	bps   []float64
	zs    []float64
}

func (p *analyticProfile) develop(o, u geom.Vec2, t0, t1 float64) float64 {
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
	p.zs = p.zs[:0]
	first, last := -1, -1
	for i, t := range p.ts {
		z := p.bowl.BowlAt(o.Add(u.Scale(t)))
		p.zs = append(p.zs, z)
		if z < p.rim {
			if first < 0 {
				first = i
			}
			last = i
		}
	}
	if first < 0 {
		return 0
	}
	var s geom.Sum
	var pt, pz float64 // previous point of the developed profile
	add := func(t, z float64) {
		s.Add(math.Hypot(t-pt, z-pz))
		pt, pz = t, z
	}
	if first > 0 {
		pt, pz = p.crossing(o, u, first-1, first), p.rim
	} else {
		pt, pz = p.ts[first], p.zs[first]
	}
	for i := first; i <= last; i++ {
		if i > first && (p.zs[i] < p.rim) != (p.zs[i-1] < p.rim) {
			add(p.crossing(o, u, i-1, i), p.rim)
		}
		add(p.ts[i], math.Min(p.zs[i], p.rim))
	}
	if last+1 < len(p.ts) {
		add(p.crossing(o, u, last, last+1), p.rim)
	}
	return s.Value()
}

// crossing returns the parameter where the bowl crosses the rim between
// samples i and j (one inside, one outside). Two samples closer than a wall
// probe pair straddle a vertical wall: the crossing is the wall itself.
func (p *analyticProfile) crossing(o, u geom.Vec2, i, j int) float64 {
	a, b := p.ts[i], p.ts[j]
	if b-a <= 3*wallProbeM {
		return (a + b) / 2
	}
	fa, fb := p.zs[i]-p.rim, p.zs[j]-p.rim
	side := 0
	c := (a + b) / 2
	for range 100 {
		if b-a <= rootTolM {
			break
		}
		c = (a + b) / 2
		if isFinite(fa) && isFinite(fb) && fb != fa {
			if x := (a*fb - b*fa) / (fb - fa); x > a && x < b {
				c = x
			}
		}
		fc := p.bowl.BowlAt(o.Add(u.Scale(c))) - p.rim
		if math.Abs(fc) <= rootZTolM || math.IsNaN(fc) {
			return c
		}
		if (fc < 0) == (fa < 0) {
			a, fa = c, fc
			if side == -1 {
				fb /= 2
			}
			side = -1
		} else {
			b, fb = c, fc
			if side == 1 {
				fa /= 2
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
	lo, hi := math.Max(b0, bestB-sp), math.Min(b1, bestB+sp)
	x1, x2 := hi-invPhi*(hi-lo), lo+invPhi*(hi-lo)
	f1, f2 := f(x1), f(x2)
	best = math.Max(best, math.Max(f1, f2))
	for range 14 {
		if f1 >= f2 {
			hi, x2, f2 = x2, x1, f1
			x1 = hi - invPhi*(hi-lo)
			f1 = f(x1)
			best = math.Max(best, f1)
		} else {
			lo, x1, f1 = x1, x2, f2
			x2 = lo + invPhi*(hi-lo)
			f2 = f(x2)
			best = math.Max(best, f2)
		}
	}
	return best
}

// invPhi is 1/φ, the golden-section ratio.
var invPhi = (math.Sqrt(5) - 1) / 2
