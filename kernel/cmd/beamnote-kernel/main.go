// Command beamnote-kernel installs, checks and serves the beamnote Jupyter
// kernel (gonb at the version pinned in go.mod, with the checkout importable
// from cells).
//
// Usage:
//
//	beamnote-kernel install [-user] [-nowarm]   build gonb, goimports, gopls, write the kernelspec, warm the cache
//	beamnote-kernel warm                        warm the Go build cache only
//	beamnote-kernel doctor [-user]              list what is missing, with the fix for each
//	beamnote-kernel serve [-user] [-ip A] [-port P]
//	                                            start Jupyter Notebook on notebooks/ with a token
//	beamnote-kernel test [-user] [-out DIR] NB.ipynb...
//	                                            execute notebooks headless and check their outputs:
//	                                            fails on a cell that does not compile, crashes,
//	                                            exits nonzero or prints a line starting "error:",
//	                                            and on a missing figure
//
// Run it from anywhere inside the checkout, usually through the Makefile.
package main

import (
	"context"
	"errors"
	"flag"
	"fmt"
	"io"
	"os"
	"os/exec"
	"os/signal"
	"path/filepath"
	"strconv"
	"syscall"
	"time"

	"github.com/beamnote/beamnote/kernel/setup"
)

func main() {
	if len(os.Args) < 2 {
		usage()
	}
	l, err := setup.FindLayout(".")
	if err != nil {
		fail(err)
	}
	cmd, args := os.Args[1], os.Args[2:]
	fs := flag.NewFlagSet(cmd, flag.ExitOnError)
	user := fs.Bool("user", os.Getenv("KERNEL_SCOPE") == "user", "use the per-user Jupyter data dir instead of the project-local one")
	switch cmd {
	case "install":
		nowarm := fs.Bool("nowarm", false, "do not warm the build cache")
		fs.Parse(args)
		kdir, err := setup.Install(l, setup.InstallOptions{User: *user, SkipWarm: *nowarm}, os.Stderr)
		if err != nil {
			fail(err)
		}
		fmt.Println(kdir)
	case "warm":
		fs.Parse(args)
		if err := setup.Warm(l, os.Stderr); err != nil {
			fail(err)
		}
	case "doctor":
		fs.Parse(args)
		if !setup.WriteReport(os.Stdout, setup.Doctor(l, *user)) {
			os.Exit(1)
		}
	case "serve":
		ip := fs.String("ip", envOr("NOTEBOOK_IP", "127.0.0.1"), "address to bind (loopback unless BEAMNOTE_ALLOW_REMOTE=1)")
		port := fs.Int("port", envInt("NOTEBOOK_PORT", 8888), "port")
		fs.Parse(args)
		argv, env, url, err := l.ServeCommand(setup.ServeOptions{
			IP: *ip, Port: *port, Token: os.Getenv("BEAMNOTE_TOKEN"),
			AllowRemote: os.Getenv("BEAMNOTE_ALLOW_REMOTE") == "1", User: *user,
		})
		if err != nil {
			fail(err)
		}
		if err := l.CheckKernelspec(*user); err != nil {
			fmt.Fprintf(os.Stderr, "beamnote: warning: %v\nbeamnote: run `make kernel` (or `beamnote-kernel install`) first; `make doctor` lists what else is missing\n", err)
		}
		if err := l.SignNotebooks(*user); err != nil {
			fmt.Fprintln(os.Stderr, "beamnote: warning:", err)
		}
		fmt.Printf("\nbeamnote: serving %s\n", filepath.Join(l.Root, "notebooks"))
		if err := serve(argv, env, url, os.Stdout); err != nil {
			fail(err)
		}
	case "test":
		out := fs.String("out", filepath.Join(l.Root, "build", "notebooks"), "directory for executed notebooks and HTML exports")
		fs.Parse(args)
		if err := l.ExecuteNotebooks(fs.Args(), *out, *user, os.Stderr); err != nil {
			fail(err)
		}
		fmt.Fprintf(os.Stderr, "beamnote: %d notebook(s) executed and checked; results in %s\n", len(fs.Args()), *out)
	default:
		usage()
	}
}

// serveTimeout is how long serve waits for the notebook server to answer
// before it prints the URL with a warning.
const serveTimeout = 60 * time.Second

// serve runs the notebook server argv with environment env until it exits,
// and writes the URL to out once the server answers HTTP there. It forwards
// SIGTERM and SIGHUP to the server; SIGINT from the terminal reaches the
// server by itself (same process group), which then asks to confirm.
func serve(argv []string, env map[string]string, url string, out io.Writer) error {
	sigs := make(chan os.Signal, 1)
	signal.Notify(sigs, os.Interrupt, syscall.SIGTERM, syscall.SIGHUP)
	defer signal.Stop(sigs)
	cmd := exec.Command(argv[0], argv[1:]...)
	cmd.Env = setup.Environ(env)
	cmd.Stdin, cmd.Stdout, cmd.Stderr = os.Stdin, os.Stdout, os.Stderr
	if err := cmd.Start(); err != nil {
		return fmt.Errorf("starting %s: %w", argv[0], err)
	}
	exited := make(chan error, 1)
	go func() { exited <- cmd.Wait() }()
	ctx, cancel := context.WithTimeout(context.Background(), serveTimeout)
	defer cancel()
	ready := make(chan error, 1)
	go func() { ready <- setup.WaitServing(ctx, url) }()
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

func envOr(name, def string) string {
	if v := os.Getenv(name); v != "" {
		return v
	}
	return def
}

func envInt(name string, def int) int {
	if v := os.Getenv(name); v != "" {
		n, err := strconv.Atoi(v)
		if err != nil {
			fail(fmt.Errorf("%s=%q: not an integer", name, v))
		}
		return n
	}
	return def
}

func usage() {
	fmt.Fprintln(os.Stderr, "usage: beamnote-kernel install|warm|doctor|serve|test [flags]")
	os.Exit(2)
}

func fail(err error) {
	fmt.Fprintln(os.Stderr, "beamnote-kernel:", err)
	os.Exit(exitCode(err))
}

// exitCode is the status to exit with after err: the exit code of the
// command whose *exec.ExitError err wraps (128+n if a signal n killed it, as
// shells report it), else 1.
func exitCode(err error) int {
	var ee *exec.ExitError
	if !errors.As(err, &ee) {
		return 1
	}
	if ws, ok := ee.Sys().(syscall.WaitStatus); ok && ws.Signaled() {
		return 128 + int(ws.Signal())
	}
	if c := ee.ExitCode(); c > 0 {
		return c
	}
	return 1
}
