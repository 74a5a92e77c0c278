package scenario

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// TestReadmeDocumentsEveryKey keeps the scenario reference of README.md
// complete: every key appears, as `key`, under its table's heading.
func TestReadmeDocumentsEveryKey(t *testing.T) {
	data, err := os.ReadFile(filepath.Join(root, "README.md"))
	if err != nil {
		t.Fatal(err)
	}
	readme := string(data)
	for _, k := range keys {
		heading := "#### [" + k.table() + "]"
		i := strings.Index(readme, heading)
		if i < 0 {
			t.Errorf("README.md has no heading %q", heading)
			continue
		}
		section := readme[i+len(heading):]
		if j := strings.Index(section, "\n#"); j >= 0 {
			section = section[:j]
		}
		leaf := k.name[len(k.table())+1:]
		if !strings.Contains(section, "`"+leaf+"`") {
			t.Errorf("README.md does not document %s under %q", k.name, heading)
		}
	}
}
