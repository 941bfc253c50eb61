#!/usr/bin/env bash
# Benchmarks of the takeoff: a demo-sized pond (target under 100 ms) and a
# design surface of about 1e6 triangles (target under 2 s, sheet angle search
# included). Extra arguments go to `go test`, e.g. -benchtime=10x or -count=5
# for benchstat.
set -euo pipefail
cd "$(dirname "$0")/.."
go test -run '^$' -bench 'BenchmarkTakeoff' -benchtime="${BENCHTIME:-3x}" "$@" ./internal/takeoff/
