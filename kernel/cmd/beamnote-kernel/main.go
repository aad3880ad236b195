// Command beamnote-kernel installs, checks and serves the beamnote Jupyter
// kernel (gonb at the version pinned in go.mod, with the checkout importable
// from cells), and re-runs notebooks as design records.
//
// Usage:
//
//	beamnote-kernel install [-user] [-nowarm]   build gonb, goimports, gopls, write the kernelspec, warm the cache
//	beamnote-kernel warm                        warm the Go build cache only
//	beamnote-kernel doctor [-user]              list what is missing, with the fix for each
//	beamnote-kernel serve [-user] [-ip A] [-port P]
//	                                            start Jupyter Notebook on notebooks/ with a token
//	beamnote-kernel run [-user] [-out DIR] [-timeout D] [-inplace] [-twice] [-require-figure] FOLDER|NB.ipynb...
//	                                            re-run notebooks headless: check every cell, collect
//	                                            the design targets, write the executed notebooks, HTML
//	                                            exports and a summary page to DIR, keep the record
//	                                            beside each notebook and list what moved; exits 1
//	                                            naming every missed target and failed cell
//	beamnote-kernel diff OLD NEW                compare two records (or the records beside two notebooks)
//
// Run it from anywhere inside the checkout, usually through the Makefile.
package main

import (
	"errors"
	"flag"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"strconv"
	"strings"
	"syscall"

	"github.com/beamnote/beamnote/kernel/install"
	"github.com/beamnote/beamnote/kernel/layout"
	"github.com/beamnote/beamnote/kernel/record"
	"github.com/beamnote/beamnote/kernel/run"
	"github.com/beamnote/beamnote/kernel/serve"
	"github.com/beamnote/beamnote/opticslib/target"
)

func main() {
	if len(os.Args) < 2 {
		usage()
	}
	l, err := layout.FindLayout(".")
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
		kdir, err := install.Install(l, install.Options{User: *user, SkipWarm: *nowarm}, os.Stderr)
		if err != nil {
			fail(err)
		}
		fmt.Println(kdir)
	case "warm":
		fs.Parse(args)
		if err := install.Warm(l, os.Stderr); err != nil {
			fail(err)
		}
	case "doctor":
		fs.Parse(args)
		if !install.WriteReport(os.Stdout, install.Doctor(l, *user)) {
			os.Exit(1)
		}
	case "serve":
		ip := fs.String("ip", envOr("NOTEBOOK_IP", "127.0.0.1"), "address to bind (loopback unless BEAMNOTE_ALLOW_REMOTE=1)")
		port := fs.Int("port", envInt("NOTEBOOK_PORT", 8888), "port")
		fs.Parse(args)
		argv, env, url, err := serve.Command(l, serve.Options{
			IP: *ip, Port: *port, Token: os.Getenv("BEAMNOTE_TOKEN"),
			AllowRemote: os.Getenv("BEAMNOTE_ALLOW_REMOTE") == "1", User: *user,
		})
		if err != nil {
			fail(err)
		}
		if err := install.CheckKernelspec(l, *user); err != nil {
			fmt.Fprintf(os.Stderr, "beamnote: warning: %v\nbeamnote: run `make kernel` (or `beamnote-kernel install`) first; `make doctor` lists what else is missing\n", err)
		}
		if err := serve.SignNotebooks(l, *user); err != nil {
			fmt.Fprintln(os.Stderr, "beamnote: warning:", err)
		}
		fmt.Printf("\nbeamnote: serving %s\n", filepath.Join(l.Root, "notebooks"))
		if err := serve.Run(argv, env, url, os.Stdout); err != nil {
			fail(err)
		}
	case "run":
		out := fs.String("out", filepath.Join(l.Root, "build", "rerun"), "folder for the executed notebooks, HTML exports and the summary page")
		timeout := fs.Duration("timeout", run.DefaultCellTimeout, "how long one cell may run")
		inplace := fs.Bool("inplace", false, "also write each executed notebook over its file")
		twice := fs.Bool("twice", false, "run every notebook twice and fail it if a target or a figure differs")
		figure := fs.Bool("require-figure", false, "fail a notebook that shows no figure")
		fs.Parse(args)
		rs, err := run.Rerun(l, fs.Args(), run.Options{Out: *out, CellTimeout: *timeout, InPlace: *inplace, User: *user,
			Twice: *twice, RequireFigure: *figure, Log: os.Stderr})
		if err != nil {
			fail(err)
		}
		for _, r := range rs {
			if r.Failed() {
				os.Exit(1)
			}
		}
	case "diff":
		fs.Parse(args)
		if fs.NArg() != 2 {
			fail(errors.New("diff needs two records (or notebooks): OLD NEW"))
		}
		var recs [2]target.Record
		for i, p := range fs.Args() {
			if strings.HasSuffix(p, ".ipynb") {
				p = record.PathFor(p)
			}
			if recs[i], err = record.Read(p); err != nil {
				fail(err)
			}
		}
		changes := target.Compare(recs[0], recs[1])
		fmt.Printf("beamnote: %s (%s)\n       → %s (%s)\n", fs.Arg(0), recs[0].Producer, fs.Arg(1), recs[1].Producer)
		for _, c := range changes {
			fmt.Println("  " + c.String())
		}
		if len(changes) == 0 {
			fmt.Println("  no target moved beyond its tolerance")
		}
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
	fmt.Fprintln(os.Stderr, "usage: beamnote-kernel install|warm|doctor|serve|run|diff [flags]")
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
