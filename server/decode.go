package server

import (
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"mime"
	"net/http"
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
