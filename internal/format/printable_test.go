package format

import (
	"encoding/json"
	"fmt"
	"strings"
	"testing"
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

// safe reports whether s holds nothing a terminal would act on, line
// feeds included.
func safe(s string) bool {
	_, bad := Unsafe(s)
	return !bad && !strings.Contains(s, "\n")
}

func TestPrintableHostile(t *testing.T) {
	if _, bad := Unsafe(Hostile); !bad {
		t.Fatal("Unsafe passes Hostile")
	}
	got := PrintableText("a\n" + Hostile + "\nb")
	if r, bad := Unsafe(got); bad {
		t.Errorf("PrintableText left %q in %q", r, got)
	}
	if want := "a\n" + `\x1b]0;title\a\x1b[2J\x9b31m\u202eevil\r` + "\nb"; got != want {
		t.Errorf("PrintableText = %q, want %q", got, want)
	}
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

// TestJSON checks that the escapes keep the values: the JSON decodes to
// the same string (encoding/json's own reading of \u escapes).
func TestJSON(t *testing.T) {
	value := "night " + Hostile + " · 東京 \u0085"
	encoded, err := json.Marshal(map[string]string{"note": value})
	if err != nil {
		t.Fatal(err)
	}
	got := JSON(encoded)
	if r, bad := Unsafe(string(got)); bad {
		t.Errorf("JSON left %q in %s", r, got)
	}
	var back map[string]string
	if err := json.Unmarshal(got, &back); err != nil {
		t.Fatal(err)
	}
	// encoding/json reads the invalid byte 0x9b as U+FFFD, before and after.
	if want := strings.ToValidUTF8(value, "\ufffd"); back["note"] != want {
		t.Errorf("decoded %q, want %q", back["note"], want)
	}
	if plain := []byte(`{"a":1}`); string(JSON(plain)) != string(plain) {
		t.Errorf("plain JSON changed: %s", JSON(plain))
	}
}
