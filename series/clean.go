package series

import (
	"strings"
	"unicode"
	"unicode/utf8"
)

// CleanText makes text taken from an input (a column name, a unit, a header) safe to place in
// HTML, SVG, XML or JSON: bytes that are not valid UTF-8 become U+FFFD (the replacement
// character), tabs and line breaks become one space, and characters XML 1.0 does not allow or
// that can disguise text are dropped: control characters (C0, DEL, C1), the bidirectional
// embedding, override and isolate marks (U+202A–U+202E, U+2066–U+2069), and the
// non-characters U+FFFE and U+FFFF. Leading and trailing spaces are removed. Text that needs
// none of this is returned unchanged without allocating.
func CleanText(s string) string {
	clean := true
	for i, r := range s {
		if r == utf8.RuneError {
			if _, size := utf8.DecodeRuneInString(s[i:]); size == 1 {
				clean = false
				break
			}
		} else if !keepRune(r) { // includes tab and line breaks
			clean = false
			break
		}
	}
	if clean {
		return strings.TrimSpace(s)
	}
	var b strings.Builder
	b.Grow(len(s))
	for i := 0; i < len(s); {
		r, size := utf8.DecodeRuneInString(s[i:])
		i += size
		switch {
		case r == utf8.RuneError && size == 1:
			b.WriteRune(utf8.RuneError)
		case r == '\t' || r == '\n' || r == '\r':
			b.WriteByte(' ')
		case keepRune(r):
			b.WriteRune(r)
		}
	}
	return strings.TrimSpace(b.String())
}

// keepRune reports whether r may stand in cleaned text.
func keepRune(r rune) bool {
	switch {
	case unicode.IsControl(r): // C0, DEL and C1
		return false
	case r >= 0x202A && r <= 0x202E, r >= 0x2066 && r <= 0x2069:
		return false
	case r == 0xFFFE || r == 0xFFFF:
		return false
	}
	return true
}
