package store_test

import (
	"context"
	"encoding/json"
	"fmt"
	"time"

	"shiftrank/store"
)

// A job's life: submitted, claimed by a worker under a lease, finished with
// its result, read back by its owner.
func ExampleMemory() {
	ctx := context.Background()
	st := store.NewMemory()
	defer st.Close()

	job, created, _ := st.CreateJob(ctx, store.Job{
		Owner:          "k1",
		Request:        json.RawMessage(`{"formula":"C4H8O2","peaks":"4.12 (q, 2H), 2.05 (s, 3H), 1.26 (t, 3H)"}`),
		Reference:      "NB-0042",
		IdempotencyKey: "NB-0042-run-1",
	})
	fmt.Println(job.Status, created)

	claimed, _ := st.ClaimJob(ctx, "host-a/1", 30*time.Second)
	fmt.Println(claimed.ID == job.ID, claimed.Status, claimed.Attempts)

	_ = st.UpdateProgress(ctx, job.ID, "host-a/1", store.Progress{Generated: 12, Scored: 12, TotalEstimate: 12})
	_ = st.FinishJob(ctx, job.ID, "host-a/1", store.StatusSucceeded, "",
		&store.Result{IsomersTotal: 12, Body: json.RawMessage(`{"formula":"C4H8O2","candidates":[]}`)})

	done, _ := st.GetJob(ctx, "k1", job.ID)
	res, _ := st.GetResult(ctx, "k1", job.ID)
	fmt.Println(done.Status, res.IsomersTotal)

	_, err := st.GetJob(ctx, "k2", job.ID) // another key's job
	fmt.Println(err != nil)

	hist, _ := st.History(ctx, "k1", job.ID)
	for _, h := range hist {
		fmt.Println(h.Status, h.Note)
	}
	// Output:
	// queued true
	// true running 1
	// succeeded 12
	// true
	// queued created
	// running claimed (attempt 1)
	// succeeded succeeded
}
