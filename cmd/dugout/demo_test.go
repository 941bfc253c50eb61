package main

import (
	"bytes"
	"encoding/json"
	"errors"
	"io/fs"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/dugout-estimating/dugout"
)

func TestDemo_FromAnyFolder(t *testing.T) {
	// Run from an unrelated working folder with a relative --out: every
	// path is resolved against DIR/site, none against the repository.
	work := t.TempDir()
	t.Chdir(work)
	out, stderr, err := runCommand(t, newDemoCmd, nil, false, "--out", "demo-out")
	if err != nil {
		t.Fatalf("demo: %v\n%s", err, stderr)
	}
	// The demo site is written as embedded.
	err = fs.WalkDir(dugout.DemoSite(), ".", func(path string, d fs.DirEntry, err error) error {
		if err != nil || d.IsDir() {
			return err
		}
		want, _ := fs.ReadFile(dugout.DemoSite(), path)
		got, err := os.ReadFile(filepath.Join(work, "demo-out", "site", path))
		if err != nil || !bytes.Equal(got, want) {
			t.Errorf("site/%s: %v, %d bytes, want %d as embedded", path, err, len(got), len(want))
		}
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
	// The survey check comes first (328 shots, testdata/demo/README.md),
	// then the estimate and the list of report files.
	check := strings.Index(out, "Survey check: ")
	points := strings.Index(out, "points      328\n")
	summary := strings.Index(out, "Halvorsen-Obi garden pond\n")
	list := strings.Index(out, "Report written to demo-out:\n")
	if check < 0 || points < check || summary < points || list < summary {
		t.Errorf("stdout out of order (check %d, points %d, summary %d, files %d):\n%s", check, points, summary, list, out)
	}
	for _, name := range []string{"report.html", "plan.svg", "section-a.svg", "stakeout.csv", "quantities.json", "design-surface.xml"} {
		if _, err := os.Stat(filepath.Join(work, "demo-out", name)); err != nil {
			t.Errorf("report file: %v", err)
		}
	}
	// The spike and the conflicting re-shot of the demo survey (README)
	// are warnings, on stderr only.
	if !strings.Contains(stderr, "warning: ") || strings.Contains(out, "warning: ") {
		t.Errorf("warnings belong on stderr:\nstdout %q\nstderr %q", out, stderr)
	}

	// A second run over the same folder replaces the files whole.
	if _, stderr, err := runCommand(t, newDemoCmd, nil, false, "--out", "demo-out"); err != nil {
		t.Fatalf("second demo: %v\n%s", err, stderr)
	}
	entries, _ := os.ReadDir(filepath.Join(work, "demo-out"))
	for _, e := range entries {
		if strings.HasPrefix(e.Name(), ".") {
			t.Errorf("temporary file %s left behind", e.Name())
		}
	}
}

func TestDemo_JSON(t *testing.T) {
	dir := t.TempDir()
	out, stderr, err := runCommand(t, newDemoCmd, &App{JSON: true}, false, "--out", dir)
	if err != nil {
		t.Fatalf("demo --json: %v\n%s", err, stderr)
	}
	var doc map[string]any
	dec := json.NewDecoder(strings.NewReader(out))
	if err := dec.Decode(&doc); err != nil || dec.More() {
		t.Fatalf("stdout is not one JSON document (%v):\n%.300s", err, out)
	}
	if doc["schema_version"] != 1.0 {
		t.Errorf("schema_version = %v", doc["schema_version"])
	}
	// The survey check and the files went to stderr.
	if !strings.Contains(stderr, "points      328\n") || !strings.Contains(stderr, filepath.Join(dir, "report.html")+"\n") {
		t.Errorf("stderr lacks the survey check or the file list:\n%s", stderr)
	}
}

func TestDemo_NeedsOut(t *testing.T) {
	_, _, err := runCommand(t, newDemoCmd, nil, false)
	var fe *FlagError
	if !errors.As(err, &fe) {
		t.Errorf("demo without --out: %v, want a usage error", err)
	}
	// --out on a file is not a folder that can be written.
	file := filepath.Join(t.TempDir(), "f")
	if err := os.WriteFile(file, nil, 0o644); err != nil {
		t.Fatal(err)
	}
	if _, _, err := runCommand(t, newDemoCmd, nil, false, "--out", file); err == nil {
		t.Error("demo --out <file> succeeded")
	}
}
