package main

import (
	"context"
	"errors"
	"fmt"
	"net"
	"path/filepath"
	"time"

	"github.com/spf13/cobra"

	"github.com/sill-tool/sill/internal/decision"
	"github.com/sill-tool/sill/internal/scores"
	"github.com/sill-tool/sill/serve"
)

func newServeCmd() *cobra.Command {
	var listen, authorizedKeys, hostKey string
	var idle time.Duration
	var maxSessions int
	var data string
	var o exploreOptions
	cmd := &cobra.Command{
		Use:   "serve FILE.yaml...",
		Short: "Show decision files to colleagues over SSH, and take their sign-offs",
		Long: `serve shows the named decision files over SSH to the holders of the keys in
an OpenSSH authorized_keys file, with nothing to install on their side.

A client with a terminal gets the review screen (several files: a list to
pick from first); the screen writes nothing. Without a terminal:

  ssh -p 2222 HOST                     prints the text review of the first file
  ssh -p 2222 HOST review [FILE] [--format markdown]
  ssh -p 2222 HOST sign --verdict approve|revise|reject [--role ROLE] [--note TEXT] [FILE]

FILE is a file's base name or its place on this command line (1 first);
no other path is reachable. A sign-off's name is the key's comment in the
authorized_keys file and its key is the key's SHA256 fingerprint. Anything
else (a shell, another command, a subsystem such as sftp, port, agent or
X11 forwarding) is refused. Passwords are never asked.

It listens on 127.0.0.1:2222 unless --listen names another address. The
host key is an ed25519 key made on the first run (mode 0600) and used
after; its fingerprint is printed at start, for clients to check. Each
connection leaves one line on standard error: time, remote address, key
fingerprint and what was done.`,
		Example: `  sill serve cut.yaml --authorized-keys ~/.ssh/reviewers.pub
  sill serve cut.yaml cut-next.yaml --authorized-keys reviewers --listen 10.0.0.5:2222`,
		Args: func(cmd *cobra.Command, args []string) error {
			if len(args) == 0 {
				return errors.New("serve takes one or more decision files; got none (see sill serve --help)")
			}
			return nil
		},
		RunE: func(cmd *cobra.Command, args []string) error {
			if authorizedKeys == "" {
				return errors.New("--authorized-keys FILE is required: the keys let in, one a line as OpenSSH writes them")
			}
			if idle <= 0 {
				return fmt.Errorf("--idle-timeout %s: expected a positive duration such as 15m", idle)
			}
			if maxSessions < 1 {
				return fmt.Errorf("--max-sessions %d: expected 1 or more", maxSessions)
			}
			for _, path := range args {
				if _, err := decision.ReadFile(path); err != nil {
					return err
				}
			}
			var explore *serve.Explore
			if data != "" {
				var err error
				if explore, err = serveExplore(cmd.Context(), &o, data); err != nil {
					return err
				}
				o.input.warnWeights(cmd.ErrOrStderr())
			}
			stderr := cmd.ErrOrStderr()
			if hostKey == "" {
				var err error
				if hostKey, err = serve.DefaultHostKeyPath(); err != nil {
					return err
				}
			}
			signer, created, err := serve.LoadHostKey(cmd.Context(), hostKey)
			if err != nil {
				return err
			}
			made := "host key"
			if created {
				made = "host key made"
			}
			fmt.Fprintf(stderr, "sill: %s at %s: %s (ED25519)\n", made, hostKey, serve.Fingerprint(signer.PublicKey()))
			srv, err := serve.New(serve.Config{Files: args, AuthorizedKeys: authorizedKeys, HostKey: signer,
				IdleTimeout: idle, MaxSessions: maxSessions, Log: stderr, Explore: explore})
			if err != nil {
				return err
			}
			if !serve.Loopback(listen) {
				fmt.Fprintf(stderr, "sill: warning: listening on %s, reachable from other machines; only the keys in %s get in\n", listen, authorizedKeys)
			}
			ln, err := net.Listen("tcp", listen)
			if err != nil {
				return fmt.Errorf("--listen %s: %w", listen, err)
			}
			fmt.Fprintf(stderr, "sill: serving %d decision %s on %s (ctrl+c stops)\n", len(args), pluralWord(len(args), "file", "files"), ln.Addr())
			go func() {
				<-cmd.Context().Done()
				srv.Close()
			}()
			return srv.Serve(ln)
		},
	}
	fs := cmd.Flags()
	fs.StringVar(&listen, "listen", serve.DefaultListen, "the address to listen on; another than loopback is reachable from other machines")
	fs.StringVar(&authorizedKeys, "authorized-keys", "", "the OpenSSH authorized_keys file of the keys let in (read again when it changes)")
	fs.StringVar(&hostKey, "host-key", "", "the server's ed25519 key, made there on the first run (default: in your configuration folder)")
	fs.DurationVar(&idle, "idle-timeout", serve.DefaultIdleTimeout, "close a connection after this long without input")
	fs.IntVar(&maxSessions, "max-sessions", serve.DefaultMaxSessions, "connections open at once, at most")
	fs.StringVar(&data, "data", "", "also serve the explorer on this validation set (with explore's flags), loaded once; each connection explores alone and writes nothing")
	o.input.register(fs)
	o.assume.register(fs)
	o.assume.input = &o.input
	o.registerBeyond(fs)
	return cmd
}

// serveExplore loads the validation set at path once, with explore's
// flags, for every connection's explorer.
func serveExplore(ctx context.Context, o *exploreOptions, path string) (*serve.Explore, error) {
	if path == "-" {
		return nil, errors.New("--data takes a file; the set is loaded once before serving, not from standard input")
	}
	if err := o.beyond.prepare(&o.input); err != nil {
		return nil, err
	}
	cfg, err := o.config()
	if err != nil {
		return nil, err
	}
	set, err := o.load(ctx, path, nil)
	if err != nil {
		return nil, err
	}
	if _, err := o.assume.assumptions(set); err != nil {
		return nil, err
	}
	cfg.Load = func(func(int)) (*scores.Set, error) { return set, nil }
	cfg.Assume, cfg.ToolVersion = o.assume.assumptions, toolVersion()
	return &serve.Explore{Name: filepath.Base(path), Config: cfg}, nil
}
