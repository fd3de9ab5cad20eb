package main

import (
	"context"
	"encoding/hex"
	"errors"
	"flag"
	"fmt"
	"io"
	"text/tabwriter"
	"time"

	"shiftrank/server"
	"shiftrank/store"
)

const apikeyUsage = `usage: shiftrank apikey create --name NAME
       shiftrank apikey list
       shiftrank apikey revoke ID|NAME
       shiftrank apikey rotate-secret ID|NAME

Manages the API keys of a PostgreSQL-backed service (DATABASE_URL must be set).
create prints the key's callback secret and then the key itself, alone on the
last line of standard output; only the key's SHA-256 hash is stored, so keep
it: it cannot be shown again. The callback secret (hex) verifies the signature
of the key's callbacks; it is shown only by create and rotate-secret.
revoke stops the key at once: its queued jobs are cancelled, its running jobs
are stopped and none of its callbacks is sent any more.
rotate-secret gives the key a new callback secret and prints it; callbacks are
signed with it from then on.`

// runAPIKey creates, lists, revokes API keys or rotates their callback
// secrets in the database named by DATABASE_URL.
func runAPIKey(ctx context.Context, args []string, e env) error {
	if len(args) == 0 || args[0] == "-h" || args[0] == "--help" || args[0] == "help" {
		fmt.Fprintln(e.stderr, apikeyUsage)
		if len(args) == 0 {
			return badInputf("apikey: no subcommand given (create, list, revoke or rotate-secret)")
		}
		return nil
	}
	sub, rest := args[0], args[1:]
	fs := flag.NewFlagSet("apikey "+sub, flag.ContinueOnError)
	fs.SetOutput(e.stderr)
	fs.Usage = func() { fmt.Fprintln(e.stderr, apikeyUsage) }
	var name *string
	switch sub {
	case "create":
		name = fs.String("name", "", "a name for the key, e.g. the integration using it (required)")
	case "list", "revoke", "rotate-secret":
	default:
		fmt.Fprintln(e.stderr, apikeyUsage)
		return badInputf("apikey: unknown subcommand %q (create, list, revoke or rotate-secret)", sub)
	}
	if err := fs.Parse(rest); err != nil {
		if errors.Is(err, flag.ErrHelp) {
			return nil
		}
		return badInput(err)
	}
	switch {
	case sub == "create" && *name == "":
		return badInputf("apikey create: --name is required")
	case sub == "create" && fs.NArg() > 0, sub == "list" && fs.NArg() > 0:
		return badInputf("apikey %s: unexpected argument %q", sub, fs.Arg(0))
	case (sub == "revoke" || sub == "rotate-secret") && fs.NArg() != 1:
		return badInputf("apikey %s: give exactly one key ID or name", sub)
	}
	dsn := e.getenv("DATABASE_URL")
	if dsn == "" {
		return badInputf("apikey: DATABASE_URL is not set; API keys live in the PostgreSQL database the service uses " +
			"(e.g. DATABASE_URL=postgres://user@host:5432/shiftrank)")
	}
	st, err := store.Open(ctx, dsn)
	if err != nil {
		return fmt.Errorf("apikey: %w", err)
	}
	defer st.Close()

	switch sub {
	case "create":
		key, k, err := st.CreateAPIKey(ctx, *name)
		if err != nil {
			if errors.Is(err, store.ErrConflict) {
				return badInputf("apikey create: a key named %q exists already", *name)
			}
			if errors.Is(err, store.ErrInvalid) {
				return badInputf("apikey create: %v", err)
			}
			return fmt.Errorf("apikey create: %w", err)
		}
		fmt.Fprintf(e.stdout, "created API key %s (id %s)\n", k.Name, k.ID)
		fmt.Fprintf(e.stdout, "callback secret (verifies the %s header of this key's callbacks): %s\n", server.SignatureHeader, hex.EncodeToString(k.Secret))
		fmt.Fprintln(e.stdout, "send the key as \"Authorization: Bearer KEY\"; the key and the secret are shown only this once:")
		fmt.Fprintln(e.stdout, key)
		return nil
	case "list":
		keys, err := st.ListAPIKeys(ctx)
		if err != nil {
			return fmt.Errorf("apikey list: %w", err)
		}
		return writeKeys(e.stdout, keys)
	case "rotate-secret":
		k, err := st.RotateAPIKeySecret(ctx, fs.Arg(0))
		switch {
		case errors.Is(err, store.ErrNotFound):
			return badInputf("apikey rotate-secret: no key with ID or name %q", fs.Arg(0))
		case errors.Is(err, store.ErrConflict):
			return badInputf("apikey rotate-secret: key %q is revoked", fs.Arg(0))
		case err != nil:
			return fmt.Errorf("apikey rotate-secret: %w", err)
		}
		fmt.Fprintf(e.stdout, "new callback secret of %s (id %s); callbacks are signed with it from now on, and it is shown only this once:\n", k.Name, k.ID)
		fmt.Fprintln(e.stdout, hex.EncodeToString(k.Secret))
		return nil
	default:
		n, err := st.RevokeAPIKey(ctx, fs.Arg(0))
		if err != nil {
			if errors.Is(err, store.ErrNotFound) {
				return badInputf("apikey revoke: no key with ID or name %q", fs.Arg(0))
			}
			return fmt.Errorf("apikey revoke: %w", err)
		}
		fmt.Fprintf(e.stdout, "revoked %s: %d queued jobs cancelled, running jobs asked to stop, no more callbacks\n", fs.Arg(0), n)
		return nil
	}
}

func writeKeys(w io.Writer, keys []store.APIKey) error {
	tw := tabwriter.NewWriter(w, 0, 4, 2, ' ', 0)
	fmt.Fprintln(tw, "ID\tNAME\tCREATED\tREVOKED")
	for _, k := range keys {
		revoked := "-"
		if !k.RevokedAt.IsZero() {
			revoked = k.RevokedAt.UTC().Format(time.RFC3339)
		}
		fmt.Fprintf(tw, "%s\t%s\t%s\t%s\n", k.ID, k.Name, k.CreatedAt.UTC().Format(time.RFC3339), revoked)
	}
	return tw.Flush()
}
