package decision

import (
	"bufio"
	"context"
	"errors"
	"fmt"
	"io"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"github.com/sill-tool/sill/internal/sharedfile"
)

// TestMain lets TestTwoSavesOfDifferentData run this test binary again
// as a saving process: with DECISION_SAVE set it saves and exits.
func TestMain(m *testing.M) {
	if which := os.Getenv("DECISION_SAVE"); which != "" {
		os.Exit(saveProcess(which, os.Getenv("DECISION_PATH")))
	}
	if name := os.Getenv("DECISION_SIGN"); name != "" {
		os.Exit(signProcess(name, os.Getenv("DECISION_PATH")))
	}
	os.Exit(m.Run())
}

// otherDigest is the data digest of the "b" saver: other data than the
// demo's.
var otherDigest = strings.Repeat("ab", 32)

// saveProcess saves the demo decision file ("a") or one made from other
// data ("b") to path once a line arrives on standard input, as
// `sill report --save` does. Exit status: 0 saved, 3 refused as made
// from other data, 1 anything else.
func saveProcess(which, path string) int {
	res, err := runDemo(0) // no bootstrap: 400 processes start here
	if err != nil {
		fmt.Println(err)
		return 1
	}
	f, err := demoFileOf(res)
	if err != nil {
		fmt.Println(err)
		return 1
	}
	if which == "b" {
		f.Data.SHA256 = otherDigest
	}
	fmt.Println("ready")
	if _, err := bufio.NewReader(os.Stdin).ReadString('\n'); err != nil {
		return 1
	}
	_, err = Write(context.Background(), path, f, WriteOptions{})
	switch {
	case err == nil:
		return 0
	case errors.Is(err, ErrDifferentData) && errors.Is(err, sharedfile.ErrOtherKind):
		return 3
	}
	fmt.Println(err)
	return 1
}

// Two processes save decision files made from different data to one
// path at the same moment, 200 times: each time exactly one saves and the
// other is refused, and the file holds the one that saved. (Before the
// check and the rename were one step under a lock, both said "saved" in
// about one run in four.)
func TestTwoSavesOfDifferentData(t *testing.T) {
	rounds := 200
	if testing.Short() {
		rounds = 20
	}
	dir := t.TempDir()
	path := filepath.Join(dir, "cut.yaml")
	wins := map[string]int{}
	for round := range rounds {
		os.Remove(path)
		type saver struct {
			name  string
			cmd   *exec.Cmd
			start io.WriteCloser
		}
		var savers []saver
		for _, name := range []string{"a", "b"} {
			cmd := exec.Command(os.Args[0], "-test.run=^$")
			cmd.Env = append(os.Environ(), "DECISION_SAVE="+name, "DECISION_PATH="+path)
			start, err := cmd.StdinPipe()
			if err != nil {
				t.Fatal(err)
			}
			out, err := cmd.StdoutPipe()
			if err != nil {
				t.Fatal(err)
			}
			if err := cmd.Start(); err != nil {
				t.Fatal(err)
			}
			if line, _ := bufio.NewReader(out).ReadString('\n'); line != "ready\n" {
				cmd.Process.Kill()
				t.Fatalf("round %d: saver %s printed %q", round, name, line)
			}
			savers = append(savers, saver{name, cmd, start})
		}
		for _, s := range savers { // both go at once
			io.WriteString(s.start, "go\n")
		}
		var saved []string
		for _, s := range savers {
			err := s.cmd.Wait()
			var exit *exec.ExitError
			switch {
			case err == nil:
				saved = append(saved, s.name)
			case errors.As(err, &exit) && exit.ExitCode() == 3:
			default:
				t.Fatalf("round %d: saver %s: %v", round, s.name, err)
			}
		}
		if len(saved) != 1 {
			t.Fatalf("round %d: %d savers said saved (%v), want exactly 1", round, len(saved), saved)
		}
		back, err := ReadFile(path)
		if err != nil {
			t.Fatalf("round %d: %v", round, err)
		}
		if (back.Data.SHA256 == otherDigest) != (saved[0] == "b") {
			t.Fatalf("round %d: %s saved but the file holds the other's data", round, saved[0])
		}
		entries, _ := os.ReadDir(dir)
		if len(entries) != 1 {
			t.Fatalf("round %d: %d files in the folder, want only cut.yaml", round, len(entries))
		}
		wins[saved[0]]++
	}
	t.Logf("%d rounds: a saved %d times, b %d times; both saved 0 times", rounds, wins["a"], wins["b"])
}

// signProcess appends a sign-off by name to the decision file at path once
// a line arrives on standard input, as sill review --sign does.
func signProcess(name, path string) int {
	fmt.Println("ready")
	if _, err := bufio.NewReader(os.Stdin).ReadString('\n'); err != nil {
		return 1
	}
	s := SignOff{Name: name, Role: "reviewer", Verdict: Approve, At: time.Now()}
	if _, _, err := AppendSignOff(context.Background(), path, s); err != nil {
		fmt.Println(err)
		return 1
	}
	return 0
}

// Six processes sign one file at the same moment: every sign-off lands,
// none lost to another's write, and the one sign-off already there stays
// first.
func TestSixConcurrentSigners(t *testing.T) {
	path := filepath.Join(t.TempDir(), "cut.yaml")
	if err := save(path, demoFile(t), false); err != nil {
		t.Fatal(err)
	}
	type signer struct {
		cmd   *exec.Cmd
		start io.WriteCloser
		out   *strings.Builder
	}
	var signers []signer
	names := []string{"Ana", "Bo", "Cyd", "Dev", "Eli", "Fen"}
	for _, name := range names {
		cmd := exec.Command(os.Args[0], "-test.run=^$")
		cmd.Env = append(os.Environ(), "DECISION_SIGN="+name, "DECISION_PATH="+path)
		start, err := cmd.StdinPipe()
		if err != nil {
			t.Fatal(err)
		}
		stdout, err := cmd.StdoutPipe()
		if err != nil {
			t.Fatal(err)
		}
		if err := cmd.Start(); err != nil {
			t.Fatal(err)
		}
		if line, err := bufio.NewReader(stdout).ReadString('\n'); err != nil || line != "ready\n" {
			t.Fatalf("%s: %q %v", name, line, err)
		}
		out := &strings.Builder{}
		go io.Copy(out, stdout)
		signers = append(signers, signer{cmd, start, out})
	}
	for _, s := range signers {
		io.WriteString(s.start, "go\n")
	}
	for i, s := range signers {
		if err := s.cmd.Wait(); err != nil {
			t.Errorf("%s: %v %s", names[i], err, s.out)
		}
	}
	f, err := ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	if len(f.SignOffs) != 1+len(names) || f.SignOffs[0].Name != "Tomas Reiner" {
		t.Fatalf("%d sign-offs, want %d: %+v", len(f.SignOffs), 1+len(names), f.SignOffs)
	}
	seen := map[string]bool{}
	for _, s := range f.SignOffs[1:] {
		seen[s.Name] = true
	}
	for _, name := range names {
		if !seen[name] {
			t.Errorf("%s's sign-off was lost", name)
		}
	}
}
