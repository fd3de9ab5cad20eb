package server

import (
	"bytes"
	"encoding/json"
	"fmt"
	"strconv"
	"strings"
	"unicode"
	"unicode/utf8"
)

// lineBreaksAllowed lists the string members whose text may hold tabs and
// line breaks: the peak lists, which may be pasted journal text or a
// JCAMP-DX file. No other string of a request may hold a control
// character.
var lineBreaksAllowed = map[string]bool{"/peaks": true, "/carbon_peaks": true}

// textFields walks a well-formed JSON value and returns a FieldError for
// each object member that appears twice in its object (encoding/json would
// keep the last silently) and each string, value or member name, holding a
// control character (U+0000-U+001F, U+007F-U+009F; tab, CR and LF only in
// the members of lineBreaksAllowed). Both stores then see only text
// PostgreSQL can keep, and a NUL byte gets a 400 naming its field rather
// than a store error. Fields are JSON Pointers; Position is the byte offset
// of the character in the decoded string.
func textFields(data []byte) []FieldError {
	type frame struct {
		object  bool
		ptr     string
		index   int // next array element
		key     string
		wantKey bool
		seen    map[string]bool
	}
	dec := json.NewDecoder(bytes.NewReader(data))
	dec.UseNumber()
	var (
		stack  []*frame
		fields []FieldError
	)
	// valuePtr is the pointer of the value about to be read.
	valuePtr := func() string {
		if len(stack) == 0 {
			return ""
		}
		f := stack[len(stack)-1]
		if f.object {
			return f.ptr + "/" + escapePointer(f.key)
		}
		p := f.ptr + "/" + strconv.Itoa(f.index)
		return p
	}
	// valueDone moves the enclosing container past a complete value.
	valueDone := func() {
		if len(stack) == 0 {
			return
		}
		f := stack[len(stack)-1]
		if f.object {
			f.wantKey = true
		} else {
			f.index++
		}
	}
	for {
		tok, err := dec.Token()
		if err != nil {
			return fields // end of the value (it is well-formed)
		}
		if len(stack) > 0 {
			if f := stack[len(stack)-1]; f.object && f.wantKey {
				if name, ok := tok.(string); ok {
					if f.seen[name] {
						fields = append(fields, FieldError{Field: f.ptr + "/" + escapePointer(name),
							Detail: "repeated member: each member may appear once in its object"})
					}
					f.seen[name] = true
					if pos, r, bad := controlAt(name, false); bad {
						fields = append(fields, FieldError{Field: f.ptr + "/" + escapePointer(name),
							Detail: fmt.Sprintf("the member name holds the control character %U", r), Position: &pos})
					}
					f.key, f.wantKey = name, false
					continue
				}
			}
		}
		switch t := tok.(type) {
		case json.Delim:
			switch t {
			case '{':
				stack = append(stack, &frame{object: true, ptr: valuePtr(), wantKey: true, seen: map[string]bool{}})
			case '[':
				stack = append(stack, &frame{ptr: valuePtr()})
			default:
				stack = stack[:len(stack)-1]
				valueDone()
			}
		case string:
			ptr := valuePtr()
			if pos, r, bad := controlAt(t, lineBreaksAllowed[ptr]); bad {
				fields = append(fields, FieldError{Field: ptr, Position: &pos,
					Detail: fmt.Sprintf("holds the control character %U; only printable text is accepted", r)})
			}
			valueDone()
		default:
			valueDone()
		}
	}
}

// controlAt returns the byte offset and the rune of the first control
// character in s (tab, CR and LF pass when lineBreaks is set).
func controlAt(s string, lineBreaks bool) (int, rune, bool) {
	i := strings.IndexFunc(s, func(r rune) bool {
		if lineBreaks && (r == '\t' || r == '\n' || r == '\r') {
			return false
		}
		return unicode.IsControl(r)
	})
	if i < 0 {
		return 0, 0, false
	}
	r, _ := utf8.DecodeRuneInString(s[i:])
	return i, r, true
}
