module github.com/dugout-estimating/dugout

go 1.26.3

require (
	github.com/BurntSushi/toml v1.6.0
	github.com/paulmach/orb v0.14.0
	github.com/spf13/cobra v1.10.2
	github.com/tidwall/rtree v1.10.0
	github.com/twpayne/go-geom v1.7.0
	golang.org/x/term v0.48.0
	pgregory.net/rapid v1.3.0
)

require (
	github.com/inconshreveable/mousetrap v1.1.0 // indirect
	github.com/spf13/pflag v1.0.9 // indirect
	github.com/tidwall/geoindex v1.7.0 // indirect
	golang.org/x/sys v0.50.0 // indirect
)
