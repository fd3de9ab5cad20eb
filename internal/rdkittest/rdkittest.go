// Package rdkittest gates the tests that cross-check shiftrank against
// RDKit (Debian's python3-rdkit), a general-purpose cheminformatics library
// used as an outside reference.
package rdkittest

import (
	"os"
	"os/exec"
	"testing"
)

// Python is the interpreter that has RDKit: Debian's python3-rdkit installs
// into the system Python, and the python3 first on PATH may be another one.
const Python = "/usr/bin/python3"

// Require ends the test when RDKit cannot be imported: it fails when
// CI=true (a cross-check must not silently vanish in CI) and skips
// elsewhere, saying how to install it.
func Require(t testing.TB) {
	t.Helper()
	if err := exec.Command(Python, "-c", "import rdkit").Run(); err != nil {
		msg := "RDKit not available (" + err.Error() + "); install python3-rdkit (apt-get install -y python3-rdkit) to run this cross-check"
		if os.Getenv("CI") == "true" {
			t.Fatal(msg)
		}
		t.Skip(msg)
	}
}
