module bivar

go 1.26.0

require (
	github.com/BurntSushi/toml v1.6.0
	github.com/yuin/goldmark v1.8.7
	gonum.org/v1/gonum v0.17.0
)

require (
	golang.org/x/net v0.63.0
	golang.org/x/sys v0.50.0
)
