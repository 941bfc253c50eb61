package landxml

import (
	"errors"
	"fmt"
)

// Sentinel errors, wrapped by [*ParseError] on reading and returned
// wrapped with the offending values on writing.
var (
	// ErrSyntax means the document is not well-formed XML or an element's
	// content cannot be parsed.
	ErrSyntax = errors.New("landxml: syntax error")
	// ErrNonFinite means a coordinate is NaN or infinite.
	ErrNonFinite = errors.New("landxml: non-finite number")
	// ErrMissing means a required element or attribute is absent.
	ErrMissing = errors.New("landxml: missing element")
	// ErrUnknownPoint means a face refers to a point id the surface does not
	// define.
	ErrUnknownPoint = errors.New("landxml: face refers to an unknown point")
	// ErrDuplicatePoint means two points of one surface share an id.
	ErrDuplicatePoint = errors.New("landxml: duplicate point id")
	// ErrUnsupported means a valid LandXML construct this package does not
	// read (a grid surface, a linear unit other than meter, foot or
	// USSurveyFoot).
	ErrUnsupported = errors.New("landxml: unsupported")
	// ErrMesh means the mesh given to Write is malformed.
	ErrMesh = errors.New("landxml: invalid mesh")
)

// ParseError locates a problem in a LandXML document: the line, the
// element and, for points and faces, the point id or the face's ordinal
// within its surface ("#12").
type ParseError struct {
	Line    int    // 1-based line of the element's start tag; 0 if unknown
	Element string // e.g. "P", "F", "Surface", "Metric"
	ID      string // point id, "#n" for the n-th face, or the surface name
	Err     error
}

// Error returns "landxml: line 12: P id=\"7\": problem".
func (e *ParseError) Error() string {
	where := e.Element
	if e.ID != "" {
		switch e.Element {
		case "F":
			where += " " + e.ID
		case "P":
			where += fmt.Sprintf(" id=%q", e.ID)
		default:
			where += fmt.Sprintf(" %q", e.ID)
		}
	}
	msg := e.Err.Error()
	const prefix = "landxml: "
	if len(msg) > len(prefix) && msg[:len(prefix)] == prefix {
		msg = msg[len(prefix):]
	}
	if e.Line > 0 {
		return fmt.Sprintf("landxml: line %d: %s: %s", e.Line, where, msg)
	}
	return fmt.Sprintf("landxml: %s: %s", where, msg)
}

// Unwrap returns the wrapped error.
func (e *ParseError) Unwrap() error { return e.Err }
