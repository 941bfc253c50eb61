//go:build ignore

// bench_tin_gen writes n uniform random points (the same points as the tin
// package's benchmarks: see uniformPoints in internal/tin/bench_test.go,
// which this must match) to a CSV with round-trip precision, then times
// tin.Build on them and prints the median wall time of -repeat runs and the
// bytes allocated per point. It is run by scripts/bench_tin.sh:
//
//	go run scripts/bench_tin_gen.go -n 100000 -out /tmp/u.csv -repeat 3
package main

import (
	"bufio"
	"flag"
	"fmt"
	"math/rand/v2"
	"os"
	"runtime"
	"slices"
	"strconv"
	"time"

	"github.com/dugout-estimating/dugout/internal/geom"
	"github.com/dugout-estimating/dugout/internal/tin"
)

func main() {
	n := flag.Int("n", 100000, "number of points")
	out := flag.String("out", "", "CSV to write (x,y,z)")
	repeat := flag.Int("repeat", 3, "timed builds")
	flag.Parse()
	if *out == "" || *n < 3 || *repeat < 1 {
		fmt.Fprintln(os.Stderr, "usage: bench_tin_gen -n N -out FILE [-repeat R]")
		os.Exit(2)
	}
	pts := uniformPoints(*n)
	if err := writeCSV(*out, pts); err != nil {
		fmt.Fprintln(os.Stderr, err)
		os.Exit(1)
	}
	var times []float64
	var perPoint float64
	var tris int
	for range *repeat {
		runtime.GC()
		var m0, m1 runtime.MemStats
		runtime.ReadMemStats(&m0)
		t0 := time.Now()
		s, err := tin.Build(pts, tin.Options{})
		el := time.Since(t0).Seconds()
		runtime.ReadMemStats(&m1)
		if err != nil {
			fmt.Fprintln(os.Stderr, err)
			os.Exit(1)
		}
		times = append(times, el)
		perPoint = float64(m1.TotalAlloc-m0.TotalAlloc) / float64(*n)
		tris = s.Summary().Triangles
	}
	slices.Sort(times)
	fmt.Printf("go n=%d triangles=%d build_median_s=%.4f build_best_s=%.4f alloc_bytes_per_point=%.1f\n",
		*n, tris, times[len(times)/2], times[0], perPoint)
}

// uniformPoints must match internal/tin/bench_test.go.
func uniformPoints(n int) []geom.Vec3 {
	r := rand.New(rand.NewPCG(20240601, 7))
	pts := make([]geom.Vec3, n)
	for i := range pts {
		x, y := r.Float64()*200-100, r.Float64()*150-75
		pts[i] = geom.Vec3{X: x, Y: y, Z: 100 + 0.02*x + 0.01*y}
	}
	return pts
}

func writeCSV(path string, pts []geom.Vec3) error {
	f, err := os.Create(path)
	if err != nil {
		return err
	}
	w := bufio.NewWriter(f)
	w.WriteString("x,y,z\n")
	var buf []byte
	for _, p := range pts {
		buf = strconv.AppendFloat(buf[:0], p.X, 'g', -1, 64)
		buf = append(buf, ',')
		buf = strconv.AppendFloat(buf, p.Y, 'g', -1, 64)
		buf = append(buf, ',')
		buf = strconv.AppendFloat(buf, p.Z, 'g', -1, 64)
		buf = append(buf, '\n')
		w.Write(buf)
	}
	if err := w.Flush(); err != nil {
		f.Close()
		return err
	}
	return f.Close()
}
