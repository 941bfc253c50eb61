package takeoff

import (
	"cmp"
	"math"
	"slices"
)

// stockChooser returns the stock order for a sheet whose developed lengths
// along and across are given without the overlap (ChooseStock for the
// sheet with 2 × overlap added to each side), and false when no layout
// covers it.
type stockChooser func(along, across float64) (StockOrder, bool)

// stockCost returns the stock area bought for a sheet as for
// stockChooser, +Inf when no layout covers it.
type stockCost func(along, across float64) float64

// Tolerances and limits of the stock search.
const (
	// stockSplitDeg: a scan interval that may hold a cheaper stock although
	// neither end does is halved down to this width, so that a window of
	// cheaper stock half a degree wide is still seen.
	stockSplitDeg = 0.5
	// maxStockExact bounds the exact sheet measurements the stock search
	// may make in all; the search for the least sheet makes one to three.
	maxStockExact = 8
	// stockTolDeg ends the raster's golden section and bisection on the
	// angle in a window: the sheet's area changes by about 0.1 % a degree
	// near a boundary of the stock (0.3 % on the elliptical test pool), so
	// a quarter degree is within stockGainRel, and the exact stage refines
	// a boundary it brackets to refineTolDeg.
	stockTolDeg = 0.25
	// stockGainRel: once a sheet is known to fit the stock, another
	// candidate is measured exactly only if the raster promises a sheet
	// smaller by more than this (0.1 %): a fraction of a square foot on a
	// garden pond, and below the raster's ranking error (secondRel).
	stockGainRel = 1e-3
	// secantMaxDeg bounds a secant step towards a stock's edge: two coarse
	// steps, about the width of the windows a few centimetres of sheet
	// make.
	secantMaxDeg = 2 * coarseStepDeg
)

// lengths are the developed lengths of the longest sections at an angle θ
// (along) and at θ + 90° (across), without the overlap.
type lengths struct{ along, across float64 }

func (l lengths) add(b lengths) lengths { return lengths{l.along + b.along, l.across + b.across} }
func (l lengths) sub(b lengths) lengths { return lengths{l.along - b.along, l.across - b.across} }

// rasterBias is what the exact profiler measured less what the coarse and
// the fine raster measure, at the same angle.
type rasterBias struct{ coarse, fine lengths }

// window is a range of sheet angles [lo, hi] in degrees, both on the
// coarse scan's grid (hi may pass 90°: the sheet at θ + 90° is the one at θ
// turned).
type window struct{ lo, hi float64 }

// cheapestStock returns the sheet, over all angles, whose stock costs
// least; among angles needing the same stock area, the one of least sheet
// area. best is the least sheet found by run (measured exactly), which
// wins unless another angle needs strictly less stock. It must be called
// after run, whose coarse scan it reads.
//
// The coarse scan shows where cheaper stock may fit: for each interval
// between two scanned angles, the shorter of the two ends' lengths on each
// side, less hopeTol (what the raster may overstate), is priced, and every
// stock area below best's is a level to try, cheapest first. In each window
// of a level the rasters, shifted by the exact profiler's measured
// difference from them (their bias, first taken at best's angle), give the
// angle of least sheet area that fits (windowBest), and the windows are
// searched in the order of the areas the raster predicts (searchWindow). A
// level is accepted only on an exact measurement, so the result never
// needs more stock than best.
func (s *sheetSearch) cheapestStock(best sheetFit, choose stockChooser) sheetFit {
	cost := func(along, across float64) float64 {
		if o, ok := choose(along, across); ok {
			return o.AreaM2
		}
		return math.Inf(1)
	}
	s0 := cost(best.along, best.across)
	nc := len(s.scan)
	if nc < 4 || nc%2 != 0 || math.IsInf(s0, 0) {
		return best
	}
	half := nc / 2
	f := s.scan
	hope := make([]float64, half)
	var levels []float64
	for k := range half {
		a := min(f[k], f[k+1]) - s.hopeTol
		c := min(f[k+half], f[(k+1+half)%nc]) - s.hopeTol
		hope[k] = cost(max(a, 0), max(c, 0))
		if hope[k] < s0*(1-tieRel) {
			levels = append(levels, hope[k])
		}
	}
	if len(levels) == 0 {
		return best
	}
	slices.Sort(levels)
	levels = slices.Compact(levels)

	bias0 := s.biasAt(best.angleDeg, lengths{best.along, best.across})
	budget := maxStockExact
	for _, level := range levels {
		type cand struct {
			w                 window
			deg, beyond, area float64
		}
		var cs []cand
		for _, w := range stockWindows(hope, level) {
			if d, b, a, ok := s.windowBest(w, level, bias0, cost); ok {
				cs = append(cs, cand{w, d, b, a})
			}
		}
		slices.SortStableFunc(cs, func(x, y cand) int { return cmp.Compare(x.area, y.area) })
		var pick *probe
		for _, c := range cs {
			if budget <= 0 || pick != nil && c.area > pick.area*(1-stockGainRel) {
				break
			}
			if p := s.searchWindow(c.w, level, c.deg, c.beyond, bias0, pick, choose, cost, &budget); p != nil {
				pick = p
			}
		}
		if pick != nil {
			return sheetFit{along: pick.l.along, across: pick.l.across, angleDeg: normAngle(pick.deg)}
		}
	}
	return best
}

// probe is a sheet measured exactly at an angle: its lengths, area with
// the overlap, and the stock order it needs (fits: of at most the level).
type probe struct {
	deg   float64
	l     lengths
	area  float64
	order StockOrder
	fits  bool
}

// gapTolM: a fitting sheet within 1 mm of its stock's edge is not pushed
// closer; its area could shrink by 1 mm × its other side at most.
const gapTolM = 1e-3

// searchWindow measures angles of window w exactly and returns the
// fitting sheet of least area it finds that beats pick (nil if none),
// starting at the raster's angle d (found with bias, beyond as for
// windowBest). Each measurement spends one of *budget. The next angle is,
// in this order of preference:
//  1. with a fitting angle A beside an angle B that does not fit and has
//     the smaller sheet, the boundary between them by regula falsi on how
//     far the sheet overruns A's stock (smooth in the angle, since the
//     exact lengths are);
//  2. with two fitting angles, the sheet shrinking from the first to the
//     second, the same overrun extrapolated by a secant to where it
//     vanishes, at most secantMaxDeg on;
//  3. after a fitting raster angle on a boundary, the raster's angle past
//     it;
//  4. the raster's angle with the bias taken again where the last
//     measurement was made (windowBest).
//
// It stops once the best sheet is within gapTolM of its stock's edge, when
// the next angle promises a sheet smaller by less than stockGainRel or is
// within refineTolDeg of one measured (a regula falsi angle that close to B
// is moved refineTolDeg short of it), or when the raster finds nothing.
func (s *sheetSearch) searchWindow(w window, level, d, beyond float64, bias rasterBias, pick *probe, choose stockChooser, cost stockCost, budget *int) *probe {
	lim := level * (1 + tieRel)
	var ps []probe // sorted by angle
	var best *probe
	measured := func(deg float64) bool {
		return slices.ContainsFunc(ps, func(p probe) bool { return math.Abs(p.deg-deg) < refineTolDeg })
	}
	gap := func(o StockOrder, p probe) float64 {
		return o.gap(p.l.along+2*s.overlap, p.l.across+2*s.overlap)
	}
	predicted := math.Inf(1)
	var last probe
	stale := false // the raster's angles d and beyond predate the last measurement
	beyondOf := d  // the raster angle beyond lies past
	for *budget > 0 {
		// The fitting probes of least area, and the probe beside the best
		// that does not fit and has the smaller sheet.
		var fit1, fit2 *probe // fit2 the least sheet, fit1 the next
		for i := range ps {
			if p := &ps[i]; p.fits {
				if fit2 == nil || p.area < fit2.area {
					fit1, fit2 = fit2, p
				} else if fit1 == nil || p.area < fit1.area {
					fit1 = p
				}
			}
		}
		var out *probe
		if fit2 != nil {
			i := slices.IndexFunc(ps, func(p probe) bool { return p.deg == fit2.deg })
			for _, j := range []int{i - 1, i + 1} {
				if j >= 0 && j < len(ps) && !ps[j].fits && ps[j].area < fit2.area && (out == nil || ps[j].area < out.area) {
					out = &ps[j]
				}
			}
		}
		next := math.NaN()
		switch {
		case fit2 != nil && out != nil:
			A, B := *fit2, *out
			ga, gb := gap(A.order, A), gap(A.order, B)
			if ga > -gapTolM || A.area-B.area <= stockGainRel*A.area || math.Abs(B.deg-A.deg) <= refineTolDeg || !(gb > ga) {
				return best
			}
			t := min(max(-ga/(gb-ga), 0.05), 0.95)
			next = A.deg + t*(B.deg-A.deg)
			if math.Abs(B.deg-next) < refineTolDeg {
				// The edge is within refineTolDeg of B: measure that far
				// short of B, on A's side.
				next = B.deg + math.Copysign(refineTolDeg, A.deg-B.deg)
			}
			if measured(next) {
				return best
			}
		case fit1 != nil && fit2 != nil && fit2.area < fit1.area:
			A, P := *fit2, *fit1
			ga, gp := gap(A.order, A), gap(A.order, P)
			if ga > -gapTolM {
				return best
			}
			if ga > gp {
				step := (A.deg - P.deg) * -ga / (ga - gp)
				step = min(max(step, -secantMaxDeg), secantMaxDeg)
				gain := (P.area - A.area) / math.Abs(A.deg-P.deg) * math.Abs(step)
				if gain <= stockGainRel*A.area {
					return best
				}
				next = A.deg + step
				if measured(next) {
					return best
				}
			}
		case last.fits && last.deg == beyondOf && !math.IsNaN(beyond):
			next = beyond
		}
		if math.IsNaN(next) || measured(next) {
			if stale {
				bias = s.biasAt(last.deg, last.l)
				var ok bool
				if d, beyond, predicted, ok = s.windowBest(w, level, bias, cost); !ok {
					d = math.NaN()
				}
				beyondOf, stale = d, false
			}
			if math.IsNaN(d) || measured(d) || best != nil && predicted > best.area*(1-stockGainRel) {
				return best
			}
			next = d
		}
		*budget--
		a, along, across := s.exactArea(next)
		p := probe{deg: next, l: lengths{along, across}, area: a}
		if o, ok := choose(along, across); ok {
			p.order, p.fits = o, o.AreaM2 <= lim
		}
		i, _ := slices.BinarySearchFunc(ps, next, func(x probe, t float64) int { return cmp.Compare(x.deg, t) })
		ps = slices.Insert(ps, i, p)
		if p.fits && (pick == nil || p.area < pick.area*(1-tieRel)) && (best == nil || p.area < best.area*(1-tieRel)) {
			best = &p
		}
		last, stale = p, true
	}
	return best
}

// biasAt returns the rasters' bias at deg, where the exact lengths are
// exact.
func (s *sheetSearch) biasAt(deg float64, exact lengths) rasterBias {
	return rasterBias{coarse: exact.sub(s.coarseAt(deg)), fine: exact.sub(s.fineAt(deg))}
}

// stockWindows returns the maximal runs of scan intervals (circular, of
// period 90°) whose priced stock is at most level, as angle ranges.
func stockWindows(hope []float64, level float64) []window {
	n := len(hope)
	ok := func(k int) bool { return hope[(k%n+n)%n] <= level*(1+tieRel) }
	all := true
	for k := range n {
		all = all && ok(k)
	}
	if all {
		return []window{{0, float64(n) * coarseStepDeg}}
	}
	var ws []window
	for k := range n {
		if !ok(k) || ok(k-1) {
			continue // not the first interval of a run
		}
		e := k
		for ok(e + 1) {
			e++
		}
		ws = append(ws, window{float64(k) * coarseStepDeg, float64(e+1) * coarseStepDeg})
	}
	return ws
}

// windowBest returns the angle in w of least sheet area among those whose
// stock costs at most level, with the sheet area the fine raster (shifted
// by its bias) predicts there; ok is false when it finds no angle of w
// that fits. When the angle lies on a boundary of the fitting angles,
// beyond is the nearest angle past it found not to fit (else NaN).
//
// The window is sampled on the coarse raster at the scan's angles, an
// interval whose ends do not fit but whose shorter sides might being
// halved down to stockSplitDeg. The fine raster then refines: around the
// sample of least area, when it fits, by golden section to stockTolDeg;
// between each sample that fits and a neighbour of smaller area that does
// not, by bisection to stockTolDeg keeping the end that fits (the least
// fitting sheet lies on that boundary); and at the fitting sample of least
// area when neither finds a fitting sheet. The least fitting sheet found
// wins.
func (s *sheetSearch) windowBest(w window, level float64, bias rasterBias, cost stockCost) (deg, beyond, area float64, ok bool) {
	lim := level * (1 + tieRel)
	fits := func(l lengths) bool { return cost(l.along, l.across) <= lim }
	areaOf := func(l lengths) float64 { return (l.along + 2*s.overlap) * (l.across + 2*s.overlap) }
	coarse := func(d float64) lengths { return s.coarseAt(d).add(bias.coarse) }
	fine := func(d float64) lengths { return s.fineAt(d).add(bias.fine) }

	n := max(1, int(math.Round((w.hi-w.lo)/coarseStepDeg)))
	pts := make([]float64, n+1)
	for i := range pts {
		pts[i] = w.lo + float64(i)*coarseStepDeg
	}
	for {
		var mids []float64
		for i := 0; i+1 < len(pts); i++ {
			p, q := pts[i], pts[i+1]
			if q-p <= stockSplitDeg {
				continue
			}
			lp, lq := coarse(p), coarse(q)
			if fits(lp) || fits(lq) {
				continue
			}
			tol := 4 * s.fineStep // two coarse steps at each end
			if cost(max(min(lp.along, lq.along)-tol, 0), max(min(lp.across, lq.across)-tol, 0)) <= lim {
				mids = append(mids, (p+q)/2)
			}
		}
		if len(mids) == 0 {
			break
		}
		pts = append(pts, mids...)
		slices.Sort(pts)
	}

	deg, beyond, area = math.NaN(), math.NaN(), math.Inf(1)
	try := func(d, past float64) {
		if l := fine(d); fits(l) && areaOf(l) < area*(1-tieRel) {
			deg, beyond, area = d, past, areaOf(l)
		}
	}
	cl := make([]lengths, len(pts))
	for i, p := range pts {
		cl[i] = coarse(p)
	}
	gm, bf := 0, -1
	for i := range pts {
		if areaOf(cl[i]) < areaOf(cl[gm]) {
			gm = i
		}
		if fits(cl[i]) && (bf < 0 || areaOf(cl[i]) < areaOf(cl[bf])) {
			bf = i
		}
	}
	if fits(cl[gm]) {
		// The least area near the best sample, by golden section.
		lo, hi := pts[max(gm-1, 0)], pts[min(gm+1, len(pts)-1)]
		g := func(d float64) float64 { return areaOf(fine(d)) }
		x1, x2 := hi-invPhi*(hi-lo), lo+invPhi*(hi-lo)
		f1, f2 := g(x1), g(x2)
		for hi-lo > stockTolDeg {
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
			try(x1, math.NaN())
		} else {
			try(x2, math.NaN())
		}
	}
	// Where the sheet shrinks towards angles that do not fit, the least
	// fitting sheet is on the boundary between them.
	for i := 0; i+1 < len(pts); i++ {
		p, q := i, i+1
		if fits(cl[p]) == fits(cl[q]) {
			continue
		}
		if fits(cl[q]) {
			p, q = q, p
		}
		if areaOf(cl[q]) >= areaOf(cl[p]) {
			continue // the sheet grows past the boundary
		}
		a, b := pts[p], pts[q]
		if !fits(fine(a)) {
			continue // the fine raster puts the boundary elsewhere
		}
		if fits(fine(b)) {
			try(b, math.NaN())
			continue
		}
		for math.Abs(b-a) > stockTolDeg {
			m := (a + b) / 2
			if fits(fine(m)) {
				a = m
			} else {
				b = m
			}
		}
		try(a, b)
	}
	if math.IsNaN(deg) && bf >= 0 {
		try(pts[bf], math.NaN())
	}
	return deg, beyond, area, !math.IsNaN(deg)
}

// coarseAt returns the coarse raster's lengths at deg: from the scan at
// its angles, else measured and cached.
func (s *sheetSearch) coarseAt(deg float64) lengths {
	nc := len(s.scan)
	if k := math.Round(deg / coarseStepDeg); k*coarseStepDeg == deg && nc > 0 {
		j := (int(k)%nc + nc) % nc
		return lengths{s.scan[j], s.scan[(j+nc/2)%nc]}
	}
	if l, ok := s.coarseCache[deg]; ok {
		return l
	}
	th := deg * math.Pi / 180
	l := lengths{
		longestSection(s.coarse, s.hull, th, s.coarseLines, false, s.margin),
		longestSection(s.coarse, s.hull, th+math.Pi/2, s.coarseLines, false, s.margin),
	}
	if s.coarseCache == nil {
		s.coarseCache = map[float64]lengths{}
	}
	s.coarseCache[deg] = l
	return l
}

// fineAt returns the fine raster's lengths at deg (both directions, each
// with its best line's offset refined), cached by angle.
func (s *sheetSearch) fineAt(deg float64) lengths {
	if l, ok := s.fineCache[deg]; ok {
		return l
	}
	_, a, c := s.area(s.fine, s.fineLines, true, deg)
	l := lengths{a, c}
	if s.fineCache == nil {
		s.fineCache = map[float64]lengths{}
	}
	s.fineCache[deg] = l
	return l
}
