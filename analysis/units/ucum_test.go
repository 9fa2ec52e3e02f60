package units

import (
	"bytes"
	"encoding/xml"
	"fmt"
	"io"
	"math"
	"math/big"
	"os"
	"strings"
	"testing"

	"bivar/analysis/units/internal/ucumxml"
	"bivar/internal/reference"
)

// ucumXML reads the UCUM standard's table, ucum-essence.xml (UCUM 2.2,
// Regenstrief Institute; shared/reference/SOURCES.md says where it was
// taken from), in place.
func ucumXML(t *testing.T) []byte {
	t.Helper()
	src, err := os.ReadFile(reference.File(t, "ucum-essence.xml"))
	if err != nil {
		t.Fatal(err)
	}
	return src
}

// TestTableIsGenerated: the committed ucum_table.go is exactly what the
// generator makes from the XML (run "go generate ./analysis/units" after
// the XML changes).
func TestTableIsGenerated(t *testing.T) {
	want, err := ucumxml.Generate(ucumXML(t))
	if err != nil {
		t.Fatal(err)
	}
	got, err := os.ReadFile("ucum_table.go")
	if err != nil {
		t.Fatal(err)
	}
	if !bytes.Equal(got, want) {
		t.Fatal("ucum_table.go is not what ucum-essence.xml gives; run: go generate ./analysis/units")
	}
}

// xmlDef is one <unit> of ucum-essence.xml, read here independently of the
// generator.
type xmlDef struct {
	Code      string `xml:"Code,attr"`
	Special   string `xml:"isSpecial,attr"`
	Arbitrary string `xml:"isArbitrary,attr"`
	Metric    string `xml:"isMetric,attr"`
	Value     struct {
		Unit     string `xml:"Unit,attr"`
		Value    string `xml:"value,attr"`
		Function *struct {
			Name  string `xml:"name,attr"`
			Value string `xml:"value,attr"`
			Unit  string `xml:"Unit,attr"`
		} `xml:"function"`
	} `xml:"value"`
}

func readDefs(t *testing.T) (units []xmlDef, prefixes, bases int) {
	t.Helper()
	var doc struct {
		Version  string     `xml:"version,attr"`
		Revision string     `xml:"revision-date,attr"`
		Prefixes []struct{} `xml:"prefix"`
		Bases    []struct{} `xml:"base-unit"`
		Units    []xmlDef   `xml:"unit"`
	}
	dec := xml.NewDecoder(bytes.NewReader(ucumXML(t)))
	dec.CharsetReader = func(_ string, r io.Reader) (io.Reader, error) { return r, nil }
	if err := dec.Decode(&doc); err != nil {
		t.Fatal(err)
	}
	if v := doc.Version + " (" + doc.Revision + ")"; v != ucumVersion {
		t.Errorf("XML is UCUM %s, the table says %s; run: go generate ./analysis/units", v, ucumVersion)
	}
	return doc.Units, len(doc.Prefixes), len(doc.Bases)
}

// TestUCUMTable checks bivar's units against the standard's table, unit by
// unit: every unit is known; its value is the XML's number times the XML's
// expression (bivar's factor to the expression's unit equals the printed
// number to 15 significant digits) and its dimension is the expression's;
// special units are marked: Cel, [degF] and [degRe] convert by a factor and
// an offset, those of other functions convert to no other unit; arbitrary
// units are commensurable only with themselves.
func TestUCUMTable(t *testing.T) {
	defs, np, nb := readDefs(t)
	// Counts SOURCES.md states for this copy of the file.
	if len(defs) != 305 || np != 24 || nb != 7 {
		t.Errorf("XML has %d units, %d prefixes, %d base units; SOURCES.md says 305, 24, 7", len(defs), np, nb)
	}
	if len(ucumUnits) != len(defs) || len(ucumPrefixes) != np || len(ucumBases) != nb {
		t.Errorf("table has %d units, %d prefixes, %d bases; XML %d, %d, %d", len(ucumUnits), len(ucumPrefixes), len(ucumBases), len(defs), np, nb)
	}
	var special, nonLinear []string
	for _, d := range defs {
		if err := Check(d.Code); err != nil {
			t.Errorf("%s: %v", d.Code, err)
			continue
		}
		off, nl := Special(d.Code)
		if (d.Special == "yes") != (off || nl) {
			t.Errorf("%s: isSpecial=%q in the XML, bivar offset=%v non-linear=%v", d.Code, d.Special, off, nl)
		}
		if a := allAtoms()[d.Code]; a.metric != (d.Metric == "yes") {
			t.Errorf("%s: isMetric=%q in the XML, bivar metric=%v", d.Code, d.Metric, a.metric)
		}
		switch f := d.Value.Function; {
		case f != nil && off:
			special = append(special, d.Code)
			// Two points on the scale fix the line: bivar's factor is the
			// function's value times its unit (5 K/9 for [degF]).
			s, _, err := Affine(d.Code, "K")
			if err != nil {
				t.Errorf("%s: %v", d.Code, err)
				continue
			}
			want := mustValue(t, f.Value) * mustFactor(t, f.Unit, "K")
			if !within(s, want, 1e-15) {
				t.Errorf("%s: 1 degree = %.17g K, XML %s × %s = %.17g K", d.Code, s, f.Value, f.Unit, want)
			}
		case f != nil:
			nonLinear = append(nonLinear, d.Code)
			if !nl {
				t.Errorf("%s: function %s, but bivar does not mark it non-linear", d.Code, f.Name)
			}
			if _, _, err := Affine(d.Code, f.Unit); err == nil {
				t.Errorf("%s: converts to %s; a non-linear scale must not", d.Code, f.Unit)
			}
			if s, o, err := Affine(d.Code, d.Code); err != nil || s != 1 || o != 0 {
				t.Errorf("%s to itself: %v, %v, %v", d.Code, s, o, err)
			}
		case d.Arbitrary == "yes":
			dm, _ := Dimension(d.Code)
			if !strings.Contains(dm, "arbitrary") {
				t.Errorf("%s: arbitrary in the XML, bivar's dimension is %q", d.Code, dm)
			}
			if _, _, err := Affine(d.Code, "1"); err == nil {
				t.Errorf("%s: an arbitrary unit converts to 1", d.Code)
			}
			if d.Value.Unit != "1" { // defined by another arbitrary unit: [IU] = [iU]
				if s, _, err := Affine(d.Code, d.Value.Unit); err != nil || !within(s, mustValue(t, d.Value.Value), 1e-15) {
					t.Errorf("%s → %s = %v, %v; XML value %s", d.Code, d.Value.Unit, s, err, d.Value.Value)
				}
			}
		default:
			s, o, err := Affine(d.Code, d.Value.Unit)
			if err != nil {
				t.Errorf("%s → %s: %v", d.Code, d.Value.Unit, err)
				continue
			}
			if want := mustValue(t, d.Value.Value); o != 0 || !within(s, want, 1e-15) {
				t.Errorf("%s = %.17g·%s + %v; XML value %s", d.Code, s, d.Value.Unit, o, d.Value.Value)
			}
			d1, _ := Dimension(d.Code)
			d2, _ := Dimension(d.Value.Unit)
			if d1 != d2 {
				t.Errorf("%s is %s, its definition %s is %s", d.Code, d1, d.Value.Unit, d2)
			}
		}
	}
	t.Logf("UCUM table: %d units; special with an offset: %v; special, non-linear: %v", len(defs), special, nonLinear)
	if fmt.Sprint(special) != "[Cel [degF] [degRe]]" {
		t.Errorf("offset units = %v, want Cel, [degF] and [degRe] (UCUM §4.5 and the XML's functions)", special)
	}
}

func mustValue(t *testing.T, s string) float64 {
	t.Helper()
	q, ok := new(big.Rat).SetString(s)
	if !ok {
		t.Fatalf("value %q", s)
	}
	f, _ := q.Float64()
	return f
}

func mustFactor(t *testing.T, from, to string) float64 {
	t.Helper()
	s, _, err := Affine(from, to)
	if err != nil {
		t.Fatal(err)
	}
	return s
}

func within(got, want, rel float64) bool {
	return math.Abs(got-want) <= rel*math.Abs(want)
}

// TestBaseDimensions: the XML's seven base units each measure one base
// dimension of their own.
func TestBaseDimensions(t *testing.T) {
	want := map[string]string{"m": "length", "g": "mass", "s": "time", "K": "temperature",
		"rad": "plane angle", "C": "electric charge", "cd": "luminous intensity"}
	for _, b := range ucumBases {
		if d, err := Dimension(b.Code); err != nil || d != want[b.Code] || d != b.Property {
			t.Errorf("Dimension(%q) = %q, %v; XML property %q", b.Code, d, err, b.Property)
		}
	}
}
