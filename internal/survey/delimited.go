package survey

import (
	"fmt"
	"slices"
	"strconv"
	"strings"

	"github.com/dugout-estimating/dugout/internal/units"
)

// column is one header column.
type column struct {
	name string // as written
	role role
	unit string // unit stated in the header, if any
}

// layout is how the columns of a delimited file map to roles.
type layout struct {
	cols  []column
	idx   map[role]int // role -> column index
	z     role         // which kind of height the elevation column is
	geo   bool         // positions are lat/lon
	delim rune
}

func (l *layout) has(r role) bool { _, ok := l.idx[r]; return ok }

// field returns the text of role r on a row ("" when absent).
func (l *layout) field(fields []string, r role) string {
	i, ok := l.idx[r]
	if !ok || i >= len(fields) {
		return ""
	}
	return fields[i]
}

// fieldName returns the header name of role r for messages.
func (l *layout) fieldName(r role) string {
	if i, ok := l.idx[r]; ok && l.cols[i].name != "" {
		return l.cols[i].name
	}
	return r.String()
}

// rolesString lists the roles in column order, for FileInfo.Columns; a
// column not used is "-".
func (l *layout) rolesString() string {
	s := make([]string, len(l.cols))
	for i := range s {
		s[i] = "-"
	}
	for r, i := range l.idx {
		s[i] = r.String()
	}
	return strings.Join(s, ",")
}

// isHeaderRow reports whether the first row is a header: no field is a
// number and at least one is not empty.
func isHeaderRow(fields []string) bool {
	nonEmpty := false
	for _, f := range fields {
		if isNumber(f) {
			return false
		}
		if f != "" {
			nonEmpty = true
		}
	}
	return nonEmpty
}

// readText reads a delimited text file or a level book.
func readText(path string, data []byte, opt *Options, prog *progress) (*rawFile, error) {
	lines, bad, long := splitLines(data)
	if long > 0 {
		return nil, perr(path, long, "", ErrTooLarge, "line longer than %d bytes", MaxLineBytes)
	}
	if len(lines) == 0 {
		return nil, perr(path, 0, "", ErrEmpty, "file has no data lines (empty, blank or only comments)")
	}
	delim := sniffDelimiter(lines)
	first, ok := splitFields(lines[0].text, delim)
	if !ok {
		return nil, perr(path, lines[0].n, "", ErrSyntax, "unterminated quote")
	}
	f := newRaw(path, FormatDelimited, opt.Units)
	f.info.Delimiter = delimiterName(delim)
	if bad > 0 {
		f.warn(bad, "text is not valid UTF-8 (a Latin-1 or Windows code page file?): unreadable characters replaced")
	}
	var lay *layout
	var err error
	if isHeaderRow(first) {
		lay, err = headerLayout(path, lines[0].n, first, opt, f)
		if err != nil {
			return nil, err
		}
		if opt.Columns != "" {
			f.warn(lines[0].n, "the file has a header, so --columns %s is not used", opt.Columns)
		}
		lines = lines[1:]
		if len(lines) == 0 {
			return nil, perr(path, 0, "", ErrEmpty, "header but no data rows")
		}
	} else {
		lay, err = specLayout(path, lines[0].n, opt.Columns)
		if err != nil {
			return nil, err
		}
	}
	lay.delim = delim
	f.info.Columns = lay.rolesString()
	if lay.has(roleBS) {
		f.info.Format = FormatLevels
		if err := readLevels(f, lay, lines, opt, prog); err != nil {
			return nil, err
		}
		return f, nil
	}
	f.geographic = lay.geo
	if lay.geo {
		f.info.Geographic = true
	}
	if err := readRows(f, lay, lines, opt, prog); err != nil {
		return nil, err
	}
	why := "no elevation value"
	if !lay.has(lay.z) {
		why = "no elevation column"
	}
	if err := f.missingZ(opt, why); err != nil {
		return nil, err
	}
	return f, nil
}

// headerLayout maps a header row to roles.
func headerLayout(path string, line int, names []string, opt *Options, f *rawFile) (*layout, error) {
	lay := &layout{idx: map[role]int{}}
	var unknown []string
	zCols := map[role]int{}
	for i, name := range names {
		key, unit := normaliseHeader(name)
		r := columnNames[key]
		lay.cols = append(lay.cols, column{name: name, role: r, unit: unit})
		switch r {
		case roleNone:
			if key != "" {
				unknown = append(unknown, strconv.Quote(name))
			}
			continue
		case roleIgnore:
			continue
		case roleElev, roleAlt, roleEllH, roleHeight:
			if j, dup := zCols[r]; dup {
				return nil, perr(path, line, name, ErrColumns, "columns %d (%q) and %d (%q) both give the %s", j+1, names[j], i+1, name, r)
			}
			zCols[r] = i
			continue
		}
		if j, dup := lay.idx[r]; dup {
			return nil, perr(path, line, name, ErrColumns, "columns %d (%q) and %d (%q) both give the %s", j+1, names[j], i+1, name, r)
		}
		lay.idx[r] = i
	}
	hasNE := lay.has(roleNorth) && lay.has(roleEast)
	hasLL := lay.has(roleLat) && lay.has(roleLon)
	for _, pair := range [][2]role{{roleNorth, roleEast}, {roleEast, roleNorth}, {roleLat, roleLon}, {roleLon, roleLat}} {
		if lay.has(pair[0]) && !lay.has(pair[1]) {
			return nil, perr(path, line, lay.fieldName(pair[0]), ErrColumns, "the header has a %s column but no %s column", pair[0], pair[1])
		}
	}
	if !hasNE && !hasLL {
		msg := "the header names no position columns (northing and easting, or latitude and longitude)"
		if len(unknown) > 0 {
			msg += "; unknown columns: " + strings.Join(unknown, ", ")
		}
		return nil, perr(path, line, "", ErrColumns, "%s", msg)
	}
	if len(unknown) > 0 {
		f.warn(line, "columns not recognised and not used: %s", strings.Join(unknown, ", "))
	}
	lay.geo = hasLL
	if hasNE && hasLL {
		if isAuto(opt.CRS) {
			f.warn(line, "the file has both latitude/longitude and northing/easting: using latitude/longitude (--crs auto); pass --crs to use the grid columns")
			delete(lay.idx, roleNorth)
			delete(lay.idx, roleEast)
		} else {
			f.warn(line, "the file has both latitude/longitude and northing/easting: using the grid columns (--crs %s)", specString(opt.CRS))
			lay.geo = false
			delete(lay.idx, roleLat)
			delete(lay.idx, roleLon)
		}
	}
	// "height" is the GPS altitude in a lon/lat file, else an elevation.
	if i, ok := zCols[roleHeight]; ok {
		delete(zCols, roleHeight)
		r := roleElev
		if lay.geo {
			r = roleAlt
		}
		if _, dup := zCols[r]; !dup {
			zCols[r] = i
		}
	}
	// Preference: an elevation (orthometric) over a plain altitude over an
	// ellipsoidal height.
	zOrder := []role{roleElev, roleAlt, roleEllH}
	for _, r := range zOrder {
		if i, ok := zCols[r]; ok {
			lay.z = r
			lay.idx[r] = i
			for _, r2 := range zOrder {
				if j, ok := zCols[r2]; ok && r2 != r && j != i {
					f.warn(line, "column %q not used: elevations are taken from %q", names[j], names[i])
				}
			}
			break
		}
	}
	if lay.z == roleNone {
		lay.z = roleElev
	}
	if lay.z == roleEllH {
		f.warn(line, "elevations are ellipsoidal heights (column %q): they differ from sea-level elevations by the geoid height, often tens of metres; depths and volumes are unaffected, but do not mix them with levels on a benchmark", lay.fieldName(roleEllH))
	}
	// Units stated in the header must agree with the units read in.
	check := []role{lay.z}
	if !lay.geo {
		check = append(check, roleNorth, roleEast)
	}
	for _, r := range check {
		if i, ok := lay.idx[r]; ok && unitConflict(lay.cols[i].unit, opt.Units) {
			f.warn(line, "column %q states %s but the file is read in %s (--units %s): check the units", lay.cols[i].name, lay.cols[i].unit, opt.Units, opt.Units)
		}
	}
	if lay.has(roleIS) || lay.has(roleFS) {
		if !lay.has(roleBS) {
			return nil, perr(path, line, "", ErrColumns, "level book columns without a backsight (bs) column")
		}
	}
	return lay, nil
}

// specLayout maps a --columns order such as "PNEZD" to roles.
func specLayout(path string, line int, spec string) (*layout, error) {
	if spec == "" {
		return nil, perr(path, line, "", ErrColumns, "the file has no header, and point, northing, easting orders cannot be told apart: give the column order with --columns (PNEZD, PENZD, NEZ, ENZ, ...)")
	}
	if err := ValidateColumns(spec); err != nil {
		return nil, &ParseError{File: path, Err: err}
	}
	lay := &layout{idx: map[role]int{}, z: roleElev}
	for i, c := range strings.ToUpper(spec) {
		r := map[rune]role{'P': roleID, 'N': roleNorth, 'E': roleEast, 'Z': roleElev, 'D': roleDesc}[c]
		lay.idx[r] = i
		lay.cols = append(lay.cols, column{name: string(c), role: r})
	}
	return lay, nil
}

// ValidateColumns checks a --columns order: letters P, N, E, Z and D, each
// at most once, with N and E present.
func ValidateColumns(spec string) error {
	seen := map[rune]bool{}
	for _, c := range strings.ToUpper(spec) {
		if !strings.ContainsRune("PNEZD", c) {
			return fmt.Errorf("%w: column order %q: %q is not one of P (point), N (northing), E (easting), Z (elevation), D (description)", ErrColumns, spec, c)
		}
		if seen[c] {
			return fmt.Errorf("%w: column order %q names %c twice", ErrColumns, spec, c)
		}
		seen[c] = true
	}
	if !seen['N'] || !seen['E'] {
		return fmt.Errorf("%w: column order %q needs both N and E", ErrColumns, spec)
	}
	return nil
}

// rowFields splits one data row and reconciles its length with the
// layout: surplus fields are joined into the description when it is the
// last column (descriptions are often written without quotes), and
// surplus empty fields are dropped.
func rowFields(path string, l textLine, lay *layout) ([]string, error) {
	fields, ok := splitFields(l.text, lay.delim)
	if !ok {
		return nil, perr(path, l.n, "", ErrSyntax, "unterminated quote or text after a closing quote")
	}
	n := len(lay.cols)
	if len(fields) <= n {
		return fields, nil
	}
	extra := fields[n:]
	if !slices.ContainsFunc(extra, func(s string) bool { return s != "" }) {
		return fields[:n], nil
	}
	if i, ok := lay.idx[roleDesc]; ok && i == n-1 {
		sep := string(lay.delim)
		if lay.delim == ',' || lay.delim == ';' {
			sep += " "
		}
		joined := strings.Join(slices.DeleteFunc(slices.Clone(fields[n-1:]), func(s string) bool { return s == "" }), sep)
		return append(fields[:n-1:n-1], joined), nil
	}
	return nil, perr(path, l.n, "", ErrSyntax, "%d fields, but the file has %d columns", len(fields), n)
}

// readRows reads the data rows of a plain delimited file.
func readRows(f *rawFile, lay *layout, lines []textLine, opt *Options, prog *progress) error {
	path := f.info.Path
	accM := func(r role) float64 {
		if i, ok := lay.idx[r]; ok && lay.cols[i].unit != "" && lay.cols[i].unit != "deg" {
			if s, err := units.ParseSystem(lay.cols[i].unit); err == nil {
				return s.Metres()
			}
		}
		return opt.Units.Metres()
	}
	hf, vf := accM(roleHAcc), accM(roleVAcc)
	f.pts = make([]rawPoint, 0, len(lines))
	for k, l := range lines {
		prog.step(k, len(lines))
		fields, err := rowFields(path, l, lay)
		if err != nil {
			return err
		}
		p := rawPoint{line: l.n, hacc: nan, vacc: nan}
		xr, yr := roleEast, roleNorth
		if lay.geo {
			xr, yr = roleLon, roleLat
		}
		if p.x, err = parseNum(path, l.n, lay.fieldName(xr), lay.field(fields, xr)); err != nil {
			return err
		}
		if p.y, err = parseNum(path, l.n, lay.fieldName(yr), lay.field(fields, yr)); err != nil {
			return err
		}
		if lay.geo {
			if err := checkLonLat(path, l.n, p.x, p.y); err != nil {
				return err
			}
		}
		if p.z, err = parseOptNum(path, l.n, lay.fieldName(lay.z), lay.field(fields, lay.z)); err != nil {
			return err
		}
		for _, a := range []struct {
			r   role
			dst *float64
			f   float64
		}{{roleHAcc, &p.hacc, hf}, {roleVAcc, &p.vacc, vf}} {
			v, err := parseOptNum(path, l.n, lay.fieldName(a.r), lay.field(fields, a.r))
			if err != nil {
				return err
			}
			if v < 0 {
				return perr(path, l.n, lay.fieldName(a.r), ErrRange, "accuracy %s is negative", fmtNum(v))
			}
			*a.dst = v * a.f
		}
		p.id = lay.field(fields, roleID)
		p.explicitID = p.id != ""
		if !p.explicitID {
			p.id = strconv.Itoa(k + 1)
		}
		p.code = lay.field(fields, roleDesc)
		f.pts = append(f.pts, p)
	}
	f.info.Points = len(f.pts)
	return nil
}
