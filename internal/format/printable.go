package format

import (
	"strconv"
	"strings"
	"unicode/utf8"
)

// Printable returns untrusted text (a file name, a column or segment
// value, a note, a candidate's or a model's name, an error quoting input)
// as text that is safe to print on a terminal or in a text or Markdown
// report: every character that a terminal would act on instead of showing
// is written out visibly, so a reader sees that something was there.
//
//   - C0 controls and DEL (0x00–0x1f, 0x7f), among them ESC, which starts
//     every CSI, OSC and DCS sequence, BEL, backspace, CR and line feed:
//     "\x1b", "\a", "\b", "\r", "\n", "\t", "\x7f" (Go's escapes);
//   - C1 controls (U+0080–U+009F, among them the one-character CSI
//     U+009B), the line and paragraph separators U+2028 and U+2029, and
//     the Unicode bidirectional marks, embeddings, overrides and isolates
//     that reorder what is shown (U+061C, U+200E, U+200F, U+202A–U+202E,
//     U+2066–U+2069): "\u009b", "\u202e";
//   - bytes that are not valid UTF-8 (a raw 0x9b among them): "\x9b".
//
// With the escape character gone, what followed it ("[2J", "]0;title")
// is plain text. Everything else, letters of every script included, is
// kept as it is. Text that needs no change is returned unchanged.
func Printable(s string) string {
	if plainASCII(s) {
		return s
	}
	var b strings.Builder
	b.Grow(len(s) + 8)
	for i := 0; i < len(s); {
		r, size := utf8.DecodeRuneInString(s[i:])
		switch {
		case r == utf8.RuneError && size == 1:
			b.WriteString(`\x`)
			b.WriteString(hex2(s[i]))
		case r < 0x20 || r == 0x7f:
			b.WriteString(c0Escape(byte(r)))
		case unsafeRune(r):
			q := strconv.QuoteRuneToASCII(r) // '\u202e'
			b.WriteString(q[1 : len(q)-1])
		default:
			b.WriteString(s[i : i+size])
		}
		i += size
	}
	return b.String()
}

// plainASCII reports whether s holds only printable ASCII.
func plainASCII(s string) bool {
	for i := 0; i < len(s); i++ {
		if s[i] < 0x20 || s[i] >= 0x7f {
			return false
		}
	}
	return true
}

// unsafeRune reports whether r is a C1 control, a line or paragraph
// separator or a bidirectional formatting character.
func unsafeRune(r rune) bool {
	switch {
	case r >= 0x80 && r <= 0x9f:
		return true
	case r == 0x061c, r == 0x200e, r == 0x200f, r == 0x2028, r == 0x2029:
		return true
	case r >= 0x202a && r <= 0x202e, r >= 0x2066 && r <= 0x2069:
		return true
	}
	return false
}

// c0Escape writes a C0 control or DEL as Go writes it in a string.
func c0Escape(c byte) string {
	switch c {
	case '\a':
		return `\a`
	case '\b':
		return `\b`
	case '\f':
		return `\f`
	case '\n':
		return `\n`
	case '\r':
		return `\r`
	case '\t':
		return `\t`
	case '\v':
		return `\v`
	}
	return `\x` + hex2(c)
}

func hex2(c byte) string {
	const digits = "0123456789abcdef"
	return string([]byte{digits[c>>4], digits[c&0xf]})
}

// PrintableText is Printable for a whole text output of several lines (a
// report, a review, a check): each line is made printable and the line
// feeds between them are kept. Text and Markdown writers pass what they
// write through it once, just before writing.
func PrintableText(text string) string {
	if plainASCIIOrNewline(text) {
		return text
	}
	lines := strings.Split(text, "\n")
	for i, line := range lines {
		lines[i] = Printable(line)
	}
	return strings.Join(lines, "\n")
}

// plainASCIIOrNewline reports whether s holds only printable ASCII and
// line feeds.
func plainASCIIOrNewline(s string) bool {
	for i := 0; i < len(s); i++ {
		if (s[i] < 0x20 && s[i] != '\n') || s[i] >= 0x7f {
			return false
		}
	}
	return true
}

// JSON returns encoded JSON with the characters that encoding/json leaves
// as they are but a terminal would act on (C1 controls, the bidirectional
// formatting characters) written as \u escapes, so that JSON printed on a
// terminal is as safe as text. The JSON decodes to the same values: such
// characters can only stand inside strings, where \u escapes mean them.
// encoding/json already escapes C0 controls, U+2028 and U+2029, and
// replaces invalid UTF-8.
func JSON(encoded []byte) []byte {
	clean := true
	for i := 0; i < len(encoded); i++ {
		if encoded[i] >= 0x80 {
			clean = false
			break
		}
	}
	if clean {
		return encoded
	}
	out := make([]byte, 0, len(encoded)+16)
	for i := 0; i < len(encoded); {
		r, size := utf8.DecodeRune(encoded[i:])
		if size > 1 && unsafeRune(r) {
			out = append(out, `\u`...)
			out = append(out, hex2(byte(r>>8))...)
			out = append(out, hex2(byte(r))...)
		} else {
			out = append(out, encoded[i:i+size]...)
		}
		i += size
	}
	return out
}
