// Command genucum writes bivar's table of UCUM units, ucum_table.go in
// analysis/units, from the standard's own machine-readable table: the
// ucum-essence.xml file of The Unified Code for Units of Measure
// (Regenstrief Institute and the UCUM Organization), read in place from the
// shared/reference folder beside the checkout (its SOURCES.md names the
// version and where it was taken from). Run it with go generate in
// analysis/units; the generated file is committed, so builds need no XML.
//
// The table is copied, not interpreted: every prefix with its factor, every
// base unit with its dimension, every unit with its name, print symbol,
// flags (metric, special, arbitrary), class and defining value (a number
// times a UCUM expression, or for a special unit the function the standard
// names with its argument). analysis/units resolves the definitions with its
// own parser, so the grammar that reads users' codes also reads the
// standard's.
package main

import (
	"flag"
	"log"
	"os"
	"path/filepath"

	"bivar/analysis/units/internal/ucumxml"
)

// findXML walks up from the working directory to shared/reference.
func findXML() string {
	dir, err := os.Getwd()
	if err != nil {
		log.Fatal(err)
	}
	for {
		p := filepath.Join(dir, "shared", "reference", "ucum-essence.xml")
		if _, err := os.Stat(p); err == nil {
			return p
		}
		up := filepath.Dir(dir)
		if up == dir {
			log.Fatal("genucum: shared/reference/ucum-essence.xml not found above the working directory (expected beside the checkout, as ../shared/reference)")
		}
		dir = up
	}
}

func main() {
	log.SetFlags(0)
	out := flag.String("o", "ucum_table.go", "output file")
	in := flag.String("xml", "", "ucum-essence.xml (default: found in shared/reference above the working directory)")
	flag.Parse()
	if *in == "" {
		*in = findXML()
	}
	src, err := os.ReadFile(*in)
	if err != nil {
		log.Fatal(err)
	}
	code, err := ucumxml.Generate(src)
	if err != nil {
		log.Fatalf("genucum: %s: %v", *in, err)
	}
	if err := os.WriteFile(*out, code, 0o644); err != nil {
		log.Fatal(err)
	}
}
