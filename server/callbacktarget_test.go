package server

import (
	"net/netip"
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// TestRefusedAddr checks the address classes refused as callback targets.
// Ranges: IANA IPv4 and IPv6 Special-Purpose Address Registries (RFC 6890,
// RFC 1918 private, RFC 3927 link-local, RFC 4193 unique-local, RFC 6598
// shared, RFC 5737 and RFC 3849 documentation, RFC 2544 benchmarking, RFC
// 4291 mapped and compatible forms, RFC 6052 NAT64, RFC 3056 6to4, RFC 4380
// Teredo).
func TestRefusedAddr(t *testing.T) {
	for _, tc := range []struct {
		addr string
		want string // a word of the reason; "" for allowed
	}{
		{"169.254.169.254", "link-local"},        // cloud metadata
		{"::ffff:169.254.169.254", "link-local"}, // the same, IPv4-mapped
		{"::ffff:127.0.0.1", "loopback"},
		{"127.0.0.1", "loopback"},
		{"127.255.0.9", "loopback"},
		{"::1", "loopback"},
		{"0.0.0.0", "unspecified"},
		{"::", "unspecified"},
		{"0.1.2.3", "this network"},
		{"10.0.0.1", "private"},
		{"172.16.5.4", "private"},
		{"172.31.255.255", "private"},
		{"192.168.1.1", "private"},
		{"fd00::1", "unique-local"},
		{"fc00::5", "unique-local"},
		{"fe80::1", "link-local"},
		{"224.0.0.1", "multicast"},
		{"239.255.255.250", "multicast"},
		{"ff02::1", "multicast"},
		{"100.64.0.1", "shared"},
		{"192.0.2.10", "documentation"},
		{"198.51.100.7", "documentation"},
		{"203.0.113.9", "documentation"},
		{"2001:db8::1", "documentation"},
		{"198.18.0.1", "benchmarking"},
		{"255.255.255.255", "broadcast"},
		{"240.0.0.1", "reserved"},
		{"::127.0.0.1", "IPv4-compatible"},
		{"64:ff9b::a9fe:a9fe", "NAT64"}, // 169.254.169.254 through NAT64
		{"64:ff9b::7f00:1", "NAT64"},    // 127.0.0.1 through NAT64
		{"2002:7f00:1::1", "6to4"},      // 127.0.0.1 through 6to4
		{"2002:c0a8:101::1", "6to4"},    // 192.168.1.1 through 6to4
		{"2001:0:4136:e378:8000:63bf:3fff:fdd2", "Teredo"},
		{"fec0::1", "site-local"},
		{"9.9.9.9", ""},
		{"1.1.1.1", ""},
		{"172.32.0.1", ""}, // just outside 172.16/12
		{"2606:4700:4700::1111", ""},
		{"64:ff9b::909:909", ""}, // 9.9.9.9 through NAT64
		{"2002:909:909::1", ""},  // 9.9.9.9 through 6to4
	} {
		got := refusedAddr(netip.MustParseAddr(tc.addr))
		if tc.want == "" {
			assert.Empty(t, got, "refusedAddr(%s): a public address", tc.addr)
			continue
		}
		assert.Contains(t, got, tc.want, "refusedAddr(%s)", tc.addr)
	}
}

func TestParseCallbackAllow(t *testing.T) {
	a, err := ParseCallbackAllow([]string{"eln.lab.internal", " *.nmr.internal ", "10.20.0.0/16", "192.168.7.7", "[fd00:1::5]", "", "ELN2.Lab.Internal."})
	require.NoError(t, err)
	for _, tc := range []struct {
		host string
		addr string
		port uint16
		ok   bool
	}{
		{"eln.lab.internal", "10.9.9.9", 8443, true},
		{"eln2.lab.internal", "127.0.0.1", 9000, true},
		{"a.nmr.internal", "10.1.1.1", 8080, true},
		{"nmr.internal", "10.1.1.1", 443, false}, // the pattern covers names below it only
		{"other.internal", "10.20.3.4", 8080, true},
		{"other.internal", "10.21.3.4", 443, false},
		{"other.internal", "192.168.7.7", 80, true},
		{"other.internal", "::ffff:192.168.7.7", 80, true},
		{"other.internal", "fd00:1::5", 80, true},
		{"public.example", "9.9.9.9", 443, true},
		{"public.example", "9.9.9.9", 80, true},
		{"public.example", "9.9.9.9", 8080, false},
		{"public.example", "9.9.9.9", 5432, false},
	} {
		err := a.check(tc.host, netip.MustParseAddr(tc.addr), tc.port)
		assert.Equal(t, tc.ok, err == nil, "check(%s, %s, %d) = %v", tc.host, tc.addr, tc.port, err)
	}
	for _, bad := range []string{"eln lab", "http://eln.lab", "10.0.0.0/33", "-x.example", "*.", "a..b"} {
		_, err := ParseCallbackAllow([]string{bad})
		assert.Error(t, err, "ParseCallbackAllow(%q)", bad)
	}
	assert.Equal(t, "eln.lab.internal,eln2.lab.internal,*.nmr.internal,10.20.0.0/16,192.168.7.7/32,fd00:1::5/128", a.String())
}

// TestDialControl checks the Control that every callback socket passes
// before it connects: it sees the address actually dialled, whatever the
// name resolved to before.
func TestDialControl(t *testing.T) {
	a, err := ParseCallbackAllow([]string{"10.20.0.0/16"})
	require.NoError(t, err)
	for _, tc := range []struct {
		host, address string
		ok            bool
	}{
		{"eln.example.org", "9.9.9.9:443", true},
		{"eln.example.org", "127.0.0.1:443", false},
		{"eln.example.org", "[::ffff:127.0.0.1]:443", false},
		{"eln.example.org", "[::1]:80", false},
		{"eln.example.org", "169.254.169.254:80", false},
		{"eln.example.org", "9.9.9.9:5432", false},
		{"eln.example.org", "10.20.1.1:8443", true},
		{"eln.example.org", "not an address", false},
	} {
		err := a.control(tc.host)("tcp", tc.address, nil)
		assert.Equal(t, tc.ok, err == nil, "control(%s, %s) = %v", tc.host, tc.address, err)
	}
}

func TestCheckCallbackURLSyntax(t *testing.T) {
	for _, tc := range []struct {
		url, want string
	}{
		{"https://eln.example.org/hook", ""},
		{"https://eln.example.org:443/hook", ""},
		{"http://[2606:4700:4700::1111]/hook", ""},
		{"http://eln.example.org:99999/hook", "outside 1..65535"},
		{"http://eln.example.org:0/hook", "outside 1..65535"},
		{"ftp://eln.example.org/", "http or https"},
		{"https://user:pw@eln.example.org/", "user information"},
		{"https://eln_example..org/", "not a host name"},
		{"/hook", "http or https"},
		{"https:///hook", "with a host"},
	} {
		err := checkCallbackURL(tc.url)
		if tc.want == "" {
			assert.NoError(t, err, tc.url)
			continue
		}
		if assert.Error(t, err, tc.url) {
			assert.True(t, strings.Contains(err.Error(), tc.want), "checkCallbackURL(%q) = %v, want %q", tc.url, err, tc.want)
		}
	}
}

// FuzzParseCallbackAllow: any entry list parses or fails with an error, and
// a parsed list written out with String parses back to the same list.
func FuzzParseCallbackAllow(f *testing.F) {
	for _, s := range []string{"eln.lab.internal", "*.nmr.internal", "10.20.0.0/16", "[fd00::1]", "192.168.7.7", "::ffff:10.0.0.1/104", "a..b", "*.", " ", "ELN.Lab."} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		a, err := ParseCallbackAllow(strings.Split(s, ","))
		if err != nil {
			return
		}
		b, err := ParseCallbackAllow(strings.Split(a.String(), ","))
		if err != nil {
			t.Fatalf("ParseCallbackAllow(%q).String() = %q does not parse: %v", s, a.String(), err)
		}
		if b.String() != a.String() {
			t.Fatalf("ParseCallbackAllow(%q): %q reads back as %q", s, a.String(), b.String())
		}
	})
}
