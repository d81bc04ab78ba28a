package compiler

import (
	"encoding/json"
	"fmt"
	"runtime"
	"sync"

	"cuelang.org/go/cue"
	"cuelang.org/go/cue/cuecontext"

	"github.com/ampwright/ampwright/schema"
)

// An evalContext is a CUE context with the embedded schema built in it,
// lent to one compilation at a time. Building the schema is a twentieth
// of a hull's compilation; a process that compiles hull after hull (a
// fleet's or a diff's worker) reuses a context for a few hulls and then
// drops it, since a context keeps every instance built in it and would
// otherwise grow with the yard.
type evalContext struct {
	ctx    *cue.Context
	schema cue.Value // the embedded schema
	design cue.Value // its #Design
	uses   int
	weight int // bytes of input evaluated
}

// A context is dropped once the designs it evaluated add up to
// contextWeight bytes of input (what it keeps grows with them), or after
// contextUses designs: enough to pay for the schema's build many times
// over, little enough that what it keeps stays within a worker's memory
// target (four hulls of a yard like cmd/yardgen's, with the catalog and
// rulebook each imports, the vendored schema counted too).
const (
	contextWeight = 512 << 10
	contextUses   = 64
)

// contexts are the contexts released and not yet used up, at most one a
// core.
var contexts struct {
	sync.Mutex
	free []*evalContext
}

// takeContext lends a context for one compilation: a released one if
// there is one, else a new one.
func takeContext() (*evalContext, error) {
	contexts.Lock()
	if n := len(contexts.free); n > 0 {
		ec := contexts.free[n-1]
		contexts.free = contexts.free[:n-1]
		contexts.Unlock()
		return ec, nil
	}
	contexts.Unlock()
	ctx := cuecontext.New()
	sch, err := schema.Build(ctx)
	if err != nil {
		return nil, fmt.Errorf("internal error: the embedded schema does not compile: %v", err)
	}
	return &evalContext{ctx: ctx, schema: sch, design: sch.LookupPath(schema.DesignPath)}, nil
}

// release gives a context back once nothing evaluates in it any more.
func (ec *evalContext) release() {
	if ec == nil {
		return
	}
	ec.uses++
	if ec.uses >= contextUses || ec.weight >= contextWeight {
		return
	}
	contexts.Lock()
	defer contexts.Unlock()
	if len(contexts.free) < runtime.GOMAXPROCS(0) {
		contexts.free = append(contexts.free, ec)
	}
}

// Release tells the compiler that nothing will use the design's CUE value
// any more (Inputs, Entry, WrittenInHull), so that the context it was
// evaluated in can evaluate the next hull. A caller that compiles many
// hulls in one process calls it when done with each; the decoded design,
// its model and its result stay valid. Without it, each hull gets a new
// context.
func (d *Design) Release() {
	if d == nil {
		return
	}
	ec := d.ec
	d.ec, d.value = nil, cue.Value{}
	ec.release()
}

// defaultRulebook is the schema's default rulebook as JSON, encoded once a
// process and decoded afresh for each design (a design's rulebook is the
// default with its own tables over it, and must not share maps with
// another's).
var defaultRulebook struct {
	once sync.Once
	json []byte
	err  error
}

// decodeDefaultRules decodes the default rulebook, encoding it first in
// ec (which the caller holds) if no design has yet.
func decodeDefaultRules(ec *evalContext) (schema.Rulebook, error) {
	defaultRulebook.once.Do(func() {
		defaultRulebook.json, defaultRulebook.err = ec.schema.LookupPath(schema.DefaultPath).MarshalJSON()
	})
	var r schema.Rulebook
	if defaultRulebook.err != nil {
		return r, fmt.Errorf("internal error: the default rulebook does not encode: %v", defaultRulebook.err)
	}
	if err := json.Unmarshal(defaultRulebook.json, &r); err != nil {
		return r, fmt.Errorf("internal error: the default rulebook does not decode: %v", err)
	}
	return r, nil
}
