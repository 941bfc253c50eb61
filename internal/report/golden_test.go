package report

import (
	"bytes"
	"flag"
	"os"
	"path/filepath"
	"testing"
)

// The -update flag rewrites the golden files in testdata/ ("go test
// ./internal/report -update"). Another test file of this package may define
// the same flag; package-level variables are initialised in file-name order,
// so whichever file comes first defines it and the other reuses it.
var _ = defineUpdateFlag()

func defineUpdateFlag() bool {
	if flag.Lookup("update") == nil {
		flag.Bool("update", false, "rewrite the golden files in testdata/")
	}
	return true
}

// updatingGoldens reports whether -update was given.
func updatingGoldens() bool {
	f := flag.Lookup("update")
	return f != nil && f.Value.String() == "true"
}

// compareGolden compares got with testdata/name, or rewrites the file when
// -update is set. On a mismatch it writes got to a temporary folder, named
// in the failure, so the two can be opened side by side.
func compareGolden(tb testing.TB, name string, got []byte) {
	tb.Helper()
	path := filepath.Join("testdata", name)
	if updatingGoldens() {
		if err := os.WriteFile(path, got, 0o644); err != nil {
			tb.Fatal(err)
		}
		return
	}
	want, err := os.ReadFile(path)
	if err != nil {
		tb.Fatalf("read golden file: %v (run go test ./internal/report -update to create it)", err)
	}
	if bytes.Equal(got, want) {
		return
	}
	where := "(could not be saved)"
	if dir, err := os.MkdirTemp("", "report-golden-"); err == nil {
		if err := os.WriteFile(filepath.Join(dir, name), got, 0o644); err == nil {
			where = filepath.Join(dir, name)
		}
	}
	tb.Errorf("%s differs from the golden file (%d bytes, want %d); the new output is %s", name, len(got), len(want), where)
}
