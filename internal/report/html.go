package report

import (
	"bytes"
	"encoding/xml"
	"errors"
	"fmt"
	"io"
	"strings"

	"github.com/dugout-estimating/dugout/internal/units"
)

// ReportSection is one table of the report: a title, an optional
// introduction, labelled rows and notes under the table. A section without
// rows is left out.
type ReportSection struct {
	Title string
	Intro string
	Rows  []Row
	Notes []string
}

// ReportData is everything the printable report shows, as plain labelled
// values that any estimate can be mapped onto. Text is printed as given
// (escaped); drawings are SVG documents as written by [Plan] and [Section].
type ReportData struct {
	Title TitleBlock
	// Heading is the report's title; "" gives "Pond estimate".
	Heading string
	// Units is the user's unit system. It decides which system comes first
	// in the tables and the units of the stake-out table.
	Units units.System

	// Summary holds the numbers a client asks first (dig, haul, liner,
	// water, price), shown as large figures on the first page.
	Summary []Row

	PlanSVG     string   // the plan sheet; "" for none
	SectionSVGs []string // cross-sections, in order

	// Quantities are the quantity tables in the order printed: earthwork
	// and haul, liner and underlayment, shoreline, stone, gravel and crew,
	// water and pump, and cost when priced.
	Quantities []ReportSection

	Comparisons []Comparison // measured against the rules of thumb
	Methods     []Method     // how each number was computed, and its accuracy
	Accuracy    []Row        // grid cell, refinement change, point accuracy …
	Warnings    []string     // data warnings met on the way (dropped points …)
	Cautions    []Caution

	// Stakeout holds the cut sheet: world coordinates and elevations in the
	// report's Units (see [WriteStakeoutCSV]).
	Stakeout []StakeoutRow

	// Footer is a line printed at the end (e.g. the program and version).
	Footer string
}

// HTML writes r as one self-contained HTML page: the CSS and the drawings
// are inline, and nothing is fetched (no scripts, fonts, images, links or
// URLs of any kind; a Content-Security-Policy of default-src 'none' makes
// sure). The page prints on US Letter and A4 alike: @page keeps the
// printer's paper size and sets 15 mm margins, which leave 180 × 249 mm on
// either, the size the drawings are made for; each part starts on a new
// page, and tables and figures are not split across pages.
//
// The markup is also well-formed XML, so it can be checked with an XML
// parser.
//
// HTML returns an error wrapping [ErrExternalReference] when a drawing
// refers to anything outside itself, an error when a drawing is not a
// well-formed SVG document, and any error of w.
func HTML(w io.Writer, r ReportData) error {
	plan, err := inlineSVG("plan", r.PlanSVG)
	if err != nil {
		return err
	}
	sections := make([]string, len(r.SectionSVGs))
	for i, s := range r.SectionSVGs {
		if sections[i], err = inlineSVG(fmt.Sprintf("section %d", i+1), s); err != nil {
			return err
		}
	}
	heading := r.Heading
	if heading == "" {
		heading = "Pond estimate"
	}
	var h htmlDoc
	h.raw("<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\"/>\n")
	h.raw("<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\"/>\n")
	h.raw("<meta http-equiv=\"Content-Security-Policy\" content=\"default-src 'none'; style-src 'unsafe-inline'\"/>\n")
	title := heading
	if r.Title.Site != "" {
		title += " — " + r.Title.Site
	}
	h.el("title", title)
	h.raw("<style>\n" + reportCSS + "</style>\n</head>\n<body>\n")

	parts := planParts(&r, plan != "", len(sections) > 0)

	// Page 1: the job, the headline numbers, the cautions banner, contents.
	h.raw("<section class=\"part first\" id=\"summary\">\n<header class=\"job\">\n")
	h.el("p", "class", "kicker", heading)
	h.el("h1", siteOr(r.Title.Site))
	h.raw("<table class=\"facts\">\n")
	for _, f := range [][2]string{
		{"Client", r.Title.Client}, {"Site address", r.Title.Address}, {"Date", r.Title.Date},
		{"Prepared by", r.Title.Preparer}, {"Units", unitsName(r.Units)},
	} {
		if f[1] != "" {
			h.raw("<tr>")
			h.el("th", "scope", "row", f[0])
			h.el("td", f[1])
			h.raw("</tr>\n")
		}
	}
	h.raw("</table>\n</header>\n")
	if len(r.Summary) > 0 {
		h.el("h2", "Summary")
		h.raw("<div class=\"tiles\">\n")
		for _, row := range r.Summary {
			h.raw("<div class=\"tile\">")
			h.el("div", "class", "tile-label", row.Label)
			h.raw("<div class=\"tile-value\">")
			h.text(row.Value)
			if row.Unit != "" {
				h.raw(" ")
				h.el("span", "class", "unit", row.Unit)
			}
			h.raw("</div>")
			if row.Alt != "" {
				h.el("div", "class", "tile-alt", row.Alt)
			}
			if row.Note != "" {
				h.el("div", "class", "tile-note", row.Note)
			}
			h.raw("</div>\n")
		}
		h.raw("</div>\n")
	}
	if n := len(r.Cautions); n > 0 {
		h.raw("<div class=\"caution-banner\" role=\"note\">")
		h.el("strong", fmt.Sprintf("⚠ %d %s", n, plural(n, "caution applies", "cautions apply")))
		h.text(" to this job: ")
		names := make([]string, n)
		for i, c := range r.Cautions {
			names[i] = c.Title
		}
		h.text(strings.Join(names, "; ") + ". See “Cautions” before any digging.")
		h.raw("</div>\n")
	}
	h.raw("<nav class=\"contents\">")
	h.el("h2", "Contents")
	h.raw("<ol>\n")
	for _, p := range parts {
		h.el("li", p.title)
	}
	h.raw("</ol></nav>\n</section>\n")

	for _, p := range parts {
		h.raw("<section class=\"part\" id=\"" + p.id + "\">\n")
		h.el("h2", p.title)
		switch p.id {
		case "plan":
			h.raw("<figure class=\"drawing plan\">\n" + plan + "<figcaption>")
			h.text("Plan of the work. Shading shows depth of cut (brown) and height of fill (blue-green); the legend gives the classes.")
			h.raw("</figcaption></figure>\n")
		case "sections":
			for _, s := range sections {
				h.raw("<figure class=\"drawing section\">\n" + s + "</figure>\n")
			}
		case "quantities":
			writeQuantities(&h, r.Quantities, r.Units)
		case "rules":
			writeComparisons(&h, r.Comparisons, r.Units)
		case "methods":
			writeMethods(&h, &r)
		case "cautions":
			writeCautions(&h, r.Cautions)
		case "stakeout":
			writeStakeoutTable(&h, r.Stakeout, r.Units)
		}
		h.raw("</section>\n")
	}
	if r.Footer != "" {
		h.el("footer", r.Footer)
	}
	h.raw("</body>\n</html>\n")
	_, err = w.Write(h.b.Bytes())
	return err
}

// reportPart is one top-level part of the report after the summary.
type reportPart struct{ id, title string }

// planParts lists the parts r has material for, in print order.
func planParts(r *ReportData, plan, sections bool) []reportPart {
	var ps []reportPart
	add := func(ok bool, id, title string) {
		if ok {
			ps = append(ps, reportPart{id, title})
		}
	}
	hasQ := false
	for _, q := range r.Quantities {
		hasQ = hasQ || len(q.Rows) > 0
	}
	add(plan, "plan", "Plan")
	add(sections, "sections", "Sections")
	add(hasQ, "quantities", "Quantities")
	add(len(r.Comparisons) > 0, "rules", "Measured against the rules of thumb")
	add(len(r.Methods) > 0 || len(r.Accuracy) > 0 || len(r.Warnings) > 0, "methods", "How the numbers were computed")
	add(len(r.Cautions) > 0, "cautions", "Cautions")
	add(len(r.Stakeout) > 0, "stakeout", "Stake-out (cut sheet)")
	return ps
}

func siteOr(s string) string {
	if s == "" {
		return "Pond estimate"
	}
	return s
}

func plural(n int, one, many string) string {
	if n == 1 {
		return one
	}
	return many
}

// columnNames returns the headings of the value columns for sys.
func columnNames(sys units.System) (first, second string) {
	if sys.IsImperial() {
		return "US customary", "Metric"
	}
	return "Metric", "US customary"
}

func writeQuantities(h *htmlDoc, qs []ReportSection, sys units.System) {
	first, second := columnNames(sys)
	for _, q := range qs {
		if len(q.Rows) == 0 {
			continue
		}
		h.raw("<div class=\"block\">\n")
		h.el("h3", q.Title)
		if q.Intro != "" {
			h.el("p", q.Intro)
		}
		h.raw("<table class=\"values quantities\">\n<thead><tr>")
		h.el("th", "scope", "col", "Item")
		h.el("th", "scope", "col", "class", "num", first)
		h.el("th", "scope", "col", "class", "num", second)
		h.el("th", "scope", "col", "Note")
		h.raw("</tr></thead>\n<tbody>\n")
		for _, row := range q.Rows {
			h.raw("<tr>")
			h.el("th", "scope", "row", row.Label)
			h.raw("<td class=\"num\">")
			h.text(row.Value)
			if row.Unit != "" {
				h.raw(" ")
				h.el("span", "class", "unit", row.Unit)
			}
			h.raw("</td>")
			h.el("td", "class", "num alt", row.Alt)
			h.el("td", "class", "note", row.Note)
			h.raw("</tr>\n")
		}
		h.raw("</tbody>\n</table>\n")
		for _, n := range q.Notes {
			h.el("p", "class", "small", n)
		}
		h.raw("</div>\n")
	}
}

func writeComparisons(h *htmlDoc, cs []Comparison, sys units.System) {
	h.el("p", "Each measured quantity beside the rule of thumb the trade uses for it. A large difference is not an error: the rules assume simple shapes (vertical walls, a rectangle), while the measured values follow the real ground and design.")
	h.raw("<table class=\"values rules\">\n<thead><tr>")
	h.el("th", "scope", "col", "Quantity")
	for _, c := range []string{"Measured", "Rule of thumb", "Difference"} {
		h.el("th", "scope", "col", "class", "num", c)
	}
	h.el("th", "scope", "col", "Rule used")
	h.raw("</tr></thead>\n<tbody>\n")
	for _, c := range cs {
		m := QuantityRow("", c.Measured, c.Quantity, sys, "")
		rule := QuantityRow("", c.Rule, c.Quantity, sys, "")
		h.raw("<tr>")
		h.el("th", "scope", "row", c.Label)
		h.el("td", "class", "num", strings.TrimSpace(m.Value+" "+m.Unit))
		h.el("td", "class", "num", strings.TrimSpace(rule.Value+" "+rule.Unit))
		diff := "—"
		if p, ok := c.DifferencePercent(); ok {
			diff = fmtPercent(p)
		}
		h.el("td", "class", "num", diff)
		note := c.RuleText
		if c.Note != "" {
			note = strings.TrimSpace(note + ". " + c.Note)
		}
		h.el("td", "class", "note", note)
		h.raw("</tr>\n")
	}
	h.raw("</tbody>\n</table>\n")
	h.el("p", "class", "small", "Difference = (measured − rule) ÷ rule, in per cent of the rule.")
}

func writeMethods(h *htmlDoc, r *ReportData) {
	if len(r.Methods) > 0 {
		h.raw("<table class=\"methods\">\n<thead><tr>")
		for _, c := range []string{"Quantity", "How it was computed", "Accuracy"} {
			h.el("th", "scope", "col", c)
		}
		h.raw("</tr></thead>\n<tbody>\n")
		for _, m := range r.Methods {
			h.raw("<tr>")
			h.el("th", "scope", "row", m.Quantity)
			h.el("td", m.How)
			h.el("td", m.Accuracy)
			h.raw("</tr>\n")
		}
		h.raw("</tbody>\n</table>\n")
	}
	if len(r.Accuracy) > 0 {
		writeQuantities(h, []ReportSection{{Title: "Accuracy of the inputs and the computation", Rows: r.Accuracy}}, r.Units)
	}
	if len(r.Warnings) > 0 {
		h.raw("<div class=\"block\">\n")
		h.el("h3", "Data warnings")
		h.raw("<ul class=\"warnings\">\n")
		for _, w := range r.Warnings {
			h.el("li", w)
		}
		h.raw("</ul>\n</div>\n")
	}
}

func writeCautions(h *htmlDoc, cs []Caution) {
	h.el("p", "class", "lead", "Read these before any digging. They are reminders of rules that apply to work like this, not a design approval or a site safety plan; the rule cited, and your local code, govern.")
	for _, c := range cs {
		h.raw("<div class=\"caution\">")
		h.el("h3", "⚠ "+c.Title)
		h.el("p", c.Text)
		if c.Rule != "" {
			h.el("p", "class", "rule", "Rule: "+c.Rule)
		}
		h.raw("</div>\n")
	}
}

func writeStakeoutTable(h *htmlDoc, rows []StakeoutRow, sys units.System) {
	u := lengthUnit(sys)
	if sys == units.USFeet {
		u = "US survey ft"
	}
	h.el("p", "Grade stakes with existing and finished elevations. Cut/fill is finished minus existing: negative means dig (cut), positive means build up (fill). Coordinates and elevations in "+u+".")
	h.raw("<table class=\"values long stakeout\">\n<thead><tr>")
	h.el("th", "scope", "col", "Point")
	for _, c := range []string{"Easting", "Northing", "Existing", "Finished", "Cut / fill"} {
		h.el("th", "scope", "col", "class", "num", c)
	}
	h.el("th", "scope", "col", "Note")
	h.raw("</tr></thead>\n<tbody>\n")
	for _, s := range rows {
		h.raw("<tr>")
		h.el("th", "scope", "row", s.ID)
		for _, v := range []float64{s.Easting, s.Northing, s.Existing, s.Finished} {
			h.el("td", "class", "num", fixed(v, stakeoutDecimals))
		}
		h.el("td", "class", "num", cutFillText(s.CutFill))
		h.el("td", "class", "note", s.Note)
		h.raw("</tr>\n")
	}
	h.raw("</tbody>\n</table>\n")
}

// cutFillText writes a signed cut/fill with the word a crew reads on a
// stake: "C 1.250" for cut, "F 0.400" for fill.
func cutFillText(v float64) string {
	s := fixed(v, stakeoutDecimals)
	switch {
	case strings.HasPrefix(s, "-"):
		return "C " + s[1:]
	case strings.Trim(s, "0.") == "":
		return "0"
	}
	return "F " + s
}

// htmlDoc accumulates the page. Text goes through [htmlEscape].
type htmlDoc struct{ b bytes.Buffer }

func (h *htmlDoc) raw(s string)  { h.b.WriteString(s) }
func (h *htmlDoc) text(s string) { h.b.WriteString(htmlEscape(s)) }

// el writes <name attrs…>text</name>; args are attribute name/value pairs
// followed by the text.
func (h *htmlDoc) el(name string, args ...string) {
	h.b.WriteString("<" + name)
	for i := 0; i+1 < len(args); i += 2 {
		h.b.WriteString(" " + args[i] + "=\"" + htmlEscape(args[i+1]) + "\"")
	}
	h.b.WriteString(">")
	if len(args)%2 == 1 {
		h.b.WriteString(htmlEscape(args[len(args)-1]))
	}
	h.b.WriteString("</" + name + ">")
	if name != "span" && name != "strong" && name != "td" && name != "th" {
		h.b.WriteString("\n")
	}
}

// htmlEscape escapes text for the page; it is [xmlEscape], which also
// defuses anything that looks like a URL, so the page's source holds none.
func htmlEscape(s string) string { return xmlEscape(s) }

// svgElements are the elements an inlined drawing may use: shapes, groups,
// text and nested viewports. Anything that can load, link or run
// (<image>, <use>, <a>, <script>, <style>, <foreignObject>, <iframe> …) is
// refused.
var svgElements = map[string]bool{
	"svg": true, "g": true, "path": true, "rect": true, "circle": true, "ellipse": true, "line": true,
	"polyline": true, "polygon": true, "text": true, "tspan": true, "title": true, "desc": true,
}

// inlineSVG prepares a drawing for the page: it must be one well-formed
// <svg> element of the elements in [svgElements], with no attribute that
// links (href, src), carries a style sheet (style) or holds a URL (url(…),
// "scheme:" or "//"). Its namespace declaration, which HTML does not need,
// is removed: it is the one URL our drawings carry.
func inlineSVG(what, s string) (string, error) {
	if strings.TrimSpace(s) == "" {
		return "", nil
	}
	s = strings.TrimSpace(strings.Replace(s, " "+svgNamespace, "", 1))
	dec := xml.NewDecoder(strings.NewReader(s))
	depth, roots := 0, 0
	for {
		tok, err := dec.Token()
		if errors.Is(err, io.EOF) {
			break
		}
		if err != nil {
			return "", fmt.Errorf("report: %s drawing is not well-formed SVG: %w", what, err)
		}
		switch t := tok.(type) {
		case xml.StartElement:
			if depth == 0 {
				roots++
				if t.Name.Local != "svg" || roots > 1 {
					return "", fmt.Errorf("report: %s drawing must be one <svg> element, found <%s>", what, t.Name.Local)
				}
			}
			if !svgElements[t.Name.Local] {
				return "", fmt.Errorf("report: %s drawing: element <%s>: %w", what, t.Name.Local, ErrExternalReference)
			}
			for _, a := range t.Attr {
				if err := checkSVGAttr(a); err != nil {
					return "", fmt.Errorf("report: %s drawing: <%s %s=%q>: %w", what, t.Name.Local, a.Name.Local, a.Value, err)
				}
			}
			depth++
		case xml.EndElement:
			depth--
		case xml.ProcInst, xml.Directive:
			return "", fmt.Errorf("report: %s drawing must be one <svg> element without prolog or doctype", what)
		}
	}
	if roots == 0 {
		return "", fmt.Errorf("report: %s drawing holds no <svg> element", what)
	}
	return s + "\n", nil
}

// checkSVGAttr refuses attributes that link, style or hold a URL.
func checkSVGAttr(a xml.Attr) error {
	name := strings.ToLower(a.Name.Local)
	if a.Name.Space != "" || name == "href" || name == "src" || name == "style" || strings.HasPrefix(name, "on") {
		return ErrExternalReference
	}
	v := strings.ToLower(a.Value)
	if strings.Contains(v, "url(") || strings.Contains(v, "//") || hasScheme(v) {
		return ErrExternalReference
	}
	return nil
}

// hasScheme reports whether lower-case s holds "scheme:" for one of
// [uriSchemes].
func hasScheme(s string) bool {
	for _, sc := range uriSchemes {
		if i := strings.Index(s, sc+":"); i >= 0 && (i == 0 || !isLetter(s[i-1])) {
			return true
		}
	}
	return false
}

// reportCSS is the page's style sheet. Sizes are in points and millimetres
// for print; the page keeps the printer's paper size (Letter or A4) with
// 15 mm margins.
const reportCSS = `@page { size: auto; margin: 15mm; }
:root { color-scheme: light; }
* { box-sizing: border-box; }
html { -webkit-print-color-adjust: exact; print-color-adjust: exact; }
body { margin: 0 auto; max-width: 190mm; padding: 8mm 5mm; color: #111; background: #fff;
  font: 10pt/1.4 "DejaVu Sans", "Liberation Sans", Arial, Helvetica, sans-serif; }
h1 { font-size: 20pt; margin: 0 0 3mm; line-height: 1.15; }
h2 { font-size: 14pt; margin: 0 0 3mm; padding-bottom: 1mm; border-bottom: 0.6mm solid #01665e; }
h3 { font-size: 11pt; margin: 5mm 0 1.5mm; }
p { margin: 0 0 2mm; }
.kicker { text-transform: uppercase; letter-spacing: 0.08em; font-size: 9pt; color: #01665e; margin-bottom: 1mm; font-weight: bold; }
.part { margin-top: 10mm; }
.small { font-size: 8.5pt; color: #333; }
.lead { font-size: 10.5pt; }
table { border-collapse: collapse; width: 100%; margin: 0 0 3mm; break-inside: avoid; page-break-inside: avoid; }
th, td { text-align: left; vertical-align: top; padding: 1.2mm 2mm; border-bottom: 0.2mm solid #bbb; }
thead th { border-bottom: 0.4mm solid #111; font-size: 9pt; }
tbody th { font-weight: normal; }
th.num, td.num { text-align: right; white-space: nowrap; font-variant-numeric: tabular-nums; }
td.alt { color: #444; }
td.note { font-size: 8.5pt; color: #333; }
.unit { font-size: 0.85em; }
table.quantities { table-layout: fixed; }
table.quantities thead th:nth-child(1) { width: 36%; }
table.quantities thead th:nth-child(2), table.quantities thead th:nth-child(3) { width: 18%; }
table.rules thead th:nth-child(1) { width: 20%; }
table.facts { width: auto; margin-bottom: 5mm; }
table.facts th { color: #444; padding-left: 0; width: 32mm; }
table.facts th, table.facts td { border: none; padding-top: 0.4mm; padding-bottom: 0.4mm; }
.tiles { display: grid; grid-template-columns: repeat(3, 1fr); gap: 3mm; margin-bottom: 5mm; }
.tile { border: 0.3mm solid #111; padding: 2.5mm 3mm; break-inside: avoid; }
.tile-label { font-size: 8.5pt; color: #333; }
.tile-value { font-size: 16pt; font-weight: bold; font-variant-numeric: tabular-nums; line-height: 1.25; }
.tile-alt { font-size: 9pt; color: #444; }
.tile-note { font-size: 8pt; color: #444; margin-top: 1mm; }
.caution-banner { border: 0.6mm solid #111; border-left-width: 3mm; background: #fdf0d5; padding: 2.5mm 3mm; margin: 0 0 5mm; }
.caution { border: 0.4mm solid #111; border-left-width: 3mm; background: #fdf0d5; padding: 1mm 3mm 1.5mm; margin: 0 0 3mm; break-inside: avoid; }
.caution h3 { margin: 1.5mm 0 1mm; }
.caution .rule { font-size: 8.5pt; font-style: italic; margin: 0; }
.contents ol { margin: 0; padding-left: 6mm; }
figure { margin: 0 0 4mm; break-inside: avoid; page-break-inside: avoid; }
figure svg { display: block; max-width: 100%; height: auto; margin: 0 auto; }
figcaption { font-size: 8.5pt; color: #333; margin-top: 1.5mm; }
.block { break-inside: avoid; page-break-inside: avoid; }
ul.warnings { margin: 0; padding-left: 5mm; }
table.long { break-inside: auto; page-break-inside: auto; }
table.long tr { break-inside: avoid; page-break-inside: avoid; }
table.long thead { display: table-header-group; }
footer { margin-top: 8mm; font-size: 8pt; color: #555; border-top: 0.2mm solid #bbb; padding-top: 1.5mm; }
@media print {
  body { max-width: none; padding: 0; }
  .part { margin-top: 0; break-before: page; page-break-before: always; }
  .part.first { break-before: auto; page-break-before: auto; }
  h2, h3 { break-after: avoid; page-break-after: avoid; }
}
`
