// Package safejson writes any value as JSON without failing on numbers JSON cannot hold:
// every NaN or ±Inf float is written as null, and the JSON paths of those fields are returned
// so that the caller can add a caution naming each ("dim.cao[3].e2 is not finite (written as
// null)"). Finite values are written exactly as encoding/json writes them.
//
// It exists beside encoding/json because a result struct of an estimator legitimately holds
// a non-finite number (an undefined E2 of a periodic signal, an infinite slope), and the
// project's rule is that such a number reaches the user as null with a caution, never as a
// failed output.
package safejson

import (
	"bytes"
	"encoding"
	"encoding/json"
	"fmt"
	"math"
	"reflect"
	"slices"
	"strconv"
	"strings"
)

// Marshal returns the JSON encoding of v as json.Marshal does, except that every non-finite
// float (NaN, +Inf, −Inf) in v — a field, an element, a map value, behind pointers and
// interfaces — is written as null. nulled lists the JSON path of each such number in output
// order: field names as JSON writes them joined by '.', slice and array indices as [i], map
// keys as .key (or ["key"] when the key is not a plain word); "" is v itself. A value that
// marshals itself (json.Marshaler, encoding.TextMarshaler) is not looked into. Marshal fails
// only where json.Marshal fails for another reason (a channel, a function, a cycle, a
// failing MarshalJSON, a non-finite float in a field marked `json:",string"`).
func Marshal(v any) (out []byte, nulled []string, err error) {
	w := walker{}
	w.find(reflect.ValueOf(v), "", 0)
	if w.err != nil {
		return nil, nil, w.err
	}
	if len(w.paths) == 0 {
		b, err := json.Marshal(v)
		return b, nil, err
	}
	w.pick()
	c := w.copy(reflect.ValueOf(v), 0)
	var cv any
	if c.IsValid() {
		cv = c.Interface()
	}
	b, err := json.Marshal(cv)
	if err != nil {
		return nil, nil, err
	}
	return w.nullSentinels(b), w.paths, nil
}

// Cautions returns one plain-words caution per nulled path, for a result's cautions list.
func Cautions(nulled []string) []string {
	out := make([]string, 0, len(nulled))
	for _, p := range nulled {
		if p == "" {
			p = "the value"
		}
		out = append(out, p+" is not finite (written as null)")
	}
	return out
}

// maxDepth bounds the walk; a deeper value is taken as a cycle.
const maxDepth = 500

// walker finds non-finite floats and the finite ones, and copies a value with every
// non-finite float replaced by a sentinel: a finite number that occurs nowhere in the value,
// whose text is then replaced by null in the output.
type walker struct {
	paths  []string
	seen64 map[float64]bool
	seen32 map[float32]bool
	s64    float64
	s32    float32
	err    error
}

var (
	marshalerType     = reflect.TypeFor[json.Marshaler]()
	textMarshalerType = reflect.TypeFor[encoding.TextMarshaler]()
)

// marshalsItself reports whether encoding/json hands v to its own marshal method.
func marshalsItself(t reflect.Type) bool {
	if t.Implements(marshalerType) || t.Implements(textMarshalerType) {
		return true
	}
	pt := reflect.PointerTo(t)
	return pt.Implements(marshalerType) || pt.Implements(textMarshalerType)
}

// field is one exported struct field as encoding/json sees it.
type field struct {
	index    int
	name     string
	promoted bool // an embedded struct whose fields are promoted
	quoted   bool // the ",string" option
}

// fields lists the fields of struct type t that encoding/json writes.
func fields(t reflect.Type) []field {
	var out []field
	for i := 0; i < t.NumField(); i++ {
		sf := t.Field(i)
		tag := sf.Tag.Get("json")
		if tag == "-" {
			continue
		}
		name, opts, _ := strings.Cut(tag, ",")
		ft := sf.Type
		if ft.Kind() == reflect.Pointer {
			ft = ft.Elem()
		}
		if sf.Anonymous && name == "" && ft.Kind() == reflect.Struct {
			out = append(out, field{index: i, promoted: true})
			continue
		}
		if !sf.IsExported() {
			continue
		}
		if name == "" {
			name = sf.Name
		}
		out = append(out, field{index: i, name: name, quoted: slices.Contains(strings.Split(opts, ","), "string")})
	}
	return out
}

// join appends one step to a path.
func join(path, name string) string {
	if path == "" {
		return name
	}
	return path + "." + name
}

// keyStep is the path step of a map key.
func keyStep(path, key string) string {
	plain := key != ""
	for _, r := range key {
		if !(r == '_' || r == '-' || r >= 'a' && r <= 'z' || r >= 'A' && r <= 'Z' || r >= '0' && r <= '9') {
			plain = false
		}
	}
	if plain {
		return join(path, key)
	}
	return path + "[" + strconv.Quote(key) + "]"
}

// mapKeys returns the keys of map m with their text, in the order encoding/json writes them.
func mapKeys(m reflect.Value) ([]reflect.Value, []string, error) {
	keys := m.MapKeys()
	texts := make([]string, len(keys))
	for i, k := range keys {
		switch {
		case k.Kind() == reflect.String:
			texts[i] = k.String()
		case k.Type().Implements(textMarshalerType):
			b, err := k.Interface().(encoding.TextMarshaler).MarshalText()
			if err != nil {
				return nil, nil, err
			}
			texts[i] = string(b)
		case k.CanInt():
			texts[i] = strconv.FormatInt(k.Int(), 10)
		case k.CanUint():
			texts[i] = strconv.FormatUint(k.Uint(), 10)
		default:
			return nil, nil, fmt.Errorf("safejson: unsupported map key type %s", k.Type())
		}
	}
	idx := make([]int, len(keys))
	for i := range idx {
		idx[i] = i
	}
	slices.SortFunc(idx, func(a, b int) int { return strings.Compare(texts[a], texts[b]) })
	ks, ts := make([]reflect.Value, len(keys)), make([]string, len(keys))
	for i, j := range idx {
		ks[i], ts[i] = keys[j], texts[j]
	}
	return ks, ts, nil
}

// find records the path of every non-finite float in v and every finite float seen.
func (w *walker) find(v reflect.Value, path string, depth int) {
	if w.err != nil || !v.IsValid() {
		return
	}
	if depth > maxDepth {
		w.err = fmt.Errorf("safejson: value nested deeper than %d levels (a cycle?) at %q", maxDepth, path)
		return
	}
	if v.Kind() != reflect.Pointer && v.Kind() != reflect.Interface && marshalsItself(v.Type()) {
		return
	}
	switch v.Kind() {
	case reflect.Float32:
		f := float32(v.Float())
		if math.IsNaN(float64(f)) || math.IsInf(float64(f), 0) {
			w.paths = append(w.paths, path)
		} else {
			if w.seen32 == nil {
				w.seen32 = map[float32]bool{}
			}
			w.seen32[f] = true
		}
	case reflect.Float64:
		f := v.Float()
		if math.IsNaN(f) || math.IsInf(f, 0) {
			w.paths = append(w.paths, path)
		} else {
			if w.seen64 == nil {
				w.seen64 = map[float64]bool{}
			}
			w.seen64[f] = true
		}
	case reflect.Pointer, reflect.Interface:
		if !v.IsNil() {
			if v.Kind() == reflect.Pointer && marshalsItself(v.Type()) {
				return
			}
			w.find(v.Elem(), path, depth+1)
		}
	case reflect.Struct:
		for _, f := range fields(v.Type()) {
			fv := v.Field(f.index)
			if f.promoted {
				w.find(fv, path, depth+1)
			} else {
				w.find(fv, join(path, f.name), depth+1)
			}
		}
	case reflect.Slice, reflect.Array:
		if v.Kind() == reflect.Slice && v.Type().Elem().Kind() == reflect.Uint8 {
			return // []byte is written as base64
		}
		for i := 0; i < v.Len(); i++ {
			w.find(v.Index(i), path+"["+strconv.Itoa(i)+"]", depth+1)
		}
	case reflect.Map:
		keys, texts, err := mapKeys(v)
		if err != nil {
			w.err = err
			return
		}
		for i, k := range keys {
			w.find(v.MapIndex(k), keyStep(path, texts[i]), depth+1)
		}
	}
}

// pick chooses the sentinels: numbers with many significant digits that occur nowhere in the
// value.
func (w *walker) pick() {
	w.s64 = -7.123456789012345e-299
	for w.seen64[w.s64] {
		w.s64 = math.Nextafter(w.s64, 0)
	}
	w.s32 = -7.1234567e-29
	for w.seen32[w.s32] {
		w.s32 = math.Nextafter32(w.s32, 0)
	}
}

// copy returns a copy of v in which every non-finite float is the sentinel. Parts without
// floats are shared, not copied.
func (w *walker) copy(v reflect.Value, depth int) reflect.Value {
	if !v.IsValid() || depth > maxDepth {
		return v
	}
	if v.Kind() != reflect.Pointer && v.Kind() != reflect.Interface && marshalsItself(v.Type()) {
		return v
	}
	switch v.Kind() {
	case reflect.Float32, reflect.Float64:
		f := v.Float()
		if !math.IsNaN(f) && !math.IsInf(f, 0) {
			return v
		}
		c := reflect.New(v.Type()).Elem()
		if v.Kind() == reflect.Float32 {
			c.SetFloat(float64(w.s32))
		} else {
			c.SetFloat(w.s64)
		}
		return c
	case reflect.Pointer:
		if v.IsNil() || marshalsItself(v.Type()) {
			return v
		}
		c := reflect.New(v.Type().Elem())
		c.Elem().Set(w.copy(v.Elem(), depth+1))
		return c
	case reflect.Interface:
		if v.IsNil() {
			return v
		}
		c := reflect.New(v.Type()).Elem()
		c.Set(w.copy(v.Elem(), depth+1))
		return c
	case reflect.Struct:
		c := reflect.New(v.Type()).Elem()
		c.Set(v)
		for _, f := range fields(v.Type()) {
			if cf := c.Field(f.index); cf.CanSet() {
				cf.Set(w.copy(v.Field(f.index), depth+1))
			}
		}
		return c
	case reflect.Slice:
		if v.IsNil() || v.Type().Elem().Kind() == reflect.Uint8 {
			return v
		}
		c := reflect.MakeSlice(v.Type(), v.Len(), v.Len())
		for i := 0; i < v.Len(); i++ {
			c.Index(i).Set(w.copy(v.Index(i), depth+1))
		}
		return c
	case reflect.Array:
		c := reflect.New(v.Type()).Elem()
		for i := 0; i < v.Len(); i++ {
			c.Index(i).Set(w.copy(v.Index(i), depth+1))
		}
		return c
	case reflect.Map:
		if v.IsNil() {
			return v
		}
		c := reflect.MakeMapWithSize(v.Type(), v.Len())
		it := v.MapRange()
		for it.Next() {
			c.SetMapIndex(it.Key(), w.copy(it.Value(), depth+1))
		}
		return c
	}
	return v
}

// nullSentinels replaces each sentinel number outside strings in b by null.
func (w *walker) nullSentinels(b []byte) []byte {
	toks := [][]byte{floatText(w.s64, 64), floatText(float64(w.s32), 32)}
	var out bytes.Buffer
	out.Grow(len(b))
	inStr, esc := false, false
	for i := 0; i < len(b); i++ {
		c := b[i]
		if inStr {
			switch {
			case esc:
				esc = false
			case c == '\\':
				esc = true
			case c == '"':
				inStr = false
			}
			out.WriteByte(c)
			continue
		}
		if c == '"' {
			inStr = true
			out.WriteByte(c)
			continue
		}
		if c == '-' {
			replaced := false
			for _, t := range toks {
				if bytes.HasPrefix(b[i:], t) && (i+len(t) == len(b) || bytes.IndexByte([]byte(",]} \n"), b[i+len(t)]) >= 0) {
					out.WriteString("null")
					i += len(t) - 1
					replaced = true
					break
				}
			}
			if replaced {
				continue
			}
		}
		out.WriteByte(c)
	}
	return out.Bytes()
}

// floatText is the text encoding/json writes for f at the given bit size.
func floatText(f float64, bits int) []byte {
	b, _ := json.Marshal(f)
	if bits == 32 {
		b, _ = json.Marshal(float32(f))
	}
	return b
}
