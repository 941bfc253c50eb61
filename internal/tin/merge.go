package tin

import (
	"cmp"
	"fmt"
	"math"
	"slices"
	"strings"

	"github.com/dugout-estimating/dugout/internal/geom"
)

// prepared is the vertex set ready for triangulation: merged, in insertion
// (Hilbert) order.
type prepared struct {
	v   []geom.Vec3
	src []int32 // per vertex: the smallest input index in its group (points first, then breakline vertices)
	blv []int32 // per breakline vertex (flattened): its vertex

	groups, merged, conflicts int
	warnings                  []Warning
}

// input is the flattened input: survey points, then the vertices of every
// breakline in order.
type input struct {
	pts     []geom.Vec3 // the survey points (not modified)
	bl      []geom.Vec3 // breakline vertices, flattened; nil without breaklines
	blLine  []int32     // breakline index of each flattened vertex
	blNames []string
	snap    []int32 // with a merge tolerance: the input index whose position each input takes; nil otherwise
}

func (in *input) n() int { return len(in.pts) + len(in.bl) }

// at returns input i: a survey point or a breakline vertex, at its snapped
// position when merging with a tolerance.
func (in *input) at(i int32) geom.Vec3 {
	p := in.raw(i)
	if in.snap != nil && in.snap[i] != i {
		q := in.raw(in.snap[i])
		p.X, p.Y = q.X, q.Y
	}
	return p
}

func (in *input) raw(i int32) geom.Vec3 {
	if int(i) < len(in.pts) {
		return in.pts[i]
	}
	return in.bl[int(i)-len(in.pts)]
}

// maxWarningsPerKind caps the warnings of one kind (e.g. duplicate
// conflicts) so that a bad file does not produce a million messages; one
// more warning says how many were left out.
const maxWarningsPerKind = 100

// prepare checks the inputs, merges duplicates by the policy and returns the
// vertices in Hilbert order, with room for extra more (vertices that
// constraint insertion will add).
func prepare(in *input, opt *Options, extra int) (*prepared, error) {
	n := in.n()
	if opt.MergeTolM > 0 {
		if err := snapWithin(in, opt.MergeTolM); err != nil {
			return nil, err
		}
	}
	// Hilbert keys over the bounding box of all inputs.
	plain := len(in.bl) == 0 && in.snap == nil // inputs are exactly in.pts
	minX, minY := math.Inf(1), math.Inf(1)
	maxX, maxY := math.Inf(-1), math.Inf(-1)
	for i := range int32(n) {
		var p geom.Vec3
		if plain {
			p = in.pts[i]
		} else {
			p = in.at(i)
		}
		minX, maxX = min(minX, p.X), max(maxX, p.X)
		minY, maxY = min(minY, p.Y), max(maxY, p.Y)
	}
	size := max(maxX-minX, maxY-minY)
	scale := 0.0
	if size > 0 {
		scale = (hilbertOrder - 1) / size
	}
	keys := make([]uint64, n)
	for i := range int32(n) {
		var p geom.Vec3
		if plain {
			p = in.pts[i]
		} else {
			p = in.at(i)
		}
		qx := uint32(min((p.X-minX)*scale, hilbertOrder-1))
		qy := uint32(min((p.Y-minY)*scale, hilbertOrder-1))
		keys[i] = uint64(hilbertKey(qx, qy))<<32 | uint64(i)
	}
	radixSortHigh(keys, make([]uint64, n))

	pr := &prepared{v: make([]geom.Vec3, 0, n+extra), src: make([]int32, 0, n)}
	if len(in.bl) > 0 {
		pr.blv = make([]int32, len(in.bl))
	}
	tol := opt.conflictTol()
	warned := 0
	var run []int32
	for lo := 0; lo < n; {
		hi := lo + 1
		for hi < n && keys[hi]>>32 == keys[lo]>>32 {
			hi++
		}
		if hi == lo+1 {
			i := int32(keys[lo])
			if plain {
				pr.v = append(pr.v, in.pts[i])
			} else {
				if int(i) >= len(in.pts) {
					pr.blv[int(i)-len(in.pts)] = int32(len(pr.v))
				}
				pr.v = append(pr.v, in.at(i))
			}
			pr.src = append(pr.src, i)
			lo = hi
			continue
		}
		// Several inputs in one Hilbert cell: order them by position then
		// index, so that equal positions are adjacent and in input order.
		run = run[:0]
		for _, k := range keys[lo:hi] {
			run = append(run, int32(k))
		}
		slices.SortFunc(run, func(i, j int32) int {
			p, q := in.at(i), in.at(j)
			if c := cmp.Compare(p.X, q.X); c != 0 {
				return c
			}
			if c := cmp.Compare(p.Y, q.Y); c != 0 {
				return c
			}
			return cmp.Compare(i, j)
		})
		for a := 0; a < len(run); {
			b := a + 1
			pa := in.at(run[a])
			for b < len(run) {
				pb := in.at(run[b])
				if pb.X != pa.X || pb.Y != pa.Y {
					break
				}
				b++
			}
			if err := pr.emit(in, run[a:b], opt, tol, &warned); err != nil {
				return nil, err
			}
			a = b
		}
		lo = hi
	}
	if warned > maxWarningsPerKind {
		pr.warnings = append(pr.warnings, Warning{Msg: fmt.Sprintf("%d more duplicate groups with conflicting elevations not listed", warned-maxWarningsPerKind)})
	}
	return pr, nil
}

// emit adds the vertex for one group of inputs at the same position (sorted
// by input index, so survey points come before breakline vertices).
func (pr *prepared) emit(in *input, g []int32, opt *Options, tol float64, warned *int) error {
	vi := int32(len(pr.v))
	if len(g) == 1 {
		if int(g[0]) >= len(in.pts) {
			pr.blv[int(g[0])-len(in.pts)] = vi
		}
		pr.v = append(pr.v, in.at(g[0]))
		pr.src = append(pr.src, g[0])
		return nil
	}
	np := int32(len(in.pts))
	// Elevations come from the breakline vertices when the group has any
	// (a breakline's vertices carry its elevations), else from the points.
	zs := g
	if g[len(g)-1] >= np {
		k := 0
		for g[k] < np {
			k++
		}
		zs = g[k:]
	}
	zmin, zmax := math.Inf(1), math.Inf(-1)
	for _, i := range g {
		z := in.at(i).Z
		zmin, zmax = math.Min(zmin, z), math.Max(zmax, z)
	}
	var z float64
	if opt.Duplicates == DupFirst {
		z = in.at(zs[0]).Z
	} else {
		var s geom.Sum
		for _, i := range zs {
			s.Add(in.at(i).Z)
		}
		z = s.Value() / float64(len(zs))
	}
	at := in.at(zs[0])
	pr.groups++
	pr.merged += len(g) - 1
	if zmax-zmin > tol {
		pr.conflicts++
		var idx []int
		var names []string
		for _, i := range g {
			if i < np {
				idx = append(idx, int(i))
			} else {
				names = append(names, fmt.Sprintf("%q", in.blNames[in.blLine[int(i)-len(in.pts)]]))
			}
		}
		names = slices.Compact(names)
		if opt.Duplicates == DupError {
			return &DuplicateError{Indices: idx, At: geom.Vec2{X: at.X, Y: at.Y}, ZMinM: zmin, ZMaxM: zmax, TolM: tol, Breaklines: names}
		}
		*warned++
		if *warned <= maxWarningsPerKind {
			var who strings.Builder
			if len(idx) > 0 {
				fmt.Fprintf(&who, "points %s", joinInts(idx, 10))
			}
			if len(names) > 0 {
				if who.Len() > 0 {
					who.WriteString(" and ")
				}
				fmt.Fprintf(&who, "breakline %s", strings.Join(names, ", "))
			}
			pr.warnings = append(pr.warnings, Warning{
				Msg: fmt.Sprintf("duplicate %s differ in elevation by %.3f m (more than %g m); kept the %s, %.3f m",
					who.String(), zmax-zmin, tol, opt.Duplicates, z),
				At: geom.Vec2{X: at.X, Y: at.Y},
				Conflict: &Conflict{Points: idx, Breaklines: names, SpreadM: zmax - zmin, TolM: tol,
					KeptZM: z, Policy: opt.Duplicates},
			})
		}
	}
	pr.v = append(pr.v, geom.Vec3{X: at.X, Y: at.Y, Z: z})
	pr.src = append(pr.src, g[0])
	for _, i := range g {
		if i >= np {
			pr.blv[i-np] = vi
		}
	}
	return nil
}

// joinInts formats up to max integers separated by commas.
func joinInts(v []int, max int) string {
	var b strings.Builder
	for i, x := range v {
		if i == max {
			fmt.Fprintf(&b, " and %d more", len(v)-max)
			break
		}
		if i > 0 {
			b.WriteString(", ")
		}
		fmt.Fprintf(&b, "%d", x)
	}
	return b.String()
}

// maxCellKey bounds the packed cell keys of the merge grid (the grid's
// extent divided by the merge distance), so that a merge tolerance tiny
// compared with the coordinates is refused instead of overflowing.
const maxCellKey = 1 << 62

// snapWithin implements the merge tolerance: processing breakline vertices
// first and then survey points in input order, each input joins the earliest
// group whose first member lies closer than tolM, or starts a group; in.snap
// is set to each input's group leader.
//
// Candidates come from cells of side tolM: only the 3×3 cells around a point
// can hold another closer than tolM. Inputs are radix-sorted by cell key
// (column-major, so the three cells of a neighbouring column are consecutive
// keys) and swept once with three sliding windows, one per neighbouring
// column: O(n) after the sort. Pairs closer than tolM are rare in survey
// data and are resolved afterwards in processing order.
func snapWithin(in *input, tolM float64) error {
	n := in.n()
	np := len(in.pts)
	rank := func(i int32) int32 { // processing order
		if int(i) >= np {
			return i - int32(np)
		}
		return i + int32(len(in.bl))
	}
	minX, minY := math.Inf(1), math.Inf(1)
	maxX, maxY := math.Inf(-1), math.Inf(-1)
	for i := range int32(n) {
		p := in.raw(i)
		minX, maxX = min(minX, p.X), max(maxX, p.X)
		minY, maxY = min(minY, p.Y), max(maxY, p.Y)
	}
	nx := math.Floor((maxX-minX)/tolM) + 3
	ny := math.Floor((maxY-minY)/tolM) + 3
	if !(nx*ny < maxCellKey) {
		return fmt.Errorf("%w: merge tolerance %g m is too small for a survey %g m × %g m across", ErrOption, tolM, maxX-minX, maxY-minY)
	}
	stride := uint64(ny)
	type kp struct {
		key uint64
		i   int32
	}
	cells := make([]kp, n)
	maxKey := uint64(0)
	for i := range int32(n) {
		p := in.raw(i)
		cx := uint64(math.Floor((p.X-minX)/tolM)) + 1
		cy := uint64(math.Floor((p.Y-minY)/tolM)) + 1
		k := cx*stride + cy
		cells[i] = kp{k, i}
		maxKey = max(maxKey, k)
	}
	// LSD radix sort by key, stable (equal keys keep index order).
	buf := make([]kp, n)
	src, dst := cells, buf
	for shift := uint(0); shift < 64 && maxKey>>shift != 0; shift += 8 {
		var count [257]int
		for _, c := range src {
			count[(c.key>>shift)&0xff+1]++
		}
		for d := 1; d < 257; d++ {
			count[d] += count[d-1]
		}
		for _, c := range src {
			d := (c.key >> shift) & 0xff
			dst[count[d]] = c
			count[d]++
		}
		src, dst = dst, src
	}
	cells, buf = src, nil
	// Sweep: for the input at sorted position k, the candidates are the
	// keys key+d−1 … key+d+1 for d in {−stride, 0, +stride}.
	tol2 := tolM * tolM
	type pair struct{ i, j int32 } // j is processed before i
	var pairs []pair
	var lo [3]int
	for k := range cells {
		key := cells[k].key
		i := cells[k].i
		p := in.raw(i)
		for w, d := range [3]int64{-int64(stride), 0, int64(stride)} {
			from := uint64(int64(key) + d - 1)
			to := uint64(int64(key) + d + 1)
			for lo[w] < n && cells[lo[w]].key < from {
				lo[w]++
			}
			for m := lo[w]; m < n && cells[m].key <= to; m++ {
				j := cells[m].i
				if j == i || rank(j) > rank(i) {
					continue
				}
				q := in.raw(j)
				if (geom.Vec2{X: p.X, Y: p.Y}).DistanceSquared(geom.Vec2{X: q.X, Y: q.Y}) < tol2 {
					pairs = append(pairs, pair{i, j})
				}
			}
		}
	}
	// Resolve in processing order: an input joins its earliest-processed
	// candidate that leads a group.
	slices.SortFunc(pairs, func(a, b pair) int {
		if c := cmp.Compare(rank(a.i), rank(b.i)); c != 0 {
			return c
		}
		return cmp.Compare(rank(a.j), rank(b.j))
	})
	lead := make([]int32, n)
	for i := range lead {
		lead[i] = int32(i)
	}
	for _, pr := range pairs {
		if lead[pr.i] == pr.i && lead[pr.j] == pr.j {
			// The first (earliest) candidate that is a leader wins; i may
			// not become a member twice.
			lead[pr.i] = pr.j
		}
	}
	in.snap = lead
	return nil
}
