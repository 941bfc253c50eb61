package units

import (
	"errors"
	"math"
	"testing"
)

func TestParseLength(t *testing.T) {
	tests := []struct {
		in   string
		def  System
		want float64
	}{
		{"2ft", Metres, 0.6096},
		{"30in", Metres, 0.762},
		{"0.75 m", Feet, 0.75},
		{"0.75ft", Metres, 0.2286},
		{"9\"", Metres, 0.2286},
		{"3'", Metres, 0.9144},
		{"12", Feet, 3.6576},
		{"12", USFeet, 12 * 1200.0 / 3937.0},
		{"1usft", Metres, 1200.0 / 3937.0},
		{"150mm", Feet, 0.15},
		{"15 cm", Feet, 0.15},
		{"1yd", Metres, 0.9144},
		{"-0.5m", Metres, -0.5},
		{"1.5e1 in", Metres, 0.381},
	}
	for _, tc := range tests {
		got, err := ParseLength(tc.in, tc.def)
		if err != nil {
			t.Errorf("ParseLength(%q, %v) error %v", tc.in, tc.def, err)
			continue
		}
		if math.Abs(got-tc.want) > 1e-12 {
			t.Errorf("ParseLength(%q, %v) = %.15g, want %.15g", tc.in, tc.def, got, tc.want)
		}
	}
}

func TestParseLengthBad(t *testing.T) {
	for _, in := range []string{"", "ft", "nan", "NaNm", "inf ft", "0x1p3", "1_000", "two feet", "1.2.3m", "--1"} {
		if _, err := ParseLength(in, Metres); !errors.Is(err, ErrLength) {
			t.Errorf("ParseLength(%q) error = %v, want ErrLength", in, err)
		}
	}
}

func TestParseSystem(t *testing.T) {
	for in, want := range map[string]System{"m": Metres, "FT": Feet, "usft": USFeet, " ftUS ": USFeet} {
		got, err := ParseSystem(in)
		if err != nil || got != want {
			t.Errorf("ParseSystem(%q) = %v, %v; want %v", in, got, err, want)
		}
	}
	if _, err := ParseSystem("yards"); err == nil {
		t.Error("ParseSystem(yards) succeeded, want error")
	}
	for _, s := range []System{Metres, Feet, USFeet} {
		back, err := ParseSystem(s.String())
		if err != nil || back != s {
			t.Errorf("round trip %v -> %q -> %v", s, s.String(), back)
		}
	}
}

func FuzzParseLength(f *testing.F) {
	for _, s := range []string{"2ft", "30 in", "0.75m", "9\"", "12", "-1e3mm", "nan"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		v, err := ParseLength(s, Feet)
		if err != nil {
			return
		}
		if math.IsNaN(v) || math.IsInf(v, 0) {
			t.Fatalf("ParseLength(%q) = %v, want finite", s, v)
		}
	})
}
