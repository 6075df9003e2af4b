//go:build unix

package sharedfile

import (
	"bufio"
	"context"
	"errors"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"strconv"
	"syscall"
	"testing"
	"time"
)

// TestMain lets the tests run this test binary again as a second writer:
// with SHAREDFILE_CHILD set it does what that names and exits.
func TestMain(m *testing.M) {
	if mode := os.Getenv("SHAREDFILE_CHILD"); mode != "" {
		os.Exit(child(mode, os.Getenv("SHAREDFILE_PATH")))
	}
	os.Exit(m.Run())
}

// child is the second process: "hold" takes the lock of path and waits
// to be killed; "slow" writes path, pausing before the rename; "count"
// adds one to the number in path, 25 times.
func child(mode, path string) int {
	ctx := context.Background()
	switch mode {
	case "hold":
		if _, err := acquire(ctx, filepath.Join(filepath.Dir(path), "."+filepath.Base(path)+".lock")); err != nil {
			fmt.Println(err)
			return 1
		}
		fmt.Println("locked")
		time.Sleep(time.Minute)
		return 0
	case "slow":
		HookBeforeRename(func(tmp string) error {
			fmt.Println("renaming", tmp)
			time.Sleep(300 * time.Millisecond)
			return nil
		})
		_, err := Write(ctx, path, []byte("new"), Options{})
		fmt.Println(err)
		if errors.Is(err, ErrInterrupted) {
			return 3
		}
		return 1
	case "count":
		for range 25 {
			_, err := Update(ctx, path, Options{}, func(current []byte) ([]byte, error) {
				n, _ := strconv.Atoi(string(current))
				return []byte(strconv.Itoa(n + 1)), nil
			})
			if err != nil {
				fmt.Println(err)
				return 1
			}
		}
		return 0
	}
	return 2
}

func childCmd(t *testing.T, mode, path string) *exec.Cmd {
	t.Helper()
	cmd := exec.Command(os.Args[0], "-test.run=^$")
	cmd.Env = append(os.Environ(), "SHAREDFILE_CHILD="+mode, "SHAREDFILE_PATH="+path)
	return cmd
}

// firstLine starts cmd and returns the first line it prints.
func firstLine(t *testing.T, cmd *exec.Cmd) string {
	t.Helper()
	out, err := cmd.StdoutPipe()
	if err != nil {
		t.Fatal(err)
	}
	if err := cmd.Start(); err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() { cmd.Process.Kill(); cmd.Wait() })
	line, err := bufio.NewReader(out).ReadString('\n')
	if err != nil {
		t.Fatalf("the child printed nothing: %v", err)
	}
	return line
}

// A writer that crashes holding the lock does not block the next: the
// kernel releases it. The lock file it left is used and then deleted.
func TestCrashedHolderReleasesLock(t *testing.T) {
	dir := t.TempDir()
	path := filepath.Join(dir, "cut.yaml")
	holder := childCmd(t, "hold", path)
	if line := firstLine(t, holder); line != "locked\n" {
		t.Fatalf("child: %q", line)
	}
	// While it holds the lock, a write waits, and gives up when its
	// context ends.
	ctx, cancel := context.WithTimeout(context.Background(), 150*time.Millisecond)
	defer cancel()
	if _, err := Write(ctx, path, []byte("early"), Options{}); !errors.Is(err, ErrInterrupted) {
		t.Fatalf("write while another holds the lock: %v, want ErrInterrupted", err)
	}
	holder.Process.Signal(syscall.SIGKILL)
	holder.Wait()
	assertOnlyFiles(t, dir, ".cut.yaml.lock")
	ctx, cancel = context.WithTimeout(context.Background(), 5*time.Second)
	defer cancel()
	if _, err := Write(ctx, path, []byte("after"), Options{}); err != nil {
		t.Fatalf("write after the holder crashed: %v", err)
	}
	assertContent(t, path, "after")
	assertOnlyFiles(t, dir, "cut.yaml")
}

// An interrupt (SIGINT) while the temporary file waits for its rename
// stops the write: the old file stays and no temporary file is left.
func TestInterruptRemovesTemporaryFile(t *testing.T) {
	dir := t.TempDir()
	path := filepath.Join(dir, "cut.yaml")
	writeFile(t, path, "old", 0o644)
	writer := childCmd(t, "slow", path)
	out, err := writer.StdoutPipe()
	if err != nil {
		t.Fatal(err)
	}
	if err := writer.Start(); err != nil {
		t.Fatal(err)
	}
	lines := bufio.NewScanner(out)
	if !lines.Scan() {
		t.Fatal("the writer printed nothing")
	}
	t.Logf("child: %s", lines.Text())
	writer.Process.Signal(syscall.SIGINT)
	lines.Scan()
	err = writer.Wait()
	var exit *exec.ExitError
	if !errors.As(err, &exit) || exit.ExitCode() != 3 {
		t.Fatalf("writer ended with %v (%q), want exit status 3 after ErrInterrupted", err, lines.Text())
	}
	assertContent(t, path, "old")
	assertOnlyFiles(t, dir, "cut.yaml")
}

// Four processes adding one to a counter 25 times each through Update
// lose no update: the count ends at 100.
func TestConcurrentUpdatesAllLand(t *testing.T) {
	path := filepath.Join(t.TempDir(), "count")
	var cmds []*exec.Cmd
	for range 4 {
		cmd := childCmd(t, "count", path)
		if err := cmd.Start(); err != nil {
			t.Fatal(err)
		}
		cmds = append(cmds, cmd)
	}
	for _, cmd := range cmds {
		if err := cmd.Wait(); err != nil {
			t.Fatalf("a counting process: %v", err)
		}
	}
	assertContent(t, path, "100")
}

// A new file gets 0666 less the umask.
func TestNewFileTakesUmask(t *testing.T) {
	dir := t.TempDir()
	old := syscall.Umask(0o027)
	defer syscall.Umask(old)
	path := filepath.Join(dir, "cut.yaml")
	if _, err := Write(context.Background(), path, []byte("new"), Options{}); err != nil {
		t.Fatal(err)
	}
	if got := fileMode(t, path); got != 0o640 {
		t.Fatalf("mode %v under umask 027, want 0640", got)
	}
}

// A replaced file keeps its owner and group where the writer may give
// them: as root, both (else the group, for a member of it).
func TestWriteKeepsOwner(t *testing.T) {
	path := filepath.Join(t.TempDir(), "cut.yaml")
	writeFile(t, path, "old", 0o660)
	uid, gid := 4321, 4321
	if os.Geteuid() != 0 {
		groups, _ := os.Getgroups()
		gid = -1
		for _, g := range groups {
			if g != os.Getegid() {
				gid = g
			}
		}
		if gid < 0 {
			t.Skip("not root and in no second group: no other owner to keep")
		}
		uid = os.Geteuid()
	}
	if err := os.Chown(path, uid, gid); err != nil {
		t.Fatal(err)
	}
	if _, err := Write(context.Background(), path, []byte("new"), Options{}); err != nil {
		t.Fatal(err)
	}
	info, err := os.Stat(path)
	if err != nil {
		t.Fatal(err)
	}
	st := info.Sys().(*syscall.Stat_t)
	if int(st.Uid) != uid || int(st.Gid) != gid || info.Mode().Perm() != 0o660 {
		t.Fatalf("owner %d:%d mode %v after the write, want %d:%d 0660", st.Uid, st.Gid, info.Mode().Perm(), uid, gid)
	}
}
