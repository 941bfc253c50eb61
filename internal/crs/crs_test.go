package crs

import (
	"errors"
	"testing"

	"github.com/dugout-estimating/dugout/internal/units"
)

func TestParse(t *testing.T) {
	tests := []struct {
		in       string
		wantStr  string
		wantKind Kind
		wantEPSG int
		wantAuto bool
		wantUTM  *UTM
	}{
		{"local", "local", Local, 0, false, nil},
		{"  LOCAL ", "local", Local, 0, false, nil},
		{"auto", "auto", Local, 0, true, nil},
		{"EPSG:32610", "EPSG:32610", Projected, 32610, false, &UTM{Zone: 10}},
		{"epsg:32756", "EPSG:32756", Projected, 32756, false, &UTM{Zone: 56, South: true}},
		{"urn:ogc:def:crs:EPSG::32633", "EPSG:32633", Projected, 32633, false, &UTM{Zone: 33}},
		{"EPSG:4326", "EPSG:4326", Geographic, 4326, false, nil},
		{"urn:ogc:def:crs:OGC:1.3:CRS84", "EPSG:4326", Geographic, 4326, false, nil},
		{"EPSG:2994", "EPSG:2994", Projected, 2994, false, nil},
		{"EPSG:26910", "EPSG:26910", Projected, 26910, false, nil},
		{"EPSG:1024", "EPSG:1024", Projected, 1024, false, nil},
	}
	for _, tc := range tests {
		t.Run(tc.in, func(t *testing.T) {
			got, err := Parse(tc.in)
			if err != nil {
				t.Fatalf("Parse(%q): %v", tc.in, err)
			}
			if got.String() != tc.wantStr || got.CRS.Kind != tc.wantKind || got.CRS.EPSG != tc.wantEPSG || got.Auto != tc.wantAuto {
				t.Errorf("Parse(%q) = %+v (%s), want %s kind %v EPSG %d auto %v", tc.in, got, got, tc.wantStr, tc.wantKind, tc.wantEPSG, tc.wantAuto)
			}
			switch {
			case tc.wantUTM == nil && got.CRS.UTM != nil:
				t.Errorf("Parse(%q).CRS.UTM = %v, want nil", tc.in, *got.CRS.UTM)
			case tc.wantUTM != nil && (got.CRS.UTM == nil || *got.CRS.UTM != *tc.wantUTM):
				t.Errorf("Parse(%q).CRS.UTM = %v, want %v", tc.in, got.CRS.UTM, *tc.wantUTM)
			}
		})
	}
	bad := []string{"", " ", "EPSG:", "EPSG:abc", "EPSG:-5", "EPSG:+5", "EPSG:0", "EPSG:1023", "EPSG:32767",
		"EPSG:123456", "EPSG:32610x", "EPSG: 32610", "UTM10", "wgs84", "EPSG:3.5", "EPSG:1e4"}
	for _, in := range bad {
		t.Run("bad_"+in, func(t *testing.T) {
			if got, err := Parse(in); !errors.Is(err, ErrSpec) {
				t.Errorf("Parse(%q) = %+v, %v, want ErrSpec", in, got, err)
			}
		})
	}
}

func TestCRS_String(t *testing.T) {
	tests := []struct {
		c    CRS
		want string
	}{
		{CRS{}, "local"},
		{LocalCRS(), "local"},
		{UTM{Zone: 10}.CRS(), "EPSG:32610"},
		{CRS{Kind: Projected, Name: "user-defined Lambert"}, "user-defined Lambert"},
		{CRS{Kind: Projected}, "unknown"},
	}
	for _, tc := range tests {
		if got := tc.c.String(); got != tc.want {
			t.Errorf("%+v.String() = %q, want %q", tc.c, got, tc.want)
		}
	}
	if got := (UTM{Zone: 10}).CRS().Name; got != "WGS 84 / UTM zone 10N" {
		t.Errorf("UTM{10}.CRS().Name = %q, want the EPSG name %q", got, "WGS 84 / UTM zone 10N")
	}
	for k, want := range map[Kind]string{Local: "local", Projected: "projected", Geographic: "geographic"} {
		if got := k.String(); got != want {
			t.Errorf("Kind(%d).String() = %q, want %q", int(k), got, want)
		}
	}
}

func TestLinearUnitM(t *testing.T) {
	tests := []struct {
		code   int
		want   float64
		ok     bool
		source string
	}{
		{32610, 1, true, "UTM is in metres"},
		{26995, 1, true, "SOURCES.md: EPSG defines 26995 in metres"},
		{2994, units.Foot, true, "SOURCES.md: EPSG:2994 is in international feet"},
		{2903, units.USSurveyFoot, true, "SOURCES.md: EPSG:2903 is in US survey feet"},
		{2255, units.USSurveyFoot, true, "SOURCES.md: 2255 is the ftUS Mississippi West"},
		{3740, 1, true, "ANCHORS.md §5: EPSG:3740 is UTM 10N in metres"},
		{4326, 0, false, "geographic"},
		{9999, 0, false, "unknown"},
	}
	for _, tc := range tests {
		got, ok := LinearUnitM(tc.code)
		if got != tc.want || ok != tc.ok {
			t.Errorf("LinearUnitM(%d) = %v, %v, want %v, %v (%s)", tc.code, got, ok, tc.want, tc.ok, tc.source)
		}
	}
}

// FuzzParse checks that Parse never panics and that whatever it accepts
// prints as a spec that parses back to the same value.
func FuzzParse(f *testing.F) {
	for _, s := range []string{"local", "auto", "EPSG:32610", "epsg:4326", "urn:ogc:def:crs:EPSG::2994",
		"urn:ogc:def:crs:OGC:1.3:CRS84", "EPSG:", "EPSG:99999", "", "EPSG:0032610"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		spec, err := Parse(s)
		if err != nil {
			if !errors.Is(err, ErrSpec) {
				t.Fatalf("Parse(%q) error %v does not wrap ErrSpec", s, err)
			}
			return
		}
		back, err := Parse(spec.String())
		if err != nil {
			t.Fatalf("Parse(%q) = %v, but Parse(%q): %v", s, spec, spec.String(), err)
		}
		if back.Auto != spec.Auto || back.CRS.EPSG != spec.CRS.EPSG || back.CRS.Kind != spec.CRS.Kind {
			t.Fatalf("Parse(%q) = %+v, Parse(%q) = %+v", s, spec, spec.String(), back)
		}
	})
}
