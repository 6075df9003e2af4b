package serve

import (
	"bytes"
	"errors"
	"fmt"
	"io"
	"path/filepath"
	"strconv"
	"strings"
	"time"

	"github.com/charmbracelet/ssh"
	"github.com/spf13/pflag"

	"github.com/sill-tool/sill/internal/decision"
	"github.com/sill-tool/sill/internal/format"
	"github.com/sill-tool/sill/internal/review"
)

// usage is the one line that says what the server takes.
const usage = "this server takes: review [FILE] [--format text|markdown], sign --verdict approve|revise|reject [--role ROLE] [--note TEXT] [FILE]"

// refusal is a command the server does not run; its message is one line.
type refusal struct{ msg string }

func (r refusal) Error() string { return r.msg }

func refuse(f string, args ...any) error { return refusal{fmt.Sprintf(f, args...)} }

// command runs the command of a session without a screen and returns its
// exit status: 0 done, 1 a failure (a file that does not read, a write
// that did not happen), 2 refused.
func (s *Server) command(sess ssh.Session, who user, rec *record) int {
	args := sess.Command()
	var err error
	switch {
	case len(args) == 0:
		err = s.review(sess, rec, nil)
	case args[0] == "review":
		err = s.review(sess, rec, args[1:])
	case args[0] == "sign":
		err = s.sign(sess, who, rec, args[1:])
	default:
		err = refuse("unknown command %q; %s", args[0], usage)
	}
	if err == nil {
		return 0
	}
	line := strings.Join(strings.Fields(format.Printable(err.Error())), " ")
	fmt.Fprintln(sess.Stderr(), "sill serve: "+line)
	var r refusal
	if errors.As(err, &r) {
		rec.note("refused " + format.Printable(strings.Join(args, " ")))
		return 2
	}
	rec.note("failed " + format.Printable(strings.Join(args, " ")) + ": " + line)
	return 1
}

// flagSet returns a flag set that reports its errors and writes nothing.
func flagSet(name string) *pflag.FlagSet {
	fs := pflag.NewFlagSet(name, pflag.ContinueOnError)
	fs.SetOutput(io.Discard)
	fs.Usage = func() {}
	return fs
}

// review prints the text or Markdown review of a file.
func (s *Server) review(w io.Writer, rec *record, args []string) error {
	fs := flagSet("review")
	outFormat := fs.String("format", "text", "")
	if err := fs.Parse(args); err != nil {
		return refuse("review: %v; %s", err, usage)
	}
	if *outFormat != "text" && *outFormat != "markdown" {
		return refuse("review --format %q: expected text or markdown", *outFormat)
	}
	i, err := s.pick(fs.Args())
	if err != nil {
		return err
	}
	name := filepath.Base(s.cfg.Files[i])
	f, err := decision.ReadFile(s.cfg.Files[i])
	if err != nil {
		return s.hidePath(err, i)
	}
	// The whole review is made, then made safe again as one text: no
	// control sequence from the file reaches the client, whichever line
	// prints it.
	var text bytes.Buffer
	if *outFormat == "markdown" {
		err = review.WriteMarkdown(&text, f, name)
	} else {
		err = review.WriteText(&text, f, name, "sign --verdict approve|revise|reject [--role ROLE] [FILE]")
	}
	if err != nil {
		return s.hidePath(err, i)
	}
	if _, err := io.WriteString(w, format.PrintableText(text.String())); err != nil {
		return err
	}
	rec.note("review " + name + " (" + *outFormat + ")")
	return nil
}

// sign appends a sign-off by who to a file: under the file's lock, on the
// file as it is then, so that no other sign-off or write is lost.
func (s *Server) sign(sess ssh.Session, who user, rec *record, args []string) error {
	fs := flagSet("sign")
	verdictText := fs.String("verdict", "", "")
	role := fs.String("role", "", "")
	note := fs.String("note", "", "")
	if err := fs.Parse(args); err != nil {
		return refuse("sign: %v; %s", err, usage)
	}
	verdict, err := decision.ParseVerdict(*verdictText)
	if err != nil {
		return refuse("sign --verdict: %v", err)
	}
	if strings.TrimSpace(who.name) == "" {
		return refuse("sign: this key has no comment in the authorized keys file to sign by; ask who runs the server to add your name")
	}
	i, err := s.pick(fs.Args())
	if err != nil {
		return err
	}
	name := filepath.Base(s.cfg.Files[i])
	f, _, err := decision.AppendSignOff(sess.Context(), s.cfg.Files[i], decision.SignOff{
		Name: strings.TrimSpace(who.name), Role: strings.TrimSpace(*role), Verdict: verdict, Note: strings.TrimSpace(*note),
		At: s.cfg.Now().UTC().Truncate(time.Second), Key: who.key,
	})
	if err != nil {
		if errors.Is(err, decision.ErrInvalid) {
			return refusal{s.hidePath(err, i).Error()}
		}
		return s.hidePath(err, i)
	}
	last := f.SignOffs[len(f.SignOffs)-1]
	fmt.Fprintf(sess, "signed %s: %s by %s for the chosen %s (score %s); %d sign-offs in the file\n", name, last.Verdict,
		format.Printable(last.Name), format.Printable(last.Chosen), format.Score(last.ChosenScore), len(f.SignOffs))
	rec.note(fmt.Sprintf("signed %s: %s", name, last.Verdict))
	return nil
}

// pick returns the file args name: none is the first; a number is a place
// (1 first); a name is a file's base name. Nothing else is taken, so that
// no path on the server is reachable.
func (s *Server) pick(args []string) (int, error) {
	if len(args) > 1 {
		return 0, refuse("one file at most, got %d; %s", len(args), usage)
	}
	if len(args) == 0 {
		return 0, nil
	}
	want := args[0]
	if n, err := strconv.Atoi(want); err == nil {
		if n < 1 || n > len(s.cfg.Files) {
			return 0, refuse("no file %d here; %s", n, s.names())
		}
		return n - 1, nil
	}
	found := -1
	for i, path := range s.cfg.Files {
		if filepath.Base(path) == want {
			if found >= 0 {
				return 0, refuse("two files here are named %q; give its number; %s", want, s.names())
			}
			found = i
		}
	}
	if found < 0 {
		return 0, refuse("no file %q here; %s", want, s.names())
	}
	return found, nil
}

// names lists the files served, by number and base name.
func (s *Server) names() string {
	parts := make([]string, len(s.cfg.Files))
	for i, path := range s.cfg.Files {
		parts[i] = fmt.Sprintf("%d %s", i+1, filepath.Base(path))
	}
	return "the files are: " + strings.Join(parts, ", ")
}

// hidePath replaces the server's path of file i in err with its base
// name: a client learns nothing of the server's folders.
func (s *Server) hidePath(err error, i int) error {
	path := s.cfg.Files[i]
	msg := err.Error()
	if abs, e := filepath.Abs(path); e == nil {
		msg = strings.ReplaceAll(msg, abs, filepath.Base(path))
	}
	return errors.New(strings.ReplaceAll(msg, path, filepath.Base(path)))
}
