#!/usr/bin/env bash
# Benchmarks of the takeoff, on the package's own analytic stand-in bowl
# (BenchmarkTakeoff*) and on surfaces built by the design package
# (BenchmarkFromDesign*): a demo-sized pond (target under 100 ms) and about
# 1e6 bowl triangles (target under 2 s, the sheet's angle search included).
# BENCHTIME sets -benchtime (default 3x); extra arguments go to `go test`,
# e.g. -count=5 for benchstat.
set -euo pipefail
cd "$(dirname "$0")/.."
go test -run '^$' -bench 'Benchmark(Takeoff|FromDesign)' -benchtime="${BENCHTIME:-3x}" "$@" ./internal/takeoff/
