package server_test

import (
	"context"
	"encoding/base64"
	"fmt"
	"net"
	"net/http"
	"net/http/httptest"
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"shiftrank/ranker"
	"shiftrank/server"
	"shiftrank/store"
)

// callbackHosts is the DNS of the callback tests: names of our own with
// the addresses they stand for.
func callbackHosts() *fakeResolver {
	return newFakeResolver(map[string][]string{
		"eln.example.org":  {"9.9.9.9"},
		"localhost":        {"127.0.0.1", "::1"},
		"metadata.example": {"169.254.169.254"},
		"mixed.example":    {"9.9.9.9", "10.0.0.1"},
		"db.example":       {"::ffff:10.1.2.3"},
		"lab-eln.internal": {"10.20.1.5"},
		"flaky.example":    nil, // a temporary DNS failure
	})
}

// TestCallbackTargetsAtSubmission: a job whose callback would reach a
// loopback, link-local, private, unique-local, multicast or unspecified
// address (in any of its spellings), or a non-standard port, is refused
// with a problem naming /callback_url, and nothing is stored.
func TestCallbackTargetsAtSubmission(t *testing.T) {
	forEachStore(t, func(t *testing.T, st testStore) {
		key, _, err := st.CreateAPIKey(context.Background(), "eln-callbacks")
		require.NoError(t, err)
		_, hs := startServer(t, st, &fakeRanker{}, server.Config{
			Workers: -1, Resolver: callbackHosts(),
			CallbackAllow: mustAllow(t, "10.20.0.0/16", "lab-eln.internal"),
		})
		c := client{t: t, base: hs.URL, key: key}
		accepted := 0
		for _, tc := range []struct {
			url    string
			status int
			detail string
		}{
			{"https://eln.example.org/hooks/shiftrank", 202, ""},
			{"http://eln.example.org:80/hook", 202, ""},
			{"https://9.9.9.9/hook", 202, ""},
			{"http://lab-eln.internal:8443/hook", 202, ""}, // allowed by name: any address, any port
			{"http://10.20.9.9:9000/hook", 202, ""},        // allowed by range
			{"http://169.254.169.254/latest/meta-data/", 400, "link-local"},
			{"http://[::ffff:169.254.169.254]/", 400, "link-local"},
			{"http://[::ffff:a9fe:a9fe]/", 400, "link-local"},
			{"http://[64:ff9b::a9fe:a9fe]/", 400, "NAT64"},
			{"http://metadata.example/", 400, "link-local"},
			{"http://10.0.0.1/", 400, "private"},
			{"http://10.21.0.1/", 400, "private"},
			{"http://192.168.1.1/", 400, "private"},
			{"http://db.example/", 400, "private"},
			{"http://mixed.example/", 400, "private"},
			{"http://0.0.0.0/", 400, "unspecified"},
			{"http://localhost/v1/jobs", 400, "loopback"},
			{"http://127.0.0.1:8080/v1/jobs", 400, "loopback"},
			{"http://[::1]/", 400, "loopback"},
			{"http://[fd00::1]/", 400, "unique-local"},
			{"http://[fe80::1]/", 400, "link-local"},
			{"http://224.0.0.1/", 400, "multicast"},
			{"https://eln.example.org:5432/", 400, "port 5432"},
			{"http://eln.example.org:99999/", 400, "outside 1..65535"},
			{"http://nxdomain.example/", 400, "does not resolve"},
			{"http://flaky.example/", 503, "cannot be resolved now"},
		} {
			job := ethanolJob()
			job["callback_url"] = tc.url
			r := c.do("POST", "/v1/jobs", job)
			if !assert.Equal(t, tc.status, r.status, "callback %s: %s", tc.url, r.body) {
				continue
			}
			if tc.status == 202 {
				accepted++
				continue
			}
			p := problemOf(t, r)
			if tc.status == 400 {
				require.Len(t, p.Errors, 1, "callback %s", tc.url)
				assert.Equal(t, "/callback_url", p.Errors[0].Field)
				assert.Contains(t, p.Errors[0].Detail, tc.detail, "callback %s", tc.url)
			} else {
				assert.Equal(t, server.CodeUnavailable, p.Code)
				assert.NotEmpty(t, r.header.Get("Retry-After"))
			}
		}
		var l server.JobList
		c.do("GET", "/v1/jobs?limit=100", nil).decode(t, &l)
		assert.Len(t, l.Jobs, accepted, "only the accepted jobs are stored")
	})
}

// TestCallbackRebindingRefusedAtConnect: a name that resolves to a public
// (and allowed) address when the job is submitted and to the loopback
// receiver when the callback is sent is refused at connect time; nothing
// reaches the receiver and the callback is settled, not retried.
func TestCallbackRebindingRefusedAtConnect(t *testing.T) {
	forEachStore(t, func(t *testing.T, st testStore) {
		key, k, err := st.CreateAPIKey(context.Background(), "eln-rebind")
		require.NoError(t, err)
		rc := &receiver{}
		recv := httptest.NewServer(rc)
		defer recv.Close()
		port := recv.Listener.Addr().(*net.TCPAddr).Port
		dns := newFakeResolver(map[string][]string{"rebind.example": {"9.9.9.9"}})
		dns.add("rebind.example", "127.0.0.1") // every later lookup
		// 9.9.9.9 is allowed on any port, so only the address can refuse it.
		_, hs := startServer(t, st, &fakeRanker{}, server.Config{Resolver: dns, CallbackAllow: mustAllow(t, "9.9.9.9")})
		c := client{t: t, base: hs.URL, key: key}
		job := ethanolJob()
		job["callback_url"] = fmt.Sprintf("http://rebind.example:%d/hook", port)
		r := c.do("POST", "/v1/jobs", job)
		require.Equal(t, http.StatusAccepted, r.status, "%s", r.body)
		var j server.JobView
		r.decode(t, &j)
		eventually(t, "callback settled", func() bool {
			got, err := st.GetJob(context.Background(), k.ID, j.ID)
			return err == nil && got.CallbackDone
		})
		assert.Zero(t, rc.count(), "a callback reached the loopback receiver")
		ds, err := st.Deliveries(context.Background(), j.ID)
		require.NoError(t, err)
		require.Len(t, ds, 1, "one refused attempt, not retried")
		assert.Contains(t, ds[0].Error, "loopback")
	})
}

// TestCallbackSecretRotation: after apikey rotate-secret the callbacks are
// signed with the new secret, with a timestamp, and the old one no longer
// verifies them.
func TestCallbackSecretRotation(t *testing.T) {
	forEachStore(t, func(t *testing.T, st testStore) {
		ctx := context.Background()
		key, old, err := st.CreateAPIKey(ctx, "eln-rotating")
		require.NoError(t, err)
		rotated, err := st.RotateAPIKeySecret(ctx, "eln-rotating")
		require.NoError(t, err)
		rc := &receiver{}
		recv := httptest.NewServer(rc)
		defer recv.Close()
		_, hs := startServer(t, st, &fakeRanker{}, server.Config{})
		c := client{t: t, base: hs.URL, key: key}
		job := ethanolJob()
		job["callback_url"] = recv.URL + "/hook"
		r := c.do("POST", "/v1/jobs", job)
		require.Equal(t, http.StatusAccepted, r.status, "%s", r.body)
		eventually(t, "callback received", func() bool { return rc.count() > 0 })
		rc.mu.Lock()
		defer rc.mu.Unlock()
		req, body := rc.reqs[0], rc.bodies[0]
		assert.NotEmpty(t, req.Header.Get(server.TimestampHeader))
		assert.True(t, signedBy(rotated.Secret, req, body), "not signed with the rotated secret")
		assert.False(t, signedBy(old.Secret, req, body), "still verifies with the secret before rotation")
	})
}

// TestRevokedKeyStopsWork: revoking a key cancels its queued job at once,
// stops its running job, and sends neither job's callback.
func TestRevokedKeyStopsWork(t *testing.T) {
	forEachStore(t, func(t *testing.T, st testStore) {
		ctx := context.Background()
		key, k, err := st.CreateAPIKey(ctx, "eln-revoked")
		require.NoError(t, err)
		rc := &receiver{}
		recv := httptest.NewServer(rc)
		defer recv.Close()
		rk := &fakeRanker{block: true}
		_, hs := startServer(t, st, rk, server.Config{Workers: 1})
		c := client{t: t, base: hs.URL, key: key}
		submit := func() server.JobView {
			job := ethanolJob()
			job["callback_url"] = recv.URL + "/hook"
			r := c.do("POST", "/v1/jobs", job)
			require.Equal(t, http.StatusAccepted, r.status, "%s", r.body)
			var j server.JobView
			r.decode(t, &j)
			return j
		}
		running := submit()
		eventually(t, "first job running", func() bool {
			j, err := st.GetJob(ctx, k.ID, running.ID)
			return err == nil && j.Status == store.StatusRunning
		})
		queued := submit()
		n, err := st.RevokeAPIKey(ctx, "eln-revoked")
		require.NoError(t, err)
		assert.Equal(t, 1, n, "queued jobs cancelled")
		q, err := st.GetJob(ctx, k.ID, queued.ID)
		require.NoError(t, err)
		assert.Equal(t, store.StatusCancelled, q.Status)
		eventually(t, "running job stopped and its callback settled", func() bool {
			j, err := st.GetJob(ctx, k.ID, running.ID)
			return err == nil && j.Status == store.StatusCancelled && j.CallbackDone && rk.stopped()
		})
		assert.Zero(t, rc.count(), "a revoked key's callback was sent")
		for _, id := range []string{running.ID, queued.ID} {
			ds, err := st.Deliveries(ctx, id)
			require.NoError(t, err)
			assert.Empty(t, ds, "delivery attempts of job %s", id)
		}
		assert.Equal(t, http.StatusUnauthorized, c.do("GET", "/v1/jobs", nil).status)
	})
}

// TestImpossibleRequestsRefused: what the ranker would refuse when it runs
// the job is refused at submission, with the field, and not stored.
func TestImpossibleRequestsRefused(t *testing.T) {
	forEachStore(t, func(t *testing.T, st testStore) {
		_, hs := startServer(t, st, ranker.New(ranker.Options{Workers: 1}), server.Config{AllowAnonymous: true, Workers: -1})
		c := client{t: t, base: hs.URL}
		long := strings.Repeat("x", 850)
		var many []string
		for i := range 1000 {
			many = append(many, fmt.Sprintf("%.2f (%s, 1H)", 1+float64(i)/100, long))
		}
		for _, tc := range []struct {
			name   string
			body   any
			field  string
			detail string
		}{
			{"no hydrogens", map[string]any{"formula": "N40", "peaks": "1.2 (s)"}, "/formula", "no hydrogens"},
			{"more heavy atoms than allowed", map[string]any{"formula": "C41H84", "peaks": "1.2 (s)"}, "/formula", ""},
			{"more peaks than H", map[string]any{"formula": "CH4O", "peaks": "3.4 (s, 3H), 1.1 (s, 1H), 2.0 (s), 4.0 (s), 5.0 (s)"}, "/peaks", "only 4 H"},
			{"1000 peaks with 850-character notes", map[string]any{"formula": "C2H6O", "peaks": strings.Join(many, ", ")}, "/peaks", "longer than"},
			{"a multiplicity that is not one", map[string]any{"formula": "C2H6O", "peaks": "1.2 (" + strings.Repeat("dt", 20) + ", 3H)"}, "/peaks", "not a multiplicity"},
			{"structured note too long", map[string]any{"formula": "C2H6O", "peaks": []map[string]any{{"shift": 1.2, "label": long}}}, "/peaks/0/label", "longer than"},
		} {
			r := c.do("POST", "/v1/jobs", tc.body)
			if !assert.Equal(t, http.StatusBadRequest, r.status, "%s: %.300s", tc.name, r.body) {
				continue
			}
			p := problemOf(t, r)
			require.NotEmpty(t, p.Errors, tc.name)
			assert.Equal(t, tc.field, p.Errors[0].Field, "%s: %s", tc.name, r.body)
			assert.Contains(t, p.Errors[0].Detail, tc.detail, tc.name)
		}
		var l server.JobList
		c.do("GET", "/v1/jobs", nil).decode(t, &l)
		assert.Empty(t, l.Jobs, "refused requests are not stored")
	})
}

// TestControlCharactersRefused: NUL and other control characters, and bytes
// that are not UTF-8, get a field-level 400 on both stores alike; text
// PostgreSQL can keep is accepted on both.
func TestControlCharactersRefused(t *testing.T) {
	forEachStore(t, func(t *testing.T, st testStore) {
		_, hs := startServer(t, st, &fakeRanker{}, server.Config{AllowAnonymous: true, Workers: -1})
		c := client{t: t, base: hs.URL}
		for _, tc := range []struct {
			name   string
			body   string
			status int
			field  string
		}{
			{"NUL in reference", `{"formula":"C2H6O","peaks":"1.2 (s, 6H)","reference":"NB\u0000-7"}`, 400, "/reference"},
			{"bell in reference", `{"formula":"C2H6O","peaks":"1.2 (s, 6H)","reference":"NB\u0007"}`, 400, "/reference"},
			{"C1 control in reference", `{"formula":"C2H6O","peaks":"1.2 (s, 6H)","reference":"NB\u0085"}`, 400, "/reference"},
			{"NUL in solvent", `{"formula":"C2H6O","peaks":"1.2 (s, 6H)","solvent":"CDCl3\u0000"}`, 400, "/solvent"},
			{"NUL in formula", `{"formula":"C2H6\u0000O","peaks":"1.2 (s, 6H)"}`, 400, "/formula"},
			{"NUL in peak text", `{"formula":"C2H6O","peaks":"1.2 (s, 6H)\u0000"}`, 400, "/peaks"},
			{"NUL in a structured peak", `{"formula":"C2H6O","peaks":[{"shift":1.2,"multiplicity":"s\u0000"}]}`, 400, "/peaks/0/multiplicity"},
			{"NUL in a fragment", `{"formula":"C2H6O","peaks":"1.2 (s, 6H)","options":{"require":["C\u0000O"]}}`, 400, "/options/require/0"},
			{"NUL in a member name", `{"formula":"C2H6O","peaks":"1.2 (s, 6H)","a\u0000":1}`, 400, "/a\x00"},
			{"raw bytes not UTF-8", "{\"formula\":\"C2H6O\",\"peaks\":\"1.2 (s, 6H)\",\"reference\":\"\xff\xfe\"}", 400, ""},
			{"line breaks in peak text", `{"formula":"C2H6O","peaks":"1.2 (s, 3H),\r\n\t3.7 (q, 2H)"}`, 202, ""},
			{"lone surrogate in a peak note", `{"formula":"C2H6O","peaks":[{"shift":1.2,"integral":6,"label":"H-1 \ud800"}]}`, 202, ""},
			{"lone surrogate in the reference", `{"formula":"C2H6O","peaks":"1.2 (s, 6H)","reference":"NB-7 \udc00"}`, 202, ""},
			{"a surrogate pair in the reference", `{"formula":"C2H6O","peaks":"1.2 (s, 6H)","reference":"\ud83e\uddea NB-7"}`, 202, ""},
		} {
			r := c.do("POST", "/v1/jobs", tc.body)
			if !assert.Equal(t, tc.status, r.status, "%s: %s", tc.name, r.body) || tc.status != 400 {
				continue
			}
			p := problemOf(t, r)
			require.NotEmpty(t, p.Errors, tc.name)
			assert.Equal(t, tc.field, p.Errors[0].Field, "%s: %s", tc.name, r.body)
		}
		cursor := base64.RawURLEncoding.EncodeToString([]byte("1234.\x00"))
		for _, tc := range []struct {
			path   string
			status int
		}{
			{"/v1/jobs/%00", 404},
			{"/v1/jobs/abc%00def", 404},
			{"/v1/jobs/%00/candidates", 404},
			{"/v1/jobs/%00/candidates/1", 404},
			{"/v1/jobs?cursor=" + cursor, 400},
			{"/v1/jobs?cursor=%00", 400},
		} {
			r := c.do("GET", tc.path, nil)
			assert.Equal(t, tc.status, r.status, "GET %s: %s", tc.path, r.body)
			problemOf(t, r)
		}
		r := c.do("POST", "/v1/jobs/%00/cancel", nil)
		assert.Equal(t, 404, r.status, "%s", r.body)
		// Go's client refuses to send a control character in a header.
		srv := server.New(quietLogger(t), st, &fakeRanker{}, fastConfig(server.Config{AllowAnonymous: true, Workers: -1}))
		r = serve(srv, "POST", "/v1/jobs", ethanolJob(), "Idempotency-Key", "nb\x01")
		assert.Equal(t, 400, r.status, "%s", r.body)
	})
}

// TestStrictJSON: member names are case-sensitive and appear once; numbers
// that do not fit say so; ports and chirality marks are checked.
func TestStrictJSON(t *testing.T) {
	_, hs := startServer(t, store.NewMemory(), &fakeRanker{}, server.Config{AllowAnonymous: true, Workers: -1, AnonymousSecret: []byte("0123456789abcdef"),
		Resolver: callbackHosts()})
	c := client{t: t, base: hs.URL}
	for _, tc := range []struct {
		name   string
		body   string
		field  string
		detail string
	}{
		{"upper-case member", `{"FORMULA":"C2H6O","formula":"C2H6O","peaks":"1.2 (s, 6H)"}`, "/FORMULA", `case-sensitive: "formula"`},
		{"mixed-case nested member", `{"formula":"C2H6O","peaks":"1.2 (s, 6H)","options":{"Top_K":3}}`, "/options/Top_K", "case-sensitive"},
		{"repeated member", `{"formula":"C2H6O","formula":"C3H8O","peaks":"1.2 (s, 6H)"}`, "/formula", "repeated member"},
		{"repeated nested member", `{"formula":"C2H6O","peaks":"1.2 (s, 6H)","options":{"top_k":3,"top_k":4}}`, "/options/top_k", "repeated member"},
		{"repeated member in a peak", `{"formula":"C2H6O","peaks":[{"shift":1.2,"shift":1.3}]}`, "/peaks/0/shift", "repeated"},
		{"integer too large", `{"formula":"C2H6O","peaks":"1.2 (s, 6H)","options":{"top_k":99999999999999999999}}`, "/options/top_k", "too large"},
		{"integer with a fraction", `{"formula":"C2H6O","peaks":"1.2 (s, 6H)","options":{"top_k":2.5}}`, "/options/top_k", "whole number"},
		{"float out of range", `{"formula":"C2H6O","peaks":"1.2 (s, 6H)","mhz":1e400}`, "/mhz", "out of range"},
		{"callback port out of range", `{"formula":"C2H6O","peaks":"1.2 (s, 6H)","callback_url":"https://eln.example.org:99999/"}`, "/callback_url", "outside 1..65535"},
		{"four chirality marks", `{"formula":"C2H6O","peaks":"1.2 (s, 6H)","options":{"require":["[C@@@@H](C)O"]}}`, "/options/require/0", "chirality"},
		{"unknown chirality class", `{"formula":"C2H6O","peaks":"1.2 (s, 6H)","options":{"forbid":["[C@TH3H](C)O"]}}`, "/options/forbid/0", "chirality"},
	} {
		r := c.do("POST", "/v1/jobs", tc.body)
		if !assert.Equal(t, http.StatusBadRequest, r.status, "%s: %s", tc.name, r.body) {
			continue
		}
		p := problemOf(t, r)
		require.NotEmpty(t, p.Errors, tc.name)
		assert.Equal(t, tc.field, p.Errors[0].Field, "%s: %s", tc.name, r.body)
		assert.Contains(t, p.Errors[0].Detail, tc.detail, "%s: %s", tc.name, r.body)
	}
	r := c.do("POST", "/v1/predict", `{"SMILES":"CCO"}`)
	assert.Equal(t, 400, r.status)
	r = c.do("POST", "/v1/isomers:count", `{"formula":"C4H10","formula":"C5H12"}`)
	assert.Equal(t, 400, r.status)
}

// TestProblemsEverywhere: errors outside /v1 and for unknown methods are
// problem documents too.
func TestProblemsEverywhere(t *testing.T) {
	srv := server.New(quietLogger(t), store.NewMemory(), &fakeRanker{}, fastConfig(server.Config{AllowAnonymous: true, Workers: -1}))
	for _, tc := range []struct {
		method, path string
		status       int
	}{
		{"GET", "/no-such-page", 404},
		{"GET", "/static/missing.js", 404},
		{"POST", "/", 405},
		{"DELETE", "/", 405},
		{"FOO", "/v1/jobs", 405},
		{"PATCH", "/v1/jobs", 405},
		{"GET", "/v1/nothing", 404},
		{"BREW", "/", 405},
	} {
		r := serve(srv, tc.method, tc.path, nil)
		assert.Equal(t, tc.status, r.status, "%s %s", tc.method, tc.path)
		problemOf(t, r)
	}
}

// TestAnonymousLocalMode: without a key, a request must be addressed to the
// listen address and come from no other origin; bodies must be JSON.
func TestAnonymousLocalMode(t *testing.T) {
	st := store.NewMemory()
	key, _, err := st.CreateAPIKey(context.Background(), "eln-local")
	require.NoError(t, err)
	srv := server.New(quietLogger(t), st, &fakeRanker{}, fastConfig(server.Config{AllowAnonymous: true, Workers: -1,
		AllowedHosts: []string{"127.0.0.1:8080", "localhost:8080", "[::1]:8080"}}))
	job := ethanolJob()
	for _, tc := range []struct {
		name         string
		method, path string
		body         any
		header       []string
		status       int
	}{
		{"own address", "GET", "/v1/jobs", nil, []string{"Host", "127.0.0.1:8080"}, 200},
		{"localhost, any case", "GET", "/v1/jobs", nil, []string{"Host", "LocalHost:8080"}, 200},
		{"IPv6 loopback", "GET", "/v1/jobs", nil, []string{"Host", "[::1]:8080"}, 200},
		{"rebound name", "GET", "/v1/jobs", nil, []string{"Host", "attacker.example:8080"}, 403},
		{"other port", "GET", "/v1/jobs", nil, []string{"Host", "127.0.0.1:9090"}, 403},
		{"same-origin POST", "POST", "/v1/jobs", job, []string{"Origin", "http://127.0.0.1:8080"}, 202},
		{"cross-site POST", "POST", "/v1/jobs", job, []string{"Origin", "http://attacker.example"}, 403},
		{"opaque origin", "POST", "/v1/jobs", job, []string{"Origin", "null"}, 403},
		{"no content type", "POST", "/v1/jobs", job, []string{"Content-Type", ""}, 415},
		{"form content type", "POST", "/v1/jobs", job, []string{"Content-Type", "application/x-www-form-urlencoded"}, 415},
		{"text content type", "POST", "/v1/jobs", job, []string{"Content-Type", "text/plain"}, 415},
		{"cross-site cancel", "POST", "/v1/jobs/" + strings.Repeat("a", 26) + "/cancel", nil, []string{"Origin", "http://attacker.example"}, 403},
		{"with a key, any host", "GET", "/v1/jobs", nil, []string{"Host", "nmr.example.org", "Authorization", "Bearer " + key}, 200},
	} {
		r := serve(srv, tc.method, tc.path, tc.body, tc.header...)
		assert.Equal(t, tc.status, r.status, "%s: %s", tc.name, r.body)
		if tc.status >= 400 {
			p := problemOf(t, r)
			if tc.status == 403 {
				assert.Equal(t, server.CodeForbidden, p.Code, tc.name)
			}
		}
	}
}

// unavailableStore answers as a store whose database cannot be reached.
type unavailableStore struct{ *store.Memory }

var errDown = fmt.Errorf("connect to 10.0.0.5:5432: %w", store.ErrUnavailable)

func (unavailableStore) SubmitJob(context.Context, store.Job, int) (store.Job, bool, error) {
	return store.Job{}, false, errDown
}
func (unavailableStore) GetJob(context.Context, string, string) (store.Job, error) {
	return store.Job{}, errDown
}
func (unavailableStore) ListJobs(context.Context, string, int, string) ([]store.Job, string, error) {
	return nil, "", errDown
}
func (unavailableStore) LookupAPIKey(context.Context, string) (store.APIKey, error) {
	return store.APIKey{}, errDown
}
func (unavailableStore) Ping(context.Context) error { return errDown }

// TestStoreUnavailable: a store that cannot be reached answers 503
// unavailable with Retry-After on every path that needs it, never 500.
func TestStoreUnavailable(t *testing.T) {
	check := func(t *testing.T, h http.Handler, key string) {
		t.Helper()
		auth := []string{}
		if key != "" {
			auth = []string{"Authorization", "Bearer " + key}
		}
		for _, tc := range []struct{ method, path string }{
			{"POST", "/v1/jobs"},
			{"GET", "/v1/jobs"},
			{"GET", "/v1/jobs/" + strings.Repeat("b", 26)},
			{"GET", "/readyz"},
		} {
			var body any
			if tc.method == "POST" {
				body = ethanolJob()
			}
			r := serve(h, tc.method, tc.path, body, auth...)
			if assert.Equal(t, http.StatusServiceUnavailable, r.status, "%s %s: %s", tc.method, tc.path, r.body) {
				p := problemOf(t, r)
				assert.Equal(t, server.CodeUnavailable, p.Code)
				if tc.path != "/readyz" {
					assert.NotEmpty(t, r.header.Get("Retry-After"), "%s %s", tc.method, tc.path)
				}
			}
		}
	}
	t.Run("memory", func(t *testing.T) {
		srv := server.New(quietLogger(t), unavailableStore{store.NewMemory()}, &fakeRanker{}, fastConfig(server.Config{AllowAnonymous: true, Workers: -1}))
		check(t, srv, "")
		check(t, srv, "sr_somekey")
	})
	t.Run("postgres", func(t *testing.T) {
		url, proxy := postgresBehindProxy(t)
		st, err := store.Open(context.Background(), url)
		require.NoError(t, err)
		t.Cleanup(st.Close)
		key, _, err := st.CreateAPIKey(context.Background(), "eln-outage")
		require.NoError(t, err)
		srv := server.New(quietLogger(t), st, &fakeRanker{}, fastConfig(server.Config{Workers: -1}))
		require.Equal(t, http.StatusOK, serve(srv, "GET", "/v1/jobs", nil, "Authorization", "Bearer "+key).status)
		proxy.cut() // the database goes away
		check(t, srv, key)
		r := serve(srv, "GET", "/v1/jobs", nil, "Authorization", "Bearer "+key)
		assert.NotContains(t, string(r.body), "127.0.0.1", "details of the outage are logged, not sent")
	})
}

// TestBothStoresAnswerAlike: text that PostgreSQL cannot keep as such gets
// the same answer from both stores (FuzzAPIRequests checks the same on
// arbitrary bodies).
func TestBothStoresAnswerAlike(t *testing.T) {
	bodies := []string{
		`{"formula":"C2H6O","peaks":"1.2 (s, 6H)","reference":"NB\u0000"}`,
		`{"formula":"C2H6O","peaks":"1.2 (s, 6H) \udfff"}`,
		`{"formula":"C2H6O","peaks":[{"shift":1.2,"label":"\ud800\u0041"}]}`,
		`{"formula":"C2H6O","peaks":"1.2 (s, 6H)","reference":"\ud83e\uddea"}`,
		"{\"formula\":\"C2H6O\",\"peaks\":\"1.2 (s, 6H)\",\"reference\":\"\xc3\x28\"}",
		`{"formula":"C2H6O","peaks":"1.2 (s, 6H)","solvent":"\u0000"}`,
	}
	status := map[string][]int{}
	forEachStore(t, func(t *testing.T, st testStore) {
		srv := server.New(quietLogger(t), st, &fakeRanker{}, fastConfig(server.Config{AllowAnonymous: true, Workers: -1}))
		var got []int
		for _, b := range bodies {
			r := serve(srv, "POST", "/v1/jobs", b)
			require.Less(t, r.status, 500, "%s: %s", b, r.body)
			got = append(got, r.status)
		}
		status[t.Name()] = got
	})
	if len(status) == 2 {
		var all [][]int
		for _, v := range status {
			all = append(all, v)
		}
		assert.Equal(t, all[0], all[1], "the two stores answer differently: %v", status)
	}
}
