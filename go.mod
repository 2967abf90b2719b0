module github.com/antipode-color/antipode

go 1.26

require (
	github.com/lucasb-eyer/go-colorful v1.4.1 // indirect
	gonum.org/v1/gonum v0.17.0 // indirect
	pgregory.net/rapid v1.3.0 // indirect
)
