package contours

import (
	"errors"
	"fmt"
	"math"
)

// MaxLevels is the largest number of levels [Levels] and [Trace] accept in
// one call. It allows 1 cm contours over 100 m of relief, far more than any
// drawing can show, and stops a mistaken interval (0.001 instead of 1)
// from running for minutes and filling memory.
const MaxLevels = 10000

// DefaultIndexEvery is the spacing of index contours, in levels, when
// [Options.IndexEvery] is zero: every fifth line is an index line (common
// practice on topographic drawings, no source).
const DefaultIndexEvery = 5

// ErrInterval is returned (wrapped, with the value) when the contour
// interval is not a finite number greater than zero.
var ErrInterval = errors.New("contours: interval must be a finite number > 0 m")

// ErrOptions is returned (wrapped, with the offending field and value) for
// other invalid [Options]: a non-finite base, a negative IndexEvery, an
// infinite level bound, or MinLevel > MaxLevel.
var ErrOptions = errors.New("contours: invalid options")

// TooManyLevelsError reports an interval so small for the elevation range
// that it would make more than [MaxLevels] levels.
type TooManyLevelsError struct {
	IntervalM float64 // the interval asked for, m
	LoM, HiM  float64 // the elevation range the levels were to cover, m
	N         float64 // the number of levels it would make
	Limit     int     // MaxLevels
}

func (e *TooManyLevelsError) Error() string {
	return fmt.Sprintf("contours: interval %g m from %g m to %g m makes %.6g levels, more than the limit of %d",
		e.IntervalM, e.LoM, e.HiM, e.N, e.Limit)
}

// Options say which contour levels to trace.
//
// Levels are BaseM + k·IntervalM for integer k, so that, for example, a
// 0.5 ft interval with base 0 lands on whole and half feet of the user's
// datum; the caller converts both to metres. Only levels within the
// elevation range of the mesh and within [MinLevel, MaxLevel] are traced.
// MinLevel and MaxLevel are NaN to take the bound from the data; note that
// their zero value is a real bound at 0 m (useful for the daylight line of a
// cut/fill depth mesh: MinLevel = MaxLevel = 0), so set them to NaN
// explicitly otherwise.
type Options struct {
	// IntervalM is the vertical spacing between contour levels, m (> 0).
	IntervalM float64
	// BaseM is the elevation of one level, m; the others are spaced
	// IntervalM from it.
	BaseM float64
	// IndexEvery makes the levels with k a multiple of IndexEvery index
	// lines (drawn heavier, labelled); 0 means DefaultIndexEvery.
	IndexEvery int
	// Smooth rounds the corners of each line (see [Trace]); off by default.
	Smooth bool
	// MinLevel and MaxLevel bound the levels traced, m; NaN means no bound
	// beyond the data's own elevation range.
	MinLevel, MaxLevel float64
}

func (o Options) check() error {
	if !(o.IntervalM > 0) || math.IsInf(o.IntervalM, 0) {
		return fmt.Errorf("%w, got %g", ErrInterval, o.IntervalM)
	}
	if math.IsNaN(o.BaseM) || math.IsInf(o.BaseM, 0) {
		return fmt.Errorf("%w: base must be a finite elevation in m, got %g", ErrOptions, o.BaseM)
	}
	if o.IndexEvery < 0 {
		return fmt.Errorf("%w: index every must be >= 0 levels, got %d", ErrOptions, o.IndexEvery)
	}
	if math.IsInf(o.MinLevel, 0) || math.IsInf(o.MaxLevel, 0) {
		return fmt.Errorf("%w: level bounds must be finite or NaN, got %g and %g m", ErrOptions, o.MinLevel, o.MaxLevel)
	}
	if o.MinLevel > o.MaxLevel {
		return fmt.Errorf("%w: min level %g m is above max level %g m", ErrOptions, o.MinLevel, o.MaxLevel)
	}
	return nil
}

func (o Options) indexEvery() int {
	if o.IndexEvery == 0 {
		return DefaultIndexEvery
	}
	return o.IndexEvery
}

// levelSet is the list of levels to trace with their step numbers k
// (level = base + k·interval).
type levelSet struct {
	z []float64
	k []int64
}

// Levels returns the contour levels base + k·interval (ascending, m) that
// lie in the closed range [zmin, zmax] and within the bounds of o. The
// levels are computed as o.BaseM + float64(k)*o.IntervalM, exactly as
// [Trace] computes them.
//
// It returns an error wrapping [ErrInterval] when the interval is not a
// finite number > 0, one wrapping [ErrOptions] for other bad options, and a
// [*TooManyLevelsError] when the range would need more than [MaxLevels]
// levels. It returns no levels (and no error) when the range is empty
// (zmin > zmax, or the bounds exclude it) and an error for non-finite zmin or
// zmax.
func Levels(zmin, zmax float64, o Options) ([]float64, error) {
	ls, err := levels(zmin, zmax, o)
	return ls.z, err
}

func levels(zmin, zmax float64, o Options) (levelSet, error) {
	if err := o.check(); err != nil {
		return levelSet{}, err
	}
	if math.IsNaN(zmin) || math.IsNaN(zmax) || math.IsInf(zmin, 0) || math.IsInf(zmax, 0) {
		return levelSet{}, fmt.Errorf("%w: elevation range must be finite, got %g to %g m", ErrOptions, zmin, zmax)
	}
	lo, hi := zmin, zmax
	if !math.IsNaN(o.MinLevel) {
		lo = math.Max(lo, o.MinLevel)
	}
	if !math.IsNaN(o.MaxLevel) {
		hi = math.Min(hi, o.MaxLevel)
	}
	if lo > hi {
		return levelSet{}, nil
	}
	// Estimate the step numbers in floating point, check the count before
	// converting to integers (a tiny interval makes them huge), then fix
	// the ends up with the exact level formula so that every level within
	// [lo, hi] is included and none outside.
	kl := math.Ceil((lo - o.BaseM) / o.IntervalM)
	kh := math.Floor((hi - o.BaseM) / o.IntervalM)
	if n := kh - kl + 1; n > MaxLevels || math.IsInf(n, 0) || math.IsNaN(n) || math.Abs(kl) > 1<<52 || math.Abs(kh) > 1<<52 {
		return levelSet{}, &TooManyLevelsError{IntervalM: o.IntervalM, LoM: lo, HiM: hi, N: n, Limit: MaxLevels}
	}
	at := func(k int64) float64 { return o.BaseM + float64(k)*o.IntervalM }
	k0, k1 := int64(kl), int64(kh)
	// The estimate is off by at most one step in practice; the loops are
	// bounded so that an interval below the float spacing of the levels
	// cannot make them run long.
	for i := 0; i < fixupSteps && at(k0-1) >= lo; i++ {
		k0--
	}
	for i := 0; i < fixupSteps && at(k0) < lo; i++ {
		k0++
	}
	for i := 0; i < fixupSteps && at(k1+1) <= hi; i++ {
		k1++
	}
	for i := 0; i < fixupSteps && at(k1) > hi; i++ {
		k1--
	}
	if k1 < k0 {
		return levelSet{}, nil
	}
	if n := k1 - k0 + 1; n > MaxLevels {
		return levelSet{}, &TooManyLevelsError{IntervalM: o.IntervalM, LoM: lo, HiM: hi, N: float64(n), Limit: MaxLevels}
	}
	ls := levelSet{z: make([]float64, 0, k1-k0+1), k: make([]int64, 0, k1-k0+1)}
	for k := k0; k <= k1; k++ {
		z := at(k)
		if z < lo || z > hi {
			continue
		}
		if n := len(ls.z); n > 0 && z <= ls.z[n-1] {
			continue // the interval is below the spacing of floats here
		}
		ls.z = append(ls.z, z)
		ls.k = append(ls.k, k)
	}
	return ls, nil
}

// fixupSteps bounds the correction of the floating-point estimate of the
// first and last step numbers in levels.
const fixupSteps = 4

// isIndex reports whether step k is an index level for spacing every (> 0).
func isIndex(k int64, every int) bool {
	e := int64(every)
	return ((k%e)+e)%e == 0
}
