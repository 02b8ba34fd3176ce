package series

import "bytes"

// Decimal commas. Files written with a European locale separate fields with semicolons or tabs
// and write numbers with a decimal comma ("0,0047"). readText switches to decimal commas when
// the delimiter is a semicolon or a tab, some cell of the first data row is a number written
// with one comma, and no cell of that row is a number written with a decimal point. From then
// on every number must use the comma: a cell with a decimal point is refused with its line and
// column, since "1.234" could be a thousands separator.

// decimalCommaRow reports whether the cells of one row are written with decimal commas.
func decimalCommaRow(line []byte, fields []span) bool {
	var buf [64]byte
	found := false
	for _, f := range fields {
		if f.bad {
			continue
		}
		b := line[f.lo:f.hi]
		if _, k := classify(b, false); k == cellNumber && bytes.IndexByte(b, '.') >= 0 {
			return false
		}
		if bytes.Count(b, []byte{','}) != 1 || len(b) > len(buf) {
			continue
		}
		if _, k := classify(commaToPoint(b, buf[:0]), false); k == cellNumber {
			found = true
		}
	}
	return found
}

// commaToPoint appends b to dst with every comma replaced by a point.
func commaToPoint(b, dst []byte) []byte {
	dst = append(dst, b...)
	for i := len(dst) - len(b); i < len(dst); i++ {
		if dst[i] == ',' {
			dst[i] = '.'
		}
	}
	return dst
}

// cellReader classifies cells of a file that may write decimal commas, reusing one buffer.
type cellReader struct {
	comma bool // the file writes decimal commas
	buf   []byte
}

// text returns the bytes of a cell as a number with a decimal point would be written: b itself,
// or, with decimal commas, a copy with the comma replaced. A cell holding a decimal point in a
// decimal-comma file is returned as ok=false.
func (c *cellReader) text(b []byte) ([]byte, bool) {
	if !c.comma {
		return b, true
	}
	if bytes.IndexByte(b, '.') >= 0 {
		return b, false
	}
	if bytes.IndexByte(b, ',') < 0 {
		return b, true
	}
	c.buf = commaToPoint(b, c.buf[:0])
	return c.buf, true
}

// classify is classify for the file's decimal separator.
func (c *cellReader) classify(b []byte, bad bool) (float64, cellKind) {
	t, ok := c.text(b)
	if !ok {
		return 0, cellText
	}
	return classify(t, bad)
}

// hint explains why a cell that is not a number was refused, when the decimal separator is
// the reason.
func (c *cellReader) hint(b []byte) string {
	switch {
	case c.comma && bytes.IndexByte(b, '.') >= 0:
		return " (this file writes decimal commas, so a decimal point is not accepted: write every number with a comma, or every number with a point)"
	case !c.comma && bytes.IndexByte(b, ',') >= 0:
		return " (a decimal comma is read only when the delimiter is a semicolon or a tab and the first data row writes every number with a comma)"
	}
	return ""
}

// commaExample returns the first cell of the row written with a decimal comma, and
// commaExampleValue the number it reads as, for the note that says decimal commas were read.
func commaExample(line []byte, fields []span) string {
	for _, f := range fields {
		if b := line[f.lo:f.hi]; bytes.IndexByte(b, ',') >= 0 {
			return clip(b)
		}
	}
	return ""
}

func commaExampleValue(line []byte, fields []span) string {
	ex := commaExample(line, fields)
	v, _ := parseFloat(commaToPoint([]byte(ex), nil))
	return fmtG(v)
}
