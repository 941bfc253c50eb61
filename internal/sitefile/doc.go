// Package sitefile reads the site file: one TOML document (comments allowed)
// that describes a job from the survey files to the report. Its schema is our
// own and is documented in the README ("Site file").
//
// Lengths in the file may be bare numbers, taken in the site's units
// (`units = "ft"`), or strings with a unit ("9in", "0.75 ft", "0.3 m"); they
// are kept as written ([Length]) and converted by the caller, which knows the
// units. Relative paths are resolved against the site file's folder.
//
// Any key can be overridden from the command line with "section.key=value"
// ([Site.Set]); unknown keys are errors, so a typo never passes silently.
package sitefile
