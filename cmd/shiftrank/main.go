// Command shiftrank ranks the constitutional isomers of a molecular formula
// by how well their predicted 1H NMR spectra explain an observed peak list.
//
// Subcommands:
//
//	isomers  FORMULA            list (or count) the constitutional isomers
//	predict  SMILES             predict a 1H spectrum with its reasoning
//	rank     --formula --peaks  rank isomers against an observed peak list
//	bench    FILE               accuracy benchmark over a reference set
//	serve                       run the HTTP service and web page
//	apikey   create|list|revoke|rotate-secret  manage API keys (needs DATABASE_URL)
//
// Run "shiftrank help" or "shiftrank COMMAND --help" for the flags.
package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"os"
	"os/signal"
	"sort"
	"syscall"
)

// env bundles what a subcommand may touch of the outside world, so that
// tests can call run with their own.
type env struct {
	getenv func(string) string
	stdin  io.Reader
	stdout io.Writer
	stderr io.Writer
	// stderrTTY reports whether stderr is an interactive terminal (progress
	// lines are printed only then).
	stderrTTY bool
}

// command is one subcommand: it receives the arguments after its name.
type command struct {
	summary string
	run     func(ctx context.Context, args []string, e env) error
}

// commands lists the subcommands. Each lives in its own file.
func commands() map[string]command {
	return map[string]command{
		"isomers": {"list or count the constitutional isomers of a formula", runIsomers},
		"predict": {"predict the 1H spectrum of a SMILES, with its reasoning", runPredict},
		"rank":    {"rank the isomers of a formula against an observed 1H peak list", runRank},
		"bench":   {"accuracy benchmark of the ranking over a reference file", runBench},
		"serve":   {"run the HTTP service and web page", runServe},
		"apikey":  {"create, list, revoke API keys or rotate their callback secrets (needs DATABASE_URL)", runAPIKey},
	}
}

// usageError marks bad input or bad flags: the process exits with code 2.
type usageError struct{ err error }

func (u usageError) Error() string { return u.err.Error() }
func (u usageError) Unwrap() error { return u.err }

// badInput wraps err so that main exits with status 2.
func badInput(err error) error {
	if err == nil {
		return nil
	}
	return usageError{err}
}

// badInputf formats a bad-input error (exit status 2).
func badInputf(format string, args ...any) error {
	return usageError{fmt.Errorf(format, args...)}
}

func main() {
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt, syscall.SIGTERM)
	e := env{getenv: os.Getenv, stdin: os.Stdin, stdout: os.Stdout, stderr: os.Stderr, stderrTTY: isTerminal(os.Stderr)}
	err := run(ctx, os.Args[1:], e)
	stop()
	if err != nil {
		fmt.Fprintln(os.Stderr, "shiftrank:", err)
		var u usageError
		if errors.As(err, &u) {
			os.Exit(2)
		}
		os.Exit(1)
	}
}

// run dispatches to a subcommand. Tests call it directly.
func run(ctx context.Context, args []string, e env) error {
	cmds := commands()
	if len(args) == 0 {
		printHelp(e.stderr, cmds)
		return badInputf("no command given")
	}
	if args[0] == "help" || args[0] == "-h" || args[0] == "--help" {
		if len(args) > 1 && args[0] == "help" {
			if c, ok := cmds[args[1]]; ok {
				return humanizeError(c.run(ctx, []string{"--help"}, e))
			}
		}
		printHelp(e.stdout, cmds)
		return nil
	}
	c, ok := cmds[args[0]]
	if !ok {
		printHelp(e.stderr, cmds)
		return badInputf("unknown command %q", args[0])
	}
	return humanizeError(c.run(ctx, args[1:], e))
}

func printHelp(w io.Writer, cmds map[string]command) {
	fmt.Fprintln(w, "usage: shiftrank COMMAND [flags] [args]")
	fmt.Fprintln(w)
	names := make([]string, 0, len(cmds))
	for n := range cmds {
		names = append(names, n)
	}
	sort.Strings(names)
	for _, n := range names {
		fmt.Fprintf(w, "  %-8s %s\n", n, cmds[n].summary)
	}
	fmt.Fprintln(w)
	fmt.Fprintln(w, "Run 'shiftrank COMMAND --help' (or 'shiftrank help COMMAND') for a command's flags and examples.")
	fmt.Fprintln(w)
	fmt.Fprintln(w, "Examples:")
	fmt.Fprintln(w, "  shiftrank isomers C4H8O2 --count")
	fmt.Fprintln(w, "  shiftrank predict 'CCOC(C)=O'")
	fmt.Fprintln(w, "  shiftrank rank --formula C4H8O2 --peaks @NB-2291-07.txt")
	fmt.Fprintln(w, "  shiftrank serve --addr 127.0.0.1:8080")
}
