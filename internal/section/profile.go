package section

import (
	"errors"
	"fmt"
	"math"

	"github.com/dugout-estimating/dugout/internal/geom"
)

// Sampler is a surface that can be asked for its elevation (m) at a plan
// position in the local frame; ok is false where it has no value.
type Sampler interface {
	Elevation(x, y float64) (z float64, ok bool)
}

// Profile is a set of surfaces sampled along a plan polyline. Chainage[j]
// (m, increasing) is the plan distance of sample j from the path's start
// and XY[j] its plan position; Z[k][j] is surface k's elevation there (m),
// NaN where that surface has no value.
type Profile struct {
	Chainage []float64
	XY       []geom.Vec2
	Z        [][]float64
}

// Errors returned (wrapped) by [Along].
var (
	// ErrShortPath is wrapped when the path has fewer than two vertices.
	ErrShortPath = errors.New("section: path needs at least 2 vertices")
	// ErrNonFinite is wrapped when a path vertex is NaN or infinite.
	ErrNonFinite = errors.New("section: path vertex is not finite")
	// ErrZeroLength is wrapped when all the path's vertices coincide.
	ErrZeroLength = errors.New("section: path has zero length")
	// ErrStep is wrapped when the sampling step is not a positive finite
	// number of metres.
	ErrStep = errors.New("section: step must be a finite number > 0 m")
	// ErrTooManySamples is wrapped when the profile would exceed
	// [MaxSamples].
	ErrTooManySamples = errors.New("section: too many samples")
	// ErrNilSurface is wrapped when a surface is nil.
	ErrNilSurface = errors.New("section: surface is nil")
)

// MaxSamples bounds the samples of one profile (80 MB per surface), so that
// a step mistyped in the wrong unit fails instead of exhausting memory.
const MaxSamples = 10_000_000

// InputError reports a bad argument to [Along]: Name says which ("path
// vertex", "step", "samples", "surface"), Index its index where it has one
// (else -1) and Value the offending number.
type InputError struct {
	Name  string
	Index int
	Value float64
	Err   error
}

func (e *InputError) Error() string {
	idx := ""
	if e.Index >= 0 {
		idx = fmt.Sprintf(" %d", e.Index)
	}
	return fmt.Sprintf("%v (%s%s: %g)", e.Err, e.Name, idx, e.Value)
}

// Unwrap returns the sentinel error.
func (e *InputError) Unwrap() error { return e.Err }

// stationMergeM is the distance (m) below which two stations are taken as
// one: 1e-9 m is well above the round-off of chainages summed over paths up
// to 1000 km (one unit in the last place of 1e6 is 1.2e-10) and far below
// any survey precision. Its only use is to avoid near-duplicate samples when
// a regular station falls on a vertex.
const stationMergeM = 1e-9

// pathChainage checks path and returns the chainage of each vertex.
func pathChainage(path geom.Polyline) ([]float64, error) {
	if len(path) < 2 {
		return nil, &InputError{Name: "path vertices", Index: -1, Value: float64(len(path)), Err: ErrShortPath}
	}
	c := make([]float64, len(path))
	var s geom.Sum
	for i, p := range path {
		if !p.IsFinite() {
			v := p.X
			if !math.IsNaN(v) && !math.IsInf(v, 0) {
				v = p.Y
			}
			return nil, &InputError{Name: "path vertex", Index: i, Value: v, Err: ErrNonFinite}
		}
		if i > 0 {
			s.Add(path[i-1].Distance(p))
		}
		c[i] = s.Value()
	}
	if c[len(c)-1] == 0 {
		return nil, &InputError{Name: "path length", Index: -1, Value: 0, Err: ErrZeroLength}
	}
	return c, nil
}

// Along samples the surfaces along path: at every vertex of path and at
// every multiple of stepM (m) of chainage from its start, a station closer
// than a nanometre to a vertex being merged into it. Repeated vertices give
// one station. Z has one row per surface, in the order given; a surface
// with no value at a station, or a non-finite one, gives NaN there.
//
// Errors: an [*InputError] wrapping [ErrShortPath], [ErrNonFinite],
// [ErrZeroLength], [ErrStep], [ErrTooManySamples] or [ErrNilSurface].
// path is not modified. Cost: one Elevation call per station and surface.
func Along(path geom.Polyline, stepM float64, surfaces ...Sampler) (Profile, error) {
	vc, err := pathChainage(path)
	if err != nil {
		return Profile{}, err
	}
	if !(stepM > 0) || math.IsInf(stepM, 0) {
		return Profile{}, &InputError{Name: "step", Index: -1, Value: stepM, Err: ErrStep}
	}
	total := vc[len(vc)-1]
	if n := total/stepM + float64(len(path)); n > MaxSamples {
		return Profile{}, &InputError{Name: "samples", Index: -1, Value: math.Ceil(n), Err: ErrTooManySamples}
	}
	for k, s := range surfaces {
		if s == nil {
			return Profile{}, &InputError{Name: "surface", Index: k, Value: float64(k), Err: ErrNilSurface}
		}
	}

	var p Profile
	add := func(c float64, xy geom.Vec2) {
		if n := len(p.Chainage); n > 0 && c-p.Chainage[n-1] <= stationMergeM {
			return
		}
		p.Chainage = append(p.Chainage, c)
		p.XY = append(p.XY, xy)
	}
	k := 1 // next regular station k·stepM
	for i := 0; i+1 < len(path); i++ {
		a, b := path[i], path[i+1]
		c0, c1 := vc[i], vc[i+1]
		add(c0, a)
		for ; float64(k)*stepM < c1-stationMergeM; k++ {
			s := float64(k) * stepM
			if s-c0 <= stationMergeM {
				continue
			}
			add(s, a.Lerp(b, (s-c0)/(c1-c0)))
		}
	}
	add(total, path[len(path)-1])

	p.Z = make([][]float64, len(surfaces))
	for k, s := range surfaces {
		z := make([]float64, len(p.XY))
		for j, q := range p.XY {
			v, ok := s.Elevation(q.X, q.Y)
			if !ok || math.IsNaN(v) || math.IsInf(v, 0) {
				v = math.NaN()
			}
			z[j] = v
		}
		p.Z[k] = z
	}
	return p, nil
}

// DevelopedLength returns the 3-D length (m) of surface k's profile between
// chainages from and to: the sum of √(Δchainage² + Δz²) over consecutive
// samples, the profile being taken as straight between samples (exact for a
// profile from [AlongMesh]), with the end pieces cut in proportion. from and
// to may be given in either order and are clamped to the profile; a piece
// with NaN at either end (no surface) adds nothing. It returns NaN when k is
// not a surface index of p.
func (p Profile) DevelopedLength(k int, from, to float64) float64 {
	if k < 0 || k >= len(p.Z) || len(p.Z[k]) != len(p.Chainage) {
		return math.NaN()
	}
	if from > to {
		from, to = to, from
	}
	z := p.Z[k]
	var s geom.Sum
	for j := 0; j+1 < len(p.Chainage); j++ {
		c0, c1 := p.Chainage[j], p.Chainage[j+1]
		lo, hi := math.Max(c0, from), math.Min(c1, to)
		if !(hi > lo) || !(c1 > c0) || math.IsNaN(z[j]) || math.IsNaN(z[j+1]) {
			continue
		}
		full := math.Hypot(c1-c0, z[j+1]-z[j])
		s.Add(full * (hi - lo) / (c1 - c0))
	}
	return s.Value()
}
