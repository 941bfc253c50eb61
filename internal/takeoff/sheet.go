package takeoff

import (
	"cmp"
	"math"
	"runtime"
	"slices"
	"sync"
	"sync/atomic"

	"github.com/dugout-estimating/dugout/internal/geom"
)

// sheetSearch finds the rectangular sheet of least area that covers the
// lined bowl. For a sheet laid at angle θ, its extent along θ is the longest
// developed cross-section parallel to θ and its extent across is the same at
// θ + 90°; each gets the overlap at both ends.
//
// The search runs in three stages, each on a more exact profiler:
//  1. a coarse scan of θ every coarseStepDeg over [0°, 180°) on the raster,
//     giving the sheet area for θ in [0°, 90°) (θ and θ + 90° are the same
//     sheet turned);
//  2. golden-section refinement of the best local minima on the raster, with
//     more lines and the line offset refined;
//  3. the extra candidates (the rim's minimum-area rectangle, unless the
//     raster rules it out on a pond whose walls it resolves), and the best
//     refined angle (the second best
//     too when its raster area is within secondRel of it, and neither when
//     within sameAngleDeg of a candidate already listed) measured on the
//     exact profiler (the analytic bowl when there is one); the least area
//     wins, ties to the earlier candidate.
type sheetSearch struct {
	coarse, fine, exact profiler
	hull                []geom.Vec2 // convex hull of the lined area
	margin              float64     // line extension beyond the hull (m)
	overlap             float64     // added at each end of both sides (m)
	coarseLines         int
	fineLines           int
	exactLines          int
	// guided makes the exact stage measure only the lines the fine raster
	// ranks within slack (m) of its longest (see longestGuided).
	guided bool
	slack  float64
	// steadyRaster reports that the raster resolves every wall (none is
	// steeper than two lattice cells of run), so it may rule angles out.
	steadyRaster bool

	// scan holds the coarse scan's longest lengths, θ every coarseStepDeg
	// over [0°, 180°), once run has been called; cheapestStock reads it.
	scan []float64
	// hopeTol is how much the coarse raster may overstate a sheet's side
	// (m): a coarse step (two raster cells) and a cell of smeared wall at
	// each end.
	hopeTol float64
	// fineStep is the fine raster's sampling step (m).
	fineStep float64
	// coarseCache holds the coarse raster's lengths by angle (degrees) off
	// the scan's grid, fineCache the fine raster's at every angle measured.
	coarseCache, fineCache map[float64]lengths
}

const (
	// coarseStepDeg is the angle step of the first scan: a sheet's area
	// varies smoothly with θ between the hull's edge directions, and local
	// minima closer than this merge into one valley that refinement follows.
	coarseStepDeg = 2.0
	// refineTolDeg ends the golden-section search on the angle: the area is
	// flat (second order) at a minimum, and the raster ranks angles to
	// about this anyway.
	refineTolDeg = 0.05
	// refineCandidates is how many local minima of the coarse scan are
	// refined: the best, and the second when its coarse area is within
	// secondRel of the best.
	refineCandidates = 2
	// sameAngleDeg: a refined angle this close to a candidate already
	// listed (the rim rectangle's) is not measured again; the sheet's area
	// is flat at its minimum, so the two would differ by a fraction of the
	// raster's own error.
	sameAngleDeg = 0.5
	// secondRel: another angle is measured exactly when its raster sheet
	// area is within 0.5 % of the best. On walls the lattice resolves, the
	// raster overstates every section by about the same (a raster step at
	// each end, under 0.1 % of a 5 m section at 2.5 cm steps), so its
	// ranking of angles is good to a fraction of that.
	secondRel = 0.005
)

// sheetFit is the measured sheet: developed lengths along and across the
// angle (without overlap), the angle in degrees.
type sheetFit struct {
	along, across, angleDeg float64
}

// sheet returns the fit as a sheet with 2 × overlap on each side: its
// length (the longer side), width, and the length's direction in degrees in
// [0, 180).
func (f sheetFit) sheet(overlap float64) (lengthM, widthM, angleDeg float64) {
	along, across, ang := f.along, f.across, normAngle(f.angleDeg)
	if across > along {
		along, across = across, along
		ang = normAngle(ang + 90)
	}
	return along + 2*overlap, across + 2*overlap, ang
}

// area measures the sheet at deg on p, the two directions on two
// goroutines when p is a raster profile (which keeps no scratch state) and
// there are two processors.
func (s *sheetSearch) area(p profiler, lines int, refine bool, deg float64) (float64, float64, float64) {
	th := deg * math.Pi / 180
	var a, c float64
	if _, ok := p.(*rasterProfile); ok && runtime.GOMAXPROCS(0) >= 2 {
		var wg sync.WaitGroup
		wg.Go(func() { a = longestSection(p, s.hull, th, lines, refine, s.margin) })
		c = longestSection(p, s.hull, th+math.Pi/2, lines, refine, s.margin)
		wg.Wait()
	} else {
		a = longestSection(p, s.hull, th, lines, refine, s.margin)
		c = longestSection(p, s.hull, th+math.Pi/2, lines, refine, s.margin)
	}
	return (a + 2*s.overlap) * (c + 2*s.overlap), a, c
}

// exactArea measures the sheet at deg on the exact profiler. With an
// analytic profiler the two directions are measured at once on two
// goroutines, each with its own scratch buffers; the results do not depend
// on the scheduling.
func (s *sheetSearch) exactArea(deg float64) (float64, float64, float64) {
	if !s.guided {
		return s.area(s.exact, s.exactLines, true, deg)
	}
	th := deg * math.Pi / 180
	ap, ok := s.exact.(*analyticProfile)
	if !ok || runtime.GOMAXPROCS(0) < 2 {
		a := longestGuided(s.exact, s.fine, s.hull, th, s.exactLines, s.slack, s.margin)
		c := longestGuided(s.exact, s.fine, s.hull, th+math.Pi/2, s.exactLines, s.slack, s.margin)
		return (a + 2*s.overlap) * (c + 2*s.overlap), a, c
	}
	var a, c float64
	var wg sync.WaitGroup
	wg.Go(func() { a = longestGuided(ap.clone(), s.fine, s.hull, th, s.exactLines, s.slack, s.margin) })
	c = longestGuided(ap, s.fine, s.hull, th+math.Pi/2, s.exactLines, s.slack, s.margin)
	wg.Wait()
	return (a + 2*s.overlap) * (c + 2*s.overlap), a, c
}

func (s *sheetSearch) run(extra []float64) sheetFit {
	// 1. Coarse scan, the angles shared among the processors (each result
	// lands in its own slot, so the order of work does not matter).
	nc := int(math.Round(180 / coarseStepDeg))
	f := make([]float64, nc)
	var next atomic.Int64
	var wg sync.WaitGroup
	for range min(runtime.GOMAXPROCS(0), nc) {
		wg.Go(func() {
			for j := int(next.Add(1) - 1); j < nc; j = int(next.Add(1) - 1) {
				f[j] = longestSection(s.coarse, s.hull, float64(j)*coarseStepDeg*math.Pi/180, s.coarseLines, false, s.margin)
			}
		})
	}
	wg.Wait()
	s.scan = f
	half := nc / 2
	area := make([]float64, half)
	for j := range half {
		area[j] = (f[j] + 2*s.overlap) * (f[j+half] + 2*s.overlap)
	}
	// Local minima of the circular sequence (period 90°), best first.
	var minima []int
	for j := range half {
		l, r := area[(j+half-1)%half], area[(j+1)%half]
		if area[j] <= l && area[j] <= r {
			minima = append(minima, j)
		}
	}
	sortByArea(minima, area)
	if len(minima) > refineCandidates {
		minima = minima[:refineCandidates]
	}
	if len(minima) == 2 && area[minima[1]] > area[minima[0]]*(1+secondRel) {
		minima = minima[:1]
	}
	// 2. Refine on the raster.
	type cand struct{ deg, area float64 }
	var refined []cand
	for _, j := range minima {
		lo := float64(j)*coarseStepDeg - coarseStepDeg
		hi := float64(j)*coarseStepDeg + coarseStepDeg
		g := func(d float64) float64 {
			a, _, _ := s.area(s.fine, s.fineLines, true, d)
			return a
		}
		x1, x2 := hi-invPhi*(hi-lo), lo+invPhi*(hi-lo)
		f1, f2 := g(x1), g(x2)
		for hi-lo > refineTolDeg {
			if f1 <= f2 {
				hi, x2, f2 = x2, x1, f1
				x1 = hi - invPhi*(hi-lo)
				f1 = g(x1)
			} else {
				lo, x1, f1 = x1, x2, f2
				x2 = lo + invPhi*(hi-lo)
				f2 = g(x2)
			}
		}
		if f1 <= f2 {
			refined = append(refined, cand{x1, f1})
		} else {
			refined = append(refined, cand{x2, f2})
		}
	}
	slices.SortStableFunc(refined, func(a, b cand) int { return cmp.Compare(a.area, b.area) })
	// Extra candidates are measured unless the raster rules them out, which
	// it may only where it resolves every wall (steadyRaster): where a wall
	// is steeper than the lattice resolves, the raster ranks angles poorly.
	var cands []float64
	for _, d := range extra {
		if s.steadyRaster && len(refined) > 0 {
			if a, _, _ := s.area(s.fine, s.fineLines, true, d); a > refined[0].area*(1+secondRel) {
				continue
			}
		}
		cands = append(cands, d)
	}
	for i, c := range refined {
		if i > 0 && c.area > refined[0].area*(1+secondRel) {
			continue
		}
		near := false
		for _, d := range cands {
			if da := math.Abs(normAngle(d) - normAngle(c.deg)); min(da, 180-da) < sameAngleDeg {
				near = true
			}
		}
		if !near {
			cands = append(cands, c.deg)
		}
	}
	// 3. Measure the candidates exactly.
	best := sheetFit{}
	bestArea := math.Inf(1)
	for _, d := range cands {
		d = normAngle(d)
		a, along, across := s.exactArea(d)
		if a < bestArea*(1-tieRel) {
			bestArea = a
			best = sheetFit{along: along, across: across, angleDeg: d}
		}
	}
	return best
}

// tieRel is the relative difference in sheet area below which two
// candidate angles count as equal and the earlier one (the rim rectangle's
// direction) is kept: 1e-9, far below the 1 mm in 30 m (3e-5) that matters
// on site and far above round-off.
const tieRel = 1e-9

func sortByArea(idx []int, area []float64) {
	for i := 1; i < len(idx); i++ {
		for j := i; j > 0 && area[idx[j]] < area[idx[j-1]]; j-- {
			idx[j], idx[j-1] = idx[j-1], idx[j]
		}
	}
}
