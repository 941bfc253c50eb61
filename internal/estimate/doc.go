// Package estimate runs one job end to end: it reads the survey, builds the
// existing-ground TIN, lays the pond design on it, does the earthwork
// accounting and the material takeoff, and returns everything in a
// [Result] for the report and the command line to render.
//
// It is the only package that knows how the others fit together; each step
// is a call into the package that owns it. [FromSite] turns a site file
// (lengths as written, in the site's units) into a [Job] in SI units with
// every default applied, so that what was assumed can be printed.
package estimate
