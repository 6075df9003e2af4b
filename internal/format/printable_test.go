package format

import (
	"fmt"
	"strings"
	"testing"
	"unicode/utf8"
)

// The expected texts were written by hand from the list in Printable's
// doc; the control characters are those of ECMA-48 (C0, C1, ESC starting
// CSI, OSC and DCS) and the bidirectional formatting characters of
// Unicode's UAX #9 (from memory).
func TestPrintable(t *testing.T) {
	for _, tc := range []struct{ name, in, want string }{
		{"plain", "scores_2026.csv", "scores_2026.csv"},
		{"letters of other scripts", "café · 東京 · Ελλάδα", "café · 東京 · Ελλάδα"},
		{"empty", "", ""},
		{"title by OSC", "a\x1b]0;title\x07b", `a\x1b]0;title\ab`},
		{"clear screen by CSI", "\x1b[2Jnote", `\x1b[2Jnote`},
		{"device control string", "\x1bPq#0\x1b\\", `\x1bPq#0\x1b\`},
		{"one-byte CSI, not UTF-8", "\x9b31mred", `\x9b31mred`},
		{"C1 CSI as a character", "\u009b31mred", `\u009b31mred`},
		{"C1 next line", "a\u0085b", `a\u0085b`},
		{"right-to-left override", "abc\u202edcba", `abc\u202edcba`},
		{"isolates", "\u2066x\u2069", `\u2066x\u2069`},
		{"marks", "\u200ex\u200f\u061c", `\u200ex\u200f\u061c`},
		{"carriage return", "ok\rbad", `ok\rbad`},
		{"backspace and bell", "a\bb\a", `a\bb\a`},
		{"line breaks and tab", "a\nb\tc\r\n", `a\nb\tc\r\n`},
		{"line separator", "a\u2028b", `a\u2028b`},
		{"delete", "a\x7f", `a\x7f`},
		{"nul", "a\x00b", `a\x00b`},
		{"invalid UTF-8", "a\xff\xfeb", `a\xff\xfeb`},
		{"truncated UTF-8", "caf\xc3", `caf\xc3`},
	} {
		got := Printable(tc.in)
		if got != tc.want {
			t.Errorf("%s: Printable(%q) = %q, want %q", tc.name, tc.in, got, tc.want)
		}
		if !safe(got) {
			t.Errorf("%s: Printable(%q) = %q is not safe", tc.name, tc.in, got)
		}
	}
}

// safe reports whether s holds nothing a terminal would act on: valid
// UTF-8 with no control, separator or bidirectional formatting character.
// It is the test's own statement of what Printable promises.
func safe(s string) bool {
	if !utf8.ValidString(s) {
		return false
	}
	for _, r := range s {
		if r < 0x20 || r == 0x7f || unsafeRune(r) {
			return false
		}
	}
	return true
}

// TestPrintableEveryByte feeds every byte and every pair of bytes and
// checks that nothing unsafe survives and that plain text is kept.
func TestPrintableEveryByte(t *testing.T) {
	for a := 0; a < 256; a++ {
		for b := 0; b < 256; b++ {
			in := string([]byte{byte(a), byte(b), 'x'})
			got := Printable(in)
			if !safe(got) {
				t.Fatalf("Printable(%q) = %q is not safe", in, got)
			}
			if !strings.HasSuffix(got, "x") {
				t.Fatalf("Printable(%q) = %q lost the text after it", in, got)
			}
		}
	}
}

func ExamplePrintable() {
	fmt.Println(Printable("night shift\x1b]0;owned\x07"))
	// Output: night shift\x1b]0;owned\a
}
