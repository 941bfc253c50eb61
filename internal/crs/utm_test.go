package crs

import (
	"errors"
	"math"
	"testing"

	"pgregory.net/rapid"
)

func TestUTMZoneFor(t *testing.T) {
	// Zone rule and exceptions: check-values.md §5 (zone = floor((λ+180)/6)+1,
	// Norway 32V, Svalbard 31X/33X/35X/37X, limits 80°S–84°N), as applied by
	// refbench/ref_proj.sh.
	tests := []struct {
		name     string
		lon, lat float64
		want     UTM
	}{
		{"eugene", -123.0685, 44.0582, UTM{Zone: 10}},
		{"sydney_south", 151.215297, -33.856784, UTM{Zone: 56, South: true}},
		{"lon_minus_180", -180, 10, UTM{Zone: 1}},
		{"lon_plus_180", 180, 10, UTM{Zone: 60}},
		{"edge_belongs_east", -120, 45, UTM{Zone: 11}},
		{"just_west_of_edge", math.Nextafter(-120, -200), 45, UTM{Zone: 10}},
		{"equator_is_north", 3, 0, UTM{Zone: 31}},
		{"negative_zero_is_north", 3, math.Copysign(0, -1), UTM{Zone: 31}},
		{"norway_32V", 5.3221, 60.3913, UTM{Zone: 32}},
		{"norway_west_of_3E", 2.9, 60, UTM{Zone: 31}},
		{"norway_band_top_excluded", 5, 64, UTM{Zone: 31}},
		{"norway_band_bottom_included", 3, 56, UTM{Zone: 32}},
		{"svalbard_31X", 8.9, 78, UTM{Zone: 31}},
		{"svalbard_33X", 15.6267, 78.2232, UTM{Zone: 33}},
		{"svalbard_35X", 21, 80, UTM{Zone: 35}},
		{"svalbard_37X", 41.9, 83.9, UTM{Zone: 37}},
		{"svalbard_east_of_42E", 42, 80, UTM{Zone: 38}},
		{"svalbard_band_start", 10, 72, UTM{Zone: 33}},
		{"below_svalbard_band", 10, 71.99, UTM{Zone: 32}},
		{"north_limit", 0, 84, UTM{Zone: 31}},
		{"south_limit", 0, -80, UTM{Zone: 31, South: true}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			got, err := UTMZoneFor(tc.lon, tc.lat)
			if err != nil || got != tc.want {
				t.Errorf("UTMZoneFor(%v, %v) = %v, %v, want %v", tc.lon, tc.lat, got, err, tc.want)
			}
		})
	}
	bad := []struct {
		name     string
		lon, lat float64
	}{
		{"north_of_84", 0, 84.0000001},
		{"south_of_80", 0, -80.0000001},
		{"lon_above_180", 180.5, 0},
		{"lon_below_minus_180", -181, 0},
		{"nan_lon", math.NaN(), 0},
		{"inf_lat", 0, math.Inf(1)},
	}
	for _, tc := range bad {
		t.Run(tc.name, func(t *testing.T) {
			if got, err := UTMZoneFor(tc.lon, tc.lat); !errors.Is(err, ErrDomain) {
				t.Errorf("UTMZoneFor(%v, %v) = %v, %v, want ErrDomain", tc.lon, tc.lat, got, err)
			}
		})
	}
}

func TestUTM_EPSGAndMeridian(t *testing.T) {
	tests := []struct {
		u      UTM
		epsg   int
		cm     float64
		str    string
		source string
	}{
		// EPSG codes of the WGS 84 UTM zones: 326zz north, 327zz south
		// (refbench/ANCHORS.md §5 lists 32610, 32756, 32717 …).
		{UTM{Zone: 10}, 32610, -123, "UTM zone 10N", "ANCHORS.md §5"},
		{UTM{Zone: 56, South: true}, 32756, 153, "UTM zone 56S", "ANCHORS.md §5"},
		{UTM{Zone: 1}, 32601, -177, "UTM zone 1N", "λ0 = 6·zone − 183, check-values.md §5"},
		{UTM{Zone: 60, South: true}, 32760, 177, "UTM zone 60S", "λ0 = 6·zone − 183, check-values.md §5"},
		{UTM{Zone: 0}, 0, -183, "UTM zone 0N", "invalid zone"},
		{UTM{Zone: 61}, 0, 183, "UTM zone 61N", "invalid zone"},
	}
	for _, tc := range tests {
		if got := tc.u.EPSG(); got != tc.epsg {
			t.Errorf("%+v.EPSG() = %d, want %d (%s)", tc.u, got, tc.epsg, tc.source)
		}
		if got := tc.u.CentralMeridianDeg(); got != tc.cm {
			t.Errorf("%+v.CentralMeridianDeg() = %v, want %v (%s)", tc.u, got, tc.cm, tc.source)
		}
		if got := tc.u.String(); got != tc.str {
			t.Errorf("%+v.String() = %q, want %q", tc.u, got, tc.str)
		}
		if tc.epsg != 0 {
			if back, ok := UTMFromEPSG(tc.epsg); !ok || back != tc.u {
				t.Errorf("UTMFromEPSG(%d) = %v, %v, want %v", tc.epsg, back, ok, tc.u)
			}
		}
	}
	for _, code := range []int{32600, 32661, 32700, 32761, 4326, 0} {
		if u, ok := UTMFromEPSG(code); ok {
			t.Errorf("UTMFromEPSG(%d) = %v, true, want false", code, u)
		}
	}
}

func TestUTM_Errors(t *testing.T) {
	u := UTM{Zone: 10}
	tests := []struct {
		name     string
		u        UTM
		lon, lat float64
		want     error
	}{
		{"zero_zone", UTM{}, -123, 45, ErrZone},
		{"zone_61", UTM{Zone: 61}, 0, 0, ErrZone},
		{"nan", u, math.NaN(), 45, ErrDomain},
		{"inf", u, -123, math.Inf(-1), ErrDomain},
		{"north_of_84", u, -123, 84.5, ErrDomain},
		{"south_of_80", u, -123, -80.5, ErrDomain},
		{"too_far_east", u, -123 + MaxUTMOffsetDeg + 0.01, 45, ErrDomain},
		{"wrong_zone_far_away", u, 10, 45, ErrDomain},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			if e, n, err := tc.u.Forward(tc.lon, tc.lat); !errors.Is(err, tc.want) {
				t.Errorf("%+v.Forward(%v, %v) = %v, %v, %v, want %v", tc.u, tc.lon, tc.lat, e, n, err, tc.want)
			}
		})
	}
	inv := []struct {
		name string
		u    UTM
		e, n float64
		want error
	}{
		{"zero_zone", UTM{}, 500000, 0, ErrZone},
		{"nan", u, math.NaN(), 0, ErrDomain},
		{"inf", u, 500000, math.Inf(1), ErrDomain},
		{"far_east", u, 5e7, 4e6, ErrDomain},
	}
	for _, tc := range inv {
		t.Run("inverse_"+tc.name, func(t *testing.T) {
			if lon, lat, err := tc.u.Inverse(tc.e, tc.n); !errors.Is(err, tc.want) {
				t.Errorf("%+v.Inverse(%v, %v) = %v, %v, %v, want %v", tc.u, tc.e, tc.n, lon, lat, err, tc.want)
			}
		})
	}
	// Wrapping across the antimeridian: zone 60 (CM 177°E) takes −179°.
	if _, _, err := (UTM{Zone: 60}).Forward(-179, 10); err != nil {
		t.Errorf("UTM 60 Forward(-179, 10): %v, want no error (2° east of CM 177°)", err)
	}
}

// TestUTM_RoundTrip checks the property that Forward then Inverse returns
// the input within 1e-9° over the UTM domain (every zone, both
// hemispheres, latitudes 80°S–84°N, up to 5° either side of the central
// meridian, i.e. beyond the zone edges).
func TestUTM_RoundTrip(t *testing.T) {
	const tolDeg = 1e-9
	rapid.Check(t, func(rt *rapid.T) {
		u := UTM{Zone: rapid.IntRange(1, 60).Draw(rt, "zone")}
		lat := rapid.Float64Range(utmMinLatDeg, utmMaxLatDeg).Draw(rt, "lat")
		u.South = rapid.Bool().Draw(rt, "south")
		lon := math.Remainder(u.CentralMeridianDeg()+rapid.Float64Range(-5, 5).Draw(rt, "dlon"), 360)
		e, n, err := u.Forward(lon, lat)
		if err != nil {
			rt.Fatalf("%v.Forward(%v, %v): %v", u, lon, lat, err)
		}
		lon2, lat2, err := u.Inverse(e, n)
		if err != nil {
			rt.Fatalf("%v.Inverse(%v, %v): %v", u, e, n, err)
		}
		if math.Abs(math.Remainder(lon2-lon, 360)) > tolDeg || math.Abs(lat2-lat) > tolDeg {
			rt.Fatalf("%v: (%v, %v) → (%v, %v) → (%v, %v)", u, lon, lat, e, n, lon2, lat2)
		}
	})
}
