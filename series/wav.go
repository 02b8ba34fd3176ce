package series

import (
	"bytes"
	"encoding/binary"
	"fmt"
	"io"
	"math"

	"github.com/go-audio/wav"
)

// WAV format codes of the fmt chunk (Microsoft/IBM, 1991, "Multimedia Programming Interface
// and Data Specifications 1.0", RIFF WAVE).
const (
	wavPCM        = 1
	wavFloat      = 3
	wavExtensible = 0xFFFE
)

// wavLayout is what a walk over the RIFF chunks found.
type wavLayout struct {
	fmtBody          []byte
	dataOff, dataLen int
	subFormat        int // format code, resolved through WAVE_FORMAT_EXTENSIBLE
}

// scanWAV walks the RIFF chunks of an in-memory WAV file up to the data chunk, checking that
// every chunk lies inside the file. go-audio/wav trusts chunk sizes when it allocates, so it is
// only ever shown a header rebuilt from chunks checked here.
func scanWAV(b []byte, path string) (*wavLayout, error) {
	if len(b) < 12 || string(b[:4]) != "RIFF" || string(b[8:12]) != "WAVE" {
		return nil, &InputError{Path: path, Msg: "not a WAV file (no RIFF/WAVE header)"}
	}
	var l wavLayout
	off := 12
	for {
		if off+8 > len(b) {
			if l.fmtBody == nil {
				return nil, &InputError{Path: path, Msg: "truncated WAV file: no fmt chunk"}
			}
			return nil, &InputError{Path: path, Msg: "truncated WAV file: no data chunk"}
		}
		id := string(b[off : off+4])
		size := int(binary.LittleEndian.Uint32(b[off+4 : off+8]))
		body := off + 8
		if id == "data" {
			if l.fmtBody == nil {
				return nil, &InputError{Path: path, Msg: "not a valid WAV file: the data chunk comes before the fmt chunk"}
			}
			if size > len(b)-body {
				return nil, &InputError{Path: path, Msg: fmt.Sprintf("truncated WAV file: the data chunk says %d bytes, the file holds %d", size, len(b)-body)}
			}
			l.dataOff, l.dataLen = body, size
			break
		}
		if size > len(b)-body {
			return nil, &InputError{Path: path, Msg: fmt.Sprintf("truncated WAV file: the %q chunk says %d bytes, the file holds %d", id, size, len(b)-body)}
		}
		if id == "fmt " {
			if size < 16 || size > 1024 {
				return nil, &InputError{Path: path, Msg: fmt.Sprintf("not a valid WAV file: fmt chunk of %d bytes", size)}
			}
			l.fmtBody = b[body : body+size]
		}
		off = body + size + size%2
	}
	l.subFormat = int(binary.LittleEndian.Uint16(l.fmtBody[0:2]))
	if l.subFormat == wavExtensible {
		if len(l.fmtBody) < 26 {
			return nil, &InputError{Path: path, Msg: "not a valid WAV file: extensible fmt chunk without a sub-format"}
		}
		l.subFormat = int(binary.LittleEndian.Uint16(l.fmtBody[24:26]))
	}
	return &l, nil
}

// readWAV reads one channel of a WAV file: PCM 8 (unsigned), 16, 24 or 32-bit integers or
// 32/64-bit IEEE floats, scaled to full scale (integers are divided by 2^(bits−1), so values lie
// in [−1, 1)). The fmt chunk is decoded with github.com/go-audio/wav; Dt = 1/rate in seconds.
func readWAV(r io.Reader, path string, opt ReadOptions) (*Series, []string, error) {
	b, err := io.ReadAll(r)
	if err != nil {
		return nil, nil, err
	}
	l, err := scanWAV(b, path)
	if err != nil {
		return nil, nil, err
	}
	// Rebuild a minimal file (RIFF header, fmt chunk, data chunk header) for the decoder.
	var hdr bytes.Buffer
	hdr.WriteString("RIFF")
	binary.Write(&hdr, binary.LittleEndian, uint32(4+8+len(l.fmtBody)+8+l.dataLen))
	hdr.WriteString("WAVEfmt ")
	binary.Write(&hdr, binary.LittleEndian, uint32(len(l.fmtBody)))
	hdr.Write(l.fmtBody)
	if len(l.fmtBody)%2 == 1 {
		hdr.WriteByte(0)
	}
	hdr.WriteString("data")
	binary.Write(&hdr, binary.LittleEndian, uint32(0))
	d := wav.NewDecoder(bytes.NewReader(hdr.Bytes()))
	if err := d.FwdToPCM(); err != nil || d.Err() != nil {
		return nil, nil, &InputError{Path: path, Msg: "not a valid WAV file: unreadable fmt chunk"}
	}
	chans, bits, rate := int(d.NumChans), int(d.BitDepth), int(d.SampleRate)
	if chans < 1 || rate < 1 {
		return nil, nil, &InputError{Path: path, Msg: fmt.Sprintf("not a valid WAV file: %d channels at %d Hz", chans, rate)}
	}
	isFloat := l.subFormat == wavFloat
	switch {
	case l.subFormat == wavPCM && (bits == 8 || bits == 16 || bits == 24 || bits == 32):
	case isFloat && (bits == 32 || bits == 64):
	default:
		return nil, nil, &InputError{Path: path, Msg: fmt.Sprintf("unsupported WAV encoding (format %d, %d bits): use PCM 8/16/24/32-bit or 32/64-bit float", l.subFormat, bits)}
	}
	width := bits / 8
	frame := width * chans
	ch := opt.Channel
	if ch == 0 {
		ch = 1
	}
	if ch < 1 || ch > chans {
		return nil, nil, &InputError{Path: path, Msg: fmt.Sprintf("no channel %d: the file has %d channel(s)", ch, chans)}
	}
	data := b[l.dataOff : l.dataOff+l.dataLen]
	if len(data)%frame != 0 {
		return nil, nil, &InputError{Path: path, Msg: fmt.Sprintf("truncated WAV data: %d bytes is not a whole number of %d-byte frames", len(data), frame)}
	}
	n := len(data) / frame
	g := gapFiller{policy: opt.Gaps, vals: make([]float64, 0, n)}
	scale := math.Ldexp(1, -(bits - 1))
	for i := 0; i < n; i++ {
		p := data[i*frame+(ch-1)*width:]
		var v float64
		switch {
		case isFloat && bits == 32:
			v = float64(math.Float32frombits(binary.LittleEndian.Uint32(p)))
		case isFloat:
			v = math.Float64frombits(binary.LittleEndian.Uint64(p))
		case bits == 8:
			v = float64(int(p[0])-128) * scale
		case bits == 16:
			v = float64(int16(binary.LittleEndian.Uint16(p))) * scale
		case bits == 24:
			v = float64(int32(uint32(p[0])<<8|uint32(p[1])<<16|uint32(p[2])<<24)>>8) * scale
		default:
			v = float64(int32(binary.LittleEndian.Uint32(p))) * scale
		}
		if math.IsNaN(v) || math.IsInf(v, 0) {
			if opt.Gaps == gapsRefuse {
				return nil, nil, &InputError{Path: path, Msg: fmt.Sprintf("frame %d of channel %d is %v, a gap: %s", i+1, ch, v, gapHint)}
			}
			g.gap()
			continue
		}
		g.value(v)
	}
	vals := g.finish()
	if len(vals) == 0 {
		return nil, nil, &InputError{Path: path, Msg: "empty series: the WAV data chunk holds no samples"}
	}
	s := &Series{Values: vals, Dt: 1 / float64(rate), Name: fmt.Sprintf("channel %d", ch), Unit: "full scale", TimeUnit: "s", GapsFilled: g.filled}
	if opt.Dt > 0 {
		s.Dt = opt.Dt
	}
	notes := []string{fmt.Sprintf("WAV %d Hz, %d-bit %s, channel %d of %d", rate, bits, map[bool]string{true: "float", false: "PCM"}[isFloat], ch, chans)}
	return s, notes, nil
}
