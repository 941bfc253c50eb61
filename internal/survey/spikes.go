package survey

import (
	"math"
	"slices"

	"github.com/dugout-estimating/dugout/internal/geom"
)

// Spike test parameters (see [findSpikes]).
const (
	// SpikeNeighbours is how many nearest neighbours a shot is compared
	// with: 8 surrounds a point on a regular grid (its ring of cells)
	// while staying local on a sparse garden survey.
	SpikeNeighbours = 8
	// SpikeMADMultiple is the multiple of the robust spread of all
	// residuals beyond which a residual is suspect. For normal noise the
	// scaled MAD estimates σ, and 6σ is exceeded by chance about twice in a
	// billion shots, so a flag is a blunder, not noise.
	SpikeMADMultiple = 6
	// SpikeFloorM is the smallest residual ever flagged: 0.15 m. Below that
	// a shot on a tussock, a stone or a tyre rut is real ground for a pond
	// estimate, while a rod set on a stake or lath top is 0.3 m or more up
	// (common practice, no source).
	SpikeFloorM = 0.15
	// madToSigma scales a median absolute deviation to the standard
	// deviation of a normal distribution: 1/Φ⁻¹(3/4) = 1.4826 (Rousseeuw &
	// Croux, JASA 88, 1993, eq. 1.1).
	madToSigma = 1.4826
	// minPlaneSpread is the least spread a neighbourhood must have in its
	// narrow direction for a plane fit: the ratio 4·λ1·λ2/(λ1+λ2)² of the
	// plan covariance's eigenvalues (1 for a round cloud, 0 for a line).
	// Below 1e-4 (the narrow axis under 1 % of the wide one) the points are
	// taken as a line, and the median of their elevations stands in for the
	// plane.
	minPlaneSpread = 1e-4
)

// Spike is a shot that stands out from its neighbours.
type Spike struct {
	Point PointRef
	// ResidualM is the elevation minus the plane fitted to the
	// neighbours at its position, in metres (positive above).
	ResidualM float64
	// BeyondM is how far it lies above the highest (or below the lowest)
	// neighbour, in metres (positive above, negative below).
	BeyondM float64
}

// findSpikes flags suspected spikes: shots on a stake top, in a hole, or
// mistyped. For each shot with an elevation it takes its SpikeNeighbours
// nearest neighbours in plan (leaving out re-shots within dupTolM), fits a
// least-squares plane z = a + b·x + c·y to them and takes the residual r of
// the shot against it. The robust spread σ = 1.4826·MAD of all residuals
// sets the threshold T = max(SpikeMADMultiple·σ, SpikeFloorM). A shot is a
// spike when |r| > T and it lies beyond all its neighbours' elevations by
// more than T, above the highest or below the lowest. The second test keeps
// breaklines from being flagged (a shot on top of a wall or bank has
// neighbours on top too), and the first keeps the edge of a slope from
// being flagged (the plane through neighbours all downhill predicts the
// shot well). It returns the spikes in point order and T.
//
// The test needs more than SpikeNeighbours shots; with fewer it returns
// nothing. Cost: O(n·k) after an O(n) grid build, for n shots.
func findSpikes(pts []Point, dupTolM float64) ([]Spike, float64) {
	var idx []int
	var plan []geom.Vec2
	for i, p := range pts {
		if p.HasZ() {
			idx = append(idx, i)
			plan = append(plan, p.P.XY())
		}
	}
	if len(idx) <= SpikeNeighbours {
		return nil, math.NaN()
	}
	g := newPointGrid(plan)
	tol2 := dupTolM * dupTolM
	res := make([]float64, len(idx))
	lo := make([]float64, len(idx))
	hi := make([]float64, len(idx))
	var nb []neighbour
	zs := make([]float64, 0, SpikeNeighbours)
	for k, i := range idx {
		p := pts[i].P
		nb = g.nearest(plan[k], SpikeNeighbours, func(_ int, d2 float64) bool { return d2 <= tol2 }, nb)
		if len(nb) < 3 {
			res[k] = math.NaN()
			continue
		}
		zs = zs[:0]
		lo[k], hi[k] = math.Inf(1), math.Inf(-1)
		for _, q := range nb {
			z := pts[idx[q.i]].P.Z
			zs = append(zs, z)
			lo[k], hi[k] = math.Min(lo[k], z), math.Max(hi[k], z)
		}
		res[k] = p.Z - planeAt(plan[k], plan, nb, zs)
	}
	var abs []float64
	for _, r := range res {
		if !math.IsNaN(r) {
			abs = append(abs, r)
		}
	}
	if len(abs) == 0 {
		return nil, math.NaN()
	}
	med := median(slices.Clone(abs))
	for i, r := range abs {
		abs[i] = math.Abs(r - med)
	}
	sigma := madToSigma * median(abs)
	t := math.Max(SpikeMADMultiple*sigma, SpikeFloorM)
	var out []Spike
	for k, i := range idx {
		r := res[k]
		if math.IsNaN(r) || math.Abs(r) <= t {
			continue
		}
		z := pts[i].P.Z
		var beyond float64
		switch {
		case z-hi[k] > t:
			beyond = z - hi[k]
		case lo[k]-z > t:
			beyond = z - lo[k]
		default:
			continue
		}
		out = append(out, Spike{Point: refOf(pts[i]), ResidualM: r, BeyondM: beyond})
	}
	return out, t
}

// planeAt returns the elevation at p of the least-squares plane through the
// neighbours nb (positions plan[nb.i], elevations zs), or their median when
// they are too close to a line for a plane.
func planeAt(p geom.Vec2, plan []geom.Vec2, nb []neighbour, zs []float64) float64 {
	n := float64(len(nb))
	var mx, my, mz float64
	for j, q := range nb {
		v := plan[q.i].Sub(p)
		mx += v.X
		my += v.Y
		mz += zs[j]
	}
	mx, my, mz = mx/n, my/n, mz/n
	var sxx, sxy, syy, sxz, syz float64
	for j, q := range nb {
		v := plan[q.i].Sub(p)
		dx, dy, dz := v.X-mx, v.Y-my, zs[j]-mz
		sxx += dx * dx
		sxy += dx * dy
		syy += dy * dy
		sxz += dx * dz
		syz += dy * dz
	}
	det := sxx*syy - sxy*sxy
	tr := sxx + syy
	if !(tr > 0) || 4*det/(tr*tr) < minPlaneSpread {
		return median(slices.Clone(zs))
	}
	b := (syy*sxz - sxy*syz) / det
	c := (sxx*syz - sxy*sxz) / det
	// The shot sits at the origin of the shifted coordinates.
	return mz - b*mx - c*my
}

// median returns the median of v, reordering v. v must not be empty.
func median(v []float64) float64 {
	slices.Sort(v)
	n := len(v)
	if n%2 == 1 {
		return v[n/2]
	}
	return (v[n/2-1] + v[n/2]) / 2
}
