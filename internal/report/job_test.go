package report

import (
	"bytes"
	"context"
	"encoding/csv"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"math"
	"os"
	"path/filepath"
	"reflect"
	"strconv"
	"strings"
	"sync"
	"testing"
	"time"

	"github.com/dugout-estimating/dugout/internal/estimate"
	"github.com/dugout-estimating/dugout/internal/sitefile"
)

// demoSitePath is the built-in demo site (an invented yard, see
// testdata/demo/README.md at the repository root).
const demoSitePath = "../../testdata/demo/site.toml"

// demoDate is the fixed report date of the golden files.
var demoDate = time.Date(2026, time.June, 1, 9, 0, 0, 0, time.UTC)

var demo struct {
	once sync.Once
	r    *estimate.Result
	err  error
}

// demoResult runs the demo estimate once per test binary.
func demoResult(tb testing.TB) *estimate.Result {
	tb.Helper()
	demo.once.Do(func() {
		s, err := sitefile.Load(demoSitePath)
		if err != nil {
			demo.err = err
			return
		}
		j, err := estimate.FromSite(s)
		if err != nil {
			demo.err = err
			return
		}
		demo.r, demo.err = estimate.Run(context.Background(), j)
	})
	if demo.err != nil {
		tb.Fatalf("demo estimate: %v", demo.err)
	}
	return demo.r
}

func TestWriteSummary_DemoGolden(t *testing.T) {
	r := demoResult(t)
	var a, b bytes.Buffer
	if err := WriteSummary(&a, r, SummaryOptions{Date: demoDate}); err != nil {
		t.Fatal(err)
	}
	if err := WriteSummary(&b, r, SummaryOptions{Date: demoDate}); err != nil || !bytes.Equal(a.Bytes(), b.Bytes()) {
		t.Errorf("a second summary differs (%v)", err)
	}
	compareGolden(t, "job_demo_summary.txt", a.Bytes())
	if bytes.ContainsRune(a.Bytes(), 0x1b) {
		t.Error("the summary holds an escape code")
	}
}

func TestWriteJSON_DemoGolden(t *testing.T) {
	r := demoResult(t)
	var a, b bytes.Buffer
	if err := WriteJSON(&a, r); err != nil {
		t.Fatal(err)
	}
	if err := WriteJSON(&b, r); err != nil || !bytes.Equal(a.Bytes(), b.Bytes()) {
		t.Errorf("a second document differs (%v)", err)
	}
	if !json.Valid(a.Bytes()) {
		t.Fatal("WriteJSON wrote invalid JSON")
	}
	compareGoldenJSON(t, "job_demo.json", a.Bytes())
}

// goldenJSONRel is the relative difference allowed between a number of a
// JSON golden file and the one computed: 1e-12, a few units in the last
// place of a float64. The writer itself is byte-for-byte deterministic
// (checked above), but the design sums some areas in an order that can
// change the last bit from one run of the program to the next.
const goldenJSONRel = 1e-12

// compareGoldenJSON is compareGolden for a JSON document: the same keys in
// the same order, the same strings, and numbers within goldenJSONRel.
func compareGoldenJSON(tb testing.TB, name string, got []byte) {
	tb.Helper()
	if updatingGoldens() {
		compareGolden(tb, name, got)
		return
	}
	want, err := os.ReadFile(filepath.Join("testdata", name))
	if err != nil {
		tb.Fatalf("read golden file: %v (run go test ./internal/report -update to create it)", err)
	}
	if bytes.Equal(got, want) {
		return
	}
	gt, wt := jsonTokens(tb, got), jsonTokens(tb, want)
	if len(gt) != len(wt) {
		compareGolden(tb, name, got) // reports the difference and saves the file
		return
	}
	for i := range gt {
		g, w := gt[i], wt[i]
		gf, gok := g.(json.Number)
		wf, wok := w.(json.Number)
		if gok && wok {
			a, _ := gf.Float64()
			b, _ := wf.Float64()
			if math.Abs(a-b) <= goldenJSONRel*math.Max(math.Abs(a), math.Abs(b)) {
				continue
			}
		} else if g == w {
			continue
		}
		tb.Errorf("%s: token %d is %v, want %v", name, i, g, w)
		compareGolden(tb, name, got)
		return
	}
}

// jsonTokens returns the tokens of a JSON document, numbers as json.Number.
func jsonTokens(tb testing.TB, b []byte) []json.Token {
	tb.Helper()
	dec := json.NewDecoder(bytes.NewReader(b))
	dec.UseNumber()
	var out []json.Token
	for {
		tok, err := dec.Token()
		if errors.Is(err, io.EOF) {
			return out
		}
		if err != nil {
			tb.Fatalf("not JSON: %v", err)
		}
		out = append(out, tok)
	}
}

func TestWriteQuantitiesCSV_DemoGolden(t *testing.T) {
	r := demoResult(t)
	var a bytes.Buffer
	if err := WriteQuantitiesCSV(&a, r); err != nil {
		t.Fatal(err)
	}
	compareGolden(t, "job_demo_quantities.csv", a.Bytes())
}

// jsonPath returns doc's value at a dotted path, and whether it exists.
func jsonPath(doc map[string]any, path string) (any, bool) {
	var v any = doc
	for _, k := range strings.Split(path, ".") {
		m, ok := v.(map[string]any)
		if !ok {
			return nil, false
		}
		if v, ok = m[k]; !ok {
			return nil, false
		}
	}
	return v, true
}

func TestWriteJSON_Keys(t *testing.T) {
	var b bytes.Buffer
	if err := WriteJSON(&b, demoResult(t)); err != nil {
		t.Fatal(err)
	}
	var doc map[string]any
	if err := json.Unmarshal(b.Bytes(), &doc); err != nil {
		t.Fatal(err)
	}
	// The keys the estimate's readers rely on, each a number.
	for _, k := range []string{
		"schema_version", "water_level_m", "rim_m", "freeboard_m",
		"earthwork.cut_m3", "earthwork.fill_m3", "earthwork.net_m3", "earthwork.loose_haul_m3", "earthwork.truckloads",
		"water.volume_m3", "water.surface_area_m2", "water.volume_gal", "water.max_depth_m", "water.mean_depth_m",
		"liner.developed_area_m2", "liner.sheet_length_m", "liner.sheet_width_m", "liner.sheet_angle_deg", "liner.overlap_m",
		"liner.rule_of_thumb_length_m", "liner.rule_of_thumb_width_m",
		"shoreline.length_m", "shoreline.loops", "shoreline.rule_of_thumb_m",
		"stone.edge_tons", "stone.gravel_tons", "stone.total_tons",
		"crew.hours", "crew.days", "pump.flow_m3_per_h", "pump.head_m",
		"inputs.freeboard_m", "inputs.berm_crest_m", "inputs.soil.swell_factor", "inputs.truck.struck_m3",
	} {
		v, ok := jsonPath(doc, k)
		if _, isNum := v.(float64); !ok || !isNum {
			t.Errorf("JSON %s = %v (present %v), want a number", k, v, ok)
		}
	}
	// The echo of the inputs: strings as the site file gives them.
	for k, want := range map[string]string{
		"units": "SI", "water_level_mode": "balance", "inputs.units": "ft", "inputs.out_units": "ft", "inputs.crs": "local",
		"inputs.water_level": "balance", "inputs.soil.name": "common earth", "inputs.truck.name": "tandem", "inputs.outline_code": "POND",
		"site.name": "Halvorsen-Obi garden pond",
	} {
		if v, _ := jsonPath(doc, k); v != want {
			t.Errorf("JSON %s = %v, want %q", k, v, want)
		}
	}
	if v, _ := jsonPath(doc, "inputs.survey_files"); !reflect.DeepEqual(v, []any{"yard_total_station.csv"}) {
		t.Errorf("inputs.survey_files = %v, want the site file's path", v)
	}
	// Aliases carry the same values as the takeoff's own keys.
	area, _ := jsonPath(doc, "water.surface_area_m2")
	if a2, _ := jsonPath(doc, "water.area_m2"); area != a2 {
		t.Errorf("water.surface_area_m2 %v differs from water.area_m2 %v", area, a2)
	}
	// The US figures are the SI ones in exact units: 231 in³ to the US
	// gallon (NIST Handbook 44, App. C) and 2000 lb of 0.45359237 kg to the
	// short ton.
	vol, _ := jsonPath(doc, "water.volume_m3")
	gal, _ := jsonPath(doc, "water.volume_gal")
	if g, want := gal.(float64), vol.(float64)/(231*0.0254*0.0254*0.0254); math.Abs(g-want) > 1e-9*want {
		t.Errorf("water.volume_gal = %v, want %v", g, want)
	}
	tons, _ := jsonPath(doc, "stone.total_tons")
	tonnes, _ := jsonPath(doc, "stone.total_tonnes")
	if a, want := tons.(float64), tonnes.(float64)*1000/(2000*0.45359237); math.Abs(a-want) > 1e-9*want {
		t.Errorf("stone.total_tons = %v, want %v", a, want)
	}
}

func TestWriteJSON_NonFiniteAndOrder(t *testing.T) {
	// encoding/json rejects NaN and ±Inf; the writer writes null, keeps
	// field order, flattens embedded structs, and honours omitempty and
	// "-" as encoding/json does (encoding/json package documentation).
	type inner struct {
		A float64 `json:"a"`
	}
	type doc struct {
		Z     float64 `json:"z"`
		inner         // flattened
		NaN   float64 `json:"nan"`
		Inf   float64 `json:"inf"`
		Skip  int     `json:"-"`
		Empty string  `json:"empty,omitempty"`
		Nil   []int   `json:"nil"`
		List  []int   `json:"list"`
		Text  string  `json:"text"`
		Ptr   *inner  `json:"ptr"`
		M     map[string]int
	}
	d := doc{Z: 1.5, inner: inner{A: 0.1}, NaN: math.NaN(), Inf: math.Inf(-1), Skip: 7, List: []int{}, Text: "a<b&c", M: map[string]int{"b": 2, "a": 1}}
	var b bytes.Buffer
	writeJSONTree(&b, jsonTree(reflect.ValueOf(d)), "")
	want := `{
  "z": 1.5,
  "a": 0.1,
  "nan": null,
  "inf": null,
  "nil": null,
  "list": [],
  "text": "a<b&c",
  "ptr": null,
  "M": {
    "a": 1,
    "b": 2
  }
}`
	if b.String() != want {
		t.Errorf("tree = %s\nwant %s", b.String(), want)
	}
}

func TestWriteQuantitiesCSV_Units(t *testing.T) {
	var b bytes.Buffer
	if err := WriteQuantitiesCSV(&b, demoResult(t)); err != nil {
		t.Fatal(err)
	}
	recs, err := csv.NewReader(&b).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	if got := strings.Join(recs[0], ","); got != "section,item,value,unit,metric_value,metric_unit,note" {
		t.Fatalf("header %q", got)
	}
	// Each US value against its metric one through the exact definitions:
	// international foot 0.3048 m and yard 0.9144 m (85 FR 62698, NBS 1959
	// notice), US gallon 231 in³ (NIST Handbook 44 App. C), pound
	// 0.45359237 kg, short ton 2000 lb (check-values.md §1, derived).
	factor := map[[2]string]float64{
		{"ft", "m"}: 0.3048, {"in", "mm"}: 25.4, {"ft²", "m²"}: 0.3048 * 0.3048, {"yd³", "m³"}: 0.9144 * 0.9144 * 0.9144,
		{"US gal", "L"}: 231 * 2.54 * 2.54 * 2.54 / 1000, {"lb", "kg"}: 0.45359237, {"short tons", "t"}: 2000 * 0.45359237 / 1000,
		{"gpm", "L/min"}: 231 * 2.54 * 2.54 * 2.54 / 1000, {"US gal/h", "L/h"}: 231 * 2.54 * 2.54 * 2.54 / 1000, {"ft/s", "m/s"}: 0.3048,
	}
	seen := map[[2]string]bool{}
	for _, rec := range recs[1:] {
		if len(rec) != 7 {
			t.Fatalf("row %q has %d fields", rec, len(rec))
		}
		us, err1 := strconv.ParseFloat(rec[2], 64)
		si, err2 := strconv.ParseFloat(rec[4], 64)
		if err1 != nil || err2 != nil {
			t.Errorf("row %q: values %v %v", rec[1], err1, err2)
			continue
		}
		key := [2]string{rec[3], rec[5]}
		f, ok := factor[key]
		if rec[3] == rec[5] {
			f, ok = 1, true
		}
		if !ok {
			t.Errorf("row %q: unit pair %v not checked", rec[1], key)
			continue
		}
		seen[key] = true
		// Both are rounded: half a unit in the last place of each.
		tol := 0.5*lastPlace(rec[4]) + 0.5*lastPlace(rec[2])*f
		if math.Abs(us*f-si) > tol+1e-12 {
			t.Errorf("row %q: %s %s × %g = %g, metric %s %s", rec[1], rec[2], rec[3], f, us*f, rec[4], rec[5])
		}
	}
	for _, k := range [][2]string{{"ft", "m"}, {"yd³", "m³"}, {"US gal", "L"}, {"short tons", "t"}} {
		if !seen[k] {
			t.Errorf("no %v row", k)
		}
	}
}

// lastPlace returns the value of one unit in the last decimal of s.
func lastPlace(s string) float64 {
	i := strings.IndexByte(s, '.')
	if i < 0 {
		return 1
	}
	return math.Pow(10, -float64(len(s)-i-1))
}

func TestWriteSummary_AgreesWithJSON(t *testing.T) {
	r := demoResult(t)
	var text bytes.Buffer
	if err := WriteSummary(&text, r, SummaryOptions{}); err != nil {
		t.Fatal(err)
	}
	// Each figure of the summary is the SI value in the printed unit,
	// rounded: exact factors as in TestWriteQuantitiesCSV_Units.
	e, tk := r.Earthwork, r.Takeoff
	for _, c := range []struct {
		label, want string
	}{
		{"Cut (bank)", fmt.Sprintf("%.1f yd³ (%.0f ft³)", e.CutBankM3/(0.9144*0.9144*0.9144), e.CutBankM3/(0.3048*0.3048*0.3048))},
		{"Fill (compacted)", fmt.Sprintf("%.2f m³", e.FillCompactedM3)},
		{"Water level", fmt.Sprintf("%.2f ft", r.Design.WaterLevelM/0.3048)},
		{"Shoreline (water's edge)", fmt.Sprintf("%.1f ft", tk.Shoreline.LengthM/0.3048)},
		{"Edge stone", fmt.Sprintf("%.2f short tons", tk.Stone.EdgeTons)},
		{"Total head (duty point)", fmt.Sprintf("%.1f ft", tk.Pump.HeadM/0.3048)},
		{"Smallest sheet (length × width)", fmt.Sprintf("%.1f × %.1f ft", tk.Liner.SheetLengthM/0.3048, tk.Liner.SheetWidthM/0.3048)},
		{"Sheet as laid (length × width)", fmt.Sprintf("%.1f × %.1f ft", tk.Liner.StockSheetLengthM/0.3048, tk.Liner.StockSheetWidthM/0.3048)},
		{"Lay the stock at", fmt.Sprintf("%.0f°", tk.Liner.StockLengthAngleDeg)},
	} {
		if l := summaryLine(text.String(), c.label); !strings.Contains(l, c.want) {
			t.Errorf("summary line %q lacks %q", l, c.want)
		}
	}
	// Plain text: no escape codes, no tabs.
	if bytes.ContainsAny(text.Bytes(), "\x1b\t") {
		t.Error("the summary holds a control character")
	}
}

// summaryLine returns the line of a summary that starts with label.
func summaryLine(s, label string) string {
	for _, l := range strings.Split(s, "\n") {
		if strings.HasPrefix(l, "  "+label+" ") {
			return l
		}
	}
	return ""
}

func TestWriteSummary_Metric(t *testing.T) {
	// The demo job printed in metric: metric first, US customary beside.
	s, err := sitefile.Load(demoSitePath)
	if err != nil {
		t.Fatal(err)
	}
	if err := s.Set(`out_units="m"`); err != nil {
		t.Fatal(err)
	}
	j, err := estimate.FromSite(s)
	if err != nil {
		t.Fatal(err)
	}
	r, err := estimate.Run(context.Background(), j)
	if err != nil {
		t.Fatal(err)
	}
	var text bytes.Buffer
	if err := WriteSummary(&text, r, SummaryOptions{}); err != nil {
		t.Fatal(err)
	}
	cut := r.Earthwork.CutBankM3
	if l, want := summaryLine(text.String(), "Cut (bank)"), fmt.Sprintf("%.2f m³ (%.2f m³)", cut, cut); strings.Contains(l, want) {
		t.Errorf("metric cut line %q repeats the metric figure", l)
	}
	if l := summaryLine(text.String(), "Cut (bank)"); !strings.Contains(l, fmt.Sprintf("%.2f m³", cut)) || !strings.Contains(l, fmt.Sprintf("%.1f yd³", cut/(0.9144*0.9144*0.9144))) {
		t.Errorf("metric cut line %q, want m³ then yd³", l)
	}
	if !strings.Contains(text.String(), "Units    metres; US customary alongside") {
		t.Error("the metric summary does not say so")
	}
}

func TestWriters_IncompleteResult(t *testing.T) {
	for _, r := range []*estimate.Result{nil, {}, {Job: &estimate.Job{}}} {
		if err := WriteSummary(io.Discard, r, SummaryOptions{}); !errors.Is(err, ErrInvalidValue) {
			t.Errorf("WriteSummary(%v) = %v, want ErrInvalidValue", r, err)
		}
		if err := WriteJSON(io.Discard, r); !errors.Is(err, ErrInvalidValue) {
			t.Errorf("WriteJSON(%v) = %v, want ErrInvalidValue", r, err)
		}
		if err := WriteQuantitiesCSV(io.Discard, r); !errors.Is(err, ErrInvalidValue) {
			t.Errorf("WriteQuantitiesCSV(%v) = %v, want ErrInvalidValue", r, err)
		}
		if _, err := WriteReportDir(t.TempDir(), r, ReportOptions{}); !errors.Is(err, ErrInvalidValue) {
			t.Errorf("WriteReportDir(%v) = %v, want ErrInvalidValue", r, err)
		}
	}
	if err := WriteSummary(brokenWriter{}, demoResult(t), SummaryOptions{}); !errors.Is(err, errBroken) {
		t.Errorf("WriteSummary to a broken writer = %v", err)
	}
	if err := WriteJSON(brokenWriter{}, demoResult(t)); !errors.Is(err, errBroken) {
		t.Errorf("WriteJSON to a broken writer = %v", err)
	}
}

func BenchmarkWriteSummaryDemo(b *testing.B) {
	r := demoResult(b)
	b.ReportAllocs()
	var buf bytes.Buffer
	for b.Loop() {
		buf.Reset()
		if err := WriteSummary(&buf, r, SummaryOptions{Date: demoDate}); err != nil {
			b.Fatal(err)
		}
	}
}
