package main

import (
	"errors"
	"flag"
	"fmt"
	"io"
	"reflect"
	"strings"
	"unicode/utf8"
)

// lineWidth is the widest line the help pages and the human output of
// rank print, in characters (runes).
const lineWidth = 100

// helpPage is a subcommand's --help text. Flags are listed from the
// FlagSet in the --name spelling.
type helpPage struct {
	// name is the command as typed, e.g. "rank" or "apikey create".
	name string
	// synopsis holds the usage lines without "usage: ".
	synopsis []string
	// about is a paragraph (or several, separated by blank lines) printed
	// before the flags; it is wrapped to lineWidth.
	about string
	// sections are printed after the flags, each under its title, as
	// written (pre-formatted).
	sections []helpSection
	// examples are command lines, printed one per line.
	examples []string
}

// helpSection is a pre-formatted block of a help page.
type helpSection struct {
	title string
	body  string
}

// write prints the whole help page: synopsis, about, flags, sections,
// examples.
func (h helpPage) write(w io.Writer, fs *flag.FlagSet) {
	h.writeSynopsis(w)
	if h.about != "" {
		fmt.Fprintln(w)
		for i, para := range strings.Split(h.about, "\n\n") {
			if i > 0 {
				fmt.Fprintln(w)
			}
			for _, l := range wrapText(strings.Join(strings.Fields(para), " "), lineWidth, "", "") {
				fmt.Fprintln(w, l)
			}
		}
	}
	if fs != nil && hasFlags(fs) {
		fmt.Fprintln(w)
		fmt.Fprintln(w, "Flags:")
		printFlags(w, fs)
	}
	for _, s := range h.sections {
		fmt.Fprintln(w)
		fmt.Fprintln(w, s.title+":")
		fmt.Fprintln(w, strings.TrimRight(s.body, "\n"))
	}
	if len(h.examples) > 0 {
		fmt.Fprintln(w)
		fmt.Fprintln(w, "Examples:")
		for _, ex := range h.examples {
			fmt.Fprintln(w, "  "+ex)
		}
	}
}

// writeSynopsis prints the usage lines only.
func (h helpPage) writeSynopsis(w io.Writer) {
	for i, s := range h.synopsis {
		if i == 0 {
			fmt.Fprintln(w, "usage: "+s)
		} else {
			fmt.Fprintln(w, "       "+s)
		}
	}
}

// writeShort prints the usage lines and where the full help is, for bad
// usage (on stderr).
func (h helpPage) writeShort(w io.Writer) {
	h.writeSynopsis(w)
	fmt.Fprintf(w, "Run 'shiftrank %s --help' for the flags and examples.\n", h.name)
}

func hasFlags(fs *flag.FlagSet) bool {
	n := 0
	fs.VisitAll(func(*flag.Flag) { n++ })
	return n > 0
}

// printFlags lists the flags of fs as "--name TYPE", the description
// wrapped under it and the default when it is not the zero value.
func printFlags(w io.Writer, fs *flag.FlagSet) {
	fs.VisitAll(func(f *flag.Flag) {
		typ, usage := flag.UnquoteUsage(f)
		head := "  --" + f.Name
		if typ != "" {
			if typ == "value" {
				typ = "text"
			}
			head += " " + strings.ToUpper(typ)
		}
		fmt.Fprintln(w, head)
		if !isZeroDefault(f) {
			def := f.DefValue
			if g, ok := f.Value.(flag.Getter); ok {
				if _, isString := g.Get().(string); isString {
					def = fmt.Sprintf("%q", def)
				}
			}
			usage += " (default " + def + ")"
		}
		for _, l := range wrapText(usage, lineWidth, "        ", "        ") {
			fmt.Fprintln(w, l)
		}
	})
}

// isZeroDefault reports whether the flag's default is its type's zero
// value (then it is not printed), as the flag package decides it.
func isZeroDefault(f *flag.Flag) bool {
	t := reflect.TypeOf(f.Value)
	var z reflect.Value
	if t.Kind() == reflect.Pointer {
		z = reflect.New(t.Elem())
	} else {
		z = reflect.Zero(t)
	}
	zv, ok := z.Interface().(flag.Value)
	if !ok {
		return f.DefValue == ""
	}
	return f.DefValue == zv.String()
}

// parseArgs parses args with fs, allowing flags after the positional
// arguments ("isomers C4H8O2 --count"), and returns the positional
// arguments in order. With -h or --help it prints the help page on stdout
// and returns help true (exit status 0). A flag error prints the usage
// lines on stderr and is bad input (exit status 2).
func parseArgs(fs *flag.FlagSet, args []string, page helpPage, e env) (positional []string, help bool, err error) {
	// The flag package's own messages and usage go nowhere: help goes to
	// stdout, errors are returned and printed once by main.
	fs.SetOutput(io.Discard)
	fs.Usage = func() {}
	for {
		if err := fs.Parse(args); err != nil {
			if errors.Is(err, flag.ErrHelp) {
				page.write(e.stdout, fs)
				return nil, true, nil
			}
			page.writeShort(e.stderr)
			return nil, false, badInputf("%s: %s", page.name, dashDash(err.Error()))
		}
		if fs.NArg() == 0 {
			return positional, false, nil
		}
		positional = append(positional, fs.Arg(0))
		args = fs.Args()[1:]
	}
}

// dashDash rewrites the flag package's "-name" in its error messages as
// "--name", the spelling of the help pages.
func dashDash(msg string) string {
	msg = strings.Replace(msg, "not defined: -", "not defined: --", 1)
	msg = strings.Replace(msg, "needs an argument: -", "needs an argument: --", 1)
	return strings.Replace(msg, " flag -", " flag --", 1)
}

// wrapText breaks s at spaces into lines of at most width characters
// (runes), the first starting with first and the others with indent. A
// word longer than a line stays whole on a line of its own.
func wrapText(s string, width int, first, indent string) []string {
	words := strings.Fields(s)
	if len(words) == 0 {
		return []string{strings.TrimRight(first, " ")}
	}
	var lines []string
	cur, n := first, utf8.RuneCountInString(first)
	fresh := true // cur holds no word yet
	for _, wd := range words {
		wl := utf8.RuneCountInString(wd)
		if !fresh && n+1+wl > width {
			lines = append(lines, cur)
			cur, n, fresh = indent, utf8.RuneCountInString(indent), true
		}
		if !fresh {
			cur += " "
			n++
		}
		cur += wd
		n += wl
		fresh = false
	}
	return append(lines, cur)
}
