package takeoff

import (
	"strings"
	"unicode"
)

// presetKey folds a preset name for lookup: lower case, with spaces,
// hyphens, underscores and dots removed, so "River rock", "river-rock" and
// "riverrock" are the same name.
func presetKey(s string) string {
	var b strings.Builder
	for _, r := range strings.ToLower(strings.TrimSpace(s)) {
		if r == ' ' || r == '-' || r == '_' || r == '.' || unicode.IsSpace(r) {
			continue
		}
		b.WriteRune(r)
	}
	return b.String()
}

// lookup returns the preset whose name (or alias) folds to the same key as
// name.
func lookup[T any](kind, name string, presets []T, names func(T) []string) (T, error) {
	k := presetKey(name)
	var known []string
	for _, p := range presets {
		ns := names(p)
		known = append(known, ns[0])
		for _, n := range ns {
			if presetKey(n) == k {
				return p, nil
			}
		}
	}
	var zero T
	return zero, &PresetError{Kind: kind, Name: name, Known: known}
}
