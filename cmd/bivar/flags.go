package main

// This file holds the flag handling every subcommand shares.

import (
	"errors"
	"flag"
	"fmt"
	"io"
	"regexp"
	"slices"
	"strconv"
	"strings"

	"bivar/analysis/manifest"
	"bivar/themes"
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
	c := lookup(fs.Name())
	if msg := optionProblem(fs, args); msg != "" {
		fmt.Fprintf(stderr, "bivar %s: %s\nusage: %s\nRun 'bivar help %s' for details.\n", c.Name, msg, c.Usage, c.Name)
		return exitUsage, false
	}
	var positional []string
	for {
		if err := fs.Parse(args); err != nil {
			if errors.Is(err, flag.ErrHelp) {
				commandHelp(stdout, c)
				if options := flagDefaults(fs); options != "" {
					fmt.Fprintf(stdout, "\nOptions:\n%s", options)
				}
				return exitOK, false
			}
			// optionProblem has found what the flag package would refuse;
			// this is a safety net, in its words.
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

// optionProblem reads args as parseFlags will (options anywhere before
// "--", in the flag package's syntax: -name, --name, -name=value, and a
// value after an option that takes one) and says, in bivar's words, what
// is wrong with the first option the flag package would refuse: an
// unknown option (with the nearest one, or where that setting lives), an
// option missing its value, a switch given a value it cannot read, a
// malformed option. It returns "" when every option is well formed.
// -h and --help are left to the flag package, which answers with the help.
func optionProblem(fs *flag.FlagSet, args []string) string {
	for i := 0; i < len(args); i++ {
		arg := args[i]
		if arg == "--" {
			return ""
		}
		if len(arg) < 2 || arg[0] != '-' {
			continue // a positional argument, or "-"
		}
		name := strings.TrimPrefix(arg[1:], "-")
		if name == "" || name[0] == '-' || name[0] == '=' {
			return fmt.Sprintf("%s is not an option: write an option with one dash before a letter or two before a word, such as %s", strconv.Quote(arg), someOption(fs))
		}
		name, value, hasValue := strings.Cut(name, "=")
		if name == "h" || name == "help" {
			continue
		}
		f := fs.Lookup(name)
		if f == nil {
			return unknownOption(fs, name)
		}
		opt := optionName(name)
		if b, ok := f.Value.(interface{ IsBoolFlag() bool }); ok && b.IsBoolFlag() {
			if _, err := strconv.ParseBool(value); hasValue && err != nil {
				return fmt.Sprintf("%s=%s: %s is a switch, on when given: write %s alone (or %s=false to turn it off)", opt, value, opt, opt, opt)
			}
			continue
		}
		if hasValue {
			continue
		}
		argName, usage := flag.UnquoteUsage(f)
		if i+1 == len(args) {
			return fmt.Sprintf("%s needs a %s after it: %s", opt, argName, usage)
		}
		if next := args[i+1]; len(next) > 1 && next[0] == '-' {
			if n, _, _ := strings.Cut(strings.TrimLeft(next, "-"), "="); fs.Lookup(n) != nil {
				return fmt.Sprintf("%s needs a %s after it, not the option %s: %s", opt, argName, optionName(n), usage)
			}
		}
		i++ // the option's value
	}
	return ""
}

// unknownOption says that fs has no option name, and what the user may
// have meant: where the setting lives when it belongs in the manifest, the
// nearest option of the command, the command that has the option, or the
// command's options.
func unknownOption(fs *flag.FlagSet, name string) string {
	opt := optionName(name)
	msg := "unknown option " + opt
	if hint := manifestSetting(fs.Name(), name); hint != "" {
		return msg + ": " + hint
	}
	var names []string
	fs.VisitAll(func(f *flag.Flag) { names = append(names, f.Name) })
	if near := manifest.Nearest(name, names); near != "" {
		return fmt.Sprintf("%s (did you mean %s?)", msg, optionName(near))
	}
	var others []string
	for _, c := range commands() {
		if c.Name != fs.Name() && slices.Contains(usageOptions(c.Usage), opt) {
			others = append(others, "'bivar "+c.Name+"'")
		}
	}
	if len(others) > 0 {
		return fmt.Sprintf("%s: %s is an option of %s, not of 'bivar %s'", msg, opt, strings.Join(others, " and "), fs.Name())
	}
	if len(names) == 0 {
		return fmt.Sprintf("%s: 'bivar %s' takes no options", msg, fs.Name())
	}
	return fmt.Sprintf("%s: the options of 'bivar %s' are %s", msg, fs.Name(), optionList(fs))
}

// manifestSetting says where a setting given as an option of run or check
// is made instead: in the manifest's [output] table.
func manifestSetting(cmd, name string) string {
	if cmd != "run" && cmd != "check" {
		return ""
	}
	switch strings.ToLower(name) {
	case "theme":
		return fmt.Sprintf("the report's theme is set in the manifest, as theme = %q in its [output] table (one of %s; see docs/manifest.md)",
			themes.Default, strings.Join(themes.Names(), ", "))
	case "format", "formats":
		return `the report's formats are set in the manifest, as formats = ["html", "markdown", "json"] in its [output] table (see docs/manifest.md)`
	case "out", "output", "dir", "outdir", "output-dir":
		if cmd == "run" {
			return `the output folder is -o DIR, or dir = "…" in the manifest's [output] table`
		}
	}
	return ""
}

// usageOption finds the options in a usage line: "[-o DIR]", "[--replace]".
var usageOption = regexp.MustCompile(`\[(--?[a-z][a-z-]*)`)

// usageOptions lists the options a command's usage line shows, spelled as
// it spells them.
func usageOptions(usage string) []string {
	var out []string
	for _, m := range usageOption.FindAllStringSubmatch(usage, -1) {
		out = append(out, m[1])
	}
	return out
}

// optionList names fs's options with their arguments: "-o DIR, --replace".
func optionList(fs *flag.FlagSet) string {
	var list []string
	fs.VisitAll(func(f *flag.Flag) {
		arg, _ := flag.UnquoteUsage(f)
		list = append(list, strings.TrimSpace(optionName(f.Name)+" "+arg))
	})
	return strings.Join(list, ", ")
}

// someOption is an example of a well-formed option for fs: its first
// option as usage spells it, or --help.
func someOption(fs *flag.FlagSet) string {
	example := "--help"
	fs.VisitAll(func(f *flag.Flag) {
		if example == "--help" {
			example = optionName(f.Name)
		}
	})
	return example
}
