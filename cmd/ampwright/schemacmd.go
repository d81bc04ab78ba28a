package main

import (
	"bytes"
	"os"
	"path/filepath"
	"strings"

	"github.com/spf13/cobra"

	"github.com/ampwright/ampwright/report"
	"github.com/ampwright/ampwright/schema"
)

func newSchemaCmd() *cobra.Command {
	var out string
	c := &cobra.Command{
		Use:   "schema --out DIR",
		Short: "Write the design schema as a CUE package a yard can vendor",
		Long: `schema writes ampwright's design schema, the same one built into the binary,
as CUE package "schema" in DIR. Vendor it into a yard's module at
cue.mod/pkg/` + schema.ImportPath + ` and import it from hulls and catalogs, so that
` + "`cue vet`" + ` and editors check designs as ampwright does (units are checked
by pattern there; ampwright also checks their limits).

Files in DIR that an earlier run wrote are replaced or removed; other files
are left alone.`,
		Example: `  ampwright schema --out cue.mod/pkg/` + schema.ImportPath + `
  cue vet -c ./hulls/dunnock`,
		Args: cobra.NoArgs,
		RunE: func(cmd *cobra.Command, _ []string) error {
			if out == "" {
				return usageError("schema needs --%s DIR", flagOut)
			}
			if err := writeSchema(out); err != nil {
				return &exitError{code: exitInput, err: err}
			}
			report.Printf(cmd.OutOrStdout(), "wrote schema package to %s\n", out)
			return nil
		},
	}
	c.Flags().StringVarP(&out, flagOut, "o", "", "directory to write the schema package to")
	_ = c.MarkFlagDirname(flagOut)
	return c
}

func writeSchema(dir string) error {
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return err
	}
	names, contents := schema.Vendored()
	keep := map[string]bool{}
	for _, n := range names {
		keep[n] = true
		if err := writeFileAtomic(filepath.Join(dir, n), contents[n]); err != nil {
			return err
		}
	}
	entries, err := os.ReadDir(dir)
	if err != nil {
		return err
	}
	for _, e := range entries {
		if keep[e.Name()] || !strings.HasSuffix(e.Name(), ".cue") {
			continue
		}
		p := filepath.Join(dir, e.Name())
		b, err := os.ReadFile(p)
		if err == nil && bytes.HasPrefix(b, []byte(schema.GeneratedHeader)) {
			if err := os.Remove(p); err != nil {
				return err
			}
		}
	}
	return nil
}

// writeFileAtomic writes b to a temporary file beside name and renames it,
// so that a failed write leaves any earlier file whole.
func writeFileAtomic(name string, b []byte) error {
	f, err := os.CreateTemp(filepath.Dir(name), "."+filepath.Base(name)+".*.tmp")
	if err != nil {
		return err
	}
	tmp := f.Name()
	addTemp(tmp)
	_, werr := f.Write(b)
	cerr := f.Close()
	if werr == nil {
		werr = cerr
	}
	if werr == nil {
		werr = os.Chmod(tmp, 0o644)
	}
	if werr == nil {
		werr = renameTemp(tmp, name)
	}
	if werr != nil {
		os.Remove(tmp)
		dropTemp(tmp)
		return werr
	}
	return nil
}
