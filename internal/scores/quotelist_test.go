package scores_test

import (
	"errors"
	"strings"
	"testing"
	"unicode/utf8"

	"github.com/sill-tool/sill/internal/scores"
)

// TestMissingColumnLongHeader: a header of many names, or of one garbled
// name as a binary file gives, is shortened in the error to at most 12
// names and 200 characters, then "…" and how many more there are. The
// expected texts were written out by hand from the limits.
func TestMissingColumnLongHeader(t *testing.T) {
	var names []string
	for i := range 40 {
		names = append(names, "c"+strings.Repeat("x", i%3)+string(rune('a'+i%26)))
	}
	garbled := strings.Repeat("\x01\xfe", 300)
	cases := []struct {
		name   string
		header string
		want   string // the list of the header in the message
	}{
		{
			name:   "40 short names: the first 12",
			header: strings.Join(names, ","),
			want:   `["ca", "cxb", "cxxc", "cd", "cxe", "cxxf", "cg", "cxh", "cxxi", "cj", "cxk", "cxxl", … and 28 more]`,
		},
		{
			name:   "one garbled name: cut at 200 characters",
			header: garbled + ",label",
		},
		{
			name:   "two names: in full",
			header: "x,label",
			want:   `["x", "label"]`,
		},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			_, err := scores.Read(strings.NewReader(tc.header+"\n0.1,1\n"), "f.csv", scores.Options{Delimiter: ','})
			if !errors.Is(err, scores.ErrMissingColumn) {
				t.Fatalf("got %v, want ErrMissingColumn", err)
			}
			msg := err.Error()
			list := msg[strings.Index(msg, "among ")+len("among ") : strings.Index(msg, ", expected one of")]
			if tc.want != "" && list != tc.want {
				t.Errorf("list %s\nwant %s", list, tc.want)
			}
			if n := utf8.RuneCountInString(list); n > 200+len(" and 99 more]")+2 {
				t.Errorf("list is %d characters: %s", n, list)
			}
			if tc.want == "" && !strings.Contains(list, "… and 1 more]") {
				t.Errorf("list %s does not end in … and 1 more", list)
			}
		})
	}
}
