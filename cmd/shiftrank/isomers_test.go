package main

import (
	"errors"
	"strings"
	"testing"
)

func TestIsomersCommand(t *testing.T) {
	out, errOut, err := runCmd(t, "", "isomers", "C4H10O", "--filter=none")
	if err != nil {
		t.Fatalf("isomers C4H10O: %v (%s)", err, errOut)
	}
	lines := strings.Fields(out)
	// 4 butanols + 3 ethers (handbook count, common practice)
	if len(lines) != 7 {
		t.Errorf("isomers C4H10O printed %d lines, want 7: %q", len(lines), out)
	}
	seen := map[string]bool{}
	for _, l := range lines {
		if seen[l] {
			t.Errorf("duplicate line %q", l)
		}
		seen[l] = true
	}
	if !seen["CCCCO"] || !seen["CCOCC"] {
		t.Errorf("isomers C4H10O misses butan-1-ol or diethyl ether: %q", out)
	}
	if !strings.Contains(errOut, "7 structures") {
		t.Errorf("stderr summary missing: %q", errOut)
	}

	out, errOut, err = runCmd(t, "", "isomers", "--count", "C6H12O2")
	if err != nil {
		t.Fatalf("isomers --count: %v", err)
	}
	if strings.TrimSpace(out) == "" || strings.Contains(out, "C") {
		t.Errorf("--count printed %q", out)
	}
	if !strings.Contains(errOut, "no-peroxide") {
		t.Errorf("--count: per-rule removals missing from stderr: %q", errOut)
	}

	out, _, err = runCmd(t, "", "isomers", "C8H18", "--limit", "4")
	if err != nil || len(strings.Fields(out)) != 4 {
		t.Errorf("--limit 4: %v, %q", err, out)
	}

	out, _, err = runCmd(t, "", "isomers", "--rules")
	if err != nil || !strings.Contains(out, "no-enol") {
		t.Errorf("--rules: %v, %q", err, out)
	}
}

func TestIsomersCommandBadInput(t *testing.T) {
	cases := []struct {
		args []string
		want string
	}{
		{[]string{"isomers"}, "missing FORMULA"},
		{[]string{"isomers", "C4H9O"}, "odd number of electrons"},
		{[]string{"isomers", "C4Xy"}, "Xy"},
		{[]string{"isomers", "C4H10O", "--filter=plausible,-no-such"}, "no-such"},
		{[]string{"isomers", "C4H10O", "--limit", "-3"}, "--limit"},
		{[]string{"isomers", "C30H62", "--max-heavy", "20"}, "limit of 20"},
		{[]string{"isomers", "C4H10O", "C5H12"}, "one FORMULA"},
		{[]string{"isomers", "--bogus", "C4H10O"}, "bogus"},
	}
	for _, c := range cases {
		out, _, err := runCmd(t, "", c.args...)
		var u usageError
		if !errors.As(err, &u) {
			t.Errorf("%v: error %v, want bad input (exit 2)", c.args, err)
			continue
		}
		if !strings.Contains(err.Error(), c.want) {
			t.Errorf("%v: error %q, want it to mention %q", c.args, err, c.want)
		}
		if out != "" {
			t.Errorf("%v: wrote %q to stdout on bad input", c.args, out)
		}
	}
}
