package survey

import (
	"slices"
	"testing"
)

func TestSplitFields(t *testing.T) {
	// Quoting follows RFC 4180 §2 (a quoted field may hold the delimiter,
	// and a doubled quote stands for one).
	tests := []struct {
		name  string
		line  string
		delim rune
		want  []string
		ok    bool
	}{
		{"comma", "1,5000.1,1000.2,99.5,GS", ',', []string{"1", "5000.1", "1000.2", "99.5", "GS"}, true},
		{"spaces trimmed", " 1 , 2 ,3 ", ',', []string{"1", "2", "3"}, true},
		{"empty fields", "1,,3,", ',', []string{"1", "", "3", ""}, true},
		{"quoted delimiter", `1,"GS, near drain",3`, ',', []string{"1", "GS, near drain", "3"}, true},
		{"doubled quote", `"6"" pipe",2`, ',', []string{`6" pipe`, "2"}, true},
		{"unterminated", `1,"GS`, ',', nil, false},
		{"text after quote", `1,"GS"x,2`, ',', nil, false},
		{"tab", "a\tb c\td", '\t', []string{"a", "b c", "d"}, true},
		{"semicolon", "1;2;3", ';', []string{"1", "2", "3"}, true},
		{"whitespace runs", "  1   5000.1\t1000.2  99.5 GS  ", whitespace, []string{"1", "5000.1", "1000.2", "99.5", "GS"}, true},
		{"whitespace quoted", `1 2 "top of wall"`, whitespace, []string{"1", "2", "top of wall"}, true},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			got, ok := splitFields(tc.line, tc.delim)
			if ok != tc.ok || (ok && !slices.Equal(got, tc.want)) {
				t.Errorf("splitFields(%q, %q) = %q, %v, want %q, %v", tc.line, tc.delim, got, ok, tc.want, tc.ok)
			}
		})
	}
}

func TestSplitLines(t *testing.T) {
	// LF, CRLF and lone CR line ends; BOM; blank and comment lines dropped.
	data := "\xef\xbb\xbfa\r\nb\rc\n\n  # note\n// note\nd"
	lines, bad, long := splitLines([]byte(data))
	var got []string
	var nums []int
	for _, l := range lines {
		got = append(got, l.text)
		nums = append(nums, l.n)
	}
	if !slices.Equal(got, []string{"a", "b", "c", "d"}) || !slices.Equal(nums, []int{1, 2, 3, 7}) || bad != 0 || long != 0 {
		t.Errorf("splitLines = %q at lines %v (bad %d, long %d), want [a b c d] at [1 2 3 7]", got, nums, bad, long)
	}
	_, bad, _ = splitLines([]byte("ok\nbad \xff byte\n"))
	if bad != 2 {
		t.Errorf("splitLines: first invalid UTF-8 line = %d, want 2", bad)
	}
}

func TestSniffDelimiter(t *testing.T) {
	tests := []struct {
		name string
		text string
		want rune
	}{
		{"comma", "1,2,3\n4,5,6", ','},
		{"tab with commas in text", "1\t2\t3\tGS, drain\n4\t5\t6\tGS", '\t'},
		{"semicolon with decimal commas", "1;5000,12;1000,5;99,1\n2;5001,1;1001,5;98,7", ';'},
		{"whitespace", "1 5000.1 1000.2 99.5\n2  5001.0 1001.0 99.0", whitespace},
		{"comma, ragged", "p,n,e,z,d\n1,2,3,4\n", ','},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			lines, _, _ := splitLines([]byte(tc.text))
			if got := sniffDelimiter(lines); got != tc.want {
				t.Errorf("sniffDelimiter(%q) = %q, want %q", tc.text, got, tc.want)
			}
		})
	}
}

func TestLooksBinary(t *testing.T) {
	if !looksBinary([]byte("PK\x03\x04\x00\x00")) {
		t.Error("looksBinary(zip header) = false, want true")
	}
	if looksBinary([]byte("1,2,3\r\n\tx\f")) {
		t.Error("looksBinary(text) = true, want false")
	}
}
