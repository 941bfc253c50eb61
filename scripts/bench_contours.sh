#!/usr/bin/env bash
# Contouring speed: the contours package against GDAL's gdal_contour on the
# same surface at the same detail.
#
# The surface is the reference bench's synthetic terrain
# (../shared/refbench/README.md) over its 200 m x 150 m site, sampled on an
# 817 x 613 lattice: the Go benchmark BenchmarkTrace1e6 contours the TIN of
# those samples (500 821 vertices, 998 784 triangles) and gdal_contour a
# Float64 GeoTIFF whose 500 821 pixel centres are the same samples, both at a
# 0.0575 m interval, which gives 100 levels. Keep the numbers in step with
# internal/contours/bench_test.go.
#
# gdal_contour is timed end to end (start-up, reading the 4 MB raster,
# contouring, writing) with the OGR Memory driver, so that no file is
# written, and with GeoJSON for reference. Two more runs split its cost: on
# a 2 x 2 raster (start-up: loading GDAL and its drivers), and with one level
# below the data (-fl 0: start-up, reading the raster and visiting every
# cell, but no line). The Go figure is Trace alone on a mesh already in
# memory, so the fair comparison is with gdal_contour less its start-up. Runs alternate, REPEAT times each; medians are printed.
# Wall-clock times suffer when other work shares the machine, so the CPU
# time (user + system) of each is printed too: for gdal_contour that of the
# process, for Trace the difference between a benchmark run of 1 and of
# 1 + CPUOPS operations, divided by CPUOPS.
#
# Usage: scripts/bench_contours.sh            (REPEAT=5 BENCHTIME=5x)
# Needs go, /usr/bin/python3 with numpy and osgeo, gdal_contour, ogrinfo.
set -euo pipefail
ROOT="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
PY=/usr/bin/python3
REPEAT="${REPEAT:-5}"
BENCHTIME="${BENCHTIME:-5x}"
CPUOPS="${CPUOPS:-10}"
OUT="$(mktemp -d)"
trap 'rm -rf "$OUT"' EXIT

NX=817 NY=613 W=200 INTERVAL=0.0575

"$PY" - "$OUT/terrain.tif" "$NX" "$NY" "$W" "$OUT/tiny.tif" <<'PYEOF'
import sys
import numpy as np
from osgeo import gdal
path, nx, ny, w, tiny = sys.argv[1], int(sys.argv[2]), int(sys.argv[3]), float(sys.argv[4]), sys.argv[5]
ds = gdal.GetDriverByName("GTiff").Create(tiny, 2, 2, 1, gdal.GDT_Float64)
ds.SetGeoTransform((0.0, 1.0, 0.0, 2.0, 0.0, -1.0))
ds.GetRasterBand(1).WriteArray(np.array([[100.0, 100.1], [100.2, 100.3]]))
ds = None
d = w / (nx - 1)
x = np.arange(nx) * d
y = (np.arange(ny) * d)[::-1]                      # north-up rows
X, Y = np.meshgrid(x, y)
T = (100 + 0.02 * X + 0.01 * Y + 0.5 * np.sin(2 * np.pi * X / 80) * np.cos(2 * np.pi * Y / 60)
     + 0.3 * np.cos(2 * np.pi * (X / 45 + Y / 110)))
ds = gdal.GetDriverByName("GTiff").Create(path, nx, ny, 1, gdal.GDT_Float64)
ds.SetGeoTransform((-d / 2, d, 0.0, (ny - 1) * d + d / 2, 0.0, -d))  # pixel centres on the lattice
ds.GetRasterBand(1).WriteArray(T)
ds = None
PYEOF

(cd "$ROOT" && go test -c -o "$OUT/contours.test" ./internal/contours)

now() { date +%s.%N; }
elapsed() { awk -v a="$1" -v b="$2" 'BEGIN { printf "%.4f", b - a }'; }
median() { printf '%s\n' "$@" | sort -g | awk '{ v[NR] = $1 } END { print (NR % 2) ? v[(NR + 1) / 2] : (v[NR / 2] + v[NR / 2 + 1]) / 2 }'; }

go_s=() mem_s=() json_s=() fixed_s=() start_s=()
go_cpu=() mem_cpu=() fixed_cpu=() start_cpu=()
lines=""
cpu() { # cpu OUTVAR DIR command...: run command in DIR, store its user+system seconds
  local __v="$1" dir="$2"; shift 2
  printf -v "$__v" '%s' "$(cd "$dir" && "$PY" -c '
import resource, subprocess, sys
subprocess.run(sys.argv[1:], stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL, check=True)
r = resource.getrusage(resource.RUSAGE_CHILDREN)
print("%.4f" % (r.ru_utime + r.ru_stime))' "$@")"
}
gobin=("$OUT/contours.test" -test.run '^$' -test.bench '^BenchmarkTrace1e6$' -test.count 1)
gobench() { (cd "$ROOT/internal/contours" && "$OUT/contours.test" -test.run '^$' -test.bench '^BenchmarkTrace1e6$' -test.count 1 "$@"); }
for ((r = 0; r < REPEAT; r++)); do
  res="$(gobench -test.benchtime "$BENCHTIME" | awk '/^BenchmarkTrace1e6/ { print $3, $5 }')"
  go_s+=("$(awk -v ns="${res% *}" 'BEGIN { printf "%.4f", ns / 1e9 }')")
  lines="${res#* }"

  t0=$(now); gdal_contour -q -a elev -i "$INTERVAL" -f Memory "$OUT/terrain.tif" mem >/dev/null; t1=$(now)
  mem_s+=("$(elapsed "$t0" "$t1")")

  rm -f "$OUT/c.geojson"
  t0=$(now); gdal_contour -q -a elev -i "$INTERVAL" -f GeoJSON "$OUT/terrain.tif" "$OUT/c.geojson"; t1=$(now)
  json_s+=("$(elapsed "$t0" "$t1")")

  t0=$(now); gdal_contour -q -a elev -fl 0 -f Memory "$OUT/terrain.tif" mem >/dev/null; t1=$(now)
  fixed_s+=("$(elapsed "$t0" "$t1")")

  t0=$(now); gdal_contour -q -a elev -i "$INTERVAL" -f Memory "$OUT/tiny.tif" mem >/dev/null; t1=$(now)
  start_s+=("$(elapsed "$t0" "$t1")")

  cpu c1 "$ROOT/internal/contours" "${gobin[@]}" -test.benchtime 1x
  cpu cn "$ROOT/internal/contours" "${gobin[@]}" -test.benchtime "$((CPUOPS + 1))x"
  go_cpu+=("$(awk -v a="$c1" -v b="$cn" -v n="$CPUOPS" 'BEGIN { printf "%.4f", (b - a) / n }')")
  cpu c "$OUT" gdal_contour -q -a elev -i "$INTERVAL" -f Memory "$OUT/terrain.tif" mem
  mem_cpu+=("$c")
  cpu c "$OUT" gdal_contour -q -a elev -fl 0 -f Memory "$OUT/terrain.tif" mem
  fixed_cpu+=("$c")
  cpu c "$OUT" gdal_contour -q -a elev -i "$INTERVAL" -f Memory "$OUT/tiny.tif" mem
  start_cpu+=("$c")
done

gdal_lines="$(ogrinfo -ro -so -al "$OUT/c.geojson" | awk -F': ' '/Feature Count/ { print $2 }')"
go_m="$(median "${go_s[@]}")" mem_m="$(median "${mem_s[@]}")"
json_m="$(median "${json_s[@]}")" fixed_m="$(median "${fixed_s[@]}")" start_m="$(median "${start_s[@]}")"

printf 'surface: %d x %d samples (%d TIN vertices, %d triangles; %d raster cells), interval %s m, 100 levels\n' \
  "$NX" "$NY" $((NX * NY)) $((2 * (NX - 1) * (NY - 1))) $((NX * NY)) "$INTERVAL"
printf 'lines: contours.Trace %s, gdal_contour %s\n' "$lines" "$gdal_lines"
printf '%-44s %8s   runs\n' "" "median s"
printf '%-44s %8.4f   %s\n' "contours.Trace (BenchmarkTrace1e6)" "$go_m" "${go_s[*]}"
printf '%-44s %8.4f   %s\n' "gdal_contour -f Memory" "$mem_m" "${mem_s[*]}"
printf '%-44s %8.4f   %s\n' "gdal_contour -f GeoJSON" "$json_m" "${json_s[*]}"
printf '%-44s %8.4f   %s\n' "gdal_contour -fl 0 (read, scan, no line)" "$fixed_m" "${fixed_s[*]}"
printf '%-44s %8.4f   %s\n' "gdal_contour on 2 x 2 cells (start-up)" "$start_m" "${start_s[*]}"
gc_m="$(median "${go_cpu[@]}")" mc_m="$(median "${mem_cpu[@]}")" fc_m="$(median "${fixed_cpu[@]}")" sc_m="$(median "${start_cpu[@]}")"
printf '%-44s %8s   runs\n' "" "CPU s"
printf '%-44s %8.4f   %s\n' "contours.Trace" "$gc_m" "${go_cpu[*]}"
printf '%-44s %8.4f   %s\n' "gdal_contour -f Memory" "$mc_m" "${mem_cpu[*]}"
printf '%-44s %8.4f   %s\n' "gdal_contour -fl 0 (read, scan, no line)" "$fc_m" "${fixed_cpu[*]}"
printf '%-44s %8.4f   %s\n' "gdal_contour on 2 x 2 cells (start-up)" "$sc_m" "${start_cpu[*]}"
awk -v g="$go_m" -v m="$mem_m" -v f="$fixed_m" -v s="$start_m" -v j="$json_m" \
    -v gc="$gc_m" -v mc="$mc_m" -v fc="$fc_m" -v sc="$sc_m" 'BEGIN {
  printf "ratio gdal_contour / contours.Trace (above 1: Trace is faster)\n"
  printf "  wall: %.2f end to end (Memory), %.2f less start-up, %.2f less the -fl 0 run, %.2f end to end (GeoJSON)\n", m / g, (m - s) / g, (m - f) / g, j / g
  printf "  CPU:  %.2f end to end (Memory), %.2f less start-up, %.2f less the -fl 0 run\n", mc / gc, (mc - sc) / gc, (mc - fc) / gc
}'
