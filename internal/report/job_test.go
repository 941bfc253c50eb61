package report

import (
	"bytes"
	"context"
	"encoding/json"
	"errors"
	"io"
	"math"
	"os"
	"path/filepath"
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
