package survey

import (
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/dugout-estimating/dugout/internal/crs"
)

// writeTemp writes content to a file called name in a fresh directory and
// returns its path.
func writeTemp(tb testing.TB, name, content string) string {
	tb.Helper()
	p := filepath.Join(tb.TempDir(), name)
	if err := os.WriteFile(p, []byte(content), 0o644); err != nil {
		tb.Fatal(err)
	}
	return p
}

// readString reads content as a file called name.
func readString(tb testing.TB, name, content string, opt Options) (*Set, error) {
	tb.Helper()
	return Read([]string{writeTemp(tb, name, content)}, opt)
}

// mustRead reads files and fails the test on error.
func mustRead(tb testing.TB, opt Options, paths ...string) *Set {
	tb.Helper()
	s, err := Read(paths, opt)
	if err != nil {
		tb.Fatalf("Read(%v): %v", paths, err)
	}
	return s
}

// readData reads data as if from a file called name, without touching
// the disk (the fuzz targets use it).
func readData(name string, data []byte, opt Options) (*Set, error) {
	o := opt.withDefaults()
	f, err := readBytes(name, strings.ToLower(filepath.Ext(name)), data, &o, nil)
	if err != nil {
		return nil, err
	}
	return assemble([]*rawFile{f}, &o)
}

func mustSpec(tb testing.TB, s string) crs.Spec {
	tb.Helper()
	sp, err := crs.Parse(s)
	if err != nil {
		tb.Fatal(err)
	}
	return sp
}

// closeTo reports whether got is within tol of want (absolute).
func closeTo(got, want, tol float64) bool { return math.Abs(got-want) <= tol }

// hasWarning reports whether some warning contains sub.
func hasWarning(ws []Warning, sub string) bool {
	for _, w := range ws {
		if strings.Contains(w.Msg, sub) {
			return true
		}
	}
	return false
}

// checkInvariants asserts what every successfully read set must satisfy.
func checkInvariants(tb testing.TB, s *Set, allowMissingZ bool) {
	tb.Helper()
	n := 0
	for _, f := range s.Files {
		n += f.Points
	}
	if n != len(s.Points) {
		tb.Fatalf("files count %d points, set has %d", n, len(s.Points))
	}
	for _, p := range s.Points {
		if !p.P.XY().IsFinite() {
			tb.Fatalf("point %q at %s:%d has non-finite plan position %v", p.ID, p.File, p.Line, p.P)
		}
		if !p.HasZ() && !allowMissingZ {
			tb.Fatalf("point %q has no elevation without AllowMissingZ", p.ID)
		}
		if math.IsInf(p.P.Z, 0) {
			tb.Fatalf("point %q has infinite elevation", p.ID)
		}
		if p.HAccM < 0 || p.VAccM < 0 {
			tb.Fatalf("point %q has negative accuracy %v %v", p.ID, p.HAccM, p.VAccM)
		}
	}
	for _, l := range s.Breaklines {
		if len(l.Pts) < 2 {
			tb.Fatalf("breakline %q has %d points", l.Name, len(l.Pts))
		}
	}
	for _, b := range s.Boundaries {
		if len(b.Ring) < 3 {
			tb.Fatalf("boundary %q has %d vertices", b.Name, len(b.Ring))
		}
	}
	sum := s.Summary()
	if sum.Count != len(s.Points) {
		tb.Fatalf("Summary().Count = %d, want %d", sum.Count, len(s.Points))
	}
}

func mustReadFile(tb testing.TB, path string) []byte {
	tb.Helper()
	b, err := os.ReadFile(path)
	if err != nil {
		tb.Fatal(err)
	}
	return b
}
