package las

import (
	"errors"
	"strings"
)

// Sentinel errors. Every error from this package that concerns the file is
// a [*FileError] wrapping one of them.
var (
	// ErrNotLAS means the file does not start with the "LASF" signature.
	ErrNotLAS = errors.New("las: not a LAS file")
	// ErrVersion means the LAS version is not 1.2, 1.3 or 1.4.
	ErrVersion = errors.New("las: unsupported LAS version")
	// ErrPointFormat means the point data record format is not one of 0, 1,
	// 2, 3, 6, 7 or 8.
	ErrPointFormat = errors.New("las: unsupported point data record format")
	// ErrLAZ means the point data is compressed (LAZ).
	ErrLAZ = errors.New("las: compressed LAZ point data is not supported; decompress it first with an open tool, " +
		"e.g. `pdal translate in.laz out.las` or `laszip -i in.laz -o out.las`")
	// ErrHeader means a header field holds an impossible value.
	ErrHeader = errors.New("las: invalid header")
	// ErrTruncated means the file ends before the header, the records or the
	// points it declares.
	ErrTruncated = errors.New("las: file is truncated")
	// ErrOptions means the read options are inconsistent; it is returned
	// bare (wrapped with the values), not in a FileError.
	ErrOptions = errors.New("las: invalid options")
)

// FileError reports a problem with one field of a LAS file. Field is named
// as in the ASPRS specification ("file signature", "point data record
// length", ...). Err wraps one of the package's sentinels, so
// errors.Is(err, ErrTruncated) works through a FileError.
type FileError struct {
	File  string // file name as given to the reader
	Field string // header field or part of the file
	Err   error
}

// Error returns "las: FILE: FIELD: problem".
func (e *FileError) Error() string {
	return "las: " + e.File + ": " + e.Field + ": " + strings.TrimPrefix(e.Err.Error(), "las: ")
}

// Unwrap returns the wrapped error.
func (e *FileError) Unwrap() error { return e.Err }
