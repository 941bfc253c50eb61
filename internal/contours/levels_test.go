package contours_test

import (
	"errors"
	"fmt"
	"math"
	"slices"
	"strings"
	"testing"

	"github.com/dugout-estimating/dugout/internal/contours"
	"github.com/dugout-estimating/dugout/internal/units"
)

// TestLevels checks the level arithmetic base + k·interval (analytic) on
// ranges whose ends fall on, between and outside levels.
func TestLevels(t *testing.T) {
	nan := math.NaN()
	ft := units.USSurveyFoot // 1200/3937 m exactly (85 FR 62698, 2020)
	for _, tc := range []struct {
		name       string
		zmin, zmax float64
		o          contours.Options
		want       []float64
	}{
		{"between", 99.8, 101.3, contours.Options{IntervalM: 0.5, MinLevel: nan, MaxLevel: nan}, []float64{100, 100.5, 101}},
		{"ends on levels", 100, 101, contours.Options{IntervalM: 0.5, MinLevel: nan, MaxLevel: nan}, []float64{100, 100.5, 101}},
		{"base", 99.8, 101.3, contours.Options{IntervalM: 0.5, BaseM: 0.2, MinLevel: nan, MaxLevel: nan}, []float64{100.2, 100.7, 101.2}},
		{"negative base", 0, 3, contours.Options{IntervalM: 1, BaseM: -7.5, MinLevel: nan, MaxLevel: nan}, []float64{0.5, 1.5, 2.5}},
		{"below zero", -2.2, -0.1, contours.Options{IntervalM: 1, MinLevel: nan, MaxLevel: nan}, []float64{-2, -1}},
		{"bounds", 90, 110, contours.Options{IntervalM: 2, MinLevel: 99, MaxLevel: 104}, []float64{100, 102, 104}},
		{"min bound only", 90, 96, contours.Options{IntervalM: 2, MinLevel: 93, MaxLevel: nan}, []float64{94, 96}},
		{"daylight", -3, 2, contours.Options{IntervalM: 0.25, MinLevel: 0, MaxLevel: 0}, []float64{0}},
		{"bounds outside data", 10, 11, contours.Options{IntervalM: 1, MinLevel: 20, MaxLevel: 30}, nil},
		{"single point", 5, 5, contours.Options{IntervalM: 1, MinLevel: nan, MaxLevel: nan}, []float64{5}},
		{"none", 5.1, 5.9, contours.Options{IntervalM: 1, MinLevel: nan, MaxLevel: nan}, nil},
		{"empty range", 6, 5, contours.Options{IntervalM: 1, MinLevel: nan, MaxLevel: nan}, nil},
		// Half-foot contours (in US survey feet) computed in metres land on
		// whole and half feet: level k is k·(0.5 ft) in metres.
		{"half feet", 7090.2 * ft, 7091.6 * ft, contours.Options{IntervalM: 0.5 * ft, MinLevel: nan, MaxLevel: nan},
			[]float64{14181 * (0.5 * ft), 14182 * (0.5 * ft), 14183 * (0.5 * ft)}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			got, err := contours.Levels(tc.zmin, tc.zmax, tc.o)
			if err != nil {
				t.Fatalf("Levels(%g, %g) error %v", tc.zmin, tc.zmax, err)
			}
			if !slices.Equal(got, tc.want) {
				t.Errorf("Levels(%g, %g) = %v, want %v", tc.zmin, tc.zmax, got, tc.want)
			}
		})
	}
}

// TestLevels_Errors checks that bad options are rejected with the offending
// value in the error.
func TestLevels_Errors(t *testing.T) {
	nan := math.NaN()
	for _, tc := range []struct {
		name       string
		zmin, zmax float64
		o          contours.Options
		want       error
	}{
		{"zero interval", 0, 1, contours.Options{}, contours.ErrInterval},
		{"negative interval", 0, 1, contours.Options{IntervalM: -1}, contours.ErrInterval},
		{"nan interval", 0, 1, contours.Options{IntervalM: nan}, contours.ErrInterval},
		{"inf interval", 0, 1, contours.Options{IntervalM: math.Inf(1)}, contours.ErrInterval},
		{"nan base", 0, 1, contours.Options{IntervalM: 1, BaseM: nan}, contours.ErrOptions},
		{"negative index", 0, 1, contours.Options{IntervalM: 1, IndexEvery: -5}, contours.ErrOptions},
		{"inverted bounds", 0, 1, contours.Options{IntervalM: 1, MinLevel: 2, MaxLevel: 1}, contours.ErrOptions},
		{"infinite bound", 0, 1, contours.Options{IntervalM: 1, MinLevel: math.Inf(-1), MaxLevel: nan}, contours.ErrOptions},
		{"nan range", nan, 1, contours.Options{IntervalM: 1, MinLevel: nan, MaxLevel: nan}, contours.ErrOptions},
	} {
		t.Run(tc.name, func(t *testing.T) {
			if _, err := contours.Levels(tc.zmin, tc.zmax, tc.o); !errors.Is(err, tc.want) {
				t.Errorf("Levels error %v, want %v", err, tc.want)
			}
		})
	}
	for _, tc := range []struct {
		name       string
		interval   float64
		zmin, zmax float64
		n          float64
	}{
		{"mistyped interval", 0.0001, 90, 110, 200001},
		{"tiny interval", 1e-300, 0, 1, 1e300},
	} {
		t.Run(tc.name, func(t *testing.T) {
			_, err := contours.Levels(tc.zmin, tc.zmax, contours.Options{IntervalM: tc.interval, MinLevel: nan, MaxLevel: nan})
			var tm *contours.TooManyLevelsError
			if !errors.As(err, &tm) || tm.Limit != contours.MaxLevels || math.Abs(tm.N-tc.n) > 1e-9*tc.n {
				t.Fatalf("Levels error %v, want TooManyLevelsError with N %g", err, tc.n)
			}
			if msg := err.Error(); !strings.Contains(msg, fmt.Sprintf("interval %g m", tc.interval)) || !strings.Contains(msg, fmt.Sprintf("%.6g levels", tc.n)) {
				t.Errorf("message %q does not name the interval and the count", msg)
			}
		})
	}
	// Exactly MaxLevels levels are fine.
	got, err := contours.Levels(1, contours.MaxLevels, contours.Options{IntervalM: 1, MinLevel: nan, MaxLevel: nan})
	if err != nil || len(got) != contours.MaxLevels {
		t.Errorf("Levels(1, %d, interval 1) = %d levels, %v; want %d", contours.MaxLevels, len(got), err, contours.MaxLevels)
	}
}
