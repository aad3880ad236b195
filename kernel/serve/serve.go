package serve

import (
	"context"
	"crypto/rand"
	"encoding/hex"
	"fmt"
	"io"
	"net"
	"net/http"
	"os"
	"path/filepath"
	"strconv"
	"time"

	"github.com/beamnote/beamnote/kernel/layout"
)

// Options configures the notebook server.
type Options struct {
	IP          string // address to bind; default 127.0.0.1
	Port        int    // default 8888
	Token       string // default: 24 random bytes, hex encoded
	AllowRemote bool   // required to bind an address other than loopback
	User        bool   // the kernelspec was installed for the user
	Dir         string // directory served; default <checkout>/notebooks
}

// Command validates opt and returns the jupyter command line that serves the
// notebooks of the checkout l with the beamnote kernel, its environment, and
// the URL to open. The server never binds a non-loopback
// address unless AllowRemote is set, and never runs without a token. The
// token is in the environment (JUPYTER_TOKEN, read by Notebook 6.4 and 7),
// never on the command line, which every local user can read in the process
// list.
func Command(l layout.Layout, opt Options) (argv []string, env map[string]string, url string, err error) {
	if opt.IP == "" {
		opt.IP = "127.0.0.1"
	}
	if opt.Port == 0 {
		opt.Port = 8888
	}
	if opt.Port < 1 || opt.Port > 65535 {
		return nil, nil, "", fmt.Errorf("serve: notebook port %d: must be 1–65535", opt.Port)
	}
	ip := net.ParseIP(opt.IP)
	if ip == nil {
		return nil, nil, "", fmt.Errorf("serve: notebook address %q: not an IP address", opt.IP)
	}
	if !ip.IsLoopback() && !opt.AllowRemote {
		return nil, nil, "", fmt.Errorf("serve: notebook address %s is not loopback; other machines could reach the kernel, "+
			"which runs any code. Set BEAMNOTE_ALLOW_REMOTE=1 to bind it anyway", opt.IP)
	}
	if opt.Token == "" {
		b := make([]byte, 24)
		if _, err := rand.Read(b); err != nil {
			return nil, nil, "", fmt.Errorf("serve: making a notebook token: %w", err)
		}
		opt.Token = hex.EncodeToString(b)
	}
	if opt.Dir == "" {
		opt.Dir = filepath.Join(l.Root, "notebooks")
	}
	jup := layout.Jupyter()
	if jup == "" {
		return nil, nil, "", fmt.Errorf("serve: jupyter not found; run `make notebook` (Debian/Ubuntu) or install Jupyter Notebook 6 and nbconvert")
	}
	argv = []string{jup, "notebook",
		"--no-browser",
		"--ip=" + opt.IP,
		"--port=" + strconv.Itoa(opt.Port),
		"--port-retries=0",
		"--notebook-dir=" + opt.Dir,
		"--MultiKernelManager.default_kernel_name=" + layout.KernelName,
	}
	if os.Geteuid() == 0 {
		// Jupyter refuses to run as root without this flag; containers and
		// fresh lab machines often are root. The token and loopback rules
		// above still apply.
		argv = append(argv, "--allow-root")
	}
	host := opt.IP
	if ip.To4() == nil {
		host = "[" + host + "]"
	}
	url = fmt.Sprintf("http://%s:%d/tree?token=%s", host, opt.Port, opt.Token)
	env = l.JupyterEnv(opt.User)
	env["JUPYTER_TOKEN"] = opt.Token
	return argv, env, url, nil
}

// WaitServing polls url until the server there answers HTTP (with any
// status) and returns nil, or returns an error with the last failure once
// ctx is done.
func WaitServing(ctx context.Context, url string) error {
	client := &http.Client{Timeout: 2 * time.Second}
	for {
		req, err := http.NewRequestWithContext(ctx, http.MethodGet, url, nil)
		if err != nil {
			return fmt.Errorf("serve: %w", err)
		}
		resp, err := client.Do(req)
		if err == nil {
			resp.Body.Close()
			return nil
		}
		select {
		case <-ctx.Done():
			return fmt.Errorf("serve: the notebook server did not answer: %w", err)
		case <-time.After(200 * time.Millisecond):
		}
	}
}

// SignNotebooks marks the committed notebooks in notebooks/ of the checkout
// l as trusted in the Jupyter data directory that the server uses, so that
// their stored figures show (Jupyter hides rich output of untrusted
// notebooks).
func SignNotebooks(l layout.Layout, user bool) error {
	py := layout.Python()
	if py == "" {
		return fmt.Errorf("no python3 to sign notebooks with")
	}
	nbs, _ := filepath.Glob(filepath.Join(l.Root, "notebooks", "*.ipynb"))
	for _, nb := range nbs {
		if err := layout.Run(io.Discard, l.Root, l.JupyterEnv(user), py, "-m", "nbformat.sign", nb); err != nil {
			return err
		}
	}
	return nil
}
