package contours

import (
	"runtime"
	"sync"
)

// minPerWorker is the number of triangles below which splitting a pass
// over the mesh between goroutines does not pay for starting them; chosen
// by benchmark, not critical.
const minPerWorker = 50000

// workersFor returns how many goroutines to use for a pass over n items.
func workersFor(n int) int {
	return max(1, min(runtime.GOMAXPROCS(0), n/minPerWorker))
}

// split returns w contiguous ranges [lo, hi) covering [0, n) in order.
func split(n, w int) [][2]int {
	r := make([][2]int, w)
	for i := range w {
		r[i] = [2]int{n * i / w, n * (i + 1) / w}
	}
	return r
}

// parallel runs f(0), ..., f(w-1) concurrently and waits for all of them;
// with w == 1 it just calls f(0).
func parallel(w int, f func(i int)) {
	if w == 1 {
		f(0)
		return
	}
	var wg sync.WaitGroup
	for i := range w {
		wg.Go(func() { f(i) })
	}
	wg.Wait()
}
