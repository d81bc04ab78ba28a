package compiler

import (
	"encoding/json"
	"errors"

	"cuelang.org/go/cue"
)

// jsonWriter writes a design as JSON while the validator walks it, in
// the order the walk visits it. A nil *jsonWriter writes nothing: the walk
// of a design in error has nothing to decode.
type jsonWriter struct {
	b     []byte
	first bool // no value yet in the struct or list just opened
	err   error
}

func (w *jsonWriter) open(c byte) {
	if w == nil {
		return
	}
	w.sep()
	w.b = append(w.b, c)
	w.first = true
}

func (w *jsonWriter) close(c byte) {
	if w == nil {
		return
	}
	w.b = append(w.b, c)
	w.first = false
}

// key writes a field's name; its value follows.
func (w *jsonWriter) key(name string) {
	if w == nil {
		return
	}
	w.sep()
	w.b = appendString(w.b, name)
	w.b = append(w.b, ':')
	w.first = true // the value takes no separator
}

// leaf writes a concrete scalar as CUE's own encoder does (a default for a
// value with one).
func (w *jsonWriter) leaf(v cue.Value) {
	if w == nil {
		return
	}
	w.sep()
	b, err := v.MarshalJSON()
	if err != nil {
		if w.err == nil {
			w.err = err
		}
		b = []byte("null")
	}
	w.b = append(w.b, b...)
}

func (w *jsonWriter) sep() {
	if !w.first && len(w.b) > 0 {
		w.b = append(w.b, ',')
	}
	w.first = false
}

// bytes returns the JSON written, or the first error of a value that
// would not encode.
func (w *jsonWriter) bytes() ([]byte, error) {
	if w == nil {
		return nil, errors.New("internal error: the design was not written as JSON")
	}
	return w.b, w.err
}

func appendString(b []byte, s string) []byte {
	q, _ := json.Marshal(s) // a string always encodes
	return append(b, q...)
}
