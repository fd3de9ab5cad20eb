package main

import (
	"context"
	"errors"
)

// runAPIKey is being written; this placeholder is replaced by its owner's first commit.
func runAPIKey(ctx context.Context, args []string, e env) error {
	return errors.New("apikey: not built yet")
}
