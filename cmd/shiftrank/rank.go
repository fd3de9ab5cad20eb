package main

import (
	"context"
	"errors"
)

// runRank is being written; this placeholder is replaced by its owner's first commit.
func runRank(ctx context.Context, args []string, e env) error {
	return errors.New("rank: not built yet")
}
