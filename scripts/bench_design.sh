#!/bin/sh
# bench_design.sh: time the pond design surface in Go and in the NumPy
# reference (scripts/ref_design.py) on the same inputs, in one run, and
# print the ratio.
#
# Inputs: internal/design/testdata/bench_big.json, a 30 x 20 m pond (two
# shelves and a deep zone) at a 2 cm lattice on a grid TIN of about a
# million nodes; the Go benchmark BenchmarkBuildBig2cm reads the same file.
# The demo case (a 6 x 4 m kidney pond on a 25 x 18 m yard) is timed in Go
# only; its target is under 100 ms.
#
# Usage: scripts/bench_design.sh            (BENCHTIME=3x by default)
#        BENCHTIME=10x REFBENCH_OUT=/tmp/out scripts/bench_design.sh
# Outputs (Go benchmark text, reference JSON) go to REFBENCH_OUT or a
# temporary directory, never into the repository.
set -eu
cd "$(dirname "$0")/.."
case_file=internal/design/testdata/bench_big.json
out=${REFBENCH_OUT:-$(mktemp -d)}
mkdir -p "$out"
py=/usr/bin/python3

echo "# Go: go test -bench (benchtime ${BENCHTIME:-3x})"
go test -run '^$' -bench 'BuildDemo$|BuildBig2cm' -benchtime="${BENCHTIME:-3x}" ./internal/design | tee "$out/go_bench.txt"
go_ns=$(awk '/^BenchmarkBuildBig2cm/ {print $3}' "$out/go_bench.txt")
demo_ns=$(awk '/^BenchmarkBuildDemo-/ {print $3}' "$out/go_bench.txt")

echo "# Go volumes on the same case"
go test -count=1 -run '^TestBenchCase$' -v ./internal/design | grep -E 'cut .* fill' || true

echo "# NumPy reference: $py scripts/ref_design.py $case_file --h 0.02 --levels 1"
$py scripts/ref_design.py "$case_file" --h 0.02 --levels 1 --out "$out/ref_big.json" >/dev/null
$py - "$out/ref_big.json" "$go_ns" "$demo_ns" <<'PY'
import json, sys
r = json.load(open(sys.argv[1]))
go_s = float(sys.argv[2]) / 1e9
demo_ms = float(sys.argv[3]) / 1e6
lv = r["levels"][-1]
print("reference: cut %.3f m3  fill %.3f m3  water %.3f m3  on %d nodes" % (lv["cut"], lv["fill"], lv["water"], lv["nodes"]))
print("big case (2 cm): Go %.3f s per build, NumPy %.3f s: Go is %.1fx faster (target 5x)" % (go_s, r["seconds"], r["seconds"] / go_s))
print("demo case: Go %.1f ms per estimate (target under 100 ms)" % demo_ms)
PY
echo "outputs in $out"
