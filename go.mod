module bivar

go 1.26

require (
	github.com/BurntSushi/toml v1.6.0 // indirect
	github.com/dustin/go-humanize v1.0.1 // indirect
	github.com/go-analyze/bulk v0.1.6 // indirect
	github.com/go-analyze/charts v0.6.4 // indirect
	github.com/golang/freetype v0.0.0-20170609003504-e2365dfdc4a0 // indirect
	github.com/wcharczuk/go-chart/v2 v2.1.2 // indirect
	github.com/yuin/goldmark v1.8.7 // indirect
	golang.org/x/image v0.45.0 // indirect
	gonum.org/v1/gonum v0.17.0 // indirect
)
