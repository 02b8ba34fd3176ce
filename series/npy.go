package series

import (
	"bytes"
	"encoding/binary"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"

	"codeberg.org/sbinet/npyio/npy"
)

// maxNpyHeader bounds the .npy header dictionary.
const maxNpyHeader = 1 << 16

// npyHeader is the checked header of a .npy file.
type npyHeader struct {
	raw     []byte // the header bytes as read (magic to the end of the dictionary)
	descr   string // e.g. "<f8"
	kind    byte   // 'f', 'i' or 'u'
	size    int    // bytes per element
	fortran bool
	shape   []int
}

// readNpyHeader reads and checks the header of a .npy file (NumPy enhancement proposal NEP 1,
// "A simple file format for NumPy arrays", 2007): magic, version, length and the dictionary
// with 'descr', 'fortran_order' and 'shape'. It accepts only what npyio parses safely:
// integer and floating-point element types of 1, 2, 4 or 8 bytes and 1-D or 2-D shapes.
func readNpyHeader(r io.Reader, path string) (*npyHeader, error) {
	bad := func(format string, a ...any) error {
		return &InputError{Path: path, Msg: "not a valid .npy file: " + fmt.Sprintf(format, a...)}
	}
	var pre [10]byte
	n, err := io.ReadFull(r, pre[:8])
	if !bytes.HasPrefix([]byte("\x93NUMPY"), pre[:min(n, 6)]) || n == 0 {
		return nil, bad("no \\x93NUMPY magic")
	}
	if err != nil {
		return nil, bad("truncated header")
	}
	var hlen int
	raw := pre[:8]
	switch pre[6] {
	case 1:
		if _, err := io.ReadFull(r, pre[8:10]); err != nil {
			return nil, bad("truncated header")
		}
		hlen = int(binary.LittleEndian.Uint16(pre[8:10]))
		raw = pre[:10]
	case 2, 3:
		var l [4]byte
		if _, err := io.ReadFull(r, l[:]); err != nil {
			return nil, bad("truncated header")
		}
		hlen = int(binary.LittleEndian.Uint32(l[:]))
		raw = append(append([]byte{}, pre[:8]...), l[:]...)
	default:
		return nil, bad("unknown format version %d.%d", pre[6], pre[7])
	}
	if hlen > maxNpyHeader {
		return nil, bad("header of %d bytes", hlen)
	}
	hdr := make([]byte, hlen)
	if _, err := io.ReadFull(r, hdr); err != nil {
		return nil, &InputError{Path: path, Msg: "truncated .npy file: the header is cut short"}
	}
	h := &npyHeader{raw: append(append([]byte{}, raw...), hdr...)}
	nl := bytes.LastIndexByte(hdr, '\n')
	if nl < 0 {
		return nil, bad("the header does not end in a newline")
	}
	d := string(hdr[:nl])
	const kDescr, kOrder, kShape = "'descr': ", "'fortran_order': ", "'shape': "
	bd, bo, bs := strings.Index(d, kDescr), strings.Index(d, kOrder), strings.Index(d, kShape)
	end := strings.Index(d, "}")
	if bd < 0 || bo < 0 || bs < 0 || end < 0 ||
		bd+len(kDescr) > bo-2 || bo+len(kOrder) > bs-2 || bs+len(kShape) > end-2 ||
		!strings.HasPrefix(strings.TrimSpace(d), "{") {
		return nil, bad("the header dictionary is not {'descr': …, 'fortran_order': …, 'shape': (…), }")
	}
	descr := d[bd+len(kDescr) : bo-2]
	order := d[bo+len(kOrder) : bs-2]
	shape := d[bs+len(kShape) : end-2]
	if len(descr) < 5 || descr[0] != '\'' || descr[len(descr)-1] != '\'' {
		return nil, bad("element type %s", clip([]byte(descr)))
	}
	t := descr[1 : len(descr)-1]
	if len(t) == 3 && (t[0] == '<' || t[0] == '>' || t[0] == '|' || t[0] == '=') {
		t = t[1:]
	}
	if len(t) != 2 || !strings.Contains("fiu", t[:1]) || !strings.Contains("1248", t[1:]) || t == "f1" || t == "f2" {
		return nil, &InputError{Path: path, Msg: fmt.Sprintf("unsupported .npy element type %s: use float32, float64 or an integer type", descr)}
	}
	h.descr, h.kind, h.size = descr[1:len(descr)-1], t[0], int(t[1]-'0')
	switch order {
	case "False":
	case "True":
		h.fortran = true
	default:
		return nil, bad("fortran_order %s", clip([]byte(order)))
	}
	if len(shape) < 2 || shape[0] != '(' || shape[len(shape)-1] != ')' {
		return nil, bad("shape %s", clip([]byte(shape)))
	}
	total := 1
	for _, tok := range strings.Split(shape[1:len(shape)-1], ",") {
		tok = strings.TrimSpace(tok)
		if tok == "" {
			continue
		}
		k, err := strconv.Atoi(tok)
		if err != nil || k < 0 || k > math.MaxInt32 {
			return nil, bad("shape %s", clip([]byte(shape)))
		}
		h.shape = append(h.shape, k)
		if total > math.MaxInt32 && k > 0 {
			return nil, bad("shape %s is too large", clip([]byte(shape)))
		}
		total *= k
	}
	if len(h.shape) != 1 && len(h.shape) != 2 {
		return nil, &InputError{Path: path, Msg: fmt.Sprintf("a .npy array of shape %s: only 1-D arrays or 2-D arrays with a column are read", shape)}
	}
	if total > math.MaxInt32 {
		return nil, bad("shape %s is too large", shape)
	}
	return h, nil
}

// npyDecode reads n elements of type T with npyio from a checked header and the data bytes.
func npyDecode[T float32 | float64 | int8 | int16 | int32 | int64 | uint8 | uint16 | uint32 | uint64](h *npyHeader, data []byte, path string) (out []float64, err error) {
	defer func() {
		// npyio is called only with a header checked above; a panic inside it would still be
		// bad input, not a bug of the caller.
		if p := recover(); p != nil {
			out, err = nil, &InputError{Path: path, Msg: fmt.Sprintf("not a valid .npy file (%v)", p)}
		}
	}()
	rr, err := npy.NewReader(io.MultiReader(bytes.NewReader(h.raw), bytes.NewReader(data)))
	if err != nil {
		return nil, &InputError{Path: path, Msg: fmt.Sprintf("not a valid .npy file: %v", err)}
	}
	var v []T
	if err := rr.Read(&v); err != nil {
		return nil, &InputError{Path: path, Msg: fmt.Sprintf("truncated or invalid .npy data: %v", err)}
	}
	out = make([]float64, len(v))
	for i, x := range v {
		out[i] = float64(x)
	}
	return out, nil
}

// readNpy reads a NumPy .npy array of floats or integers: 1-D, or 2-D with opt.Column (a
// 1-based index; default 1). Data are decoded with codeberg.org/sbinet/npyio.
func readNpy(r io.Reader, path string, opt ReadOptions) (*Series, []string, error) {
	h, err := readNpyHeader(r, path)
	if err != nil {
		return nil, nil, err
	}
	n := 1
	for _, k := range h.shape {
		n *= k
	}
	need := int64(n) * int64(h.size)
	// Read at most what the header promises (and one byte more to tell), so a header that
	// claims a huge array cannot make us allocate more than the file holds.
	data, err := io.ReadAll(io.LimitReader(r, need+1))
	if err != nil {
		return nil, nil, err
	}
	if int64(len(data)) < need {
		return nil, nil, &InputError{Path: path, Msg: fmt.Sprintf("truncated .npy file: the header promises %d values (%d bytes of data), the file holds %d bytes", n, need, len(data))}
	}
	data = data[:need]
	var all []float64
	switch int(h.kind)<<4 | h.size {
	case 'f'<<4 | 4:
		all, err = npyDecode[float32](h, data, path)
	case 'f'<<4 | 8:
		all, err = npyDecode[float64](h, data, path)
	case 'i'<<4 | 1:
		all, err = npyDecode[int8](h, data, path)
	case 'i'<<4 | 2:
		all, err = npyDecode[int16](h, data, path)
	case 'i'<<4 | 4:
		all, err = npyDecode[int32](h, data, path)
	case 'i'<<4 | 8:
		all, err = npyDecode[int64](h, data, path)
	case 'u'<<4 | 1:
		all, err = npyDecode[uint8](h, data, path)
	case 'u'<<4 | 2:
		all, err = npyDecode[uint16](h, data, path)
	case 'u'<<4 | 4:
		all, err = npyDecode[uint32](h, data, path)
	case 'u'<<4 | 8:
		all, err = npyDecode[uint64](h, data, path)
	}
	if err != nil {
		return nil, nil, err
	}
	if len(all) != n {
		return nil, nil, &InputError{Path: path, Msg: fmt.Sprintf("truncated .npy data: %d of %d values", len(all), n)}
	}
	var notes []string
	rows, cols := h.shape[0], 1
	if len(h.shape) == 2 {
		cols = h.shape[1]
	}
	if rows == 0 || cols == 0 {
		return nil, nil, &InputError{Path: path, Msg: fmt.Sprintf("empty series: the array has shape %v", h.shape)}
	}
	col := 0
	name := "x"
	if spec := strings.TrimSpace(opt.Column); spec != "" {
		k, err := strconv.Atoi(spec)
		if err != nil || k < 1 || k > cols {
			return nil, nil, &InputError{Path: path, Msg: fmt.Sprintf("no column %q: a .npy array has no column names; give a 1-based index from 1 to %d", spec, cols)}
		}
		col = k - 1
	} else if cols > 1 {
		notes = append(notes, fmt.Sprintf("column 1 of %d (choose with --column)", cols))
	}
	if cols > 1 {
		name = "column " + strconv.Itoa(col+1)
	}
	g := gapFiller{policy: opt.Gaps, vals: make([]float64, 0, rows)}
	for i := 0; i < rows; i++ {
		var v float64
		if h.fortran {
			v = all[col*rows+i]
		} else {
			v = all[i*cols+col]
		}
		if math.IsNaN(v) || math.IsInf(v, 0) {
			if opt.Gaps == gapsRefuse {
				return nil, nil, &InputError{Path: path, Msg: fmt.Sprintf("row %d of the array is %v, a gap: %s", i+1, v, gapHint)}
			}
			g.gap()
			continue
		}
		g.value(v)
	}
	vals := g.finish()
	if len(vals) == 0 {
		return nil, nil, &InputError{Path: path, Msg: "empty series: the array holds no values"}
	}
	s := &Series{Values: vals, Dt: 1, Name: name, GapsFilled: g.filled}
	if opt.Dt > 0 {
		s.Dt = opt.Dt
	}
	return s, notes, nil
}
