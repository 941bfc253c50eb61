package survey

import (
	"bytes"
	"encoding/xml"
	"errors"
	"io"
	"math"
	"strconv"
	"strings"
)

// gpxPoint is a GPX 1.1 wptType (waypoint, route point or track point).
type gpxPoint struct {
	Lat  *string `xml:"lat,attr"`
	Lon  *string `xml:"lon,attr"`
	Ele  *string `xml:"ele"`
	Name string  `xml:"name"`
	Cmt  string  `xml:"cmt"`
	Desc string  `xml:"desc"`
	Sym  string  `xml:"sym"`
	HDOP *string `xml:"hdop"`
	VDOP *string `xml:"vdop"`
	Ext  struct {
		Inner []byte `xml:",innerxml"`
	} `xml:"extensions"`
}

// gpxBytesPerPoint is a typical size of one GPX point element, to estimate
// reading progress from the file size.
const gpxBytesPerPoint = 200

// readGPX reads the waypoints, route points and track points of a GPX 1.0
// or 1.1 file. <ele> is in metres (GPX 1.1 schema, wptType); the code is
// taken from <desc>, else <cmt>, else <sym>; accuracy in metres from
// extension elements named like the CSV accuracy columns (hacc, vacc,
// horizontal_accuracy, ...). hdop and vdop are dilutions of precision, not
// lengths, so they are not turned into accuracies.
func readGPX(path string, data []byte, opt *Options, prog *progress) (*rawFile, error) {
	f := newRaw(path, FormatGPX, opt.Units)
	f.geographic = true
	f.info.Geographic = true
	f.vUnitM = 1
	dec := xml.NewDecoder(bytes.NewReader(data))
	line := func() int { l, _ := dec.InputPos(); return l }
	rootSeen := false
	var nWpt, nRte, nTrk, nInSeq int
	dop := false
	for {
		tok, err := dec.Token()
		if errors.Is(err, io.EOF) {
			break
		}
		if err != nil {
			return nil, perr(path, line(), "", ErrSyntax, "invalid XML: %v", err)
		}
		se, ok := tok.(xml.StartElement)
		if !ok {
			continue
		}
		if !rootSeen {
			if se.Name.Local != "gpx" {
				return nil, perr(path, line(), se.Name.Local, ErrFormat, "XML root element is <%s>, not <gpx>", se.Name.Local)
			}
			rootSeen = true
			continue
		}
		var gen string
		switch se.Name.Local {
		case "rte":
			nRte++
			nInSeq = 0
			continue
		case "trk":
			nTrk++
			nInSeq = 0
			continue
		case "wpt":
			nWpt++
			gen = "wpt" + strconv.Itoa(nWpt)
		case "rtept":
			nInSeq++
			gen = "rte" + strconv.Itoa(nRte) + "-" + strconv.Itoa(nInSeq)
		case "trkpt":
			nInSeq++
			gen = "trk" + strconv.Itoa(nTrk) + "-" + strconv.Itoa(nInSeq)
		default:
			continue
		}
		at := line()
		var gp gpxPoint
		if err := dec.DecodeElement(&gp, &se); err != nil {
			return nil, perr(path, at, se.Name.Local, ErrSyntax, "invalid XML: %v", err)
		}
		p, err := gpxToRaw(path, at, se.Name.Local, &gp)
		if err != nil {
			return nil, err
		}
		p.explicitID = p.id != ""
		if !p.explicitID {
			p.id = gen
		}
		if gp.HDOP != nil || gp.VDOP != nil {
			dop = true
		}
		f.pts = append(f.pts, p)
		prog.step(len(f.pts), len(data)/gpxBytesPerPoint+1)
	}
	if !rootSeen {
		return nil, perr(path, 0, "", ErrEmpty, "XML document has no elements")
	}
	if len(f.pts) == 0 {
		return nil, perr(path, 0, "", ErrEmpty, "GPX has no waypoints, route points or track points")
	}
	if dop && !slicesAnyAcc(f.pts) {
		f.warn(0, "GPX gives hdop/vdop (dilution of precision, no unit) but no accuracy in metres: accuracy not known")
	}
	f.info.Points = len(f.pts)
	why := "no <ele> on this point"
	if allMissingZ(f.pts) {
		why = "GPX has no <ele>"
	}
	return f, f.missingZ(opt, why)
}

func gpxToRaw(path string, line int, elem string, gp *gpxPoint) (rawPoint, error) {
	p := rawPoint{line: line, id: strings.TrimSpace(gp.Name), hacc: nan, vacc: nan, z: nan}
	if gp.Lat == nil || gp.Lon == nil {
		return p, perr(path, line, elem, ErrSyntax, "<%s> needs lat and lon attributes", elem)
	}
	var err error
	if p.y, err = parseNum(path, line, "lat", *gp.Lat); err != nil {
		return p, err
	}
	if p.x, err = parseNum(path, line, "lon", *gp.Lon); err != nil {
		return p, err
	}
	if err := checkLonLat(path, line, p.x, p.y); err != nil {
		return p, err
	}
	if gp.Ele != nil {
		if p.z, err = parseOptNum(path, line, "ele", *gp.Ele); err != nil {
			return p, err
		}
	}
	for _, c := range []string{gp.Desc, gp.Cmt, gp.Sym} {
		if c = strings.TrimSpace(c); c != "" {
			p.code = c
			break
		}
	}
	if len(gp.Ext.Inner) > 0 {
		p.hacc, p.vacc = extensionAccuracy(gp.Ext.Inner)
	}
	return p, nil
}

// extensionAccuracy finds accuracy elements in a GPX <extensions> block:
// any element whose name reads as a horizontal or vertical accuracy column,
// in any namespace, holding a non-negative number of metres.
func extensionAccuracy(inner []byte) (h, v float64) {
	h, v = nan, nan
	dec := xml.NewDecoder(bytes.NewReader(inner))
	var cur role
	for {
		tok, err := dec.Token()
		if err != nil {
			return h, v
		}
		switch t := tok.(type) {
		case xml.StartElement:
			key, _ := normaliseHeader(t.Name.Local)
			cur = columnNames[key]
		case xml.CharData:
			x, err := parseNum("", 0, "", string(t))
			if err != nil || x < 0 {
				continue
			}
			switch cur {
			case roleHAcc:
				h = x
			case roleVAcc:
				v = x
			}
		case xml.EndElement:
			cur = roleNone
		}
	}
}

func slicesAnyAcc(pts []rawPoint) bool {
	for _, p := range pts {
		if !math.IsNaN(p.hacc) || !math.IsNaN(p.vacc) {
			return true
		}
	}
	return false
}

func allMissingZ(pts []rawPoint) bool {
	for _, p := range pts {
		if !math.IsNaN(p.z) {
			return false
		}
	}
	return true
}
