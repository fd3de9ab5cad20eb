package server

import (
	"net"
	"net/http"
	"net/url"
	"strings"
)

// Anonymous local mode. Without an API key the service trusts whoever can
// reach it, which on a loopback address means the user at the machine, and
// any web page that user's browser opens: a page of another site may POST
// to http://127.0.0.1:8080, and a name it controls may be rebound to
// 127.0.0.1 so that the browser treats the service as that site's own
// (DNS rebinding) and lets the page read the answers. The defences, on
// anonymous requests:
//
//   - a request body must be sent as Content-Type: application/json (see
//     decodeJSON), which a page of another site cannot send without the
//     browser asking first (a CORS preflight, which this service never
//     grants);
//   - the Host header must be one of Config.AllowedHosts (the listen
//     address under its loopback names), which a rebound name is not;
//   - an Origin header, which browsers send with cross-site requests and
//     with every POST, must name one of Config.AllowedHosts.

// checkLocalRequest applies the Host and Origin checks to an anonymous
// request; nil when Config.AllowedHosts is empty.
func (s *Server) checkLocalRequest(r *http.Request) error {
	if len(s.cfg.AllowedHosts) == 0 {
		return nil
	}
	if !s.allowedHost(r.Host, "http") {
		return errorf(CodeForbidden, "anonymous requests must be addressed to this server's own address (Host %q is not one); use an API key, or the address the server listens on", r.Host)
	}
	if o := r.Header.Get("Origin"); o != "" {
		u, err := url.Parse(o)
		if err != nil || u.Host == "" || !s.allowedHost(u.Host, u.Scheme) {
			return errorf(CodeForbidden, "anonymous requests from a page of another origin (%q) are refused; use an API key", o)
		}
	}
	return nil
}

// allowedHost reports whether hostport (a Host header or an origin's host,
// the port defaulting to scheme's) is one of Config.AllowedHosts.
func (s *Server) allowedHost(hostport, scheme string) bool {
	want := canonicalHostPort(hostport, scheme)
	for _, h := range s.cfg.AllowedHosts {
		if canonicalHostPort(h, "http") == want {
			return true
		}
	}
	return false
}

// canonicalHostPort lower-cases host:port and adds the scheme's default
// port when none is given ("LOCALHOST" → "localhost:80").
func canonicalHostPort(hostport, scheme string) string {
	hostport = strings.ToLower(hostport)
	host, port, err := net.SplitHostPort(hostport)
	if err != nil {
		host, port = strings.Trim(hostport, "[]"), "80"
		if scheme == "https" {
			port = "443"
		}
	}
	return net.JoinHostPort(strings.TrimSuffix(host, "."), port)
}
