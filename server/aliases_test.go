package server_test

import "shiftrank/ranker"

type (
	rankerRequest  = ranker.Request
	rankerProgress = ranker.Progress
	rankerResult   = ranker.Result
)
