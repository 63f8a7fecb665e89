// Package layout holds a test of the project's import rules.
package layout

import (
	"os/exec"
	"strings"
	"testing"
)

// TestImportDirection: imports point one way, cmd/lanecert -> reports ->
// dual -> flow; cobra only in cmd, tablewriter only in reports; the library
// packages never import the command or the test helpers.
func TestImportDirection(t *testing.T) {
	forbidden := map[string][]string{
		"lanecert/flow":    {"lanecert/dual", "lanecert/reports", "lanecert/cmd/", "lanecert/internal/", "github.com/spf13/cobra", "github.com/olekukonko/tablewriter"},
		"lanecert/dual":    {"lanecert/reports", "lanecert/cmd/", "lanecert/internal/", "github.com/spf13/cobra", "github.com/olekukonko/tablewriter"},
		"lanecert/reports": {"lanecert/cmd/", "lanecert/internal/", "github.com/spf13/cobra"},
	}
	for pkg, bad := range forbidden {
		out, err := exec.Command("go", "list", "-deps", pkg).Output()
		if err != nil {
			t.Fatalf("go list %s: %v", pkg, err)
		}
		for _, dep := range strings.Fields(string(out)) {
			for _, b := range bad {
				if dep == b || strings.HasPrefix(dep, b) {
					t.Errorf("%s depends on %s", pkg, dep)
				}
			}
		}
	}
}
