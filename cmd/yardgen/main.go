// Command yardgen writes a synthetic yard for measuring ampwright's speed:
// a CUE module with the example yard's catalog, rulebook and vendored
// schema, and N generated hulls of realistic size (about 40 loads and 30
// conductor runs each) that share the one catalog.
//
//	go run ./cmd/yardgen -hulls 200 -out /tmp/yard
//
// Each hull is a function of its index alone (math/rand seeded with the
// index), so hull 17 is the same file whatever -hulls is. The hulls are
// sized the way a designer would size them, conductors by ampacity and
// voltage drop and devices by rating, interrupting capacity and distance,
// so most pass every check; a few warn or fail, as real designs do.
//
// yardgen uses only the standard library and imports nothing of
// ampwright's: it copies the schema from the example yard rather than
// asking the compiler for it.
package main

import (
	"errors"
	"flag"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
)

func main() {
	if err := runMain(os.Args[1:], os.Stderr); err != nil {
		fmt.Fprintf(os.Stderr, "yardgen: %v\n", err)
		os.Exit(2)
	}
}

func runMain(args []string, stderr io.Writer) error {
	fl := flag.NewFlagSet("yardgen", flag.ContinueOnError)
	fl.SetOutput(stderr)
	hulls := fl.Int("hulls", 200, "number of hulls to generate")
	out := fl.String("out", "", "directory to write the yard to (must not exist or be empty)")
	from := fl.String("from", "designs", "example yard to copy cue.mod, catalog and rulebook from")
	fl.Usage = func() {
		fmt.Fprintf(stderr, "usage: yardgen -hulls N -out DIR [-from designs]\n\n")
		fl.PrintDefaults()
	}
	if err := fl.Parse(args); err != nil {
		return err
	}
	if *out == "" || fl.NArg() != 0 {
		fl.Usage()
		return errors.New("-out DIR is required, and no arguments")
	}
	if *hulls < 1 || *hulls > 9999 {
		return fmt.Errorf("-hulls %d: expected 1 to 9999", *hulls)
	}
	return generate(*from, *out, *hulls)
}

// generate writes the yard: the shared parts copied from the example yard
// in from, then n hulls.
func generate(from, out string, n int) error {
	if entries, err := os.ReadDir(out); err == nil && len(entries) > 0 {
		return fmt.Errorf("%s is not empty", out)
	}
	for _, p := range []string{"cue.mod/module.cue", "cue.mod/pkg/ampwright.dev/schema", "catalog", "rulebook"} {
		if err := copyTree(filepath.Join(from, filepath.FromSlash(p)), filepath.Join(out, filepath.FromSlash(p))); err != nil {
			return err
		}
	}
	for i := 1; i <= n; i++ {
		name := HullName(i)
		dir := filepath.Join(out, "hulls", name)
		if err := os.MkdirAll(dir, 0o755); err != nil {
			return err
		}
		if err := os.WriteFile(filepath.Join(dir, "hull.cue"), Hull(i), 0o644); err != nil {
			return err
		}
	}
	return nil
}

// HullName is the directory and package name of hull i.
func HullName(i int) string { return fmt.Sprintf("hull%04d", i) }

// copyTree copies the file or directory src to dst.
func copyTree(src, dst string) error {
	return filepath.WalkDir(src, func(p string, d fs.DirEntry, err error) error {
		if err != nil {
			return err
		}
		rel, err := filepath.Rel(src, p)
		if err != nil {
			return err
		}
		target := filepath.Join(dst, rel)
		if d.IsDir() {
			return os.MkdirAll(target, 0o755)
		}
		if !d.Type().IsRegular() {
			return nil
		}
		b, err := os.ReadFile(p)
		if err != nil {
			return err
		}
		if err := os.MkdirAll(filepath.Dir(target), 0o755); err != nil {
			return err
		}
		return os.WriteFile(target, b, 0o644)
	})
}
