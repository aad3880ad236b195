// Command beamnote-kernel installs, checks and serves the beamnote Jupyter
// kernel (gonb at the version pinned in go.mod, with the checkout importable
// from cells).
//
// Usage:
//
//	beamnote-kernel install [-user] [-nowarm]   build tools, write the kernelspec, warm the cache
//	beamnote-kernel warm                        warm the Go build cache only
//	beamnote-kernel doctor [-user]              list what is missing, with the fix for each
//	beamnote-kernel serve [-user] [-ip A] [-port P]
//	                                            start Jupyter Notebook on notebooks/ with a token
//	beamnote-kernel test [-user] [-out DIR] NB.ipynb...
//	                                            execute notebooks headless and check their outputs
//
// Run it from anywhere inside the checkout, usually through the Makefile.
package main

import (
	"flag"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"strconv"
	"syscall"

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
		fmt.Printf("\nbeamnote: serving %s\nbeamnote: open %s\n\n", filepath.Join(l.Root, "notebooks"), url)
		if err := syscall.Exec(argv[0], argv, setup.Environ(env)); err != nil {
			fail(fmt.Errorf("starting %s: %w", argv[0], err))
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
	if ee, ok := err.(*exec.ExitError); ok {
		os.Exit(ee.ExitCode())
	}
	os.Exit(1)
}
