package estimate

import (
	"context"
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"time"

	"github.com/dugout-estimating/dugout/internal/cutfill"
	"github.com/dugout-estimating/dugout/internal/design"
	"github.com/dugout-estimating/dugout/internal/geom"
	"github.com/dugout-estimating/dugout/internal/survey"
	"github.com/dugout-estimating/dugout/internal/takeoff"
	"github.com/dugout-estimating/dugout/internal/tin"
	"github.com/dugout-estimating/dugout/internal/units"
)

// Result is one estimate: every step's output, in SI units and the local
// frame of Survey.Frame.
type Result struct {
	Job       *Job
	Survey    *survey.Set
	Terrain   *tin.Surface
	Zones     []design.Zone
	Design    *design.Surface
	Earthwork cutfill.Result
	Takeoff   takeoff.Result
	// Warnings collects the non-fatal findings of every step, each
	// prefixed with the step.
	Warnings []string
	// Timings records how long each step took, for --verbose output and
	// benchmarks.
	Timings []Timing
}

// Timing is the wall time of one step.
type Timing struct {
	Step    string
	Seconds float64
}

// Run carries out the job. It checks ctx between steps.
func Run(ctx context.Context, j *Job) (*Result, error) {
	r := &Result{Job: j}
	step := func(name string, fn func() error) error {
		if err := ctx.Err(); err != nil {
			return err
		}
		t0 := time.Now()
		err := fn()
		r.Timings = append(r.Timings, Timing{name, time.Since(t0).Seconds()})
		return err
	}
	if err := step("survey", func() error { return r.readSurvey() }); err != nil {
		return nil, err
	}
	if err := step("surface", func() error { return r.buildTerrain() }); err != nil {
		return nil, err
	}
	if err := step("zones", func() error { return r.makeZones() }); err != nil {
		return nil, err
	}
	if err := step("design", func() error { return r.buildDesign() }); err != nil {
		return nil, err
	}
	if err := step("earthwork", func() error { return r.account() }); err != nil {
		return nil, err
	}
	if err := step("takeoff", func() error { return r.takeoff() }); err != nil {
		return nil, err
	}
	return r, nil
}

// readSurvey reads the survey files together with the boundary, breakline
// and outline files, so that all of them share one local frame.
func (r *Result) readSurvey() error {
	j := r.Job
	paths := append([]string(nil), j.SurveyFiles...)
	extra := map[string]bool{}
	for _, p := range append([]string{j.BoundaryFile, j.OutlineFile}, j.BreaklineFile...) {
		if p != "" && !extra[p] {
			extra[p] = true
			paths = append(paths, p)
		}
	}
	set, err := survey.Read(paths, j.Survey)
	if err != nil {
		return err
	}
	r.Survey = set
	for _, w := range set.Warnings {
		r.Warnings = append(r.Warnings, "survey: "+w.String())
	}
	return nil
}

func (r *Result) buildTerrain() error {
	j, set := r.Job, r.Survey
	opt := j.TIN
	for _, l := range set.Breaklines {
		name := l.Name
		if name == "" {
			name = fmt.Sprintf("%s line %d", l.File, l.Line)
		}
		opt.Breaklines = append(opt.Breaklines, tin.Breakline{Name: name, Pts: l.Pts})
	}
	for _, p := range set.Boundaries {
		if j.OutlineFile != "" && p.File == j.OutlineFile {
			continue // the pond outline, not a survey boundary
		}
		opt.Boundary = append(opt.Boundary, p.Ring)
	}
	spikes := map[survey.PointRef]bool{}
	for _, sp := range set.Summary().Spikes {
		spikes[sp.Point] = true
	}
	pts := make([]geom.Vec3, 0, len(set.Points))
	src := make([]int, 0, len(set.Points)) // TIN input index -> survey point
	for i, p := range set.Points {
		if !p.HasZ() {
			continue
		}
		ref := survey.PointRef{ID: p.ID, File: p.File, Line: p.Line}
		if spikes[ref] {
			if j.DropSpikes {
				r.Warnings = append(r.Warnings, fmt.Sprintf("surface: suspected spike %s (%s line %d) left out of the surface (survey.drop_spikes)",
					p.ID, filepath.Base(p.File), p.Line))
				continue
			}
			r.Warnings = append(r.Warnings, fmt.Sprintf("surface: suspected spike %s (%s line %d) is in the surface; check the shot, or set survey.drop_spikes = true to leave it out",
				p.ID, filepath.Base(p.File), p.Line))
		}
		pts = append(pts, p.P)
		src = append(src, i)
	}
	s, err := tin.Build(pts, opt)
	if err != nil {
		return fmt.Errorf("surface: %w", err)
	}
	r.Terrain = s
	for _, w := range s.Warnings() {
		r.Warnings = append(r.Warnings, "surface: "+r.tinWarning(w, src))
	}
	return nil
}

// maxNamedShots is how many shots a warning names before "and N more".
const maxNamedShots = 10

// tinWarning words a surface warning for the estimator: shots by their id
// and line, lengths in the job's units.
func (r *Result) tinWarning(w tin.Warning, src []int) string {
	c := w.Conflict
	if c == nil {
		return w.Msg
	}
	var who []string
	for k, i := range c.Points {
		if k == maxNamedShots {
			who = append(who, fmt.Sprintf("%d more", len(c.Points)-k))
			break
		}
		p := r.Survey.Points[src[i]]
		who = append(who, fmt.Sprintf("%s (%s line %d)", p.ID, filepath.Base(p.File), p.Line))
	}
	for _, b := range c.Breaklines {
		who = append(who, "breakline "+b)
	}
	u := r.Job.OutUnits
	return fmt.Sprintf("duplicate shots %s differ in elevation by %s (more than %s); kept the %s, %s",
		strings.Join(who, ", "), lengthText(c.SpreadM, u), lengthText(c.TolM, u), c.Policy, lengthText(c.KeptZM, u))
}

// lengthText writes a length in metres in the job's unit family, for
// warnings (the report formats its own tables).
func lengthText(m float64, u units.System) string {
	if u.IsImperial() {
		return fmt.Sprintf("%.2f ft", m/units.Foot)
	}
	return fmt.Sprintf("%.3f m", m)
}

func (r *Result) makeZones() error {
	j, set := r.Job, r.Survey
	switch {
	case j.ZonesFile != "":
		f, err := os.Open(j.ZonesFile)
		if err != nil {
			return err
		}
		defer f.Close()
		zs, err := design.ReadZonesGeoJSON(f, j.ZonesFile, r.fileToLocal, j.Units)
		if err != nil {
			return err
		}
		r.Zones = zs
		return nil
	case j.OutlineCode != "":
		pts := set.CodedString(j.OutlineCode)
		if len(pts) < 3 {
			return fmt.Errorf("%w: design.outline.code %q: %d survey points carry it, need at least 3 to make an outline", ErrJob, j.OutlineCode, len(pts))
		}
		ring := make(geom.Ring, len(pts))
		for i, p := range pts {
			ring[i] = p.P.XY()
		}
		j.Outline.Ring = ring
	case j.OutlineFile != "":
		var rings []geom.Ring
		for _, p := range set.Boundaries {
			if p.File == j.OutlineFile {
				rings = append(rings, p.Ring)
			}
		}
		if len(rings) != 1 {
			return fmt.Errorf("%w: design.outline.file %s: want exactly one polygon, found %d", ErrJob, j.OutlineFile, len(rings))
		}
		j.Outline.Ring = rings[0]
	}
	zs, err := j.Outline.Zones()
	if err != nil {
		return err
	}
	r.Zones = zs
	return nil
}

// fileToLocal converts coordinates from a zones file to the local frame:
// lon/lat (RFC 7946) when the survey itself was lon/lat, else the survey's
// own projected coordinates in its units.
func (r *Result) fileToLocal(x, y float64) (geom.Vec2, error) {
	set := r.Survey
	if set.Geographic && set.CRS.UTM != nil {
		e, n, err := set.CRS.UTM.Forward(x, y)
		if err != nil {
			return geom.Vec2{}, err
		}
		return set.Frame.ToLocal(geom.Vec2{X: e, Y: n}), nil
	}
	f := r.Job.Units.Metres()
	return set.Frame.ToLocal(geom.Vec2{X: x * f, Y: y * f}), nil
}

func (r *Result) buildDesign() error {
	p := r.Job.Design
	p.Zones = r.Zones
	s, err := design.Build(r.Terrain, p)
	var off *design.OffSurveyError
	if errors.As(err, &off) {
		return r.offSurvey(off, err)
	}
	if err != nil {
		return err
	}
	r.Design = s
	for _, w := range s.Warnings {
		r.Warnings = append(r.Warnings, "design: "+w)
	}
	return nil
}

func (r *Result) account() error {
	j, d := r.Job, r.Design
	res, err := cutfill.Compute(cutfill.Inputs{
		CutBankM3:       d.CutM3,
		FillCompactedM3: d.FillM3,
		Soil:            j.Soil,
		TopsoilDepthM:   j.TopsoilDepthM,
		TopsoilAreaM2:   d.DisturbedAreaM2,
		Truck:           j.Truck,
		Heaped:          j.Heaped,
		ReuseCut:        j.ReuseCut,
	})
	if err != nil {
		return fmt.Errorf("earthwork: %w", err)
	}
	r.Earthwork = res
	return nil
}

func (r *Result) takeoff() error {
	j := r.Job
	in, err := takeoff.InputFromDesign(r.Design)
	if err != nil {
		return fmt.Errorf("takeoff: %w", err)
	}
	in.Truckloads = float64(r.Earthwork.Truckloads)
	o := j.Takeoff
	if j.DischargePoint != "" {
		found := false
		for _, p := range r.Survey.Points {
			if p.ID == j.DischargePoint && p.HasZ() {
				z := p.P.Z
				o.Water.DischargeElevationM = &z
				found = true
				break
			}
		}
		if !found {
			return fmt.Errorf("%w: pump.discharge_point %q: no survey point with that id and an elevation", ErrJob, j.DischargePoint)
		}
	}
	res, err := takeoff.Compute(in, o)
	if err != nil {
		return fmt.Errorf("takeoff: %w", err)
	}
	r.Takeoff = res
	for _, w := range res.Warnings {
		r.Warnings = append(r.Warnings, "takeoff: "+w)
	}
	return nil
}

// offSurvey words a design that needs unsurveyed ground in the job's own
// coordinates and units, and says why when the water level is the cause.
func (r *Result) offSurvey(off *design.OffSurveyError, err error) error {
	u := r.Job.OutUnits
	f := u.Metres()
	lo := r.Survey.Frame.ToWorld(off.Box.Min)
	hi := r.Survey.Frame.ToWorld(off.Box.Max)
	what := "the walls or berm"
	if off.InBowl {
		what = "the pond itself"
	}
	msg := fmt.Sprintf("%s need ground up to %s beyond the survey, around E %.2f to %.2f, N %.2f to %.2f %s",
		what, lengthText(off.BeyondM, u), lo.X/f, hi.X/f, lo.Y/f, hi.Y/f, u)
	sum := r.Terrain.Summary()
	if p := r.Job.Design; p.Level == design.LevelFixed && p.WaterLevelM+p.FreeboardM > sum.ZMaxM {
		msg += fmt.Sprintf("; the rim at %s is above all surveyed ground (highest %s), so the pond would stand on a berm all round",
			lengthText(p.WaterLevelM+p.FreeboardM, u), lengthText(sum.ZMaxM, u))
	}
	return &rewordedError{msg: "design: " + msg + ": survey farther out, or move or lower the pond", err: err}
}

// rewordedError says err again in the estimator's words (world
// coordinates, the job's units) and keeps it for errors.Is and errors.As.
type rewordedError struct {
	msg string
	err error
}

func (e *rewordedError) Error() string { return e.msg }
func (e *rewordedError) Unwrap() error { return e.err }
