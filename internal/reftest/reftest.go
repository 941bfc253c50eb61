// Package reftest helps tests that compare the project's results with an
// outside reference program (PROJ's cs2cs, GDAL, SciPy under Debian's
// python3, Chromium). When the program is missing the test is skipped with a
// message on a developer machine, and fails when the environment variable
// DUGOUT_REFERENCE is "required", as CI sets it, so that a reference check can
// never pass by silently not running.
package reftest

import (
	"os"
	"os/exec"
	"path/filepath"
	"runtime"
	"testing"
)

// Required reports whether reference programs must be present
// (DUGOUT_REFERENCE=required).
func Required() bool { return os.Getenv("DUGOUT_REFERENCE") == "required" }

// Tool returns the path of the named program, or skips (fails when
// [Required]) when it is not on PATH.
func Tool(tb testing.TB, name string) string {
	tb.Helper()
	p, err := exec.LookPath(name)
	if err != nil {
		missing(tb, "reference program %s not found on PATH (Debian packages: see .ci/run)", name)
	}
	return p
}

// Python returns Debian's /usr/bin/python3 after checking that it can import
// every module in mods (e.g. "numpy", "scipy.spatial", "osgeo"); it skips or
// fails like [Tool] otherwise.
func Python(tb testing.TB, mods ...string) string {
	tb.Helper()
	const py = "/usr/bin/python3"
	if _, err := os.Stat(py); err != nil {
		missing(tb, "reference interpreter %s not found", py)
	}
	for _, m := range mods {
		if out, err := exec.Command(py, "-c", "import "+m).CombinedOutput(); err != nil {
			missing(tb, "python module %s not importable by %s: %v: %s", m, py, err, out)
		}
	}
	return py
}

// SharedDir returns the path of the read-only ../shared folder beside the
// project (reference data, refbench scripts), or skips/fails when it is
// absent.
func SharedDir(tb testing.TB) string {
	tb.Helper()
	_, file, _, _ := runtime.Caller(0)
	// file is <repo>/internal/reftest/reftest.go
	dir := filepath.Join(filepath.Dir(file), "..", "..", "..", "shared")
	if _, err := os.Stat(dir); err != nil {
		missing(tb, "shared reference folder %s not found", dir)
	}
	abs, err := filepath.Abs(dir)
	if err != nil {
		tb.Fatal(err)
	}
	return abs
}

func missing(tb testing.TB, format string, args ...any) {
	tb.Helper()
	if Required() {
		tb.Fatalf(format, args...)
	}
	tb.Skipf(format+" (set DUGOUT_REFERENCE=required to make this an error)", args...)
}
