package survey

import (
	"bytes"
	"strings"
	"unicode/utf8"
)

// textLine is one non-blank, non-comment line of a text file.
type textLine struct {
	n    int // 1-based line number
	text string
}

// utf8BOM is the byte-order mark some Windows programs put first.
var utf8BOM = []byte{0xEF, 0xBB, 0xBF}

// looksBinary reports whether head (the first bytes of a file) is binary
// rather than text: it holds a NUL byte, or more than 1 in 100 bytes are
// control characters other than tab, newline, carriage return and form feed.
func looksBinary(head []byte) bool {
	if bytes.IndexByte(head, 0) >= 0 {
		return true
	}
	ctl := 0
	for _, c := range head {
		if c < 0x20 && c != '\t' && c != '\n' && c != '\r' && c != '\f' {
			ctl++
		}
	}
	return ctl*100 > len(head)
}

// splitLines splits text into lines, accepting LF, CRLF and lone CR line
// ends, dropping blank lines and comment lines (first non-blank characters
// "#" or "//"). Invalid UTF-8 is replaced by U+FFFD; badUTF8 gives the first
// line where that happened (0 if none), long the first line longer than
// [MaxLineBytes] (0 if none; splitting stops there).
func splitLines(data []byte) (lines []textLine, badUTF8, long int) {
	data = bytes.TrimPrefix(data, utf8BOM)
	n := 0
	for len(data) > 0 {
		n++
		i := bytes.IndexAny(data, "\r\n")
		var line []byte
		if i < 0 {
			line, data = data, nil
		} else {
			line = data[:i]
			if data[i] == '\r' && i+1 < len(data) && data[i+1] == '\n' {
				i++
			}
			data = data[i+1:]
		}
		if len(line) > MaxLineBytes {
			return lines, badUTF8, n
		}
		t := strings.TrimSpace(string(line))
		if t == "" || strings.HasPrefix(t, "#") || strings.HasPrefix(t, "//") {
			continue
		}
		if !utf8.ValidString(t) {
			if badUTF8 == 0 {
				badUTF8 = n
			}
			t = strings.ToValidUTF8(t, "\uFFFD")
		}
		lines = append(lines, textLine{n: n, text: t})
	}
	return lines, badUTF8, 0
}

// whitespace is the pseudo-delimiter for fields separated by runs of
// spaces and tabs.
const whitespace = ' '

// splitFields splits a line at delim (or runs of white space when delim is
// [whitespace]), honouring double quotes: a field that starts with a quote
// runs to the matching quote, and a doubled quote inside stands for one.
// Fields are trimmed of surrounding white space. ok is false for an
// unterminated quote or text after a closing quote.
func splitFields(line string, delim rune) (fields []string, ok bool) {
	i := 0
	for {
		if delim == whitespace {
			for i < len(line) && (line[i] == ' ' || line[i] == '\t') {
				i++
			}
			if i == len(line) {
				return fields, true
			}
		} else {
			for i < len(line) && (line[i] == ' ' || line[i] == '\t') && rune(line[i]) != delim {
				i++
			}
		}
		var f string
		if i < len(line) && line[i] == '"' {
			var b strings.Builder
			i++
			closed := false
			for i < len(line) {
				if line[i] == '"' {
					if i+1 < len(line) && line[i+1] == '"' {
						b.WriteByte('"')
						i += 2
						continue
					}
					i++
					closed = true
					break
				}
				b.WriteByte(line[i])
				i++
			}
			if !closed {
				return nil, false
			}
			f = b.String()
			for i < len(line) && (line[i] == ' ' || line[i] == '\t') && rune(line[i]) != delim {
				i++
			}
			if i < len(line) && !isDelim(line[i], delim) {
				return nil, false
			}
		} else {
			j := i
			for j < len(line) && !isDelim(line[j], delim) {
				j++
			}
			f = strings.TrimSpace(line[i:j])
			i = j
		}
		fields = append(fields, f)
		if i >= len(line) {
			return fields, true
		}
		i++ // past the delimiter
		if delim != whitespace && i == len(line) {
			return append(fields, ""), true
		}
	}
}

func isDelim(c byte, delim rune) bool {
	if delim == whitespace {
		return c == ' ' || c == '\t'
	}
	return rune(c) == delim
}

// sniffSample is how many lines the delimiter is chosen from.
const sniffSample = 50

// sniffDelimiter chooses the field separator of a delimited file from its
// first lines. A candidate qualifies when it splits every sampled line into
// at least two fields (lines with a broken quote are not counted); among tab, semicolon and comma the first that gives
// every line the same field count wins (semicolon before comma, because
// files separated by semicolons are written where the comma is the decimal
// mark), else the first that qualifies at all; white space is the fallback.
func sniffDelimiter(lines []textLine) rune {
	sample := lines[:min(len(lines), sniffSample)]
	cands := []rune{'\t', ';', ','}
	var loose rune
	for _, d := range cands {
		counts := map[int]bool{}
		qualifies := true
		for _, l := range sample {
			f, ok := splitFields(l.text, d)
			if !ok {
				continue // a broken quote is reported when the row is read
			}
			if len(f) < 2 {
				qualifies = false
				break
			}
			counts[len(f)] = true
		}
		if !qualifies {
			continue
		}
		if len(counts) == 1 {
			return d
		}
		if loose == 0 {
			loose = d
		}
	}
	if loose != 0 {
		return loose
	}
	return whitespace
}

// delimiterName returns the FileInfo spelling of a delimiter.
func delimiterName(d rune) string {
	if d == whitespace {
		return " "
	}
	return string(d)
}
