package main

// This file holds the flag handling every subcommand shares.

import (
	"errors"
	"flag"
	"fmt"
	"io"
)

// newFlagSet returns a FlagSet for the named command whose -h prints the
// command's help from the table.
func newFlagSet(name string, stderr io.Writer) *flag.FlagSet {
	fs := flag.NewFlagSet(name, flag.ContinueOnError)
	fs.SetOutput(stderr)
	fs.Usage = func() {
		c := lookup(name)
		fmt.Fprintf(stderr, "usage: %s\n\n%s\n\nOptions:\n", c.Usage, c.Long)
		fs.PrintDefaults()
	}
	return fs
}

// parseFlags parses args, allowing flags after the positional arguments
// (`bivar run bivar.toml -o out` as well as `bivar run -o out bivar.toml`).
// The positional arguments are left in fs.Args(). It returns ok=false with
// the exit status when parsing ended the command: 0 after -h, 2 on a
// usage error (the flag package has already said what was wrong).
func parseFlags(fs *flag.FlagSet, args []string) (code int, ok bool) {
	var positional []string
	for {
		if err := fs.Parse(args); err != nil {
			if errors.Is(err, flag.ErrHelp) {
				return exitOK, false
			}
			return exitUsage, false
		}
		args = fs.Args()
		if len(args) == 0 {
			break
		}
		positional = append(positional, args[0])
		args = args[1:]
		if len(args) > 0 && args[0] == "--" {
			positional = append(positional, args[1:]...)
			break
		}
	}
	// Re-parse an empty list so fs.Args() reports the positional arguments.
	_ = fs.Parse(append([]string{"--"}, positional...))
	return exitOK, true
}
