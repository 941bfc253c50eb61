package report

import (
	"bufio"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
)

// WriteFileAtomic writes a file through write so that readers see either
// the old file or the whole new one, never a part: write fills a temporary
// file in the same folder (so the final rename stays on one file system),
// which is flushed, synced to disk, closed and renamed over path; the folder
// is then synced so the rename itself survives a crash (on systems that
// allow syncing a folder). A new file gets mode 0644; a replaced file keeps
// its mode.
//
// If write or any step fails, the temporary file is removed, any existing
// file at path is left untouched, and the error is returned wrapped with the
// path.
func WriteFileAtomic(path string, write func(io.Writer) error) (err error) {
	dir, base := filepath.Split(path)
	if dir == "" {
		dir = "."
	}
	mode := fs.FileMode(0o644)
	if fi, statErr := os.Stat(path); statErr == nil {
		if !fi.Mode().IsRegular() {
			return fmt.Errorf("report: write %s: not a regular file", path)
		}
		mode = fi.Mode().Perm()
	}
	tmp, err := os.CreateTemp(dir, "."+base+".tmp-*")
	if err != nil {
		return fmt.Errorf("report: write %s: %w", path, err)
	}
	tmpName := tmp.Name()
	defer func() {
		if err != nil {
			tmp.Close()
			os.Remove(tmpName)
		}
	}()
	bw := bufio.NewWriterSize(tmp, 64<<10)
	if err = write(bw); err != nil {
		return fmt.Errorf("report: write %s: %w", path, err)
	}
	if err = bw.Flush(); err != nil {
		return fmt.Errorf("report: write %s: %w", path, err)
	}
	if err = tmp.Chmod(mode); err != nil {
		return fmt.Errorf("report: write %s: %w", path, err)
	}
	if err = tmp.Sync(); err != nil {
		return fmt.Errorf("report: write %s: sync: %w", path, err)
	}
	if err = tmp.Close(); err != nil {
		return fmt.Errorf("report: write %s: close: %w", path, err)
	}
	if err = os.Rename(tmpName, path); err != nil {
		return fmt.Errorf("report: write %s: %w", path, err)
	}
	syncDir(dir)
	return nil
}

// syncDir syncs a folder so that a rename in it is on disk. Errors are
// ignored: some systems cannot sync a folder, and the file itself is
// already complete and synced.
func syncDir(dir string) {
	if d, err := os.Open(dir); err == nil {
		_ = d.Sync()
		_ = d.Close()
	}
}

// CheckOutputDir makes sure dir can take the outputs before any work
// starts: it creates dir (and its parents, mode 0755) when missing, and
// proves it writable by creating and removing a small probe file. It returns
// an error wrapping [ErrOutputDir] and the cause (for example
// [fs.ErrPermission] or [fs.ErrExist] when dir is a file).
func CheckOutputDir(dir string) error {
	if dir == "" {
		dir = "."
	}
	fi, err := os.Stat(dir)
	switch {
	case errors.Is(err, fs.ErrNotExist):
		if err := os.MkdirAll(dir, 0o755); err != nil {
			return fmt.Errorf("%w: %s: %w", ErrOutputDir, dir, err)
		}
	case err != nil:
		return fmt.Errorf("%w: %s: %w", ErrOutputDir, dir, err)
	case !fi.IsDir():
		return fmt.Errorf("%w: %s is a file, not a folder: %w", ErrOutputDir, dir, fs.ErrExist)
	}
	probe, err := os.CreateTemp(dir, ".write-check-*")
	if err != nil {
		return fmt.Errorf("%w: %s cannot be written: %w", ErrOutputDir, dir, err)
	}
	name := probe.Name()
	_, werr := probe.Write([]byte("ok\n"))
	cerr := probe.Close()
	rerr := os.Remove(name)
	if err := errors.Join(werr, cerr, rerr); err != nil {
		return fmt.Errorf("%w: %s cannot be written: %w", ErrOutputDir, dir, err)
	}
	return nil
}
