package main

import (
	"context"
	"errors"
)

// runPredict is being written; this placeholder is replaced by its owner's first commit.
func runPredict(ctx context.Context, args []string, e env) error {
	return errors.New("predict: not built yet")
}
