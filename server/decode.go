package server

import (
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"mime"
	"net/http"
	"reflect"
	"strings"
)

// decodeJSON reads one JSON value from the request body into v, strictly:
// the body must be at most maxBytes long, unknown object members are
// rejected, and nothing but white space may follow the value.
func decodeJSON(w http.ResponseWriter, r *http.Request, maxBytes int64, v any) error {
	if ct := r.Header.Get("Content-Type"); ct != "" {
		mt, _, err := mime.ParseMediaType(ct)
		if err != nil || (mt != "application/json" && !strings.HasSuffix(mt, "+json")) {
			return errorf(CodeUnsupportedMedia, "the request body must be JSON sent with Content-Type: application/json, not %q", ct)
		}
	}
	body, err := io.ReadAll(http.MaxBytesReader(w, r.Body, maxBytes))
	if err != nil {
		var mbe *http.MaxBytesError
		if errors.As(err, &mbe) {
			return errorf(CodeTooLarge, "the request body is larger than %d bytes", mbe.Limit)
		}
		return errorf(CodeInvalid, "reading the request body: %v", err)
	}
	return unmarshalStrict(body, v)
}

// unmarshalStrict decodes data into v with unknown fields and trailing
// data rejected. Its errors are *Error values of code CodeInvalid naming
// the offending member where the decoder reports one.
func unmarshalStrict(data []byte, v any) error {
	if len(bytes.TrimSpace(data)) == 0 {
		return invalidFields([]FieldError{{Field: "", Detail: "the request body is empty; send a JSON object"}})
	}
	dec := json.NewDecoder(bytes.NewReader(data))
	dec.DisallowUnknownFields()
	if err := dec.Decode(v); err != nil {
		// encoding/json names only the first unknown or mistyped member, and
		// an unknown one without its path: list them all, with their paths.
		var syn *json.SyntaxError
		if !errors.As(err, &syn) {
			if fields := memberErrors(data, reflect.TypeOf(v), ""); len(fields) > 0 {
				return invalidFields(fields)
			}
		}
		return jsonError(err)
	}
	var extra json.RawMessage
	if err := dec.Decode(&extra); err != io.EOF {
		off := int(dec.InputOffset())
		return invalidFields([]FieldError{{Field: "", Detail: "unexpected data after the JSON value", Position: &off}})
	}
	return nil
}

// jsonError turns an encoding/json error into field errors.
func jsonError(err error) error {
	var syn *json.SyntaxError
	var typ *json.UnmarshalTypeError
	switch {
	case errors.As(err, &syn):
		off := int(syn.Offset)
		return invalidFields([]FieldError{{Field: "", Detail: "malformed JSON: " + syn.Error(), Position: &off}})
	case errors.As(err, &typ):
		off := int(typ.Offset)
		return invalidFields([]FieldError{{
			Field:    pointerFromPath(typ.Field),
			Detail:   fmt.Sprintf("must be %s, not JSON %s", jsonKind(typ.Type.Kind().String()), typ.Value),
			Position: &off,
		}})
	case errors.Is(err, io.ErrUnexpectedEOF):
		return invalidFields([]FieldError{{Field: "", Detail: "the JSON value is truncated"}})
	}
	msg := err.Error()
	if name, ok := strings.CutPrefix(msg, "json: unknown field "); ok {
		name = strings.Trim(name, `"`)
		return invalidFields([]FieldError{{Field: "/" + escapePointer(name), Detail: "unknown field"}})
	}
	return invalidFields([]FieldError{{Field: "", Detail: "malformed JSON: " + strings.TrimPrefix(msg, "json: ")}})
}

func jsonKind(k string) string {
	switch k {
	case "string":
		return "a string"
	case "int", "int64", "int32", "uint", "uint64", "float64", "float32":
		return "a number"
	case "bool":
		return "true or false"
	case "slice", "array":
		return "an array"
	case "struct", "map":
		return "an object"
	}
	return k
}

// pointerFromPath converts encoding/json's dotted field path
// ("options.top_k") into a JSON Pointer ("/options/top_k").
func pointerFromPath(path string) string {
	if path == "" {
		return ""
	}
	parts := strings.Split(path, ".")
	for i, p := range parts {
		parts[i] = escapePointer(p)
	}
	return "/" + strings.Join(parts, "/")
}

func escapePointer(s string) string {
	return strings.NewReplacer("~", "~0", "/", "~1").Replace(s)
}

var rawMessageType = reflect.TypeFor[json.RawMessage]()

// memberErrors walks the JSON value data against the Go type t and returns
// one FieldError per unknown object member and per member whose JSON type
// does not fit, in document order, with JSON Pointers below ptr. Members of
// type json.RawMessage are left to their own validation. It returns nil for
// data that is not well-formed JSON.
func memberErrors(data []byte, t reflect.Type, ptr string) []FieldError {
	for t != nil && t.Kind() == reflect.Pointer {
		t = t.Elem()
	}
	if t == nil || t == rawMessageType {
		return nil
	}
	data = bytes.TrimSpace(data)
	if (t.Kind() == reflect.Slice || t.Kind() == reflect.Array) && len(data) > 0 && data[0] == '[' {
		var elems []json.RawMessage
		if err := json.Unmarshal(data, &elems); err != nil {
			return nil
		}
		var fields []FieldError
		for i, e := range elems {
			fields = append(fields, memberErrors(e, t.Elem(), fmt.Sprintf("%s/%d", ptr, i))...)
		}
		return fields
	}
	if t.Kind() != reflect.Struct || len(data) == 0 || data[0] != '{' {
		if err := json.Unmarshal(data, reflect.New(t).Interface()); err != nil {
			var typ *json.UnmarshalTypeError
			if errors.As(err, &typ) {
				return []FieldError{{Field: ptr, Detail: fmt.Sprintf("must be %s, not JSON %s", jsonKind(t.Kind().String()), jsonValueKind(data))}}
			}
		}
		return nil
	}
	dec := json.NewDecoder(bytes.NewReader(data))
	if _, err := dec.Token(); err != nil { // the opening brace
		return nil
	}
	var fields []FieldError
	for dec.More() {
		tok, err := dec.Token()
		if err != nil {
			return fields
		}
		name, _ := tok.(string)
		var raw json.RawMessage
		if err := dec.Decode(&raw); err != nil {
			return fields
		}
		member := ptr + "/" + escapePointer(name)
		ft, ok := fieldType(t, name)
		if !ok {
			fields = append(fields, FieldError{Field: member, Detail: "unknown field"})
			continue
		}
		fields = append(fields, memberErrors(raw, ft, member)...)
	}
	return fields
}

// fieldType finds the struct field of t that encoding/json fills from the
// object member name: by its json tag or Go name, exact match first, then
// without regard to case.
func fieldType(t reflect.Type, name string) (reflect.Type, bool) {
	var fold reflect.Type
	for i := range t.NumField() {
		f := t.Field(i)
		if !f.IsExported() {
			continue
		}
		tag, _, _ := strings.Cut(f.Tag.Get("json"), ",")
		if tag == "-" {
			continue
		}
		if tag == "" {
			tag = f.Name
		}
		if tag == name {
			return f.Type, true
		}
		if fold == nil && strings.EqualFold(tag, name) {
			fold = f.Type
		}
	}
	return fold, fold != nil
}

// jsonValueKind names the JSON type of a well-formed value.
func jsonValueKind(data []byte) string {
	if len(data) == 0 {
		return "nothing"
	}
	switch data[0] {
	case '{':
		return "object"
	case '[':
		return "array"
	case '"':
		return "string"
	case 't', 'f':
		return "bool"
	case 'n':
		return "null"
	}
	return "number"
}
