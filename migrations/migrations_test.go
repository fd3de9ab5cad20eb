package migrations_test

import (
	"context"
	"io/fs"
	"regexp"
	"testing"

	"github.com/jackc/pgx/v5"
	"github.com/jackc/pgx/v5/stdlib"
	"github.com/pressly/goose/v3"

	"shiftrank/migrations"
	"shiftrank/store/pgtest"
)

// TestNames checks the goose file naming (NNNNN_name.sql), which fixes the
// order migrations run in.
func TestNames(t *testing.T) {
	names, err := fs.Glob(migrations.FS, "*.sql")
	if err != nil || len(names) == 0 {
		t.Fatalf("no migrations embedded: %v", err)
	}
	re := regexp.MustCompile(`^\d{5}_[a-z0-9_]+\.sql$`)
	for _, n := range names {
		if !re.MatchString(n) {
			t.Errorf("migration %q: want NNNNN_lower_snake.sql", n)
		}
	}
}

// TestUpDownUp applies every migration, rolls all of them back and applies
// them again in a fresh schema, so each Down section undoes its Up.
func TestUpDownUp(t *testing.T) {
	url := pgtest.URL(t)
	cc, err := pgx.ParseConfig(url)
	if err != nil {
		t.Fatal(err)
	}
	db := stdlib.OpenDB(*cc)
	defer db.Close()
	p, err := goose.NewProvider(goose.DialectPostgres, db, migrations.FS, goose.WithDisableGlobalRegistry(true))
	if err != nil {
		t.Fatal(err)
	}
	ctx := context.Background()
	if _, err := p.Up(ctx); err != nil {
		t.Fatalf("up: %v", err)
	}
	if _, err := p.DownTo(ctx, 0); err != nil {
		t.Fatalf("down: %v", err)
	}
	var tables int
	if err := db.QueryRowContext(ctx, `SELECT count(*) FROM pg_tables WHERE schemaname = current_schema() AND tablename <> 'goose_db_version'`).Scan(&tables); err != nil {
		t.Fatal(err)
	}
	if tables != 0 {
		t.Errorf("%d tables left after migrating down to 0", tables)
	}
	if _, err := p.Up(ctx); err != nil {
		t.Fatalf("up again: %v", err)
	}
	if v, err := p.GetDBVersion(ctx); err != nil || v != int64(len(p.ListSources())) {
		t.Errorf("version after up = %d, %v; want %d", v, err, len(p.ListSources()))
	}
}
