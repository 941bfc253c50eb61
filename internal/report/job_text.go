package report

import (
	"bufio"
	"fmt"
	"io"
	"strings"
	"unicode/utf8"

	"github.com/dugout-estimating/dugout/internal/estimate"
	"github.com/dugout-estimating/dugout/internal/units"
)

// jobSummaryWrap is the width cautions and notes are wrapped to in the text
// summary: it fits a 100-column terminal, and stays readable when the
// summary is piped to a file or a printer.
const jobSummaryWrap = 96

// WriteSummary writes the estimate r as a contractor's bid summary in
// plain text: the water level and how it was chosen, the earthwork with
// haul and truckloads, the liner and underlayment order, the shoreline,
// stone, gravel and crew time, the water and pump duty, the cost table
// when priced, the measured quantities against the rules of thumb, the
// defaults assumed and the cautions with their rules, which are always
// printed.
//
// Quantities are in the job's units (cubic yards and feet, feet, inches,
// square feet, US gallons, short tons, gallons per minute; or metric), the
// other system beside them, rounded for people: the same figures as the
// report's tables. Columns are aligned with spaces across the whole
// summary, with no colour or control codes, so the text reads the same on
// a terminal and in a file. Output is deterministic.
//
// It returns an error wrapping [ErrInvalidValue] for an incomplete result
// and any error of w.
func WriteSummary(w io.Writer, r *estimate.Result, opts SummaryOptions) error {
	v, err := newJobView(r)
	if err != nil {
		return err
	}
	bw := bufio.NewWriter(w)
	t := &jobText{sys: v.sys}
	site := r.Job.Site
	title := "Pond estimate"
	if site != nil && site.Name != "" {
		title = site.Name
	}
	t.line(title)
	t.line(strings.Repeat("=", utf8.RuneCountInString(title)))
	if site != nil {
		t.fact("Client", site.Client)
		t.fact("Address", site.Address)
	}
	if !opts.Date.IsZero() {
		t.fact("Date", opts.Date.Format("2 January 2006"))
	}
	other := "US customary alongside"
	if v.sys.IsImperial() {
		other = "metric alongside"
	}
	t.fact("Units", unitsName(v.sys)+"; "+other)
	if site != nil && site.Notes != "" {
		t.wrapped("Notes", site.Notes)
	}

	for _, s := range v.sections {
		t.heading(s.title)
		for i := range s.lines {
			l := &s.lines[i]
			value, unit, second := l.cells(v.sys)
			first := jobValueUnit(value, unit)
			if a := l.alsoText(v.sys); a != "" {
				first += " (" + a + ")"
			}
			t.row(l.label, first, second, l.note)
		}
		for _, n := range s.notes {
			t.note(n)
		}
	}

	if len(v.compare) > 0 {
		t.heading("Measured against the rules of thumb")
		for _, c := range v.compare {
			m := QuantityRow("", c.Measured, c.Quantity, v.sys, "")
			rule := QuantityRow("", c.Rule, c.Quantity, v.sys, "")
			diff := "—"
			if p, ok := c.DifferencePercent(); ok {
				diff = strings.ReplaceAll(fmtPercent(p), "\u00a0", " ")
			}
			note := diff + " of the rule: " + c.RuleText
			if c.Note != "" {
				note += ". " + c.Note
			}
			t.row(c.Label, strings.TrimSpace(m.Value+" "+m.Unit), "rule "+strings.TrimSpace(rule.Value+" "+rule.Unit), note)
		}
	}

	if len(v.assumed) > 0 {
		t.heading("Defaults assumed (not in the site file)")
		for _, a := range v.assumed {
			t.bullet("-", strings.TrimSpace(a.Label+" = "+a.Value))
		}
	}

	t.heading("Cautions")
	for i, c := range r.Takeoff.Cautions {
		text := v.cautions[i].Title + ". " + v.cautions[i].Text
		if c.Rule != "" {
			text += " Rule: " + c.Rule + "."
		}
		t.bullet("!", strings.ToUpper(c.Severity.String())+": "+text)
	}

	if n := len(r.Warnings); n > 0 {
		if opts.WarningsElsewhere {
			t.heading("Data warnings")
			t.note(fmt.Sprintf("%d %s about the data, reported apart from this summary.", n, plural(n, "warning", "warnings")))
		} else {
			t.heading("Data warnings")
			for _, wn := range r.Warnings {
				t.bullet("-", wn)
			}
		}
	}
	t.write(bw)
	return bw.Flush()
}

// jobText collects the summary's lines, then aligns the quantity rows
// of every section on one grid.
type jobText struct {
	sys   units.System
	items []jobTextItem
}

// jobTextItem is a free line (kind 0) or a quantity row (kind 1).
type jobTextItem struct {
	row   bool
	cells [4]string // label, first system, second system, note
	text  string
}

func (t *jobText) line(s string) { t.items = append(t.items, jobTextItem{text: s}) }

func (t *jobText) fact(k, v string) {
	if v != "" {
		t.line(fmt.Sprintf("%-8s %s", k, v))
	}
}

func (t *jobText) wrapped(k, v string) {
	for i, l := range jobWrap(v, jobSummaryWrap-9) {
		if i == 0 {
			t.line(fmt.Sprintf("%-8s %s", k, l))
		} else {
			t.line(strings.Repeat(" ", 9) + l)
		}
	}
}

func (t *jobText) heading(s string) {
	t.line("")
	t.line(strings.ToUpper(s))
}

func (t *jobText) row(label, first, second, note string) {
	t.items = append(t.items, jobTextItem{row: true, cells: [4]string{label, first, second, note}})
}

// note writes an indented, wrapped note under a table.
func (t *jobText) note(s string) {
	for _, l := range jobWrap(s, jobSummaryWrap-4) {
		t.line("    " + l)
	}
}

// bullet writes a wrapped item with a marker.
func (t *jobText) bullet(mark, s string) {
	for i, l := range jobWrap(s, jobSummaryWrap-4) {
		if i == 0 {
			t.line("  " + mark + " " + l)
		} else {
			t.line("    " + l)
		}
	}
}

// write prints the lines: the label column left-aligned, the two value
// columns right-aligned, two spaces between columns, the note last.
func (t *jobText) write(w io.Writer) {
	var wid [3]int
	for _, it := range t.items {
		if it.row {
			for k := range wid {
				wid[k] = max(wid[k], utf8.RuneCountInString(it.cells[k]))
			}
		}
	}
	for _, it := range t.items {
		if !it.row {
			fmt.Fprintln(w, it.text)
			continue
		}
		c := it.cells
		line := "  " + jobPadRight(c[0], wid[0]) + "  " + jobPadLeft(c[1], wid[1]) + "  " + jobPadLeft(c[2], wid[2])
		if c[3] != "" {
			line += "  " + c[3]
		}
		fmt.Fprintln(w, strings.TrimRight(line, " "))
	}
}

// jobValueUnit joins a value and its unit: with a space, but none before
// a degree sign.
func jobValueUnit(value, unit string) string {
	if unit == "" || unit == "°" {
		return value + unit
	}
	return value + " " + unit
}

func jobPadRight(s string, n int) string {
	return s + strings.Repeat(" ", max(0, n-utf8.RuneCountInString(s)))
}

func jobPadLeft(s string, n int) string {
	return strings.Repeat(" ", max(0, n-utf8.RuneCountInString(s))) + s
}

// jobWrap breaks s into lines of at most width runes at spaces (a word
// longer than width gets a line of its own).
func jobWrap(s string, width int) []string {
	var lines []string
	var cur strings.Builder
	n := 0
	for _, word := range strings.Fields(s) {
		wl := utf8.RuneCountInString(word)
		if n > 0 && n+1+wl > width {
			lines = append(lines, cur.String())
			cur.Reset()
			n = 0
		}
		if n > 0 {
			cur.WriteByte(' ')
			n++
		}
		cur.WriteString(word)
		n += wl
	}
	if n > 0 {
		lines = append(lines, cur.String())
	}
	return lines
}
