package serve

import (
	"reflect"

	"github.com/sill-tool/sill/internal/decision"
	"github.com/sill-tool/sill/internal/format"
)

// safeFile makes every text of f (names, notes, paths, rules, segment
// values, sign-offs) safe for a terminal with format.Printable, in
// place, before the screen shows it: nothing read from a file reaches a
// client as a control sequence, whichever part of the screen draws it.
// The screen writes nothing, so the changed copy never reaches the disk.
func safeFile(f *decision.File) {
	safeValue(reflect.ValueOf(f).Elem(), 0)
}

// safeValue makes the strings of v safe; depth bounds the walk.
func safeValue(v reflect.Value, depth int) {
	if depth > 32 {
		return
	}
	switch v.Kind() {
	case reflect.String:
		if v.CanSet() {
			v.SetString(format.Printable(v.String()))
		}
	case reflect.Pointer, reflect.Interface:
		if !v.IsNil() {
			safeValue(v.Elem(), depth+1)
		}
	case reflect.Struct:
		for i := range v.NumField() {
			if v.Type().Field(i).IsExported() {
				safeValue(v.Field(i), depth+1)
			}
		}
	case reflect.Slice, reflect.Array:
		for i := range v.Len() {
			safeValue(v.Index(i), depth+1)
		}
	case reflect.Map:
		if v.IsNil() || !v.CanSet() {
			return
		}
		safe := reflect.MakeMapWithSize(v.Type(), v.Len())
		for it := v.MapRange(); it.Next(); {
			key := reflect.New(v.Type().Key()).Elem()
			key.Set(it.Key())
			safeValue(key, depth+1)
			value := reflect.New(v.Type().Elem()).Elem()
			value.Set(it.Value())
			safeValue(value, depth+1)
			safe.SetMapIndex(key, value)
		}
		v.Set(safe)
	}
}
