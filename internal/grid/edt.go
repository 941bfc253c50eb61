package grid

import "math"

// EDT returns, for every node, the exact Euclidean distance in metres from
// the node to the nearest node whose inside flag is set (0 at those
// nodes), computed with the separable lower-envelope-of-parabolas algorithm
// of Felzenszwalb & Huttenlocher, "Distance Transforms of Sampled
// Functions", Theory of Computing 8 (2012), 415–428. Squared distances are
// whole numbers of H² and are computed exactly; the cost is O(NX·NY). With
// no inside node every distance is +Inf. It panics if inside is shorter
// than l.Len() (a programming error).
func EDT(l Lattice, inside []bool) []float64 {
	n := l.Len()
	out := make([]float64, n)
	if n == 0 {
		return out
	}
	_ = inside[n-1]
	inf := math.Inf(1)
	for k := range out {
		if inside[k] {
			out[k] = 0
		} else {
			out[k] = inf
		}
	}
	m := max(l.NX, l.NY)
	f := make([]float64, m)
	d := make([]float64, m)
	v := make([]int, m)
	z := make([]float64, m+1)
	// Columns first (along y), then rows (along x), in units of H.
	for i := 0; i < l.NX; i++ {
		for j := 0; j < l.NY; j++ {
			f[j] = out[l.Index(i, j)]
		}
		dt1(f[:l.NY], d[:l.NY], v, z)
		for j := 0; j < l.NY; j++ {
			out[l.Index(i, j)] = d[j]
		}
	}
	for j := 0; j < l.NY; j++ {
		row := out[l.Index(0, j) : l.Index(0, j)+l.NX]
		copy(f, row)
		dt1(f[:l.NX], d[:l.NX], v, z)
		for i := range row {
			row[i] = math.Sqrt(d[i]) * l.H
		}
	}
	return out
}

// dt1 is the one-dimensional squared distance transform d(q) = min_p
// (q−p)² + f(p) of Felzenszwalb & Huttenlocher (2012), Algorithm 1, with
// infinite samples left out of the envelope (they can never be the
// minimum). v and z are scratch of length ≥ len(f) and len(f)+1.
func dt1(f, d []float64, v []int, z []float64) {
	n := len(f)
	inf := math.Inf(1)
	k := -1
	for q := 0; q < n; q++ {
		if math.IsInf(f[q], 1) {
			continue
		}
		fq := f[q] + float64(q*q)
		for k >= 0 {
			p := v[k]
			s := (fq - (f[p] + float64(p*p))) / float64(2*(q-p))
			if s > z[k] {
				k++
				v[k] = q
				z[k] = s
				z[k+1] = inf
				break
			}
			k--
		}
		if k < 0 {
			k = 0
			v[0] = q
			z[0] = -inf
			z[1] = inf
		}
	}
	if k < 0 {
		for q := range d[:n] {
			d[q] = inf
		}
		return
	}
	k = 0
	for q := 0; q < n; q++ {
		for z[k+1] < float64(q) {
			k++
		}
		p := v[k]
		d[q] = float64((q-p)*(q-p)) + f[p]
	}
}
