module github.com/areatest/areatest

go 1.26.8

require (
	github.com/paulmach/orb v0.14.0
	github.com/spf13/pflag v1.1.0
	golang.org/x/term v0.48.0
	gonum.org/v1/gonum v0.17.0
)

require golang.org/x/sys v0.50.0 // indirect
