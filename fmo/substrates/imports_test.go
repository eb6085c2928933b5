package substrates

import (
	"go/build"
	"strings"
	"testing"
)

// TestImportsPointOneWay: the readers depend on no analysis code, so package screen can
// import them and a new reader never drags in the pair theory (see DEVELOPERS.md).
func TestImportsPointOneWay(t *testing.T) {
	pkg, err := build.ImportDir(".", 0)
	if err != nil {
		t.Fatal(err)
	}
	for _, imp := range pkg.Imports {
		if strings.HasPrefix(imp, "cyclopair/fmo") {
			t.Errorf("substrates imports %s", imp)
		}
	}
}
