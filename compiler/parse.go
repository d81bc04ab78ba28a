package compiler

import (
	"fmt"
	"path/filepath"
	"sync"
	"unicode/utf8"

	"cuelang.org/go/cue/scanner"

	"cuelang.org/go/cue/ast"
	"cuelang.org/go/cue/errors"
	"cuelang.org/go/cue/parser"
	"cuelang.org/go/cue/token"
)

// hullParser is the parser cue/load calls for every file a design is made
// of, in the module at root whose hull package is in home. It refuses what
// a design may not hold, each as an error at its position (bytes that are
// not UTF-8 are refused earlier, by gather: cue/load turns them into U+FFFD
// before this parser sees them):
//
//   - an attribute that ampwright's schema uses (@q, which pins a field to
//     a dimension and its limits): the limits come from the schema alone,
//     and a design that wrote `@q(length, le="2000 m")` on a field would
//     loosen them;
//   - embedding files (@extern(embed), @embed): an embedded file would be
//     read by CUE, outside the guard and outside the inputs hash that a
//     reviewer and the diff rely on;
//   - nesting deeper than maxNesting, before it is parsed.
//
// The vendored copy of the schema (checked identical to the embedded one
// before loading) is the one file allowed the schema's attributes.
//
// In the hull's own directory, it also takes out an embedding of the
// vendored #Design (dropDesignEmbed). The files on disk are not touched.
//
// The refusals are also kept in refused: cue/load reports an error in an
// imported package at the import, and the refusal's own position is the
// one to show.
func hullParser(root, home string, refused *refusals) func(name string, src any, cfg parser.Config) (*ast.File, error) {
	home = filepath.Clean(home)
	vendored := filepath.Join(root, vendoredDir)
	return func(name string, src any, cfg parser.Config) (*ast.File, error) {
		full := cfg.Mode&(parser.ImportsOnly|parser.PackageClauseOnly) == 0
		if b, ok := src.([]byte); ok && full {
			if err := nesting(name, b); err != nil {
				refused.add(err)
				return nil, err
			}
		}
		f, err := parser.ParseFile(name, src, cfg)
		if err != nil || !full {
			return f, err
		}
		// Only the vendored package's own files: a package below it is
		// another package, and the design's.
		if filepath.Dir(name) != vendored {
			if err := designAttributes(f); err != nil {
				refused.add(err)
				return nil, err
			}
		}
		if filepath.Clean(filepath.Dir(name)) == home {
			dropDesignEmbed(f)
		}
		return f, nil
	}
}

// invalidUTF8 is the error for the first byte of b that is not UTF-8.
func invalidUTF8(name string, b []byte) errors.Error {
	off := 0
	for off < len(b) {
		r, w := utf8.DecodeRune(b[off:])
		if r == utf8.RuneError && w == 1 {
			break
		}
		off += w
	}
	tf := token.NewFile(name, -1, len(b))
	tf.SetLinesForContent(b)
	return errors.Newf(tf.Pos(off, token.NoRelPos), "byte 0x%02x is not UTF-8: a design file must be UTF-8 text", b[off])
}

// reservedAttrs are the attributes a design may not write, and why.
var reservedAttrs = map[string]string{
	"q":      "@q is the schema's: it pins a field to its dimension and limits, which come from ampwright's schema alone; remove it",
	"extern": "embedding files is not supported: an embedded file would escape the checks and the inputs hash of the design's .cue files; write the data in CUE",
	"embed":  "embedding files is not supported: an embedded file would escape the checks and the inputs hash of the design's .cue files; write the data in CUE",
}

// designAttributes refuses the attributes of reservedAttrs in f, each at
// its position.
func designAttributes(f *ast.File) errors.Error {
	var errs errors.Error
	ast.Walk(f, func(n ast.Node) bool {
		if a, ok := n.(*ast.Attribute); ok {
			key, _ := a.Split()
			if why, ok := reservedAttrs[key]; ok {
				errs = errors.Append(errs, errors.Newf(a.Pos(), "%s", fmt.Sprintf("attribute @%s: %s", key, why)))
			}
		}
		return true
	}, nil)
	return errs
}

// refusals collects the errors hullParser refused files with; cue/load
// may parse files from several goroutines.
type refusals struct {
	mu   sync.Mutex
	errs errors.Error
}

func (r *refusals) add(err errors.Error) {
	r.mu.Lock()
	defer r.mu.Unlock()
	r.errs = errors.Append(r.errs, err)
}

func (r *refusals) err() errors.Error {
	r.mu.Lock()
	defer r.mu.Unlock()
	return r.errs
}

// maxNesting bounds how deeply a design file nests fields, structs and
// lists within each other. CUE's parser bounds an expression's nesting but
// not a chain of fields (a: a: a: …), and its syntax tree is walked
// recursively: a chain of 300,000 overflows the stack, which no program
// can recover from. No design nests more than a few levels.
const maxNesting = 1000

// nesting refuses a file that nests deeper than maxNesting, found by
// scanning its tokens: each field of a chain (a colon) and each open
// bracket is one level, a comma (written, or at a line's end) ends a
// chain.
func nesting(name string, src []byte) errors.Error {
	tf := token.NewFile(name, -1, len(src))
	var s scanner.Scanner
	s.Init(tf, src, nil, 0)
	chains := []int{0} // colons of the chain open at each bracket level
	depth := 0
	for {
		pos, tok, _ := s.Scan()
		switch tok {
		case token.EOF:
			return nil
		case token.COLON:
			chains[len(chains)-1]++
			depth++
		case token.COMMA:
			depth -= chains[len(chains)-1]
			chains[len(chains)-1] = 0
		case token.LBRACE, token.LBRACK, token.LPAREN:
			chains = append(chains, 0)
			depth++
		case token.RBRACE, token.RBRACK, token.RPAREN:
			if len(chains) > 1 {
				depth -= chains[len(chains)-1] + 1
				chains = chains[:len(chains)-1]
			}
			// The chain that held the bracket ends with it too.
		}
		if depth > maxNesting {
			return errors.Newf(pos, "the file nests fields, structs and lists more than %d levels deep; ampwright takes designs of at most %d", maxNesting, maxNesting)
		}
	}
}
