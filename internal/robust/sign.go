package robust

// Sign is the sign of a predicate's determinant: -1, 0 or +1. Its zero value
// is [Zero], the degenerate case (collinear or cocircular points).
type Sign int8

// The three signs. For [Orient2D], Positive means counter-clockwise; for
// [InCircle], Positive means inside the circle.
const (
	Negative Sign = -1
	Zero     Sign = 0
	Positive Sign = +1
)

// String returns "negative", "zero" or "positive".
func (s Sign) String() string {
	switch {
	case s < 0:
		return "negative"
	case s > 0:
		return "positive"
	}
	return "zero"
}

// signOf returns the sign of x (zero for zero; x is never NaN here).
func signOf(x float64) Sign {
	switch {
	case x > 0:
		return Positive
	case x < 0:
		return Negative
	}
	return Zero
}
