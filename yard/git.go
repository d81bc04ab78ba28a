package yard

import (
	"bytes"
	"fmt"
	"io"
	"os"
	"os/exec"
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
