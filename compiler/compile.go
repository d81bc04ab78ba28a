// Package compiler turns a hull's CUE design into checked results.
//
// The phases, each over one state:
//
//	load      cue/load reads the hull's package and its imports from the
//	          yard's module, with a registry that refuses, so nothing is
//	          fetched and nothing outside the module is read;
//	unify     the design is unified with the embedded #Design;
//	validate  every field is visited: quantities are parsed against their
//	          dimension and limits, CUE errors are reworded, references
//	          between parts of the design are resolved; all errors are
//	          collected, positioned and sorted;
//	decode    the valid design decodes into schema.Design, SI units;
//	rules     the design's rulebook tables replace the default's;
//	summarise the result names the design and what it declares.
//
// Load returns a Design or an ErrorList; Compile returns a result.Result.
package compiler

import (
	"encoding/json"
	"errors"
	"fmt"
	"path/filepath"
	"strings"

	"cuelang.org/go/cue"
	"cuelang.org/go/cue/build"
	cueerrors "cuelang.org/go/cue/errors"
	"cuelang.org/go/cue/token"

	"github.com/ampwright/ampwright/energy"
	"github.com/ampwright/ampwright/model"
	"github.com/ampwright/ampwright/schema"
)

// Design is a loaded, validated and decoded hull design.
type Design struct {
	// Dir is the design directory as given.
	Dir string
	// Root is the module root, or Dir when the design is in no module.
	Root string
	// Files are the input files, the imports' included, sorted.
	Files []string
	// Hash is the SHA-256 of the schema and every input file.
	Hash string
	// Spec is the decoded design.
	Spec *schema.Design
	// Rules is the rulebook in force: the default, with the design's
	// tables over it.
	Rules schema.Rulebook
	// Sys is the system model, once compiled.
	Sys *model.System
	// pos holds the design's position of every named entry, by CUE path.
	pos map[string]token.Pos
	// value is the design unified with the schema.
	value cue.Value
	// inst is the hull's package as loaded, its imports with it, and read
	// reads its files: the catalog and a proposal's CUE are read from them
	// (catalog.go, write.go).
	inst *build.Instance
	read func(string) ([]byte, error)
	// home is the hull's package directory as its files' positions name it.
	home string
	// ec is the context value was evaluated in, until Release.
	ec *evalContext
}

// ReadInput returns the contents of one of the design's input files
// (Files) as they were loaded: the file is not read again.
func (d *Design) ReadInput(file string) ([]byte, error) { return d.read(file) }

// Position returns the design's file:line:col for a CUE path such as
// wiring."bank-main", or of the nearest entry that holds it, or "" when
// there is none.
func (d *Design) Position(path string) string {
	return posString(d.posOf(path))
}

// posOf is the position of the entry at path, or of the nearest entry
// that holds it.
func (d *Design) posOf(path string) token.Pos {
	if pos, ok := d.pos[path]; ok {
		return pos // an entry's own path, as most findings give
	}
	p := cue.ParsePath(path)
	if p.Err() != nil {
		return d.pos[path]
	}
	sels := p.Selectors()
	for n := len(sels); n > 0; n-- {
		if pos, ok := d.pos[cue.MakePath(sels[:n]...).String()]; ok {
			return pos
		}
	}
	return token.NoPos
}

// Load reads, validates and decodes the hull design in dir. Input errors
// are returned as an ErrorList.
func Load(dir string) (*Design, error) {
	return LoadFrom(dir, nil)
}

// loaded is a hull's package as cue/load gives it, before evaluation.
type loaded struct {
	inst  *build.Instance
	files []string // the package's files and its imports', sorted
	src   *Source  // the files cue/load was given, by module path
	root  string   // the module root: on disk, or the source's in memory
}

// read returns an input file's contents as they were loaded.
func (l loaded) read(name string) ([]byte, error) {
	// A file as cue/load names it, in the overlay.
	if l.src != nil {
		if rel, ok := strings.CutPrefix(filepath.ToSlash(name), l.src.root()+"/"); ok {
			if b, ok := l.src.Files[rel]; ok {
				return b, nil
			}
		}
	}
	rel, err := filepath.Rel(l.root, name)
	if err != nil {
		return nil, err
	}
	b, ok := l.src.Files[filepath.ToSlash(rel)]
	if !ok {
		return nil, fmt.Errorf("%s is not among the design's files", displayName(name))
	}
	return b, nil
}

// loadPackage loads the hull's package from src, or the host file system
// when src is nil.
func loadPackage(dir string, src *Source) (loaded, error) {
	if src != nil {
		return loadSource(dir, src)
	}
	return loadDisk(dir)
}

// LoadFrom is Load reading from src, where dir is the hull's directory
// relative to the module root; with a nil src it reads the host file system.
func LoadFrom(dir string, src *Source) (*Design, error) {
	ec, err := takeContext()
	if err != nil {
		return nil, err
	}
	d, err := loadIn(ec, dir, src)
	if err != nil {
		// Errors hold positions and text, nothing evaluated: the context
		// is free for the next design.
		ec.release()
		return nil, err
	}
	d.ec = ec
	return d, nil
}

func loadIn(ec *evalContext, dir string, src *Source) (*Design, error) {
	ctx := ec.ctx
	l, err := loadPackage(dir, src)
	if l.src != nil {
		for _, b := range l.src.Files {
			ec.weight += len(b)
		}
	}
	if err != nil {
		var positioned cueerrors.Error
		if l.inst == nil && !errors.As(err, &positioned) {
			return nil, ErrorList{{Msg: unvirtual(err.Error())}}
		}
		return nil, loadErrors(err)
	}
	inst, files, root := l.inst, l.files, l.root
	hash, err := inputsHash(root, files, l.read)
	if err != nil {
		return nil, ErrorList{{Msg: err.Error()}}
	}
	data := ctx.BuildInstance(inst)
	if !data.Exists() {
		return nil, loadErrors(data.Err())
	}
	// Data first, so that error paths name the design, not #Design. A
	// hull that embeds the vendored #Design is unified again all the same:
	// CUE does not close the structs of an embedded definition the way it
	// closes a unified one, so a misspelt field would pass unseen.
	unified := data.Unify(ec.design)

	v := &validator{root: unified, data: data, design: ec.design, home: inst.Dir, refs: &refResolver{ctx: ctx, inst: inst, data: data}}
	v.run()
	v.crossCheck()
	if err := v.errs.Err(); err != nil {
		return nil, err
	}

	var spec schema.Design
	// Through the JSON the validator's walk wrote: CUE's own encoder would
	// list (and sort) every struct's fields a second time, and the
	// quantity types decode from their text either way.
	b, err := v.out.bytes()
	if err == nil {
		err = json.Unmarshal(b, &spec)
	}
	if err != nil {
		return nil, loadErrors(err)
	}
	fromCable(v, &spec)
	// Prices are the catalog's: so is their currency.
	if cur := catalogCurrency(ctx, inst); cur != "" {
		if spec.Currency == "" {
			spec.Currency = cur
		} else if spec.Currency != cur {
			p := cue.MakePath(cue.Str("currency"))
			return nil, ErrorList{{Pos: v.dataPos(p), Path: "currency", Msg: fmt.Sprintf("%q differs from the catalog's currency %q, which its prices are in; give %q, or catalog.currency", spec.Currency, cur, cur)}}
		}
	}
	rules, err := decodeDefaultRules(ec)
	if err != nil {
		return nil, err
	}
	errs := append(irradiationBounds(v, &spec), moduleEfficiency(v, &spec)...)
	errs = append(errs, rulebookErrors(v, spec.Rules)...)
	if len(errs) > 0 {
		return nil, errs.Err()
	}
	d := &Design{
		Dir:   dir,
		Root:  root,
		Files: files,
		Hash:  hash,
		Spec:  &spec,
		Rules: rules.Over(spec.Rules),
		pos:   entryPositions(&validator{root: unified, data: data, home: inst.Dir}, inst.Files),
		value: unified,
		inst:  inst,
		read:  l.read,
		home:  inst.Dir,
	}
	return d, nil
}

// irradiationBounds rejects a month's irradiation above the clear-sky
// value for the site: no month's mean can exceed a cloudless sky's.
func irradiationBounds(v *validator, s *schema.Design) ErrorList {
	var errs ErrorList
	for _, m := range schema.Names(s.Site.Irradiation.Monthly) {
		mi := -1
		for i, x := range energy.Months {
			if x == m {
				mi = i
			}
		}
		if mi < 0 {
			continue
		}
		h := s.Site.Irradiation.Monthly[m]
		bound := energy.ClearSkyBound(s.Site.Latitude, s.Site.Longitude, mi)
		if h.KWhPerM2Day() > bound {
			p := cue.MakePath(cue.Str("site"), cue.Str("irradiation"), cue.Str(m))
			errs.Add(v.dataPos(p), p.String(), "%q is more than a clear sky gives at latitude %g in %s (%.2f kWh/m²/day, Haurwitz model on the month's average day); check the data source %q",
				h.Text, s.Site.Latitude, m, bound, s.Site.Irradiation.Source)
		}
	}
	return errs
}

// Module efficiencies outside these bounds mean a datasheet misread: no
// marketed crystalline or thin-film module is below 5 % or above 25 %
// (common practice; the best cells in laboratories reach about 27 %).
const minEfficiency, maxEfficiency = 0.05, 0.25

// moduleEfficiency rejects a module whose STC power and area give an
// implausible efficiency, η = Pmax / (length × width × 1000 W/m²).
func moduleEfficiency(v *validator, s *schema.Design) ErrorList {
	var errs ErrorList
	for _, name := range schema.Names(s.Arrays) {
		m := s.Arrays[name].Module
		eff := energy.ModuleEfficiency(m)
		if eff < minEfficiency || eff > maxEfficiency {
			p := cue.MakePath(cue.Str("arrays"), cue.Str(name), cue.Str("module"), cue.Str("pmax"))
			errs.Add(v.dataPos(p), p.String(), "%s over %s × %s is %.1f %% efficient at STC; expected %g–%g %%: check the module's power and dimensions",
				m.Pmax.Text, m.LengthDim.Text, m.WidthDim.Text, eff*100, minEfficiency*100, maxEfficiency*100)
		}
	}
	return errs
}

// fromCable gives a run cut from a catalog cable the cable's insulation
// rating and material where the design leaves them to their defaults.
func fromCable(v *validator, s *schema.Design) {
	for _, name := range schema.Names(s.Wiring) {
		w := s.Wiring[name]
		if w.Cable == nil {
			continue
		}
		run := cue.MakePath(cue.Str("wiring"), cue.Str(name))
		if v.isDefault(appendPath(run, "insulation")) {
			w.Insulation = w.Cable.Insulation
		}
		if v.isDefault(appendPath(run, "material")) {
			w.Material = w.Cable.Material
		}
		s.Wiring[name] = w
	}
}
