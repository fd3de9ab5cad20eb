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

const apikeyExamples = `Examples:
  shiftrank apikey create --name eln-sync
  shiftrank apikey list
  shiftrank apikey revoke eln-sync
  shiftrank apikey rotate-secret eln-sync`

// apikeyHelp is the help page of one apikey subcommand.
func apikeyHelp(sub string) helpPage {
	p := helpPage{name: "apikey " + sub}
	switch sub {
	case "create":
		p.synopsis = []string{"shiftrank apikey create --name NAME"}
		p.about = "Creates a key and prints its callback secret, then the key alone on the last line of standard output. " +
			"Only the key's SHA-256 hash is stored: keep the key, it cannot be shown again."
		p.examples = []string{"shiftrank apikey create --name eln-sync"}
	case "list":
		p.synopsis = []string{"shiftrank apikey list"}
		p.about = "Lists the API keys of the database named by DATABASE_URL."
		p.examples = []string{"shiftrank apikey list"}
	case "revoke":
		p.synopsis = []string{"shiftrank apikey revoke ID|NAME"}
		p.about = "Stops the key at once: its queued jobs are cancelled, its running jobs are stopped and none of its callbacks is sent any more."
		p.examples = []string{"shiftrank apikey revoke eln-sync"}
	case "rotate-secret":
		p.synopsis = []string{"shiftrank apikey rotate-secret ID|NAME"}
		p.about = "Gives the key a new callback secret and prints it; callbacks are signed with it from then on."
		p.examples = []string{"shiftrank apikey rotate-secret eln-sync"}
	}
	return p
}

// runAPIKey creates, lists, revokes API keys or rotates their callback
// secrets in the database named by DATABASE_URL.
func runAPIKey(ctx context.Context, args []string, e env) error {
	if len(args) == 0 {
		fmt.Fprintln(e.stderr, apikeyUsage)
		return badInputf("apikey: no subcommand given (create, list, revoke or rotate-secret)")
	}
	if args[0] == "-h" || args[0] == "--help" || args[0] == "help" {
		fmt.Fprintln(e.stdout, apikeyUsage)
		fmt.Fprintln(e.stdout)
		fmt.Fprintln(e.stdout, apikeyExamples)
		return nil
	}
	sub, rest := args[0], args[1:]
	fs := flag.NewFlagSet("apikey "+sub, flag.ContinueOnError)
	page := apikeyHelp(sub)
	var name *string
	switch sub {
	case "create":
		name = fs.String("name", "", "a name for the key, e.g. the integration using it (required)")
	case "list", "revoke", "rotate-secret":
	default:
		fmt.Fprintln(e.stderr, apikeyUsage)
		return badInputf("apikey: unknown subcommand %q (create, list, revoke or rotate-secret)", sub)
	}
	positional, help, err := parseArgs(fs, rest, page, e)
	if help || err != nil {
		return err
	}
	switch {
	case sub == "create" && *name == "":
		return badInputf("apikey create: --name is required")
	case sub == "create" && len(positional) > 0, sub == "list" && len(positional) > 0:
		return badInputf("apikey %s: unexpected argument %q", sub, positional[0])
	case (sub == "revoke" || sub == "rotate-secret") && len(positional) != 1:
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
		k, err := st.RotateAPIKeySecret(ctx, positional[0])
		switch {
		case errors.Is(err, store.ErrNotFound):
			return badInputf("apikey rotate-secret: no key with ID or name %q", positional[0])
		case errors.Is(err, store.ErrConflict):
			return badInputf("apikey rotate-secret: key %q is revoked", positional[0])
		case err != nil:
			return fmt.Errorf("apikey rotate-secret: %w", err)
		}
		fmt.Fprintf(e.stdout, "new callback secret of %s (id %s); callbacks are signed with it from now on, and it is shown only this once:\n", k.Name, k.ID)
		fmt.Fprintln(e.stdout, hex.EncodeToString(k.Secret))
		return nil
	default:
		n, err := st.RevokeAPIKey(ctx, positional[0])
		if err != nil {
			if errors.Is(err, store.ErrNotFound) {
				return badInputf("apikey revoke: no key with ID or name %q", positional[0])
			}
			return fmt.Errorf("apikey revoke: %w", err)
		}
		fmt.Fprintf(e.stdout, "revoked %s: %d queued jobs cancelled, running jobs asked to stop, no more callbacks\n", positional[0], n)
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
