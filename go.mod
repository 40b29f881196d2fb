module github.com/backshift/backshift

go 1.26

require (
	github.com/alecthomas/participle/v2 v2.1.4
	golang.org/x/image v0.30.0
	gonum.org/v1/gonum v0.17.0
	gonum.org/v1/plot v0.17.0
)

require (
	codeberg.org/go-latex/latex v0.2.0 // indirect
	git.sr.ht/~sbinet/gg v0.7.0 // indirect
	github.com/golang/freetype v0.0.0-20170609003504-e2365dfdc4a0 // indirect
	golang.org/x/text v0.28.0 // indirect
)
