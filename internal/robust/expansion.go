package robust

import "math"

// Error-free transformations and expansion arithmetic after Shewchuk (1997),
// sections 2.5–2.8. An expansion is a slice of non-overlapping float64
// components in increasing order of magnitude whose exact sum is the value
// represented. The "zeroelim" routines drop zero components; they always
// return at least one component (a single 0 for the value zero).

// epsilon is half an ulp of 1 (2^-53), the unit roundoff of float64 under
// round-to-nearest; Shewchuk's ε.
const epsilon = 1.0 / (1 << 53)

// Error-bound coefficients from Shewchuk (1997), section 4 and predicates.c
// exactinit(), with ε = 2^-53.
const (
	resultErrBound = (3 + 8*epsilon) * epsilon
	ccwErrBoundA   = (3 + 16*epsilon) * epsilon
	ccwErrBoundB   = (2 + 12*epsilon) * epsilon
	ccwErrBoundC   = (9 + 64*epsilon) * epsilon * epsilon
	iccErrBoundA   = (10 + 96*epsilon) * epsilon
	iccErrBoundB   = (4 + 48*epsilon) * epsilon
	iccErrBoundC   = (44 + 576*epsilon) * epsilon * epsilon
)

// fastTwoSum returns x = fl(a+b) and the exact error y, so a+b = x+y.
// It requires |a| >= |b| (or a == 0).
func fastTwoSum(a, b float64) (x, y float64) {
	x = a + b
	bvirt := x - a
	y = b - bvirt
	return
}

// twoSum returns x = fl(a+b) and the exact error y, so a+b = x+y (Knuth).
func twoSum(a, b float64) (x, y float64) {
	x = a + b
	bvirt := x - a
	avirt := x - bvirt
	bround := b - bvirt
	around := a - avirt
	y = around + bround
	return
}

// twoDiff returns x = fl(a-b) and the exact error y, so a-b = x+y.
func twoDiff(a, b float64) (x, y float64) {
	x = a - b
	return x, twoDiffTail(a, b, x)
}

// twoDiffTail returns the exact error of x = fl(a-b).
func twoDiffTail(a, b, x float64) float64 {
	bvirt := a - x
	avirt := x + bvirt
	bround := bvirt - b
	around := a - avirt
	return around + bround
}

// twoProduct returns x = fl(a*b) and the exact error y, so a*b = x+y. The
// product is rounded on its own (float64 conversion forbids fusion) and the
// error is computed exactly by a fused multiply-add.
func twoProduct(a, b float64) (x, y float64) {
	x = float64(a * b)
	y = math.FMA(a, b, -x)
	return
}

// twoOneDiff returns the three-component expansion of (a1+a0) - b.
func twoOneDiff(a1, a0, b float64) (x2, x1, x0 float64) {
	i, x0 := twoDiff(a0, b)
	x2, x1 = twoSum(a1, i)
	return
}

// twoTwoDiff returns the four-component expansion of (a1+a0) - (b1+b0).
func twoTwoDiff(a1, a0, b1, b0 float64) (x3, x2, x1, x0 float64) {
	j, z, x0 := twoOneDiff(a1, a0, b0)
	x3, x2, x1 = twoOneDiff(j, z, b1)
	return
}

// estimate returns an approximation of the value of expansion e.
func estimate(e []float64) float64 {
	q := e[0]
	for _, c := range e[1:] {
		q += c
	}
	return q
}

// fastExpansionSumZeroElim sets h to the expansion of e + f and returns it.
// h must have room for len(e)+len(f) components and must not overlap e or f.
// Shewchuk (1997), Theorem 13 (fast_expansion_sum_zeroelim). e and f must be
// non-empty.
func fastExpansionSumZeroElim(e, f, h []float64) []float64 {
	elen, flen := len(e), len(f)
	enow, fnow := e[0], f[0]
	ei, fi := 0, 0
	var q float64
	if (fnow > enow) == (fnow > -enow) {
		q = enow
		ei++
	} else {
		q = fnow
		fi++
	}
	hi := 0
	var qnew, hh float64
	if ei < elen && fi < flen {
		enow, fnow = e[ei], f[fi]
		if (fnow > enow) == (fnow > -enow) {
			qnew, hh = fastTwoSum(enow, q)
			ei++
		} else {
			qnew, hh = fastTwoSum(fnow, q)
			fi++
		}
		q = qnew
		if hh != 0 {
			h[hi] = hh
			hi++
		}
		for ei < elen && fi < flen {
			enow, fnow = e[ei], f[fi]
			if (fnow > enow) == (fnow > -enow) {
				qnew, hh = twoSum(q, enow)
				ei++
			} else {
				qnew, hh = twoSum(q, fnow)
				fi++
			}
			q = qnew
			if hh != 0 {
				h[hi] = hh
				hi++
			}
		}
	}
	for ; ei < elen; ei++ {
		qnew, hh = twoSum(q, e[ei])
		q = qnew
		if hh != 0 {
			h[hi] = hh
			hi++
		}
	}
	for ; fi < flen; fi++ {
		qnew, hh = twoSum(q, f[fi])
		q = qnew
		if hh != 0 {
			h[hi] = hh
			hi++
		}
	}
	if q != 0 || hi == 0 {
		h[hi] = q
		hi++
	}
	return h[:hi]
}

// scaleExpansionZeroElim sets h to the expansion of e*b and returns it. h must
// have room for 2*len(e) components and must not overlap e. Shewchuk (1997),
// Theorem 19 (scale_expansion_zeroelim). e must be non-empty.
func scaleExpansionZeroElim(e []float64, b float64, h []float64) []float64 {
	q, hh := twoProduct(e[0], b)
	hi := 0
	if hh != 0 {
		h[hi] = hh
		hi++
	}
	for _, enow := range e[1:] {
		p1, p0 := twoProduct(enow, b)
		sum, hh := twoSum(q, p0)
		if hh != 0 {
			h[hi] = hh
			hi++
		}
		q, hh = fastTwoSum(p1, sum)
		if hh != 0 {
			h[hi] = hh
			hi++
		}
	}
	if q != 0 || hi == 0 {
		h[hi] = q
		hi++
	}
	return h[:hi]
}

// expSum returns a new expansion e + f.
func expSum(e, f []float64) []float64 {
	return fastExpansionSumZeroElim(e, f, make([]float64, len(e)+len(f)))
}

// expNeg returns a new expansion -e.
func expNeg(e []float64) []float64 {
	out := make([]float64, len(e))
	for i, c := range e {
		out[i] = -c
	}
	return out
}

// expMul returns a new expansion e*f, as the sum over the components of f of
// e scaled by each (distillation by repeated expansion sums).
func expMul(e, f []float64) []float64 {
	acc := scaleExpansionZeroElim(e, f[0], make([]float64, 2*len(e)))
	tmp := make([]float64, 2*len(e))
	for _, c := range f[1:] {
		s := scaleExpansionZeroElim(e, c, tmp)
		acc = fastExpansionSumZeroElim(acc, s, make([]float64, len(acc)+len(s)))
	}
	return acc
}
