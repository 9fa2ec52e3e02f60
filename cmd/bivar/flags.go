package main

// This file holds the flag handling every subcommand shares.

import (
	"errors"
	"flag"
	"fmt"
	"io"
	"strings"
)

// newFlagSet returns a FlagSet for the named command. Its errors are
// reported by parseFlags, which prefixes them with the command's name.
func newFlagSet(name string) *flag.FlagSet {
	fs := flag.NewFlagSet(name, flag.ContinueOnError)
	fs.SetOutput(io.Discard)
	fs.Usage = func() {}
	return fs
}

// parseFlags parses args, allowing flags after the positional arguments
// (`bivar run bivar.toml -o out` as well as `bivar run -o out bivar.toml`).
// The positional arguments are left in fs.Args(). It returns ok=false with
// the exit status when parsing ended the command: 0 after -h (the full
// help on stdout), 2 on a usage error (the error, the usage line and where
// to read more on stderr).
func parseFlags(fs *flag.FlagSet, args []string, stdout, stderr io.Writer) (code int, ok bool) {
	var positional []string
	for {
		if err := fs.Parse(args); err != nil {
			c := lookup(fs.Name())
			if errors.Is(err, flag.ErrHelp) {
				commandHelp(stdout, c)
				if options := flagDefaults(fs); options != "" {
					fmt.Fprintf(stdout, "\nOptions:\n%s", options)
				}
				return exitOK, false
			}
			fmt.Fprintf(stderr, "bivar %s: %v\nusage: %s\nRun 'bivar help %s' for details.\n", c.Name, err, c.Usage, c.Name)
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

// flagDefaults lists fs's options as the usage lines spell them
// (optionName): each with its argument, its description and any default.
func flagDefaults(fs *flag.FlagSet) string {
	var b strings.Builder
	fs.VisitAll(func(f *flag.Flag) {
		arg, usage := flag.UnquoteUsage(f)
		b.WriteString("  " + optionName(f.Name))
		if arg != "" {
			b.WriteString(" " + arg)
		}
		b.WriteString("\n    \t" + strings.ReplaceAll(usage, "\n", "\n    \t"))
		if g, ok := f.Value.(flag.Getter); ok {
			switch v := g.Get().(type) {
			case string:
				if v != "" {
					fmt.Fprintf(&b, " (default %q)", v)
				}
			case bool:
				if v {
					b.WriteString(" (default true)")
				}
			default:
				fmt.Fprintf(&b, " (default %v)", v)
			}
		}
		b.WriteString("\n")
	})
	return b.String()
}

// optionName spells an option as the usage lines and the README do: one
// dash before a one-letter name ("-o"), two before a word ("--replace").
// The flag package reads either spelling of either.
func optionName(name string) string {
	if len(name) == 1 {
		return "-" + name
	}
	return "--" + name
}
