package worker

import (
	"bufio"
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"os"
	"os/exec"
	"strings"
	"sync"
	"sync/atomic"
	"time"

	"github.com/ampwright/ampwright/compiler"
	"github.com/ampwright/ampwright/result"
	"github.com/ampwright/ampwright/yard"
)

// Pool runs compiles in worker processes, at most n at once, each worker
// reused for one hull after another. Its Run is a yard.Runner.
type Pool struct {
	exe  string
	args []string
	lim  compiler.Limits
	slot chan struct{} // one per worker allowed to be busy
	mu   sync.Mutex
	idle []*proc
	id   atomic.Uint64
}

// NewPool returns a pool of at most n workers, each the executable exe run
// with args (such as "worker --timeout 60s --max-memory 512MiB"), bounded
// by lim. Workers start when first needed.
func NewPool(n int, exe string, args []string, lim compiler.Limits) *Pool {
	return &Pool{exe: exe, args: args, lim: lim, slot: make(chan struct{}, max(n, 1))}
}

// Close ends the workers, once every Run has returned, and waits for
// them: no worker outlives the command.
func (p *Pool) Close() {
	p.mu.Lock()
	idle := p.idle
	p.idle = nil
	p.mu.Unlock()
	for _, w := range idle {
		w.stdin.Close()
	}
	for _, w := range idle {
		go w.drain()
		select {
		case <-w.exited:
		case <-time.After(5 * time.Second):
			w.kill()
		}
	}
}

// Run compiles a hull of a side in a worker. A hull that passes a bound,
// or whose worker fails, comes back with a problem saying so, and its
// worker is replaced.
func (p *Pool) Run(s yard.Side, hull string, want yard.Want) yard.Compiled {
	req := Request{ID: p.id.Add(1), Dir: s.Dir, Hull: hull, Want: want}
	if s.Rev != nil {
		req.Dir, req.Rev = s.Rev.Dir, s.Rev.Commit
	}
	p.slot <- struct{}{}
	defer func() { <-p.slot }()
	w, err := p.get()
	if err != nil {
		return yard.Compiled{Problems: problems(fmt.Errorf("cannot start a worker process: %v", err))}
	}
	ans, err := w.do(req, p.lim.Timeout)
	if err != nil {
		w.kill()
		return yard.Compiled{Problems: problems(err)}
	}
	p.put(w)
	return ans.Compiled
}

func (p *Pool) get() (*proc, error) {
	p.mu.Lock()
	if n := len(p.idle); n > 0 {
		w := p.idle[n-1]
		p.idle = p.idle[:n-1]
		p.mu.Unlock()
		return w, nil
	}
	p.mu.Unlock()
	return start(p.exe, p.args, p.lim)
}

func (p *Pool) put(w *proc) {
	p.mu.Lock()
	defer p.mu.Unlock()
	p.idle = append(p.idle, w)
}

// proc is one worker process.
type proc struct {
	cmd     *exec.Cmd
	stdin   io.WriteCloser
	answers chan Answer // closed when the worker's output ends
	exited  chan struct{}
	err     error // how the process ended, once exited is closed
	stderr  *tail
	lim     compiler.Limits
}

func start(exe string, args []string, lim compiler.Limits) (*proc, error) {
	cmd := &exec.Cmd{Path: exe, Args: append([]string{"ampwright"}, args...)}
	cmd.Env = os.Environ()
	processGroup(cmd)
	stdin, err := cmd.StdinPipe()
	if err != nil {
		return nil, err
	}
	stdout, err := cmd.StdoutPipe()
	if err != nil {
		return nil, err
	}
	w := &proc{cmd: cmd, stdin: stdin, answers: make(chan Answer, 1), exited: make(chan struct{}), stderr: &tail{}, lim: lim}
	// A worker's own messages (a crash's stack) are kept for what they
	// say about memory, and not shown.
	cmd.Stderr = w.stderr
	if err := cmd.Start(); err != nil {
		return nil, err
	}
	go func() {
		dec := json.NewDecoder(bufio.NewReader(stdout))
		for {
			var a Answer
			if err := dec.Decode(&a); err != nil {
				break
			}
			w.answers <- a
		}
		close(w.answers)
		w.err = cmd.Wait()
		close(w.exited)
	}()
	return w, nil
}

// do sends a request and waits for its answer, at most timeout.
func (w *proc) do(req Request, timeout time.Duration) (Answer, error) {
	b, err := json.Marshal(req)
	if err != nil {
		return Answer{}, err
	}
	if _, err := w.stdin.Write(append(b, '\n')); err != nil {
		return Answer{}, w.ended()
	}
	var expire <-chan time.Time
	if timeout > 0 {
		t := time.NewTimer(timeout)
		defer t.Stop()
		expire = t.C
	}
	for {
		select {
		case a, ok := <-w.answers:
			if !ok {
				return Answer{}, w.ended()
			}
			if a.ID != req.ID {
				continue // an answer to a request abandoned earlier
			}
			return a, nil
		case <-expire:
			return Answer{}, errors.New(Message(TimeBound, w.lim.Timeout, w.lim.MaxMemory))
		}
	}
}

// ended says why a worker stopped answering.
func (w *proc) ended() error {
	go w.drain()
	select {
	case <-w.exited:
	case <-time.After(10 * time.Second):
		w.kill()
	}
	var ee *exec.ExitError
	switch {
	case errors.As(w.err, &ee) && ee.ExitCode() == ExitMemory,
		strings.Contains(w.stderr.String(), "out of memory"):
		return errors.New(Message(MemoryBound, w.lim.Timeout, w.lim.MaxMemory))
	case errors.As(w.err, &ee) && ee.ExitCode() == ExitTime:
		return errors.New(Message(TimeBound, w.lim.Timeout, w.lim.MaxMemory))
	case w.err != nil:
		return fmt.Errorf("stopped: the process compiling it ended unexpectedly (%v); please report it with the design", w.err)
	}
	return errors.New("stopped: the process compiling it ended before it answered; please report it with the design")
}

// kill ends the worker and whatever it started (git), and waits for it.
// A worker already reaped is not signalled: its process group's number
// may be another's by then.
func (w *proc) kill() {
	select {
	case <-w.exited:
	default:
		killGroup(w.cmd)
	}
	w.stdin.Close()
	go w.drain()
	<-w.exited
}

// drain reads answers no one waits for any more, so that the reader of
// the worker's output can reach its end.
func (w *proc) drain() {
	for range w.answers {
	}
}

func problems(err error) []result.Problem {
	return []result.Problem{{Message: err.Error()}}
}

// tail keeps the last few kilobytes written to it.
type tail struct {
	mu  sync.Mutex
	buf bytes.Buffer
}

const tailSize = 4 << 10

func (t *tail) Write(b []byte) (int, error) {
	t.mu.Lock()
	defer t.mu.Unlock()
	t.buf.Write(b)
	if over := t.buf.Len() - tailSize; over > 0 {
		t.buf.Next(over)
	}
	return len(b), nil
}

func (t *tail) String() string {
	t.mu.Lock()
	defer t.mu.Unlock()
	return t.buf.String()
}
