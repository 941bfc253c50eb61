#!/usr/bin/env bash
# Times the existing-ground TIN build (internal/tin.Build) against SciPy's
# scipy.spatial.Delaunay (Qhull) on the same uniform random points, in the
# same run, and prints Go time / Qhull time. The target is a ratio of at most
# 0.1 for 1e6 points (refbench ANCHORS.md: Qhull takes about 16 s there).
#
# The points are the tin benchmarks' (seeded), written to a CSV in
# $REFBENCH_OUT (default: a new temporary directory) by bench_tin_gen.go.
# Qhull gets them centred on their rounded bounding-box centre, as
# refbench/ref_delaunay.py does. Timings are medians of $REPEAT runs
# (default 3) of the triangulation alone (file reading excluded for both).
#
#   scripts/bench_tin.sh              # 1e5 and 1e6 points
#   SIZES="100000" REPEAT=5 scripts/bench_tin.sh
set -euo pipefail
cd "$(dirname "$0")/.."

PY=/usr/bin/python3
SIZES="${SIZES:-100000 1000000}"
REPEAT="${REPEAT:-3}"
OUT="${REFBENCH_OUT:-$(mktemp -d)}"
mkdir -p "$OUT"

if ! "$PY" -c 'import numpy, scipy.spatial' 2>/dev/null; then
  echo "bench_tin: $PY cannot import numpy and scipy.spatial" >&2
  exit 1
fi

echo "points in $OUT; median of $REPEAT runs; $(nproc) CPUs, load $(cut -d' ' -f1-3 /proc/loadavg)"
printf '%-9s %12s %12s %10s %14s\n' points go_s qhull_s go/qhull go_alloc_B/pt
for n in $SIZES; do
  csv="$OUT/tin_uniform_$n.csv"
  goline=$(go run scripts/bench_tin_gen.go -n "$n" -out "$csv" -repeat "$REPEAT")
  go_s=$(sed -n 's/.*build_median_s=\([0-9.]*\).*/\1/p' <<<"$goline")
  go_b=$(sed -n 's/.*alloc_bytes_per_point=\([0-9.]*\).*/\1/p' <<<"$goline")
  qh_s=$("$PY" - "$csv" "$REPEAT" <<'PYEOF'
import statistics, sys, time
import numpy as np
from scipy.spatial import Delaunay
path, repeat = sys.argv[1], int(sys.argv[2])
xy = np.loadtxt(path, delimiter=",", skiprows=1, usecols=(0, 1))
shift = np.round(0.5 * (xy.min(axis=0) + xy.max(axis=0)))
xq = np.ascontiguousarray(xy - shift)
times = []
for _ in range(repeat):
    t0 = time.perf_counter()
    tri = Delaunay(xq)
    times.append(time.perf_counter() - t0)
    del tri
print("%.4f" % statistics.median(times))
PYEOF
)
  ratio=$(awk -v g="$go_s" -v q="$qh_s" 'BEGIN { printf "%.3f", g / q }')
  printf '%-9s %12s %12s %10s %14s\n' "$n" "$go_s" "$qh_s" "$ratio" "$go_b"
done
