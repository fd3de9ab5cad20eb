package server

import (
	"context"
	"errors"
	"fmt"
	"net"
	"net/http"
	"net/netip"
	"net/url"
	"strconv"
	"strings"
	"syscall"
	"time"
)

// Callback targets. A callback is a POST the service makes on behalf of a
// client to a URL the client chose, so without care it could reach what
// only the service can reach: its own API, the database, a cloud metadata
// address, hosts on the internal network. The rules, applied when a job is
// submitted and again to the exact address each connection is made to
// (after name resolution, so a name that resolves to a public address at
// submission and to a private one later is still refused):
//
//   - only public unicast addresses: not loopback, link-local, private,
//     unique-local, multicast, unspecified, shared (carrier-grade NAT),
//     documentation, benchmarking or reserved ranges, in IPv4, IPv6, and
//     IPv4 addresses written inside IPv6 (mapped, compatible, NAT64, 6to4,
//     Teredo);
//   - only the standard ports, 80 and 443;
//   - redirects are never followed, and no proxy from the environment is
//     used.
//
// An operator may allow targets outside these rules with
// Config.CallbackAllow (an electronic lab notebook on the internal
// network): an allowed host name, or an address inside an allowed range,
// may be any address and use any port.

// CallbackAllow lists the callback targets an operator allows besides
// public addresses on standard ports: host names (exact, or "*.lab.example"
// for every name below lab.example), IP addresses and CIDR ranges. The zero
// value allows none. Build it with ParseCallbackAllow.
type CallbackAllow struct {
	names    []string // lower case, without a trailing dot
	suffixes []string // ".lab.example" for "*.lab.example"
	prefixes []netip.Prefix
}

// ParseCallbackAllow reads callback-allow entries: host names, "*.domain"
// patterns, IP addresses (IPv6 with or without brackets) and CIDR ranges
// ("10.20.0.0/16", "fd00:1::/48"). Empty entries are skipped. An entry
// that is none of these is an error naming it.
func ParseCallbackAllow(entries []string) (CallbackAllow, error) {
	var a CallbackAllow
	for _, e := range entries {
		e = strings.TrimSpace(e)
		if e == "" {
			continue
		}
		if p, err := netip.ParsePrefix(e); err == nil {
			a.prefixes = append(a.prefixes, p.Masked())
			continue
		}
		if ip, err := netip.ParseAddr(strings.Trim(e, "[]")); err == nil {
			ip = ip.WithZone("").Unmap()
			a.prefixes = append(a.prefixes, netip.PrefixFrom(ip, ip.BitLen()))
			continue
		}
		name := normalizeHost(e)
		if ip, err := netip.ParseAddr(name); err == nil { // "10.0.0.1." is an address too
			ip = ip.WithZone("").Unmap()
			a.prefixes = append(a.prefixes, netip.PrefixFrom(ip, ip.BitLen()))
			continue
		}
		wild := strings.HasPrefix(name, "*.")
		if !validHostName(strings.TrimPrefix(name, "*.")) {
			return CallbackAllow{}, fmt.Errorf("callback allow entry %q is not a host name, *.domain, IP address or CIDR range", e)
		}
		if wild {
			a.suffixes = append(a.suffixes, name[1:])
		} else {
			a.names = append(a.names, name)
		}
	}
	return a, nil
}

// String lists the entries, for the log.
func (a CallbackAllow) String() string {
	var out []string
	out = append(out, a.names...)
	for _, s := range a.suffixes {
		out = append(out, "*"+s)
	}
	for _, p := range a.prefixes {
		out = append(out, p.String())
	}
	return strings.Join(out, ",")
}

// allowsHost reports whether the normalised host name is allowed by name.
func (a CallbackAllow) allowsHost(host string) bool {
	for _, n := range a.names {
		if host == n {
			return true
		}
	}
	for _, s := range a.suffixes {
		if strings.HasSuffix(host, s) && len(host) > len(s) {
			return true
		}
	}
	return false
}

// allowsAddr reports whether ip lies in an allowed range.
func (a CallbackAllow) allowsAddr(ip netip.Addr) bool {
	ip = ip.WithZone("").Unmap()
	for _, p := range a.prefixes {
		if p.Contains(ip) {
			return true
		}
	}
	return false
}

// TargetError is a callback target the rules refuse: Reason says why
// ("a loopback address", "port 8080").
type TargetError struct {
	Host   string
	Addr   netip.Addr // invalid when the port alone is refused before resolution
	Port   uint16
	Reason string
}

func (e *TargetError) Error() string {
	if e.Addr.IsValid() && e.Addr.String() != e.Host {
		return fmt.Sprintf("callback host %s resolves to %s, %s", e.Host, e.Addr, e.Reason)
	}
	return fmt.Sprintf("callback target %s: %s", net.JoinHostPort(e.Host, strconv.Itoa(int(e.Port))), e.Reason)
}

// check applies the rules to one address of host on port.
func (a CallbackAllow) check(host string, ip netip.Addr, port uint16) error {
	if a.allowsHost(host) || a.allowsAddr(ip) {
		return nil
	}
	if why := refusedAddr(ip); why != "" {
		return &TargetError{Host: host, Addr: ip, Port: port, Reason: why + "; callbacks go to public addresses only, unless the operator allows the host (--callback-allow)"}
	}
	if port != 80 && port != 443 {
		return &TargetError{Host: host, Addr: ip, Port: port, Reason: fmt.Sprintf("port %d is not a standard web port; callbacks use 80 (http) or 443 (https) unless the operator allows the host (--callback-allow)", port)}
	}
	return nil
}

// Special-purpose ranges that refusedAddr names beyond what netip.Addr's
// own predicates cover (IANA IPv4 and IPv6 Special-Purpose Address
// Registries, RFC 6890 and its updates).
var specialRanges = []struct {
	prefix netip.Prefix
	why    string
}{
	{netip.MustParsePrefix("0.0.0.0/8"), "a \"this network\" address"},
	{netip.MustParsePrefix("100.64.0.0/10"), "a shared (carrier-grade NAT) address"},
	{netip.MustParsePrefix("192.0.0.0/24"), "an IETF protocol assignment address"},
	{netip.MustParsePrefix("192.0.2.0/24"), "a documentation address"},
	{netip.MustParsePrefix("198.51.100.0/24"), "a documentation address"},
	{netip.MustParsePrefix("203.0.113.0/24"), "a documentation address"},
	{netip.MustParsePrefix("198.18.0.0/15"), "a benchmarking address"},
	{netip.MustParsePrefix("240.0.0.0/4"), "a reserved or broadcast address"},
	{netip.MustParsePrefix("::/96"), "an IPv4-compatible or reserved IPv6 address"},
	{netip.MustParsePrefix("100::/64"), "a discard-only IPv6 address"},
	{netip.MustParsePrefix("2001:db8::/32"), "a documentation address"},
	{netip.MustParsePrefix("2001::/32"), "a Teredo address (it hides an IPv4 address)"},
	{netip.MustParsePrefix("fec0::/10"), "a site-local address"},
}

// Ranges of IPv6 addresses that carry an IPv4 address, and where: NAT64
// (RFC 6052, the last 32 bits) and 6to4 (RFC 3056, bits 16 to 47).
var (
	nat64Prefixes = []netip.Prefix{netip.MustParsePrefix("64:ff9b::/96"), netip.MustParsePrefix("64:ff9b:1::/48")}
	sixToFour     = netip.MustParsePrefix("2002::/16")
)

// refusedAddr says why ip may not receive callbacks ("a loopback address"),
// or returns "" when it is a public unicast address. An IPv4 address
// written inside an IPv6 one (mapped, NAT64, 6to4) is judged as the IPv4
// address.
func refusedAddr(ip netip.Addr) string {
	ip = ip.WithZone("").Unmap()
	switch {
	case !ip.IsValid():
		return "not an IP address"
	case ip.IsUnspecified():
		return "the unspecified address"
	case ip.IsLoopback():
		return "a loopback address"
	case ip.IsLinkLocalUnicast():
		return "a link-local address"
	case ip.IsMulticast():
		return "a multicast address"
	case ip.IsPrivate() && ip.Is4():
		return "a private address"
	case ip.IsPrivate():
		return "a unique-local address"
	}
	if ip.Is6() {
		b := ip.As16()
		for _, p := range nat64Prefixes {
			if p.Contains(ip) {
				if why := refusedAddr(netip.AddrFrom4([4]byte(b[12:16]))); why != "" {
					return why + " (inside a NAT64 address)"
				}
			}
		}
		if sixToFour.Contains(ip) {
			if why := refusedAddr(netip.AddrFrom4([4]byte(b[2:6]))); why != "" {
				return why + " (inside a 6to4 address)"
			}
		}
	}
	for _, r := range specialRanges {
		if r.prefix.Contains(ip) {
			return r.why
		}
	}
	if !ip.IsGlobalUnicast() {
		return "not a global unicast address"
	}
	return ""
}

// normalizeHost lower-cases a host name and drops a trailing dot.
func normalizeHost(h string) string {
	return strings.TrimSuffix(strings.ToLower(h), ".")
}

// validHostName reports whether h is a DNS host name: dot-separated labels
// of letters, digits and inner hyphens, each 1-63 characters.
func validHostName(h string) bool {
	if h == "" || len(h) > 253 {
		return false
	}
	for _, label := range strings.Split(h, ".") {
		if label == "" || len(label) > 63 || label[0] == '-' || label[len(label)-1] == '-' {
			return false
		}
		for i := 0; i < len(label); i++ {
			c := label[i]
			if !(c >= 'a' && c <= 'z' || c >= '0' && c <= '9' || c == '-' || c == '_') {
				return false
			}
		}
	}
	return true
}

// Resolver looks up the addresses of a host name; *net.Resolver implements
// it. Config.Resolver lets tests answer for names of their own.
type Resolver interface {
	LookupNetIP(ctx context.Context, network, host string) ([]netip.Addr, error)
}

// resolveTimeout bounds one name lookup for a callback target.
const resolveTimeout = 5 * time.Second

// errNoSuchHost: the callback host has no addresses.
var errNoSuchHost = errors.New("no such host")

// resolve returns the addresses of host (an IP literal is its own).
func (s *Server) resolve(ctx context.Context, host string) ([]netip.Addr, error) {
	if ip, err := netip.ParseAddr(host); err == nil {
		return []netip.Addr{ip}, nil
	}
	ctx, cancel := context.WithTimeout(ctx, resolveTimeout)
	defer cancel()
	addrs, err := s.cfg.Resolver.LookupNetIP(ctx, "ip", host)
	var de *net.DNSError
	if errors.As(err, &de) && de.IsNotFound || err == nil && len(addrs) == 0 {
		return nil, fmt.Errorf("callback host %s: %w", host, errNoSuchHost)
	}
	if err != nil {
		return nil, fmt.Errorf("resolve callback host %s: %w", host, err)
	}
	return addrs, nil
}

// checkURLHostPort checks the host and port of a callback URL as written:
// a host name or IP address, and a port, if any, within 1..65535.
func checkURLHostPort(u *url.URL) error {
	host := normalizeHost(u.Hostname())
	if _, err := netip.ParseAddr(host); err != nil && !validHostName(host) {
		return fmt.Errorf("host %q is not a host name or IP address", u.Hostname())
	}
	if p := u.Port(); p != "" {
		if n, err := strconv.Atoi(p); err != nil || n < 1 || n > 65535 {
			return fmt.Errorf("port %s is outside 1..65535", p)
		}
	}
	return nil
}

// urlPort returns the port of an http or https URL, its scheme's default
// when none is written.
func urlPort(u *url.URL) uint16 {
	if p, err := strconv.ParseUint(u.Port(), 10, 16); err == nil {
		return uint16(p)
	}
	if u.Scheme == "https" {
		return 443
	}
	return 80
}

// checkCallbackTarget applies the callback target rules to a syntactically
// valid callback URL at submission: it resolves the host and checks every
// address it has. A refused target is a field error on /callback_url; a
// lookup that fails for another reason than a missing name is a 503.
func (s *Server) checkCallbackTarget(ctx context.Context, raw string) error {
	u, err := url.Parse(raw)
	if err != nil {
		return invalidFields([]FieldError{{Field: "/callback_url", Detail: "not a valid URL"}})
	}
	host, port := normalizeHost(u.Hostname()), urlPort(u)
	addrs, err := s.resolve(ctx, host)
	switch {
	case errors.Is(err, errNoSuchHost):
		return invalidFields([]FieldError{{Field: "/callback_url", Detail: fmt.Sprintf("host %q does not resolve", host), Token: host}})
	case err != nil:
		return &Error{Code: CodeUnavailable, Detail: "the callback host cannot be resolved now; retry later", Err: err, RetryAfter: storeRetryAfter}
	}
	for _, ip := range addrs {
		if err := s.cfg.CallbackAllow.check(host, ip, port); err != nil {
			return invalidFields([]FieldError{{Field: "/callback_url", Detail: err.Error(), Token: host}})
		}
	}
	return nil
}

// callbackTransport is the transport of the default callback client: every
// connection goes through dialCallback, no proxy is used.
func (s *Server) callbackTransport() *http.Transport {
	return &http.Transport{
		Proxy:                 nil,
		DialContext:           s.dialCallback,
		ForceAttemptHTTP2:     true,
		TLSHandshakeTimeout:   s.cfg.CallbackTimeout,
		ResponseHeaderTimeout: s.cfg.CallbackTimeout,
		MaxIdleConnsPerHost:   2,
		IdleConnTimeout:       90 * time.Second,
	}
}

// dialCallback connects to a callback host: it resolves the name itself,
// skips the addresses the rules refuse, and dials the others by address
// through a dialer whose Control checks the very address of the socket
// once more. No second lookup happens between the check and the connect,
// so a name that changes its answer (DNS rebinding) cannot slip through.
func (s *Server) dialCallback(ctx context.Context, network, addr string) (net.Conn, error) {
	h, p, err := net.SplitHostPort(addr)
	if err != nil {
		return nil, fmt.Errorf("callback address %q: %w", addr, err)
	}
	port, err := strconv.ParseUint(p, 10, 16)
	if err != nil {
		return nil, fmt.Errorf("callback address %q: bad port", addr)
	}
	host := normalizeHost(h)
	addrs, err := s.resolve(ctx, host)
	if err != nil {
		return nil, err
	}
	var firstErr error
	for _, ip := range addrs {
		if err := s.cfg.CallbackAllow.check(host, ip, uint16(port)); err != nil {
			firstErr = firstOf(firstErr, err)
			continue
		}
		d := net.Dialer{Timeout: s.cfg.CallbackTimeout, Control: s.cfg.CallbackAllow.control(host)}
		c, err := d.DialContext(ctx, network, netip.AddrPortFrom(ip.WithZone(""), uint16(port)).String())
		if err == nil {
			return c, nil
		}
		firstErr = firstOf(firstErr, err)
	}
	return nil, firstErr
}

// firstOf returns first if it is set, else err.
func firstOf(first, err error) error {
	if first != nil {
		return first
	}
	return err
}

// control returns a net.Dialer Control that refuses a socket about to
// connect to an address the rules refuse for host.
func (a CallbackAllow) control(host string) func(network, address string, _ syscall.RawConn) error {
	return func(network, address string, _ syscall.RawConn) error {
		ap, err := netip.ParseAddrPort(address)
		if err != nil {
			return fmt.Errorf("callback connection to %q: not an address", address)
		}
		return a.check(host, ap.Addr(), ap.Port())
	}
}
