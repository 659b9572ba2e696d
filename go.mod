module github.com/areatest/areatest

go 1.26.8

require (
	github.com/paulmach/orb v0.14.0 // indirect
	github.com/spf13/pflag v1.1.0 // indirect
	github.com/twpayne/go-geom v1.7.0 // indirect
	golang.org/x/sys v0.50.0 // indirect
	golang.org/x/term v0.48.0 // indirect
	gonum.org/v1/gonum v0.17.0 // indirect
)
