package series

import (
	"encoding/binary"
	"fmt"
	"io"
	"math"
)

// readRaw reads headerless little-endian float32 (f32le) or float64 (f64le) samples. A byte
// count that is not a multiple of the sample width is an *InputError.
func readRaw(r io.Reader, path, format string, opt ReadOptions) (*Series, error) {
	width := 8
	if format == FormatF32LE {
		width = 4
	}
	g := gapFiller{policy: opt.Gaps}
	buf := make([]byte, 16<<10) // a multiple of 8
	var total int64
	have := 0
	for {
		n, err := io.ReadAtLeast(r, buf[have:], 1)
		have += n
		total += int64(n)
		whole := have - have%width
		for i := 0; i < whole; i += width {
			var v float64
			if width == 4 {
				v = float64(math.Float32frombits(binary.LittleEndian.Uint32(buf[i:])))
			} else {
				v = math.Float64frombits(binary.LittleEndian.Uint64(buf[i:]))
			}
			if math.IsNaN(v) || math.IsInf(v, 0) {
				if opt.Gaps == gapsRefuse {
					k := int(total-int64(have)+int64(i)) / width
					return nil, &InputError{Path: path, Msg: fmt.Sprintf("sample %d (byte offset %d) is %v, a gap: %s", k+1, int64(k)*int64(width), v, gapHint)}
				}
				g.gap()
				continue
			}
			g.value(v)
		}
		have = copy(buf, buf[whole:have])
		if err == io.EOF || err == io.ErrUnexpectedEOF {
			break
		}
		if err != nil {
			return nil, err
		}
	}
	if have != 0 {
		return nil, &InputError{Path: path, Msg: fmt.Sprintf("%d bytes is not a whole number of %d-byte %s samples (%d bytes left over): truncated, or not %s data",
			total, width, format, have, format)}
	}
	vals := g.finish()
	if len(vals) == 0 {
		return nil, &InputError{Path: path, Msg: "empty series: no samples"}
	}
	s := &Series{Values: vals, Dt: 1, Name: "x", GapsFilled: g.filled}
	if opt.Dt > 0 {
		s.Dt = opt.Dt
	}
	return s, nil
}
