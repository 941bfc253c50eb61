package report

import (
	"bytes"
	"encoding/csv"
	"errors"
	"math"
	"strconv"
	"strings"
	"testing"
)

func TestWriteStakeoutCSV_Golden(t *testing.T) {
	rows := sampleReport(t).Stakeout
	var b bytes.Buffer
	if err := WriteStakeoutCSV(&b, rows, "ft"); err != nil {
		t.Fatal(err)
	}
	compareGolden(t, "report_stakeout.csv", b.Bytes())

	// Read back with encoding/csv (an RFC 4180 reader): the header names
	// the unit, every row has 8 fields, and the numbers are the rows'
	// values to 0.001 ft.
	recs, err := csv.NewReader(bytes.NewReader(b.Bytes())).ReadAll()
	if err != nil {
		t.Fatalf("CSV does not parse: %v", err)
	}
	wantHeader := "id,easting_ft,northing_ft,existing_ft,finished_ft,cut_fill_ft,cut_or_fill,note"
	if got := strings.Join(recs[0], ","); got != wantHeader {
		t.Errorf("header = %q, want %q", got, wantHeader)
	}
	if len(recs) != len(rows)+1 {
		t.Fatalf("%d records, want %d", len(recs), len(rows)+1)
	}
	byID := map[string]StakeoutRow{}
	for _, r := range rows {
		byID[r.ID] = r
	}
	for _, rec := range recs[1:] {
		r, ok := byID[rec[0]]
		if !ok {
			t.Fatalf("unknown id %q", rec[0])
		}
		for i, want := range []float64{r.Easting, r.Northing, r.Existing, r.Finished, r.CutFill} {
			got, err := strconv.ParseFloat(rec[i+1], 64)
			if err != nil || math.Abs(got-want) > 0.0005+1e-9*math.Abs(want) {
				t.Errorf("%s field %d = %q, want %.4f to 3 decimals", r.ID, i+1, rec[i+1], want)
			}
		}
		if want := cutOrFill(r.CutFill); rec[6] != want {
			t.Errorf("%s cut_or_fill = %q, want %q", r.ID, rec[6], want)
		}
	}
}

func TestWriteStakeoutCSV_OrderAndText(t *testing.T) {
	rows := []StakeoutRow{
		{ID: "P10", CutFill: 0.0004},
		{ID: "P2", CutFill: -0.25, Note: "shelf, \"north\"\nedge"},
		{ID: "=1+1", CutFill: 0.5},
		{ID: "p2", CutFill: 1},
	}
	orig := append([]StakeoutRow(nil), rows...)
	var b bytes.Buffer
	if err := WriteStakeoutCSV(&b, rows, "m"); err != nil {
		t.Fatal(err)
	}
	for i := range rows {
		if rows[i] != orig[i] {
			t.Fatal("WriteStakeoutCSV reordered its input")
		}
	}
	// Rows keep the order given: the order a crew walks them.
	want := "id,easting_m,northing_m,existing_m,finished_m,cut_fill_m,cut_or_fill,note\n" +
		"P10,0.000,0.000,0.000,0.000,0.000,grade,\n" +
		"P2,0.000,0.000,0.000,0.000,-0.250,cut,\"shelf, \"\"north\"\" edge\"\n" +
		"'=1+1,0.000,0.000,0.000,0.000,0.500,fill,\n" +
		"p2,0.000,0.000,0.000,0.000,1.000,fill,\n"
	if got := b.String(); got != want {
		t.Errorf("WriteStakeoutCSV =\n%s\nwant\n%s", got, want)
	}
}

func TestWriteStakeoutCSV_Errors(t *testing.T) {
	if err := WriteStakeoutCSV(&bytes.Buffer{}, nil, ""); !errors.Is(err, ErrUnitsLabel) {
		t.Errorf("empty label: %v, want ErrUnitsLabel", err)
	}
	if err := WriteStakeoutCSV(&bytes.Buffer{}, nil, "ft,m"); !errors.Is(err, ErrUnitsLabel) {
		t.Errorf("label with a comma: %v, want ErrUnitsLabel", err)
	}
	var ve *ValueError
	err := WriteStakeoutCSV(&bytes.Buffer{}, []StakeoutRow{{ID: "A"}, {ID: "B", Finished: math.Inf(1)}}, "ft")
	if !errors.As(err, &ve) || !strings.Contains(ve.Item, "row 1 (B)") || ve.Field != "finished" {
		t.Errorf("WriteStakeoutCSV = %v, want a *ValueError for row 1 (B), finished", err)
	}
	var b bytes.Buffer
	if err := WriteStakeoutCSV(&b, nil, "usft"); err != nil || strings.Count(b.String(), "\n") != 1 {
		t.Errorf("no rows: %q, %v; want the header alone", b.String(), err)
	}
}

// FuzzWriteStakeoutCSV checks that any ID and note give a CSV that an RFC
// 4180 reader (encoding/csv) reads back as one record per row with the text
// as written (sanitized, formula-safe).
func FuzzWriteStakeoutCSV(f *testing.F) {
	f.Add("P1", "rim", 1234.5, -0.25)
	f.Add("=cmd", "a,\"b\"\nc", 0.0, 1e9)
	f.Add("\xff", "\x00", -1e-7, 3.0)
	f.Fuzz(func(t *testing.T, id, note string, e, cf float64) {
		rows := []StakeoutRow{{ID: id, Note: note, Easting: e, CutFill: cf}, {ID: "Z9", Note: note}}
		var b bytes.Buffer
		err := WriteStakeoutCSV(&b, rows, "ft")
		if math.IsNaN(e) || math.IsInf(e, 0) || math.IsNaN(cf) || math.IsInf(cf, 0) {
			if !errors.Is(err, ErrInvalidValue) {
				t.Fatalf("non-finite input: %v, want ErrInvalidValue", err)
			}
			return
		}
		if err != nil {
			t.Fatal(err)
		}
		recs, err := csv.NewReader(bytes.NewReader(b.Bytes())).ReadAll()
		if err != nil {
			t.Fatalf("CSV does not parse: %v", err)
		}
		if len(recs) != 3 {
			t.Fatalf("%d records, want 3", len(recs))
		}
		found := false
		for _, rec := range recs[1:] {
			if rec[0] == csvText(id) && rec[7] == csvText(note) {
				found = true
			}
			if strings.ContainsAny(rec[7], "\n\r") {
				t.Errorf("note %q spans lines", rec[7])
			}
			if len(rec[0]) > 0 && strings.ContainsRune("=+-@", rune(rec[0][0])) {
				t.Errorf("id %q starts like a spreadsheet formula", rec[0])
			}
		}
		if !found {
			t.Errorf("row %q / %q not read back", id, note)
		}
	})
}
