package series

import (
	"bufio"
	"bytes"
	"compress/gzip"
	"fmt"
	"io"
	"os"
)

// Header returns the column names of the delimited-text file at path (plain or gzipped), read
// from its first line that is neither blank nor a comment when that line is a header by the
// rule of ReadFile (a cell that is neither a number, a gap nor a time stamp); nil when the
// file has no header. Only the start of the file is read (shell completion of --column).
func Header(path string) ([]string, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	br := bufio.NewReader(f)
	var r io.Reader = br
	if magic, _ := br.Peek(2); len(magic) == 2 && magic[0] == 0x1f && magic[1] == 0x8b {
		zr, err := gzip.NewReader(br)
		if err != nil {
			return nil, &InputError{Path: path, Msg: fmt.Sprintf("corrupt gzip data: %v", err)}
		}
		defer zr.Close()
		r = zr
	}
	lr := newLineReader(r, path)
	for first := true; ; first = false {
		line, err := lr.next()
		if err != nil {
			if err == io.EOF {
				return nil, nil
			}
			return nil, err
		}
		if first {
			line = bytes.TrimPrefix(line, []byte("\xef\xbb\xbf"))
		}
		if isBlank(line) || isComment(line) {
			continue
		}
		delim := detectDelimiter(line)
		fields := splitFields(line, delim, nil)
		cr := cellReader{comma: (delim == ';' || delim == '\t') && decimalCommaRow(line, fields)}
		for _, fl := range fields {
			if _, k := cr.classify(line[fl.lo:fl.hi], fl.bad); k == cellText && !isStampCell(line, fl) {
				names := make([]string, len(fields))
				for j, g := range fields {
					names[j] = CleanText(fieldText(line, g))
				}
				return names, nil
			}
		}
		return nil, nil
	}
}
