package main

import (
	"errors"
	"flag"
	"fmt"
	"io"
	"os"
	"runtime/debug"
	"sort"
	"strings"

	// Every format the CLI reads and writes: Parquet and .xlsx register
	// themselves.
	_ "github.com/proofsheet/proofsheet/fixtures/parquet"
	_ "github.com/proofsheet/proofsheet/fixtures/xlsx"
)

// Exit statuses, as POSIX diff uses them.
const (
	exitSame    = 0
	exitDiffers = 1
	exitTrouble = 2
)

// env is what a command may touch: its streams, the environment and the
// working directory. Tests run commands with their own env.
type env struct {
	stdin  io.Reader
	stdout io.Writer
	stderr io.Writer
	getenv func(string) string
}

// command is one subcommand.
type command struct {
	name    string
	summary string // one line for the command list
	usage   string // full --help text: synopsis, description, example
	run     func(e *env, args []string) int
}

// commands returns the subcommands by name.
func commands() map[string]*command {
	cs := []*command{profileCommand()}
	cs = append(cs, moreCommands()...)
	m := make(map[string]*command, len(cs))
	for _, c := range cs {
		m[c.name] = c
	}
	return m
}

func main() {
	e := &env{stdin: os.Stdin, stdout: os.Stdout, stderr: os.Stderr, getenv: os.Getenv}
	os.Exit(run(e, os.Args[1:]))
}

// run dispatches to a subcommand and returns the exit status.
func run(e *env, args []string) int {
	cmds := commands()
	if len(args) == 0 {
		usage(e.stderr, cmds)
		return exitTrouble
	}
	name := args[0]
	switch name {
	case "version", "-version", "--version":
		fmt.Fprint(e.stdout, versionText(debug.ReadBuildInfo()))
		return exitSame
	case "help", "-h", "-help", "--help":
		if len(args) > 1 {
			if c, ok := cmds[args[1]]; ok {
				fmt.Fprint(e.stdout, c.usage)
				return exitSame
			}
			fmt.Fprintf(e.stderr, "proofsheet: unknown command %q\n", args[1])
			return exitTrouble
		}
		usage(e.stdout, cmds)
		return exitSame
	}
	c, ok := cmds[name]
	if !ok && name == "review" {
		fmt.Fprintf(e.stderr, "proofsheet: the review command is now called changes, with the same options: proofsheet changes --help\n")
		return exitTrouble
	}
	if !ok {
		fmt.Fprintf(e.stderr, "proofsheet: unknown command %q\n\n", name)
		usage(e.stderr, cmds)
		return exitTrouble
	}
	return c.run(e, args[1:])
}

func usage(w io.Writer, cmds map[string]*command) {
	fmt.Fprint(w, "proofsheet tests data transformations: compare tables, keep golden files,\nprofile raw files, generate messy ones.\n\nUsage: proofsheet COMMAND [options] [arguments]\n\nCommands:\n")
	names := make([]string, 0, len(cmds))
	for n := range cmds {
		names = append(names, n)
	}
	sort.Strings(names)
	for _, n := range names {
		fmt.Fprintf(w, "  %-8s %s\n", n, cmds[n].summary)
	}
	fmt.Fprint(w, "\nRun 'proofsheet help COMMAND' or 'proofsheet COMMAND --help' for a command's options.\nExit status: 0 no difference, 1 differences, 2 trouble (bad input, usage).\n'proofsheet --version' prints the version and VCS revision.\n")
}

// newFlags makes a quiet flag set; parseFlags reports its errors.
func newFlags(c *command) *flag.FlagSet {
	fs := flag.NewFlagSet(c.name, flag.ContinueOnError)
	fs.SetOutput(io.Discard)
	fs.Usage = func() {}
	return fs
}

// parseFlags parses flags that may come before, after or between the
// positional arguments (a lone "--" ends the flags). It returns the
// positional arguments, or a status to exit with: exitSame after --help,
// exitTrouble after a usage error (already printed).
func parseFlags(e *env, c *command, fs *flag.FlagSet, args []string) ([]string, int, bool) {
	var pos []string
	rest := args
	for {
		if err := fs.Parse(rest); err != nil {
			if errors.Is(err, flag.ErrHelp) {
				fmt.Fprint(e.stdout, c.usage)
				return nil, exitSame, false
			}
			fmt.Fprintf(e.stderr, "proofsheet %s: %v\n\n%s", c.name, err, c.usage)
			return nil, exitTrouble, false
		}
		rest = fs.Args()
		if len(rest) == 0 {
			break
		}
		if rest[0] == "--" {
			pos = append(pos, rest[1:]...)
			break
		}
		pos = append(pos, rest[0])
		rest = rest[1:]
	}
	return pos, 0, true
}

// trouble prints a message for bad input or usage and returns exitTrouble.
func trouble(e *env, c *command, format string, args ...any) int {
	msg := fmt.Sprintf(format, args...)
	fmt.Fprintf(e.stderr, "proofsheet %s: %s\n", c.name, strings.TrimRight(msg, "\n"))
	return exitTrouble
}
