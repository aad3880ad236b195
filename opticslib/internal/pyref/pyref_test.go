package pyref

import "testing"

// The interpreter of the cross-checks follows BEAMNOTE_PYTHON; a test of
// the runner's own configuration, no outside reference.
func TestPythonHonoursBEAMNOTE_PYTHON(t *testing.T) {
	t.Setenv("BEAMNOTE_PYTHON", "/opt/py/bin/python3")
	if got := Python(); got != "/opt/py/bin/python3" {
		t.Errorf("Python() with BEAMNOTE_PYTHON=/opt/py/bin/python3 = %q", got)
	}
	t.Setenv("BEAMNOTE_PYTHON", "")
	if got := Python(); got != "/usr/bin/python3" {
		t.Errorf("Python() without BEAMNOTE_PYTHON = %q, want /usr/bin/python3", got)
	}
}
