package yard

import (
	"bufio"
	"bytes"
	"fmt"
	"io"
	"os"
	"os/exec"
	"strconv"
	"strings"
)

// hardened are the settings every git command runs with, whatever the
// repository's own configuration says: a pull request can carry a
// configuration that runs a command (an fsmonitor, a pager), and ampwright
// runs on such pull requests. The system and global configuration are not
// read at all (see gitEnv).
var hardened = []string{
	"-c", "core.fsmonitor=false",
	"-c", "core.hooksPath=/dev/null",
	"-c", "core.pager=cat",
	"-c", "core.untrackedCache=false",
	"-c", "log.showSignature=false",
	"-c", "protocol.allow=never",
	"--no-pager",
}

// gitEnv is the environment git runs in: the caller's, with every GIT_
// variable but the ones below removed, no system or global configuration,
// no prompt and no optional locks (ampwright only reads).
func gitEnv() []string {
	var env []string
	for _, kv := range os.Environ() {
		if strings.HasPrefix(kv, "GIT_") {
			continue
		}
		env = append(env, kv)
	}
	return append(env,
		"GIT_CONFIG_NOSYSTEM=1",
		"GIT_CONFIG_GLOBAL=/dev/null",
		"GIT_ATTR_NOSYSTEM=1",
		"GIT_TERMINAL_PROMPT=0",
		"GIT_OPTIONAL_LOCKS=0",
		"GIT_PAGER=cat",
		"PAGER=cat",
	)
}

// git runs git in dir with an argument list, never through a shell, with
// the hardened settings.
func git(dir string, stdin io.Reader, args ...string) ([]byte, error) {
	full := append(append([]string{"-C", dir}, hardened...), args...)
	cmd := exec.Command("git", full...)
	cmd.Env = gitEnv()
	cmd.Stdin = stdin
	var stderr bytes.Buffer
	cmd.Stderr = &stderr
	out, err := cmd.Output()
	if err != nil {
		msg := strings.TrimSpace(stderr.String())
		if msg == "" {
			msg = err.Error()
		}
		return nil, fmt.Errorf("git %s: %s", strings.Join(args, " "), msg)
	}
	return out, nil
}

// commitTime is a commit's committer time, Unix seconds, read from the
// commit object itself: `git log` would verify a signature with the
// configured gpg.program when the repository asks it to.
func commitTime(dir, commit string) int64 {
	out, err := git(dir, nil, "cat-file", "commit", commit)
	if err != nil {
		return 0
	}
	for _, line := range strings.Split(string(out), "\n") {
		if line == "" {
			break // the end of the headers
		}
		if rest, ok := strings.CutPrefix(line, "committer "); ok {
			f := strings.Fields(rest)
			if len(f) >= 2 {
				t, _ := strconv.ParseInt(f[len(f)-2], 10, 64)
				return t
			}
		}
	}
	return 0
}

// gitProcess is a git command that runs while it is given input, such as
// `git cat-file --batch`, started with the same hardening as git.
type gitProcess struct {
	cmd    *exec.Cmd
	stdin  io.WriteCloser
	stdout *bufio.Reader
	stderr bytes.Buffer
}

func startGit(dir string, args ...string) (*gitProcess, error) {
	full := append(append([]string{"-C", dir}, hardened...), args...)
	p := &gitProcess{cmd: exec.Command("git", full...)}
	p.cmd.Env = gitEnv()
	p.cmd.Stderr = &p.stderr
	in, err := p.cmd.StdinPipe()
	if err != nil {
		return nil, err
	}
	out, err := p.cmd.StdoutPipe()
	if err != nil {
		return nil, err
	}
	if err := p.cmd.Start(); err != nil {
		return nil, fmt.Errorf("git %s: %v", strings.Join(args, " "), err)
	}
	p.stdin, p.stdout = in, bufio.NewReader(out)
	return p, nil
}

// close ends the process's input and waits for it.
func (p *gitProcess) close() {
	p.stdin.Close()
	p.cmd.Wait()
}
