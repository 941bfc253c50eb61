package sitefile

import (
	"errors"
	"math"
	"testing"

	"github.com/dugout-estimating/dugout/internal/units"
)

const sample = `
# A made-up job.
name = "Test yard"
units = "ft"

[survey]
files = ["shots.csv"]
breakline_codes = ["TW", "BW"]

[design.outline]
code = "POND"
wall_slope = 1.5
deep_depth = "30in"
[[design.outline.shelf]]
width = "12in"
depth = "10in"

[water]
level = "auto"
freeboard = "3in"

[liner]
overlap = 1
`

func TestParse(t *testing.T) {
	s, err := Parse([]byte(sample), "test.toml")
	if err != nil {
		t.Fatal(err)
	}
	if s.Name != "Test yard" || s.Units != "ft" || len(s.Survey.Files) != 1 || s.Design.Outline.Code != "POND" {
		t.Errorf("decoded %+v", s)
	}
	sys, _ := units.ParseSystem(s.Units)
	fb, err := s.Water.Freeboard.Metres(sys, 0)
	if err != nil || math.Abs(fb-0.0762) > 1e-12 {
		t.Errorf("freeboard = %v, %v; want 0.0762 m", fb, err)
	}
	ov, err := s.Liner.Overlap.Metres(sys, 0)
	if err != nil || math.Abs(ov-0.3048) > 1e-12 {
		t.Errorf("overlap = %v, %v; want 0.3048 m (1 ft)", ov, err)
	}
	if d, _ := s.Design.Outline.Shelves[0].Width.Metres(sys, 0); math.Abs(d-0.3048) > 1e-12 {
		t.Errorf("shelf width = %v", d)
	}
	if s.Water.Level.Raw != "auto" {
		t.Errorf("level = %q", s.Water.Level.Raw)
	}
}

func TestParseErrors(t *testing.T) {
	tests := []struct{ name, text string }{
		{"unknown key", "name = \"x\"\n[liner]\noverlapp = 1\n"},
		{"syntax", "name = \n"},
		{"wrong type", "[liner]\noverlap = true\n"},
	}
	for _, tc := range tests {
		if _, err := Parse([]byte(tc.text), "bad.toml"); !errors.Is(err, ErrSiteFile) {
			t.Errorf("%s: err = %v, want ErrSiteFile", tc.name, err)
		}
	}
}

func TestSet(t *testing.T) {
	s, err := Parse([]byte(sample), "test.toml")
	if err != nil {
		t.Fatal(err)
	}
	s.Dir = "/jobs/yard"
	for _, a := range []string{"liner.overlap=2ft", "water.level=101.25", "crew.size=4", "name=Other yard", "survey.files=[\"a.csv\", \"b.csv\"]"} {
		if err := s.Set(a); err != nil {
			t.Fatalf("Set(%q): %v", a, err)
		}
	}
	if s.Liner.Overlap.Raw != "2ft" || s.Water.Level.Raw != "101.25" || s.Crew.Size != 4 || s.Name != "Other yard" || len(s.Survey.Files) != 2 {
		t.Errorf("after Set: %+v", s)
	}
	if s.Design.Outline.Code != "POND" || s.Dir != "/jobs/yard" {
		t.Errorf("Set lost other keys: %+v", s)
	}
	if err := s.Set("liner.overlapp=2ft"); !errors.Is(err, ErrSiteFile) {
		t.Errorf("Set unknown key: err = %v", err)
	}
	if err := s.Set("novalue"); !errors.Is(err, ErrSiteFile) {
		t.Errorf("Set without '=': err = %v", err)
	}
}

func FuzzParse(f *testing.F) {
	f.Add([]byte(sample))
	f.Add([]byte("units = \"m\"\n[water]\nlevel = 12.5\n"))
	f.Fuzz(func(t *testing.T, data []byte) {
		s, err := Parse(data, "fuzz.toml")
		if err != nil {
			return
		}
		if s == nil {
			t.Fatal("nil site without error")
		}
	})
}
