package format

import "unicode/utf8"

// Hostile is text that would act on a terminal if printed raw: an OSC
// that sets the window title (ended by BEL), a CSI that clears the
// screen, the one-byte C1 CSI (not UTF-8), a right-to-left override and a
// carriage return. Tests across the project put it into file names,
// notes, names and values and check with Unsafe that none of it reaches
// what is printed.
const Hostile = "\x1b]0;title\x07\x1b[2J\x9b31m\u202eevil\r"

// Unsafe returns the first character of s that a terminal would act on
// rather than show, and whether there is one: a byte that is not UTF-8, a
// C0 control other than the line feed, DEL, a C1 control, a line or
// paragraph separator or a bidirectional formatting character (what
// Printable writes out). Line feeds pass: s may be a whole output.
func Unsafe(s string) (rune, bool) {
	for i := 0; i < len(s); {
		r, size := utf8.DecodeRuneInString(s[i:])
		switch {
		case r == utf8.RuneError && size == 1:
			return rune(s[i]), true
		case r != '\n' && (r < 0x20 || r == 0x7f || unsafeRune(r)):
			return r, true
		}
		i += size
	}
	return 0, false
}
