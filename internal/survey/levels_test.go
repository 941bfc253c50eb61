package survey

import (
	"errors"
	"strings"
	"testing"

	"github.com/dugout-estimating/dugout/internal/units"
)

// TestReadLevels_Loop checks the height-of-instrument reduction on a loop
// of our own (testdata/levels_loop.csv), worked by hand:
//
//	BM1  elev 100.000, BS 1.234          HI = 101.234
//	P1   IS 1.500                        101.234 − 1.500 =  99.734
//	P2   IS 2.105                        101.234 − 2.105 =  99.129
//	TP1  FS 2.456                        101.234 − 2.456 =  98.778
//	TP1  BS 0.987 (next row)             HI =  98.778 + 0.987 =  99.765
//	P3   IS 1.111                         99.765 − 1.111 =  98.654
//	TP2  FS 1.876, BS 2.345 (one row)     99.765 − 1.876 =  97.889, HI = 100.234
//	P4   IS 0.500                        100.234 − 0.500 =  99.734
//	BM1  FS 0.236, known 100.000         100.234 − 0.236 =  99.998
//
// Misclosure 99.998 − 100.000 = −0.002 m. Arithmetic check (any
// surveying text on differential levelling): ΣBS − ΣFS = 4.566 − 4.568 =
// −0.002 = last − first.
func TestReadLevels_Loop(t *testing.T) {
	s := mustRead(t, Options{}, "testdata/levels_loop.csv")
	checkInvariants(t, s, false)
	want := []struct {
		id string
		z  float64
	}{{"BM1", 100}, {"P1", 99.734}, {"P2", 99.129}, {"P3", 98.654}, {"TP2", 97.889}, {"P4", 99.734}}
	if len(s.Points) != len(want) {
		t.Fatalf("got %d points %+v, want %d", len(s.Points), s.Points, len(want))
	}
	const tol = 1e-9 // m; the sums are of 3-decimal readings
	for i, w := range want {
		if p := s.Points[i]; p.ID != w.id || !closeTo(p.P.Z, w.z, tol) {
			t.Errorf("point %d = %s z %.6f, want %s z %.3f", i, p.ID, p.P.Z, w.id, w.z)
		}
	}
	info := s.Files[0].Levels
	if s.Files[0].Format != FormatLevels || info == nil {
		t.Fatalf("FileInfo = %+v, want a level book", s.Files[0])
	}
	if info.Setups != 3 || info.TurningPoints != 2 || info.Unplaced != 1 || len(info.Checks) != 1 {
		t.Errorf("LevelInfo = %+v, want 3 setups, 2 turning points, 1 unplaced, 1 check", *info)
	}
	if c := info.Checks[0]; c.Point != "BM1" || c.Line != 12 || !closeTo(c.MisclosureM, -0.002, tol) || !closeTo(c.ComputedM, 99.998, tol) {
		t.Errorf("check = %+v, want BM1 line 12 computed 99.998 misclosure -0.002", c)
	}
}

func TestReadLevels_Feet(t *testing.T) {
	// Readings in feet: BM 50.00 ft, BS 4.25 → HI 54.25; IS 6.10 → 48.15 ft.
	content := "point,e,n,bs,is,fs,elevation\nBM,0,0,4.25,,,50.00\nA,10,0,,6.10,,\n"
	s, err := readString(t, "lv.csv", content, Options{Units: units.Feet})
	if err != nil {
		t.Fatal(err)
	}
	if got := s.Points[1].P.Z; !closeTo(got, 48.15*units.Foot, 1e-9) {
		t.Errorf("A z = %v m, want %v", got, 48.15*units.Foot)
	}
}

func TestReadLevels_RodTooLong(t *testing.T) {
	// 12.4 read as metres is longer than any rod: feet?
	content := "point,e,n,bs,is,elevation\nBM,0,0,4.1,,100\nA,10,0,,12.4,\n"
	s, err := readString(t, "lv.csv", content, Options{})
	if err != nil {
		t.Fatal(err)
	}
	if !hasWarning(s.Warnings, "longer than a levelling rod") {
		t.Errorf("warnings %v, want the rod-length warning", s.Warnings)
	}
}

func TestReadLevels_Bad(t *testing.T) {
	hdr := "point,easting,northing,bs,is,fs,elevation\n"
	tests := []struct {
		name, body string
		want       error
		line       int
	}{
		{"first row not a benchmark", "A,0,0,1.2,,,\n", ErrLevels, 2},
		{"sight before any backsight", "A,0,0,,1.2,,\n", ErrLevels, 2},
		{"is and fs on one row", "BM,0,0,1,,,100\nA,1,1,,1.2,1.3,\n", ErrLevels, 3},
		{"bs and is on one row", "BM,0,0,1,,,100\nA,1,1,1,1.2,,\n", ErrLevels, 3},
		{"no reading", "BM,0,0,1,,,100\nA,1,1,,,,\n", ErrLevels, 3},
		{"sight after a foresight", "BM,0,0,1,,,100\nTP,,,,,1.5,\nA,1,1,,1.2,,\n", ErrLevels, 4},
		{"backsight on an unknown point", "BM,0,0,1,,,100\nTP,,,,,1.5,\nX,,,0.5,,,\n", ErrLevels, 4},
		{"second backsight with no foresight", "BM,0,0,1,,,100\nX,1,1,0.5,,,\n", ErrLevels, 3},
		{"sight without position", "BM,0,0,1,,,100\nA,,,,1.2,,\n", ErrColumns, 3},
		{"bad reading", "BM,0,0,1,,,100\nA,1,1,,1.2x,,\n", ErrSyntax, 3},
		{"non-finite reading", "BM,0,0,1,,,100\nA,1,1,,NaN,,\n", ErrNonFinite, 3},
		{"nothing placed", "BM,,,1,,,100\nTP,,,,,1.5,\n", ErrEmpty, 0},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			_, err := readString(t, "lv.csv", hdr+tc.body, Options{})
			var pe *ParseError
			if !errors.Is(err, tc.want) || !errors.As(err, &pe) || pe.Line != tc.line {
				t.Errorf("Read = %v, want %v on line %d", err, tc.want, tc.line)
			}
		})
	}
	for _, tc := range []struct{ name, content string }{
		{"fs without bs column", "point,e,n,fs,elevation\nBM,0,0,1,100\n"},
		{"no positions", "point,bs,is,elevation\nBM,1,,100\n"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			if _, err := readString(t, "lv.csv", tc.content, Options{}); !errors.Is(err, ErrColumns) {
				t.Errorf("Read = %v, want ErrColumns", err)
			}
		})
	}
}

// TestReadLevels_DocExample reads the level book of docs/input-formats.md:
// HI 100 + 1.234 = 101.234; P1 99.734; TP1 101.234 − 2.456 = 98.778; HI
// 98.778 + 2.234 = 101.012; P3 99.901; BM1 101.012 − 1.014 = 99.998, a
// misclosure of −0.002 m.
func TestReadLevels_DocExample(t *testing.T) {
	doc := string(mustReadFile(t, "../../docs/input-formats.md"))
	i := strings.Index(doc, "    point,easting,northing,bs,is,fs,elevation,description\n")
	if i < 0 {
		t.Fatal("level book example not found in docs/input-formats.md")
	}
	var body strings.Builder
	for _, l := range strings.Split(doc[i:], "\n") {
		if !strings.HasPrefix(l, "    ") {
			break
		}
		body.WriteString(strings.TrimPrefix(l, "    ") + "\n")
	}
	s, err := readString(t, "doc.csv", body.String(), Options{})
	if err != nil {
		t.Fatal(err)
	}
	c := s.Files[0].Levels.Checks
	if len(c) != 1 || !closeTo(c[0].MisclosureM, -0.002, 1e-9) || !closeTo(s.Points[2].P.Z, 99.901, 1e-9) {
		t.Errorf("checks %+v, P3 z %v; want misclosure -0.002 and P3 99.901", c, s.Points[2].P.Z)
	}
}
