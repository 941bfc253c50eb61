// Package dugout holds the built-in demo site: an invented back yard with
// its total-station and phone-GPS surveys and a site file for a garden pond,
// embedded from testdata/demo so that `dugout demo` works from the binary
// alone.
package dugout

import (
	"embed"
	"io/fs"
)

//go:generate go run ./tools/gendemo -out testdata/demo

//go:embed testdata/demo
var demoFiles embed.FS

// DemoSite returns the demo site's files; the site file is "site.toml".
func DemoSite() fs.FS {
	sub, err := fs.Sub(demoFiles, "testdata/demo")
	if err != nil {
		panic(err) // the embedded tree is fixed at build time
	}
	return sub
}
