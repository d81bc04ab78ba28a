package result

import (
	"fmt"
	"math"
	"reflect"
	"strconv"
	"strings"
	"sync"
)

// NonFinite returns the JSON path of the first number in v that is not
// finite (NaN or an infinity), such as "checks[3].value", and false when
// every number is finite. JSON cannot hold such a number: a result that
// has one is refused before it is written, never encoded halfway.
func NonFinite(v any) (string, bool) {
	var at []string // the path's elements, innermost first
	if !nonFinite(reflect.ValueOf(v), &at) {
		return "", false
	}
	var b strings.Builder
	for i := len(at) - 1; i >= 0; i-- {
		e := at[i]
		if b.Len() > 0 && !strings.HasPrefix(e, "[") {
			b.WriteByte('.')
		}
		b.WriteString(e)
	}
	return b.String(), true
}

// nonFinite reports whether v holds a number that is not finite, adding
// to at, on the way out, the elements of its path: the path is spelt only
// for a result that has one.
func nonFinite(v reflect.Value, at *[]string) bool {
	switch v.Kind() {
	case reflect.Float32, reflect.Float64:
		f := v.Float()
		return math.IsNaN(f) || math.IsInf(f, 0)
	case reflect.Pointer, reflect.Interface:
		return !v.IsNil() && nonFinite(v.Elem(), at)
	case reflect.Slice, reflect.Array:
		if v.Kind() == reflect.Slice && !hasFloats(v.Type().Elem()) {
			return false
		}
		for i := 0; i < v.Len(); i++ {
			if nonFinite(v.Index(i), at) {
				*at = append(*at, "["+strconv.Itoa(i)+"]")
				return true
			}
		}
	case reflect.Map:
		if !hasFloats(v.Type().Elem()) {
			return false
		}
		iter := v.MapRange()
		for iter.Next() {
			if nonFinite(iter.Value(), at) {
				*at = append(*at, "["+strconv.Quote(fmt.Sprint(iter.Key().Interface()))+"]")
				return true
			}
		}
	case reflect.Struct:
		t := v.Type()
		for i := 0; i < t.NumField(); i++ {
			f := t.Field(i)
			if !f.IsExported() {
				continue
			}
			name, _, _ := strings.Cut(f.Tag.Get("json"), ",")
			if name == "-" {
				continue
			}
			if name == "" {
				name = f.Name
			}
			if nonFinite(v.Field(i), at) {
				if !f.Anonymous {
					*at = append(*at, name)
				}
				return true
			}
		}
	}
	return false
}

// floatTypes caches hasFloats by type.
var floatTypes sync.Map // reflect.Type → bool

// hasFloats reports whether a value of type t can hold a float.
func hasFloats(t reflect.Type) bool {
	if v, ok := floatTypes.Load(t); ok {
		return v.(bool)
	}
	has := floatsIn(t, map[reflect.Type]bool{})
	floatTypes.Store(t, has)
	return has
}

func floatsIn(t reflect.Type, seen map[reflect.Type]bool) bool {
	if seen[t] {
		return false // a recursive type: its floats are found where it starts
	}
	seen[t] = true
	switch t.Kind() {
	case reflect.Float32, reflect.Float64, reflect.Interface:
		return true
	case reflect.Pointer, reflect.Slice, reflect.Array, reflect.Map:
		return floatsIn(t.Elem(), seen)
	case reflect.Struct:
		for i := 0; i < t.NumField(); i++ {
			if t.Field(i).IsExported() && floatsIn(t.Field(i).Type, seen) {
				return true
			}
		}
	}
	return false
}
