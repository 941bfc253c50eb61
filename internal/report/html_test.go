package report

import (
	"bufio"
	"bytes"
	"context"
	"errors"
	"image"
	"image/png"
	"net"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"slices"
	"strings"
	"sync"
	"testing"
	"time"

	"github.com/dugout-estimating/dugout/internal/reftest"
	"github.com/dugout-estimating/dugout/internal/units"
)

func renderReport(tb testing.TB, r ReportData) []byte {
	tb.Helper()
	var b bytes.Buffer
	if err := HTML(&b, r); err != nil {
		tb.Fatalf("HTML: %v", err)
	}
	return b.Bytes()
}

// urlMarkers are the traces a fetched resource leaves in HTML or CSS.
var urlMarkers = []string{"http:", "https:", "//", "src=", "href=", "url(", "@import", "@font-face", "<script", "<link", "<img", "<iframe", "<object", "<embed"}

func TestHTML_SelfContained(t *testing.T) {
	page := renderReport(t, sampleReport(t))
	low := strings.ToLower(string(page))
	for _, m := range urlMarkers {
		if i := strings.Index(low, m); i >= 0 {
			t.Errorf("report holds %q at byte %d: …%s…", m, i, low[max(0, i-40):min(len(low), i+40)])
		}
	}
	if !strings.Contains(string(page), `content="default-src 'none'; style-src 'unsafe-inline'"`) {
		t.Error("report lacks its deny-all Content-Security-Policy")
	}
	// The page is polyglot markup: well-formed XML (encoding/xml).
	root := parseXML(t, page)
	if root.Name != "html" {
		t.Fatalf("root element <%s>, want <html>", root.Name)
	}
	var ids []string
	for _, s := range root.find(func(n *xmlNode) bool { return n.Name == "section" }) {
		ids = append(ids, s.Attr["id"])
	}
	want := "summary plan sections quantities rules methods cautions stakeout"
	if got := strings.Join(ids, " "); got != want {
		t.Errorf("sections = %q, want %q", got, want)
	}
}

func TestHTML_PlanPresentAndSized(t *testing.T) {
	root := parseXML(t, renderReport(t, sampleReport(t)))
	figs := root.find(func(n *xmlNode) bool { return n.Name == "figure" && n.Attr["class"] == "drawing plan" })
	if len(figs) != 1 {
		t.Fatalf("%d plan figures, want 1", len(figs))
	}
	svgs := figs[0].find(func(n *xmlNode) bool { return n.Name == "svg" })
	if len(svgs) == 0 {
		t.Fatal("plan figure holds no <svg>")
	}
	if s := svgs[0]; s.Attr["width"] != "180mm" || s.Attr["height"] != "225mm" || s.Attr["viewBox"] != "0 0 180 225" {
		t.Errorf("plan svg sized %q × %q (viewBox %q), want 180mm × 225mm", s.Attr["width"], s.Attr["height"], s.Attr["viewBox"])
	}
	secs := root.find(func(n *xmlNode) bool { return n.Name == "figure" && n.Attr["class"] == "drawing section" })
	if len(secs) != 2 {
		t.Errorf("%d section figures, want 2", len(secs))
	}
}

func TestHTML_Minimal_Golden(t *testing.T) {
	r := ReportData{
		Title: TitleBlock{Site: "Test pit", Client: "A. Client", Date: "1 June 2026"},
		Units: units.Metres,
		Summary: []Row{
			QuantityRow("Dig", 12.5, Volume, units.Metres, ""),
		},
		Quantities: []ReportSection{
			{Title: "Earthwork", Rows: []Row{QuantityRow("Cut", 12.5, Volume, units.Metres, "bank")}},
			{Title: "Empty section, left out"},
		},
		Comparisons: []Comparison{{Label: "Liner width", Quantity: Length, Measured: 12.944 * units.Foot, Rule: 16 * units.Foot, RuleText: "W + 2·D + 2·overlap"}},
		Cautions:    []Caution{{Title: "Buried utilities", Text: "Call 811 before digging.", Rule: "29 CFR 1926.651(b)"}},
		Stakeout:    []StakeoutRow{{ID: "S1", Easting: 1000, Northing: 2000, Existing: 10.25, Finished: 9.5, CutFill: -0.75}},
	}
	compareGolden(t, "report_minimal.html", renderReport(t, r))
}

func TestQuantityRow(t *testing.T) {
	tests := []struct {
		name  string
		si    float64
		q     Quantity
		sys   units.System
		value string
		unit  string
		alt   string
	}{
		// Math Central (University of Regina) pond: 44 256 ft³ = 1639.1 yd³
		// [confirmed, check-values §2c]; ×0.028316846592 m³/ft³ [derived]
		// = 1253.19 m³.
		{"pond volume ft", 44256 * units.CubicFoot, Volume, units.Feet, "1,639.1", "yd³", "1,253.19 m³"},
		{"pond volume m", 44256 * units.CubicFoot, Volume, units.Metres, "1253.19", "m³", "1639.1 yd³"},
		// 12 345.6 m³ / 0.764554857984 m³/yd³ = 16 147.435 yd³ [derived].
		{"metric grouping", 12345.6, Volume, units.Metres, "12\u202f345.60", "m³", "16\u202f147.4 yd³"},
		// 1000 US gal per hour = 3785.41 L/h [derived, check-values §7].
		{"pump flow", 1000 * units.GallonPerHour, Flow, units.Feet, "1,000", "US gal/h", "3,785 L/h"},
		// An acre-foot is 325 851.4286 US gal = 1 233 481.84 L [derived §1].
		{"acre-foot", 1233.48183754752, WaterVolume, units.Feet, "325,851", "US gal", "1,233,482 L"},
		// 1 yd³ of solid granite at 2.64 t/m³: 2.018 t = 2.225 short tons
		// [derived §7]; written to 0.01.
		{"granite", units.CubicYard * 2640, Mass, units.Feet, "2.22", "short tons", "2.02 t"},
		// The survey foot (1200/3937 m, 85 FR 62698) for US-survey-feet jobs.
		{"survey foot", 1200.0 / 3937 * 100, Length, units.USFeet, "100.0", "ft (US survey)", "30.48 m"},
		{"elevation", 30.45, Elevation, units.Feet, "99.90", "ft", "30.450 m"},
		{"inches", 0.6096, ShortLength, units.Feet, "24.0", "in", "610 mm"},
		{"area", 10 * units.SquareFoot, Area, units.Feet, "10", "ft²", "0.9 m²"},
		{"negative", -2 * units.CubicYard, Volume, units.Feet, "−2.0", "yd³", "−1.53 m³"},
		{"not computed", nanValue(), Volume, units.Feet, "—", "yd³", ""},
		{"number", 1.25, Number, units.Feet, "1.25", "", ""},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			r := QuantityRow("x", tc.si, tc.q, tc.sys, "n")
			if r.Value != tc.value || r.Unit != tc.unit || r.Alt != tc.alt || r.Label != "x" || r.Note != "n" {
				t.Errorf("QuantityRow = %q %q / %q, want %q %q / %q", r.Value, r.Unit, r.Alt, tc.value, tc.unit, tc.alt)
			}
		})
	}
}

func nanValue() float64 {
	var zero float64
	return zero / zero
}

func TestComparison_DifferencePercent(t *testing.T) {
	// Liner across a sloped side, top 10 ft, depth 2 ft, overlap 1 ft
	// [derived, check-values §7]: z = 2 gives 12.944 ft, z = 1 gives
	// 13.657 ft, and the rule of thumb 16 ft: −19.1 % and −14.6 %.
	tests := []struct {
		measured, rule float64
		want           string
		ok             bool
	}{
		{12.944, 16, "−19.1\u00a0%", true},
		{13.657, 16, "−14.6\u00a0%", true},
		{16, 16, "0.0\u00a0%", true},
		{18, 16, "+12.5\u00a0%", true},
		{5, 0, "", false},
		{nanValue(), 16, "", false},
	}
	for _, tc := range tests {
		c := Comparison{Measured: tc.measured * units.Foot, Rule: tc.rule * units.Foot, Quantity: Length}
		p, ok := c.DifferencePercent()
		if ok != tc.ok || (ok && fmtPercent(p) != tc.want) {
			t.Errorf("DifferencePercent(%v vs %v) = %s, %v; want %s, %v", tc.measured, tc.rule, fmtPercent(p), ok, tc.want, tc.ok)
		}
	}
}

func TestHTML_RejectsOutsideReferences(t *testing.T) {
	ns := svgNamespace
	tests := []struct {
		name, svg string
		external  bool
	}{
		{"image", `<svg ` + ns + `><image href="x.png"/></svg>`, true},
		{"xlink", `<svg ` + ns + ` xmlns:xlink="http://www.w3.org/1999/xlink"><g xlink:href="#a"/></svg>`, true},
		{"link", `<svg ` + ns + `><a href="https://example.org"><text>x</text></a></svg>`, true},
		{"script", `<svg ` + ns + `><script>alert(1)</script></svg>`, true},
		{"style attribute", `<svg ` + ns + `><rect style="fill:url(#p)"/></svg>`, true},
		{"fill url", `<svg ` + ns + `><rect fill="url(http://x/p)"/></svg>`, true},
		{"event handler", `<svg ` + ns + `><rect onclick="x()"/></svg>`, true},
		{"foreign object", `<svg ` + ns + `><foreignObject/></svg>`, true},
		{"not well-formed", `<svg ` + ns + `><g></svg>`, false},
		{"two roots", `<svg ` + ns + `/><svg/>`, false},
		{"not svg", `<html/>`, false},
		{"doctype", `<!DOCTYPE svg><svg/>`, false},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			err := HTML(&bytes.Buffer{}, ReportData{PlanSVG: tc.svg})
			if err == nil {
				t.Fatal("HTML accepted the drawing")
			}
			if got := errors.Is(err, ErrExternalReference); got != tc.external {
				t.Errorf("HTML = %v; errors.Is(ErrExternalReference) = %v, want %v", err, got, tc.external)
			}
		})
	}
	// Text that mentions a URL is kept, but defused in the source.
	page := renderReport(t, ReportData{Warnings: []string{"see https://example.org//x"}})
	if strings.Contains(string(page), "https:") || strings.Contains(string(page), "//") {
		t.Error("a URL in text reached the page's source")
	}
	root := parseXML(t, page)
	if lis := root.find(func(n *xmlNode) bool { return n.Name == "li" }); len(lis) == 0 || lis[len(lis)-1].Text != "see https://example.org//x" {
		t.Errorf("the warning does not read back as written")
	}
}

// brokenWriter fails every write.
type brokenWriter struct{}

var errBroken = errors.New("device full")

func (brokenWriter) Write([]byte) (int, error) { return 0, errBroken }

func TestWriters_PropagateWriteErrors(t *testing.T) {
	if err := HTML(brokenWriter{}, ReportData{}); !errors.Is(err, errBroken) {
		t.Errorf("HTML = %v, want %v", err, errBroken)
	}
	if err := Plan(brokenWriter{}, samplePlan()); !errors.Is(err, errBroken) {
		t.Errorf("Plan = %v, want %v", err, errBroken)
	}
	if err := Section(brokenWriter{}, trapezoid()); !errors.Is(err, errBroken) {
		t.Errorf("Section = %v, want %v", err, errBroken)
	}
	if err := WriteStakeoutCSV(brokenWriter{}, nil, "ft"); !errors.Is(err, errBroken) {
		t.Errorf("WriteStakeoutCSV = %v, want %v", err, errBroken)
	}
}

// chromiumArgs are the flags of every headless run: no sandbox (CI
// containers), no GPU, and every background service off, so that the only
// thing loaded is our file.
func chromiumArgs(profile, proxy string, extra ...string) []string {
	return append([]string{
		"--headless", "--no-sandbox", "--disable-gpu", "--disable-background-networking", "--disable-component-update",
		"--disable-sync", "--no-first-run", "--disable-quic", "--user-data-dir=" + profile, "--proxy-server=" + proxy,
	}, extra...)
}

// proxyTrap listens where Chromium is told its proxy is: any request the
// page makes, for any host, arrives here and is recorded (and refused).
type proxyTrap struct {
	ln   net.Listener
	mu   sync.Mutex
	reqs []string
	wg   sync.WaitGroup
}

func newProxyTrap(tb testing.TB) *proxyTrap {
	tb.Helper()
	ln, err := net.Listen("tcp", "127.0.0.1:0")
	if err != nil {
		tb.Fatal(err)
	}
	p := &proxyTrap{ln: ln}
	p.wg.Add(1)
	go func() {
		defer p.wg.Done()
		for {
			c, err := ln.Accept()
			if err != nil {
				return
			}
			_ = c.SetReadDeadline(time.Now().Add(2 * time.Second))
			line, _ := bufio.NewReader(c).ReadString('\n')
			p.mu.Lock()
			p.reqs = append(p.reqs, strings.TrimSpace(line))
			p.mu.Unlock()
			c.Close()
		}
	}()
	tb.Cleanup(func() { ln.Close(); p.wg.Wait() })
	return p
}

func (p *proxyTrap) addr() string { return p.ln.Addr().String() }

// browserServiceHosts are the hosts Chromium itself calls whatever page it
// shows (component updater, network time, account sign-in; seen here even
// with --disable-background-networking and --disable-component-update).
// Requests to them are not the page's.
var browserServiceHosts = []string{".google.com", ".googleapis.com", ".gvt1.com", ".gstatic.com"}

// pageRequests returns the recorded requests that are not Chromium's own
// service calls.
func (p *proxyTrap) pageRequests() []string {
	p.mu.Lock()
	defer p.mu.Unlock()
	var out []string
	for _, r := range p.reqs {
		if !isBrowserService(requestHost(r)) {
			out = append(out, r)
		}
	}
	return out
}

// requestHost returns the host of a proxy request line: "CONNECT host:443
// HTTP/1.1" or "GET http://host/path HTTP/1.1".
func requestHost(line string) string {
	f := strings.Fields(line)
	if len(f) < 2 {
		return ""
	}
	target := f[1]
	if i := strings.Index(target, "://"); i >= 0 {
		target = target[i+3:]
	}
	if i := strings.IndexAny(target, "/:"); i >= 0 {
		target = target[:i]
	}
	return strings.ToLower(target)
}

func isBrowserService(host string) bool {
	for _, s := range browserServiceHosts {
		if strings.HasSuffix("."+host, s) {
			return true
		}
	}
	return false
}

func runChromium(tb testing.TB, bin string, args ...string) []byte {
	tb.Helper()
	ctx, cancel := context.WithTimeout(context.Background(), 120*time.Second)
	defer cancel()
	cmd := exec.CommandContext(ctx, bin, args...)
	var out bytes.Buffer
	cmd.Stdout = &out
	var stderr bytes.Buffer
	cmd.Stderr = &stderr
	if err := cmd.Run(); err != nil {
		tb.Fatalf("chromium %v: %v\n%s", args, err, stderr.Bytes())
	}
	return out.Bytes()
}

var pdfPageRE = regexp.MustCompile(`/Type\s*/Page[^s]`)

// TestHTML_Chromium renders the sample report in headless Chromium (the
// reference browser engine): a screenshot must show a drawn page with the
// plan's cut shading, the rendered DOM must hold the plan, printing must
// give pages, and the page must not try to reach the network.
func TestHTML_Chromium(t *testing.T) {
	bin := reftest.Tool(t, "chromium")
	dir := t.TempDir()
	page := filepath.Join(dir, "report.html")
	if err := os.WriteFile(page, renderReport(t, sampleReport(t)), 0o644); err != nil {
		t.Fatal(err)
	}
	url := "file://" + page
	trap := newProxyTrap(t)

	shot := filepath.Join(dir, "report.png")
	runChromium(t, bin, chromiumArgs(t.TempDir(), trap.addr(), "--screenshot="+shot, "--window-size=1200,1600", "--hide-scrollbars", url)...)
	f, err := os.Open(shot)
	if err != nil {
		t.Fatalf("no screenshot: %v", err)
	}
	img, err := png.Decode(f)
	f.Close()
	if err != nil {
		t.Fatalf("screenshot is not a PNG: %v", err)
	}
	if b := img.Bounds(); b.Dx() != 1200 || b.Dy() != 1600 {
		t.Errorf("screenshot is %v, want 1200 × 1600", b)
	}
	ink, cut := countInk(img)
	total := img.Bounds().Dx() * img.Bounds().Dy()
	// A blank page has no ink; the sample's first screen holds the title,
	// the summary, the cautions and the top of the plan.
	if ink < total/50 {
		t.Errorf("screenshot has %d non-white pixels of %d: the page looks blank", ink, total)
	}
	if cut < 200 {
		t.Errorf("screenshot has %d pixels of the cut shading, want the plan drawn", cut)
	}

	dom := runChromium(t, bin, chromiumArgs(t.TempDir(), trap.addr(), "--dump-dom", url)...)
	if !bytes.Contains(dom, []byte(`<figure class="drawing plan">`)) || !bytes.Contains(dom, []byte(`width="180mm"`)) {
		t.Error("the rendered DOM lacks the plan figure and its sized <svg>")
	}

	pdf := filepath.Join(dir, "report.pdf")
	runChromium(t, bin, chromiumArgs(t.TempDir(), trap.addr(), "--no-pdf-header-footer", "--print-to-pdf="+pdf, url)...)
	data, err := os.ReadFile(pdf)
	if err != nil {
		t.Fatalf("no PDF: %v", err)
	}
	if !bytes.HasPrefix(data, []byte("%PDF-")) {
		t.Fatal("print output is not a PDF")
	}
	// Pages are "/Type /Page" objects (ISO 32000-1 §7.7.3.3); "/Pages" is
	// the tree above them. Parts start on new pages: at least one page per
	// part.
	if n := len(pdfPageRE.FindAll(data, -1)); n < 8 {
		t.Errorf("PDF has %d pages, want at least 8 (one per part)", n)
	}
	// The same page on A4 (the printer's size is kept by @page size: auto,
	// so force A4 here): every part still gets its page.
	a4 := filepath.Join(dir, "report-a4.html")
	html, _ := os.ReadFile(page)
	if err := os.WriteFile(a4, bytes.Replace(html, []byte("size: auto;"), []byte("size: A4;"), 1), 0o644); err != nil {
		t.Fatal(err)
	}
	pdfA4 := filepath.Join(dir, "report-a4.pdf")
	runChromium(t, bin, chromiumArgs(t.TempDir(), trap.addr(), "--no-pdf-header-footer", "--print-to-pdf="+pdfA4, "file://"+a4)...)
	if data, err := os.ReadFile(pdfA4); err != nil || len(pdfPageRE.FindAll(data, -1)) < 8 {
		t.Errorf("A4 PDF: %v, %d pages; want at least 8", err, len(pdfPageRE.FindAll(data, -1)))
	}

	if reqs := trap.pageRequests(); len(reqs) > 0 {
		t.Errorf("the page made %d network requests: %q", len(reqs), reqs)
	}

	// Control: a page that does fetch something is caught by the trap, so
	// the check above can fail.
	leaky := filepath.Join(dir, "leaky.html")
	if err := os.WriteFile(leaky, []byte(`<!DOCTYPE html><html><body><img src="http://fetch-check.dugout.invalid/x.png"/></body></html>`), 0o644); err != nil {
		t.Fatal(err)
	}
	control := newProxyTrap(t)
	runChromium(t, bin, chromiumArgs(t.TempDir(), control.addr(), "--dump-dom", "file://"+leaky)...)
	if reqs := control.pageRequests(); !slices.ContainsFunc(reqs, func(r string) bool { return requestHost(r) == "fetch-check.dugout.invalid" }) {
		t.Errorf("control page's request was not seen by the proxy trap (saw %q): the network check proves nothing", reqs)
	}
	if keep := os.Getenv("DUGOUT_REPORT_ARTIFACTS"); keep != "" {
		for _, name := range []string{"report.html", "report.png", "report.pdf"} {
			if b, err := os.ReadFile(filepath.Join(dir, name)); err == nil {
				_ = os.WriteFile(filepath.Join(keep, name), b, 0o644)
			}
		}
	}
}

// countInk counts the pixels of img that are not white, and those close to
// the plan's cut shades (ColorBrewer BrBG browns #bf812d and #dfc27d).
func countInk(img image.Image) (ink, cut int) {
	b := img.Bounds()
	near := func(r, g, bl uint32, c [3]uint32) bool {
		d := func(a, b uint32) uint32 {
			if a > b {
				return a - b
			}
			return b - a
		}
		return d(r, c[0]) < 12 && d(g, c[1]) < 12 && d(bl, c[2]) < 12
	}
	for y := b.Min.Y; y < b.Max.Y; y++ {
		for x := b.Min.X; x < b.Max.X; x++ {
			r, g, bl, _ := img.At(x, y).RGBA()
			r, g, bl = r>>8, g>>8, bl>>8
			if r < 250 || g < 250 || bl < 250 {
				ink++
			}
			if near(r, g, bl, [3]uint32{0xbf, 0x81, 0x2d}) || near(r, g, bl, [3]uint32{0xdf, 0xc2, 0x7d}) {
				cut++
			}
		}
	}
	return ink, cut
}

func BenchmarkHTMLSample(b *testing.B) {
	r := sampleReport(b)
	b.ReportAllocs()
	var buf bytes.Buffer
	for b.Loop() {
		buf.Reset()
		if err := HTML(&buf, r); err != nil {
			b.Fatal(err)
		}
	}
}
