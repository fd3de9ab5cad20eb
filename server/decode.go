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
	"unicode/utf8"
)

// decodeJSON reads one JSON value from the request body into v, strictly:
// the body must be sent as Content-Type: application/json (or another
// +json type), be at most maxBytes long, and pass unmarshalStrict.
func decodeJSON(w http.ResponseWriter, r *http.Request, maxBytes int64, v any) error {
	ct := r.Header.Get("Content-Type")
	if ct == "" {
		return errorf(CodeUnsupportedMedia, "the request body must be JSON sent with Content-Type: application/json")
	}
	mt, _, err := mime.ParseMediaType(ct)
	if err != nil || (mt != "application/json" && !strings.HasSuffix(mt, "+json")) {
		return errorf(CodeUnsupportedMedia, "the request body must be JSON sent with Content-Type: application/json, not %q", ct)
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

// unmarshalStrict decodes data into v as the API's contract says: one JSON
// value in valid UTF-8 and nothing after it; object member names exactly as
// documented (case matters) and each at most once; no unknown members;
// every value of the documented type, numbers within the Go type's range;
// and strings without control characters (see textFields). Its errors are
// *Error values of code CodeInvalid naming every offending member by JSON
// Pointer, not only the first.
func unmarshalStrict(data []byte, v any) error {
	if len(bytes.TrimSpace(data)) == 0 {
		return invalidFields([]FieldError{{Field: "", Detail: "the request body is empty; send a JSON object"}})
	}
	if !utf8.Valid(data) {
		off := invalidUTF8At(data)
		return invalidFields([]FieldError{{Field: "", Detail: "the request body is not valid UTF-8", Position: &off}})
	}
	dec := json.NewDecoder(bytes.NewReader(data))
	var value json.RawMessage
	if err := dec.Decode(&value); err != nil {
		return jsonError(err)
	}
	var extra json.RawMessage
	if err := dec.Decode(&extra); err != io.EOF {
		off := int(dec.InputOffset())
		return invalidFields([]FieldError{{Field: "", Detail: "unexpected data after the JSON value", Position: &off}})
	}
	fields := textFields(value)
	fields = append(fields, memberErrors(value, reflect.TypeOf(v), "")...)
	if len(fields) > 0 {
		return invalidFields(fields)
	}
	strict := json.NewDecoder(bytes.NewReader(value))
	strict.DisallowUnknownFields()
	if err := strict.Decode(v); err != nil {
		return jsonError(err)
	}
	return nil
}

// invalidUTF8At returns the byte offset of the first invalid UTF-8
// sequence in b.
func invalidUTF8At(b []byte) int {
	for i := 0; i < len(b); {
		r, n := utf8.DecodeRune(b[i:])
		if r == utf8.RuneError && n <= 1 {
			return i
		}
		i += n
	}
	return len(b)
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
		detail := fmt.Sprintf("must be %s, not JSON %s", jsonKind(typ.Type.Kind().String()), typ.Value)
		if num, ok := strings.CutPrefix(typ.Value, "number "); ok {
			detail = numberProblem(typ.Type.Kind(), num)
		}
		return invalidFields([]FieldError{{Field: pointerFromPath(typ.Field), Detail: detail, Position: &off}})
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
				detail := fmt.Sprintf("must be %s, not JSON %s", jsonKind(t.Kind().String()), jsonValueKind(data))
				if jsonValueKind(data) == "number" {
					detail = numberProblem(t.Kind(), string(data))
				}
				return []FieldError{{Field: ptr, Detail: detail}}
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
		ft, ok, exact := fieldType(t, name)
		switch {
		case !ok:
			fields = append(fields, FieldError{Field: member, Detail: "unknown field"})
			continue
		case !exact:
			fields = append(fields, FieldError{Field: member, Detail: fmt.Sprintf("unknown field (member names are case-sensitive: %q)", exactName(t, name))})
			continue
		}
		fields = append(fields, memberErrors(raw, ft, member)...)
	}
	return fields
}

// fieldType finds the struct field of t for the object member name: by its
// json tag or Go name. exact is false when only a name differing in case
// matches (encoding/json would fill it; the API's contract does not).
func fieldType(t reflect.Type, name string) (ft reflect.Type, ok, exact bool) {
	var fold reflect.Type
	for i := range t.NumField() {
		f := t.Field(i)
		tag := jsonName(f)
		if tag == "" {
			continue
		}
		if tag == name {
			return f.Type, true, true
		}
		if fold == nil && strings.EqualFold(tag, name) {
			fold = f.Type
		}
	}
	return fold, fold != nil, false
}

// exactName returns the documented spelling of the member of t that name
// matches without regard to case.
func exactName(t reflect.Type, name string) string {
	for i := range t.NumField() {
		if tag := jsonName(t.Field(i)); tag != "" && strings.EqualFold(tag, name) {
			return tag
		}
	}
	return name
}

// jsonName is the member name encoding/json gives struct field f, "" for
// an unexported or ignored field.
func jsonName(f reflect.StructField) string {
	if !f.IsExported() {
		return ""
	}
	tag, _, _ := strings.Cut(f.Tag.Get("json"), ",")
	switch tag {
	case "-":
		return ""
	case "":
		return f.Name
	}
	return tag
}

// numberProblem says why the JSON number text does not fit a Go value of
// kind k.
func numberProblem(k reflect.Kind, text string) string {
	switch k {
	case reflect.Int, reflect.Int8, reflect.Int16, reflect.Int32, reflect.Int64,
		reflect.Uint, reflect.Uint8, reflect.Uint16, reflect.Uint32, reflect.Uint64:
		if strings.ContainsAny(text, ".eE") {
			return fmt.Sprintf("must be a whole number written without a fraction or exponent, not %s", truncate(text, 40))
		}
		return fmt.Sprintf("the number %s is too large for this field", truncate(text, 40))
	case reflect.Float32, reflect.Float64:
		return fmt.Sprintf("the number %s is out of range", truncate(text, 40))
	}
	return fmt.Sprintf("must be %s, not a number", jsonKind(k.String()))
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
