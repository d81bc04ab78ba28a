package result

import (
	"fmt"
	"math"
	"reflect"
	"strconv"
	"strings"
)

// NonFinite returns the JSON path of the first number in v that is not
// finite (NaN or an infinity), such as "checks[3].value", and false when
// every number is finite. JSON cannot hold such a number: a result that
// has one is refused before it is written, never encoded halfway.
func NonFinite(v any) (string, bool) {
	return nonFinite(reflect.ValueOf(v), "")
}

func nonFinite(v reflect.Value, path string) (string, bool) {
	switch v.Kind() {
	case reflect.Float32, reflect.Float64:
		if f := v.Float(); math.IsNaN(f) || math.IsInf(f, 0) {
			return path, true
		}
	case reflect.Pointer, reflect.Interface:
		if !v.IsNil() {
			return nonFinite(v.Elem(), path)
		}
	case reflect.Slice, reflect.Array:
		for i := 0; i < v.Len(); i++ {
			if p, bad := nonFinite(v.Index(i), path+"["+strconv.Itoa(i)+"]"); bad {
				return p, true
			}
		}
	case reflect.Map:
		iter := v.MapRange()
		for iter.Next() {
			if p, bad := nonFinite(iter.Value(), path+"["+strconv.Quote(fmt.Sprint(iter.Key().Interface()))+"]"); bad {
				return p, true
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
			sub := name
			if path != "" {
				sub = path + "." + name
			}
			if f.Anonymous {
				sub = path
			}
			if p, bad := nonFinite(v.Field(i), sub); bad {
				return p, true
			}
		}
	}
	return "", false
}
