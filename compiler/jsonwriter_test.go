package compiler

import (
	"encoding/json"
	"path/filepath"
	"reflect"
	"testing"
)

// TestWalkWritesWhatCUEEncodes checks the validator's one pass against
// CUE's own JSON encoder: for every valid hull of the example yard and
// of the test yard, the JSON the walk writes decodes to the same value
// as cue.Value.MarshalJSON's.
func TestWalkWritesWhatCUEEncodes(t *testing.T) {
	var dirs []string
	for _, glob := range []string{"../designs/hulls/*", "../" + yard + "/hulls/*"} {
		m, err := filepath.Glob(glob)
		if err != nil {
			t.Fatal(err)
		}
		dirs = append(dirs, m...)
	}
	valid := 0
	for _, dir := range dirs {
		d, err := Load(dir)
		if err != nil {
			continue // a hull in error is never decoded
		}
		valid++
		c := &validator{root: d.value, data: d.value, design: d.ec.design, home: d.home}
		c.run()
		if !c.clean {
			t.Errorf("%s: loads, but its value is not clean", dir)
			continue
		}
		ours, err := c.out.bytes()
		if err != nil {
			t.Fatalf("%s: %v", dir, err)
		}
		theirs, err := d.value.MarshalJSON()
		if err != nil {
			t.Fatalf("%s: %v", dir, err)
		}
		var a, b any
		if err := json.Unmarshal(ours, &a); err != nil {
			t.Fatalf("%s: the walk wrote JSON that does not parse: %v\n%s", dir, err, ours)
		}
		if err := json.Unmarshal(theirs, &b); err != nil {
			t.Fatal(err)
		}
		if !reflect.DeepEqual(a, b) {
			t.Errorf("%s: the walk's JSON differs from CUE's:\nours   %s\ntheirs %s", dir, ours, theirs)
		}
	}
	if valid < 5 {
		t.Fatalf("only %d valid hulls compared", valid)
	}
}
