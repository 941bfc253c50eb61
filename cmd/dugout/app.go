package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"strings"

	"golang.org/x/term"
)

// ExitCode is the process exit status; see `dugout help exit-codes`.
type ExitCode int

// Exit codes.
const (
	ExitOK          ExitCode = 0
	ExitFailure     ExitCode = 1
	ExitUsage       ExitCode = 2
	ExitRejected    ExitCode = 3
	ExitInterrupted ExitCode = 130
)

// IOStreams carries the standard streams so commands can be tested with
// buffers. Results go to Out; errors, warnings and progress go to ErrOut.
type IOStreams struct {
	In       io.Reader
	Out      io.Writer
	ErrOut   io.Writer
	ErrIsTTY bool
	OutIsTTY bool
}

// SystemIO returns the process's own streams.
func SystemIO() *IOStreams {
	return &IOStreams{
		In:       os.Stdin,
		Out:      os.Stdout,
		ErrOut:   os.Stderr,
		ErrIsTTY: term.IsTerminal(int(os.Stderr.Fd())),
		OutIsTTY: term.IsTerminal(int(os.Stdout.Fd())),
	}
}

// App is what every command shares: the streams and the global flags.
type App struct {
	IO    *IOStreams
	Quiet bool
	JSON  bool
}

// Progress reports whether progress may be shown on stderr.
func (a *App) Progress() bool { return a.IO.ErrIsTTY && !a.Quiet }

// Warnf prints a warning on stderr unless --quiet.
func (a *App) Warnf(format string, args ...any) {
	if a.Quiet {
		return
	}
	fmt.Fprintf(a.IO.ErrOut, "warning: "+format+"\n", args...)
}

// FlagError is a usage error: it is printed with a hint to see --help and
// exits with code 2.
type FlagError struct{ Err error }

func (e *FlagError) Error() string { return e.Err.Error() }
func (e *FlagError) Unwrap() error { return e.Err }

// flagErrorf returns a *FlagError.
func flagErrorf(format string, args ...any) error {
	return &FlagError{Err: fmt.Errorf(format, args...)}
}

// RejectedError marks input that was read but failed validation (exit 3).
type RejectedError struct{ Err error }

func (e *RejectedError) Error() string { return e.Err.Error() }
func (e *RejectedError) Unwrap() error { return e.Err }

// Main runs the command line and returns the exit code.
func Main(ctx context.Context, streams *IOStreams, args []string) ExitCode {
	app := &App{IO: streams}
	root := newRootCmd(app)
	root.SetArgs(args)
	root.SetIn(streams.In)
	root.SetOut(streams.Out)
	root.SetErr(streams.ErrOut)
	err := root.ExecuteContext(ctx)
	if err == nil {
		return ExitOK
	}
	if errors.Is(err, context.Canceled) || ctx.Err() != nil {
		fmt.Fprintln(streams.ErrOut, "dugout: interrupted")
		return ExitInterrupted
	}
	fmt.Fprintf(streams.ErrOut, "dugout: %v\n", err)
	var fe *FlagError
	var re *RejectedError
	switch {
	case errors.As(err, &fe) || isCobraUsageError(err):
		fmt.Fprintln(streams.ErrOut, "Run 'dugout --help' or 'dugout COMMAND --help' for usage.")
		return ExitUsage
	case errors.As(err, &re):
		return ExitRejected
	}
	return ExitFailure
}

// isCobraUsageError recognises the errors cobra and pflag return for bad
// flags and argument counts, which carry no type of their own.
func isCobraUsageError(err error) bool {
	msg := err.Error()
	for _, p := range []string{"unknown flag", "unknown shorthand flag", "unknown command", "invalid argument",
		"flag needs an argument", "accepts ", "requires at least", "requires at most", "if any flags in the group"} {
		if strings.Contains(msg, p) {
			return true
		}
	}
	return false
}

// absFrom returns p unchanged when absolute, else joined to dir.
func absFrom(dir, p string) string {
	if filepath.IsAbs(p) || p == "-" {
		return p
	}
	return filepath.Join(dir, p)
}
