package yamlfile

import (
	"errors"
	"strings"
	"testing"

	"go.yaml.in/yaml/v3"
)

var errTest = errors.New("test sentinel")

func TestErrorText(t *testing.T) {
	cause := errors.New("cause")
	for _, tc := range []struct {
		e    Error
		want string
	}{
		{Error{File: "f.yaml", Msg: "empty"}, "f.yaml: empty"},
		{Error{File: "f.yaml", Line: 3, Col: 7, Msg: "bad"}, "f.yaml: 3:7: bad"},
		{Error{File: "f.yaml", Line: 3, Col: 7, Path: "dienes[2]", Msg: "bad", Hint: "fix it"}, "f.yaml: 3:7: dienes[2]: bad (fix it)"},
		{Error{File: "f.yaml", Path: "IE08", Msg: "bad", Err: errTest, Cause: cause}, "f.yaml: IE08: bad"},
	} {
		if got := tc.e.Error(); got != tc.want {
			t.Errorf("Error() = %q, want %q", got, tc.want)
		}
	}
	e := &Error{File: "f", Msg: "m", Err: errTest, Cause: cause}
	if !errors.Is(e, errTest) || !errors.Is(e, cause) {
		t.Errorf("Unwrap does not reach the sentinel and the cause")
	}
	if len((&Error{}).Unwrap()) != 0 {
		t.Errorf("Unwrap of an error without sentinel or cause is not empty")
	}
}

func TestErrorList(t *testing.T) {
	var l ErrorList
	if l.Err() != nil || l.Error() != "no errors" {
		t.Fatalf("empty list: Err() = %v, Error() = %q", l.Err(), l.Error())
	}
	l = append(l, &Error{File: "f", Line: 1, Col: 2, Msg: "first"})
	if got := l.Err().Error(); got != "f: 1:2: first" {
		t.Errorf("one error: %q", got)
	}
	l = append(l, &Error{File: "f", Msg: "second", Err: errTest}, &Error{File: "f", Msg: "third"})
	if got := l.Error(); got != "f: 1:2: first (and 2 more errors)" {
		t.Errorf("three errors: %q", got)
	}
	var e *Error
	if !errors.Is(l, errTest) || !errors.As(l, &e) || e.Msg != "first" {
		t.Errorf("errors.Is/As do not see the list's errors")
	}
}

func TestCheckUTF8(t *testing.T) {
	for _, tc := range []struct {
		data string
		want string // "" for good text
	}{
		{"a: 1\nb: é\n", ""},
		{"\xff\xfea\x00", "f: 1:1: text is UTF-16, not UTF-8"},
		{"a: 1\nb: x\x00y\n", "f: 2:5: NUL byte in text"},
		{"a: 1\nb: é\xe9\n", "f: 2:5: byte 0xE9 is not valid UTF-8"}, // columns count runes
	} {
		e := CheckUTF8([]byte(tc.data), "f", errTest)
		switch {
		case tc.want == "" && e != nil:
			t.Errorf("%q: unexpected %v", tc.data, e)
		case tc.want != "" && (e == nil || !strings.HasPrefix(e.Error(), tc.want) || !errors.Is(e, errTest)):
			t.Errorf("%q: got %v, want %q wrapping the sentinel", tc.data, e, tc.want)
		}
	}
}

func TestReadLimited(t *testing.T) {
	data, tooLarge, err := ReadLimited(strings.NewReader("12345"), 5)
	if err != nil || tooLarge || string(data) != "12345" {
		t.Errorf("at the cap: %q %v %v", data, tooLarge, err)
	}
	if _, tooLarge, _ := ReadLimited(strings.NewReader("123456"), 5); !tooLarge {
		t.Errorf("over the cap not reported")
	}
}

func TestNodeChecks(t *testing.T) {
	var root yaml.Node
	src := "cases:\n  - id: a\n    diene: {name: x, smiels: C=C}\nextra: &x 1\nmore: *x\n"
	if err := yaml.Unmarshal([]byte(src), &root); err != nil {
		t.Fatal(err)
	}
	schema := map[string][]string{"": {"cases", "extra", "more"}, "cases[]": {"id", "diene"}, "cases[].diene": {"name", "smiles"}}
	err := CheckKeys(&root, schema, "c.yaml", "see the format", errTest)
	if err == nil || err.Error() != `c.yaml: 3:22: unknown key "smiels" (known here: name, smiles) (see the format)` || !errors.Is(err, errTest) {
		t.Errorf("CheckKeys = %v", err)
	}
	if a := FirstAlias(&root); a == nil || a.Line != 5 || a.Column != 7 {
		t.Errorf("FirstAlias = %+v, want the alias at 5:7", a)
	}
	top := root.Content[0]
	if l, c := FieldPos(top, "extra"); l != 4 || c != 8 {
		t.Errorf("FieldPos(extra) = %d:%d, want 4:8", l, c)
	}
	if l, c := FieldPos(top, "missing"); l != 1 || c != 1 {
		t.Errorf("FieldPos(missing) = %d:%d, want the mapping's own 1:1", l, c)
	}
	if l, c := FieldPos(nil, "x"); l != 0 || c != 0 {
		t.Errorf("FieldPos(nil) = %d:%d", l, c)
	}
}

func TestLookups(t *testing.T) {
	var root yaml.Node
	src := "h:\n  - type: C\n    h: 0.5\nname: x\n"
	if err := yaml.Unmarshal([]byte(src), &root); err != nil {
		t.Fatal(err)
	}
	top := root.Content[0]
	pos := func(n *yaml.Node) [2]int { return [2]int{n.Line, n.Column} }
	for _, c := range []struct {
		what string
		n    *yaml.Node
		want [2]int
	}{
		{"Key(name)", Key(top, "name"), [2]int{4, 1}},
		{"Value(name)", Value(top, "name"), [2]int{4, 7}},
		{"Value(Item(h, 0), h)", Value(Item(Value(top, "h"), 0), "h"), [2]int{3, 8}},
		{"missing key falls back to the mapping", Value(top, "k"), [2]int{1, 1}},
		{"missing item falls back to the sequence", Item(Value(top, "h"), 5), [2]int{2, 3}},
		{"a scalar is its own value", Value(Value(top, "name"), "x"), [2]int{4, 7}},
	} {
		if got := pos(c.n); got != c.want {
			t.Errorf("%s at %v, want %v", c.what, got, c.want)
		}
	}
	if Value(nil, "x") != nil || Item(nil, 0) != nil || Key(nil, "x") != nil {
		t.Error("nil node must stay nil")
	}
}
