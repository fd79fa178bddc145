package handlers

import (
	"bytes"
	"fmt"
	"math/rand/v2"
	"mime/multipart"
	"net/http"
	"net/http/httptest"
	"net/url"
	"sort"
	"strings"
	"testing"

	"lagwright/store/storetest"
)

// malformedFields are names the forms and the API read; junk goes into them.
var malformedFields = []string{"name", "client", "site", "units", "version", "tag", "service", "location", "exposure",
	"notes", "shape", "pipe_size", "pipe_od_mm", "operating_temp_c", "length_m", "layers[0].material",
	"layers[0].thickness_mm", "jacket", "fittings.elbows", "settings.indoor.ambient_temp_c", "slug", "k_points",
	"emittance", "thickness_mm", "rows", "text", "file", "note", "geometry", "layers", "settings", "criteria"}

var malformedValues = []string{"", "abc", "NaN", "nan", "Infinity", "-Inf", "1e999", "-1e309", "99999999999999999999999",
	"-0", "0x10", "1/0", "½", "1-1/2\"", "\x00", "\xff\xfe", "<script>alert(1)</script>", `"><img src=x onerror=alert(1)>`,
	"=cmd|' /C calc'!A0", strings.Repeat("9", 400), strings.Repeat("x", 5000), "true", "null", "[]", "{}"}

var malformedJSONValues = []string{`"abc"`, `"NaN"`, `1e308`, `-1e308`, `1e999`, `123456789012345678901234567890`, `true`,
	`null`, `[]`, `{}`, `[1,2,3]`, `{"a":1}`, `-0`, `"<script>alert(1)</script>"`, `0.0000000000000000000001`, `[[[[[]]]]]`}

// malformedBody returns a bad body and its content type, different each call.
func malformedBody(rng *rand.Rand) (body []byte, ctype, kind string) {
	switch k := rng.IntN(11); k {
	case 0: // random bytes, random type
		b := make([]byte, rng.IntN(2000))
		for i := range b {
			b[i] = byte(rng.UintN(256))
		}
		return b, []string{"application/json", "application/x-www-form-urlencoded", "text/csv", "application/octet-stream", ""}[rng.IntN(5)], "random bytes"
	case 1: // a form with junk values
		v := url.Values{}
		for range 1 + rng.IntN(12) {
			v.Add(malformedFields[rng.IntN(len(malformedFields))], malformedValues[rng.IntN(len(malformedValues))])
		}
		return []byte(v.Encode()), "application/x-www-form-urlencoded", "junk form"
	case 2: // JSON with wrong types and huge numbers
		var b strings.Builder
		b.WriteString("{")
		for i := range 1 + rng.IntN(10) {
			if i > 0 {
				b.WriteString(",")
			}
			fmt.Fprintf(&b, "%q:%s", malformedFields[rng.IntN(len(malformedFields))], malformedJSONValues[rng.IntN(len(malformedJSONValues))])
		}
		b.WriteString("}")
		return []byte(b.String()), "application/json", "wrong-type JSON"
	case 3: // deep nesting
		n := 1000 + rng.IntN(50000)
		open, close := "[", "]"
		if rng.IntN(2) == 0 {
			open, close = `{"a":`, "}"
		}
		return []byte(`{"layers":` + strings.Repeat(open, n) + "1" + strings.Repeat(close, n) + "}"), "application/json", "deep nesting"
	case 4: // JSON sent as a form, or a form sent as JSON
		if rng.IntN(2) == 0 {
			return []byte(`{"name":"x","tag":"y","version":1}`), "application/x-www-form-urlencoded", "JSON as form"
		}
		return []byte("name=x&tag=y&version=1"), "application/json", "form as JSON"
	case 5: // truncated multipart
		var b bytes.Buffer
		mw := multipart.NewWriter(&b)
		fw, _ := mw.CreateFormFile("file", "lines.csv")
		_, _ = fw.Write([]byte("tag,length [m]\nA-1,10\nA-2,"))
		_ = mw.WriteField("rows", "tag\nB-1")
		_ = mw.Close()
		cut := b.Bytes()[:rng.IntN(b.Len())]
		return cut, mw.FormDataContentType(), "truncated multipart"
	case 6: // multipart without a boundary, or a made-up type
		return []byte("--x\r\nContent-Disposition: form-data; name=\"tag\"\r\n\r\nA\r\n--x--\r\n"),
			[]string{"multipart/form-data", "multipart/form-data; boundary=", "multipart/mixed; boundary=x", "text/plain; charset=utf-16", "application/x-www-form-urlencoded; charset=ebcdic"}[rng.IntN(5)], "bad content type"
	case 7: // NaN and infinities as strings where numbers go
		return []byte(`{"tag":"N-1","geometry":"pipe","pipe_size":"NPS 2","operating_temp_c":"NaN","length_m":"Infinity","layers":[{"material":"elastomeric_c534_gr1","thickness_mm":"-Inf"}],"version":"NaN"}`), "application/json", "NaN strings"
	case 8: // truncated JSON
		full := `{"tag":"T-1","geometry":"pipe","pipe_size":"NPS 2","operating_temp_c":60,"layers":[{"material":"elastomeric_c534_gr1","thickness_mm":25}],"version":1}`
		return []byte(full[:rng.IntN(len(full))]), "application/json", "truncated JSON"
	case 9: // many repeated fields
		var b strings.Builder
		for i := range 20000 {
			fmt.Fprintf(&b, "layers[%d].thickness_mm=1&", i)
		}
		return []byte(b.String()), "application/x-www-form-urlencoded", "repeated fields"
	default: // invalid UTF-8 and control characters in every text field
		v := url.Values{}
		for _, f := range malformedFields {
			v.Set(f, "\xc3\x28\x00\r\n\t\u202e"+f)
		}
		return []byte(v.Encode()), "application/x-www-form-urlencoded", "invalid UTF-8"
	}
}

// A thousand malformed forms and API bodies to every POST and PATCH route, with a real
// database: every answer is below 500, and nothing panics or logs an internal error.
func TestMalformedInputNever5xx(t *testing.T) {
	st := storetest.NewDB(t)
	s, logs := newServer(t, st)
	h := s.Routes()
	ids := fixture(t, st, h)

	var routes []route
	for _, rt := range walkRoutes(t, s) {
		if rt.method == http.MethodPost || rt.method == http.MethodPatch {
			routes = append(routes, rt)
		}
	}
	// Deletes last, so the other routes still find their project, line and materials.
	sort.SliceStable(routes, func(i, j int) bool {
		return !strings.HasSuffix(routes[i].path, "/delete") && strings.HasSuffix(routes[j].path, "/delete")
	})
	const total = 1000
	rng := rand.New(rand.NewPCG(10, 2026))
	byClass := map[int]int{}
	byKind := map[string]int{}
	for i := range total {
		rt := routes[i*len(routes)/total]
		body, ctype, kind := malformedBody(rng)
		target := fillRoute(rt.path, ids)
		req := httptest.NewRequest(rt.method, target, bytes.NewReader(body))
		if ctype != "" {
			req.Header.Set("Content-Type", ctype)
		}
		if rng.IntN(3) == 0 {
			req.Header.Set("HX-Request", "true")
		}
		rec := httptest.NewRecorder()
		h.ServeHTTP(rec, req)
		byClass[rec.Code/100]++
		byKind[kind]++
		if rec.Code >= 500 || rec.Code < 200 {
			t.Errorf("%s %s with %s (%d bytes, %q) = %d: %.300s", rt.method, target, kind, len(body), ctype, rec.Code, rec.Body)
		}
	}
	if l := logs.String(); strings.Contains(l, "panic") || strings.Contains(l, "internal error") {
		t.Errorf("panics or internal errors logged:\n%.3000s", l)
	}
	t.Logf("%d requests to %d POST/PATCH routes: %d×2xx %d×3xx %d×4xx %d×5xx; kinds %v",
		total, len(routes), byClass[2], byClass[3], byClass[4], byClass[5], byKind)
	if len(routes) < 20 {
		t.Errorf("only %d POST/PATCH routes walked", len(routes))
	}
}
