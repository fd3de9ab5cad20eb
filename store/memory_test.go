package store_test

import (
	"testing"

	"shiftrank/store"
	"shiftrank/store/storetest"
)

func TestMemory(t *testing.T) {
	storetest.Run(t, func(t *testing.T) storetest.Store { return store.NewMemory() })
}
