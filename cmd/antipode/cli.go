package main

import (
	"errors"
	"flag"
	"fmt"
	"io"
	"sort"
	"strings"
)

// Exit codes (DESIGN.md): 0 success, 1 a check failed under --strict, 2 bad
// input or usage.
const (
	exitOK     = 0
	exitStrict = 1
	exitBad    = 2
)

// env carries the streams of one invocation so tests can run commands in
// process.
type env struct {
	stdin          io.Reader
	stdout, stderr io.Writer
	// modelPath is the model file of mix and solve, which outputs must not
	// replace.
	modelPath string
}

// command is one subcommand of the tool.
type command struct {
	name    string
	summary string // one line for the command list
	usage   string // the synopsis after "antipode "
	about   string // a paragraph for --help
	example string // a worked example for --help
	run     func(e *env, args []string) error
}

var commands = map[string]*command{}

func register(c *command) { commands[c.name] = c }

// errStrict marks a check that failed under --strict (exit 1).
var errStrict = errors.New("check failed (--strict)")

// errHelp is returned after printing help (exit 0).
var errHelp = errors.New("help shown")

// usageError is a mistake on the command line (exit 2).
type usageError struct{ msg string }

func (e *usageError) Error() string { return e.msg }

func usagef(format string, a ...any) error { return &usageError{fmt.Sprintf(format, a...)} }

func run(args []string, stdin io.Reader, stdout, stderr io.Writer) int {
	e := &env{stdin: stdin, stdout: stdout, stderr: stderr}
	if len(args) == 0 {
		printOverview(stdout)
		return exitOK
	}
	name := args[0]
	switch name {
	case "help", "-h", "--help", "-help":
		if len(args) > 1 {
			return helpTopic(e, args[1])
		}
		printOverview(stdout)
		return exitOK
	case "version", "--version":
		fmt.Fprintln(stdout, "antipode", version)
		return exitOK
	}
	c, ok := commands[name]
	if !ok {
		fmt.Fprintf(stderr, "antipode: unknown command %q (run 'antipode help' for the list)\n", name)
		return exitBad
	}
	err := c.run(e, args[1:])
	switch {
	case err == nil, errors.Is(err, errHelp):
		return exitOK
	case errors.Is(err, errStrict):
		fmt.Fprintf(stderr, "antipode %s: %v\n", name, err)
		return exitStrict
	default:
		var ue *usageError
		if errors.As(err, &ue) {
			fmt.Fprintf(stderr, "antipode %s: %s (see 'antipode %s --help')\n", name, oneLine(err.Error()), name)
		} else {
			fmt.Fprintf(stderr, "antipode %s: %s\n", name, oneLine(err.Error()))
		}
		return exitBad
	}
}

// oneLine folds an error message onto one line.
func oneLine(s string) string { return strings.Join(strings.Fields(s), " ") }

const version = "0.1.0-dev"

func printOverview(w io.Writer) {
	fmt.Fprint(w, `antipode — spectral colorimetry, complementary-colour checks and mixing models

Usage: antipode COMMAND [flags] [FILES…]

Commands:
`)
	names := make([]string, 0, len(commands))
	for n := range commands {
		names = append(names, n)
	}
	sort.Strings(names)
	for _, n := range names {
		fmt.Fprintf(w, "  %-12s %s\n", n, commands[n].summary)
	}
	fmt.Fprint(w, `
Every command takes --help and shows a worked example. Spectral files are CSV
(wavelength columns or wavelength rows, told apart by content); "-" reads
standard input. Exit codes: 0 success, 1 a check failed under --strict,
2 bad input or usage.

Topics: antipode help tolerances | cautions
`)
}

func helpTopic(e *env, topic string) int {
	if c, ok := commands[topic]; ok {
		printCommandHelp(e.stdout, c, nil)
		return exitOK
	}
	if text, ok := topics[topic]; ok {
		fmt.Fprint(e.stdout, text)
		return exitOK
	}
	fmt.Fprintf(e.stderr, "antipode help: no command or topic %q\n", topic)
	return exitBad
}

func printCommandHelp(w io.Writer, c *command, fs *flag.FlagSet) {
	fmt.Fprintf(w, "Usage: antipode %s\n\n%s\n", c.usage, strings.TrimSpace(c.about))
	if fs != nil {
		fmt.Fprintln(w, "\nFlags:")
		fs.SetOutput(w)
		fs.VisitAll(func(f *flag.Flag) {
			name, use := flag.UnquoteUsage(f)
			if name != "" {
				name = " " + name
			}
			def := ""
			if f.DefValue != "" && f.DefValue != "false" {
				def = fmt.Sprintf(" (default %s)", f.DefValue)
			}
			fmt.Fprintf(w, "  --%s%s\n      %s%s\n", f.Name, name, use, def)
		})
	}
	if c.example != "" {
		fmt.Fprintf(w, "\nExample:\n%s\n", strings.TrimRight(c.example, "\n"))
	}
}

// parseFlags parses flags placed anywhere among the arguments (Go's flag
// package stops at the first non-flag) and returns the positional
// arguments. A lone "-" is positional (standard input).
func parseFlags(c *command, fs *flag.FlagSet, e *env, args []string) ([]string, error) {
	fs.SetOutput(io.Discard)
	fs.Usage = func() {}
	args = stdinNames(fs, args)
	var pos []string
	for {
		if err := fs.Parse(args); err != nil {
			if errors.Is(err, flag.ErrHelp) {
				printCommandHelp(e.stdout, c, fs)
				return nil, errHelp
			}
			return nil, usagef("%v", err)
		}
		args = fs.Args()
		if len(args) == 0 {
			return pos, nil
		}
		pos = append(pos, args[0])
		args = args[1:]
	}
}

// stdinNames lets "-:NAME" (one spectrum of standard input) through the
// flag parser, which would take it for an unknown flag: it puts "--"
// before each such argument, so parseFlags takes it as a positional
// argument and goes on parsing flags after it. An argument that is the
// value of the flag before it is left alone.
func stdinNames(fs *flag.FlagSet, args []string) []string {
	out := make([]string, 0, len(args)+1)
	for i, a := range args {
		if a == "--" {
			return append(out, args[i:]...)
		}
		if strings.HasPrefix(a, "-:") && len(a) > 2 && (i == 0 || !takesValue(fs, args[i-1])) {
			out = append(out, "--")
		}
		out = append(out, a)
	}
	return out
}

// takesValue reports whether a is a flag of fs that takes its value from
// the next argument (-name or --name of a non-boolean flag, without "=").
func takesValue(fs *flag.FlagSet, a string) bool {
	if len(a) < 2 || a[0] != '-' || strings.Contains(a, "=") {
		return false
	}
	f := fs.Lookup(strings.TrimPrefix(a[1:], "-"))
	if f == nil {
		return false
	}
	if b, ok := f.Value.(interface{ IsBoolFlag() bool }); ok && b.IsBoolFlag() {
		return false
	}
	return true
}
