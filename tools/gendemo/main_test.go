package main

import (
	"bytes"
	"os"
	"path/filepath"
	"testing"
)

// TestRun_MatchesCommitted regenerates the demo survey and compares it
// byte for byte with testdata/demo, so that the committed files are what
// the generator makes.
func TestRun_MatchesCommitted(t *testing.T) {
	dir := t.TempDir()
	if err := run(dir); err != nil {
		t.Fatal(err)
	}
	for _, name := range []string{"yard_total_station.csv", "yard_phone_gps.csv", "yard_phone_gps.gpx"} {
		got, err := os.ReadFile(filepath.Join(dir, name))
		if err != nil {
			t.Fatal(err)
		}
		want, err := os.ReadFile(filepath.Join("..", "..", "testdata", "demo", name))
		if err != nil {
			t.Fatal(err)
		}
		if !bytes.Equal(got, want) {
			t.Errorf("%s differs from testdata/demo: run go run ./tools/gendemo -out testdata/demo", name)
		}
	}
}

// TestGround checks the analytic terrain: CP1 is 100.000 ft, the yard falls
// about 1.2 m to the back fence, and the wall steps 0.45 m.
func TestGround(t *testing.T) {
	if got := ground(0, 0); got != cp1Z*0.3048 {
		t.Errorf("ground(CP1) = %v m, want %v", got, cp1Z*0.3048)
	}
	// Across the wall at u = 12.5 the step is the terrace height.
	v := wallV(12.5)
	if step := ground(12.5, v-1e-9) - ground(12.5, v+1e-9); step < terraceM-1e-6 || step > terraceM+1e-6 {
		t.Errorf("wall step %v m, want %v", step, terraceM)
	}
	// The plane falls fallM over the depth; the waves add at most ±0.1 m.
	if fall := ground(12.5, 5) - ground(12.5, 18) - fallM*13/yardH; fall < -0.2 || fall > 0.2 {
		t.Errorf("fall beyond the plane %v m, want within the waves' ±0.2", fall)
	}
}
