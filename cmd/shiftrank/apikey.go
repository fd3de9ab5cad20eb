package main

import (
	"context"
	"errors"
	"flag"
	"fmt"
	"io"
	"text/tabwriter"
	"time"

	"shiftrank/store"
)

const apikeyUsage = `usage: shiftrank apikey create --name NAME
       shiftrank apikey list
       shiftrank apikey revoke ID|NAME

Manages the API keys of a PostgreSQL-backed service (DATABASE_URL must be set).
create prints the new key once, alone on the last line of standard output;
only its SHA-256 hash is stored, so keep it: it cannot be shown again.`

// runAPIKey creates, lists or revokes API keys in the database named by
// DATABASE_URL.
func runAPIKey(ctx context.Context, args []string, e env) error {
	if len(args) == 0 || args[0] == "-h" || args[0] == "--help" || args[0] == "help" {
		fmt.Fprintln(e.stderr, apikeyUsage)
		if len(args) == 0 {
			return badInputf("apikey: no subcommand given (create, list or revoke)")
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
	case "list", "revoke":
	default:
		fmt.Fprintln(e.stderr, apikeyUsage)
		return badInputf("apikey: unknown subcommand %q (create, list or revoke)", sub)
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
	case sub == "revoke" && fs.NArg() != 1:
		return badInputf("apikey revoke: give exactly one key ID or name")
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
		fmt.Fprintln(e.stdout, "send it as \"Authorization: Bearer KEY\"; it is shown only this once:")
		fmt.Fprintln(e.stdout, key)
		return nil
	case "list":
		keys, err := st.ListAPIKeys(ctx)
		if err != nil {
			return fmt.Errorf("apikey list: %w", err)
		}
		return writeKeys(e.stdout, keys)
	default:
		if err := st.RevokeAPIKey(ctx, fs.Arg(0)); err != nil {
			if errors.Is(err, store.ErrNotFound) {
				return badInputf("apikey revoke: no key with ID or name %q", fs.Arg(0))
			}
			return fmt.Errorf("apikey revoke: %w", err)
		}
		fmt.Fprintf(e.stdout, "revoked %s\n", fs.Arg(0))
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
