package design

import (
	"math"
	"slices"

	"github.com/dugout-estimating/dugout/internal/geom"
)

// relEx returns e(p) over every zone except ex1 and ex2 (−1 for none).
func (zs *zoneSet) relEx(p geom.Vec2, ex1, ex2 int) float64 {
	e := math.Inf(1)
	for i := range zs.z {
		if i == ex1 || i == ex2 {
			continue
		}
		ei, _ := zs.zoneRel(i, p)
		e = min(e, ei)
	}
	return e
}

// floorAreas returns, for each zone, the plan area of its flat floor: the
// zone's polygon less the part where another zone's bowl lies deeper,
// A_i = area(Z_i) − ∬_{Z_i} [χ_i < 0] with χ_i = (e without zone i) + d_i.
// χ_i is continuous across Z_i's outline, so cells crossing the outline
// are integrated exactly over their triangles clipped to Z_i; a vertical
// deeper zone inside Z_i is handled like a wall split. A cell crossed both
// by Z_i's outline and by another vertical wall is interpolated.
func (fd *field) floorAreas() []float64 {
	zs := fd.zs
	l := fd.lat
	out := make([]float64, len(zs.z))
	ca := l.CellArea()
	var buf clipBuf
	for i := range zs.z {
		z := &zs.z[i]
		out[i] = z.area
		cache := map[int]float64{}
		// chi returns χ_i at node k, with zone ex left out as well.
		chi := func(k int, eNode float64, ex int) float64 {
			if v := eNode + z.depth; v < 0 {
				return v
			}
			key := k
			if ex >= 0 {
				key = -(k + 1) - ex*l.Len()
			}
			if v, ok := cache[key]; ok {
				return v
			}
			v := zs.relEx(l.Node(k%l.NX, k/l.NX), i, ex) + z.depth
			cache[key] = v
			return v
		}
		bb := z.floor.box
		ci0 := max(0, int(math.Floor((bb.Min.X-l.X0)/l.H)))
		ci1 := min(l.NX-2, int(math.Floor((bb.Max.X-l.X0)/l.H)))
		cj0 := max(0, int(math.Floor((bb.Min.Y-l.Y0)/l.H)))
		cj1 := min(l.NY-2, int(math.Floor((bb.Max.Y-l.Y0)/l.H)))
		var sub geom.Sum
		var f, fo, fi [4]float64
		rows := &fd.floorRows[i]
		crossed := fd.crossed[i]
		for cj := cj0; cj <= cj1; cj++ {
			sp := fd.splitsIn(cj, cj+1)
			// This row's crossed cells, and the row's polygon crossings
			// for the inside test of the others.
			lo, _ := slices.BinarySearch(crossed, int32(cj*l.NX+ci0))
			cr := crossed[lo:]
			xs := rows.row(cj)
			xp := 0
			inside := false
			for ci := ci0; ci <= ci1; ci++ {
				c := ci + cj*l.NX
				x0 := l.X0 + float64(ci)*l.H
				for xp < len(xs) && xs[xp] <= x0 {
					inside = !inside
					xp++
				}
				for len(cr) > 0 && int(cr[0]) < c {
					cr = cr[1:]
				}
				crossing := len(cr) > 0 && int(cr[0]) == c
				nd := fd.cellNodes(c)
				var x *split
				for len(sp) > 0 && sp[0].cell < c {
					sp = sp[1:]
				}
				if len(sp) > 0 && sp[0].cell == c && int(sp[0].zone) != i {
					x = &sp[0]
				}
				deeper := x != nil && zs.z[x.zone].depth > z.depth
				for _, k := range nd {
					deeper = deeper || fd.e[k]+z.depth < 0
				}
				if !deeper || !crossing && !inside {
					continue
				}
				for m, k := range nd {
					f[m] = chi(k, fd.e[k], -1)
				}
				var part [2][]uv
				if crossing {
					part = fd.clipCell(c, z.floor)
				}
				for t := range 2 {
					switch {
					case crossing:
						_, _, _, na := polyParts(t, ca, &f, part[t], &buf)
						sub.Add(na)
					case x != nil:
						dj := zs.z[x.zone].depth
						for m, k := range nd {
							fo[m] = chi(k, x.eOut[m], int(x.zone))
							fi[m] = min(fo[m], z.depth-dj)
						}
						_, _, _, n0 := triParts(t, ca, &fo)
						_, _, _, n1 := polyParts(t, ca, &fo, x.part[t], &buf)
						_, _, _, n2 := polyParts(t, ca, &fi, x.part[t], &buf)
						sub.Add(n0 - n1 + n2)
					default:
						_, _, _, na := triParts(t, ca, &f)
						sub.Add(na)
					}
				}
			}
		}
		out[i] -= sub.Value()
		if out[i] < 0 {
			out[i] = 0
		}
	}
	return out
}

// clipCell returns the two triangles of cell c clipped to polygon q, in
// cell coordinates.
func (fd *field) clipCell(c int, q *polygon) [2][]uv {
	l := fd.lat
	o := l.Node(c%l.NX, c/l.NX)
	poly := make([]uv, len(q.pts))
	for k, p := range q.pts {
		poly[k] = uv{(p.X - o.X) / l.H, (p.Y - o.Y) / l.H}
	}
	var out [2][]uv
	for t := range 2 {
		cr := triCorners[t]
		part := poly
		for e := range 3 {
			part = clipHalf(part, cr[e], cr[(e+1)%3])
			if len(part) == 0 {
				break
			}
		}
		if len(part) >= 3 {
			out[t] = part
		}
	}
	return out
}
