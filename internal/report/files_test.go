package report

import (
	"errors"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

func TestWriteFileAtomic(t *testing.T) {
	dir := t.TempDir()
	path := filepath.Join(dir, "report.html")
	if err := WriteFileAtomic(path, func(w io.Writer) error {
		_, err := io.WriteString(w, "first")
		return err
	}); err != nil {
		t.Fatal(err)
	}
	assertFile(t, path, "first", 0o644)

	// A replaced file keeps its mode.
	if err := os.Chmod(path, 0o600); err != nil {
		t.Fatal(err)
	}
	if err := WriteFileAtomic(path, func(w io.Writer) error {
		_, err := io.WriteString(w, "second")
		return err
	}); err != nil {
		t.Fatal(err)
	}
	assertFile(t, path, "second", 0o600)
	assertOnlyFiles(t, dir, "report.html")
}

func TestWriteFileAtomic_FailureLeavesOldFile(t *testing.T) {
	dir := t.TempDir()
	path := filepath.Join(dir, "plan.svg")
	if err := os.WriteFile(path, []byte("old drawing"), 0o644); err != nil {
		t.Fatal(err)
	}
	boom := errors.New("drawing failed half-way")
	err := WriteFileAtomic(path, func(w io.Writer) error {
		// More than the write buffer, so part of it reaches the temporary
		// file before the failure.
		if _, err := io.WriteString(w, strings.Repeat("x", 200<<10)); err != nil {
			return err
		}
		return boom
	})
	if !errors.Is(err, boom) || !strings.Contains(err.Error(), path) {
		t.Errorf("WriteFileAtomic = %v, want %v naming %s", err, boom, path)
	}
	assertFile(t, path, "old drawing", 0o644)
	assertOnlyFiles(t, dir, "plan.svg")
}

func TestWriteFileAtomic_BadTargets(t *testing.T) {
	dir := t.TempDir()
	write := func(w io.Writer) error { _, err := io.WriteString(w, "x"); return err }
	if err := WriteFileAtomic(filepath.Join(dir, "missing", "a.csv"), write); !errors.Is(err, fs.ErrNotExist) {
		t.Errorf("missing folder: %v, want fs.ErrNotExist", err)
	}
	sub := filepath.Join(dir, "sub")
	if err := os.Mkdir(sub, 0o755); err != nil {
		t.Fatal(err)
	}
	if err := WriteFileAtomic(sub, write); err == nil {
		t.Error("writing over a folder succeeded")
	}
	if fi, err := os.Stat(sub); err != nil || !fi.IsDir() {
		t.Error("the folder was replaced")
	}
	assertOnlyFiles(t, dir, "sub")
}

func TestCheckOutputDir(t *testing.T) {
	base := t.TempDir()
	nested := filepath.Join(base, "jobs", "ashgrove", "out")
	if err := CheckOutputDir(nested); err != nil {
		t.Fatalf("CheckOutputDir(new nested folder) = %v", err)
	}
	if fi, err := os.Stat(nested); err != nil || !fi.IsDir() {
		t.Fatalf("folder not created: %v", err)
	}
	if err := CheckOutputDir(nested); err != nil {
		t.Errorf("CheckOutputDir(existing folder) = %v", err)
	}
	assertOnlyFiles(t, nested)

	file := filepath.Join(base, "notes.txt")
	if err := os.WriteFile(file, []byte("x"), 0o644); err != nil {
		t.Fatal(err)
	}
	if err := CheckOutputDir(file); !errors.Is(err, ErrOutputDir) || !errors.Is(err, fs.ErrExist) {
		t.Errorf("CheckOutputDir(a file) = %v, want ErrOutputDir and fs.ErrExist", err)
	}
	// A folder below a file can never be made (this holds even for root).
	if err := CheckOutputDir(filepath.Join(file, "out")); !errors.Is(err, ErrOutputDir) {
		t.Errorf("CheckOutputDir(below a file) = %v, want ErrOutputDir", err)
	}
	if os.Geteuid() != 0 { // root writes anywhere, so a read-only folder proves nothing
		ro := filepath.Join(base, "ro")
		if err := os.Mkdir(ro, 0o555); err != nil {
			t.Fatal(err)
		}
		if err := CheckOutputDir(ro); !errors.Is(err, ErrOutputDir) || !errors.Is(err, fs.ErrPermission) {
			t.Errorf("CheckOutputDir(read-only) = %v, want ErrOutputDir and fs.ErrPermission", err)
		}
	}
}

func assertFile(tb testing.TB, path, content string, mode fs.FileMode) {
	tb.Helper()
	b, err := os.ReadFile(path)
	if err != nil {
		tb.Fatal(err)
	}
	if string(b) != content {
		tb.Errorf("%s holds %q, want %q", path, b, content)
	}
	fi, err := os.Stat(path)
	if err != nil {
		tb.Fatal(err)
	}
	if fi.Mode().Perm() != mode {
		tb.Errorf("%s mode %v, want %v", path, fi.Mode().Perm(), mode)
	}
}

// assertOnlyFiles checks that dir holds exactly names: no temporary or
// probe file left behind.
func assertOnlyFiles(tb testing.TB, dir string, names ...string) {
	tb.Helper()
	es, err := os.ReadDir(dir)
	if err != nil {
		tb.Fatal(err)
	}
	var got []string
	for _, e := range es {
		got = append(got, e.Name())
	}
	if strings.Join(got, " ") != strings.Join(names, " ") {
		tb.Errorf("%s holds %v, want %v", dir, got, names)
	}
}
