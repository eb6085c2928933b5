package errtext

import (
	"errors"
	"testing"
)

type testList []error

func (l testList) Error() string   { return ListText(l) }
func (l testList) Unwrap() []error { return ListUnwrap(l) }

// The wording follows go/scanner.ErrorList (Go standard library), as the readers promise.
func TestList(t *testing.T) {
	a, b, c := errors.New("a"), errors.New("b"), errors.New("c")
	for _, tc := range []struct {
		l    testList
		want string
	}{
		{nil, "no errors"}, {testList{a}, "a"}, {testList{a, b}, "a (and 1 more error)"}, {testList{a, b, c}, "a (and 2 more errors)"},
	} {
		if got := tc.l.Error(); got != tc.want {
			t.Errorf("%d errors: %q, want %q", len(tc.l), got, tc.want)
		}
	}
	if ListErr(testList{}) != nil || ListErr(testList{a}) != a {
		t.Error("ListErr: want nil for none, the error itself for one")
	}
	if err := ListErr(testList{a, b}); !errors.Is(err, b) {
		t.Errorf("ListErr of two = %v, does not unwrap to the second", err)
	}
	if got := ListUnwrap([]error{a, b}); len(got) != 2 || got[1] != b {
		t.Errorf("ListUnwrap = %v", got)
	}
}
