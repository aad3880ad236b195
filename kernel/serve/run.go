package serve

import (
	"context"
	"fmt"
	"io"
	"os"
	"os/exec"
	"os/signal"
	"syscall"
	"time"

	"github.com/beamnote/beamnote/kernel/layout"
)

// serveTimeout is how long [Run] waits for the notebook server to answer
// before it prints the URL with a warning.
const serveTimeout = 60 * time.Second

// Run runs the notebook server argv (from [Command]) with environment env
// until it exits, and writes the URL to out once the server answers HTTP
// there ([WaitServing]). It forwards SIGTERM and SIGHUP to the server;
// SIGINT from the terminal reaches the server by itself (same process
// group), which then asks to confirm.
func Run(argv []string, env map[string]string, url string, out io.Writer) error {
	sigs := make(chan os.Signal, 1)
	signal.Notify(sigs, os.Interrupt, syscall.SIGTERM, syscall.SIGHUP)
	defer signal.Stop(sigs)
	cmd := exec.Command(argv[0], argv[1:]...)
	cmd.Env = layout.Environ(env)
	cmd.Stdin, cmd.Stdout, cmd.Stderr = os.Stdin, os.Stdout, os.Stderr
	if err := cmd.Start(); err != nil {
		return fmt.Errorf("starting %s: %w", argv[0], err)
	}
	exited := make(chan error, 1)
	go func() { exited <- cmd.Wait() }()
	ctx, cancel := context.WithTimeout(context.Background(), serveTimeout)
	defer cancel()
	ready := make(chan error, 1)
	go func() { ready <- WaitServing(ctx, url) }()
	for {
		select {
		case err := <-ready:
			ready = nil
			if err != nil {
				fmt.Fprintf(out, "beamnote: warning: no answer within %v, the server may still be starting: %v\n", serveTimeout, err)
			}
			fmt.Fprintf(out, "\nbeamnote: open %s\n\n", url)
		case sig := <-sigs:
			if sig != os.Interrupt {
				cmd.Process.Signal(sig)
			}
		case err := <-exited:
			if err != nil {
				return fmt.Errorf("%s: %w", argv[0], err)
			}
			return nil
		}
	}
}
