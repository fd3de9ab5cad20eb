// Package migrations holds shiftrank's PostgreSQL schema as goose SQL
// migrations (numbered files NNNNN_name.sql with -- +goose Up / Down
// sections), embedded in the binary. store.Open applies them with goose v3
// on start; add a new numbered file to change the schema, never edit one
// that has been released.
package migrations

import "embed"

// FS holds the migration files, at its root. It is read-only.
//
//go:embed *.sql
var FS embed.FS
