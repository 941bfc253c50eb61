package tin

import (
	"errors"
	"math"
	"strings"
	"testing"

	"github.com/dugout-estimating/dugout/internal/geom"
)

func TestParseDupPolicy(t *testing.T) {
	tests := []struct {
		in   string
		want DupPolicy
		err  bool
	}{
		{"mean", DupMean, false},
		{" First ", DupFirst, false},
		{"ERROR", DupError, false},
		{"", DupMean, true},
		{"last", DupMean, true},
		{"meanx", DupMean, true},
	}
	for _, tt := range tests {
		got, err := ParseDupPolicy(tt.in)
		if got != tt.want || (err != nil) != tt.err {
			t.Errorf("ParseDupPolicy(%q) = %v, %v; want %v, error %v", tt.in, got, err, tt.want, tt.err)
		}
		if err != nil && !errors.Is(err, ErrOption) {
			t.Errorf("ParseDupPolicy(%q) error %v does not wrap ErrOption", tt.in, err)
		}
	}
	for _, p := range []DupPolicy{DupMean, DupFirst, DupError} {
		if got, err := ParseDupPolicy(p.String()); err != nil || got != p {
			t.Errorf("ParseDupPolicy(%v.String()) = %v, %v", p, got, err)
		}
	}
	if got := DupPolicy(9).String(); got != "DupPolicy(9)" {
		t.Errorf("DupPolicy(9).String() = %q", got)
	}
}

func FuzzParseDupPolicy(f *testing.F) {
	for _, s := range []string{"mean", "first", "error", " Mean", "", "x"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		p, err := ParseDupPolicy(s)
		if err != nil {
			return
		}
		if q, err := ParseDupPolicy(p.String()); err != nil || q != p {
			t.Fatalf("round trip of %q: %v, %v", s, q, err)
		}
	})
}

// TestDuplicates checks the merge policies on a square with repeated shots
// at (5, 5): values are the arithmetic mean or the first shot (in input
// order), and the conflict tolerance (default 0.05 m) decides warnings and,
// under DupError, errors.
func TestDuplicates(t *testing.T) {
	base := "0 0 0; 10 0 0; 10 10 0; 0 10 0"
	tests := []struct {
		name      string
		pts       string
		opt       Options
		wantZ     float64
		conflicts int
		merged    int
		err       bool
	}{
		{"mean agree", "; 5 5 1.00; 5 5 1.02; 5 5 1.04", Options{}, 1.02, 0, 2, false},
		{"mean conflict", "; 5 5 1.00; 5 5 1.10", Options{}, 1.05, 1, 1, false},
		{"first conflict", "; 5 5 1.30; 5 5 1.10; 5 5 1.20", Options{Duplicates: DupFirst}, 1.30, 1, 2, false},
		{"error agree", "; 5 5 1.00; 5 5 1.02", Options{Duplicates: DupError}, 1.01, 0, 1, false},
		{"error conflict", "; 5 5 1.00; 5 5 1.10", Options{Duplicates: DupError}, 0, 1, 1, true},
		{"tolerance option", "; 5 5 1.00; 5 5 1.10", Options{Duplicates: DupError, ConflictTolM: 0.2}, 1.05, 0, 1, false},
		{"merge distance", "; 5 5 1.00; 5.0004 5 1.02; 5 5.002 2", Options{MergeTolM: 0.001}, 1.01, 0, 1, false},
		{"merge distance keeps first position", "; 5.0004 5 1.00; 5 5 1.02", Options{MergeTolM: 0.001}, 1.01, 0, 1, false},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			pts := parsePts(t, base+tt.pts)
			s, err := Build(pts, tt.opt)
			if tt.err {
				var de *DuplicateError
				if !errors.As(err, &de) || !errors.Is(err, ErrDuplicateConflict) {
					t.Fatalf("Build: error %v, want *DuplicateError", err)
				}
				if len(de.Indices) != 2 || de.Indices[0] != 4 || de.Indices[1] != 5 || de.At != v2(5, 5) {
					t.Errorf("DuplicateError %+v, want points 4 and 5 at (5, 5)", de)
				}
				if !strings.Contains(err.Error(), "4 5") {
					t.Errorf("message %q does not name the points", err)
				}
				return
			}
			if err != nil {
				t.Fatal(err)
			}
			if err := s.Validate(); err != nil {
				t.Fatal(err)
			}
			x := pts[4].X
			z, ok := s.Elevation(x, 5)
			if !ok || math.Abs(z-tt.wantZ) > 1e-12 {
				t.Errorf("Elevation(%g, 5) = %g, %v; want %g", x, z, ok, tt.wantZ)
			}
			sum := s.Summary()
			if sum.DuplicateConflicts != tt.conflicts || sum.DuplicatesMerged != tt.merged {
				t.Errorf("conflicts %d, merged %d; want %d, %d", sum.DuplicateConflicts, sum.DuplicatesMerged, tt.conflicts, tt.merged)
			}
			if got := len(s.Warnings()); got != tt.conflicts {
				t.Errorf("%d warnings, want %d: %v", got, tt.conflicts, s.Warnings())
			}
		})
	}
}

// TestDuplicates_MergeChain: the merge tolerance groups points by their
// distance to the group's first point, not transitively, so a chain of
// points 0.8 mm apart with a 1 mm tolerance becomes several vertices.
func TestDuplicates_MergeChain(t *testing.T) {
	pts := parsePts(t, "0 0 0; 10 0 0; 10 10 0; 0 10 0")
	for k := range 6 {
		pts = append(pts, v3(5+0.0008*float64(k), 5, 1))
	}
	s := mustBuild(t, pts, Options{MergeTolM: 0.001})
	// Groups: {0, 0.8}, {1.6, 2.4}, {3.2, 4.0} mm.
	if got := s.Summary().Vertices; got != 4+3 {
		t.Errorf("vertices = %d, want 7", got)
	}
}

// TestDuplicates_WarningCap: one warning per conflicting group up to the cap,
// then one summary warning.
func TestDuplicates_WarningCap(t *testing.T) {
	var pts []geom.Vec3
	for i := range 150 {
		x := float64(i % 15)
		y := float64(i / 15)
		pts = append(pts, v3(x, y, 0), v3(x, y, 1))
	}
	s := mustBuild(t, pts, Options{})
	if got := len(s.Warnings()); got != maxWarningsPerKind+1 {
		t.Errorf("%d warnings, want %d", got, maxWarningsPerKind+1)
	}
	if s.Summary().DuplicateConflicts != 150 {
		t.Errorf("conflicts = %d, want 150", s.Summary().DuplicateConflicts)
	}
}

// TestDuplicates_TinyTolerance: a merge tolerance too small for the
// coordinates' magnitude is refused, not overflowed.
func TestDuplicates_TinyTolerance(t *testing.T) {
	pts := parsePts(t, "0 0 0; 1e10 0 0; 0 1e10 0")
	if _, err := Build(pts, Options{MergeTolM: 1e-300}); !errors.Is(err, ErrOption) {
		t.Errorf("error %v, want ErrOption", err)
	}
}
