//go:build tools

// Package tools pins the modules the project has chosen before every package
// that uses them exists, so that go.mod stays stable while they are written.
package tools

import (
	_ "github.com/BurntSushi/toml"
	_ "github.com/paulmach/orb"
	_ "github.com/spf13/cobra"
	_ "github.com/tidwall/rtree"
	_ "github.com/twpayne/go-geom"
	_ "golang.org/x/term"
	_ "pgregory.net/rapid"
)
