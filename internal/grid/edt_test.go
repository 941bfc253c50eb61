package grid

import (
	"bufio"
	"fmt"
	"math"
	"math/rand/v2"
	"os"
	"os/exec"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"github.com/dugout-estimating/dugout/internal/reftest"
)

// bruteEDT is the definition: the smallest distance to any inside node.
func bruteEDT(l Lattice, inside []bool) []float64 {
	out := make([]float64, l.Len())
	for k := range out {
		best := math.Inf(1)
		xi, yi := k%l.NX, k/l.NX
		for m, in := range inside {
			if !in {
				continue
			}
			dx, dy := float64(m%l.NX-xi), float64(m/l.NX-yi)
			best = math.Min(best, math.Sqrt(dx*dx+dy*dy)*l.H)
		}
		out[k] = best
	}
	return out
}

func randomMask(rng *rand.Rand, n int, p float64) []bool {
	m := make([]bool, n)
	for k := range m {
		m[k] = rng.Float64() < p
	}
	return m
}

func TestEDT_Brute(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	for _, tc := range []struct {
		nx, ny int
		p      float64
	}{{1, 1, 1}, {1, 7, 0.3}, {9, 1, 0.3}, {17, 13, 0.02}, {23, 31, 0.2}, {40, 40, 0.005}, {12, 12, 0}} {
		l := Lattice{H: 0.25, NX: tc.nx, NY: tc.ny}
		in := randomMask(rng, l.Len(), tc.p)
		got, want := EDT(l, in), bruteEDT(l, in)
		for k := range got {
			if got[k] != want[k] && !(math.IsInf(got[k], 1) && math.IsInf(want[k], 1)) {
				t.Fatalf("EDT %dx%d p=%g node %d = %g, want %g (brute force)", tc.nx, tc.ny, tc.p, k, got[k], want[k])
			}
		}
	}
}

// TestEDT_SciPy compares with scipy.ndimage.distance_transform_edt, which
// computes the distance from each non-zero element to the nearest zero.
func TestEDT_SciPy(t *testing.T) {
	py := reftest.Python(t, "numpy", "scipy.ndimage")
	rng := rand.New(rand.NewPCG(3, 4))
	l := Lattice{H: 0.1, NX: 157, NY: 93}
	in := randomMask(rng, l.Len(), 0.003)
	dir := t.TempDir()
	mask := filepath.Join(dir, "mask.txt")
	var sb strings.Builder
	for j := 0; j < l.NY; j++ {
		for i := 0; i < l.NX; i++ {
			if in[l.Index(i, j)] {
				sb.WriteString("1 ")
			} else {
				sb.WriteString("0 ")
			}
		}
		sb.WriteString("\n")
	}
	if err := os.WriteFile(mask, []byte(sb.String()), 0o600); err != nil {
		t.Fatal(err)
	}
	script := `import sys, numpy as np
from scipy.ndimage import distance_transform_edt
m = np.loadtxt(sys.argv[1])
d = distance_transform_edt(m == 0, sampling=float(sys.argv[2]))
np.savetxt(sys.stdout, d.ravel(), fmt="%.17g")
`
	out, err := exec.Command(py, "-c", script, mask, "0.1").Output()
	if err != nil {
		t.Fatalf("scipy: %v", err)
	}
	got := EDT(l, in)
	sc := bufio.NewScanner(strings.NewReader(string(out)))
	k := 0
	for sc.Scan() {
		want, err := strconv.ParseFloat(sc.Text(), 64)
		if err != nil {
			t.Fatal(err)
		}
		if math.Abs(got[k]-want) > 1e-12 {
			t.Fatalf("EDT node %d = %.17g, scipy distance_transform_edt = %.17g", k, got[k], want)
		}
		k++
	}
	if k != l.Len() {
		t.Fatalf("scipy returned %d values, want %d", k, l.Len())
	}
}

func BenchmarkEDT1M(b *testing.B) {
	rng := rand.New(rand.NewPCG(5, 6))
	l := Lattice{H: 0.02, NX: 1000, NY: 1000}
	in := randomMask(rng, l.Len(), 0.0005)
	b.ReportAllocs()
	for b.Loop() {
		EDT(l, in)
	}
}

func ExampleEDT() {
	l := Lattice{H: 0.5, NX: 4, NY: 1}
	d := EDT(l, []bool{true, false, false, false})
	fmt.Println(d)
	// Output: [0 0.5 1 1.5]
}
