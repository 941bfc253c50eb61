package report

import (
	"bytes"
	"errors"
	"math"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"github.com/dugout-estimating/dugout/internal/units"
)

func renderSection(tb testing.TB, s SectionData) []byte {
	tb.Helper()
	var b bytes.Buffer
	if err := Section(&b, s); err != nil {
		tb.Fatalf("Section: %v", err)
	}
	return b.Bytes()
}

func TestSection_Golden(t *testing.T) {
	got := renderSection(t, sampleSection("A"))
	compareGolden(t, "section_a.svg", got)
	if again := renderSection(t, sampleSection("A")); !bytes.Equal(got, again) {
		t.Error("Section is not deterministic")
	}
	root := parseXML(t, got)
	if root.Attr["width"] != "180mm" || root.Attr["height"] != "100mm" {
		t.Errorf("section size = %s × %s, want 180mm × 100mm", root.Attr["width"], root.Attr["height"])
	}
	root.walk(func(n *xmlNode) {
		if _, ok := n.Attr["id"]; ok {
			t.Errorf("<%s> has an id attribute", n.Name)
		}
	})
}

var exaggerationRE = regexp.MustCompile(`vertical exaggeration ([0-9.]+)×`)

func TestSection_SampleIsReadable(t *testing.T) {
	// What we want of our sections: a stated vertical exaggeration of 2× to
	// 5× for a garden pond, and the title A–A'.
	for _, name := range []string{"A", "B"} {
		root := parseXML(t, renderSection(t, sampleSection(name)))
		texts := strings.Join(root.texts(), "|")
		m := exaggerationRE.FindStringSubmatch(texts)
		if m == nil {
			t.Fatalf("section %s states no vertical exaggeration", name)
		}
		ve, _ := strconv.ParseFloat(m[1], 64)
		if ve < 2 || ve > 5 {
			t.Errorf("section %s: vertical exaggeration %v×, want 2× to 5×", name, ve)
		}
		for _, w := range []string{"Section " + name + "–" + name + "'", "rim ", "water 99.90 ft", "floor ", "water depth", "freeboard",
			"Distance along " + name + "–" + name + "' (ft)", "Elevation (ft)"} {
			if !strings.Contains(texts, w) {
				t.Errorf("section %s lacks %q", name, w)
			}
		}
	}
}

// trapezoid is an analytic pond section: flat ground at 10 m from 0 to 20
// m, a pond with its rim at S = 5 and 15, 1:1 sides down to a floor at
// 8.5 m from S = 6.5 to 13.5, water at 9.8 m.
func trapezoid() SectionData {
	ex := []ProfilePoint{{0, 10}, {20, 10}}
	fin := []ProfilePoint{{0, 10}, {5, 10}, {6.5, 8.5}, {13.5, 8.5}, {15, 10}, {20, 10}}
	return SectionData{Name: "C", Units: units.Metres, Existing: ex, Finished: fin, HasWaterLevel: true, WaterLevelM: 9.8,
		RimS: []float64{5, 15}, LinerOverlapM: 0.5, ScaleDenominator: 100, Exaggeration: 2}
}

func TestSection_Trapezoid(t *testing.T) {
	root := parseXML(t, renderSection(t, trapezoid()))
	texts := strings.Join(root.texts(), "|")
	// Depths by subtraction: water 9.80 − floor 8.50 = 1.30 m; rim 10.00 −
	// water 9.80 = 0.20 m freeboard.
	for _, w := range []string{"rim 10.00 m", "water 9.80 m", "floor 8.50 m", "1.30 m water depth", "0.20 m freeboard",
		"Horizontal 1:100 · vertical 1:50 · vertical exaggeration 2×"} {
		if !strings.Contains(texts, w) {
			t.Errorf("section lacks %q; texts: %s", w, texts)
		}
	}
	// The cut between ground and finished grade is the trapezoid's area,
	// 1.5 m × (10 + 7) m / 2 = 12.75 m², drawn at 10 mm per metre across
	// and 20 mm per metre up (1:100, 2×): 2550 mm².
	cuts := root.find(func(n *xmlNode) bool { return n.Name == "path" && n.Attr["class"] == "cut" })
	if len(cuts) != 1 {
		t.Fatalf("%d cut paths, want 1", len(cuts))
	}
	if got, want := polygonsArea(t, cuts[0].Attr["d"]), 2550.0; math.Abs(got-want) > 0.5 {
		t.Errorf("cut area on paper = %.2f mm², want %.0f", got, want)
	}
	if fills := root.find(func(n *xmlNode) bool { return n.Attr["class"] == "fill" && n.Name == "path" }); len(fills) != 0 {
		t.Errorf("%d fill paths, want none", len(fills))
	}
}

func TestSectionFloor(t *testing.T) {
	s := trapezoid()
	f, ok := sectionFloor(&s)
	// The flat floor runs from 6.5 to 13.5 m: labelled at its middle, 10 m.
	if !ok || f.S != 10 || f.Z != 8.5 {
		t.Errorf("sectionFloor = %v, %v; want {10 8.5}, true", f, ok)
	}
}

func TestLinerProfile(t *testing.T) {
	// Left of the rim (S = 5, Z = 9.25) the finished grade rises 3 in 4 (a
	// 3-4-5 triangle): 2.5 m along that surface is 2.0 m across and 1.5 m
	// up, so the liner ends at S = 3, Z = 10.75. Right of the rim the grade
	// is flat: it ends 2.5 m on, at S = 17.5.
	fin := []ProfilePoint{{0, 13}, {1, 12.25}, {5, 9.25}, {7, 8}, {13, 8}, {15, 10}, {20, 10}}
	s := SectionData{Finished: fin, Existing: fin, RimS: []float64{5, 15}, LinerOverlapM: 2.5}
	l := linerProfile(&s)
	if len(l) < 2 {
		t.Fatalf("linerProfile = %v", l)
	}
	first, last := l[0], l[len(l)-1]
	if math.Abs(first.S-3) > 1e-12 || math.Abs(first.Z-10.75) > 1e-12 {
		t.Errorf("liner starts at %v, want {3 10.75}", first)
	}
	if math.Abs(last.S-17.5) > 1e-12 || last.Z != 10 {
		t.Errorf("liner ends at %v, want {17.5 10}", last)
	}
	// Its length is the overlap twice plus the surface between the rims,
	// segment by segment by Pythagoras: 5 → 7 (2 across, 1.25 down), 7 → 13
	// flat, 13 → 15 (2 across, 2 up).
	var got float64
	for i := 1; i < len(l); i++ {
		got += math.Hypot(l[i].S-l[i-1].S, l[i].Z-l[i-1].Z)
	}
	want := 2*2.5 + math.Hypot(2, 1.25) + 6 + math.Hypot(2, 2)
	if math.Abs(got-want) > 1e-12 {
		t.Errorf("liner length = %.12f m, want %.12f", got, want)
	}
	// Fewer than two rim crossings: no liner.
	s.RimS = s.RimS[:1]
	if l := linerProfile(&s); l != nil {
		t.Errorf("linerProfile with one rim = %v, want nil", l)
	}
}

func TestGradeSamples(t *testing.T) {
	// Ground flat at 10; finished grade from 9 to 11 over 0–2 m crosses it
	// at exactly S = 1.
	got := gradeSamples([]ProfilePoint{{0, 10}, {2, 10}}, []ProfilePoint{{0, 9}, {2, 11}})
	want := []gradeSample{{0, 10, 9}, {1, 10, 10}, {2, 10, 11}}
	if len(got) != len(want) {
		t.Fatalf("gradeSamples = %v, want %v", got, want)
	}
	for i := range want {
		if got[i] != want[i] {
			t.Errorf("sample %d = %v, want %v", i, got[i], want[i])
		}
	}
}

func TestChooseExaggeration(t *testing.T) {
	const h = 62.0 // plot height (mm): 40 % is 24.8 mm, 75 % is 46.5 mm
	tests := []struct{ reliefMM, want float64 }{
		{30, 1},   // already fills 48 %
		{10, 2.5}, // 2.5× gives 25 mm (40.3 %)
		{20, 2},   // 2× gives 40 mm
		{1, 10},   // very flat: the largest
		{60, 1},   // too tall even at 1×: stays 1×
		{8, 4},    // 4× gives 32 mm
		{4.7, 5},  // 5× gives 23.5 mm (< 40 %), 10× 47 mm (> 75 %)
		{24.8, 1}, // exactly 40 % at 1×
	}
	for _, tc := range tests {
		if got := chooseExaggeration(tc.reliefMM, h); got != tc.want {
			t.Errorf("chooseExaggeration(%v mm) = %v, want %v", tc.reliefMM, got, tc.want)
		}
	}
}

func TestSection_Degenerate(t *testing.T) {
	nan := math.NaN()
	ok := trapezoid()
	tests := []struct {
		name    string
		mod     func(s *SectionData)
		wantErr error
		inMsg   string
	}{
		{"empty", func(s *SectionData) { *s = SectionData{Name: "E"} }, ErrNothingToDraw, "section E"},
		{"all gaps", func(s *SectionData) { s.Existing = []ProfilePoint{{0, nan}}; s.Finished = nil; s.RimS = nil }, ErrNothingToDraw, ""},
		{"one point", func(s *SectionData) { s.Existing = []ProfilePoint{{3, 10}}; s.Finished = nil; s.RimS = nil }, nil, ""},
		{"flat", func(s *SectionData) { s.Finished = s.Existing; s.RimS = nil; s.HasWaterLevel = false }, nil, ""},
		{"gap in finished", func(s *SectionData) { s.Finished[3].Z = nan; s.RimS = nil }, nil, ""},
		{"vertical step", func(s *SectionData) {
			s.Finished = []ProfilePoint{{0, 10}, {5, 10}, {5, 8.5}, {15, 8.5}, {15, 10}, {20, 10}}
		}, nil, ""},
		{"decreasing chainage", func(s *SectionData) { s.Existing = []ProfilePoint{{0, 10}, {-1, 10}} }, ErrInvalidValue, "existing ground point 1"},
		{"NaN chainage", func(s *SectionData) { s.Finished[2].S = nan }, ErrInvalidValue, "finished grade point 2"},
		{"infinite elevation", func(s *SectionData) { s.Existing[1].Z = math.Inf(1) }, ErrInvalidValue, "elevation"},
		{"rim outside", func(s *SectionData) { s.RimS = []float64{5, 25} }, ErrInvalidValue, "rim crossing 1"},
		{"rims not increasing", func(s *SectionData) { s.RimS = []float64{15, 5} }, ErrInvalidValue, "rim crossing 1"},
		{"negative overlap", func(s *SectionData) { s.LinerOverlapM = -1 }, ErrInvalidValue, "liner overlap"},
		{"water NaN", func(s *SectionData) { s.WaterLevelM = nan }, ErrInvalidValue, "water level"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			s := ok
			s.Existing = append([]ProfilePoint(nil), ok.Existing...)
			s.Finished = append([]ProfilePoint(nil), ok.Finished...)
			s.RimS = append([]float64(nil), ok.RimS...)
			tc.mod(&s)
			var b bytes.Buffer
			err := Section(&b, s)
			if tc.wantErr == nil {
				if err != nil {
					t.Fatalf("Section = %v, want a drawing", err)
				}
				parseXML(t, b.Bytes())
				return
			}
			if !errors.Is(err, tc.wantErr) || !strings.Contains(err.Error(), tc.inMsg) {
				t.Errorf("Section = %v, want %v naming %q", err, tc.wantErr, tc.inMsg)
			}
		})
	}
}

func BenchmarkSectionSample(b *testing.B) {
	s := sampleSection("A")
	b.ReportAllocs()
	var buf bytes.Buffer
	for b.Loop() {
		buf.Reset()
		if err := Section(&buf, s); err != nil {
			b.Fatal(err)
		}
	}
}
