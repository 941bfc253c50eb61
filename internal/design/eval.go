package design

import (
	"math"
	"runtime"
	"slices"
	"sync"
	"sync/atomic"

	"github.com/dugout-estimating/dugout/internal/geom"
)

// infCap stands in for an infinite e (no zone reaches the node) in
// integrals of the water depth, 1e6 m: between a node at a floor and one
// at +Inf the interpolated water edge then sits within a millionth of the
// cell from the floor node, which is the step the vertical wall makes.
const infCap = 1e6

// bandRows is the number of cell rows summed together. Bands are fixed by
// the lattice alone, and their sums are merged in band order, so results
// do not depend on the number of workers.
const bandRows = 32

// berm holds the berm's shape.
type berm struct{ crest, slope float64 }

// finished returns the finished grade at a node with relative bowl e, rim
// distance rho and existing ground g, for water level w (see the package
// comment): the bowl up to the rim; elsewhere the bowl cut into higher
// ground, or the berm where it stands above both.
func (zs *zoneSet) finished(w, e, rho, g float64, b berm) float64 {
	if e <= zs.freeboard {
		return w + e
	}
	bz := w + zs.freeboard - max(0, rho-b.crest)/b.slope
	return max(bz, min(g, w+e))
}

// forBands runs fn on every band of cell rows, spread over the workers.
func forBands(ncellRows int, fn func(band, j0, j1 int)) {
	nb := (ncellRows + bandRows - 1) / bandRows
	var next atomic.Int64
	var wg sync.WaitGroup
	for range min(runtime.GOMAXPROCS(0), max(nb, 1)) {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for {
				b := int(next.Add(1) - 1)
				if b >= nb {
					return
				}
				fn(b, b*bandRows, min((b+1)*bandRows, ncellRows))
			}
		}()
	}
	wg.Wait()
}

// splitsIn returns the splits whose cells lie in cell rows [j0, j1).
func (fd *field) splitsIn(j0, j1 int) []split {
	nx := fd.lat.NX
	lo, _ := slices.BinarySearchFunc(fd.splits, j0*nx, func(s split, c int) int { return s.cell - c })
	hi, _ := slices.BinarySearchFunc(fd.splits, j1*nx, func(s split, c int) int { return s.cell - c })
	return fd.splits[lo:hi]
}

// cellNodes returns the node indices (00, 10, 01, 11) of cell c.
func (fd *field) cellNodes(c int) [4]int {
	nx := fd.lat.NX
	return [4]int{c, c + 1, c + nx, c + nx + 1}
}

// triSlots are the node slots of the cell's two triangles.
var triSlots = [2][3]int{{0, 1, 3}, {0, 3, 2}}

// volumes are the earthwork results at one water level.
type volumes struct {
	cut, fill, cutArea, fillArea float64
	zoneCut, zoneFill            []float64
}

type bandSums struct {
	cut, fill, cutA, fillA geom.Sum
	zc, zf                 []geom.Sum
}

// evaluate fills d with the finished grade for water level w and returns
// the cut and fill against existing ground g (NaN outside the survey;
// such cells are skipped). Each row of cells is summed plainly (at most a
// few thousand terms of one sign, so the relative rounding stays near
// 1e-13) and rows are added with compensation, band by band.
func (fd *field) evaluate(w float64, g, d []float64, b berm) volumes {
	fd.grade(w, g, d, b)
	return fd.integrate(w, g, d, b)
}

// grade fills d with the finished grade for water level w over existing
// ground g. The berm's drop below the rim at each node, max(0, ρ − c)/b,
// does not depend on W: it is computed once per field and berm.
func (fd *field) grade(w float64, g, d []float64, b berm) {
	zs := fd.zs
	l := fd.lat
	if fd.drop == nil || fd.dropBerm != b {
		if fd.drop == nil {
			fd.drop = make([]float64, l.Len())
		}
		fd.dropBerm = b
		forBands(l.NY, func(_, j0, j1 int) {
			for k := j0 * l.NX; k < j1*l.NX; k++ {
				fd.drop[k] = max(0, fd.rho[k]-b.crest) / b.slope
			}
		})
	}
	f := zs.freeboard
	forBands(l.NY, func(_, j0, j1 int) {
		k0, k1 := j0*l.NX, j1*l.NX
		e, drop, gg, dd := fd.e[k0:k1], fd.drop[k0:k1], g[k0:k1], d[k0:k1]
		drop, gg, dd = drop[:len(e)], gg[:len(e)], dd[:len(e)]
		for k, ek := range e {
			// zoneSet.finished with the drop read, not computed.
			if ek <= f {
				dd[k] = w + ek
				continue
			}
			bz := w + f - drop[k]
			dd[k] = max(bz, min(gg[k], w+ek))
		}
	})
}

// integrate returns the cut and fill between g and the finished grade d
// that [field.grade] made for water level w.
func (fd *field) integrate(w float64, g, d []float64, b berm) volumes {
	zs := fd.zs
	l := fd.lat
	nb := (l.NY - 1 + bandRows - 1) / bandRows
	nz := len(zs.z)
	sums := make([]bandSums, nb)
	area := l.CellArea()
	forBands(l.NY-1, func(band, j0, j1 int) {
		s := &sums[band]
		s.zc, s.zf = make([]geom.Sum, nz), make([]geom.Sum, nz)
		rzc, rzf := make([]float64, nz), make([]float64, nz)
		var buf clipBuf
		sp := fd.splitsIn(j0, j1)
		var f, fin [4]float64
		for cj := j0; cj < j1; cj++ {
			var rc, rf, rca, rfa float64
			touched := false
			// The cell row's two node rows, as slices of one length so that
			// the index checks go.
			r0 := cj * l.NX
			g0, g1 := g[r0:r0+l.NX], g[r0+l.NX:r0+2*l.NX]
			d0, d1 := d[r0:r0+l.NX], d[r0+l.NX:r0+2*l.NX]
			g1, d0, d1 = g1[:len(g0)], d0[:len(g0)], d1[:len(g0)]
			for ci := 0; ci+1 < len(g0); ci++ {
				c := ci + r0
				isSplit := len(sp) > 0 && sp[0].cell == c
				k0, k1, k2, k3 := c, c+1, c+l.NX, c+l.NX+1
				f = [4]float64{g0[ci] - d0[ci], g0[ci+1] - d0[ci+1], g1[ci] - d1[ci], g1[ci+1] - d1[ci+1]}
				if !isSplit && f[0] == 0 && f[1] == 0 && f[2] == 0 && f[3] == 0 {
					continue
				}
				if math.IsNaN(f[0] + f[1] + f[2] + f[3]) {
					if isSplit {
						sp = sp[1:]
					}
					continue
				}
				touched = true
				nd := [4]int{k0, k1, k2, k3}
				own := [4]int32{fd.volOwner(k0), fd.volOwner(k1), fd.volOwner(k2), fd.volOwner(k3)}
				var x *split
				if isSplit {
					x = &sp[0]
					sp = sp[1:]
					for m, k := range nd {
						f[m] = g[k] - zs.finished(w, x.eOut[m], fd.rho[k], g[k], b)
						fin[m] = g[k] - zs.finished(w, x.eIn[m], fd.rho[k], g[k], b)
					}
				}
				for t := range 2 {
					var pos, neg, pa, na float64
					if x != nil {
						p0, n0, pa0, na0 := triParts(t, area, &f)
						p1, n1, pa1, na1 := polyParts(t, area, &f, x.part[t], &buf)
						p2, n2, pa2, na2 := polyParts(t, area, &fin, x.part[t], &buf)
						pos, neg = p0-p1+p2, n0-n1+n2
						pa, na = pa0-pa1+pa2, na0-na1+na2
					} else {
						pos, neg, pa, na = triParts(t, area, &f)
					}
					rc += pos
					rf += neg
					rca += pa
					rfa += na
					// A third to each corner's zone, in slot order
					// (adding zero changes nothing, so zeros are skipped).
					o0, o1, o2 := own[triSlots[t][0]], own[triSlots[t][1]], own[triSlots[t][2]]
					if p3 := pos / 3; p3 != 0 {
						rzc[o0] += p3
						rzc[o1] += p3
						rzc[o2] += p3
					}
					if n3 := neg / 3; n3 != 0 {
						rzf[o0] += n3
						rzf[o1] += n3
						rzf[o2] += n3
					}
				}
			}
			if touched {
				s.cut.Add(rc)
				s.fill.Add(rf)
				s.cutA.Add(rca)
				s.fillA.Add(rfa)
				for z := range nz {
					s.zc[z].Add(rzc[z])
					s.zf[z].Add(rzf[z])
					rzc[z], rzf[z] = 0, 0
				}
			}
		}
	})
	var v volumes
	var cut, fill, ca, fa geom.Sum
	zc, zf := make([]geom.Sum, nz), make([]geom.Sum, nz)
	for i := range sums {
		s := &sums[i]
		cut.AddSum(s.cut)
		fill.AddSum(s.fill)
		ca.AddSum(s.cutA)
		fa.AddSum(s.fillA)
		for z := range s.zc {
			zc[z].AddSum(s.zc[z])
			zf[z].AddSum(s.zf[z])
		}
	}
	v.cut, v.fill, v.cutArea, v.fillArea = cut.Value(), fill.Value(), ca.Value(), fa.Value()
	v.zoneCut, v.zoneFill = make([]float64, nz), make([]float64, nz)
	for z := range zc {
		v.zoneCut[z], v.zoneFill[z] = zc[z].Value(), zf[z].Value()
	}
	return v
}

// water returns the water volume ∬ (W − E)⁺ = ∬ (−e)⁺ and the water
// surface area, which do not depend on W.
func (fd *field) water() (vol, area float64) {
	l := fd.lat
	wb := fd.zs.waterBox()
	ci0 := max(0, int(math.Floor((wb.Min.X-l.X0)/l.H))-1)
	ci1 := min(l.NX-2, int(math.Ceil((wb.Max.X-l.X0)/l.H))+1)
	cj0 := max(0, int(math.Floor((wb.Min.Y-l.Y0)/l.H))-1)
	cj1 := min(l.NY-2, int(math.Ceil((wb.Max.Y-l.Y0)/l.H))+1)
	if ci0 > ci1 || cj0 > cj1 {
		return 0, 0
	}
	nrows := cj1 - cj0 + 1
	nb := (nrows + bandRows - 1) / bandRows
	vs, as := make([]geom.Sum, nb), make([]geom.Sum, nb)
	ca := l.CellArea()
	neg := func(e float64) float64 {
		if e > infCap {
			return -infCap
		}
		return -e
	}
	forBands(nrows, func(band, r0, r1 int) {
		var buf clipBuf
		j0, j1 := cj0+r0, cj0+r1
		sp := fd.splitsIn(j0, j1)
		var f, fin [4]float64
		for cj := j0; cj < j1; cj++ {
			var rv, ra float64
			for ci := ci0; ci <= ci1; ci++ {
				c := ci + cj*l.NX
				for len(sp) > 0 && sp[0].cell < c {
					sp = sp[1:]
				}
				nd := fd.cellNodes(c)
				any := false
				for m, k := range nd {
					f[m] = neg(fd.e[k])
					any = any || f[m] > 0
				}
				if len(sp) > 0 && sp[0].cell == c {
					x := &sp[0]
					sp = sp[1:]
					for m := range nd {
						f[m], fin[m] = neg(x.eOut[m]), neg(x.eIn[m])
					}
					for t := range 2 {
						p0, _, a0, _ := triParts(t, ca, &f)
						p1, _, a1, _ := polyParts(t, ca, &f, x.part[t], &buf)
						p2, _, a2, _ := polyParts(t, ca, &fin, x.part[t], &buf)
						rv += p0 - p1 + p2
						ra += a0 - a1 + a2
					}
					continue
				}
				if !any {
					continue
				}
				for t := range 2 {
					p, _, a, _ := triParts(t, ca, &f)
					rv += p
					ra += a
				}
			}
			vs[band].Add(rv)
			as[band].Add(ra)
		}
	})
	var v, a geom.Sum
	for i := range vs {
		v.AddSum(vs[i])
		a.AddSum(as[i])
	}
	return v.Value(), a.Value()
}
