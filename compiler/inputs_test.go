package compiler

import (
	"io/fs"
	"os"
	"path/filepath"
	"testing"
)

// readSource reads a module on disk into a Source, as ReadRevision would
// from git.
func readSource(t *testing.T, root string) *Source {
	t.Helper()
	src := &Source{Files: map[string][]byte{}, Label: "abc1234:"}
	err := filepath.WalkDir(root, func(p string, d fs.DirEntry, err error) error {
		if err != nil || d.IsDir() {
			return err
		}
		rel, err := filepath.Rel(root, p)
		if err != nil {
			return err
		}
		b, err := os.ReadFile(p)
		src.Files[filepath.ToSlash(rel)] = b
		return err
	})
	if err != nil {
		t.Fatal(err)
	}
	return src
}

// TestEntryAndOrigin checks how a diff groups a hull's inputs: by entry,
// and by whether the hull's own files write them, for a hull on disk and
// the same hull read from memory.
func TestEntryAndOrigin(t *testing.T) {
	onDisk, err := Load("../designs/hulls/dunnock")
	if err != nil {
		t.Fatal(err)
	}
	inMemory, err := LoadFrom("hulls/dunnock", readSource(t, "../designs"))
	if err != nil {
		t.Fatal(err)
	}
	tests := []struct {
		name, path, entry string
		own               bool
	}{
		{"a run's length", `wiring."panel-pilot".length`, `wiring."panel-pilot"`, true},
		{"a load's hours", "loads.fridge.hours.anchor", "loads.fridge", true},
		{"a catalog part's value", "bank.battery.capacity", "bank", false},
		{"a part's id, from the schema's pattern", "bank.battery.id", "bank", false},
		{"how a catalog fuse is fitted", `wiring."bank-switch".protection.distance`, `wiring."bank-switch"`, true},
		{"a catalog fuse's rating", `wiring."bank-switch".protection.rating`, `wiring."bank-switch"`, false},
		{"the yard's rulebook", "rules.bom.slack", "rules.bom", false},
		{"the rulebook's name", "rules.name", "rules", false},
		{"a list element", "site.months[0]", "site", true},
		{"the vessel", "vessel.name", "vessel", true},
		{"a schema default", `wiring."bank-switch".protection.sheathed`, `wiring."bank-switch"`, false},
		{"imported from the catalog", "currency", "currency", false},
		{"no such value", "loads.nosuch.power", "loads", false},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			for side, d := range map[string]*Design{"disk": onDisk, "memory": inMemory} {
				if got := d.Entry(tc.path); got != tc.entry {
					t.Errorf("%s: Entry(%s) = %s, want %s", side, tc.path, got, tc.entry)
				}
				if got := d.WrittenInHull(tc.path); got != tc.own {
					t.Errorf("%s: WrittenInHull(%s) = %v, want %v", side, tc.path, got, tc.own)
				}
			}
		})
	}
}

// TestInputOrigins: the one walk gives what Inputs, Entry and
// WrittenInHull give apart.
func TestInputOrigins(t *testing.T) {
	for _, hull := range []string{"dunnock", "tystie", "brackenwell"} {
		d, err := Load("../designs/hulls/" + hull)
		if err != nil {
			t.Fatal(err)
		}
		inputs, entries, own := d.InputOrigins()
		want := d.Inputs()
		if len(inputs) != len(want) {
			t.Fatalf("%s: %d inputs, want %d", hull, len(inputs), len(want))
		}
		for p, v := range want {
			if inputs[p] != v {
				t.Errorf("%s: %s = %s, want %s", hull, p, inputs[p], v)
			}
			if entries[p] != d.Entry(p) {
				t.Errorf("%s: %s belongs to %s, want %s", hull, p, entries[p], d.Entry(p))
			}
			if own[p] != d.WrittenInHull(p) {
				t.Errorf("%s: %s written in the hull %v, want %v", hull, p, own[p], d.WrittenInHull(p))
			}
		}
	}
}
