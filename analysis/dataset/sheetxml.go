package dataset

// This file streams a worksheet's cells out of an .xlsx package, the
// format of ECMA-376 (Office Open XML), 5th edition: Part 2 (Open
// Packaging Conventions: the zip archive, its parts and their
// relationships) and Part 1 §18.3 (the worksheet part: sheetData's row
// and c elements, mergeCells) and §18.4 (the shared string table).
//
// Why not excelize's row iterator: it decodes every cell through
// encoding/xml's reflection, about 10 µs a row of three cells (10 s for
// 10⁶ rows), and its merged-cell list unmarshals the whole worksheet
// into memory (1.5 GB and three minutes for a 10⁶-row sheet, measured).
// The scanner here reads the same rows at well under a microsecond a
// cell; the tests compare every cell read here with excelize's own
// reading (sheetxml_test.go).

import (
	"archive/zip"
	"bufio"
	"bytes"
	"encoding/xml"
	"errors"
	"fmt"
	"io"
	"path"
	"strconv"
	"strings"
	"unicode/utf8"
)

// sheetPackage locates the parts of an .xlsx package: each sheet's
// worksheet part and the shared string table.
type sheetPackage struct {
	files    map[string]*zip.File    // by part name, without the leading "/"
	maxPart  uint64                  // the most bytes a part may unpack to
	order    []string                // the sheets' names in tab order
	sheets   map[string]string       // sheet name → worksheet part name
	hidden   map[string]bool         // sheets whose state is hidden or veryHidden
	other    map[string]string       // sheets that are no worksheet → what they are ("a chart sheet")
	date1904 bool                    // serial numbers count days from 1904-01-01
	merges   map[string][]mergeRange // worksheet part → its merged ranges, once read
	sstPart  string                  // "" when the workbook has no shared strings
	sst      Strings                 // loaded on first use (Given once read)
}

// Relationship types (ECMA-376 Part 1 §15.2; the transitional and the
// strict namespaces).
const (
	relOfficeDocument = "/officeDocument"
	relWorksheet      = "/worksheet"
	relSharedStrings  = "/sharedStrings"
)

type opcRelationships struct {
	Rel []struct {
		ID     string `xml:"Id,attr"`
		Type   string `xml:"Type,attr"`
		Target string `xml:"Target,attr"`
		Mode   string `xml:"TargetMode,attr"`
	} `xml:"Relationship"`
}

type workbookSheets struct {
	Pr struct {
		Date1904 string `xml:"date1904,attr"`
	} `xml:"workbookPr"`
	Sheets []struct {
		Name  string     `xml:"name,attr"`
		Attrs []xml.Attr `xml:",any,attr"`
	} `xml:"sheets>sheet"`
}

// openSheetPackage reads the package's relationships and workbook part
// (both small) from the zip archive in data.
func openSheetPackage(data []byte, maxPart uint64) (*sheetPackage, error) {
	zr, err := zip.NewReader(bytes.NewReader(data), int64(len(data)))
	if err != nil {
		return nil, err
	}
	p := &sheetPackage{files: map[string]*zip.File{}, maxPart: maxPart, sheets: map[string]string{}, hidden: map[string]bool{}, other: map[string]string{}, merges: map[string][]mergeRange{}}
	for _, f := range zr.File {
		p.files[strings.TrimPrefix(f.Name, "/")] = f
	}
	root, err := p.rels("_rels/.rels")
	if err != nil {
		return nil, err
	}
	wb := ""
	for _, r := range root.Rel {
		if strings.HasSuffix(r.Type, relOfficeDocument) {
			wb = resolvePart("", r.Target)
			break
		}
	}
	if wb == "" {
		return nil, errors.New("the package names no workbook part")
	}
	var sheets workbookSheets
	if err := p.decode(wb, &sheets); err != nil {
		return nil, err
	}
	p.date1904 = sheets.Pr.Date1904 == "1" || sheets.Pr.Date1904 == "true"
	dir := path.Dir(wb)
	wbRels, err := p.rels(path.Join(dir, "_rels", path.Base(wb)+".rels"))
	if err != nil {
		return nil, err
	}
	target := map[string]string{}
	kind := map[string]string{} // relationship → what a sheet of another type is
	for _, r := range wbRels.Rel {
		if r.Mode == "External" {
			continue
		}
		switch {
		case strings.HasSuffix(r.Type, relWorksheet):
			target[r.ID] = resolvePart(dir, r.Target)
		case strings.HasSuffix(r.Type, "/chartsheet"):
			kind[r.ID] = "a chart sheet"
		case strings.HasSuffix(r.Type, "/dialogsheet"):
			kind[r.ID] = "a dialog sheet"
		case strings.HasSuffix(r.Type, "/xlMacrosheet"), strings.HasSuffix(r.Type, "/xlIntlMacrosheet"):
			kind[r.ID] = "a macro sheet"
		case strings.HasSuffix(r.Type, relSharedStrings):
			p.sstPart = resolvePart(dir, r.Target)
		}
	}
	if _, ok := p.files[p.sstPart]; !ok {
		// A table named but absent is empty; one present without its
		// relationship is taken from where writers put it.
		p.sstPart = ""
		if _, ok := p.files["xl/sharedStrings.xml"]; ok {
			p.sstPart = "xl/sharedStrings.xml"
		}
	}
	for _, s := range sheets.Sheets {
		p.order = append(p.order, s.Name)
		for _, a := range s.Attrs {
			// state (ECMA-376 Part 1 §18.2.19; the type's section,
			// ST_SheetState, not checked): visible when absent.
			if a.Name.Local == "state" && a.Name.Space == "" && (a.Value == "hidden" || a.Value == "veryHidden") {
				p.hidden[s.Name] = true
			}
			// r:id, in the relationships namespace of either flavour.
			if a.Name.Local == "id" && strings.HasSuffix(a.Name.Space, "/relationships") {
				if t, ok := target[a.Value]; ok {
					p.sheets[s.Name] = t
				} else if k, ok := kind[a.Value]; ok {
					p.other[s.Name] = k
				}
			}
		}
	}
	return p, nil
}

// resolvePart resolves a relationship's target against the folder of its
// source part (an absolute target starts at the package's root).
func resolvePart(dir, target string) string {
	if strings.HasPrefix(target, "/") {
		return path.Clean(target)[1:]
	}
	return strings.TrimPrefix(path.Clean(path.Join("/", dir, target)), "/")
}

func (p *sheetPackage) rels(name string) (*opcRelationships, error) {
	var r opcRelationships
	if _, ok := p.files[name]; !ok {
		return &r, nil // a part without relationships
	}
	return &r, p.decode(name, &r)
}

func (p *sheetPackage) decode(name string, v any) error {
	rc, err := p.open(name)
	if err != nil {
		return err
	}
	defer rc.Close()
	d := xml.NewDecoder(rc)
	d.CharsetReader = func(label string, r io.Reader) (io.Reader, error) {
		if isUTF8Label(label) {
			return r, nil
		}
		return nil, encodingError(label)
	}
	if err := d.Decode(v); err != nil {
		return fmt.Errorf("part %s: %w", name, err)
	}
	return nil
}

func (p *sheetPackage) open(name string) (io.ReadCloser, error) {
	f, ok := p.files[name]
	if !ok {
		return nil, fmt.Errorf("the package has no part %s", name)
	}
	if f.UncompressedSize64 > p.maxPart {
		// archive/zip refuses a part that unpacks to more than it declares.
		return nil, fmt.Errorf("the part %s unpacks to %d bytes, more than 64 times the file size limit (max_bytes)", name, f.UncompressedSize64)
	}
	return f.Open()
}

// sharedStrings returns the shared string table: each si element's text,
// the t element it holds or the t elements of its rich-text runs joined
// (phonetic runs, rPh, left out), with the _xHHHH_ escapes of §22.9.2.19
// decoded; all in one block of text (Strings), 4 bytes a string besides
// the text.
func (p *sheetPackage) sharedStrings() (Strings, error) {
	if p.sst.Given() || p.sstPart == "" {
		return p.sst, nil
	}
	sst, err := p.readSST()
	if err != nil {
		return Strings{}, fmt.Errorf("part %s: %w", p.sstPart, err)
	}
	p.sst = sst
	return sst, nil
}

func (p *sheetPackage) readSST() (Strings, error) {
	sst := Strings{end: []uint32{}}
	rc, err := p.open(p.sstPart)
	if err != nil {
		return sst, err
	}
	defer rc.Close()
	s := newXMLScan(rc)
	var text []byte
	var rt richText
	inSI, ended := false, false
	add := func(t string) error {
		if !sst.add(t) {
			return fmt.Errorf("the shared strings pass %d bytes", MaxTextBytes)
		}
		return nil
	}
	for {
		tk, err := s.next()
		if err == io.EOF {
			if !ended {
				return sst, errCutOff
			}
			return sst, nil
		}
		if err != nil {
			return sst, err
		}
		switch tk.kind {
		case tokStart, tokEmpty:
			switch string(tk.name) {
			case "si":
				if inSI {
					return sst, errors.New("a string of the table starts inside another")
				}
				inSI, text = true, text[:0]
				if tk.kind == tokEmpty {
					if err := add(""); err != nil {
						return sst, err
					}
					inSI = false
				}
			case "rPh", "t":
				rt.tag(tk, inSI)
			case "sst":
				ended = tk.kind == tokEmpty
			}
		case tokEnd:
			switch string(tk.name) {
			case "si":
				if err := add(unescapeOOXML(string(text))); err != nil {
					return sst, err
				}
				inSI = false
			case "rPh", "t":
				rt.tag(tk, inSI)
			case "sst":
				if inSI {
					return sst, errors.New("the table ends inside a string")
				}
				ended = true
			}
		case tokText:
			if rt.inT {
				if text, err = tk.appendText(text); err != nil {
					return sst, err
				}
			}
		}
	}
}

// maxMerges bounds the merged ranges a sheet may hold (Excel itself
// saves tens of thousands at most); more is a damaged or generated part.
const maxMerges = 1 << 20

// mergeRefs returns the merged ranges of a worksheet part (its mergeCell
// elements' ref attributes, 1-based and inclusive, ranges that do not
// parse left out). The element follows sheetData (§18.3.1.99), so the
// whole part is read: every '<' outside comments, CDATA sections and
// processing instructions starts markup (XML forbids '<' in text and in
// attribute values), and only mergeCell start tags are read further.
func (p *sheetPackage) mergeRefs(part string) ([]mergeRange, error) {
	if m, ok := p.merges[part]; ok {
		return m, nil
	}
	m, err := p.scanMerges(part)
	if err != nil {
		return nil, fmt.Errorf("part %s: %w", part, err)
	}
	p.merges[part] = m
	return m, nil
}

func (p *sheetPackage) scanMerges(part string) ([]mergeRange, error) {
	rc, err := p.open(part)
	if err != nil {
		return nil, err
	}
	defer rc.Close()
	s := newXMLScan(rc)
	var out []mergeRange
	skip := func(from int, end string) error {
		k, err := s.find(from, []byte(end))
		if err == nil && k < 0 {
			err = errCutOff
		}
		if err == nil {
			s.pos += k + len(end)
		}
		return err
	}
	for {
		k, err := s.find(0, []byte{'<'})
		if err != nil {
			return nil, err
		}
		if k < 0 {
			return out, nil
		}
		s.pos += k
		if err := s.ensure(256); err != nil {
			return nil, err
		}
		rest := s.buf[s.pos:s.end]
		switch {
		case bytes.HasPrefix(rest, []byte("<!--")):
			err = skip(4, "-->")
		case bytes.HasPrefix(rest, []byte("<![CDATA[")):
			err = skip(9, "]]>")
		case bytes.HasPrefix(rest, []byte("<?")):
			err = skip(2, "?>")
		default:
			n := 1
			for n < len(rest) && !isNameEnd(rest[n]) {
				n++
			}
			name := rest[1:n]
			if c := bytes.LastIndexByte(name, ':'); c >= 0 {
				name = name[c+1:]
			}
			if string(name) != "mergeCell" {
				s.pos++ // an element's attributes hold no '<': look for the next
				continue
			}
			end, err := s.tagEnd()
			if err == nil && end < 0 {
				err = errCutOff
			}
			if err != nil {
				return nil, err
			}
			tag := s.buf[s.pos : s.pos+end]
			if ref := attrValue(tag[n:], "ref"); ref != nil {
				if m, ok := parseRange(ref); ok {
					if len(out) == maxMerges {
						return nil, fmt.Errorf("more than %d merged ranges", maxMerges)
					}
					out = append(out, m)
				}
			}
			s.pos += end + 1
		}
		if err != nil {
			return nil, err
		}
	}
}

// parseRange reads a range reference ("A2:B3"; one cell "C4" is the range
// of that cell).
func parseRange(ref []byte) (mergeRange, bool) {
	a, b, found := bytes.Cut(ref, []byte(":"))
	if !found {
		b = a
	}
	c1, r1, ok1 := cellOf(a)
	c2, r2, ok2 := cellOf(b)
	if !ok1 || !ok2 {
		return mergeRange{}, false
	}
	return mergeRange{int32(c1), int32(r1), int32(c2), int32(r2)}, true
}

// cellOf reads a cell reference ("C12", "$C$12"): its 0-based column
// and 1-based row.
func cellOf(ref []byte) (col, row int, ok bool) {
	ref = bytes.ReplaceAll(ref, []byte("$"), nil)
	col = columnOf(ref)
	k := 0
	for k < len(ref) && (ref[k]|0x20) >= 'a' && (ref[k]|0x20) <= 'z' {
		k++
	}
	r, err := strconv.Atoi(string(ref[k:]))
	if col < 0 || err != nil || r < 1 || r > maxSheetRows {
		return 0, 0, false
	}
	return col, r, true
}

// maxSheetRows and maxSheetCols are the largest sheet of the format's
// implementations (Excel: 1 048 576 rows, 16 384 columns, XFD).
const (
	maxSheetRows = 1 << 20
	maxSheetCols = 1 << 14
)

func isNameEnd(b byte) bool {
	return b == ' ' || b == '\t' || b == '\n' || b == '\r' || b == '/' || b == '>'
}

// sheetCell is one cell of a row: its 0-based column and its value as
// the file stores it (see rows).
type sheetCell struct {
	col  int
	v    []byte
	date bool // t="d": v is a date, a time or both in ISO 8601 (§18.17.4)
}

// rowFunc receives one row element: its 1-based row number and its cells
// in column order. The cells' bytes are valid only during the call. It
// returns stop to end the reading early.
type rowFunc func(row int, cells []sheetCell) (stop bool, err error)

// rows streams the row elements of a worksheet part's sheetData to fn. A
// cell's value is what excelize's RawCellValue reading gives: the v
// element as written (a number's text, a formula's cached value, an
// error's text, a boolean's 0 or 1, a date's ISO 8601 text), a shared
// string's text for t="s", an inline string's text for t="inlineStr"
// (both with _xHHHH_ escapes decoded). Rows and cells without an r
// attribute follow the one before.
func (p *sheetPackage) rows(part string, fn rowFunc) error {
	sst, err := p.sharedStrings()
	if err != nil {
		return err
	}
	rc, err := p.open(part)
	if err != nil {
		return err
	}
	defer rc.Close()
	s := newXMLScan(rc)
	var (
		cells   []sheetCell
		arena   []byte // the row's values, back to back
		spans   [][2]int
		row     int
		inRow   bool
		col     int
		typ     []byte
		inCell  bool
		inV     bool
		inIS    int      // depth inside an is element
		rt      richText // inside an is element
		hasV    bool
		isText  []byte
		hasIS   bool
		vStart  int
		typeBuf [16]byte
	)
	wrap := func(err error) error { return fmt.Errorf("part %s, row %d: %w", part, row, err) }
	for {
		tk, err := s.next()
		if err == io.EOF {
			return wrap(errors.New("the part ends before its sheetData element does"))
		}
		if err != nil {
			return wrap(err)
		}
		switch tk.kind {
		case tokStart, tokEmpty:
			switch string(tk.name) {
			case "sheetData":
				if tk.kind == tokEmpty {
					return nil // no cells
				}
			case "row":
				if inRow || inCell {
					return wrap(errors.New("a row element starts inside another row"))
				}
				r := row + 1
				if v := attrValue(tk.attrs, "r"); v != nil {
					if r, err = strconv.Atoi(string(v)); err != nil || r < 1 {
						return wrap(fmt.Errorf("row number %q", v))
					}
				}
				if r <= row {
					return wrap(fmt.Errorf("row %d follows row %d: the rows are out of order", r, row))
				}
				row, col = r, -1
				cells, arena, spans = cells[:0], arena[:0], spans[:0]
				inRow = tk.kind == tokStart
				if !inRow {
					if stop, err := fn(row, nil); stop || err != nil {
						return err
					}
				}
			case "c":
				if !inRow {
					continue
				}
				if inCell {
					return wrap(errors.New("a cell element starts inside another cell"))
				}
				c := col + 1
				if v := attrValue(tk.attrs, "r"); v != nil {
					if c = columnOf(v); c < 0 {
						return wrap(fmt.Errorf("the cell reference %q names no column from A to XFD", v))
					}
				}
				if c <= col || c >= maxSheetCols {
					return wrap(fmt.Errorf("cell %s follows cell %s in its row: the cells are out of order or past column XFD", cellRef(c, row), cellRef(col, row)))
				}
				col = c
				typ = append(typeBuf[:0], attrValue(tk.attrs, "t")...)
				hasV, hasIS, vStart = false, false, len(arena)
				isText = isText[:0]
				inCell = tk.kind == tokStart // an empty element holds no value
			case "v":
				if inCell && inIS == 0 && tk.kind == tokStart {
					inV, hasV = true, true
				}
			case "is":
				if inCell && tk.kind == tokStart {
					inIS++
					hasIS = true
				}
			case "rPh", "t":
				rt.tag(tk, inIS > 0)
			}
		case tokEnd:
			switch string(tk.name) {
			case "row":
				if inCell {
					return wrap(errors.New("a row element ends inside a cell"))
				}
				if !inRow {
					continue
				}
				inRow = false
				for k := range cells {
					cells[k].v = arena[spans[k][0]:spans[k][1]]
				}
				if stop, err := fn(row, cells); stop || err != nil {
					return err
				}
			case "c":
				if !inCell {
					continue
				}
				inCell = false
				switch {
				case string(typ) == "s" && hasV:
					v := bytes.TrimSpace(arena[vStart:])
					i, err := strconv.Atoi(string(v))
					if err != nil || i < 0 || i >= sst.Len() {
						return wrap(fmt.Errorf("cell %s: shared string %q is not in the table of %d", cellRef(col, row), v, sst.Len()))
					}
					arena = append(arena[:vStart], sst.At(i)...)
				case string(typ) == "inlineStr" && hasIS:
					arena = append(arena[:vStart], unescapeOOXML(string(isText))...)
				}
				if len(arena) > vStart { // a cell without a value is left out
					spans = append(spans, [2]int{vStart, len(arena)})
					cells = append(cells, sheetCell{col: col, date: string(typ) == "d"})
				}
			case "v":
				inV = false
			case "is":
				inIS--
			case "rPh", "t":
				rt.tag(tk, inIS > 0)
			case "sheetData":
				return nil // the rest of the part holds no cells
			}
		case tokText:
			switch {
			case inV:
				if arena, err = tk.appendText(arena); err != nil {
					return wrap(err)
				}
			case rt.inT:
				if isText, err = tk.appendText(isText); err != nil {
					return wrap(err)
				}
			}
		}
	}
}

// richText follows the t and rPh elements of a string item (si in the
// shared strings, is in a cell; §18.4.8): the item's text is that of its
// t element or of its runs' t elements, phonetic runs (rPh) left out.
type richText struct {
	inT bool // in a t element whose text counts
	ph  int  // depth inside rPh elements
}

// tag takes a start, end or empty tag named t or rPh; inItem says whether
// it is inside a string item.
func (r *richText) tag(tk token, inItem bool) {
	switch string(tk.name) {
	case "rPh":
		if tk.kind == tokStart && inItem {
			r.ph++
		} else if tk.kind == tokEnd && r.ph > 0 {
			r.ph--
		}
	case "t":
		r.inT = tk.kind == tokStart && inItem && r.ph == 0
	}
}

// columnOf is the 0-based column of a cell reference ("C12" → 2), −1 when
// it does not start with one to three letters of a column within XFD.
func columnOf(ref []byte) int {
	c, k := 0, 0
	for ; k < len(ref) && k < 4; k++ {
		b := ref[k] | 0x20 // lower case
		if b < 'a' || b > 'z' {
			break
		}
		c = c*26 + int(b-'a') + 1
	}
	if k == 0 || k > 3 || c > 16384 {
		return -1
	}
	return c - 1
}

// unescapeOOXML decodes the _xHHHH_ escapes of ST_Xstring (ECMA-376 Part
// 1 §22.9.2.19): a character XML cannot hold, written as its UTF-16 code
// unit in hex; "_x005F_" is an underscore that would otherwise start one.
// A surrogate pair written as two escapes is joined; a lone surrogate
// becomes U+FFFD.
func unescapeOOXML(s string) string {
	if !strings.Contains(s, "_x") {
		return s
	}
	var b strings.Builder
	for i := 0; i < len(s); {
		if u, ok := hexEscape(s, i); ok {
			i += 7
			if u >= 0xD800 && u < 0xDC00 {
				if lo, ok := hexEscape(s, i); ok && lo >= 0xDC00 && lo < 0xE000 {
					i += 7
					b.WriteRune(rune((u-0xD800)<<10|(lo-0xDC00)) + 0x10000)
					continue
				}
			}
			if u >= 0xD800 && u < 0xE000 {
				b.WriteRune(utf8.RuneError)
				continue
			}
			b.WriteRune(rune(u))
			continue
		}
		b.WriteByte(s[i])
		i++
	}
	return b.String()
}

// hexEscape reads an "_xHHHH_" escape at s[i:].
func hexEscape(s string, i int) (uint32, bool) {
	if i+7 > len(s) || s[i] != '_' || s[i+1] != 'x' || s[i+6] != '_' {
		return 0, false
	}
	u, err := strconv.ParseUint(s[i+2:i+6], 16, 16)
	return uint32(u), err == nil
}

// xmlScan is a pull scanner of the XML that worksheet and shared string
// parts are written in: start, end and empty-element tags (names without
// their namespace prefix), and text; comments, processing instructions
// and the document type are skipped, CDATA sections are text. It does
// not check that the document is well formed beyond what reading the
// cells needs; the part was written by a spreadsheet program.
type xmlScan struct {
	r        *bufio.Reader
	buf      []byte
	pos, end int
	eof      bool
}

type tokKind uint8

const (
	tokStart tokKind = iota
	tokEnd
	tokEmpty // <name/>
	tokText
)

type token struct {
	kind  tokKind
	name  []byte // local name
	attrs []byte // the tag's attributes, raw
	text  []byte // raw text (entities undecoded) or a CDATA section's content
	cdata bool
}

func newXMLScan(r io.Reader) *xmlScan {
	return &xmlScan{r: bufio.NewReaderSize(r, 64<<10), buf: make([]byte, 256<<10)}
}

// fill reads more input, keeping s.buf[s.pos:s.end]; false at the end of
// the input.
func (s *xmlScan) fill() (bool, error) {
	if s.eof {
		return false, nil
	}
	if s.pos > 0 {
		s.end = copy(s.buf, s.buf[s.pos:s.end])
		s.pos = 0
	}
	if s.end == len(s.buf) {
		if len(s.buf) >= maxToken {
			return false, fmt.Errorf("a tag or text passes %d MiB: the part is not a worksheet written by a spreadsheet program", maxToken>>20)
		}
		s.buf = append(s.buf, make([]byte, len(s.buf))...)
	}
	n, err := s.r.Read(s.buf[s.end:])
	s.end += n
	if err == io.EOF {
		s.eof = true
		return n > 0, nil
	}
	return true, err
}

// ensure reads until n bytes from s.pos are in the buffer or the input
// ends.
func (s *xmlScan) ensure(n int) error {
	for s.end-s.pos < n && !s.eof {
		if _, err := s.fill(); err != nil {
			return err
		}
	}
	return nil
}

// find returns the index, from s.pos+from, of sep in the buffer, reading
// more input as needed; −1 at the end of the input.
func (s *xmlScan) find(from int, sep []byte) (int, error) {
	for {
		if k := bytes.Index(s.buf[s.pos+from:s.end], sep); k >= 0 {
			return from + k, nil
		}
		from = max(from, s.end-s.pos-len(sep)+1)
		more, err := s.fill()
		if err != nil {
			return -1, err
		}
		if !more {
			return -1, nil
		}
	}
}

// tagEnd returns the index of the '>' that ends the tag at s.pos, outside
// quoted attribute values; −1 at the end of the input.
func (s *xmlScan) tagEnd() (int, error) {
	var quote byte
	for i := 1; ; i++ {
		for s.pos+i >= s.end {
			more, err := s.fill()
			if err != nil {
				return -1, err
			}
			if !more {
				return -1, nil
			}
		}
		switch b := s.buf[s.pos+i]; {
		case quote != 0:
			if b == quote {
				quote = 0
			}
		case b == '"' || b == '\'':
			quote = b
		case b == '>':
			return i, nil
		}
	}
}

var errCutOff = errors.New("the XML is cut off")

// maxToken bounds one tag or text of a part (a cell holds at most 32 767
// characters), so that a damaged part cannot take all memory.
const maxToken = 64 << 20

// next returns the next token; io.EOF at the end. The token's bytes are
// valid until the next call.
func (s *xmlScan) next() (token, error) {
	for {
		if s.pos == s.end {
			more, err := s.fill()
			if err != nil {
				return token{}, err
			}
			if !more {
				return token{}, io.EOF
			}
		}
		if s.buf[s.pos] != '<' {
			k, err := s.find(0, []byte{'<'})
			if err != nil {
				return token{}, err
			}
			if k < 0 {
				k = s.end - s.pos
			}
			t := token{kind: tokText, text: s.buf[s.pos : s.pos+k]}
			s.pos += k
			return t, nil
		}
		if err := s.ensure(9); err != nil {
			return token{}, err
		}
		rest := s.buf[s.pos:s.end]
		switch {
		case bytes.HasPrefix(rest, []byte("<!--")):
			k, err := s.find(4, []byte("-->"))
			if err != nil || k < 0 {
				return token{}, cmpErr(err, errCutOff)
			}
			s.pos += k + 3
			continue
		case bytes.HasPrefix(rest, []byte("<![CDATA[")):
			k, err := s.find(9, []byte("]]>"))
			if err != nil || k < 0 {
				return token{}, cmpErr(err, errCutOff)
			}
			t := token{kind: tokText, text: s.buf[s.pos+9 : s.pos+k], cdata: true}
			s.pos += k + 3
			return t, nil
		case bytes.HasPrefix(rest, []byte("<?")):
			k, err := s.find(2, []byte("?>"))
			if err != nil || k < 0 {
				return token{}, cmpErr(err, errCutOff)
			}
			pi := s.buf[s.pos+2 : s.pos+k]
			if bytes.HasPrefix(pi, []byte("xml")) && len(pi) > 3 && isNameEnd(pi[3]) {
				if enc := attrValue(pi[3:], "encoding"); enc != nil && !isUTF8Label(string(enc)) {
					return token{}, encodingError(string(enc))
				}
			}
			s.pos += k + 2
			continue
		}
		k, err := s.tagEnd()
		if err != nil || k < 0 {
			return token{}, cmpErr(err, errCutOff)
		}
		tag := s.buf[s.pos+1 : s.pos+k]
		s.pos += k + 1
		if len(tag) > 0 && tag[0] == '!' {
			continue // <!DOCTYPE …>
		}
		t := token{kind: tokStart}
		if len(tag) > 0 && tag[0] == '/' {
			t.kind, tag = tokEnd, tag[1:]
		} else if len(tag) > 0 && tag[len(tag)-1] == '/' {
			t.kind, tag = tokEmpty, tag[:len(tag)-1]
		}
		n := 0
		for n < len(tag) && !isNameEnd(tag[n]) {
			n++
		}
		t.name, t.attrs = tag[:n], tag[n:]
		if c := bytes.LastIndexByte(t.name, ':'); c >= 0 {
			t.name = t.name[c+1:]
		}
		return t, nil
	}
}

func cmpErr(err, otherwise error) error {
	if err != nil {
		return err
	}
	return otherwise
}

// appendText appends the token's text to dst with the XML 1.0 rules of
// §2.11 and §4.6: entity and character references decoded, "\r\n" and a
// lone "\r" read as "\n" (a CDATA section keeps its characters but its
// line ends too).
func (t token) appendText(dst []byte) ([]byte, error) {
	src := t.text
	high := false
	for _, b := range src {
		if b < 0x20 && b != '\t' && b != '\n' && b != '\r' {
			return dst, fmt.Errorf("the text %q holds the control character %#02x, which XML forbids", clip(src), b)
		}
		high = high || b >= 0x80
	}
	if high && !utf8.Valid(src) {
		return dst, fmt.Errorf("the text %q is not valid UTF-8", clip(src))
	}
	special := "&\r"
	if t.cdata {
		special = "\r" // a CDATA section holds no references
	}
	for len(src) > 0 {
		k := bytes.IndexAny(src, special)
		if k < 0 {
			return append(dst, src...), nil
		}
		dst = append(dst, src[:k]...)
		src = src[k:]
		if src[0] == '\r' {
			dst = append(dst, '\n')
			src = src[1:]
			if len(src) > 0 && src[0] == '\n' {
				src = src[1:]
			}
			continue
		}
		semi := bytes.IndexByte(src, ';')
		if semi < 0 {
			return dst, fmt.Errorf("an entity reference in %q is not ended by ';'", clip(t.text))
		}
		ref := string(src[1:semi])
		src = src[semi+1:]
		switch ref {
		case "lt":
			dst = append(dst, '<')
		case "gt":
			dst = append(dst, '>')
		case "amp":
			dst = append(dst, '&')
		case "quot":
			dst = append(dst, '"')
		case "apos":
			dst = append(dst, '\'')
		default:
			var v uint64
			var err error
			switch {
			case strings.HasPrefix(ref, "#x"):
				v, err = strconv.ParseUint(ref[2:], 16, 32)
			case strings.HasPrefix(ref, "#"):
				v, err = strconv.ParseUint(ref[1:], 10, 32)
			default:
				err = errors.New("unknown entity")
			}
			if err != nil || !xmlChar(rune(v)) {
				return dst, fmt.Errorf("the reference &%s; in %q is not a character XML allows", ref, clip(t.text))
			}
			dst = utf8.AppendRune(dst, rune(v))
		}
	}
	return dst, nil
}

// xmlChar says whether XML 1.0 allows the character (§2.2, production
// Char).
func xmlChar(r rune) bool {
	return r == '\t' || r == '\n' || r == '\r' || r >= 0x20 && r <= 0xD7FF || r >= 0xE000 && r <= 0xFFFD || r >= 0x10000 && r <= 0x10FFFF
}

// isUTF8Label says whether an encoding declaration names UTF-8 (or its
// subset US-ASCII).
func isUTF8Label(enc string) bool {
	switch strings.ToLower(strings.ReplaceAll(strings.ReplaceAll(enc, "-", ""), "_", "")) {
	case "utf8", "usascii", "ascii":
		return true
	}
	return false
}

func encodingError(label string) error {
	return fmt.Errorf("the XML is in the %s encoding; bivar reads workbooks in UTF-8, as spreadsheet programs write them", label)
}

func clip(b []byte) string {
	if len(b) > 40 {
		return string(b[:40]) + "…"
	}
	return string(b)
}

// attrValue returns the raw value of the attribute with the given local
// name in a tag's attribute bytes, nil when absent. The attributes read
// here (r, t, ref) hold letters and digits only, so no reference is
// decoded.
func attrValue(attrs []byte, name string) []byte {
	for i := 0; i < len(attrs); {
		for i < len(attrs) && (attrs[i] == ' ' || attrs[i] == '\t' || attrs[i] == '\n' || attrs[i] == '\r') {
			i++
		}
		start := i
		for i < len(attrs) && attrs[i] != '=' && attrs[i] != ' ' && attrs[i] != '\t' && attrs[i] != '\n' && attrs[i] != '\r' {
			i++
		}
		key := attrs[start:i]
		for i < len(attrs) && attrs[i] != '=' {
			i++
		}
		i++
		for i < len(attrs) && attrs[i] != '"' && attrs[i] != '\'' {
			i++
		}
		if i >= len(attrs) {
			return nil
		}
		q := attrs[i]
		i++
		end := bytes.IndexByte(attrs[i:], q)
		if end < 0 {
			return nil
		}
		val := attrs[i : i+end]
		i += end + 1
		if c := bytes.LastIndexByte(key, ':'); c >= 0 {
			if string(key[:c]) == "xmlns" {
				continue
			}
			key = key[c+1:]
		}
		if string(key) == name {
			return val
		}
	}
	return nil
}
