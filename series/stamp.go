package series

import (
	"bytes"
	"math"
	"time"
)

// isoStamp parses an ISO-8601 date-time (ISO 8601-1:2019; the profile of RFC 3339 with its
// common relaxations): YYYY-MM-DD, optionally followed by 'T' or one space and hh:mm[:ss[.f…]],
// optionally followed by Z or an offset ±hh[:mm] or ±hhmm. A stamp without an offset is taken
// as UTC. It returns the instant as Unix seconds and nanoseconds (offset applied), the
// precision the stamp is written with in seconds (1 day for a date, 60 s for hh:mm, 1 s for
// whole seconds, 10^−d for d decimals of a second), and ok=false for anything else (including
// impossible dates such as 2026-02-30 and leap seconds). It does not allocate.
func isoStamp(b []byte) (sec, nsec int64, q float64, ok bool) {
	num := func(i, n int) (int, bool) {
		if i+n > len(b) {
			return 0, false
		}
		v := 0
		for _, c := range b[i : i+n] {
			if c < '0' || c > '9' {
				return 0, false
			}
			v = v*10 + int(c-'0')
		}
		return v, true
	}
	y, ok1 := num(0, 4)
	mo, ok2 := num(5, 2)
	d, ok3 := num(8, 2)
	if !ok1 || !ok2 || !ok3 || b[4] != '-' || b[7] != '-' {
		return 0, 0, 0, false
	}
	var h, mi, s int
	q = 86400
	i := 10
	if i < len(b) && (b[i] == 'T' || b[i] == 't' || b[i] == ' ') {
		var okh, okm bool
		h, okh = num(i+1, 2)
		mi, okm = num(i+4, 2)
		if !okh || !okm || b[i+3] != ':' {
			return 0, 0, 0, false
		}
		i += 6
		q = 60
		if i < len(b) && b[i] == ':' {
			var oks bool
			if s, oks = num(i+1, 2); !oks {
				return 0, 0, 0, false
			}
			i += 3
			q = 1
			if i < len(b) && (b[i] == '.' || b[i] == ',') {
				i++
				digits := 0
				scale := int64(1e8)
				for i < len(b) && b[i] >= '0' && b[i] <= '9' {
					if digits < 9 {
						nsec += int64(b[i]-'0') * scale
						scale /= 10
					}
					digits++
					i++
				}
				if digits == 0 {
					return 0, 0, 0, false
				}
				q = math.Pow10(-min(digits, 9))
			}
		}
	}
	offset := 0
	if i < len(b) {
		switch b[i] {
		case 'Z', 'z':
			i++
		case '+', '-':
			if q >= 86400 {
				return 0, 0, 0, false // an offset needs a time of day
			}
			sign := 1
			if b[i] == '-' {
				sign = -1
			}
			oh, okh := num(i+1, 2)
			if !okh {
				return 0, 0, 0, false
			}
			i += 3
			om := 0
			if i < len(b) && b[i] == ':' {
				i++
			}
			if i < len(b) {
				var okm bool
				if om, okm = num(i, 2); !okm {
					return 0, 0, 0, false
				}
				i += 2
			}
			if oh > 23 || om > 59 {
				return 0, 0, 0, false
			}
			offset = sign * (oh*3600 + om*60)
		default:
			return 0, 0, 0, false
		}
	}
	if i != len(b) || mo < 1 || mo > 12 || d < 1 || h > 23 || mi > 59 || s > 59 {
		return 0, 0, 0, false
	}
	t := time.Date(y, time.Month(mo), d, h, mi, s, 0, time.UTC)
	if t.Day() != d { // 2026-02-30 normalises to March
		return 0, 0, 0, false
	}
	return t.Unix() - int64(offset), nsec, q, true
}

// looksISO is a cheap test that a cell starts like an ISO-8601 date (dddd-dd-dd).
func looksISO(b []byte) bool {
	if len(b) < 10 || b[4] != '-' || b[7] != '-' {
		return false
	}
	return bytes.IndexFunc(b[:4], func(r rune) bool { return r < '0' || r > '9' }) < 0
}

// isStampCell reports whether field f of line is an ISO-8601 date-time.
func isStampCell(line []byte, f span) bool {
	b := line[f.lo:f.hi]
	if f.bad || !looksISO(b) {
		return false
	}
	_, _, _, ok := isoStamp(b)
	return ok
}
